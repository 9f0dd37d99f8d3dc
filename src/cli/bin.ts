#!/usr/bin/env node
// Entry point of the clausegate command.
// First, so that the flag is set before any other module runs (see exposeGc.ts).
import "./exposeGc.js";
import "./start.js";
