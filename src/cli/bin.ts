#!/usr/bin/env node
// Entry point of the clausegate command.
// First, so that the flag is set before any other module runs (see exposeGc.ts).
import "./exposeGc.js";
import { runCommand } from "./relaunch.js";

// Over a large input the command runs in a child with a fixed malloc threshold (relaunch.ts);
// this process then loads nothing more.
runCommand(() => {
  void import("./start.js");
});
