#!/usr/bin/env node
// Entry point of the clausegate command.
// First, so that the flag is set before any other module runs (see exposeGc.ts).
import "./exposeGc.js";
import { discardOutputs, settleOnClosedReader } from "./output.js";
import { main } from "./main.js";

process.stdout.on("error", (e: NodeJS.ErrnoException) => {
  // A reader that stops early (clausegate oracle f.cnf | head) is not an error.
  if (e.code === "EPIPE") {
    settleOnClosedReader();
    process.exit(0);
  }
  discardOutputs();
  process.stderr.write(`clausegate: error: cannot write to standard output (${e.code ?? e.message}); hint: check the disk space or the program reading the output, or write to a file with -o\n`);
  process.exit(2);
});

// Notes and errors that cannot be shown (standard error closed or full) are dropped: the run and
// its exit code go on (an unhandled stream error would end it with status 1 and leave temporary files).
process.stderr.on("error", () => undefined);

main(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
