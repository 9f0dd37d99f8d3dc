#!/usr/bin/env node
// Entry point of the clausegate command.
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { discardOutputs } from "./output.js";

// A garbage collection on call, for cost's runs (cost/split.ts collectBetweenRuns): the flag set
// now reaches the worker threads' contexts, made later; this context gets the function from a new one.
setFlagsFromString("--expose-gc");
(globalThis as { gc?: unknown }).gc ??= runInNewContext("gc");
import { main } from "./main.js";

process.stdout.on("error", (e: NodeJS.ErrnoException) => {
  // A reader that stops early (clausegate oracle f.cnf | head) is not an error.
  if (e.code === "EPIPE") process.exit(0);
  discardOutputs();
  process.stderr.write(`clausegate: error: cannot write to standard output (${e.code ?? e.message}); hint: check the disk space or the program reading the output, or write to a file with -o\n`);
  process.exit(2);
});

main(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
