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
 *  2. AND / OR definitions, clause by clause in input order, the first literal of a clause (by
 *     variable) that is a valid output wins: AND/OR outputs are unambiguous, so they go first;
 *  3. XOR / XNOR definitions (equivalence and negation are the 2-variable case) by peeling: a
 *     group with one undefined variable defines it; otherwise the next group in input order
 *     defines the undefined variable that occurs in the fewest pending groups (ties: the largest
 *     variable, which encoders usually give to gate outputs); a group that can define nothing is
 *     a standalone parity constraint;
 *  4. (by default) exactly-one groups (an all-positive clause over a clique of negative binary
 *     clauses), then at-most-one cliques of at least 3 variables among the negative binary clauses
 *     left. Definitions go first because they shrink the search space; a one-hot group's
 *     at-least-one clause with its pairwise clauses is also a NOR definition of its first variable.
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
    if (x > y) [x, y] = [y, x];
    let s = this.slot(x, y);
    while (this.a[s] !== -1) s = (s + 1) & this.mask;
    this.a[s] = x;
    this.b[s] = y;
    this.v[s] = value;
  }
  /** The clause (x | y), or -1. */
  get(x: number, y: number): number {
    if (x > y) [x, y] = [y, x];
    let s = this.slot(x, y);
    for (;;) {
      const k = this.a[s]!;
      if (k === -1) return -1;
      if (k === x && this.b[s] === y) return this.v[s]!;
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

  // ---- AND / OR: (o | x1 | ... | xk) with (~o | ~xi) for every i: o <-> AND(~xi) ----
  const ins = new Int32Array(Math.max(1, maxWidth(start)));
  for (let i = 0; i < m; i++) {
    const s = start[i]!;
    const e = start[i + 1]!;
    const w = e - s;
    if (w < 3 || consumed[i] !== KEPT) continue;
    for (let p = s; p < e; p++) {
      const o = codes[p]!;
      const no = o ^ 1;
      if (binCount[no]! < w - 1 || defOf[o >>> 1]! >= 0) continue;
      let ok = true;
      for (let q = s; q < e && ok; q++) if (q !== p) ok = freeBinary(no, codes[q]! ^ 1) >= 0;
      if (!ok) continue;
      // o positive: y = AND(~xi); o negative: ~y = AND(~xi), so y = OR(xi).
      const positive = (o & 1) === 0;
      let n = 0;
      for (let q = s; q < e; q++) if (q !== p) ins[n++] = positive ? codes[q]! ^ 1 : codes[q]!;
      if (!canDefine(o >>> 1, ins, 0, n)) continue;
      commit(o >>> 1, positive ? AND : OR, ins, 0, n);
      consumed[i] = BY_DEFINITION;
      for (let q = s; q < e; q++) if (q !== p) consumed[freeBinary(no, codes[q]! ^ 1)] = BY_DEFINITION;
      break;
    }
  }

  // ---- XOR groups: clauses over one variable set, all 2^(w-1) sign patterns of one parity ----
  const xor = findXorGroups(clean, consumed);
  const G = xor.count;
  const pStart = new IntList();
  pStart.push(0);
  const pVars = new IntList();
  const pValue = new IntList();
  if (G > 0) {
    const { varStart, vars, clauseStartG, clausesG, value } = xor;
    // Groups by variable.
    const vg = new Uint32Array(u + 1);
    for (let k = 0; k < vars.length; k++) vg[vars[k]! + 1]!++;
    for (let x = 0; x < u; x++) vg[x + 1]! += vg[x]!;
    const vgList = new Int32Array(vars.length);
    const vgFill = vg.slice(0, u);
    for (let g = 0; g < G; g++) for (let k = varStart[g]!; k < varStart[g + 1]!; k++) vgList[vgFill[vars[k]!]!++] = g;
    const pending = new Uint8Array(G).fill(1);
    const undef = new Int32Array(G);
    const pc = new Int32Array(u);
    for (let g = 0; g < G; g++) {
      for (let k = varStart[g]!; k < varStart[g + 1]!; k++) {
        if (defOf[vars[k]!]! < 0) undef[g]!++;
        pc[vars[k]!]!++;
      }
    }
    const queue = new Int32Array(G + vars.length + 1);
    let qh = 0;
    let qt = 0;
    for (let g = 0; g < G; g++) if (undef[g]! <= 1) queue[qt++] = g;
    const xin = new Int32Array(MAX_XOR_WIDTH);
    const cand = new Int32Array(MAX_XOR_WIDTH);

    const tryDefine = (g: number, v: number): boolean => {
      let n = 0;
      for (let k = varStart[g]!; k < varStart[g + 1]!; k++) if (vars[k] !== v) xin[n++] = vars[k]! << 1;
      if (!canDefine(v, xin, 0, n)) return false;
      commit(v, n === 1 ? (value[g] ? NOT : EQUIV) : value[g] ? XNOR : XOR, xin, 0, n);
      for (let k = clauseStartG[g]!; k < clauseStartG[g + 1]!; k++) consumed[clausesG[k]!] = BY_DEFINITION;
      for (let p = vg[v]!; p < vg[v + 1]!; p++) {
        const h = vgList[p]!;
        if (--undef[h]! <= 1 && pending[h]) queue[qt++] = h;
      }
      return true;
    };
    const finish = (g: number, defined: boolean): void => {
      pending[g] = 0;
      for (let k = varStart[g]!; k < varStart[g + 1]!; k++) pc[vars[k]!]!--;
      if (defined) return;
      // A standalone parity constraint: the XOR of its variables equals value[g].
      for (let k = varStart[g]!; k < varStart[g + 1]!; k++) pVars.push(vars[k]!);
      pStart.push(pVars.length);
      pValue.push(value[g]!);
      for (let k = clauseStartG[g]!; k < clauseStartG[g + 1]!; k++) consumed[clausesG[k]!] = BY_PARITY;
    };
    let next = 0;
    for (;;) {
      while (qh < qt) {
        const g = queue[qh++]!;
        if (!pending[g]) continue;
        let done = false;
        if (undef[g] === 1) {
          for (let k = varStart[g]!; k < varStart[g + 1]!; k++) {
            if (defOf[vars[k]!]! < 0) {
              done = tryDefine(g, vars[k]!);
              break;
            }
          }
        }
        finish(g, done);
      }
      while (next < G && !pending[next]) next++;
      if (next === G) break;
      const g = next;
      // Candidates: undefined variables, fewest pending groups first, then the largest variable.
      let n = 0;
      for (let k = varStart[g]!; k < varStart[g + 1]!; k++) if (defOf[vars[k]!]! < 0) cand[n++] = vars[k]!;
      const sorted = Array.from(cand.subarray(0, n)).sort((a, b) => pc[a]! - pc[b]! || b - a);
      let done = false;
      for (const v of sorted) if ((done = tryDefine(g, v))) break;
      finish(g, done);
    }
  }

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
  const bits = Math.max(4, Math.ceil(Math.log2(2 * cands + 2)));
  const mask = (1 << bits) - 1;
  const head = new Int32Array(1 << bits).fill(-1);
  const next = new Int32Array(m);
  const hashOf = new Int32Array(m);
  for (let i = 0; i < m; i++) {
    const s = start[i]!;
    const w = start[i + 1]! - s;
    if (w < 2 || w > MAX_XOR_WIDTH || consumed[i] !== KEPT) continue;
    let h = Math.imul(w, 0x27d4eb2f);
    for (let k = s; k < s + w; k++) h = Math.imul(h ^ (codes[k]! >>> 1), 0x9e3779b1) ^ (h >>> 15);
    hashOf[i] = h;
    const b = (h ^ (h >>> 16)) & mask;
    next[i] = head[b]!;
    head[b] = i;
  }
  const grouped = new Uint8Array(m);
  const members: number[] = [];
  const varStart = new IntList();
  varStart.push(0);
  const vars = new IntList();
  const clauseStartG = new IntList();
  clauseStartG.push(0);
  const clausesG = new IntList();
  const value = new IntList();
  for (let i = 0; i < m; i++) {
    const s = start[i]!;
    const w = start[i + 1]! - s;
    if (w < 2 || w > MAX_XOR_WIDTH || consumed[i] !== KEPT || grouped[i]) continue;
    const h = hashOf[i]!;
    members.length = 0;
    for (let j = head[(h ^ (h >>> 16)) & mask]!; j >= 0; j = next[j]!) {
      if (grouped[j] || hashOf[j] !== h || start[j + 1]! - start[j]! !== w) continue;
      const t = start[j]!;
      let same = true;
      for (let k = 0; k < w && same; k++) same = codes[s + k]! >>> 1 === codes[t + k]! >>> 1;
      if (!same) continue;
      grouped[j] = 1;
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
  return {
    count: value.length,
    varStart: Uint32Array.from(varStart.view()),
    vars: vars.view(),
    clauseStartG: Uint32Array.from(clauseStartG.view()),
    clausesG: clausesG.view(),
    value: Uint8Array.from(value.view()),
  };
}

/** Number of negated literals in a clause, mod 2. */
function parityOf(codes: Int32Array, s: number, w: number): number {
  let p = 0;
  for (let k = s; k < s + w; k++) p ^= codes[k]! & 1;
  return p;
}
