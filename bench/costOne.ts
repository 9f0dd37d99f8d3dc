/**
 * One cost table in a fresh process, so that peak memory is its own:
 *   node dist/bench/costOne.js FILE [phase|flag]
 * Prints {"readMs":..,"costMs":..,"cpuMs":..,"maxRssMB":..,"clauses":..,"rows":[..]}.
 */
import { readFileSync } from "node:fs";
import { scanDimacs } from "../src/cnf/scanner.js";
import { costTable } from "../src/cost/index.js";

const [file, kind] = process.argv.slice(2);
const t0 = performance.now();
const { cnf, diagnostics } = scanDimacs(readFileSync(file!));
if (cnf === undefined) throw new Error(JSON.stringify(diagnostics));
const t1 = performance.now();
const cpu0 = process.cpuUsage();
const rows = costTable(cnf, kind === "flag" ? "flag" : "phase");
const cpu = process.cpuUsage(cpu0);
const t2 = performance.now();
process.stdout.write(`${JSON.stringify({
  readMs: t1 - t0, costMs: t2 - t1, cpuMs: (cpu.user + cpu.system) / 1000, maxRssMB: process.resourceUsage().maxRSS / 1024,
  clauses: cnf.clauseStart.length - 1, rows,
})}\n`);
