// The command itself, in the process that runs it (see bin.ts and relaunch.ts).
import { discardOutputs } from "./output.js";
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
