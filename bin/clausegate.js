#!/usr/bin/env node
// Entry point of the clausegate command; the code lives in dist/ (run `npm run build` first).
import { main } from "../dist/src/cli/main.js";

main(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
