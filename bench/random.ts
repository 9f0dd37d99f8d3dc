/** Seeded random k-SAT text, written in chunks so that a million clauses never sit in one string. */
import { openSync, writeSync, closeSync } from "node:fs";
import { seededRandom as rng } from "../src/util/random.js";

/** Clauses of random k-SAT with distinct variables per clause; with `kMax`, each clause's width uniform in k..kMax. */
export function* randomClauses(n: number, m: number, k: number, seed: number, kMax = k): Generator<number[]> {
  const r = rng(seed);
  for (let i = 0; i < m; i++) {
    const c: number[] = [];
    const width = kMax === k ? k : k + Math.floor(r() * (kMax - k + 1));
    while (c.length < width) {
      const v = 1 + Math.floor(r() * n);
      if (c.some((l) => Math.abs(l) === v)) continue;
      c.push(r() < 0.5 ? v : -v);
    }
    yield c;
  }
}

/** Writes a random k-SAT DIMACS file (widths k..kMax with `kMax`); returns its size in bytes. */
export function writeRandomCnf(path: string, n: number, m: number, k: number, seed: number, kMax = k): number {
  const fd = openSync(path, "w");
  let size = 0;
  let buf = `c seeded random ${kMax === k ? `${k}-SAT` : `clauses of widths ${k}-${kMax}`}, seed ${seed}\np cnf ${n} ${m}\n`;
  for (const c of randomClauses(n, m, k, seed, kMax)) {
    buf += `${c.join(" ")} 0\n`;
    if (buf.length > 1 << 20) {
      size += writeSync(fd, buf);
      buf = "";
    }
  }
  size += writeSync(fd, buf);
  closeSync(fd);
  return size;
}
