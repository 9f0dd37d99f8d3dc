/**
 * One measurement in a fresh process, so peak memory belongs to one reader alone:
 *   node dist/bench/readOne.js floor|scanner|grammar FILE
 * Prints {"ms":..,"clauses":..,"maxRssMB":..}. `floor` only reads the file into memory.
 */
import { readFileSync } from "node:fs";
import { readDimacsWithGrammar } from "../src/cnf/antlrReader.js";
import { scanDimacs } from "../src/cnf/scanner.js";

const [mode, file] = process.argv.slice(2);
const t0 = performance.now();
const bytes = readFileSync(file!);
let clauses = 0;
if (mode === "scanner" || mode === "grammar") {
  const r = mode === "scanner" ? scanDimacs(bytes) : readDimacsWithGrammar(bytes);
  if (r.cnf === undefined) throw new Error(JSON.stringify(r.diagnostics));
  clauses = r.cnf.clauseStart.length - 1;
}
const ms = performance.now() - t0;
const maxRssMB = process.resourceUsage().maxRSS / 1024;
process.stdout.write(`${JSON.stringify({ ms, clauses, maxRssMB, bytes: bytes.length })}\n`);
