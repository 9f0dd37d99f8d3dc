/**
 * Structure recovery and counting over the free variables: prints figures, asserts nothing.
 *   npm run build && node --expose-gc dist/bench/structure.js
 * Reuses bench/out/random3sat-1m.cnf (the same seeded file `npm run bench -- read` writes).
 */
import { existsSync, mkdirSync, readdirSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { cnfFromClauses, type Cnf } from "../src/cnf/cnf.js";
import { readDimacsFile } from "../src/cnf/source.js";
import { countModels } from "../src/count/index.js";
import { recoverStructure, type Structure } from "../src/structure/index.js";
import { multiplier, mulberry32, shuffled } from "../test/helpers/encoders.js";
import { writeRandomCnf } from "./random.js";

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, "..", "..");
const out = join(root, "bench", "out");

/** Best of `runs`: wall and CPU milliseconds (CPU counts every thread of the process). */
function time<T>(runs: number, f: () => T): { value: T; wall: number; cpu: number } {
  let best: { value: T; wall: number; cpu: number } | undefined;
  for (let i = 0; i < runs; i++) {
    (globalThis as { gc?: () => void }).gc?.();
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const value = f();
    const wall = performance.now() - t0;
    const c = process.cpuUsage(c0);
    const cpu = (c.user + c.system) / 1000;
    if (best === undefined || wall < best.wall) best = { value, wall, cpu };
  }
  return best!;
}

function summary(s: Structure): string {
  const kinds = new Map<string, number>();
  for (const d of s.definitions) kinds.set(d.kind, (kinds.get(d.kind) ?? 0) + 1);
  const eo = s.groups.filter((g) => g.exactlyOne).length;
  return `free ${s.free.length}, definitions ${s.definitions.length} (${[...kinds].map(([k, n]) => `${k} ${n}`).join(", ") || "none"}), ` +
    `parities ${s.parities.length}, groups ${eo} exactly-one + ${s.groups.length - eo} at-most-one, remaining ${s.remaining.clauseStart.length - 1}`;
}

mkdirSync(out, { recursive: true });
const file = join(out, "random3sat-1m.cnf");
if (!existsSync(file)) writeRandomCnf(file, 234742, 1_000_000, 3, 20261201);
const big = (await readDimacsFile(file)).cnf!;
const r1 = time(3, () => recoverStructure(big));
console.log(`Structure recovery: ${file} (1,000,000 clauses, 234,742 variables, seed 20261201)`);
console.log(`  best of 3: ${r1.wall.toFixed(0)} ms wall, ${r1.cpu.toFixed(0)} ms CPU; ${summary(r1.value)}; rss ${(process.memoryUsage().rss / 1e6).toFixed(0)} MB`);

for (const bits of [64, 128]) {
  const f = shuffled(multiplier(bits, bits, 1234567n), mulberry32(bits));
  const cnf = cnfFromClauses(f.variables, f.clauses);
  const r = time(2, () => recoverStructure(cnf));
  console.log(`  ${bits} x ${bits} multiplier (Tseitin, shuffled): ${f.variables} variables, ${f.clauses.length} clauses: ${r.wall.toFixed(0)} ms wall, ${r.cpu.toFixed(0)} ms CPU; ${summary(r.value)}`);
}

const satlib = join(root, "..", "shared", "satlib");
if (existsSync(satlib)) {
  console.log(`SATLIB (Hoos & Stuetzle 2000), ${satlib}, per family (default preference: definitions first)`);
  for (const family of readdirSync(satlib, { withFileTypes: true }).filter((d) => d.isDirectory()).map((d) => d.name).sort()) {
    let files = 0;
    let unreadable = 0;
    let wall = 0;
    let maxWall = 0;
    let vars = 0;
    let clauses = 0;
    const parts: Structure[] = [];
    for (const name of readdirSync(join(satlib, family)).filter((f) => f.endsWith(".cnf")).sort()) {
      const cnf: Cnf | undefined = (await readDimacsFile(join(satlib, family, name))).cnf;
      if (cnf === undefined) {
        unreadable++;
        continue;
      }
      const r = time(1, () => recoverStructure(cnf));
      files++;
      wall += r.wall;
      maxWall = Math.max(maxWall, r.wall);
      vars += cnf.variables;
      clauses += cnf.clauseStart.length - 1;
      parts.push(r.value);
    }
    const kinds = new Map<string, number>();
    let free = 0;
    let par = 0;
    let eo = 0;
    let amo = 0;
    for (const s of parts) {
      free += s.free.length + s.unused;
      par += s.parities.length;
      for (const d of s.definitions) kinds.set(d.kind, (kinds.get(d.kind) ?? 0) + 1);
      for (const g of s.groups) if (g.exactlyOne) eo++; else amo++;
    }
    console.log(`  ${family.padEnd(12)} ${String(files).padStart(3)} files${unreadable ? ` (${unreadable} rejected by the reader)` : ""}: ${vars} variables -> ${free} free; ` +
      `definitions ${[...kinds].map(([k, n]) => `${k} ${n}`).join(", ") || "none"}; parities ${par}; groups ${eo} exactly-one, ${amo} at-most-one; ` +
      `${clauses} clauses in ${wall.toFixed(0)} ms (largest file ${maxWall.toFixed(0)} ms)`);
  }
}

console.log("Counting over the free variables");
for (const [bits, n] of [[5, 120n], [8, 5040n], [10, 30030n]] as const) {
  const f = multiplier(bits, bits, n);
  const cnf = cnfFromClauses(f.variables, f.clauses);
  await countModels(cnf); // warm up
  const t0 = performance.now();
  const r = await countModels(cnf);
  const ms = performance.now() - t0;
  console.log(`  ${bits} x ${bits} multiplier = ${n}: ${f.variables} variables, ${r.enumerated} enumerated: ${r.ok ? r.models : r.reason} models in ${ms.toFixed(1)} ms`);
}
