/**
 * The logical operations of each construction, streamed into a {@link LogicalSink} without
 * building the logical circuit (a million clauses' wide oracle is some 50 MB, the lean one has
 * some 6 log2(m) operations per clause): the wide, textbook and lean oracles generated clause by
 * clause, the diffusion, and the whole search circuit. A test holds each stream equal to the
 * logical circuit synthesis builds.
 */
import { CircuitBuilder, K, type Circuit } from "../ir/circuit.js";
import type { OracleKind, SimplifiedCnf, Strategy } from "../synth/index.js";
import { violatedBy } from "../synth/common.js";
import type { LogicalSink, VirtualIds } from "./lowering.js";
import { T_H, T_X } from "./templates.js";

const pos = (q: number): number => q << 1;

/** Reports progress as a fraction in [0, 1]. */
export type Fraction = (done: number) => void;

/**
 * synth/lean.ts, one clause at a time: for each clause its violated bit (an AND into a fresh
 * qubit, or the literal itself), a controlled increment of the w-bit counter through w - 1 fresh
 * carries, the clause uncomputed; the mark on counter = 0; then the whole forward part inverted
 * (reverse order, and <-> unand) on fresh work qubits.
 */
export function leanOracle(f: SimplifiedCnf, kind: OracleKind, sink: LogicalSink, ids: VirtualIds, target: number, progress?: Fraction): void {
  const m = f.clauseStart.length - 1;
  if (f.unsat) return;
  if (m === 0) {
    if (kind === "phase") sink.gphase();
    else sink.single(T_X, target, false);
    return;
  }
  const w = leanCounterWidth(m);
  const counter = new Int32Array(w);
  for (let j = 0; j < w; j++) counter[j] = ids.take();
  let maxK = 0;
  for (let i = 0; i < m; i++) maxK = Math.max(maxK, f.clauseStart[i + 1]! - f.clauseStart[i]!);
  const ctrls = new Int32Array(maxK);
  // One view per width, made once (a view per clause was a million allocations).
  const views: Int32Array[] = [];
  const carries = new Int32Array(Math.max(0, w - 1));
  const step = Math.max(1, Math.floor(m / 50));
  const clause = (i: number): Int32Array => {
    const s = f.clauseStart[i]!;
    const k = f.clauseStart[i + 1]! - s;
    for (let j = 0; j < k; j++) ctrls[j] = violatedBy(f.lits[s + j]!);
    return views[k] ?? (views[k] = ctrls.subarray(0, k));
  };
  for (let i = 0; i < m; i++) {
    if (progress && i % step === 0) progress(i / (2 * m));
    leanForward(clause(i), counter, carries, sink, ids);
  }
  leanMark(counter, kind, target, sink);
  // The forward part inverted: clause by clause from the last, each clause's operations reversed.
  for (let i = m - 1; i >= 0; i--) {
    if (progress && i % step === 0) progress(1 - i / (2 * m));
    leanBackward(clause(i), counter, carries, i === 0, sink, ids);
  }
  for (let j = 0; j < w; j++) ids.give(counter[j]!);
}

/** The counter width of the lean oracle of m clauses (synth/lean.ts). */
export function leanCounterWidth(m: number): number {
  return Math.ceil(Math.log2(m + 1));
}

/** The violated bit of a clause (encoded controls `lits`): the literal itself, or an AND into a fresh qubit (returned as t). */
function clauseBitOf(lits: Int32Array, sink: LogicalSink, ids: VirtualIds): { bit: number; t: number } {
  if (lits.length === 1) return { bit: lits[0]!, t: -1 };
  const t = ids.take();
  sink.and(lits, t);
  return { bit: pos(t), t };
}

/** One clause of the forward part (`carries`: room for w - 1 ids): its violated bit, the increment (synth/lean.ts's increment), the clause uncomputed. */
export function leanForward(lits: Int32Array, counter: Int32Array, carries: Int32Array, sink: LogicalSink, ids: VirtualIds): void {
  const w = counter.length;
  const { bit, t } = clauseBitOf(lits, sink, ids);
  for (let j = 0; j + 1 < w; j++) carries[j] = ids.take();
  let prev = bit;
  for (let j = 0; j + 1 < w; j++) {
    sink.andPair(prev, pos(counter[j]!), carries[j]!);
    prev = pos(carries[j]!);
  }
  for (let j = w - 1; j >= 1; j--) {
    sink.mcx1(pos(carries[j - 1]!), counter[j]!, false);
    sink.unand(carries[j - 1]!, true);
    ids.give(carries[j - 1]!);
  }
  sink.mcx1(bit, counter[0]!, false);
  if (t >= 0) {
    sink.unand(t, true);
    ids.give(t);
  }
}

/** The mark on counter = 0 (phase flip, or the target flipped). */
export function leanMark(counter: Int32Array, kind: OracleKind, target: number, sink: LogicalSink): void {
  const ok = Array.from(counter, (q) => pos(q) | 1); // fires when the counter is 0
  if (kind === "phase") sink.mcz(ok);
  else sink.mcx(ok, target, false);
}

/**
 * One clause of the inverted part. `last`: clause 0, which comes last: there each counter qubit
 * is used for the last time (its wire is then free for what follows, e.g. the next iteration of a
 * search).
 */
export function leanBackward(lits: Int32Array, counter: Int32Array, carries: Int32Array, last: boolean, sink: LogicalSink, ids: VirtualIds): void {
  const w = counter.length;
  const { bit, t } = clauseBitOf(lits, sink, ids);
  for (let j = 0; j + 1 < w; j++) carries[j] = ids.take();
  sink.mcx1(bit, counter[0]!, last && w === 1);
  for (let j = 1; j < w; j++) {
    sink.andPair(j === 1 ? bit : pos(carries[j - 2]!), pos(counter[j - 1]!), carries[j - 1]!);
    sink.mcx1(pos(carries[j - 1]!), counter[j]!, last && j === w - 1);
  }
  for (let j = w - 2; j >= 0; j--) {
    sink.unand(carries[j]!, true, last ? 2 : 0);
    ids.give(carries[j]!);
  }
  if (t >= 0) {
    sink.unand(t, true);
    ids.give(t);
  }
}

/**
 * synth/wide.ts as a stream (as replayLogical would replay its circuit, without building it: a
 * million clauses' logical circuit is some 50 MB): each clause of two literals or more ANDed into
 * a fresh qubit, the mark over those qubits (fires when each is 0) and the unit clauses' literals,
 * then the ANDs uncomputed from the last clause.
 */
export function wideOracle(f: SimplifiedCnf, kind: OracleKind, sink: LogicalSink, ids: VirtualIds, target: number, progress?: Fraction): void {
  const m = f.clauseStart.length - 1;
  if (f.unsat) return;
  if (m === 0) {
    if (kind === "phase") sink.gphase();
    else sink.single(T_X, target, false);
    return;
  }
  let maxK = 1;
  for (let i = 0; i < m; i++) maxK = Math.max(maxK, f.clauseStart[i + 1]! - f.clauseStart[i]!);
  const ctrls = new Int32Array(maxK);
  // One view per width, made once (a view per clause was a million allocations).
  const views: Int32Array[] = [];
  const bit = new Int32Array(m).fill(-1);
  const ok = new Int32Array(m + (kind === "flag" ? 1 : 0));
  const step = Math.max(1, Math.floor(m / 50));
  const controls = (i: number): Int32Array => {
    const s = f.clauseStart[i]!;
    const k = f.clauseStart[i + 1]! - s;
    for (let j = 0; j < k; j++) ctrls[j] = violatedBy(f.lits[s + j]!);
    return views[k] ?? (views[k] = ctrls.subarray(0, k));
  };
  for (let i = 0; i < m; i++) {
    if (progress && i % step === 0) progress(i / (2 * m));
    const c = controls(i);
    if (c.length === 1) {
      ok[i] = c[0]! ^ 1; // fires when the unit clause is satisfied
      continue;
    }
    const t = ids.take();
    bit[i] = t;
    if (c.length === 2) sink.andPair(c[0]!, c[1]!, t);
    else sink.and(c, t);
    ok[i] = pos(t) | 1; // fires when the clause is not violated
  }
  markOver(ok.subarray(0, m), kind, target, sink);
  for (let i = m - 1; i >= 0; i--) {
    if (progress && i % step === 0) progress(1 - i / (2 * m));
    const t = bit[i]!;
    if (t < 0) continue;
    sink.unand(t, true);
    ids.give(t);
  }
}

/**
 * synth/reference.ts (the textbook reference) as a stream: for each clause a fresh qubit set to
 * the clause's value (a multi-controlled X on its violated literals, then an X), the mark over
 * those qubits, then the same operations in reverse order.
 */
export function textbookOracle(f: SimplifiedCnf, kind: OracleKind, sink: LogicalSink, ids: VirtualIds, target: number, progress?: Fraction): void {
  const m = f.clauseStart.length - 1;
  if (f.unsat) return;
  if (m === 0) {
    if (kind === "phase") sink.gphase();
    else sink.single(T_X, target, false);
    return;
  }
  let maxK = 1;
  for (let i = 0; i < m; i++) maxK = Math.max(maxK, f.clauseStart[i + 1]! - f.clauseStart[i]!);
  const ctrls = new Int32Array(maxK);
  // One view per width, made once (a view per clause was a million allocations).
  const views: Int32Array[] = [];
  const bit = new Int32Array(m);
  const ok = new Int32Array(m);
  const step = Math.max(1, Math.floor(m / 50));
  const controls = (i: number): Int32Array => {
    const s = f.clauseStart[i]!;
    const k = f.clauseStart[i + 1]! - s;
    for (let j = 0; j < k; j++) ctrls[j] = violatedBy(f.lits[s + j]!);
    return views[k] ?? (views[k] = ctrls.subarray(0, k));
  };
  const clauseValue = (c: Int32Array, t: number, dies: boolean): void => {
    if (c.length === 1) sink.mcx1(c[0]!, t, dies);
    else sink.mcx(c, t, dies);
  };
  for (let i = 0; i < m; i++) {
    if (progress && i % step === 0) progress(i / (2 * m));
    const t = ids.take();
    bit[i] = t;
    clauseValue(controls(i), t, false);
    sink.single(T_X, t, false);
    ok[i] = pos(t);
  }
  markOver(ok, kind, target, sink);
  for (let i = m - 1; i >= 0; i--) {
    if (progress && i % step === 0) progress(1 - i / (2 * m));
    const t = bit[i]!;
    sink.single(T_X, t, false);
    clauseValue(controls(i), t, true);
    ids.give(t);
  }
}

/** synth/common.ts's mark: a multi-controlled Z over `ok`, or an X of the target (one control: a CX). */
function markOver(ok: Int32Array, kind: OracleKind, target: number, sink: LogicalSink): void {
  if (kind === "phase") sink.mcz(ok);
  else if (ok.length === 1) sink.mcx1(ok[0]!, target, false);
  else sink.mcx(ok, target, false);
}

/** synth/search.ts's diffusion over qubits 0..n-1. */
export function diffusionOps(n: number, sink: LogicalSink): void {
  if (n === 0) return;
  for (let q = 0; q < n; q++) sink.single(T_H, q, false);
  sink.mcz(Array.from({ length: n }, (_, q) => pos(q) | 1));
  for (let q = 0; q < n; q++) sink.single(T_H, q, false);
  sink.gphase();
}

/** One phase oracle of a search, on fresh work qubits. */
export type OracleOps = (sink: LogicalSink, ids: VirtualIds, progress?: Fraction) => void;

/** The phase oracle of a strategy as a stream, generated as synthesis builds it. */
export function phaseOracleOps(f: SimplifiedCnf, strategy: Strategy): OracleOps {
  if (strategy === "lean") return (sink, ids, progress) => leanOracle(f, "phase", sink, ids, -1, progress);
  return (sink, ids, progress) => wideOracle(f, "phase", sink, ids, -1, progress);
}

/** synth/search.ts's search circuit: H on all, K times (oracle, diffusion), then the measurements. */
export function searchOps(n: number, oracle: OracleOps, iterations: number, measure: boolean, sink: LogicalSink, ids: VirtualIds, progress?: Fraction): void {
  for (let q = 0; q < n; q++) sink.single(T_H, q, false);
  for (let i = 0; i < iterations; i++) {
    oracle(sink, ids, progress ? (x) => progress((i + x) / iterations) : undefined);
    diffusionOps(n, sink);
  }
  if (measure) for (let q = 0; q < n; q++) sink.measure(q);
}

/**
 * Builds the logical circuit of a stream (for the costs built instead of counted): a fresh qubit
 * for every span of a recycled id, as synthesis gives.
 */
export class LogicalRecorder implements LogicalSink {
  private readonly b: CircuitBuilder;
  private readonly qubit = new Map<number, number>();
  private readonly andOps = new Map<number, number[]>();

  constructor(private readonly base: number, search: number, target: number) {
    this.b = new CircuitBuilder({ search, target, clbits: 0 });
  }

  private q(id: number): number {
    if (id < this.base) return id;
    let q = this.qubit.get(id);
    if (q === undefined) this.qubit.set(id, (q = this.b.newWork()));
    return q;
  }

  private op(o: number): number {
    return (this.q(o >>> 1) << 1) | (o & 1);
  }

  private end(id: number): void {
    this.qubit.delete(id);
  }

  and(ctrls: ArrayLike<number>, t: number): void {
    const ops = [...Array.from(ctrls, (o) => this.op(o)), pos(this.q(t))];
    this.andOps.set(t, Array.from(ctrls));
    this.b.addN(K.and, ops);
  }

  andPair(a: number, b: number, t: number): void {
    this.and([a, b], t);
  }

  unand(t: number, dies: boolean, controlsDie = 0): void {
    const ctrls = this.andOps.get(t)!;
    this.b.addN(K.unand, [...ctrls.map((o) => this.op(o)), pos(this.q(t))]);
    if (dies) this.end(t);
    for (let i = 0; i < 2; i++) if ((controlsDie >>> i) & 1) this.end(ctrls[i]! >>> 1);
  }

  mcx(ctrls: ArrayLike<number>, t: number, dies: boolean): void {
    this.b.addN(K.mcx, [...Array.from(ctrls, (o) => this.op(o)), pos(this.q(t))]);
    if (dies) this.end(t);
  }

  mcx1(ctrl: number, t: number, dies: boolean): void {
    this.mcx([ctrl], t, dies);
  }

  mcz(qs: ArrayLike<number>): void {
    this.b.addN(K.mcz, Array.from(qs, (o) => this.op(o)));
  }

  single(template: number, q: number, dies: boolean): void {
    this.b.add(template === T_X ? K.x : K.h, pos(this.q(q)));
    if (dies) this.end(q);
  }

  measure(q: number): void {
    this.b.add(K.measure, pos(this.q(q)), this.b.newClbit());
  }

  gphase(): void {
    this.b.add(K.gphase, 4);
  }

  finish(): Circuit {
    return this.b.finish();
  }
}

/**
 * Replays a logical circuit (structured oracles and the constructions of cost/front.ts). Work
 * qubits (from `base` up) get fresh virtual ids on first use and give them back after their last
 * use, which the lowering is told so that the engine frees their wire where work-qubit reuse would.
 */
export function replayLogical(c: Circuit, base: number, sink: LogicalSink, ids: VirtualIds, lastUse: Int32Array, progress?: Fraction): void {
  const vid = new Int32Array(c.qubits).fill(-1);
  let widest = 1;
  for (let g = 0; g < c.gates; g++) widest = Math.max(widest, c.opStart[g + 1]! - c.opStart[g]!);
  const buf = new Int32Array(widest);
  const step = Math.max(1, Math.floor(c.gates / 100));
  for (let g = 0; g < c.gates; g++) {
    if (progress && g % step === 0) progress(g / c.gates);
    const kind = c.kind[g]!;
    const s = c.opStart[g]!;
    const e = c.opStart[g + 1]!;
    if (kind === K.gphase) {
      sink.gphase();
      continue;
    }
    const nq = kind === K.measure ? 1 : e - s;
    for (let p = s; p < s + nq; p++) {
      const op = c.ops[p]!;
      const q = op >>> 1;
      if (q < base) buf[p - s] = op;
      else {
        if (vid[q] === -1) vid[q] = ids.take();
        buf[p - s] = (vid[q]! << 1) | (op & 1);
      }
    }
    const last = nq - 1;
    const tq = c.ops[s + last]! >>> 1;
    // The target's span ends here (it is never used again).
    const dies = tq >= base && lastUse[tq] === g;
    switch (kind) {
      case K.and:
      case K.unand:
      case K.mcx:
      case K.mcz:
        sinkMulti(sink, kind, buf, nq, dies);
        break;
      case K.x:
        sink.single(T_X, buf[0]! >>> 1, dies);
        break;
      case K.h:
        sink.single(T_H, buf[0]! >>> 1, dies);
        break;
      case K.measure:
        sink.measure(buf[0]! >>> 1);
        break;
      default:
        throw new Error(`counting: logical gate kind ${kind} is not produced by synthesis`);
    }
    // Give back the ids of work qubits used for the last time (their wires were freed by the
    // lowering's last instance on them). A work qubit ending as a mere control would keep its wire.
    for (let p = s; p < s + nq; p++) {
      const q = c.ops[p]! >>> 1;
      if (q < base || lastUse[q] !== g || vid[q] === -1) continue;
      const isTarget = p === s + last && (kind === K.unand || kind === K.mcx || kind === K.x || kind === K.h);
      if (!isTarget) throw new Error("counting: a work qubit ends its span as a control");
      ids.give(vid[q]!);
      vid[q] = -1;
    }
  }
}

/**
 * One multi-qubit logical operation (and, unand, mcx, mcz) into the sink: `buf[0..nq)` holds its
 * operands as virtual ids with the polarity bit, the target last. Shared by the replay of a built
 * circuit and the structured stream (structuredSource.ts).
 */
export function sinkMulti(sink: LogicalSink, kind: number, buf: Int32Array, nq: number, dies: boolean): void {
  const last = nq - 1;
  switch (kind) {
    case K.and:
      if (last === 2) sink.andPair(buf[0]!, buf[1]!, buf[2]! >>> 1);
      else sink.and(buf.subarray(0, last), buf[last]! >>> 1);
      return;
    case K.unand:
      sink.unand(buf[last]! >>> 1, dies);
      return;
    case K.mcx:
      if (last === 1) sink.mcx1(buf[0]!, buf[1]! >>> 1, dies);
      else sink.mcx(buf.subarray(0, last), buf[last]! >>> 1, dies);
      return;
    default:
      sink.mcz(buf.subarray(0, nq));
  }
}

/** The last gate of each qubit (for replayLogical: a work qubit gives back its id there). */
export function lastUses(c: Circuit): Int32Array {
  const last = new Int32Array(c.qubits).fill(-1);
  for (let g = 0; g < c.gates; g++) {
    const kind = c.kind[g]!;
    if (kind === K.gphase) continue;
    const s = c.opStart[g]!;
    const nq = kind === K.measure ? 1 : c.opStart[g + 1]! - s;
    for (let p = s; p < s + nq; p++) last[c.ops[p]! >>> 1] = g;
  }
  return last;
}
