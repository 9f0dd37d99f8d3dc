/**
 * One cost table in a fresh process, so that peak memory is its own:
 *   node dist/bench/costOne.js FILE [phase|flag]
 * Prints {"readMs":..,"costMs":..,"cpuMs":..,"maxRssMB":..,"clauses":..,"rows":[..]}.
 *
 * Or one counting run of the table (a per-row breakdown, each run in its own process):
 *   node dist/bench/costOne.js FILE [phase|flag] --run STRATEGY:UNCOMPUTE:BASIS
 * (e.g. wide:measured:clifford+t). Prints the same timing fields and the run's figures. The
 * toffoli-basis runs here also count depth (the table's do not), so they take somewhat longer.
 */
import { readFileSync } from "node:fs";
import { scanDimacs } from "../src/cnf/scanner.js";
import { costTable, countConstruction } from "../src/cost/index.js";
import type { AnyStrategy } from "../src/synth/index.js";

const args = process.argv.slice(2);
const at = args.indexOf("--run");
const runSpec = at >= 0 ? args.splice(at, 2)[1] : undefined;
const [file, kind] = args;
const t0 = performance.now();
const { cnf, diagnostics } = scanDimacs(readFileSync(file!));
if (cnf === undefined) throw new Error(JSON.stringify(diagnostics));
const t1 = performance.now();
const cpu0 = process.cpuUsage();
const phase = kind === "flag" ? "flag" : "phase";
let result: unknown;
if (runSpec === undefined) result = { rows: costTable(cnf, phase) };
else {
  const [strategy, uncompute, basis] = runSpec.split(":");
  if ((strategy !== "wide" && strategy !== "lean" && strategy !== "textbook") || (uncompute !== "unitary" && uncompute !== "measured") || (basis !== "toffoli" && basis !== "clifford+t")) {
    throw new Error(`--run ${runSpec}: expected STRATEGY:UNCOMPUTE:BASIS (wide|lean|textbook, unitary|measured, toffoli|clifford+t)`);
  }
  result = { run: runSpec, figures: countConstruction(cnf, { kind: phase, strategy: strategy as AnyStrategy, uncompute, basis }) };
}
const cpu = process.cpuUsage(cpu0);
const t2 = performance.now();
process.stdout.write(`${JSON.stringify({
  readMs: t1 - t0, costMs: t2 - t1, cpuMs: (cpu.user + cpu.system) / 1000, maxRssMB: process.resourceUsage().maxRSS / 1024,
  clauses: cnf.clauseStart.length - 1, ...(result as object),
})}\n`);
