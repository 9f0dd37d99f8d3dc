/**
 * Simplification before synthesis: the same satisfying assignments over the declared
 * variables, fewer literals. Drops duplicate literals, tautological clauses, repeated clauses
 * and clauses subsumed by another clause (D subset of C: C holds whenever D does).
 */
import type { Cnf } from "../cnf/cnf.js";

/** What simplification removed. */
export interface SimplifyReport {
  /** Literals that stood twice in one clause. */
  readonly duplicateLiterals: number;
  /** Clauses holding a literal and its negation (always true). */
  readonly tautologies: number;
  /** Clauses equal to an earlier one. */
  readonly repeated: number;
  /** Clauses that contain another, shorter clause (true whenever it is). */
  readonly subsumed: number;
  /** False when the subsumption check ran out of budget (a formula with huge occurrence lists). */
  readonly subsumptionComplete: boolean;
}

/** A simplified formula: clauses with distinct, sorted literals; `unsat` when one is empty. */
export interface SimplifiedCnf {
  readonly variables: number;
  readonly lits: Int32Array;
  readonly clauseStart: Uint32Array;
  /** Some clause is empty: no assignment satisfies the formula. */
  readonly unsat: boolean;
  readonly report: SimplifyReport;
}

/** Clauses up to which repeats of clauses all of one length are found by hashing (the table: 2^30 slots at most). */
const REPEATS_MAX_CLAUSES = 1 << 29;
/** Budget of literal comparisons for the subsumption check (keeps it near-linear). */
const SUBSUMPTION_BUDGET = 200_000_000;
/** Clauses up to this length are sorted by insertion; longer ones by a typed-array sort. */
const INSERTION_SORT_MAX = 32;
/** A subset test walks C when C is at most this many times longer than D, else binary-searches it. */
const MERGE_RATIO = 8;

export function simplify(cnf: Cnf): SimplifiedCnf {
  const m = cnf.clauseStart.length - 1;
  const lits = new Int32Array(cnf.lits.length);
  const start = new Uint32Array(m + 1);
  let duplicateLiterals = 0;
  let tautologies = 0;
  let nl = 0;
  let nc = 0;
  let unsat = false;
  let keys = new Uint32Array(0);
  for (let i = 0; i < m; i++) {
    const s = cnf.clauseStart[i]!;
    const e = cnf.clauseStart[i + 1]!;
    const from = nl;
    if (e - s <= INSERTION_SORT_MAX) {
      // Insertion sort by variable, then sign, in place in the output: fastest for short clauses.
      for (let k = s; k < e; k++) {
        const l = cnf.lits[k]!;
        let j = nl++;
        while (j > from && litKey(lits[j - 1]!) > litKey(l)) {
          lits[j] = lits[j - 1]!;
          j--;
        }
        lits[j] = l;
      }
    } else {
      // A long clause: insertion sort would be quadratic (100,000 literals in descending order
      // took 10 s), so sort the keys numerically, O(n log n), and turn them back into literals.
      if (keys.length < e - s) keys = new Uint32Array(Math.max(e - s, 2 * keys.length));
      const k0 = keys.subarray(0, e - s);
      for (let k = s; k < e; k++) k0[k - s] = litKey(cnf.lits[k]!);
      k0.sort();
      for (let k = 0; k < k0.length; k++) lits[nl++] = keyLit(k0[k]!);
    }
    let taut = false;
    let w = from;
    for (let k = from; k < nl; k++) {
      const l = lits[k]!;
      if (w > from && lits[w - 1] === l) {
        duplicateLiterals++;
        continue;
      }
      if (w > from && lits[w - 1] === -l) taut = true;
      lits[w++] = l;
    }
    nl = w;
    if (taut) {
      tautologies++;
      nl = from;
      continue;
    }
    if (nl === from) unsat = true;
    start[++nc] = nl;
  }
  // Complementary unit clauses (v) and (-v): no assignment satisfies both.
  const unit = new Int8Array(cnf.variables + 1);
  for (let i = 0; i < nc && !unsat; i++) {
    if (start[i + 1]! - start[i]! !== 1) continue;
    const l = lits[start[i]!]!;
    const v = Math.abs(l);
    const sign = l > 0 ? 1 : -1;
    if (unit[v] === -sign) unsat = true;
    unit[v] = sign;
  }
  const { keep, repeated, subsumed, complete } = subsumption(cnf.variables, lits, start.subarray(0, nc + 1));
  const outLits = new Int32Array(nl);
  const outStart = new Uint32Array(nc + 1);
  let ol = 0;
  let oc = 0;
  for (let i = 0; i < nc; i++) {
    if (!keep[i]) continue;
    for (let k = start[i]!; k < start[i + 1]!; k++) outLits[ol++] = lits[k]!;
    outStart[++oc] = ol;
  }
  return {
    variables: cnf.variables,
    lits: outLits.subarray(0, ol),
    clauseStart: outStart.subarray(0, oc + 1),
    unsat,
    report: { duplicateLiterals, tautologies, repeated, subsumed, subsumptionComplete: complete },
  };
}

/**
 * Marks clauses subsumed by another. For each clause D (shortest first), every clause that
 * contains D contains D's least frequent literal, so only that literal's clauses are checked.
 */
function subsumption(variables: number, lits: Int32Array, start: Uint32Array) {
  const m = start.length - 1;
  const keep = new Uint8Array(m).fill(1);
  // Clauses all of one length (random k-SAT, most SATLIB families): a clause can lie inside another
  // only by being equal to it, so a hash of each sorted clause finds everything, in linear time and
  // without a budget (a million random 3-SAT clauses: some 0.1 s against 0.6 s for the occurrence
  // lists below, which may also stop at their budget where signatures collide and then miss repeats).
  let uniform = m > 0 && m <= REPEATS_MAX_CLAUSES && start[1]! > start[0]!;
  for (let i = 1; i < m && uniform; i++) uniform = start[i + 1]! - start[i]! === start[1]! - start[0]!;
  if (uniform) return { keep, repeated: repeatsOf(lits, start, keep), subsumed: 0, complete: true };
  const index = (l: number): number => (l > 0 ? 2 * l - 2 : -2 * l - 1);
  const occCount = new Uint32Array(2 * variables);
  for (const l of lits) occCount[index(l)]!++;
  const occStart = new Uint32Array(2 * variables + 1);
  for (let i = 0; i < 2 * variables; i++) occStart[i + 1] = occStart[i]! + occCount[i]!;
  // Clauses by length, then index: a counting sort (lengths are small).
  let maxLen = 0;
  for (let i = 0; i < m; i++) maxLen = Math.max(maxLen, start[i + 1]! - start[i]!);
  const byLen = new Uint32Array(maxLen + 2);
  for (let i = 0; i < m; i++) byLen[start[i + 1]! - start[i]! + 1]!++;
  for (let l = 0; l <= maxLen; l++) byLen[l + 1]! += byLen[l]!;
  const order = new Uint32Array(m);
  for (let i = 0; i < m; i++) order[byLen[start[i + 1]! - start[i]!]!++] = i;
  // A 32-bit signature per clause (one bit per literal, hashed): D can only be inside C when every
  // bit of D's signature is in C's, which rejects most candidates without comparing literals.
  const sig = new Int32Array(m);
  for (let i = 0; i < m; i++) {
    let x = 0;
    for (let k = start[i]!; k < start[i + 1]!; k++) x |= 1 << (index(lits[k]!) & 31);
    sig[i] = x;
  }
  // Each occurrence carries its clause's signature and length beside the clause: the filter, which
  // rejects nearly every candidate, then reads one list in order instead of three tables at random
  // places.
  const occ = new Uint32Array(lits.length);
  // [signature, length] pairs: one cache line for both.
  const occInfo = new Int32Array(2 * lits.length);
  const fill = occStart.slice(0, 2 * variables);
  for (let i = 0; i < m; i++) {
    for (let k = start[i]!; k < start[i + 1]!; k++) {
      const p = fill[index(lits[k]!)]!++;
      occ[p] = i;
      occInfo[2 * p] = sig[i]!;
      // Lengths past 2^31 - 1 cannot occur: a clause is shorter than the literal array (an Int32Array).
      occInfo[2 * p + 1] = start[i + 1]! - start[i]!;
    }
  }
  let repeated = 0;
  let subsumed = 0;
  let budget = SUBSUMPTION_BUDGET;
  for (const d of order) {
    if (!keep[d]) continue;
    const ds = start[d]!;
    const de = start[d + 1]!;
    if (de === ds) continue;
    let best = lits[ds]!;
    for (let k = ds + 1; k < de; k++) if (occCount[index(lits[k]!)]! < occCount[index(best)]!) best = lits[k]!;
    const bi = index(best);
    const dSig = sig[d]!;
    const dLen = de - ds;
    for (let p = occStart[bi]!; p < occStart[bi + 1]!; p++) {
      if (occInfo[2 * p + 1]! < dLen || (dSig & ~occInfo[2 * p]!) !== 0) continue;
      const c = occ[p]!;
      if (c === d || !keep[c]) continue;
      const cs = start[c]!;
      const ce = start[c + 1]!;
      budget -= containsCost(ce - cs, de - ds);
      if (budget < 0) return { keep, repeated, subsumed, complete: false };
      if (contains(lits, cs, ce, ds, de)) {
        keep[c] = 0;
        if (ce - cs === de - ds) repeated++;
        else subsumed++;
      }
    }
  }
  return { keep, repeated, subsumed, complete: true };
}

/**
 * Marks every clause equal to an earlier one (clauses sorted, all of one length) not kept; returns
 * how many.
 */
function repeatsOf(lits: Int32Array, start: Uint32Array, keep: Uint8Array): number {
  const m = start.length - 1;
  const bits = Math.max(4, Math.ceil(Math.log2(2 * m)));
  const mask = (1 << bits) - 1;
  // Clause index + 1 per slot (0: empty), open addressing.
  const table = new Int32Array(1 << bits);
  let repeated = 0;
  for (let i = 0; i < m; i++) {
    const s = start[i]!;
    const e = start[i + 1]!;
    let h = 0x811c9dc5;
    for (let k = s; k < e; k++) h = Math.imul(h ^ lits[k]!, 0x01000193);
    h = (h ^ (h >>> 15)) & mask;
    for (;;) {
      const j = table[h]! - 1;
      if (j < 0) {
        table[h] = i + 1;
        break;
      }
      const js = start[j]!;
      let equal = true;
      for (let k = 0; k < e - s && equal; k++) equal = lits[js + k] === lits[s + k];
      if (equal) {
        keep[i] = 0;
        repeated++;
        break;
      }
      h = (h + 1) & mask;
    }
  }
  return repeated;
}

/**
 * Sort key of a literal: by variable, then positive before negative. At most 2^32 - 1 for
 * variables up to 2^31 - 1, so it fits a Uint32Array.
 */
const litKey = (l: number): number => (l < 0 ? -2 * l + 1 : 2 * l);
/** The literal of a sort key. */
const keyLit = (k: number): number => (k & 1 ? -(k - 1) / 2 : k / 2);

/**
 * Literal comparisons `contains` makes: a walk over both clauses, or a binary search per literal
 * of D when C is much longer (a 100,000-literal clause checked against every short clause that
 * shares a literal with it would otherwise cost 100,000 per check).
 */
function containsCost(cLen: number, dLen: number): number {
  return cLen <= MERGE_RATIO * dLen ? cLen + dLen : dLen * (32 - Math.clz32(cLen));
}

/** True when sorted clause [ds, de) is a subset of sorted clause [cs, ce). */
function contains(lits: Int32Array, cs: number, ce: number, ds: number, de: number): boolean {
  if (ce - cs > MERGE_RATIO * (de - ds)) {
    // Binary search for each literal of D in what remains of C (D's literals ascend too).
    let lo = cs;
    for (let j = ds; j < de; j++) {
      const want = litKey(lits[j]!);
      let hi = ce;
      while (lo < hi) {
        const mid = (lo + hi) >>> 1;
        if (litKey(lits[mid]!) < want) lo = mid + 1;
        else hi = mid;
      }
      if (lo === ce || litKey(lits[lo]!) !== want) return false;
      lo++;
    }
    return true;
  }
  let i = cs;
  for (let j = ds; j < de; j++) {
    const want = litKey(lits[j]!);
    while (i < ce && litKey(lits[i]!) < want) i++;
    if (i === ce || litKey(lits[i]!) !== want) return false;
    i++;
  }
  return true;
}
