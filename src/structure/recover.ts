/**
 * Structure recovery over compact variables: gate definitions, standalone parity constraints and
 * at-most-one / exactly-one groups, each consuming exactly the clauses that encode it.
 *
 * Published background:
 *  - gate detection by clause patterns during SAT preprocessing: N. Een and A. Biere 2005,
 *    "Effective preprocessing in SAT through variable and clause elimination" (SatELite): an AND
 *    gate y <-> l1 & ... & lk is the long clause (y | ~l1 | ... | ~lk) plus the k binary clauses
 *    (~y | li); an OR gate is the same pattern with y negated;
 *  - XOR recovery: M. Soos, K. Nohl and C. Castelluccia 2009, "Extending SAT solvers to
 *    cryptographic problems" (CryptoMiniSat): a k-variable XOR is the 2^(k-1) clauses over the
 *    same variables whose numbers of negated literals share one parity; found by grouping
 *    clauses by variable set;
 *  - cardinality detection: A. Biere, D. Le Berre, E. Lonca and N. Manthey 2014, "Detecting
 *    cardinality constraints in CNF": at-most-one constraints as cliques in the graph of binary
 *    clauses over negative literals, grown greedily.
 *
 * Order of the greedy choices (each step consumes clauses no earlier step consumed):
 *  1. (with prefer "groups" only) exactly-one and at-most-one groups;
 *  2. candidate definitions ("structures"): every AND / OR pattern (one per long clause and
 *     output literal) and every complete XOR group (equivalence and negation are its 2-variable
 *     case); an AND / OR candidate can define only its output, an XOR group any of its variables;
 *  3. peeling from the outputs: a variable that occurs in exactly one pending structure, which
 *     can define it, is defined by it. On a Tseitin-encoded circuit the last gates' outputs occur
 *     only in their own gates, so this defines the circuit gate by gate from the outputs back and
 *     leaves exactly the inputs free; definitions made this way cannot form a cycle (a peeled
 *     variable occurs in no structure still pending, so no later definition can read it);
 *  4. when peeling is stuck (a core where every variable is shared): an XOR group with one unknown
 *     variable defines it; else the next AND / OR candidate in clause order defines its output;
 *     else the next XOR group defines its unknown variable that occurs in the fewest pending
 *     structures (ties: the largest variable, which encoders usually give to gate outputs). Then
 *     peeling resumes. An XOR group that can define nothing becomes a standalone parity
 *     constraint; a candidate that lost a clause to another definition is dropped;
 *  5. (by default) exactly-one groups (an all-positive clause over a clique of negative binary
 *     clauses), then at-most-one cliques of at least 3 variables among the negative binary clauses
 *     left. Definitions go first because they shrink the search space; a one-hot group's
 *     at-least-one clause with its pairwise clauses is also a NOR definition of one member.
 * A definition is accepted only when its variable is not yet defined and no input depends on it
 * (checked by a depth-first search over the definitions so far, with a global budget; past the
 * budget a definition that would need the search is refused, so the result is always acyclic).
 */
import { cleanCnf, type CleanCnf } from "./clean.js";

export const EQUIV = 0;
export const NOT = 1;
export const AND = 2;
export const OR = 3;
export const XOR = 4;
export const XNOR = 5;

/** Widest XOR recognized: 2^15 clauses. */
const MAX_XOR_WIDTH = 16;
/** Total nodes the cycle checks may visit over one recovery. */
const CYCLE_BUDGET = 20_000_000;
/** Neighbours considered when growing an at-most-one clique from one variable. */
const CLIQUE_CANDIDATES = 256;
/** Rounds of dropping AND / OR candidates that borrow another structure's binary clause. */
const BORROW_ROUNDS = 8;
/** Smallest at-most-one / exactly-one group reported (a 2-variable one is a single clause). */
const MIN_GROUP = 3;

/** Why a clause was consumed. */
export const KEPT = 0;
export const BY_DEFINITION = 1;
export const BY_PARITY = 2;
export const BY_GROUP = 3;

/** The recovered structure over compact variables (see clean.ts). */
export interface RawStructure {
  readonly clean: CleanCnf;
  /** Per cleaned clause: KEPT, BY_DEFINITION, BY_PARITY or BY_GROUP. */
  readonly consumed: Uint8Array;
  /** Definitions in topological order: variable, kind, inputs as codes. */
  readonly defVar: Int32Array;
  readonly defKind: Uint8Array;
  readonly defInStart: Uint32Array;
  readonly defIn: Int32Array;
  /** Compact variable -> 1 when it occurs in a cleaned clause. */
  readonly occurs: Uint8Array;
  /** Compact variable -> 1 when defined. */
  readonly defined: Uint8Array;
  readonly parStart: Uint32Array;
  readonly parVars: Int32Array;
  readonly parValue: Uint8Array;
  readonly grpStart: Uint32Array;
  readonly grpVars: Int32Array;
  readonly grpExactlyOne: Uint8Array;
  /** Definitions refused because they would have closed a cycle. */
  readonly cyclesRefused: number;
  /** The cycle-check budget ran out (some definitions were refused without a full check). */
  readonly budgetExhausted: boolean;
}

/** Binary clauses by their two literal codes, for O(1) membership tests. */
class PairTable {
  private readonly a: Int32Array;
  private readonly b: Int32Array;
  private readonly v: Int32Array;
  private readonly mask: number;
  constructor(capacity: number) {
    const bits = Math.max(4, Math.ceil(Math.log2(2 * capacity + 2)));
    this.mask = (1 << bits) - 1;
    this.a = new Int32Array(1 << bits).fill(-1);
    this.b = new Int32Array(1 << bits);
    this.v = new Int32Array(1 << bits);
  }
  private slot(x: number, y: number): number {
    let h = Math.imul(x, 0x9e3779b1) ^ Math.imul(y + 0x7f4a7c15, 0x85ebca77);
    h ^= h >>> 15;
    return h & this.mask;
  }
  set(x: number, y: number, value: number): void {
    const lo = x < y ? x : y;
    const hi = x < y ? y : x;
    let s = this.slot(lo, hi);
    while (this.a[s] !== -1) s = (s + 1) & this.mask;
    this.a[s] = lo;
    this.b[s] = hi;
    this.v[s] = value;
  }
  /** The clause (x | y), or -1. */
  get(x: number, y: number): number {
    const lo = x < y ? x : y;
    const hi = x < y ? y : x;
    let s = this.slot(lo, hi);
    for (;;) {
      const k = this.a[s]!;
      if (k === -1) return -1;
      if (k === lo && this.b[s] === hi) return this.v[s]!;
      s = (s + 1) & this.mask;
    }
  }
}

/** Growable Int32 list (amortized doubling; no per-element objects). */
class IntList {
  data: Int32Array;
  length = 0;
  constructor(capacity = 16) {
    this.data = new Int32Array(Math.max(1, capacity));
  }
  push(x: number): void {
    if (this.length === this.data.length) {
      const d = new Int32Array(this.data.length * 2);
      d.set(this.data);
      this.data = d;
    }
    this.data[this.length++] = x;
  }
  view(): Int32Array {
    return this.data.subarray(0, this.length);
  }
}

export function recoverRaw(variables: number, lits: Int32Array, clauseStart: Uint32Array, preferGroups: boolean): RawStructure {
  const clean = cleanCnf(variables, lits, clauseStart);
  const { u, codes, start } = clean;
  const m = start.length - 1;
  const consumed = new Uint8Array(m);
  const occurs = new Uint8Array(u);
  for (let k = 0; k < codes.length; k++) occurs[codes[k]! >>> 1] = 1;

  // Binary clauses: a pair table and, per literal, how many binary clauses contain it.
  let binaries = 0;
  for (let i = 0; i < m; i++) if (start[i + 1]! - start[i]! === 2) binaries++;
  const pairs = new PairTable(binaries);
  const binCount = new Uint32Array(2 * u);
  for (let i = 0; i < m; i++) {
    const s = start[i]!;
    if (start[i + 1]! - s !== 2) continue;
    pairs.set(codes[s]!, codes[s + 1]!, i);
    binCount[codes[s]!]!++;
    binCount[codes[s + 1]!]!++;
  }
  /** The unconsumed binary clause (x | y), or -1. */
  const freeBinary = (x: number, y: number): number => {
    const c = pairs.get(x, y);
    return c >= 0 && consumed[c] === KEPT ? c : -1;
  };

  // ---- definitions, with an incremental acyclicity check ----
  const defOf = new Int32Array(u).fill(-1);
  const dependents = new Uint32Array(u);
  const dVar = new IntList();
  const dKind = new IntList();
  const dInStart = new IntList();
  dInStart.push(0);
  const dIn = new IntList();
  const mark = new Int32Array(u);
  let stamp = 0;
  const stack = new Int32Array(u);
  let budget = CYCLE_BUDGET;
  let budgetExhausted = false;
  let cyclesRefused = 0;

  /** True when defining v from the input codes ins[from, to) keeps the definitions acyclic. */
  function canDefine(v: number, ins: Int32Array, from: number, to: number): boolean {
    if (defOf[v]! >= 0) return false;
    let anyDefined = false;
    for (let k = from; k < to; k++) {
      const x = ins[k]! >>> 1;
      if (x === v) return false;
      if (defOf[x]! >= 0) anyDefined = true;
    }
    // Nothing depends on v yet, or every input is undefined (has no inputs of its own): no cycle.
    if (dependents[v] === 0 || !anyDefined) return true;
    stamp++;
    let sp = 0;
    for (let k = from; k < to; k++) {
      const x = ins[k]! >>> 1;
      if (defOf[x]! >= 0 && mark[x] !== stamp) {
        mark[x] = stamp;
        stack[sp++] = x;
      }
    }
    while (sp > 0) {
      if (--budget < 0) {
        budgetExhausted = true;
        return false;
      }
      const x = stack[--sp]!;
      const d = defOf[x]!;
      for (let k = dInStart.data[d]!, e = dInStart.data[d + 1]!; k < e; k++) {
        const y = dIn.data[k]! >>> 1;
        if (y === v) {
          cyclesRefused++;
          return false;
        }
        if (defOf[y]! >= 0 && mark[y] !== stamp) {
          mark[y] = stamp;
          stack[sp++] = y;
        }
      }
    }
    return true;
  }

  function commit(v: number, kind: number, ins: Int32Array, from: number, to: number): void {
    defOf[v] = dVar.length;
    dVar.push(v);
    dKind.push(kind);
    for (let k = from; k < to; k++) {
      dIn.push(ins[k]!);
      dependents[ins[k]! >>> 1]!++;
    }
    dInStart.push(dIn.length);
  }

  // ---- groups (at-most-one, exactly-one) ----
  const gStart = new IntList();
  gStart.push(0);
  const gVars = new IntList();
  const gEo = new IntList();
  const inGroup = new Uint8Array(u);

  function findGroups(): void {
    // Negative binary clauses still unconsumed, as adjacency lists over variables.
    const deg = new Uint32Array(u + 1);
    for (let i = 0; i < m; i++) {
      const s = start[i]!;
      if (start[i + 1]! - s !== 2 || consumed[i] !== KEPT) continue;
      const a = codes[s]!;
      const b = codes[s + 1]!;
      if ((a & b & 1) === 0) continue;
      deg[(a >>> 1) + 1]!++;
      deg[(b >>> 1) + 1]!++;
    }
    for (let x = 0; x < u; x++) deg[x + 1]! += deg[x]!;
    const adj = new Int32Array(deg[u]!);
    const fill = deg.slice(0, u);
    for (let i = 0; i < m; i++) {
      const s = start[i]!;
      if (start[i + 1]! - s !== 2 || consumed[i] !== KEPT) continue;
      const a = codes[s]!;
      const b = codes[s + 1]!;
      if ((a & b & 1) === 0) continue;
      adj[fill[a >>> 1]!++] = b >>> 1;
      adj[fill[b >>> 1]!++] = a >>> 1;
    }
    const edge = (x: number, y: number): number => freeBinary((x << 1) | 1, (y << 1) | 1);
    const record = (members: Int32Array, count: number, eo: boolean): void => {
      for (let p = 0; p < count; p++) {
        const x = members[p]!;
        inGroup[x] = 1;
        gVars.push(x);
        for (let q = p + 1; q < count; q++) consumed[edge(x, members[q]!)] = BY_GROUP;
      }
      gStart.push(gVars.length);
      gEo.push(eo ? 1 : 0);
    };
    // Exactly-one: an all-positive clause whose variables are pairwise excluded.
    const members = new Int32Array(u);
    for (let i = 0; i < m; i++) {
      const s = start[i]!;
      const e = start[i + 1]!;
      if (e - s < MIN_GROUP || consumed[i] !== KEPT) continue;
      let ok = true;
      for (let k = s; k < e && ok; k++) ok = (codes[k]! & 1) === 0 && inGroup[codes[k]! >>> 1] === 0;
      for (let k = s; k < e && ok; k++) {
        for (let q = k + 1; q < e && ok; q++) ok = edge(codes[k]! >>> 1, codes[q]! >>> 1) >= 0;
      }
      if (!ok) continue;
      for (let k = s; k < e; k++) members[k - s] = codes[k]! >>> 1;
      consumed[i] = BY_GROUP;
      record(members, e - s, true);
    }
    // At-most-one: grow a clique greedily from each variable, neighbours in clause order.
    for (let x = 0; x < u; x++) {
      if (inGroup[x] || deg[x + 1]! - deg[x]! < MIN_GROUP - 1) continue;
      let count = 0;
      members[count++] = x;
      let considered = 0;
      for (let p = deg[x]!; p < deg[x + 1]! && considered < CLIQUE_CANDIDATES; p++) {
        const y = adj[p]!;
        if (inGroup[y] || edge(x, y) < 0) continue;
        considered++;
        let ok = true;
        for (let q = 1; q < count && ok; q++) ok = edge(y, members[q]!) >= 0;
        if (ok) members[count++] = y;
      }
      if (count >= MIN_GROUP) record(members, count, false);
    }
  }

  if (preferGroups) findGroups();

  // ---- candidate definitions ("structures") ----
  // AND / OR: (o | x1 | ... | xk) with (~o | ~xi) for every i means o <-> AND(~xi).
  const cClause = new IntList();
  const cOut = new IntList();
  const cBinStart = new IntList();
  cBinStart.push(0);
  const cBins = new IntList();
  for (let i = 0; i < m; i++) {
    const s = start[i]!;
    const e = start[i + 1]!;
    const w = e - s;
    if (w < 3 || consumed[i] !== KEPT) continue;
    for (let p = s; p < e; p++) {
      const no = codes[p]! ^ 1;
      if (binCount[no]! < w - 1) continue;
      let ok = true;
      for (let q = s; q < e && ok; q++) if (q !== p) ok = freeBinary(no, codes[q]! ^ 1) >= 0;
      if (!ok) continue;
      cClause.push(i);
      cOut.push(codes[p]!);
      for (let q = s; q < e; q++) if (q !== p) cBins.push(freeBinary(no, codes[q]! ^ 1));
      cBinStart.push(cBins.length);
    }
  }
  const A = cClause.length;
  // XOR / XNOR (and equivalence / negation, their 2-variable case).
  const xor = findXorGroups(clean, consumed);
  const G = xor.count;
  const S = A + G;
  // Variables and clauses of every structure s (AND candidates first, then XOR groups).
  const sVarStart = new Uint32Array(S + 1);
  const sClauseStart = new Uint32Array(S + 1);
  for (let s = 0; s < S; s++) {
    if (s < A) {
      const i = cClause.data[s]!;
      sVarStart[s + 1] = sVarStart[s]! + start[i + 1]! - start[i]!;
      sClauseStart[s + 1] = sClauseStart[s]! + 1 + cBinStart.data[s + 1]! - cBinStart.data[s]!;
    } else {
      const g = s - A;
      sVarStart[s + 1] = sVarStart[s]! + xor.varStart[g + 1]! - xor.varStart[g]!;
      sClauseStart[s + 1] = sClauseStart[s]! + xor.clauseStartG[g + 1]! - xor.clauseStartG[g]!;
    }
  }
  const sVars = new Int32Array(sVarStart[S]!);
  const sClauses = new Int32Array(sClauseStart[S]!);
  for (let s = 0; s < S; s++) {
    let pv = sVarStart[s]!;
    let pcl = sClauseStart[s]!;
    if (s < A) {
      const i = cClause.data[s]!;
      for (let k = start[i]!; k < start[i + 1]!; k++) sVars[pv++] = codes[k]! >>> 1;
      sClauses[pcl++] = i;
      for (let k = cBinStart.data[s]!; k < cBinStart.data[s + 1]!; k++) sClauses[pcl++] = cBins.data[k]!;
    } else {
      const g = s - A;
      for (let k = xor.varStart[g]!; k < xor.varStart[g + 1]!; k++) sVars[pv++] = xor.vars[k]!;
      for (let k = xor.clauseStartG[g]!; k < xor.clauseStartG[g + 1]!; k++) sClauses[pcl++] = xor.clausesG[k]!;
    }
  }
  const varStructs = invert(sVarStart, sVars, u);
  const clauseStructs = invert(sClauseStart, sClauses, m);
  const pending = new Uint8Array(S).fill(1);
  // A long clause can match several AND / OR candidates (say y = AND(~a, b) while another gate
  // implies a -> b: then a = AND(~y, b) matches too). The gate the encoder wrote owns its binary
  // clauses; a coincidental match borrows one from another structure. Where a clause has a
  // candidate that borrows nothing, its borrowing candidates are dropped.
  // Dropping a borrower can clear another candidate of borrowing, so this repeats (a few rounds).
  const borrows = new Uint8Array(A);
  for (let round = 0, changed = true; changed && round < BORROW_ROUNDS; round++) {
    changed = false;
    borrows.fill(0);
    for (let s = 0; s < A; s++) {
      if (!pending[s]) continue;
      for (let k = sClauseStart[s]! + 1; k < sClauseStart[s + 1]! && !borrows[s]; k++) {
        const c = sClauses[k]!;
        for (let p = clauseStructs.start[c]!; p < clauseStructs.start[c + 1]!; p++) {
          const t = clauseStructs.list[p]!;
          if (pending[t] && (t >= A || cClause.data[t] !== cClause.data[s])) borrows[s] = 1;
        }
      }
    }
    for (let s = 0; s < A; ) {
      let e = s;
      let owner = false;
      for (; e < A && cClause.data[e] === cClause.data[s]; e++) if (pending[e] && !borrows[e]) owner = true;
      if (owner) {
        for (let t = s; t < e; t++) {
          if (pending[t] && borrows[t]) {
            pending[t] = 0;
            changed = true;
          }
        }
      }
      s = e;
    }
  }
  const pc = new Int32Array(u);
  for (let s = 0; s < S; s++) if (pending[s]) for (let k = sVarStart[s]!; k < sVarStart[s + 1]!; k++) pc[sVars[k]!]!++;
  const undef = new Int32Array(G);
  for (let g = 0; g < G; g++) undef[g] = xor.varStart[g + 1]! - xor.varStart[g]!;
  const peel = new Int32Array(u + sVars.length + 1);
  let ph = 0;
  let pt = 0;
  for (let x = 0; x < u; x++) if (pc[x] === 1) peel[pt++] = x;
  const xorPeel = new Int32Array(u + sVars.length + 1);
  let xh = 0;
  let xt = 0;
  const fwd = new Int32Array(G + sVars.length + 1);
  let fh = 0;
  let ft = 0;
  const pStart = new IntList();
  pStart.push(0);
  const pVars = new IntList();
  const pValue = new IntList();

  // Variables by number of pending structures (lazy bucket queue, for the core choices).
  let maxPc = 0;
  for (let x = 0; x < u; x++) maxPc = Math.max(maxPc, pc[x]!);
  const bHead = new Int32Array(maxPc + 1).fill(-1);
  const bNext = new Int32Array(u + sVars.length + 1);
  const bVal = new Int32Array(u + sVars.length + 1);
  let bn = 0;
  let bMin = maxPc + 1;
  const bPush = (x: number): void => {
    const b = pc[x]!;
    if (b < 2) return;
    bVal[bn] = x;
    bNext[bn] = bHead[b]!;
    bHead[b] = bn++;
    if (b < bMin) bMin = b;
  };
  for (let x = 0; x < u; x++) bPush(x);
  const tried = new Uint8Array(u);
  const refused = new Uint8Array(G);
  /** The undefined, untried variable in the fewest pending structures (ties: last pushed), or -1. */
  const popMin = (): number => {
    while (bMin <= maxPc) {
      const e = bHead[bMin]!;
      if (e < 0) {
        bMin++;
        continue;
      }
      bHead[bMin] = bNext[e]!;
      const x = bVal[e]!;
      if (pc[x] === bMin && defOf[x]! < 0 && !tried[x]) return x;
    }
    return -1;
  };
  const remove = (s: number): void => {
    pending[s] = 0;
    for (let k = sVarStart[s]!; k < sVarStart[s + 1]!; k++) {
      const x = sVars[k]!;
      if (--pc[x]! === 1) peel[pt++] = x;
      else bPush(x);
    }
  };
  /** An XOR group that defines nothing: a standalone parity constraint. */
  const asParity = (g: number): void => {
    for (let k = xor.varStart[g]!; k < xor.varStart[g + 1]!; k++) pVars.push(xor.vars[k]!);
    pStart.push(pVars.length);
    pValue.push(xor.value[g]!);
    for (let k = xor.clauseStartG[g]!; k < xor.clauseStartG[g + 1]!; k++) consumed[xor.clausesG[k]!] = BY_PARITY;
    remove(A + g);
  };
  const ins = new Int32Array(Math.max(MAX_XOR_WIDTH, maxWidth(start)));
  /** Defines v by structure s if that keeps the definitions acyclic; updates the bookkeeping. */
  const define = (s: number, v: number): boolean => {
    let n = 0;
    let kind: number;
    if (s < A) {
      const o = cOut.data[s]!;
      // o positive: v = AND(~xi); o negative: ~v = AND(~xi), so v = OR(xi).
      const positive = (o & 1) === 0;
      const i = cClause.data[s]!;
      for (let k = start[i]!; k < start[i + 1]!; k++) if (codes[k] !== o) ins[n++] = positive ? codes[k]! ^ 1 : codes[k]!;
      kind = positive ? AND : OR;
    } else {
      const g = s - A;
      for (let k = xor.varStart[g]!; k < xor.varStart[g + 1]!; k++) if (xor.vars[k] !== v) ins[n++] = xor.vars[k]! << 1;
      kind = n === 1 ? (xor.value[g] ? NOT : EQUIV) : xor.value[g] ? XNOR : XOR;
    }
    if (!canDefine(v, ins, 0, n)) return false;
    commit(v, kind, ins, 0, n);
    for (let k = sClauseStart[s]!; k < sClauseStart[s + 1]!; k++) consumed[sClauses[k]!] = BY_DEFINITION;
    remove(s);
    // Structures that shared a clause with s are gone (their clauses are no longer all there).
    for (let k = sClauseStart[s]!; k < sClauseStart[s + 1]!; k++) {
      const c = sClauses[k]!;
      for (let p = clauseStructs.start[c]!; p < clauseStructs.start[c + 1]!; p++) if (pending[clauseStructs.list[p]!]) remove(clauseStructs.list[p]!);
    }
    // AND candidates for v can define nothing now; XOR groups with v have one fewer unknown.
    for (let p = varStructs.start[v]!; p < varStructs.start[v + 1]!; p++) {
      const t = varStructs.list[p]!;
      if (!pending[t]) continue;
      if (t < A) {
        if (cOut.data[t]! >>> 1 === v) remove(t);
      } else if (--undef[t - A]! <= 1) fwd[ft++] = t - A;
    }
    return true;
  };

  for (;;) {
    // 1. Peel from the outputs: a variable in exactly one pending structure that can define it.
    // AND / OR outputs first (they are unambiguous); an XOR group then defines its largest
    // variable that occurs in no other pending structure (encoders number outputs last).
    if (ph < pt) {
      const x = peel[ph++]!;
      if (pc[x] !== 1 || defOf[x]! >= 0) continue;
      let s = -1;
      for (let p = varStructs.start[x]!; p < varStructs.start[x + 1]! && s < 0; p++) if (pending[varStructs.list[p]!]) s = varStructs.list[p]!;
      if (s < 0) continue;
      if (s < A) {
        if (cOut.data[s]! >>> 1 === x) define(s, x);
      } else xorPeel[xt++] = s;
      continue;
    }
    if (xh < xt) {
      const s = xorPeel[xh++]!;
      if (!pending[s]) continue;
      let v = -1;
      for (let k = sVarStart[s]!; k < sVarStart[s + 1]!; k++) {
        const y = sVars[k]!;
        if (pc[y] === 1 && defOf[y]! < 0 && y > v) v = y;
      }
      if (v >= 0) define(s, v);
      continue;
    }
    // 2. An XOR group with at most one unknown variable: define it, or keep the group as a parity.
    if (fh < ft) {
      const g = fwd[fh++]!;
      if (!pending[A + g]) continue;
      let v = -1;
      for (let k = xor.varStart[g]!; k < xor.varStart[g + 1]!; k++) if (defOf[xor.vars[k]!]! < 0) v = xor.vars[k]!;
      if (v < 0 || !define(A + g, v)) asParity(g);
      continue;
    }
    // 3. The core: the variable in the fewest pending structures, defined by an AND / OR
    // candidate with that output if one can, else by an XOR group holding it.
    const x = popMin();
    if (x < 0) break;
    tried[x] = 1;
    let done = false;
    for (let p = varStructs.start[x]!; p < varStructs.start[x + 1]! && !done; p++) {
      const t = varStructs.list[p]!;
      if (t < A && pending[t] && cOut.data[t]! >>> 1 === x && !(done = define(t, x))) remove(t);
    }
    // Among XOR groups, the one with the fewest unknown variables first: a wider choice is
    // better left to groups that have more variables to give.
    while (!done) {
      let best = -1;
      for (let p = varStructs.start[x]!; p < varStructs.start[x + 1]!; p++) {
        const t = varStructs.list[p]!;
        if (t >= A && pending[t] && !refused[t - A] && (best < 0 || undef[t - A]! < undef[best - A]!)) best = t;
      }
      if (best < 0) break;
      if (!(done = define(best, x))) refused[best - A] = 1;
    }
    for (let p = varStructs.start[x]!; p < varStructs.start[x + 1]!; p++) if (varStructs.list[p]! >= A) refused[varStructs.list[p]! - A] = 0;
  }
  // XOR groups that defined nothing are standalone parity constraints.
  for (let g = 0; g < G; g++) if (pending[A + g]) asParity(g);

  if (!preferGroups) findGroups();

  // ---- topological order of the definitions (inputs first), by a post-order walk ----
  const D = dVar.length;
  const order = new Int32Array(D);
  let on = 0;
  const state = new Uint8Array(D);
  const dstack = new Int32Array(D);
  const pos = new Int32Array(D);
  for (let x = 0; x < u; x++) {
    const root = defOf[x]!;
    if (root < 0 || state[root]) continue;
    let sp = 0;
    dstack[sp] = root;
    pos[sp++] = dInStart.data[root]!;
    state[root] = 1;
    while (sp > 0) {
      const d = dstack[sp - 1]!;
      const p = pos[sp - 1]!;
      if (p < dInStart.data[d + 1]!) {
        pos[sp - 1] = p + 1;
        const c = defOf[dIn.data[p]! >>> 1]!;
        if (c >= 0 && state[c] === 0) {
          state[c] = 1;
          dstack[sp] = c;
          pos[sp++] = dInStart.data[c]!;
        }
      } else {
        state[d] = 2;
        order[on++] = d;
        sp--;
      }
    }
  }
  const defVar = new Int32Array(D);
  const defKind = new Uint8Array(D);
  const defInStart = new Uint32Array(D + 1);
  const defIn = new Int32Array(dIn.length);
  let w = 0;
  for (let i = 0; i < D; i++) {
    const d = order[i]!;
    defVar[i] = dVar.data[d]!;
    defKind[i] = dKind.data[d]!;
    for (let k = dInStart.data[d]!; k < dInStart.data[d + 1]!; k++) defIn[w++] = dIn.data[k]!;
    defInStart[i + 1] = w;
  }
  const defined = new Uint8Array(u);
  for (let i = 0; i < D; i++) defined[defVar[i]!] = 1;

  return {
    clean,
    consumed,
    defVar,
    defKind,
    defInStart,
    defIn,
    occurs,
    defined,
    parStart: Uint32Array.from(pStart.view()),
    parVars: pVars.view().slice(),
    parValue: Uint8Array.from(pValue.view()),
    grpStart: Uint32Array.from(gStart.view()),
    grpVars: gVars.view().slice(),
    grpExactlyOne: Uint8Array.from(gEo.view()),
    cyclesRefused,
    budgetExhausted,
  };
}

/** Inverts a CSR relation "s -> items" into "item -> s" over items 0..n-1. */
function invert(rowStart: Uint32Array, items: Int32Array, n: number): { start: Uint32Array; list: Int32Array } {
  const start = new Uint32Array(n + 1);
  for (let k = 0; k < items.length; k++) start[items[k]! + 1]!++;
  for (let x = 0; x < n; x++) start[x + 1]! += start[x]!;
  const fill = start.slice(0, n);
  const list = new Int32Array(items.length);
  for (let s = 0; s + 1 < rowStart.length; s++) for (let k = rowStart[s]!; k < rowStart[s + 1]!; k++) list[fill[items[k]!]!++] = s;
  return { start, list };
}

function maxWidth(start: Uint32Array): number {
  let w = 0;
  for (let i = 0; i + 1 < start.length; i++) w = Math.max(w, start[i + 1]! - start[i]!);
  return w;
}

interface XorGroups {
  count: number;
  /** Group g's variables (compact, ascending): vars[varStart[g] .. varStart[g+1]). */
  varStart: Uint32Array;
  vars: Int32Array;
  clauseStartG: Uint32Array;
  clausesG: Int32Array;
  /** XOR of the group's variables (1 when the clauses forbid the even-parity assignments). */
  value: Uint8Array;
}

/**
 * Groups unconsumed clauses of width 2..MAX_XOR_WIDTH by variable set (a hash of the sorted
 * variables, chained buckets) and keeps the sets holding all 2^(w-1) clauses of one sign parity.
 * A clause over variables v1..vw forbids exactly one assignment: vi = 1 where the literal is
 * negated. If every forbidden assignment has parity p (the number of negated literals mod 2),
 * and all 2^(w-1) of them are forbidden, the clauses say exactly v1 ^ ... ^ vw = 1 - p.
 */
function findXorGroups(clean: CleanCnf, consumed: Uint8Array): XorGroups {
  const { codes, start } = clean;
  const m = start.length - 1;
  let cands = 0;
  for (let i = 0; i < m; i++) {
    const w = start[i + 1]! - start[i]!;
    if (w >= 2 && w <= MAX_XOR_WIDTH && consumed[i] === KEPT) cands++;
  }
  const empty: XorGroups = { count: 0, varStart: new Uint32Array(1), vars: new Int32Array(0), clauseStartG: new Uint32Array(1), clausesG: new Int32Array(0), value: new Uint8Array(0) };
  if (cands === 0) return empty;
  // Sort the candidate clauses by the hash of their variable set (LSD radix sort, two 16-bit
  // digits): clauses over one set become neighbours, in clause order within equal hashes.
  const keys = new Uint32Array(cands);
  const order = new Int32Array(cands);
  let n = 0;
  for (let i = 0; i < m; i++) {
    const s = start[i]!;
    const w = start[i + 1]! - s;
    if (w < 2 || w > MAX_XOR_WIDTH || consumed[i] !== KEPT) continue;
    let h = Math.imul(w, 0x27d4eb2f);
    for (let k = s; k < s + w; k++) h = Math.imul(h ^ (codes[k]! >>> 1), 0x9e3779b1) ^ (h >>> 15);
    keys[n] = h >>> 0;
    order[n++] = i;
  }
  const sorted = radixSort(keys, order);
  const members: number[] = [];
  const varStart = new IntList();
  varStart.push(0);
  const vars = new IntList();
  const clauseStartG = new IntList();
  clauseStartG.push(0);
  const clausesG = new IntList();
  const value = new IntList();
  const done = new Uint8Array(cands);
  for (let r = 0; r < cands; ) {
    let e = r + 1;
    while (e < cands && sorted.keys[e] === sorted.keys[r]) e++;
    // Within a run of equal hashes, split by actual variable set (collisions are rare).
    for (let a = r; e - r >= 2 && a < e; a++) {
      if (done[a]) continue;
      const i = sorted.order[a]!;
      const s = start[i]!;
      const w = start[i + 1]! - s;
      members.length = 0;
      for (let b = a; b < e; b++) {
        if (done[b]) continue;
        const j = sorted.order[b]!;
        const t = start[j]!;
        if (start[j + 1]! - t !== w) continue;
        let same = true;
        for (let k = 0; k < w && same; k++) same = codes[s + k]! >>> 1 === codes[t + k]! >>> 1;
        if (!same) continue;
        done[b] = 1;
        members.push(j);
      }
      const half = 2 ** (w - 1);
      if (members.length < half) continue;
      let odd = 0;
      for (const j of members) odd += parityOf(codes, start[j]!, w);
      // Repeated clauses were removed, so the sign patterns of one parity are distinct.
      const p = odd === half ? 1 : members.length - odd === half ? 0 : -1;
      if (p < 0) continue;
      for (let k = s; k < s + w; k++) vars.push(codes[k]! >>> 1);
      varStart.push(vars.length);
      for (const j of members) if (parityOf(codes, start[j]!, w) === p) clausesG.push(j);
      clauseStartG.push(clausesG.length);
      value.push(1 - p);
    }
    r = e;
  }
  // Groups in the order of their first clause, independent of the hash.
  const G = value.length;
  const ids = Array.from({ length: G }, (_, g) => g).sort((x, y) => clausesG.data[clauseStartG.data[x]!]! - clausesG.data[clauseStartG.data[y]!]!);
  const out: XorGroups = {
    count: G,
    varStart: new Uint32Array(G + 1),
    vars: new Int32Array(vars.length),
    clauseStartG: new Uint32Array(G + 1),
    clausesG: new Int32Array(clausesG.length),
    value: new Uint8Array(G),
  };
  let nv = 0;
  let nc = 0;
  ids.forEach((g, r) => {
    for (let k = varStart.data[g]!; k < varStart.data[g + 1]!; k++) out.vars[nv++] = vars.data[k]!;
    for (let k = clauseStartG.data[g]!; k < clauseStartG.data[g + 1]!; k++) out.clausesG[nc++] = clausesG.data[k]!;
    out.varStart[r + 1] = nv;
    out.clauseStartG[r + 1] = nc;
    out.value[r] = value.data[g]!;
  });
  return out;
}

/** Sorts (key, item) pairs by key, stably: two passes of 16-bit counting sort. */
function radixSort(keys: Uint32Array, items: Int32Array): { keys: Uint32Array; order: Int32Array } {
  const n = keys.length;
  let k1: Uint32Array = keys;
  let i1: Int32Array = items;
  let k2: Uint32Array = new Uint32Array(n);
  let i2: Int32Array = new Int32Array(n);
  const count = new Uint32Array(65537);
  for (let shift = 0; shift < 32; shift += 16) {
    count.fill(0);
    for (let i = 0; i < n; i++) count[((k1[i]! >>> shift) & 0xffff) + 1]!++;
    for (let d = 0; d < 65536; d++) count[d + 1]! += count[d]!;
    for (let i = 0; i < n; i++) {
      const d = (k1[i]! >>> shift) & 0xffff;
      const at = count[d]!++;
      k2[at] = k1[i]!;
      i2[at] = i1[i]!;
    }
    [k1, k2] = [k2, k1];
    [i1, i2] = [i2, i1];
  }
  return { keys: k1, order: i1 };
}

/** Number of negated literals in a clause, mod 2. */
function parityOf(codes: Int32Array, s: number, w: number): number {
  let p = 0;
  for (let k = s; k < s + w; k++) p ^= codes[k]! & 1;
  return p;
}
