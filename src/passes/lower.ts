/**
 * Lowering: from the logical level (multi-input temporary ANDs, multi-controlled X and Z with
 * control polarities) to one of three gate bases.
 *
 *   mcx         multi-controlled gates stay whole (OpenQASM 3 ctrl/negctrl modifiers); a temporary
 *               AND is a multi-controlled X onto its fresh target.
 *   toffoli     x, cx, ccx, z, cz, h, gphase: every multi-input AND becomes a tree of 2-input ANDs
 *               (each one ccx) over fresh work qubits; multi-controlled gates likewise.
 *   clifford+t  x, y, z, h, s, sdg, t, tdg, cx, cz, gphase: a 2-input AND is the 4-T temporary
 *               logical-AND of Gidney 2018; a Toffoli is 7 T at T-depth 3 (Amy, Maslov, Mosca &
 *               Roetteler 2013).
 *
 * Uncomputing a temporary AND is either its unitary inverse or, with `measured`, Gidney's
 * measurement-based erasure: H on the AND qubit, measure it, on outcome 1 apply CZ to the AND's
 * inputs, reset it. Both outcomes leave exactly the state before the AND was computed.
 *
 * Control polarity (fire on |0>) costs X gates in the toffoli and clifford+t bases. They are
 * placed lazily: a qubit stays flipped while consecutive gates want it flipped, and is restored
 * before any other use and at the end.
 */
import { CircuitBuilder, K, kindName, layoutOf, negated, operands, pos, qubitOf, type Circuit } from "../ir/circuit.js";

/** The gate basis of an emitted circuit. */
export type Basis = "mcx" | "toffoli" | "clifford+t";
/** How temporary ANDs are uncomputed. */
export type Uncompute = "unitary" | "measured";

export const BASES: readonly Basis[] = ["mcx", "toffoli", "clifford+t"];
export const UNCOMPUTES: readonly Uncompute[] = ["unitary", "measured"];

export interface LowerOptions {
  readonly basis: Basis;
  readonly uncompute: Uncompute;
  /**
   * In clifford+t, how a 2-input AND is built: the 4-T temporary AND (default) or a full 7-T
   * Toffoli (the textbook reference).
   */
  readonly andGate?: "temporary-and" | "toffoli";
}

/** A 2-input AND as lowered: inputs (encoded) and output qubit. */
type And2 = readonly [a: number, b: number, t: number];

export function lower(c: Circuit, opts: LowerOptions): Circuit {
  return new Lowering(c, opts).run();
}

class Lowering {
  private readonly out: CircuitBuilder;
  /** 1 where a qubit is currently flipped by a pending X (grows with the work register). */
  private flipped = new Uint8Array(64);
  /**
   * How each logical AND was lowered, so its uncompute can undo exactly that: records[recordAt[t]]
   * starts a record of the AND into qubit t: count, copied control (or -1), then count triples
   * (a, b, w) of the 2-input ANDs in the order they were computed. Flat numbers, no objects per AND.
   */
  private readonly records: number[] = [];
  private recordAt = new Int32Array(64).fill(-1);

  constructor(private readonly c: Circuit, private readonly opts: LowerOptions) {
    this.out = new CircuitBuilder(layoutOf(c), c.gates * 6);
  }

  run(): Circuit {
    const c = this.c;
    const mcx = this.opts.basis === "mcx";
    for (let g = 0; g < c.gates; g++) {
      const cond = c.cond[g]!;
      const k = c.kind[g]!;
      if (mcx && k !== K.unand && k !== K.and) {
        this.out.copy(c, g);
        continue;
      }
      if (!mcx && k === K.unand) {
        // Only the target is needed: the AND's lowering was recorded under it.
        this.unandK(qubitOf(c.ops[c.opStart[g + 1]! - 1]!));
        continue;
      }
      if (!mcx && k === K.and && this.smallAnd(g)) continue;
      const ops = Array.from(operands(c, g));
      if (mcx) this.mcxBasis(g, ops, cond);
      else this.gateBasis(g, ops, cond);
    }
    for (let q = 0; q < this.out.qubits; q++) if (this.flipped[q]) this.plain(q);
    return this.out.finish();
  }

  // ---- the mcx basis: keep multi-controlled gates whole ----------------------------------

  private mcxBasis(g: number, ops: number[], cond: number): void {
    const o = this.out;
    const k = this.c.kind[g]!;
    if (k === K.and) o.addN(K.mcx, ops, cond);
    else if (k === K.unand) {
      if (this.opts.uncompute === "unitary") o.addN(K.mcx, ops, cond);
      else this.measuredErase(qubitOf(ops[ops.length - 1]!), (bit) => o.addN(K.mcz, ops.slice(0, -1), bit));
    } else o.addN(k, ops, cond);
  }

  // ---- the toffoli and clifford+t bases ----------------------------------------------------

  private gateBasis(g: number, ops: number[], cond: number): void {
    const name = kindName(this.c, g);
    const target = ops[ops.length - 1]!;
    switch (name) {
      case "and":
        return this.andK(ops.slice(0, -1), qubitOf(target));
      case "unand":
        return this.unandK(qubitOf(target));
      case "mcx":
        return this.mcxK(ops.slice(0, -1), qubitOf(target), cond);
      case "mcz":
        return this.mczK(ops, cond);
      case "gphase":
        this.out.addN(K.gphase, ops, cond);
        return;
      default:
        for (const op of ops.slice(0, name === "measure" ? 1 : ops.length)) this.plain(qubitOf(op));
        this.out.addN(this.c.kind[g]!, ops, cond);
    }
  }

  private growFlips(q: number): void {
    const f = new Uint8Array(Math.max(q + 1, this.flipped.length * 2));
    f.set(this.flipped);
    this.flipped = f;
  }

  /** Makes qubit q hold its own value (undoing a pending flip). */
  private plain(q: number): void {
    if (this.flipped[q]) {
      this.out.add(K.x, pos(q));
      this.flipped[q] = 0;
    }
  }

  /** Makes an encoded control usable as a plain positive control; returns its qubit. */
  private control(op: number): number {
    const q = qubitOf(op);
    const want = negated(op) ? 1 : 0;
    if (q >= this.flipped.length) this.growFlips(q);
    if (this.flipped[q] !== want) {
      this.out.add(K.x, pos(q));
      this.flipped[q] = want;
    }
    return q;
  }

  /** Reduces encoded controls to `r` encoded controls by 2-input ANDs into fresh qubits. */
  private tree(items: number[], r: number, record: And2[]): number[] {
    if (items.length === r + 1) {
      // One AND is enough (a 3-literal clause down to 2 inputs): no intermediate lists.
      const w = this.out.newWork();
      this.and2(items[0]!, items[1]!, w);
      record.push([items[0]!, items[1]!, w]);
      return r === 1 ? [pos(w)] : [pos(w), items[2]!];
    }
    while (items.length > r) {
      const next: number[] = [];
      let excess = items.length - r;
      for (let i = 0; i < items.length; ) {
        if (excess > 0 && i + 1 < items.length) {
          const w = this.out.newWork();
          this.and2(items[i]!, items[i + 1]!, w);
          record.push([items[i]!, items[i + 1]!, w]);
          next.push(pos(w));
          excess--;
          i += 2;
        } else next.push(items[i++]!);
      }
      items = next;
    }
    return items;
  }

  private undoTree(record: And2[]): void {
    for (let i = record.length - 1; i >= 0; i--) this.unand2(...record[i]!);
  }

  /** Stores the record of the AND into t (see `records`). */
  private remember(t: number, copied: number, record: readonly And2[]): void {
    this.growRecords(t);
    this.recordAt[t] = this.records.length;
    this.records.push(record.length, copied);
    for (const [a, b, w] of record) this.records.push(a, b, w);
  }

  private growRecords(t: number): void {
    if (t < this.recordAt.length) return;
    const r = new Int32Array(Math.max(t + 1, this.recordAt.length * 2)).fill(-1);
    r.set(this.recordAt);
    this.recordAt = r;
  }

  /**
   * The common case without lists: an AND of two or three controls on distinct qubits. Returns
   * false (doing nothing) for anything else.
   */
  private smallAnd(g: number): boolean {
    const c = this.c;
    const s = c.opStart[g]!;
    const n = c.opStart[g + 1]! - s - 1;
    if (n !== 2 && n !== 3) return false;
    const a = c.ops[s]!;
    const b = c.ops[s + 1]!;
    const t = qubitOf(c.ops[s + n]!);
    const d = n === 3 ? c.ops[s + 2]! : -1;
    if (qubitOf(a) === qubitOf(b) || (n === 3 && (qubitOf(a) === qubitOf(d) || qubitOf(b) === qubitOf(d)))) return false;
    this.growRecords(t);
    this.recordAt[t] = this.records.length;
    if (n === 2) {
      this.and2(a, b, t);
      this.records.push(1, -1, a, b, t);
    } else {
      const w = this.out.newWork();
      this.and2(a, b, w);
      this.and2(pos(w), d, t);
      this.records.push(2, -1, a, b, w, pos(w), d, t);
    }
    return true;
  }

  private andK(raw: number[], t: number): void {
    const record: And2[] = [];
    const ctrls = normalizeControls(raw);
    if (ctrls === null) {
      this.remember(t, -1, record); // never fires: t stays |0>
      return;
    }
    if (ctrls.length === 1) this.copy(ctrls[0]!, t);
    else {
      const [a, b] = this.tree(ctrls, 2, record);
      this.and2(a!, b!, t);
      record.push([a!, b!, t]);
    }
    this.remember(t, ctrls.length === 1 ? ctrls[0]! : -1, record);
  }

  /** A one-input AND is a copy: t ^= (control fires). Its own inverse. */
  private copy(ctrl: number, t: number): void {
    this.plain(t);
    this.out.add(K.cx, pos(this.control(ctrl & ~1)), pos(t));
    if (negated(ctrl)) this.out.add(K.x, pos(t));
  }

  private unandK(t: number): void {
    const at = t < this.recordAt.length ? this.recordAt[t]! : -1;
    if (at < 0) throw new Error(`lowering: uncompute of work qubit ${t} without its AND`);
    this.recordAt[t] = -1;
    const r = this.records;
    const count = r[at]!;
    const copied = r[at + 1]!;
    if (count > 0) for (let i = count - 1; i >= 0; i--) this.unand2(r[at + 2 + 3 * i]!, r[at + 3 + 3 * i]!, r[at + 4 + 3 * i]!);
    else if (copied >= 0) this.copy(copied, t);
  }

  private mcxK(raw: number[], t: number, cond: number): void {
    const o = this.out;
    if (cond >= 0) throw new Error("lowering: conditioned multi-controlled X is not produced by synthesis");
    const ctrls = normalizeControls(raw);
    if (ctrls === null) return;
    this.plain(t);
    if (ctrls.length === 0) {
      o.add(K.x, pos(t));
      return;
    }
    if (ctrls.length === 1) {
      o.add(K.cx, pos(this.control(ctrls[0]!)), pos(t));
      return;
    }
    const record: And2[] = [];
    const toOne = this.opts.basis === "clifford+t" && this.opts.uncompute === "measured" && this.opts.andGate !== "toffoli";
    if (toOne) {
      const [a] = this.tree(ctrls, 1, record);
      o.add(K.cx, pos(this.control(a!)), pos(t));
    } else {
      const [a, b] = this.tree(ctrls, 2, record);
      const qa = this.control(a!);
      const qb = this.control(b!);
      this.ccx(qa, qb, t);
    }
    this.undoTree(record);
  }

  private mczK(raw: number[], cond: number): void {
    const o = this.out;
    if (cond >= 0) throw new Error("lowering: conditioned multi-controlled Z is not produced by synthesis");
    const qs = normalizeControls(raw);
    if (qs === null) return;
    if (qs.length === 0) {
      o.add(K.gphase, 4);
      return;
    }
    const record: And2[] = [];
    const [a, b] = this.tree(qs, 2, record);
    if (b === undefined) o.add(K.z, pos(this.control(a!)));
    else o.add(K.cz, pos(this.control(a!)), pos(this.control(b)));
    this.undoTree(record);
  }

  // ---- 2-input ANDs and Toffolis ------------------------------------------------------------

  private and2(a: number, b: number, t: number): void {
    const qa = this.control(a);
    const qb = this.control(b);
    this.plain(t);
    if (this.opts.basis === "toffoli" || this.opts.andGate === "toffoli") this.ccx(qa, qb, t);
    else temporaryAnd(this.out, qa, qb, t);
  }

  private unand2(a: number, b: number, t: number): void {
    if (this.opts.uncompute === "measured" && this.opts.andGate !== "toffoli") {
      this.measuredErase(t, (bit) => {
        const qa = this.control(a);
        const qb = this.control(b);
        this.out.add(K.cz, pos(qa), pos(qb), NaN, bit);
      });
      return;
    }
    const qa = this.control(a);
    const qb = this.control(b);
    this.plain(t);
    if (this.opts.basis === "toffoli" || this.opts.andGate === "toffoli") this.ccx(qa, qb, t);
    else temporaryAndInverse(this.out, qa, qb, t);
  }

  private ccx(a: number, b: number, t: number): void {
    if (this.opts.basis === "clifford+t") toffoli7(this.out, a, b, t);
    else this.out.add(K.ccx, pos(a), pos(b), pos(t));
  }

  /**
   * Gidney 2018: erase an AND qubit by measuring it in the X basis; on outcome 1 the inputs
   * pick up the phase (-1)^(AND), which `fixup(bit)` removes; then reset the qubit.
   */
  private measuredErase(t: number, fixup: (bit: number) => void): void {
    const o = this.out;
    if (this.opts.basis !== "mcx") this.plain(t);
    const bit = o.newClbit();
    o.add(K.h, pos(t));
    o.add(K.measure, pos(t), bit);
    fixup(bit);
    o.add(K.reset, pos(t));
  }
}

/**
 * Controls as a set: a repeated control is dropped; a qubit wanted both on |0> and on |1> means
 * the gate never fires (null).
 */
export function normalizeControls(ops: readonly number[]): number[] | null {
  if (ops.length <= 16) {
    // Small gates (nearly all): a quadratic scan beats building a map.
    const out: number[] = [];
    next: for (const op of ops) {
      for (const o of out) {
        if (qubitOf(o) !== qubitOf(op)) continue;
        if (o !== op) return null;
        continue next;
      }
      out.push(op);
    }
    return out;
  }
  const seen = new Map<number, number>();
  const out: number[] = [];
  for (const op of ops) {
    const q = qubitOf(op);
    const prev = seen.get(q);
    if (prev === undefined) {
      seen.set(q, op);
      out.push(op);
    } else if (prev !== op) return null;
  }
  return out;
}

/**
 * The temporary logical-AND of Gidney 2018 ("Halving the cost of quantum addition"): t starts in
 * |0> and ends holding a AND b, with 4 T gates at T-depth 2. H and T on t prepare the T state;
 * the CNOT network exposes the parities t, a^t, b^t, a^b^t to T, T', T', T; H returns t to the
 * computational basis and S cancels the phase i^(ab) the four terms leave behind.
 */
export function temporaryAnd(o: CircuitBuilder, a: number, b: number, t: number): void {
  const [A, B, T] = [pos(a), pos(b), pos(t)];
  o.add(K.h, T).add(K.t, T);
  o.add(K.cx, A, T).add(K.cx, B, T).add(K.cx, T, A).add(K.cx, T, B);
  o.add(K.tdg, A).add(K.tdg, B).add(K.t, T);
  o.add(K.cx, T, A).add(K.cx, T, B).add(K.cx, A, T).add(K.cx, B, T);
  o.add(K.h, T).add(K.s, T);
}

/** The exact inverse of {@link temporaryAnd} (unitary uncomputation, 4 T). */
export function temporaryAndInverse(o: CircuitBuilder, a: number, b: number, t: number): void {
  const [A, B, T] = [pos(a), pos(b), pos(t)];
  o.add(K.sdg, T).add(K.h, T);
  o.add(K.cx, B, T).add(K.cx, A, T).add(K.cx, T, B).add(K.cx, T, A);
  o.add(K.tdg, T).add(K.t, B).add(K.t, A);
  o.add(K.cx, T, B).add(K.cx, T, A).add(K.cx, B, T).add(K.cx, A, T);
  o.add(K.tdg, T).add(K.h, T);
}

/**
 * Toffoli with 7 T at T-depth 3: H on the target around a doubly-controlled Z whose phase
 * polynomial a + b + c - (a^b) - (a^c) - (b^c) + (a^b^c) (in units of pi/4) is applied in three
 * layers of parities: {a, b, c}, {a^b^c, a^b, a^c}, {b^c} (Amy, Maslov, Mosca & Roetteler 2013).
 */
export function toffoli7(o: CircuitBuilder, a: number, b: number, c: number): void {
  const [A, B, C] = [pos(a), pos(b), pos(c)];
  o.add(K.h, C);
  o.add(K.t, A).add(K.t, B).add(K.t, C);
  o.add(K.cx, A, B).add(K.cx, A, C).add(K.cx, B, A).add(K.cx, C, A);
  o.add(K.t, A).add(K.tdg, B).add(K.tdg, C);
  o.add(K.cx, B, C);
  o.add(K.tdg, C);
  o.add(K.cx, B, C).add(K.cx, C, A).add(K.cx, B, A).add(K.cx, A, C).add(K.cx, A, B);
  o.add(K.h, C);
}
