/**
 * Reduced ordered binary decision diagrams (Bryant 1986), for the miters that a SAT solver finds
 * hard: the `lean` strategy counts violated clauses in a binary counter and marks "counter = 0",
 * and showing that this equals "no clause violated" is a counting argument, which resolution
 * (and so CDCL) cannot make short, while the counter's BDDs over the clause bits in clause order
 * stay small (the count after i clauses has at most i + 1 values).
 *
 * The miter is taken over cut points: every clause's "violated" node (the AND of its violated
 * literals, the same node on the formula side and in the circuit after structural hashing)
 * becomes a free variable. If the miter is false for every value of the cut variables, it is
 * false for every assignment (each assignment gives the cut variables some value): a proof. If
 * not, nothing follows (the cut may allow combinations no assignment gives) and the caller goes
 * on with the SAT solver.
 *
 * Plain nodes (no complement edges) in typed arrays, a unique table and a lossy computed table.
 */
import { AND, INPUT, type Graph } from "./graph.js";
import { operandsFor } from "./tseitin.js";

const FALSE_BDD = 0;
const TRUE_BDD = 1;
const OP_AND = 1;
const OP_XOR = 2;

/** Thrown inside when the node budget runs out. */
class BudgetExceeded extends Error {}

class Bdd {
  private vars = new Int32Array(1 << 16);
  private los = new Int32Array(1 << 16);
  private his = new Int32Array(1 << 16);
  private size = 2;
  private table = new Int32Array(1 << 17);
  private readonly cacheBits = 20;
  private readonly cacheA = new Int32Array(1 << this.cacheBits).fill(-1);
  private readonly cacheB = new Int32Array(1 << this.cacheBits);
  private readonly cacheOp = new Int32Array(1 << this.cacheBits);
  private readonly cacheR = new Int32Array(1 << this.cacheBits);

  constructor(private readonly budget: number) {
    this.vars[0] = this.vars[1] = 0x7fffffff; // terminals sort below every variable
  }

  get nodes(): number {
    return this.size;
  }

  variable(v: number): number {
    return this.mk(v, FALSE_BDD, TRUE_BDD);
  }

  and(a: number, b: number): number {
    if (a === FALSE_BDD || b === FALSE_BDD) return FALSE_BDD;
    if (a === TRUE_BDD) return b;
    if (b === TRUE_BDD || a === b) return a;
    return this.apply(OP_AND, a, b);
  }

  xor(a: number, b: number): number {
    if (a === b) return FALSE_BDD;
    if (a === FALSE_BDD) return b;
    if (b === FALSE_BDD) return a;
    return this.apply(OP_XOR, a, b);
  }

  not(a: number): number {
    return this.xor(a, TRUE_BDD);
  }

  private apply(op: number, a: number, b: number): number {
    if (a > b) [a, b] = [b, a]; // both operations commute
    const h = (Math.imul(a, 0x9e3779b1) ^ Math.imul(b + op, 0x85ebca6b)) >>> (32 - this.cacheBits);
    if (this.cacheA[h] === a && this.cacheB[h] === b && this.cacheOp[h] === op) return this.cacheR[h]!;
    const va = this.vars[a]!;
    const vb = this.vars[b]!;
    const v = Math.min(va, vb);
    const a0 = va === v ? this.los[a]! : a;
    const a1 = va === v ? this.his[a]! : a;
    const b0 = vb === v ? this.los[b]! : b;
    const b1 = vb === v ? this.his[b]! : b;
    const r = op === OP_AND ? this.mk(v, this.and(a0, b0), this.and(a1, b1)) : this.mk(v, this.xor(a0, b0), this.xor(a1, b1));
    this.cacheA[h] = a;
    this.cacheB[h] = b;
    this.cacheOp[h] = op;
    this.cacheR[h] = r;
    return r;
  }

  private mk(v: number, lo: number, hi: number): number {
    if (lo === hi) return lo;
    const mask = this.table.length - 1;
    let p = (Math.imul(v, 0x27d4eb2d) ^ Math.imul(lo, 0x165667b1) ^ Math.imul(hi, 0x9e3779b1)) & mask;
    for (;;) {
      const id = this.table[p]!;
      if (id === 0) break;
      if (this.vars[id] === v && this.los[id] === lo && this.his[id] === hi) return id;
      p = (p + 1) & mask;
    }
    if (this.size >= this.budget) throw new BudgetExceeded();
    if (this.size >= this.vars.length) this.grow();
    const id = this.size++;
    this.vars[id] = v;
    this.los[id] = lo;
    this.his[id] = hi;
    this.table[p] = id;
    if (this.size * 2 > this.table.length) this.rehash();
    return id;
  }

  private grow(): void {
    const n = this.vars.length * 2;
    for (const k of ["vars", "los", "his"] as const) {
      const b = new Int32Array(n);
      b.set(this[k]);
      this[k] = b;
    }
  }

  private rehash(): void {
    this.table = new Int32Array(this.table.length * 2);
    const mask = this.table.length - 1;
    for (let id = 2; id < this.size; id++) {
      let p = (Math.imul(this.vars[id]!, 0x27d4eb2d) ^ Math.imul(this.los[id]!, 0x165667b1) ^ Math.imul(this.his[id]!, 0x9e3779b1)) & mask;
      while (this.table[p] !== 0) p = (p + 1) & mask;
      this.table[p] = id;
    }
  }
}

/** The outcome of {@link cutBddProof}. */
export interface CutBddResult {
  /** True when the miter is false for every value of the cut variables (a proof). */
  readonly proved: boolean;
  /** BDD nodes made. */
  readonly nodes: number;
  /** Variables of the BDD (cut points and the other inputs in the cone). */
  readonly variables: number;
  /** True when the node budget ran out first. */
  readonly exhausted: boolean;
}

/**
 * Builds the BDD of literal `root` of the graph with the nodes `cuts` (in order: the variable
 * order) replaced by free variables, the other inputs after them.
 */
export function cutBddProof(g: Graph, root: number, cuts: readonly number[], budget = 3_000_000): CutBddResult {
  const bdd = new Bdd(budget);
  const cutVar = new Map<number, number>();
  // Cut variables in reverse clause order (the last clause on top): the sub-diagrams below a
  // clause's level are then functions of the earlier clauses only ("the count so far plus an
  // offset"), shared by every later partial count, so the counter's bits after all the steps
  // take about m 2^w nodes in all instead of m^2 2^w / 2.
  const clauseOf = new Map<number, number>();
  for (const n of cuts) if (!clauseOf.has(n)) clauseOf.set(n, clauseOf.size);
  for (const [n, i] of clauseOf) cutVar.set(n, clauseOf.size - 1 - i);
  const memo = new Map<number, number>();
  /** The last clause each node's function depends on (through cut points), an upper bound. */
  const last = new Map<number, number>();
  const extra = new Map<number, number>();
  try {
    // Iterative post-order over the cone, stopping at cut points.
    const stack: number[] = [root >>> 1];
    while (stack.length > 0) {
      const n = stack[stack.length - 1]!;
      if (memo.has(n)) {
        stack.pop();
        continue;
      }
      const cut = cutVar.get(n);
      if (cut !== undefined) {
        memo.set(n, bdd.variable(cut));
        last.set(n, clauseOf.get(n)!);
        stack.pop();
        continue;
      }
      const kind = g.kind(n);
      if (kind === INPUT) {
        let v = extra.get(n);
        if (v === undefined) extra.set(n, (v = cutVar.size + extra.size));
        memo.set(n, bdd.variable(v));
        last.set(n, -1);
        stack.pop();
        continue;
      }
      const ops = operandsFor(g, n);
      let ready = true;
      for (let i = 0; i < ops.length; i++) {
        if (!memo.has(ops[i]! >>> 1)) {
          stack.push(ops[i]! >>> 1);
          ready = false;
        }
      }
      if (!ready) continue;
      stack.pop();
      const lit = (l: number): number => {
        const b = memo.get(l >>> 1)!;
        return (l & 1) === 1 ? bdd.not(b) : b;
      };
      // Operands in the order of the last clause they depend on: a counter's bit is then summed
      // clause by clause, and every partial sum is a small BDD.
      const order = Array.from(ops).sort((p, q) => last.get(p >>> 1)! - last.get(q >>> 1)!);
      let acc = kind === AND ? TRUE_BDD : FALSE_BDD;
      for (const o of order) acc = kind === AND ? bdd.and(acc, lit(o)) : bdd.xor(acc, lit(o));
      memo.set(n, acc);
      last.set(n, last.get(order[order.length - 1]! >>> 1)!);
    }
  } catch (e) {
    if (e instanceof BudgetExceeded) return { proved: false, nodes: bdd.nodes, variables: cutVar.size + extra.size, exhausted: true };
    throw e;
  }
  const r = memo.get(root >>> 1)!;
  const value = (root & 1) === 1 ? bdd.not(r) : r;
  return { proved: value === FALSE_BDD, nodes: bdd.nodes, variables: cutVar.size + extra.size, exhausted: false };
}
