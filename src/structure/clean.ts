/**
 * The clean-up structure recovery runs first, inside this stage: synthesis's simplifier
 * (synth/simplify.ts) sits downstream of this stage and may not be imported here. It renumbers
 * the occurring variables densely, sorts each clause's literals by variable, drops repeated
 * literals, tautologies and repeated clauses. It does not remove subsumed clauses: a subsumed
 * clause can be one of a gate's defining clauses, and dropping it would hide the gate. The
 * models over the declared variables are unchanged.
 */

/** A cleaned formula over compact variables 0..u-1 (ascending in DIMACS order). */
export interface CleanCnf {
  /** Distinct variables occurring in the input's literals. */
  readonly u: number;
  /** Compact variable -> DIMACS variable, ascending. */
  readonly varOf: Int32Array;
  /** Literal codes (x << 1) | negated, sorted within each clause (by variable, then sign). */
  readonly codes: Int32Array;
  /** Clause i is codes[start[i] .. start[i+1]). */
  readonly start: Uint32Array;
  readonly duplicateLiterals: number;
  readonly tautologies: number;
  readonly duplicateClauses: number;
  /** Some clause is empty: no assignment satisfies the formula. */
  readonly empty: boolean;
}

/** Dense renumbering arrays up to this many declared variables (or 4 per literal, if more). */
const DENSE_LIMIT = 1 << 22;

export function cleanCnf(variables: number, lits: Int32Array, clauseStart: Uint32Array): CleanCnf {
  const m = clauseStart.length - 1;
  const { u, varOf, map, compact } = renumber(variables, lits);
  const codes = new Int32Array(lits.length);
  const start = new Uint32Array(m + 1);
  let duplicateLiterals = 0;
  let tautologies = 0;
  let duplicateClauses = 0;
  let empty = false;
  // Open-addressing table of kept clauses by content hash, to drop repeated clauses in one pass.
  const bits = Math.max(4, Math.ceil(Math.log2(2 * m + 2)));
  const mask = (1 << bits) - 1;
  const table = new Int32Array(1 << bits);
  let nl = 0;
  let nc = 0;
  for (let i = 0; i < m; i++) {
    const s = clauseStart[i]!;
    const e = clauseStart[i + 1]!;
    const from = nl;
    if (map !== undefined) {
      for (let k = s; k < e; k++) {
        const l = lits[k]!;
        codes[nl++] = l < 0 ? ((map[-l]! - 1) << 1) | 1 : (map[l]! - 1) << 1;
      }
    } else for (let k = s; k < e; k++) codes[nl++] = compact![k]!;
    sortRange(codes, from, nl);
    let w = from;
    let taut = false;
    for (let k = from; k < nl; k++) {
      const c = codes[k]!;
      if (w > from && codes[w - 1] === c) {
        duplicateLiterals++;
        continue;
      }
      if (w > from && codes[w - 1] === (c ^ 1)) taut = true;
      codes[w++] = c;
    }
    nl = w;
    if (taut) {
      tautologies++;
      nl = from;
      continue;
    }
    if (nl === from) empty = true;
    let h = Math.imul(nl - from, 0x9e3779b1);
    for (let k = from; k < nl; k++) h = Math.imul(h ^ codes[k]!, 0x85ebca77) ^ (h >>> 13);
    let slot = (h ^ (h >>> 16)) & mask;
    let repeated = false;
    for (;;) {
      const t = table[slot]!;
      if (t === 0) break;
      const os = start[t - 1]!;
      const oe = start[t]!;
      if (oe - os === nl - from) {
        let same = true;
        for (let k = 0; k < oe - os; k++) {
          if (codes[os + k] !== codes[from + k]) {
            same = false;
            break;
          }
        }
        if (same) {
          repeated = true;
          break;
        }
      }
      slot = (slot + 1) & mask;
    }
    if (repeated) {
      duplicateClauses++;
      nl = from;
      continue;
    }
    table[slot] = nc + 1;
    start[++nc] = nl;
  }
  return {
    u,
    varOf,
    codes: codes.subarray(0, nl),
    start: start.subarray(0, nc + 1),
    duplicateLiterals,
    tautologies,
    duplicateClauses,
    empty,
  };
}

/** Sorts codes[from, to) ascending: insertion sort for short clauses, the typed-array sort otherwise. */
function sortRange(a: Int32Array, from: number, to: number): void {
  if (to - from > 16) {
    a.subarray(from, to).sort();
    return;
  }
  for (let i = from + 1; i < to; i++) {
    const x = a[i]!;
    let j = i;
    while (j > from && a[j - 1]! > x) {
      a[j] = a[j - 1]!;
      j--;
    }
    a[j] = x;
  }
}

/**
 * Dense, order-preserving numbering of the variables that occur in `lits`: a map from DIMACS
 * variable to index + 1 when the declaration is not too sparse, else each literal's code
 * (index << 1) | negated.
 */
function renumber(variables: number, lits: Int32Array): { u: number; varOf: Int32Array; map?: Int32Array; compact?: Int32Array } {
  if (variables <= Math.max(DENSE_LIMIT, 4 * lits.length)) {
    const map = new Int32Array(variables + 1);
    for (let k = 0; k < lits.length; k++) {
      const l = lits[k]!;
      map[l < 0 ? -l : l] = 1;
    }
    let u = 0;
    for (let v = 1; v <= variables; v++) if (map[v] !== 0) map[v] = ++u;
    const varOf = new Int32Array(u);
    for (let v = 1; v <= variables; v++) if (map[v] !== 0) varOf[map[v]! - 1] = v;
    return { u, varOf, map };
  }
  // Very sparse declarations (say 2^31 - 1 declared, a few used): sort the distinct variables.
  const all = new Int32Array(lits.length);
  for (let k = 0; k < lits.length; k++) all[k] = Math.abs(lits[k]!);
  all.sort();
  let u = 0;
  for (let k = 0; k < all.length; k++) if (k === 0 || all[k] !== all[k - 1]) all[u++] = all[k]!;
  const varOf = all.slice(0, u);
  const map = new Map<number, number>();
  for (let i = 0; i < u; i++) map.set(varOf[i]!, i);
  const compact = new Int32Array(lits.length);
  for (let k = 0; k < lits.length; k++) {
    const l = lits[k]!;
    compact[k] = (map.get(Math.abs(l))! << 1) | (l < 0 ? 1 : 0);
  }
  return { u, varOf, compact };
}
