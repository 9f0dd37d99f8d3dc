/**
 * Reducing the search register: unit propagation fixes variables (set classically, not searched)
 * and variables that occur in no remaining clause are free (any value completes a solution), so
 * only the rest are searched. Each free variable halves N; the model count is over the rest.
 */
import type { Cnf } from "../cnf/cnf.js";

/** The reduced problem and how to map a measured result back to a full assignment. */
export interface Reduction {
  /** The formula over the searched variables only (renumbered 1..n'). */
  readonly cnf: Cnf;
  /** searched[i] is the DIMACS variable held by search-register bit i (x[i]). */
  readonly searched: readonly number[];
  /** Variables fixed by unit propagation, with their values. */
  readonly fixed: ReadonlyMap<number, boolean>;
  /** Variables in no remaining clause: any value works. */
  readonly free: readonly number[];
  /** Propagation found a contradiction: no solution. */
  readonly unsat: boolean;
}

/**
 * Reduces the search register of a formula by unit propagation and by dropping variables that
 * occur in no remaining clause.
 *
 * @example
 * ```ts
 * reduceSearch(cnfFromClauses(3, [[1], [-1, 2]])).fixed; // Map { 1 => true, 2 => true }
 * ```
 */
export function reduceSearch(cnf: Cnf): Reduction {
  const n = cnf.variables;
  const m = cnf.clauseStart.length - 1;
  const value = new Int8Array(n + 1).fill(-1);
  const fixed = new Map<number, boolean>();
  let unsat = false;
  const litValue = (l: number): number => {
    const v = value[Math.abs(l)]!;
    return v < 0 ? -1 : (v === 1) === l > 0 ? 1 : 0;
  };
  for (let changed = true; changed && !unsat; ) {
    changed = false;
    for (let i = 0; i < m && !unsat; i++) {
      let open = 0;
      let last = 0;
      let sat = false;
      for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
        const x = litValue(cnf.lits[k]!);
        if (x === 1) sat = true;
        else if (x < 0) {
          open++;
          last = cnf.lits[k]!;
        }
      }
      if (sat) continue;
      if (open === 0) unsat = true;
      else if (open === 1) {
        value[Math.abs(last)] = last > 0 ? 1 : 0;
        fixed.set(Math.abs(last), last > 0);
        changed = true;
      }
    }
  }
  const remaining: number[][] = [];
  const occurs = new Uint8Array(n + 1);
  if (!unsat) {
    for (let i = 0; i < m; i++) {
      const c: number[] = [];
      let sat = false;
      for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
        const l = cnf.lits[k]!;
        const x = litValue(l);
        if (x === 1) sat = true;
        else if (x < 0) c.push(l);
      }
      if (sat) continue;
      remaining.push(c);
      for (const l of c) occurs[Math.abs(l)] = 1;
    }
  }
  const searched: number[] = [];
  const free: number[] = [];
  const index = new Int32Array(n + 1);
  for (let v = 1; v <= n; v++) {
    if (fixed.has(v)) continue;
    if (occurs[v]) {
      index[v] = searched.length + 1;
      searched.push(v);
    } else free.push(v);
  }
  const lits: number[] = [];
  const starts: number[] = [0];
  for (const c of unsat ? [[]] : remaining) {
    for (const l of c) lits.push(l > 0 ? index[l]! : -index[-l]!);
    starts.push(lits.length);
  }
  return {
    cnf: { variables: searched.length, lits: Int32Array.from(lits), clauseStart: Uint32Array.from(starts) },
    searched,
    fixed,
    free,
    unsat,
  };
}
