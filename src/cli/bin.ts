#!/usr/bin/env node
// Entry point of the clausegate command.
import { main } from "./main.js";

// A reader that stops early (clausegate oracle f.cnf | head) is not an error.
process.stdout.on("error", (e: NodeJS.ErrnoException) => {
  if (e.code === "EPIPE") process.exit(0);
  throw e;
});

main(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
