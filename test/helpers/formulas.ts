/** Formula families with published model counts, and plain reference evaluation. */
import { cnfFromClauses, type Cnf } from "./lib.js";
import { seededRandom } from "../../dist/src/util/random.js";

/** n-queens, one variable per square (row-major, 1-based). */
export function queens(n: number): Cnf {
  const v = (r: number, c: number): number => 1 + r * n + c;
  const clauses: number[][] = [];
  for (let r = 0; r < n; r++) clauses.push(Array.from({ length: n }, (_, c) => v(r, c)));
  for (let a = 0; a < n * n; a++) {
    for (let b = a + 1; b < n * n; b++) {
      const [r1, c1, r2, c2] = [Math.floor(a / n), a % n, Math.floor(b / n), b % n];
      if (r1 === r2 || c1 === c2 || Math.abs(r1 - r2) === Math.abs(c1 - c2)) clauses.push([-(a + 1), -(b + 1)]);
    }
  }
  return cnfFromClauses(n * n, clauses);
}

/** Pigeonhole PHP(pigeons, holes): every pigeon in a hole, no two in the same hole. */
export function pigeonhole(pigeons: number, holes: number): Cnf {
  const v = (p: number, h: number): number => 1 + p * holes + h;
  const clauses: number[][] = [];
  for (let p = 0; p < pigeons; p++) clauses.push(Array.from({ length: holes }, (_, h) => v(p, h)));
  for (let h = 0; h < holes; h++) {
    for (let p = 0; p < pigeons; p++) for (let q = p + 1; q < pigeons; q++) clauses.push([-v(p, h), -v(q, h)]);
  }
  return cnfFromClauses(pigeons * holes, clauses);
}

/** Proper k-colourings of a graph with a one-hot encoding: exactly one colour per vertex. */
export function colouring(vertices: number, edges: readonly (readonly [number, number])[], k: number): Cnf {
  const v = (x: number, c: number): number => 1 + x * k + c;
  const clauses: number[][] = [];
  for (let x = 0; x < vertices; x++) {
    clauses.push(Array.from({ length: k }, (_, c) => v(x, c)));
    for (let a = 0; a < k; a++) for (let b = a + 1; b < k; b++) clauses.push([-v(x, a), -v(x, b)]);
  }
  for (const [x, y] of edges) for (let c = 0; c < k; c++) clauses.push([-v(x, c), -v(y, c)]);
  return cnfFromClauses(vertices * k, clauses);
}

export { seededRandom as rng } from "../../dist/src/util/random.js";
import { randomClauses } from "../../dist/bench/random.js";

/** Random k-SAT with distinct variables per clause (the generator the benchmarks use). */
export function randomKSat(n: number, m: number, k: number, seed: number): Cnf {
  return cnfFromClauses(n, [...randomClauses(n, m, k, seed)]);
}

/** Truth-table count by plain loops: the simplest possible reference (n up to ~20). */
export function bruteCount(variables: number, clauses: readonly (readonly number[])[]): number {
  let count = 0;
  for (let x = 0; x < 2 ** variables; x++) {
    if (clauses.every((c) => c.some((l) => (Math.floor(x / 2 ** (Math.abs(l) - 1)) % 2 === 1) === l > 0))) count++;
  }
  return count;
}

/** Seeded random clauses of widths lo..hi (distinct variables per clause; a share of unit clauses). */
export function randomClausesOfWidths(seed: number, n: number, m: number, lo: number, hi: number, unitShare = 0): number[][] {
  const r = seededRandom(seed);
  const clauses: number[][] = [];
  while (clauses.length < m) {
    const k = r() < unitShare ? 1 : lo + Math.floor(r() * (hi - lo + 1));
    const c: number[] = [];
    while (c.length < k) {
      const v = 1 + Math.floor(r() * n);
      if (c.some((l) => Math.abs(l) === v)) continue;
      c.push(r() < 0.5 ? v : -v);
    }
    clauses.push(c);
  }
  return clauses;
}
