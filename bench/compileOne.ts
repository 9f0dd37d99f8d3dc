/**
 * One measurement in a fresh process (peak memory is its own):
 *   node dist/bench/compileOne.js compile IN OUT   read, compile (toffoli basis), write OpenQASM 3
 *   node dist/bench/compileOne.js floor IN OUT N   read IN, write N bytes to OUT in 1 MiB chunks
 * Prints {"ms":..,"bytes":..,"maxRssMB":..,"phases":{..}}.
 */
import { closeSync, openSync, readFileSync, writeSync } from "node:fs";
import { compileOracle } from "../src/compile.js";
import { emitQasm3 } from "../src/emit/qasm3/index.js";
import { scanDimacs } from "../src/cnf/scanner.js";

const [mode, input, output, size] = process.argv.slice(2);
const t0 = performance.now();
const phases: Record<string, number> = {};
let mark = t0;
const phase = (name: string): void => {
  const now = performance.now();
  phases[name] = Math.round(now - mark);
  mark = now;
};
const bytesIn = readFileSync(input!);
phase("read");
let written = 0;
const fd = openSync(output!, "w");
if (mode === "floor") {
  const chunk = Buffer.alloc(1 << 20, 0x61);
  for (let left = Number(size); left > 0; left -= chunk.length) written += writeSync(fd, chunk, 0, Math.min(left, chunk.length));
} else {
  const { cnf } = scanDimacs(bytesIn);
  phase("parse");
  const oracle = compileOracle(cnf!, { basis: "toffoli" });
  phase("compile");
  emitQasm3(oracle.circuit, (s) => {
    written += writeSync(fd, s);
  });
  phase("emit");
}
closeSync(fd);
const ms = performance.now() - t0;
process.stdout.write(`${JSON.stringify({ ms, bytes: written, maxRssMB: process.resourceUsage().maxRSS / 1024, phases })}\n`);
