/**
 * The structured oracles (synth/structured.ts: recovered definitions, parities and one-hot groups
 * checked natively) as streams of logical operations, generated from the recorded checks without
 * building the logical circuit. The built lean circuit gives every carry of every count and every
 * check's mirror copy a qubit of its own (bw_large.d: 8.6 million gates on 4.2 million qubits);
 * here only the checks are kept (about the size of the formula), and the operations go straight
 * to the sink.
 *
 * The stream is exactly what sources.ts's replayLogical makes of the built circuit: the same
 * operations in the same order, a work qubit's id taken at its first use and given back after its
 * last (where the built circuit uses it for the last time), the same `dies` flags. A test holds
 * the two equal call for call. The last uses are known from the construction's shape instead of a
 * scan of the circuit:
 *  - a check's work qubit is first touched as the target of the operation that computes it, and
 *    uncomputing replays the check's operations inverted, so its last use is the inverted copy of
 *    the first operation touching it (`firstTouch`);
 *  - the computed definitions of a free register (the persistent prefix) stay until the final
 *    uncomputation of the prefix;
 *  - a count's carries end at their uncomputing AND; the lean counter at the last count of the
 *    mirror half, on the CNOTs that flip it (each counter qubit is last touched as a target).
 */
import { K, pos } from "../ir/circuit.js";
import type { OracleKind, Strategy, StructuredFormula } from "../synth/index.js";
import { structuredChecks, wideMarkInputs, type StructuredChecks } from "../synth/structured.js";
import { VirtualIds, type LogicalSink } from "./lowering.js";
import { sinkMulti, type Fraction } from "./sources.js";
import { T_X } from "./templates.js";

const inverse = (k: number): number => (k === K.and ? K.unand : k === K.unand ? K.and : k);

/** A structured oracle ready to stream (its checks recorded once; each run streams them again). */
export class StructuredSource {
  /** Search qubits plus a flag oracle's target: the fixed wires (ids below are the qubits themselves). */
  readonly base: number;
  private readonly c: StructuredChecks;
  /** Per qubit of the checks, the first operation touching it (-1: none). */
  private readonly firstTouch: Int32Array;
  /** Qubits the persistent prefix computes (free register: computed definitions). */
  private readonly keep: Uint8Array;
  /** The lean counter's width. */
  private readonly width: number;
  /** Operands of the widest operation (the mark included). */
  private readonly widest: number;

  constructor(f: StructuredFormula, readonly kind: OracleKind, readonly strategy: Strategy) {
    const c = structuredChecks(f, kind);
    this.c = c;
    this.base = f.register.length + (kind === "flag" ? 1 : 0);
    const first = new Int32Array(c.qubits).fill(-1);
    let widest = 4;
    for (let i = c.count - 1; i >= 0; i--) {
      widest = Math.max(widest, c.starts[i + 1]! - c.starts[i]!);
      for (let p = c.starts[i]!; p < c.starts[i + 1]!; p++) first[c.ops[p]! >>> 1] = i;
    }
    this.firstTouch = first;
    const keep = new Uint8Array(c.qubits);
    for (let i = 0; i < c.persistentEnd; i++) keep[c.ops[c.starts[i + 1]! - 1]! >>> 1] = 1;
    this.keep = keep;
    this.width = Math.ceil(Math.log2(c.violated.length + 1));
    this.widest = Math.max(widest, c.violated.length + 2, this.width + 2);
  }

  /** Work qubits the checks name (a bound for the ids and wires one run needs, with the counter's few). */
  get checkQubits(): number {
    return this.c.qubits - this.base;
  }

  /** Template instances of one run, roughly (for progress weights). */
  get weight(): number {
    const c = this.c;
    const ops = 2 * c.count + c.violated.length;
    return this.strategy === "wide" ? 4 * ops : 2 * ops + 2 * c.violated.length * (6 * this.width + 2);
  }

  /** Streams the oracle into `sink` (ids from `ids`; `progress` told the fraction done). */
  emit(sink: LogicalSink, ids: VirtualIds, progress?: Fraction): void {
    const c = this.c;
    if (c.unsat) return; // f = 0: the identity
    const target = this.base - 1;
    if (c.violated.length === 0) {
      // Nothing left to check: f = 1 on every register value.
      if (this.kind === "phase") sink.gphase();
      else sink.single(T_X, target, false);
      return;
    }
    if (this.strategy === "wide") this.wide(sink, ids, progress);
    else this.lean(sink, ids, progress);
  }

  private wide(sink: LogicalSink, ids: VirtualIds, progress?: Fraction): void {
    const c = this.c;
    const ok = wideMarkInputs(c.violated);
    if (ok === null) return; // a bit wanted both ways: f = 0
    const r = new Replay(this.base, c.qubits, this.widest, sink, ids);
    const step = Math.max(1, Math.floor(c.count / 50));
    for (let i = 0; i < c.count; i++) {
      if (progress && i % step === 0) progress(i / (2 * c.count));
      r.recorded(c, i, false, -1, null);
    }
    this.mark(r, ok);
    for (let i = c.count - 1; i >= 0; i--) {
      if (progress && i % step === 0) progress(1 - i / (2 * c.count));
      r.recorded(c, i, true, this.firstTouch[c.ops[c.starts[i + 1]! - 1]! >>> 1] === i ? 1 : 0, null);
    }
  }

  /** synth/common.ts's mark over encoded controls (names). */
  private mark(r: Replay, ok: ArrayLike<number>): void {
    const n = ok.length;
    for (let p = 0; p < n; p++) r.ins[p] = ok[p]!;
    if (this.kind === "phase") r.put(K.mcz, n, false);
    else {
      r.ins[n] = pos(this.base - 1);
      r.put(K.mcx, n + 1, false);
    }
  }

  /**
   * synth/structured.ts's lean(): the prefix; each segment computed, its violated bits counted,
   * the segment uncomputed; the mark on counter = 0; the mirror half on fresh copies of the
   * checks' qubits (the prefix's kept), the counts undone; the prefix uncomputed.
   */
  private lean(sink: LogicalSink, ids: VirtualIds, progress?: Fraction): void {
    const c = this.c;
    const w = this.width;
    const Q = c.qubits;
    // Names: the checks' qubits, the counter, the carries (reused: a count's carries end within
    // it), the mirror copies of the checks' qubits.
    const counter = Q;
    const carries = Q + w;
    const copies = Q + 2 * w;
    const r = new Replay(this.base, copies + Q, this.widest, sink, ids);
    const keep = this.keep;
    const first = this.firstTouch;
    const base = this.base;
    const copy = (op: number): number => {
      const q = op >>> 1;
      return q < base || keep[q] ? op : op + (copies << 1);
    };
    const ends = (i: number): number => {
      const t = c.ops[c.starts[i + 1]! - 1]! >>> 1;
      return !keep[t] && first[t] === i ? 1 : 0;
    };
    const segments = c.segOp.length - 1;
    const step = Math.max(1, Math.floor(segments / 50));
    /** Adds (subtracts) one violated bit into the counter: synth/structured.ts's count(). */
    const count = (bit: number, down: boolean, last: boolean): void => {
      const q = (i: number): number => pos(counter + i) | (down ? 1 : 0);
      const ins = r.ins;
      let prev = bit;
      for (let i = 0; i + 1 < w; i++) {
        ins[0] = prev;
        ins[1] = q(i);
        ins[2] = pos(carries + i);
        r.put(K.and, 3, false);
        prev = pos(carries + i);
      }
      for (let i = w - 1; i >= 1; i--) {
        ins[0] = pos(carries + i - 1);
        ins[1] = pos(counter + i);
        r.put(K.mcx, 2, last);
        ins[0] = i - 1 === 0 ? bit : pos(carries + i - 2);
        ins[1] = q(i - 1);
        ins[2] = pos(carries + i - 1);
        r.put(K.unand, 3, true);
      }
      ins[0] = bit;
      ins[1] = pos(counter);
      r.put(K.mcx, 2, last);
    };
    for (let i = 0; i < c.persistentEnd; i++) r.recorded(c, i, false, 0, null);
    for (let s = 0; s < segments; s++) {
      if (progress && s % step === 0) progress(s / (2 * segments));
      const from = c.segOp[s]!;
      const to = c.segOp[s + 1]!;
      for (let i = from; i < to; i++) r.recorded(c, i, false, 0, null);
      for (let v = c.segBit[s]!; v < c.segBit[s + 1]!; v++) count(c.violated[v]!, false, false);
      for (let i = to - 1; i >= from; i--) r.recorded(c, i, true, ends(i), null);
    }
    const ok = new Int32Array(w);
    for (let j = 0; j < w; j++) ok[j] = pos(counter + j) | 1; // fires when the counter is 0
    this.mark(r, ok);
    for (let s = segments - 1; s >= 0; s--) {
      if (progress && s % step === 0) progress(1 - s / (2 * segments));
      const from = c.segOp[s]!;
      const to = c.segOp[s + 1]!;
      for (let i = from; i < to; i++) r.recorded(c, i, false, 0, copy);
      for (let v = c.segBit[s + 1]! - 1; v >= c.segBit[s]!; v--) count(copy(c.violated[v]!), true, v === 0);
      for (let i = to - 1; i >= from; i--) r.recorded(c, i, true, ends(i), copy);
    }
    for (let i = c.persistentEnd - 1; i >= 0; i--) r.recorded(c, i, true, first[c.ops[c.starts[i + 1]! - 1]! >>> 1] === i ? 1 : 0, null);
  }
}

/**
 * replayLogical's step for one operation given by names: work names get an id at their first use
 * and give it back after the operation that ends them (`ends`, for the target).
 */
class Replay {
  /** The operation's operands (encoded names), filled by the caller. */
  readonly ins: Int32Array;
  private readonly buf: Int32Array;
  private readonly vid: Int32Array;

  constructor(private readonly base: number, names: number, widest: number, private readonly sink: LogicalSink, private readonly ids: VirtualIds) {
    this.ins = new Int32Array(widest);
    this.buf = new Int32Array(widest);
    this.vid = new Int32Array(names).fill(-1);
  }

  /** Operation i of the checks, forwards or inverted, its operands mapped by `map`. */
  recorded(c: StructuredChecks, i: number, inverted: boolean, ends: number, map: ((op: number) => number) | null): void {
    const s = c.starts[i]!;
    const n = c.starts[i + 1]! - s;
    for (let p = 0; p < n; p++) this.ins[p] = map === null ? c.ops[s + p]! : map(c.ops[s + p]!);
    const k = c.kinds[i]!;
    this.put(inverted ? inverse(k) : k, n, ends === 1);
  }

  /** Puts the operation in `ins[0..nq)` (the target last). */
  put(kind: number, nq: number, ends: boolean): void {
    const { ins, buf, vid, base, sink } = this;
    for (let p = 0; p < nq; p++) {
      const op = ins[p]!;
      const q = op >>> 1;
      if (q < base) buf[p] = op;
      else {
        let v = vid[q]!;
        if (v === -1) vid[q] = v = this.ids.take();
        buf[p] = (v << 1) | (op & 1);
      }
    }
    const last = nq - 1;
    const tq = ins[last]! >>> 1;
    const dies = ends && tq >= base;
    switch (kind) {
      case K.and:
      case K.unand:
      case K.mcx:
      case K.mcz:
        sinkMulti(sink, kind, buf, nq, dies);
        break;
      default:
        throw new Error(`counting: structured operation kind ${kind} is not produced by synthesis`);
    }
    if (dies) {
      this.ids.give(vid[tq]!);
      vid[tq] = -1;
    }
  }
}

