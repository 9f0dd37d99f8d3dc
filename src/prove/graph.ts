/**
 * An AND-inverter/XOR graph with structural hashing: the Boolean functions that the symbolic
 * simulation of a circuit puts on its wires. A literal is `(node << 1) | complemented`; literal 0
 * is false, 1 is true (node 0 is the constant).
 *
 * Canonical forms keep the graph small and make identical sub-functions one node:
 *   - AND nodes are n-ary: an uncomplemented AND operand is flattened into its operands, which
 *     are sorted and deduplicated; `a AND NOT a` is false; one operand is that operand. So every
 *     tree of 2-input ANDs over the same literals (however the lowering grouped them) is the same
 *     node as the flat AND that the formula side builds.
 *   - XOR nodes are n-ary, the symmetric difference of their operands' operand sets (a literal
 *     and its complement cancel to true), up to XOR_CAP operands. Beyond that a
 *     binary XOR node is made instead (an opaque operand elsewhere), which still cancels
 *     `(p XOR a) XOR a = p`: enough for computations undone in reverse order. The cap keeps a long
 *     chain of updates (a counter bit over many clauses) linear instead of quadratic.
 *   - constants propagate: a wire provably equal to a literal stays that literal.
 *
 * Every node records whether it depends on a path variable (the summation variables of a
 * Clifford+T path sum); those nodes are few and short-lived, and the path-sum reduction looks
 * only at them.
 *
 * Everything lives in typed arrays: per-node kind, operand range and hash, operands in one arena,
 * an open-addressing hash table of node ids.
 */

export const FALSE = 0;
export const TRUE = 1;

/** Node kinds. */
export const CONST = 0;
export const INPUT = 1;
export const AND = 2;
export const XOR = 3;
export const XOR2 = 4;

/** What an input node stands for. */
export const VAR = 1; // a search-register variable
export const TARGET = 2; // the initial value of a flag oracle's target
export const OUTCOME = 3; // a measurement outcome
export const PATH = 4; // a path-sum variable (the value after a Hadamard)

/** Flattened XOR nodes keep at most this many operands (see the file comment). */
export const XOR_CAP = 4096;

/**
 * Operands copied while flattening ANDs, in all, before flattening stops (further ANDs then keep
 * AND operands unflattened: still sound, only less sharing). Balanced trees cost n log n; this
 * bounds a pathological chain.
 */
const FLATTEN_BUDGET = 400_000_000;

export class Graph {
  /** Operands read by `and` and by cut matching so far: a measure of work for the prover's budgets. */
  effort = 0;
  private kinds = new Uint8Array(1024);
  /** For inputs: the role (VAR ...); else 0. */
  private roles = new Uint8Array(1024);
  /** For inputs: the index within the role; else the start of the operands in the arena. */
  private starts = new Int32Array(1024);
  private lens = new Int32Array(1024);
  private hashes = new Int32Array(1024);
  private paths = new Uint8Array(1024);
  /** For XOR nodes: the two literals it was first built from (node = derivA XOR derivB). */
  private derivA = new Int32Array(1024);
  private derivB = new Int32Array(1024);
  private arena = new Int32Array(1 << 16);
  private top = 0;
  private table = new Int32Array(1 << 12);
  private used = 0;
  private scratch = new Int32Array(1024);
  private flattened = 0;
  /** Number of nodes (node 0 is the constant). */
  size = 1;

  // ---- inspection ----------------------------------------------------------------------------

  kind(node: number): number {
    return this.kinds[node]!;
  }
  role(node: number): number {
    return this.roles[node]!;
  }
  /** The index of an input within its role. */
  index(node: number): number {
    return this.starts[node]!;
  }
  /** The operands of an AND, XOR or XOR2 node (a view into the arena: copy before building). */
  operands(node: number): Int32Array {
    const s = this.starts[node]!;
    return this.arena.subarray(s, s + this.lens[node]!);
  }
  /**
   * Two literals whose XOR is node n, for a XOR or XOR2 node: the way it was first built (a XOR
   * node built in one step from many operands has none: null).
   */
  derivation(n: number): [number, number] | null {
    if (this.kinds[n] === XOR2) return [this.arena[this.starts[n]!]!, this.arena[this.starts[n]! + 1]!];
    if (this.kinds[n] !== XOR || this.derivA[n] === 0) return null;
    return [this.derivA[n]!, this.derivB[n]!];
  }

  arity(node: number): number {
    return this.lens[node]!;
  }
  /** True when the literal's function depends on a path variable. */
  hasPath(lit: number): boolean {
    return this.paths[lit >>> 1] === 1;
  }

  // ---- construction --------------------------------------------------------------------------

  /** A fresh input node (positive literal). */
  input(role: number, index: number): number {
    const n = this.newNode(INPUT, index, 0, 0);
    this.roles[n] = role;
    this.paths[n] = role === PATH ? 1 : 0;
    return n << 1;
  }

  /** AND of two literals. */
  and2(a: number, b: number): number {
    if (a === FALSE || b === FALSE || a === (b ^ 1)) return FALSE;
    if (a === TRUE || a === b) return b;
    if (b === TRUE) return a;
    if (this.cutHead !== null) return this.and([a, b]);
    const la = this.flatOperands(a);
    const lb = this.flatOperands(b);
    const na = la === null ? 1 : la.length;
    const nb = lb === null ? 1 : lb.length;
    this.room(na + nb);
    const s = this.scratch;
    // Merge two sorted lists (an operand list is sorted; a single literal is a list of one).
    let i = 0;
    let j = 0;
    let n = 0;
    while (i < na || j < nb) {
      const x = i < na ? (la === null ? a : la[i]!) : 0x7fffffff;
      const y = j < nb ? (lb === null ? b : lb[j]!) : 0x7fffffff;
      let v: number;
      if (x < y) {
        v = x;
        i++;
      }
      else if (y < x) {
        v = y;
        j++;
      }
      else {
        v = x;
        i++;
        j++;
      }
      if (n > 0 && s[n - 1] === (v ^ 1)) return FALSE; // l and NOT l are adjacent when sorted
      s[n++] = v;
    }
    if (n === 1) return s[0]!;
    return this.cons(AND, n) << 1;
  }

  /** AND of any number of literals. */
  and(lits: ArrayLike<number>): number {
    this.effort += lits.length;
    if (lits.length === 0) return TRUE;
    if (lits.length === 1) return lits[0]!;
    if (lits.length === 2 && this.cutHead === null) return this.and2(lits[0]!, lits[1]!);
    let n = 0;
    for (let i = 0; i < lits.length; i++) {
      const l = lits[i]!;
      if (l === FALSE) return FALSE;
      if (l === TRUE) continue;
      const ops = this.flatOperands(l);
      if (ops === null) {
        this.room(n + 1);
        this.scratch[n++] = l;
      } else if (this.cutHead === null) {
        this.room(n + ops.length);
        this.scratch.set(ops, n);
        n += ops.length;
      } else {
        // Cut nodes inside are expanded too, so that the cuts are found again below whatever
        // way the AND was grouped.
        for (let k = 0; k < ops.length; k++) {
          const o = ops[k]!;
          const inner = (o & 1) === 0 && this.isCut(o >>> 1) ? this.operands(o >>> 1) : null;
          if (inner === null) {
            this.room(n + 1);
            this.scratch[n++] = o;
          } else {
            this.room(n + inner.length);
            this.scratch.set(inner, n);
            n += inner.length;
          }
        }
      }
    }
    if (n === 0) return TRUE;
    const s = this.scratch.subarray(0, n).sort();
    let w = 0;
    for (let i = 0; i < n; i++) if (w === 0 || s[w - 1] !== s[i]) s[w++] = s[i]!;
    if (this.cutHead !== null) w = this.recut(w);
    for (let i = 1; i < w; i++) if (s[i - 1] === (s[i]! ^ 1)) return FALSE; // l and NOT l are adjacent when sorted
    if (w === 1) return this.scratch[0]!;
    return this.cons(AND, w) << 1;
  }

  // ---- cut points ----------------------------------------------------------------------------

  /** For each literal, the first cut whose smallest operand it is (index into cutNodes), or -1. */
  private cutHead: Int32Array | null = null;
  private cutNext = new Int32Array(0);
  private cutNodes = new Int32Array(0);
  private cutFlag = new Uint8Array(0);
  private marks = new Uint8Array(1024);

  /**
   * Declares AND nodes as cut points (the formula's clause nodes). From now on an AND keeps
   * every cut whose operands it contains as one operand, the cut node, instead of the cut's
   * operands, and only folds "l AND NOT l" to false outside cuts: so a clause's node is the
   * same however it is reached, and the correlations between clauses (two clauses with
   * opposite literals cannot both be violated) stay out of the graph, where a BDD over the cut
   * points could not see them (bdd.ts).
   */
  setCuts(nodes: readonly number[]): void {
    let maxLit = 0;
    const list = nodes.filter((n) => this.kinds[n] === AND);
    for (const n of list) maxLit = Math.max(maxLit, this.operands(n)[0]!);
    this.cutHead = new Int32Array(maxLit + 1).fill(-1);
    this.cutNext = new Int32Array(list.length);
    this.cutNodes = Int32Array.from(list);
    this.cutFlag = new Uint8Array(this.size);
    for (let i = list.length - 1; i >= 0; i--) {
      const first = this.operands(list[i]!)[0]!;
      this.cutNext[i] = this.cutHead[first]!;
      this.cutHead[first] = i;
      this.cutFlag[list[i]!] = 1;
    }
  }

  /** True when node n was declared a cut point. */
  isCut(n: number): boolean {
    return n < this.cutFlag.length && this.cutFlag[n] === 1;
  }

  /**
   * Rewrites the sorted, deduplicated operands scratch[0..n): every cut whose operands are all
   * there replaces them. Returns the new count (sorted again).
   */
  private recut(n: number): number {
    const s = this.scratch;
    const head = this.cutHead!;
    if (this.marks.length < n) this.marks = new Uint8Array(n * 2);
    const marks = this.marks;
    let found: number[] | null = null;
    for (let i = 0; i < n; i++) {
      const l = s[i]!;
      if (l >= head.length) break; // operands are sorted: no cut starts at a larger literal
      for (let c = head[l]!; c >= 0; c = this.cutNext[c]!) {
        const ops = this.operands(this.cutNodes[c]!);
        this.effort += ops.length;
        // Is ops (sorted) a subset of s[i..n) (sorted)? Two pointers.
        let p = i;
        let ok = true;
        for (let k = 0; k < ops.length && ok; k++) {
          while (p < n && s[p]! < ops[k]!) p++;
          ok = p < n && s[p] === ops[k];
        }
        if (!ok) continue;
        if (found === null) {
          found = [];
          marks.fill(0, 0, n);
        }
        found.push(this.cutNodes[c]! << 1);
        p = i;
        for (let k = 0; k < ops.length; k++) {
          while (s[p]! < ops[k]!) p++;
          marks[p] = 1;
        }
      }
    }
    if (found === null) return n;
    let w = 0;
    for (let i = 0; i < n; i++) if (!marks[i]) s[w++] = s[i]!;
    for (const f of found) s[w++] = f;
    const sorted = s.subarray(0, w).sort();
    let u = 0;
    for (let i = 0; i < w; i++) if (u === 0 || sorted[u - 1] !== sorted[i]) sorted[u++] = sorted[i]!;
    return u;
  }

  /** OR of literals (De Morgan). */
  or(lits: ArrayLike<number>): number {
    const neg = new Int32Array(lits.length);
    for (let i = 0; i < lits.length; i++) neg[i] = lits[i]! ^ 1;
    return this.and(neg) ^ 1;
  }

  /** XOR of two literals. */
  xor(a: number, b: number): number {
    if (a === b) return FALSE;
    if (a === (b ^ 1)) return TRUE;
    if (a <= 1) return b ^ a;
    if (b <= 1) return a ^ b;
    const a0 = a;
    const b0 = b;
    // Operands keep their own complements (an XOR literal's complement moves outside): the
    // Z8 expansion of a phase on a parity then works over the literals that were XORed, e.g.
    // NOT a XOR y stays over NOT a, so a 2-input AND of negated inputs sums out to AND(NOT a,
    // NOT b) itself rather than an equal but differently built function.
    let r = 0;
    let la: Int32Array | null = null;
    let lb: Int32Array | null = null;
    if (this.kinds[a >>> 1] === XOR) {
      r ^= a & 1;
      la = this.operands(a >>> 1);
    }
    if (this.kinds[b >>> 1] === XOR) {
      r ^= b & 1;
      lb = this.operands(b >>> 1);
    }
    const na = la === null ? 1 : la.length;
    const nb = lb === null ? 1 : lb.length;
    this.room(na + nb);
    const s = this.scratch;
    let i = 0;
    let j = 0;
    let n = 0;
    while (i < na || j < nb) {
      const x = i < na ? (la === null ? a : la[i]!) : 0x7fffffff;
      const y = j < nb ? (lb === null ? b : lb[j]!) : 0x7fffffff;
      let v: number;
      if (x < y) {
        v = x;
        i++;
      }
      else if (y < x) {
        v = y;
        j++;
      }
      else {
        i++; // l XOR l = 0
        j++;
        continue;
      }
      if (n > 0 && s[n - 1] === (v ^ 1)) {
        n--; // l XOR NOT l = 1 (complementary literals are adjacent when sorted)
        r ^= 1;
      } else s[n++] = v;
    }
    if (n === 0) return r;
    if (n === 1) return s[0]! ^ r;
    if (n <= XOR_CAP) {
      const before = this.size;
      const id = this.cons(XOR, n);
      // The first way a XOR node was built (node = a XOR b XOR r): encodings and BDDs follow it,
      // so a counter bit updated clause after clause costs one step per update, not its whole
      // operand list every time.
      if (id === before) {
        this.derivA[id] = a0;
        this.derivB[id] = b0 ^ r;
      }
      return (id << 1) ^ r;
    }
    // Too many operands: a binary node (uncomplemented operands), which still cancels an
    // operand XORed in again.
    r = (a ^ b) & 1;
    a &= ~1;
    b &= ~1;
    for (const [p, q] of [[a, b], [b, a]] as const) {
      if (this.kinds[p >>> 1] === XOR2) {
        const ops = this.operands(p >>> 1);
        if (ops[0] === q) return ops[1]! ^ r;
        if (ops[1] === q) return ops[0]! ^ r;
      }
    }
    s[0] = Math.min(a, b);
    s[1] = Math.max(a, b);
    return (this.cons(XOR2, 2) << 1) ^ r;
  }

  /** XOR of any number of literals. */
  xorAll(lits: ArrayLike<number>): number {
    let acc = FALSE;
    for (let i = 0; i < lits.length; i++) acc = this.xor(acc, lits[i]!);
    return acc;
  }

  // ---- internals -----------------------------------------------------------------------------

  /** The operands of an uncomplemented AND literal (to flatten), else null. */
  private flatOperands(l: number): Int32Array | null {
    if ((l & 1) !== 0 || this.kinds[l >>> 1] !== AND) return null;
    const len = this.lens[l >>> 1]!;
    if (this.flattened + len > FLATTEN_BUDGET) return null;
    this.flattened += len;
    return this.operands(l >>> 1);
  }

  private room(n: number): void {
    if (n > this.scratch.length) {
      const s = new Int32Array(Math.max(n, this.scratch.length * 2));
      s.set(this.scratch);
      this.scratch = s;
    }
  }

  /** The node of kind `kind` over scratch[0..n), made if new. */
  private cons(kind: number, n: number): number {
    const s = this.scratch;
    let h = Math.imul(kind + 1, 0x9e3779b1) ^ n;
    for (let i = 0; i < n; i++) h = Math.imul(h ^ s[i]!, 0x01000193) + (h >>> 15);
    h |= 0;
    const mask = this.table.length - 1;
    for (let p = h & mask; ; p = (p + 1) & mask) {
      const id = this.table[p]!;
      if (id === 0) break;
      if (this.hashes[id] !== h || this.kinds[id] !== kind || this.lens[id] !== n) continue;
      const st = this.starts[id]!;
      let same = true;
      for (let i = 0; i < n; i++) {
        if (this.arena[st + i] !== s[i]) {
          same = false;
          break;
        }
      }
      if (same) return id;
    }
    if (this.top + n > this.arena.length) {
      const a = new Int32Array(Math.max(this.arena.length * 2, this.top + n));
      a.set(this.arena.subarray(0, this.top));
      this.arena = a;
    }
    this.arena.set(s.subarray(0, n), this.top);
    let path = 0;
    for (let i = 0; i < n && path === 0; i++) path = this.paths[s[i]! >>> 1]!;
    const id = this.newNode(kind, this.top, n, h);
    this.paths[id] = path;
    this.top += n;
    this.insert(id);
    return id;
  }

  private newNode(kind: number, start: number, len: number, hash: number): number {
    if (this.size >= this.kinds.length) this.growNodes();
    const id = this.size++;
    this.kinds[id] = kind;
    this.starts[id] = start;
    this.lens[id] = len;
    this.hashes[id] = hash;
    return id;
  }

  private insert(id: number): void {
    if (++this.used * 2 > this.table.length) {
      const old = this.table;
      this.table = new Int32Array(old.length * 2);
      const m = this.table.length - 1;
      for (const x of old) {
        if (x === 0) continue;
        let p = this.hashes[x]! & m;
        while (this.table[p] !== 0) p = (p + 1) & m;
        this.table[p] = x;
      }
    }
    const m = this.table.length - 1;
    let p = this.hashes[id]! & m;
    while (this.table[p] !== 0) p = (p + 1) & m;
    this.table[p] = id;
  }

  private growNodes(): void {
    const cap = this.kinds.length * 2;
    const g = <T extends Uint8Array | Int32Array>(a: T): T => {
      const b = new (a.constructor as new (n: number) => T)(cap);
      b.set(a);
      return b;
    };
    this.kinds = g(this.kinds);
    this.roles = g(this.roles);
    this.starts = g(this.starts);
    this.lens = g(this.lens);
    this.hashes = g(this.hashes);
    this.derivA = g(this.derivA);
    this.derivB = g(this.derivB);
    this.paths = g(this.paths);
  }
}
