/**
 * Synthesis from a recovered structure (synth/plan.ts): gate definitions, parity constraints and
 * one-hot groups compiled natively instead of clause by clause.
 *
 * Every variable has a *signal*: an encoded qubit operand `(q << 1) | n` whose value is the
 * qubit's value XOR n (so it is also the control that fires when the signal is 1), or a constant
 * (FALSE, TRUE). A full register gives each variable its own search qubit; a free register gives
 * the free variables search qubits and computes each defined variable from its definition, in
 * topological order: equivalence and negation alias their input (no qubit, no gate), XOR / XNOR
 * take a work qubit and CNOTs, AND / OR one temporary AND (Gidney 2018) of w inputs (w - 1
 * Toffoli-equivalents once lowered; OR by De Morgan as a negated AND of negated inputs).
 *
 * Checks, each giving "violated" bits (encoded controls that fire when the check fails):
 *  - a definition, on a full register: its function computed as above into a work qubit, the
 *    defined variable CNOT-ed onto it; violated when the two differ. XOR-type checks are CNOTs
 *    only (0 T); AND / OR of w inputs costs one w-input temporary AND;
 *  - a parity constraint: CNOTs into one work qubit; violated when it has the wrong parity (0 T);
 *  - an at-most-one group x1..xg: a running parity p (CNOTs into one work qubit) and, for each
 *    i >= 2, the conflict bit c_i = p_(i-1) AND x_i. While at most one of x1..x_(i-1) is set,
 *    p_(i-1) is their OR, so the first index where a second member is set raises its conflict
 *    bit, and no conflict bit rises when at most one is set: "no conflict" is exactly "at most
 *    one". g - 1 two-input ANDs instead of the g(g-1)/2 pairwise clauses (each a two-input AND
 *    and a mark input). Exactly-one adds "p_g = 1" (under at most one, the parity is the count),
 *    which is CNOTs only, instead of the g-input at-least-one clause;
 *  - a remaining clause: as the wide strategy does, an AND of its literals' negations.
 * The blocked and fan-out constructions (construction.ts) conjoin the same checks in blocks, a
 * group split into one check per conflict bit (each with its own prefix parity: CNOTs only, so the
 * conflict ANDs share no qubit and run in parallel).
 * `wide` keeps every violated bit and marks "none violated" with one multi-controlled gate, then
 * uncomputes everything in reverse. `lean` adds each check's violated bits into a counter and
 * uncomputes the check at once (synth/lean.ts's counter), marks "counter = 0", then runs
 * everything backwards; computed definitions stay until the end.
 */
import { CircuitBuilder, K, pos, type Circuit } from "../ir/circuit.js";
import { conjoinChecks, type BlockPlan } from "./blocked.js";
import type { Checks as BlockChecks, Holder } from "./checks.js";
import { mark, type Op, type OracleKind } from "./common.js";
import type { StructuredFormula } from "./plan.js";
import type { SimplifiedCnf } from "./simplify.js";

/** Constant signals. */
const FALSE = -2;
const TRUE = -1;
const negate = (s: number): number => (s < 0 ? -3 - s : s ^ 1);

/** Logical operations (kind, operands) in growable typed arrays, replayable forwards or inverted. */
class OpList {
  kinds = new Uint8Array(64);
  starts = new Uint32Array(65);
  ops = new Int32Array(192);
  n = 0;

  push(kind: number, operands: ArrayLike<number>): void {
    if (this.n + 1 >= this.kinds.length) {
      const k = new Uint8Array(this.kinds.length * 2);
      k.set(this.kinds);
      this.kinds = k;
      const s = new Uint32Array(this.kinds.length + 1);
      s.set(this.starts);
      this.starts = s;
    }
    const at = this.starts[this.n]!;
    if (at + operands.length > this.ops.length) {
      const o = new Int32Array(Math.max(2 * this.ops.length, at + operands.length));
      o.set(this.ops);
      this.ops = o;
    }
    for (let i = 0; i < operands.length; i++) this.ops[at + i] = operands[i]!;
    this.kinds[this.n] = kind;
    this.starts[++this.n] = at + operands.length;
  }

  cx(control: number, targetQubit: number): void {
    this.push(K.mcx, [control, pos(targetQubit)]);
  }

  /** Copies operations [from, to) of `src`, forwards or inverted (reverse order, and <-> unand). */
  append(src: OpList, from: number, to: number, inverted: boolean): void {
    for (let j = 0; j < to - from; j++) {
      const i = inverted ? to - 1 - j : from + j;
      const k = src.kinds[i]!;
      this.push(inverted ? inverse(k) : k, src.ops.subarray(src.starts[i]!, src.starts[i + 1]!));
    }
  }

  /** Emits operations into a builder, forwards or inverted, with operands mapped by `map`. */
  emit(b: CircuitBuilder, inverted: boolean, map?: (op: number) => number): void {
    const buf: number[] = [];
    for (let j = 0; j < this.n; j++) {
      const i = inverted ? this.n - 1 - j : j;
      const k = this.kinds[i]!;
      buf.length = 0;
      for (let p = this.starts[i]!; p < this.starts[i + 1]!; p++) buf.push(map ? map(this.ops[p]!) : this.ops[p]!);
      b.addN(inverted ? inverse(k) : k, buf);
    }
  }
}

const inverse = (k: number): number => (k === K.and ? K.unand : k === K.unand ? K.and : k);

/** Growable Int32 list. */
class IntList {
  a = new Int32Array(16);
  n = 0;
  push(x: number): void {
    if (this.n === this.a.length) {
      const b = new Int32Array(2 * this.n);
      b.set(this.a);
      this.a = b;
    }
    this.a[this.n++] = x;
  }
}

/**
 * The checks of a structured formula: operations in `ops`, split into a persistent prefix (the
 * computed definitions of a free register) and check segments, each with its violated bits.
 */
class Checks {
  readonly ops = new OpList();
  readonly violated = new IntList();
  /** Per segment: its first operation and first violated bit (a sentinel closes the list). */
  readonly segOp = new IntList();
  readonly segBit = new IntList();
  /** Operations before this index compute definitions and stay until the end. */
  persistentEnd = 0;
  /** Qubits below this index exist before the first check: the search register, target and computed definitions. */
  persistentQubits = 0;
  /** Some check can never hold: the formula is unsatisfiable. */
  unsat = false;
  private readonly scratch: number[] = [];

  /**
   * @param split one check per conflict bit (each with its own prefix parity) instead of one
   *   running parity per group: what the blocked and fan-out constructions conjoin (see group()).
   */
  constructor(readonly b: CircuitBuilder, readonly split = false) {}

  beginSegment(): void {
    this.segOp.push(this.ops.n);
    this.segBit.push(this.violated.n);
  }

  /**
   * The AND of signals: a constant or an existing signal when the inputs reduce to one (constants
   * dropped or deciding, repeats merged, a signal and its negation give FALSE), else a temporary
   * AND into a fresh work qubit. `owned` is that qubit, or -1.
   */
  and(inputs: readonly number[]): { signal: number; owned: number } {
    const list = this.scratch;
    list.length = 0;
    for (const s of inputs) {
      if (s === TRUE) continue;
      if (s === FALSE) return { signal: FALSE, owned: -1 };
      list.push(s);
    }
    list.sort((x, y) => x - y);
    let w = 0;
    for (let i = 0; i < list.length; i++) {
      const s = list[i]!;
      if (w > 0 && list[w - 1] === s) continue;
      if (w > 0 && list[w - 1] === (s ^ 1)) return { signal: FALSE, owned: -1 };
      list[w++] = s;
    }
    list.length = w;
    if (w === 0) return { signal: TRUE, owned: -1 };
    if (w === 1) return { signal: list[0]!, owned: -1 };
    const t = this.b.newWork();
    list.push(pos(t));
    this.ops.push(K.and, list);
    return { signal: pos(t), owned: t };
  }

  /**
   * The XOR of signals: constants and negations fold into the result's polarity, a qubit that
   * appears twice cancels; a constant or an existing signal when at most one qubit is left, else
   * CNOTs into a fresh work qubit (`owned`).
   */
  xor(inputs: readonly number[]): { signal: number; owned: number } {
    let polarity = 0;
    const qs: number[] = [];
    for (const s of inputs) {
      if (s < 0) polarity ^= s === TRUE ? 1 : 0;
      else {
        polarity ^= s & 1;
        qs.push(s >>> 1);
      }
    }
    qs.sort((x, y) => x - y);
    let w = 0;
    for (let i = 0; i < qs.length; i++) {
      if (w > 0 && qs[w - 1] === qs[i]) w--;
      else qs[w++] = qs[i]!;
    }
    if (w === 0) return { signal: polarity ? TRUE : FALSE, owned: -1 };
    if (w === 1) return { signal: (qs[0]! << 1) | polarity, owned: -1 };
    const t = this.b.newWork();
    for (let i = 0; i < w; i++) this.ops.cx(pos(qs[i]!), t);
    return { signal: (t << 1) | polarity, owned: t };
  }

  /** A check that fails when signal `s` is 1. */
  failWhen(s: number): void {
    if (s === TRUE) this.unsat = true;
    else if (s !== FALSE) this.violated.push(s);
  }

  /** A check that signals `x` and `y` are equal; `owned` is a work qubit of `x`'s this check may change. */
  equal(x: number, owned: number, y: number): void {
    if (x < 0 || y < 0) {
      if (x < 0 && y < 0) this.failWhen(x === y ? FALSE : TRUE);
      else this.failWhen(x < 0 ? (x === TRUE ? negate(y) : y) : y === TRUE ? negate(x) : x);
      return;
    }
    if (x >>> 1 === y >>> 1) {
      this.failWhen((x ^ y) & 1 ? TRUE : FALSE);
      return;
    }
    let t = owned;
    if (t < 0) {
      t = this.b.newWork();
      this.ops.cx(pos(x >>> 1), t);
    }
    this.ops.cx(pos(y >>> 1), t);
    // t now holds x's qubit XOR y's qubit; the signals differ when t XOR (their polarities) is 1.
    this.failWhen((t << 1) | ((x ^ y) & 1));
  }

  /** A clause over literal signals: fails when every literal is 0. */
  clause(lits: readonly number[]): void {
    const controls: number[] = [];
    for (const s of lits) {
      if (s === TRUE) return;
      if (s !== FALSE) controls.push(negate(s));
    }
    if (controls.length === 0) {
      this.unsat = true;
      return;
    }
    // "every literal 0" is the AND of the negated literals.
    this.failWhen(this.and(controls).signal);
  }

  /**
   * At most one (exactly one) of the signals is 1, by a running parity and one conflict bit per
   * member after the first (see the file comment). Falls back to the pairwise clauses when a
   * member is constant or two members share a qubit.
   */
  group(members: readonly number[], exactlyOne: boolean): void {
    const qs = new Set<number>();
    let plain = true;
    for (const s of members) {
      if (s < 0 || qs.has(s >>> 1)) plain = false;
      else qs.add(s >>> 1);
    }
    if (!plain) {
      for (let i = 0; i < members.length; i++) for (let j = i + 1; j < members.length; j++) this.clause([negate(members[i]!), negate(members[j]!)]);
      if (exactlyOne) this.clause(members);
      return;
    }
    const g = members.length;
    if (this.split) {
      // Conflict bit i on its own: c_i = (x1 XOR ... XOR x_(i-1)) AND x_i, each prefix parity in
      // its own qubit (CNOTs only). The same values as the running parity's, but no two conflict
      // ANDs share a qubit, so they run in parallel (T-depth of one two-input AND), and each is a
      // check of its own for the blocked constructions, as a pairwise clause would be. Exactly
      // one adds the parity of all members as one more check.
      for (let i = 1; i < g; i++) {
        if (i > 1) this.beginSegment();
        const prefix = this.xor(members.slice(0, i));
        this.failWhen(this.and([prefix.signal, members[i]!]).signal);
      }
      if (exactlyOne) {
        this.beginSegment();
        this.failWhen(negate(this.xor(members).signal));
      }
      return;
    }
    const acc = this.b.newWork();
    let polarity = 0;
    for (let i = 0; i < g; i++) {
      const s = members[i]!;
      if (i >= 1) {
        const c = this.b.newWork();
        this.ops.push(K.and, [(acc << 1) | polarity, s, pos(c)]);
        this.violated.push(pos(c));
      }
      if (i + 1 < g || exactlyOne) {
        this.ops.cx(pos(s >>> 1), acc);
        polarity ^= s & 1;
      }
    }
    // Under at most one, the parity of the members is their count: exactly one is parity 1.
    if (exactlyOne) this.violated.push(((acc << 1) | polarity) ^ 1);
  }
}

/**
 * The logical oracle of a structured formula (see the file comment), `wide` or `lean`. Search
 * qubit i holds local variable `f.register[i]`; a flag oracle's target follows the register.
 */
export function synthesizeStructured(f: StructuredFormula, kind: OracleKind, strategy: "wide" | "lean"): Circuit {
  const n = f.register.length;
  const layout = { search: n, target: kind === "flag" ? 1 : 0 };
  const b = new CircuitBuilder(layout, 4 * (f.structure.definitions.length + f.remaining.clauseStart.length) + 16);
  const checks = collectChecks(f, b);
  if (checks.unsat) return new CircuitBuilder(layout).finish(); // f = 0: the identity
  const target = n;
  if (checks.violated.n === 0) {
    // Nothing left to check: f = 1 on every register value.
    const out = new CircuitBuilder(layout);
    if (kind === "phase") out.add(K.gphase, 4);
    else out.add(K.x, pos(target));
    return out.finish();
  }
  return strategy === "wide" ? wide(b, checks, kind, target, layout) : lean(b, checks, kind, target);
}

/**
 * Two-input ANDs (Toffoli-equivalents) of the wide phase oracle of a structured formula, one way
 * up: a w-input AND is w - 1 of them and the mark over c bits c - 2. The same measure as
 * {@link clauseAnds}, for choosing the cheaper construction.
 */
export function structuredAnds(f: StructuredFormula): number {
  const checks = collectChecks(f, new CircuitBuilder({ search: f.register.length, target: 0 }));
  if (checks.unsat) return 0;
  const ops = checks.ops;
  let ands = 0;
  for (let i = 0; i < ops.n; i++) if (ops.kinds[i] === K.and) ands += ops.starts[i + 1]! - ops.starts[i]! - 2;
  const marks = new Set(checks.violated.a.subarray(0, checks.violated.n)).size;
  return ands + Math.max(0, marks - 2);
}

/** The same measure for the clause construction (synth/wide.ts) of simplified clauses. */
export function clauseAnds(c: SimplifiedCnf): number {
  if (c.unsat) return 0;
  const m = c.clauseStart.length - 1;
  let ands = 0;
  for (let i = 0; i < m; i++) ands += Math.max(0, c.clauseStart[i + 1]! - c.clauseStart[i]! - 1);
  return ands + Math.max(0, m - 2);
}

/** The checks of a structured formula (see the file comment), recorded, with their violated bits. */
function collectChecks(f: StructuredFormula, b: CircuitBuilder, splitGroups = false): Checks {
  const s = f.structure;
  const n = f.register.length;
  const checks = new Checks(b, splitGroups);
  const N = s.variables;
  // Variables neither on the register, constant nor defined take 0 (see Completion, rule 5).
  const sig = new Int32Array(N + 1).fill(FALSE);
  const held = new Uint8Array(N + 1);
  for (const l of f.constants) {
    sig[Math.abs(l)] = l > 0 ? TRUE : FALSE;
    held[Math.abs(l)] = 1;
  }
  for (let i = 0; i < n; i++) {
    sig[f.register[i]!] = pos(i);
    held[f.register[i]!] = 1;
  }
  const lit = (l: number): number => (l > 0 ? sig[l]! : negate(sig[-l]!));
  const value = (d: (typeof s.definitions)[number]): { signal: number; owned: number } => {
    const ins = d.inputs.map(lit);
    switch (d.kind) {
      case "equiv":
        return { signal: ins[0]!, owned: -1 };
      case "not":
        return { signal: negate(ins[0]!), owned: -1 };
      case "and":
        return checks.and(ins);
      case "or": {
        const r = checks.and(ins.map(negate));
        return { signal: negate(r.signal), owned: r.owned };
      }
      case "xor":
        return checks.xor(ins);
      case "xnor": {
        const r = checks.xor(ins);
        return { signal: negate(r.signal), owned: r.owned };
      }
    }
  };
  // A definition is computed (free register, its variable neither on the register nor constant)
  // or checked against its variable's signal. Computed ones nothing reads are left out.
  const defs = s.definitions;
  const computed = defs.map((d) => f.computeDefinitions && !held[d.variable]);
  const needed = new Uint8Array(N + 1);
  const need = (l: number): void => {
    needed[Math.abs(l)] = 1;
  };
  for (const p of s.parities) p.variables.forEach(need);
  for (const g of s.groups) g.variables.forEach(need);
  f.remaining.lits.forEach(need);
  for (let d = defs.length - 1; d >= 0; d--) if (!computed[d] || needed[defs[d]!.variable]) defs[d]!.inputs.forEach(need);
  for (let d = 0; d < defs.length; d++) if (computed[d] && needed[defs[d]!.variable]) sig[defs[d]!.variable] = value(defs[d]!).signal;
  checks.persistentEnd = checks.ops.n;
  checks.persistentQubits = b.qubits;
  for (let d = 0; d < defs.length; d++) {
    if (computed[d]) continue;
    checks.beginSegment();
    const v = value(defs[d]!);
    checks.equal(v.signal, v.owned, sig[defs[d]!.variable]!);
  }
  for (const p of s.parities) {
    checks.beginSegment();
    const r = checks.xor(p.variables.map(lit));
    checks.failWhen(p.parity ? negate(r.signal) : r.signal);
  }
  for (const g of s.groups) {
    checks.beginSegment();
    checks.group(g.variables.map(lit), g.exactlyOne);
  }
  const rem = f.remaining;
  if (rem.unsat) checks.unsat = true;
  const clause: number[] = [];
  for (let i = 0; i + 1 < rem.clauseStart.length && !checks.unsat; i++) {
    checks.beginSegment();
    clause.length = 0;
    for (let k = rem.clauseStart[i]!; k < rem.clauseStart[i + 1]!; k++) clause.push(lit(rem.lits[k]!));
    checks.clause(clause);
  }
  checks.beginSegment(); // sentinel
  return checks;
}

/**
 * The wide oracle's mark inputs: one per distinct violated bit (negated: fires when the bit is
 * clear), ascending; null when a bit is wanted both ways (it can never be all clear: f = 0).
 */
export function wideMarkInputs(violated: ArrayLike<number>): number[] | null {
  const ok = Array.from(violated, (v) => v ^ 1).sort((x, y) => x - y);
  let w = 0;
  for (let i = 0; i < ok.length; i++) {
    if (w > 0 && ok[w - 1] === ok[i]) continue;
    if (w > 0 && ok[w - 1] === (ok[i]! ^ 1)) return null;
    ok[w++] = ok[i]!;
  }
  ok.length = w;
  return ok;
}

/**
 * The recorded checks of a structured formula (see the file comment) as plain arrays, for
 * cost/structuredSource.ts, which generates the wide and lean oracles from them operation by
 * operation instead of building the circuit (whose lean half has a fresh work qubit per carry).
 * Qubits: the search register 0..n-1, a flag oracle's target n, then the checks' work qubits
 * up to `qubits`.
 */
export interface StructuredChecks {
  /** Some check can never hold: the oracle is the identity. */
  readonly unsat: boolean;
  /** Operation i: kind `kinds[i]`, operands `ops[starts[i]..starts[i + 1])` (the target last). */
  readonly kinds: Uint8Array;
  readonly starts: Uint32Array;
  readonly ops: Int32Array;
  /** Operations recorded. */
  readonly count: number;
  /** The violated bits (encoded controls), segment by segment. */
  readonly violated: Int32Array;
  /** Per segment its first operation and first violated bit; one more entry closes the last. */
  readonly segOp: Int32Array;
  readonly segBit: Int32Array;
  /** Operations before this compute definitions (free register) and stay until the end. */
  readonly persistentEnd: number;
  /** Qubits in all (search, target, checks' work qubits). */
  readonly qubits: number;
}

/** The checks synthesizeStructured builds its oracle from (see {@link StructuredChecks}). */
export function structuredChecks(f: StructuredFormula, kind: OracleKind): StructuredChecks {
  const b = new CircuitBuilder({ search: f.register.length, target: kind === "flag" ? 1 : 0 }, 16);
  const c = collectChecks(f, b);
  const o = c.ops;
  return {
    unsat: c.unsat,
    kinds: o.kinds.slice(0, o.n),
    starts: o.starts.slice(0, o.n + 1),
    ops: o.ops.slice(0, o.starts[o.n]!),
    count: o.n,
    violated: c.violated.a.slice(0, c.violated.n),
    segOp: c.segOp.a.slice(0, c.segOp.n),
    segBit: c.segBit.a.slice(0, c.segBit.n),
    persistentEnd: c.persistentEnd,
    qubits: b.qubits,
  };
}

function wide(b: CircuitBuilder, checks: Checks, kind: OracleKind, target: number, layout: { search: number; target: number }): Circuit {
  const ok = wideMarkInputs(checks.violated.a.subarray(0, checks.violated.n));
  if (ok === null) return new CircuitBuilder(layout).finish();
  checks.ops.emit(b, false);
  mark(b, kind, ok, target);
  checks.ops.emit(b, true);
  return b.finish();
}

function lean(b: CircuitBuilder, checks: Checks, kind: OracleKind, target: number): Circuit {
  const bits = checks.violated.n;
  const w = Math.ceil(Math.log2(bits + 1));
  const counter = Array.from({ length: w }, () => b.newWork());
  const keep = new Uint8Array(b.qubits + 1);
  for (const q of counter) keep[q] = 1;
  // Work qubits of the computed definitions hold their values until the end.
  const ops = checks.ops;
  for (let i = 0; i < checks.persistentEnd; i++) keep[ops.ops[ops.starts[i + 1]! - 1]! >>> 1] = 1;
  const segments = checks.segOp.n - 1;
  const forward = new OpList();
  forward.append(ops, 0, checks.persistentEnd, false);
  for (let sgm = 0; sgm < segments; sgm++) {
    const from = checks.segOp.a[sgm]!;
    const to = checks.segOp.a[sgm + 1]!;
    forward.append(ops, from, to, false);
    for (let v = checks.segBit.a[sgm]!; v < checks.segBit.a[sgm + 1]!; v++) count(b, counter, checks.violated.a[v]!, false, forward);
    forward.append(ops, from, to, true);
  }
  // The mirror half: the same checks from the last, each count undone by a decrement (the
  // increment's inverse built so that every counter qubit ends as a target, where its span ends).
  const backward = new OpList();
  for (let sgm = segments - 1; sgm >= 0; sgm--) {
    const from = checks.segOp.a[sgm]!;
    const to = checks.segOp.a[sgm + 1]!;
    backward.append(ops, from, to, false);
    for (let v = checks.segBit.a[sgm + 1]! - 1; v >= checks.segBit.a[sgm]!; v--) count(b, counter, checks.violated.a[v]!, true, backward);
    backward.append(ops, from, to, true);
  }
  backward.append(ops, 0, checks.persistentEnd, true);
  forward.emit(b, false);
  mark(b, kind, counter.map((q) => pos(q) | 1), target); // fires when the counter is 0
  // The mirror runs on fresh work qubits (each used for one compute-uncompute span, which the
  // work-qubit reuse after lowering folds onto few wires), except those that hold values across.
  const base = b.search + b.target;
  const fresh = new Map<number, number>();
  backward.emit(b, false, (op) => {
    const q = op >>> 1;
    if (q < base || (q < keep.length && keep[q])) return op;
    let r = fresh.get(q);
    if (r === undefined) fresh.set(q, (r = b.newWork()));
    return (r << 1) | (op & 1);
  });
  return b.finish();
}

/**
 * Adds the encoded control `bit` into the counter (least significant qubit first), or subtracts
 * it (`down`), as synth/lean.ts's increment: carry i is bit AND q0 AND ... AND qi (for a
 * decrement, of the negated qi: a borrow), computed with temporary ANDs; the counter flips from
 * the top down, each carry uncomputed right after the flip it drives (its inputs are still
 * unchanged then). Each counter qubit is last touched as a target.
 */
function count(b: CircuitBuilder, counter: readonly number[], bit: number, down: boolean, out: OpList): void {
  const w = counter.length;
  const carries = Array.from({ length: w - 1 }, () => b.newWork());
  const q = (i: number): number => pos(counter[i]!) | (down ? 1 : 0);
  let prev = bit;
  for (let i = 0; i + 1 < w; i++) {
    out.push(K.and, [prev, q(i), pos(carries[i]!)]);
    prev = pos(carries[i]!);
  }
  for (let i = w - 1; i >= 1; i--) {
    out.push(K.mcx, [pos(carries[i - 1]!), pos(counter[i]!)]);
    const input = i - 1 === 0 ? bit : pos(carries[i - 2]!);
    out.push(K.unand, [input, q(i - 1), pos(carries[i - 1]!)]);
  }
  out.push(K.mcx, [bit, pos(counter[0]!)]);
}

/**
 * The structured formula's checks as the generic checks of synth/checks.ts, so that the blocked
 * and fan-out constructions of synth/blocked.ts conjoin them as they conjoin clauses. Each
 * segment (a checked definition, a parity, one conflict bit of a group split as in group(), a
 * remaining clause) is one check; violated bits of one segment, were there several, would be
 * joined by one temporary AND of their negations inside the check, which costs what those bits
 * would have cost as inputs of the block's tree or of the mark. A violated bit read straight from a search qubit or a
 * computed definition is kept by one check only (the others would repeat a mark input); one wanted
 * both ways makes the formula unsatisfiable, as in `wide`.
 *
 * Qubits of the recorded operations below `persistentQubits` (search register, target, computed
 * definitions) are the builder's, mapped once; those a check computes into are fresh on every
 * computation (a block is computed again to be erased). Occurrences are the reads of those
 * outside qubits (controls, and outside violated bits) in recorded order, for fan-out copies.
 */
class SegmentChecks implements BlockChecks {
  readonly count: number;
  /** Per check: its segment, and its kept violated bits (recorded encoding). */
  private readonly segments: number[] = [];
  private readonly bits: number[][] = [];
  /** Per check: the index of its first occurrence. */
  private readonly starts: number[] = [];
  /** False when two checks want one outside bit both ways. */
  readonly satisfiable: boolean;

  constructor(private readonly checks: Checks, private readonly outside: (op: number) => number) {
    const seen = new Set<number>();
    let satisfiable = true;
    let occurrences = 0;
    const segments = checks.segOp.n - 1;
    for (let sgm = 0; sgm < segments; sgm++) {
      const kept: number[] = [];
      for (let v = checks.segBit.a[sgm]!; v < checks.segBit.a[sgm + 1]!; v++) {
        const bit = checks.violated.a[v]!;
        if (this.isOutside(bit)) {
          if (seen.has(bit)) continue;
          if (seen.has(bit ^ 1)) satisfiable = false;
          seen.add(bit);
        }
        kept.push(bit);
      }
      if (kept.length === 0) continue;
      this.segments.push(sgm);
      this.bits.push(kept);
      this.starts.push(occurrences);
      occurrences += this.reads(sgm, kept).length;
    }
    this.count = this.segments.length;
    this.satisfiable = satisfiable;
  }

  private isOutside(op: number): boolean {
    return op >>> 1 < this.checks.persistentQubits;
  }

  /** The outside reads of a segment, in recorded order: operation controls, then kept outside bits. */
  private reads(sgm: number, kept: readonly number[]): number[] {
    const ops = this.checks.ops;
    const out: number[] = [];
    for (let i = this.checks.segOp.a[sgm]!; i < this.checks.segOp.a[sgm + 1]!; i++) {
      // Every recorded operation (and, cx) writes its last operand and reads the others.
      for (let p = ops.starts[i]!; p + 1 < ops.starts[i + 1]!; p++) if (this.isOutside(ops.ops[p]!)) out.push(ops.ops[p]!);
    }
    for (const bit of kept) if (this.isOutside(bit)) out.push(bit);
    return out;
  }

  occurrences(i: number): { start: number; controls: ArrayLike<number> } {
    return { start: this.starts[i]!, controls: this.reads(this.segments[i]!, this.bits[i]!).map(this.outside) };
  }

  compute(b: CircuitBuilder, i: number, out: Op[], holder: Holder | null): number {
    const sgm = this.segments[i]!;
    const ops = this.checks.ops;
    const fresh = new Map<number, number>();
    let occurrence = this.starts[i]!;
    const read = (op: number): number => {
      if (!this.isOutside(op)) return inner(op);
      const mapped = this.outside(op);
      return holder === null ? mapped : holder(occurrence++, mapped);
    };
    const inner = (op: number): number => {
      const q = op >>> 1;
      let r = fresh.get(q);
      if (r === undefined) fresh.set(q, (r = b.newWork()));
      return (r << 1) | (op & 1);
    };
    for (let k = this.checks.segOp.a[sgm]!; k < this.checks.segOp.a[sgm + 1]!; k++) {
      const operands: number[] = [];
      const last = ops.starts[k + 1]! - 1;
      for (let p = ops.starts[k]!; p < last; p++) operands.push(read(ops.ops[p]!));
      operands.push(inner(ops.ops[last]!));
      const op: Op = [ops.kinds[k]!, operands];
      out.push(op);
      b.addN(op[0], op[1]);
    }
    const bits = this.bits[i]!.map(read);
    if (bits.length === 1) return bits[0]!;
    // Violated when not every bit is clear: the negation of the AND of their negations.
    const w = b.newWork();
    const op: Op = [K.and, [...bits.map((v) => v ^ 1), pos(w)]];
    out.push(op);
    b.addN(op[0], op[1]);
    return pos(w) | 1;
  }
}

/**
 * The structured formula's oracle by a blocked or fan-out construction (synth/blocked.ts's
 * {@link conjoinChecks} over its checks): the computed definitions of a free register first,
 * then the checks conjoined in blocks (or with fan-out copies), then the definitions uncomputed.
 */
export function synthesizeStructuredBlocked(f: StructuredFormula, kind: OracleKind, plan: BlockPlan): Circuit {
  const n = f.register.length;
  const layout = { search: n, target: kind === "flag" ? 1 : 0 };
  const checks = collectChecks(f, new CircuitBuilder(layout, 4 * (f.structure.definitions.length + f.remaining.clauseStart.length) + 16), true);
  if (checks.unsat) return new CircuitBuilder(layout).finish(); // f = 0: the identity
  const target = n;
  if (checks.violated.n === 0) {
    const out = new CircuitBuilder(layout);
    if (kind === "phase") out.add(K.gphase, 4);
    else out.add(K.x, pos(target));
    return out.finish();
  }
  const b = new CircuitBuilder(layout, 8 * checks.ops.n * (2 << Math.min(plan.sizes.length, 8)) + 16);
  const base = n + layout.target;
  // The computed definitions' qubits, the builder's own from the first use on.
  const mapped = new Int32Array(Math.max(0, checks.persistentQubits - base)).fill(-1);
  const outside = (op: number): number => {
    const q = op >>> 1;
    if (q < base) return op;
    if (mapped[q - base]! < 0) mapped[q - base] = b.newWork();
    return (mapped[q - base]! << 1) | (op & 1);
  };
  const generic = new SegmentChecks(checks, outside);
  if (!generic.satisfiable) return new CircuitBuilder(layout).finish();
  const prefix = new OpList();
  prefix.append(checks.ops, 0, checks.persistentEnd, false);
  prefix.emit(b, false, outside);
  conjoinChecks(b, kind, target, generic, plan);
  prefix.emit(b, true, outside);
  return b.finish();
}

/** The shape the construction candidates are chosen by: checks, most reads of one qubit, all reads. */
export function structuredShape(f: StructuredFormula): { m: number; reads: number; literals: number } {
  const n = f.register.length;
  const checks = collectChecks(f, new CircuitBuilder({ search: n, target: 0 }), true);
  if (checks.unsat) return { m: 0, reads: 0, literals: 0 };
  const generic = new SegmentChecks(checks, (op) => op);
  const count = new Map<number, number>();
  let reads = 0;
  let literals = 0;
  for (let i = 0; i < generic.count; i++) {
    const { controls } = generic.occurrences(i);
    literals += controls.length;
    for (let j = 0; j < controls.length; j++) {
      const q = controls[j]! >>> 1;
      const r = (count.get(q) ?? 0) + 1;
      count.set(q, r);
      reads = Math.max(reads, r);
    }
  }
  return { m: generic.count, reads, literals };
}
