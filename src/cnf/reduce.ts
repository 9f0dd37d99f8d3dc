/**
 * Reducing the search register: unit propagation fixes variables (set classically, not searched)
 * and variables that occur in no remaining clause are free (any value completes a solution), so
 * only the rest are searched. Each free variable halves N; the model count is over the rest.
 *
 * Work and memory follow the literals, not the header: only variables that occur in clauses get
 * a slot (a header may declare 2^31 - 1 variables), and free variables are returned as ranges.
 */
import type { Cnf } from "./cnf.js";

/** Variables first..last (DIMACS numbers, inclusive). */
export interface VariableRange {
  /** The first variable of the range. */
  readonly first: number;
  /** The last variable of the range. */
  readonly last: number;
}

/** The reduced problem and how to map a measured result back to a full assignment. */
export interface Reduction {
  /** The formula over the searched variables only (renumbered 1..n'). */
  readonly cnf: Cnf;
  /** searched[i] is the DIMACS variable held by search-register bit i (vars[i]). */
  readonly searched: readonly number[];
  /** Variables fixed by unit propagation, with their values, in ascending order. */
  readonly fixed: ReadonlyMap<number, boolean>;
  /** Variables in no remaining clause (any value works), as ascending ranges. */
  readonly free: readonly VariableRange[];
  /** How many variables are free. */
  readonly freeCount: number;
  /** Propagation found a contradiction: no solution. */
  readonly unsat: boolean;
}

/** The sorted distinct variables that occur in clauses, and each literal as 2 * index + sign. */
export function occurringVariables(cnf: Cnf): { variables: Int32Array; literals: Int32Array } {
  const L = cnf.lits.length;
  const all = new Int32Array(L);
  for (let k = 0; k < L; k++) {
    const l = cnf.lits[k]!;
    all[k] = l < 0 ? -l : l;
  }
  all.sort();
  let count = 0;
  for (let k = 0; k < L; k++) if (k === 0 || all[k] !== all[k - 1]) all[count++] = all[k]!;
  const variables = all.slice(0, count);
  const literals = new Int32Array(L);
  for (let k = 0; k < L; k++) {
    const l = cnf.lits[k]!;
    const v = l < 0 ? -l : l;
    let lo = 0;
    let hi = count - 1;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (variables[mid]! < v) lo = mid + 1;
      else hi = mid;
    }
    literals[k] = (lo << 1) | (l < 0 ? 1 : 0);
  }
  return { variables, literals };
}

/**
 * Reduces the search register of a formula by unit propagation and by dropping variables that
 * occur in no remaining clause. Propagation is linear in the literals: each clause keeps a count
 * of its open literals and is scanned once when it becomes unit.
 *
 * @example
 * ```ts
 * reduceSearch(cnfFromClauses(3, [[1], [-1, 2]])).fixed; // Map { 1 => true, 2 => true }
 * ```
 */
export function reduceSearch(cnf: Cnf): Reduction {
  const m = cnf.clauseStart.length - 1;
  const { variables, literals } = occurringVariables(cnf);
  const V = variables.length;
  // Distinct literals per clause, tautologies marked satisfied from the start.
  const seen = new Int32Array(2 * V).fill(-1);
  const satisfied = new Uint8Array(m);
  const open = new Int32Array(m);
  const occStart = new Uint32Array(2 * V + 1);
  let unsat = false;
  for (let i = 0; i < m; i++) {
    for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
      const l = literals[k]!;
      if (seen[l ^ 1] === i) satisfied[i] = 1;
      if (seen[l] === i) continue;
      seen[l] = i;
      open[i]!++;
      occStart[l + 1]!++;
    }
    if (open[i] === 0) unsat = true;
  }
  for (let l = 0; l < 2 * V; l++) occStart[l + 1]! += occStart[l]!;
  const occ = new Int32Array(occStart[2 * V]!);
  const fill = occStart.slice(0, 2 * V);
  seen.fill(-1);
  for (let i = 0; i < m; i++) {
    for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
      const l = literals[k]!;
      if (seen[l] === i) continue;
      seen[l] = i;
      occ[fill[l]!++] = i;
    }
  }
  const value = new Int8Array(V).fill(-1);
  const queue = new Int32Array(V);
  let head = 0;
  let tail = 0;
  const assign = (l: number): void => {
    const v = l >> 1;
    if (value[v]! < 0) {
      value[v] = (l & 1) === 0 ? 1 : 0;
      queue[tail++] = l;
    } else if (value[v] !== ((l & 1) === 0 ? 1 : 0)) unsat = true;
  };
  const isTrue = (l: number): boolean => value[l >> 1] === ((l & 1) === 0 ? 1 : 0);
  // Values are set when a literal is queued and its clauses visited later, so the last open
  // literal of a clause is its first literal not yet false (it may already be true).
  const unitLiteral = (i: number): number => {
    for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
      const l = literals[k]!;
      if (value[l >> 1]! < 0 || isTrue(l)) return l;
    }
    return -1;
  };
  for (let i = 0; i < m && !unsat; i++) if (!satisfied[i] && open[i] === 1) assign(literals[cnf.clauseStart[i]!]!);
  while (head < tail && !unsat) {
    const l = queue[head++]!;
    for (let p = occStart[l]!; p < occStart[l + 1]!; p++) satisfied[occ[p]!] = 1;
    const f = l ^ 1;
    for (let p = occStart[f]!; p < occStart[f + 1]! && !unsat; p++) {
      const i = occ[p]!;
      if (satisfied[i]) continue;
      const left = --open[i]!;
      if (left === 0) unsat = true;
      else if (left === 1) {
        const u = unitLiteral(i);
        if (u < 0) unsat = true;
        else if (isTrue(u)) satisfied[i] = 1;
        else assign(u);
      }
    }
  }
  const fixed = new Map<number, boolean>();
  for (let v = 0; v < V; v++) if (value[v]! >= 0) fixed.set(variables[v]!, value[v] === 1);
  const index = new Int32Array(V); // 1-based register position + 1 of a searched variable, 0 otherwise
  const searched: number[] = [];
  const lits: number[] = [];
  const starts: number[] = [0];
  if (unsat) starts.push(0);
  else {
    for (let i = 0; i < m; i++) {
      if (satisfied[i]) continue;
      for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
        const l = literals[k]!;
        if (value[l >> 1]! < 0) index[l >> 1] = 1;
      }
    }
    for (let v = 0; v < V; v++) if (index[v] === 1) index[v] = searched.push(variables[v]!);
    for (let i = 0; i < m; i++) {
      if (satisfied[i]) continue;
      for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
        const l = literals[k]!;
        if (value[l >> 1]! < 0) lits.push((l & 1) === 0 ? index[l >> 1]! : -index[l >> 1]!);
      }
      starts.push(lits.length);
    }
  }
  // Free: every declared variable neither fixed nor searched, as the gaps between the taken ones.
  const free: VariableRange[] = [];
  let freeCount = 0;
  let next = 1;
  for (let v = 0; v <= V; v++) {
    const taken = v < V && (value[v]! >= 0 || index[v]! > 0);
    if (v < V && !taken) continue;
    const stop = v < V ? variables[v]! - 1 : cnf.variables;
    if (stop >= next) {
      free.push({ first: next, last: stop });
      freeCount += stop - next + 1;
    }
    if (v < V) next = variables[v]! + 1;
  }
  return {
    cnf: { variables: searched.length, lits: Int32Array.from(lits), clauseStart: Uint32Array.from(starts) },
    searched,
    fixed,
    free,
    freeCount,
    unsat,
  };
}

/** The variables of the free ranges, listed (for small reductions and tests). */
export function freeVariables(r: Reduction): number[] {
  const out: number[] = [];
  for (const { first, last } of r.free) for (let v = first; v <= last; v++) out.push(v);
  return out;
}
