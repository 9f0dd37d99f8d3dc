/**
 * Cheap model finding for sampled verification: WalkSAT (Selman, Kautz & Cohen 1994) with a
 * seeded random walk and a flip budget. Finds some satisfying assignments quickly on formulas
 * that have many; finds none (and says nothing about satisfiability) when the budget runs out.
 */
import type { Cnf } from "./cnf.js";

/** Up to `max` distinct models, each as a Uint8Array of 0/1 indexed by variable - 1. */
export function findModels(cnf: Cnf, max: number, seed: number, flipBudget = 200_000): Uint8Array[] {
  const n = cnf.variables;
  const m = cnf.clauseStart.length - 1;
  const { lits, clauseStart } = cnf;
  for (let i = 0; i < m; i++) if (clauseStart[i + 1] === clauseStart[i]) return []; // an empty clause
  let s = seed >>> 0 || 1;
  const rand = (): number => {
    s ^= s << 13;
    s ^= s >>> 17;
    s ^= s << 5;
    return (s >>> 0) / 4294967296;
  };
  // Occurrence lists: clauses of each literal (index 2v for +v, 2v+1 for -v).
  const occStart = new Uint32Array(2 * n + 3);
  for (const l of lits) occStart[litIndex(l) + 1]!++;
  for (let i = 0; i < 2 * n + 2; i++) occStart[i + 1]! += occStart[i]!;
  const occ = new Uint32Array(lits.length);
  const fill = occStart.slice();
  for (let i = 0; i < m; i++) for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) occ[fill[litIndex(lits[k]!)]!++] = i;

  const models: Uint8Array[] = [];
  const seen = new Set<string>();
  let budget = flipBudget;
  while (models.length < max && budget > 0) {
    const x = new Uint8Array(n);
    for (let v = 0; v < n; v++) x[v] = rand() < 0.5 ? 1 : 0;
    const trueCount = new Int32Array(m);
    const unsat: number[] = [];
    const where = new Int32Array(m).fill(-1);
    const isTrue = (l: number): boolean => (x[Math.abs(l) - 1] === 1) === l > 0;
    for (let i = 0; i < m; i++) {
      for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) if (isTrue(lits[k]!)) trueCount[i]!++;
      if (trueCount[i] === 0) {
        where[i] = unsat.length;
        unsat.push(i);
      }
    }
    const removeUnsat = (i: number): void => {
      const p = where[i]!;
      const last = unsat.pop()!;
      if (last !== i) {
        unsat[p] = last;
        where[last] = p;
      }
      where[i] = -1;
    };
    const flip = (v: number): void => {
      const becomesTrue = x[v - 1] === 1 ? -v : v;
      x[v - 1]! ^= 1;
      const up = litIndex(becomesTrue);
      for (let p = occStart[up]!; p < occStart[up + 1]!; p++) {
        const i = occ[p]!;
        if (trueCount[i]!++ === 0) removeUnsat(i);
      }
      const down = litIndex(-becomesTrue);
      for (let p = occStart[down]!; p < occStart[down + 1]!; p++) {
        const i = occ[p]!;
        if (--trueCount[i]! === 0) {
          where[i] = unsat.length;
          unsat.push(i);
        }
      }
    };
    // Break count of flipping v: clauses that v alone makes true.
    const breaks = (v: number): number => {
      const l = x[v - 1] === 1 ? v : -v;
      let b = 0;
      const li = litIndex(l);
      for (let p = occStart[li]!; p < occStart[li + 1]!; p++) if (trueCount[occ[p]!] === 1) b++;
      return b;
    };
    for (let tries = Math.min(budget, 10 * n + 1000); tries > 0 && unsat.length > 0; tries--, budget--) {
      const i = unsat[Math.floor(rand() * unsat.length)]!;
      let pick = 0;
      if (rand() < 0.5) pick = Math.abs(lits[clauseStart[i]! + Math.floor(rand() * (clauseStart[i + 1]! - clauseStart[i]!))]!);
      else {
        let best = Infinity;
        for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) {
          const v = Math.abs(lits[k]!);
          const b = breaks(v);
          if (b < best) [best, pick] = [b, v];
        }
      }
      flip(pick);
    }
    if (unsat.length === 0) {
      const key = x.join("");
      if (!seen.has(key)) {
        seen.add(key);
        models.push(x);
      }
    }
    budget -= 1;
  }
  return models;
}

function litIndex(l: number): number {
  return l > 0 ? 2 * l : -2 * l + 1;
}
