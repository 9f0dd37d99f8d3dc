#!/usr/bin/env node
// Entry point of the clausegate command.
import { main } from "./main.js";

main(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
