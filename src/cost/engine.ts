/**
 * The counting engine: takes the lowered circuit as a stream of template instances (see
 * lowering.ts) and counts what the emitted circuit holds after work-qubit reuse and the default
 * optimizer passes, without storing the circuit.
 *
 * 1. Work-qubit reuse (passes/reuseWork.ts): a work qubit takes a wire at its first gate (the
 *    most recently freed wire, else a new one) and frees it after its last gate.
 * 2. cancel-inverses (passes/cancelInverses.ts), replayed exactly: the same walk back along the
 *    target's gates (at most WINDOW live ones), the same inverse, commutation and clear-between
 *    tests, over instances instead of gates. Only the gates whose walk can leave their own
 *    instance are walked (templates.ts's exitingGates); the others stop inside it, unchanged.
 * 3. The second cancel-inverses of the pipeline runs on merge-phases' output. It is replayed on
 *    the first one's output (in detection mode: any pair it would find makes the result a bound)
 *    after each instance is final; merge-phases only moves a phase gate later past gates that are
 *    diagonal on its qubit, and merges a run of them into at most two, which changes no walk of
 *    cancel-inverses unless a run of phase gates alone vanishes (also detected) or a walk hits
 *    the window (detected).
 * 4. merge-phases (passes/mergePhases.ts), replayed exactly per qubit, then the ASAP tally of
 *    emit/resources.ts (depth, T-depth, counts) with one level per wire.
 * drop-identities only merges global phases here (no multi-controlled gates are left), and
 * fold-x-polarity finds no polarity in the toffoli and clifford+t bases: neither changes a figure.
 *
 * An instance is final once LAG later instances have been replayed; a cancellation reaching an
 * instance already counted, or a walk needing an instance no longer kept, makes the result
 * inexact (reported, never silent). Then figures are not exact: see {@link EngineResult.exact}.
 */
import { K, INVERSE_KIND } from "../ir/kinds.js";
import {
  FIRST_TOUCH, LAST_TOUCH, G_COND, G_KIND, G_NQ, G_OP, G_PHASE, G_ROLE, GATE_START, SLOT_GATES, SLOTS, WINDOW,
  exitingGates, gatesOf, ROLE_OTHER, ROLE_Z, TEMPLATE_COUNT,
} from "./templates.js";
import type { InstanceSink } from "./lowering.js";
import { finalRun, NONE, transferOf } from "./transfer.js";

/** What the engine counts. */
export interface EngineOptions {
  /** search + target qubits: wires below this are the qubits themselves. */
  readonly base: number;
  /** Replay the optimizer passes (the pipeline's default); false: the lowered, reused circuit. */
  readonly optimize: boolean;
  /** Depth, T-depth and the phase merging; false counts Toffolis, T and CNOTs only (faster). */
  readonly levels: boolean;
  /**
   * Instances replayed before one is final (a power of two); default 65536. Infinity keeps every
   * instance until the end (memory grows with the circuit; nothing can fall short).
   */
  readonly lag?: number;
  /** Copies kept per wire of instances that left the window (default 1). */
  readonly history?: number;
}

/** Figures of one circuit. */
export interface EngineResult {
  /** All qubits (search, target, work wires). */
  readonly qubits: number;
  /** T and Tdg gates. */
  readonly tCount: number;
  /** ASAP T-depth (0 when levels were not asked for). */
  readonly tDepth: number;
  /** CX and CZ gates. */
  readonly cnotCount: number;
  /** CCX gates. */
  readonly toffoliCount: number;
  /** ASAP depth, global phase excluded (0 when levels were not asked for). */
  readonly depth: number;
  /** Measurements. */
  readonly measurements: number;
  /** Template instances replayed. */
  readonly instances: number;
  /**
   * True when every figure is that of the emitted circuit. False only when the engine found a
   * case its replay does not cover (see `reason`): then the counts and depths are upper bounds
   * when `upperBound` is true, else unknown.
   */
  readonly exact: boolean;
  /** With exact false: the figures are upper bounds. */
  readonly upperBound: boolean;
  /** Why the figures are not exact. */
  readonly reason: string | null;
  /** A walk needed an instance that was no longer kept: a run with more `history` can be exact. */
  readonly historyShort: boolean;
  /** A cancellation reached an instance already counted: a run with a longer `lag` can be exact. */
  readonly lagShort: boolean;
}

const KIND_CX = K.cx;
const KIND_CZ = K.cz;
const KIND_CCX = K.ccx;
const KIND_T = K.t;
const KIND_TDG = K.tdg;
const KIND_MEASURE = K.measure;
const KIND_RESET = K.reset;

/** Exiting gates with nothing dead, per template. */
const EXIT0 = Int32Array.from({ length: TEMPLATE_COUNT }, (_, t) => exitingGates(t, 0));
/** Index of gate e in its slot's list, per slot: GATE_SLOT_INDEX[e * 3 + s]. */
const GATE_SLOT_INDEX = new Int8Array(GATE_START[TEMPLATE_COUNT]! * 3).fill(-1);
for (let t = 0; t < TEMPLATE_COUNT; t++) {
  for (let s = 0; s < 3; s++) {
    const list = SLOT_GATES[t * 3 + s]!;
    for (let i = 0; i < list.length; i++) GATE_SLOT_INDEX[(GATE_START[t]! + list[i]!) * 3 + s] = i;
  }
}

/**
 * A recorded stretch of instances (a segment; see CountingEngine.replaySegment). Wires are entries of
 * a table: an input wire given by the source, a fixed wire, or one taken from the free wires.
 */
interface Segment {
  /** Table: 0 input (value: its index), 1 fixed (value: the wire), 2 taken (value: order taken). */
  readonly kind: Int8Array;
  readonly value: Int32Array;
  /** Wires taken from the free wires (all before any is given back), and those given back. */
  readonly takes: number;
  readonly gives: Int32Array;
  /** The instances: template, table entry per slot, cancelled gates, stage-1 mask, rechecks. */
  readonly t: Uint8Array;
  readonly w: Int32Array;
  readonly dead: Int32Array;
  readonly mask1: Int32Array;
  readonly recheck: Int32Array;
  /**
   * Earlier instances the recording read, by path: table entry j, depth along the wire's history
   * (0: the last instance before the segment), sorted by (j, depth); with their template, the
   * slot on that wire, their cancelled gates then, and which table entry each slot's wire is
   * (-1: none). `id` identifies the same instance met on several paths.
   */
  readonly readJ: Int32Array;
  readonly readDepth: Int32Array;
  /** The instance read, numbered in the order of the instances (0 = the oldest). */
  readonly readRef: Int32Array;
  /** Instances read. */
  readonly refs: number;
  readonly readT: Uint8Array;
  readonly readSlot: Int8Array;
  readonly readDead: Int32Array;
  readonly readPat: Int32Array;
  /** Gates of earlier instances the segment cancelled (by read ref), and instances it marked for stage 2. */
  readonly killRef: Int32Array;
  readonly killBits: Int32Array;
  readonly markRef: Int32Array;
  /** The source's data (e.g. the control flips the segment leaves). */
  readonly extra: number;
  /** A digest of the last instance on each input wire when it was recorded (see fingerprint). */
  readonly fp: number;
}

/** The segments recorded for one key: all share their table's layout, and are found by fingerprint. */
interface SegmentsOfKey {
  readonly kind: Int8Array;
  readonly value: Int32Array;
  readonly takes: number;
  readonly byFp: Map<number, Segment[]>;
  count: number;
}

const MAX_SEGMENTS_PER_KEY = 64;
const MAX_SEGMENTS = 4096;

export class CountingEngine implements InstanceSink {
  private readonly base: number;
  private readonly optimize: boolean;
  private readonly levels: boolean;
  /** Instances replayed before one is final; grows with the stream up to maxLag. */
  private lag = 64;
  private readonly maxLag: number;
  private ringSize: number;
  private ringMask: number;
  /** The oldest instance still in the ring (older ones survive only as a wire's copy). */
  private ringLow = 0;

  // Instances, in a ring.
  private rT: Uint8Array;
  private rW: Int32Array;
  private rDead: Int32Array;
  private rPrev: Int32Array;
  private rPrevSlot: Int8Array;
  private rNext: Int32Array;
  /** Cancelled gates of each instance right after its own stage 1. */
  private rMask1: Int32Array;
  /** Per slot: how many instances its wire had with this one (see evict). */
  private rSeq: Int32Array;
  /** Gates whose walk stage 2 repeats: a gate they passed went after their stage 1 (-1: all). */
  private rRecheck: Int32Array;
  private nextId = 0;
  /** Instances below this have been through stage 2 and the tally. */
  private done = 0;

  // Wires.
  private lastInst: Int32Array;
  private lastSlot: Int8Array;
  /**
   * Copies of instances that left the ring, per wire: entry w * depth + i, newest first. A walk
   * along a wire seldom used may need the last few instances on it long after they left.
   */
  private readonly depth: number;
  private sId: Int32Array;
  private sT: Uint8Array;
  private sW: Int32Array;
  private sDead: Int32Array;
  private sPrev: Int32Array;
  private sPrevSlot: Int8Array;
  private level: Float64Array;
  private tLevel: Float64Array;
  private pend: Uint8Array;
  /** Instances linked on each wire so far. */
  private wireSeq = new Int32Array(0);
  private wireCap = 0;

  // Virtual ids -> wires.
  private wireOf: Int32Array = new Int32Array(1024).fill(-1);
  private freeWires: number[] = [];
  private workWires = 0;

  // The segment memo (see replaySegment).
  private readonly memo = new Map<number, SegmentsOfKey>();
  private memoSize = 0;
  private rec = false;
  private recAbort = false;
  private recStart = 0;
  private recKey = 0;
  private recFlags = 0;
  private stamp = 0;
  private tabStamp = new Int32Array(0);
  private tabIdx = new Int32Array(0);
  private recKind: number[] = [];
  private recValue: number[] = [];
  private recWire: number[] = [];
  private recHead: number[] = [];
  private recHeadSlot: number[] = [];
  private recTakes = 0;
  private recGives: number[] = [];
  private readonly recReads = new Map<number, number>();
  private readonly recKills = new Map<number, number>();
  private readonly recMarks = new Set<number>();
  /** Segments replayed and recorded (for the tests and benchmarks). */
  replays = 0;
  recordings = 0;

  // Figures.
  private tCount = 0;
  private cnotCount = 0;
  private toffoliCount = 0;
  private measurements = 0;
  private bitL = 0;
  private bitTL = 0;
  private phaseGates = 0;
  private flagHard: string | null = null;
  private historyShort = false;
  private lagShort = false;
  private flagBound: string | null = null;
  /** Set when the second cancel-inverses might change something (irrelevant if it never runs). */
  private flagSecond: string | null = null;

  constructor(opts: EngineOptions) {
    this.base = opts.base;
    this.optimize = opts.optimize;
    this.levels = opts.levels;
    this.maxLag = opts.lag ?? 65536;
    this.lag = this.maxLag === Infinity ? Infinity : Math.min(1024, this.maxLag);
    this.ringSize = 0;
    this.ringMask = 0;
    this.rT = new Uint8Array(0);
    this.rW = new Int32Array(0);
    this.rDead = new Int32Array(0);
    this.rPrev = new Int32Array(0);
    this.rPrevSlot = new Int8Array(0);
    this.rNext = new Int32Array(0);
    this.rMask1 = new Int32Array(0);
    this.rSeq = new Int32Array(0);
    this.rRecheck = new Int32Array(0);
    this.growRing(this.maxLag === Infinity ? 4096 : 0);
    this.lastInst = new Int32Array(0);
    this.lastSlot = new Int8Array(0);
    this.depth = opts.history ?? 1;
    this.sId = new Int32Array(0);
    this.sT = new Uint8Array(0);
    this.sW = new Int32Array(0);
    this.sDead = new Int32Array(0);
    this.sPrev = new Int32Array(0);
    this.sPrevSlot = new Int8Array(0);
    this.level = new Float64Array(0);
    this.tLevel = new Float64Array(0);
    this.pend = new Uint8Array(0);
    this.growWires(Math.max(64, this.base + 64));
  }

  /** A ring for the current lag (at least twice the lag and a margin for walks), entries kept. */
  private growRing(atLeast = 0): void {
    let r = Math.max(256, this.ringSize);
    const want = Number.isFinite(this.lag) ? this.lag * 2 + 64 : 0;
    while (r < Math.max(atLeast, want)) r *= 2;
    if (r === this.ringSize) return;
    const old = { size: this.ringSize, mask: this.ringMask, rT: this.rT, rW: this.rW, rDead: this.rDead, rPrev: this.rPrev, rPrevSlot: this.rPrevSlot, rNext: this.rNext, rMask1: this.rMask1, rRecheck: this.rRecheck, rSeq: this.rSeq };
    this.ringSize = r;
    this.ringMask = r - 1;
    this.rT = new Uint8Array(r);
    this.rW = new Int32Array(r * 3);
    this.rDead = new Int32Array(r);
    this.rPrev = new Int32Array(r * 3);
    this.rPrevSlot = new Int8Array(r * 3);
    this.rNext = new Int32Array(r * 3);
    this.rMask1 = new Int32Array(r);
    this.rRecheck = new Int32Array(r);
    this.rSeq = new Int32Array(r * 3);
    for (let id = this.ringLow; id < this.nextId; id++) {
      const a = id & old.mask;
      const b = id & this.ringMask;
      this.rT[b] = old.rT[a]!;
      this.rDead[b] = old.rDead[a]!;
      this.rMask1[b] = old.rMask1[a]!;
      this.rRecheck[b] = old.rRecheck[a]!;
      for (let s = 0; s < 3; s++) {
        this.rW[b * 3 + s] = old.rW[a * 3 + s]!;
        this.rPrev[b * 3 + s] = old.rPrev[a * 3 + s]!;
        this.rPrevSlot[b * 3 + s] = old.rPrevSlot[a * 3 + s]!;
        this.rNext[b * 3 + s] = old.rNext[a * 3 + s]!;
        this.rSeq[b * 3 + s] = old.rSeq[a * 3 + s]!;
      }
    }
  }

  private growWires(n: number): void {
    if (n <= this.wireCap) return;
    const cap = Math.max(n, this.wireCap * 2);
    const i32 = (a: Int32Array, fill: number): Int32Array => {
      const b = new Int32Array(cap).fill(fill);
      b.set(a);
      return b;
    };
    this.lastInst = i32(this.lastInst, -1);
    const ls = new Int8Array(cap);
    ls.set(this.lastSlot);
    this.lastSlot = ls;
    const d = this.depth;
    const sid = new Int32Array(cap * d).fill(-1);
    sid.set(this.sId);
    this.sId = sid;
    const st = new Uint8Array(cap * d);
    st.set(this.sT);
    this.sT = st;
    const sw = new Int32Array(cap * d * 3);
    sw.set(this.sW);
    this.sW = sw;
    const sd = new Int32Array(cap * d);
    sd.set(this.sDead);
    this.sDead = sd;
    const sp = new Int32Array(cap * d);
    sp.set(this.sPrev);
    this.sPrev = sp;
    const sps = new Int8Array(cap * d);
    sps.set(this.sPrevSlot);
    this.sPrevSlot = sps;
    const l = new Float64Array(cap);
    l.set(this.level);
    this.level = l;
    const tl = new Float64Array(cap);
    tl.set(this.tLevel);
    this.tLevel = tl;
    const p = new Uint8Array(cap);
    p.set(this.pend);
    this.pend = p;
    const sq = new Int32Array(cap);
    sq.set(this.wireSeq);
    this.wireSeq = sq;
    const ts = new Int32Array(cap);
    ts.set(this.tabStamp);
    this.tabStamp = ts;
    const ti = new Int32Array(cap);
    ti.set(this.tabIdx);
    this.tabIdx = ti;
    this.wireCap = cap;
  }

  private wireFor(v: number): number {
    if (v < this.base) return v;
    if (v >= this.wireOf.length) {
      const w = new Int32Array(Math.max(v + 1, this.wireOf.length * 2)).fill(-1);
      w.set(this.wireOf);
      this.wireOf = w;
    }
    let w = this.wireOf[v]!;
    if (w < 0) {
      if (this.freeWires.length > 0) {
        w = this.freeWires.pop()!;
        if (this.rec) this.recPop(w);
      } else {
        w = this.base + this.workWires++;
        if (this.rec) this.recAbort = true; // a replay could not take the same new wire
      }
      if (w >= this.wireCap) this.growWires(w + 1);
      this.wireOf[v] = w;
    }
    return w;
  }

  // ---- input -----------------------------------------------------------------------------

  put(t: number, a: number, b: number, c: number, dies: number): void {
    const id = this.open();
    const x = id & this.ringMask;
    // Wires in the order of first use (reuse takes them in that order).
    const touch = FIRST_TOUCH[t]!;
    for (let i = 0; i < touch.length; i++) {
      const s = touch[i]!;
      this.rW[x * 3 + s] = this.wireFor(s === 0 ? a : s === 1 ? b : c);
    }
    this.place(id, x, t);
    if (this.optimize) this.cancel(id, x);
    this.rMask1[x] = this.rDead[x]!;
    if (dies !== 0) {
      // Freed in the order of their last gate, as reuseWork frees them.
      const order = LAST_TOUCH[t]!;
      for (let i = 0; i < order.length; i++) {
        const s = order[i]!;
        if (((dies >>> s) & 1) === 0) continue;
        const v = s === 0 ? a : s === 1 ? b : c;
        const w = this.wireOf[v]!;
        this.freeWires.push(w);
        this.wireOf[v] = -1;
        if (this.rec) this.recPush(w);
      }
    }
    this.close(id);
  }

  /** A new instance id: the window grows with the stream, the oldest instance leaves the ring. */
  private open(): number {
    const id = this.nextId;
    if (id > 0x7ffffff0) throw new Error("counting: more than 2^31 template instances");
    if (this.maxLag === Infinity) {
      // Everything is kept until the end.
      if (id >= this.ringSize) this.growRing(this.ringSize * 2);
    } else if (id > 8 * this.lag && this.lag < this.maxLag) {
      // A longer stream: a longer window before instances are final (small circuits stay cheap).
      this.lag = Math.min(this.maxLag, this.lag * 2);
      this.growRing();
    }
    this.nextId++;
    if (id - this.ringSize >= this.ringLow) {
      this.evict(id - this.ringSize);
      this.ringLow = id - this.ringSize + 1;
    }
    return id;
  }

  /** Writes instance id (its wires already in rW) and links it into its wires' histories. */
  private place(id: number, x: number, t: number): void {
    this.rT[x] = t;
    this.rDead[x] = 0;
    this.rRecheck[x] = 0;
    const slots = SLOTS[t]!;
    for (let s = 0; s < slots; s++) {
      const w = this.rW[x * 3 + s]!;
      const p = this.lastInst[w]!;
      if (this.rec) this.recTouch(w, p);
      this.rPrev[x * 3 + s] = p;
      this.rPrevSlot[x * 3 + s] = this.lastSlot[w]!;
      this.rNext[x * 3 + s] = -1;
      if (p >= this.ringLow) this.rNext[(p & this.ringMask) * 3 + this.lastSlot[w]!] = id;
      this.lastInst[w] = id;
      this.lastSlot[w] = s;
      this.rSeq[x * 3 + s] = ++this.wireSeq[w]!;
    }
  }

  /** Settles what the window has let go (stage 2's walks are no part of a segment being recorded). */
  private close(id: number): void {
    if (this.done > id - this.lag) return;
    const rec = this.rec;
    this.rec = false;
    while (this.done <= id - this.lag) this.settle(this.done);
    this.rec = rec;
  }

  /** Flushes everything; call once after the last instance. */
  finish(): EngineResult {
    this.rec = false;
    while (this.done < this.nextId) this.settle(this.done);
    const wires = this.base + this.workWires;
    let depth = 0;
    let tDepth = 0;
    for (let w = 0; w < wires; w++) {
      if (this.levels && this.optimize) {
        // merge-phases' last flush, in qubit order.
        const run = finalRun(this.pend[w]!);
        this.level[w]! += run.gates;
        this.tLevel[w]! += run.tGates;
        this.tCount += run.tGates;
        this.pend[w] = 0;
      }
      depth = Math.max(depth, this.level[w]!);
      tDepth = Math.max(tDepth, this.tLevel[w]!);
    }
    // The second cancel-inverses runs only when merge-phases made a new circuit (two or more
    // phase gates); otherwise the runner skips it.
    if (this.phaseGates >= 2 && this.flagSecond !== null && this.flagBound === null) this.flagBound = this.flagSecond;
    const exact = this.flagHard === null && this.flagBound === null;
    return {
      qubits: wires,
      tCount: this.tCount,
      tDepth: this.levels ? tDepth : 0,
      cnotCount: this.cnotCount,
      toffoliCount: this.toffoliCount,
      depth: this.levels ? depth : 0,
      measurements: this.measurements,
      instances: this.nextId,
      exact,
      upperBound: !exact && this.flagHard === null,
      reason: this.flagHard ?? this.flagBound,
      historyShort: this.historyShort,
      lagShort: this.lagShort,
    };
  }

  /** Instances replayed so far. */
  get instances(): number {
    return this.nextId;
  }

  // ---- the segment memo -------------------------------------------------------------------
  //
  // A source may mark a stretch of its instances as a segment with a key that fixes the stretch's
  // templates and the pattern of its wires, given its input wires (the lean oracle: one clause's
  // half, keyed by its width, polarities and pending flips). The first time, the engine records
  // the segment while replaying it as usual: which wires it took from the free wires, and every
  // earlier instance its walks read (by path: a table wire and a depth in that wire's history),
  // with the data the walks looked at. Later, the same key is replayed from the record when every
  // recorded read finds the same data at the same path (the same instances where the recording met
  // one instance twice, in the same order): the engine is deterministic, so the walks would make
  // the same decisions; the record's cancellations, marks and instances are written directly.

  private flagState(): number {
    return (this.flagHard !== null ? 1 : 0) | (this.flagSecond !== null ? 2 : 0) | (this.flagBound !== null ? 4 : 0) | (this.historyShort ? 8 : 0) | (this.lagShort ? 16 : 0);
  }

  /**
   * Replays a recorded segment for `key` with these input wires; returns its extra data, or -1
   * when none applies (then the engine records the segment the caller is about to send, until
   * endSegment).
   */
  replaySegment(key: number, inputs: ArrayLike<number>): number {
    const of = this.memo.get(key);
    if (of !== undefined && this.stampTable(of.kind, of.value, of.takes, inputs)) {
      const list = of.byFp.get(this.fingerprint(of.kind));
      if (list !== undefined) {
        for (let i = 0; i < list.length; i++) {
          const seg = list[i]!;
          if (this.tryReplay(seg)) {
            this.replays++;
            // The one that fits goes first: the next segment like this one likely meets the same.
            if (i > 0) {
              list.splice(i, 1);
              list.unshift(seg);
            }
            return seg.extra;
          }
        }
      }
    }
    if ((of?.count ?? 0) < MAX_SEGMENTS_PER_KEY && this.memoSize < MAX_SEGMENTS) this.startRecording(key, inputs);
    return -1;
  }

  /** Ends the segment begun by a replaySegment that returned -1 (extra -1: do not keep it). */
  endSegment(extra: number): void {
    if (!this.rec) return;
    this.rec = false;
    const seg = extra < 0 || this.recAbort || this.flagState() !== this.recFlags || this.nextId - this.recStart > this.lag / 2 ? null : this.buildSegment(extra);
    if (seg === null) return;
    let of = this.memo.get(this.recKey);
    if (of === undefined) {
      of = { kind: seg.kind, value: seg.value, takes: seg.takes, byFp: new Map(), count: 0 };
      this.memo.set(this.recKey, of);
    } else if (!sameTable(of, seg)) return;
    const list = of.byFp.get(seg.fp) ?? [];
    list.push(seg);
    of.byFp.set(seg.fp, list);
    of.count++;
    this.memoSize++;
    this.recordings++;
  }

  /**
   * Puts the wires of a table layout (inputs, fixed wires, wires about to be taken) into the
   * stamped lookup; false when the layout does not fit now.
   */
  private stampTable(kind: Int8Array, value: Int32Array, takes: number, inputs: ArrayLike<number>): boolean {
    const table = this.replayWires;
    table.length = 0;
    const free = this.freeWires;
    if (takes > free.length) return false;
    this.stamp++;
    for (let j = 0; j < kind.length; j++) {
      const k = kind[j]!;
      const v = value[j]!;
      let wire: number;
      if (k === 0) {
        if (v >= inputs.length) return false;
        wire = inputs[v]!;
      } else if (k === 1) wire = v;
      else wire = free[free.length - 1 - v]!;
      if (wire >= this.wireCap) this.growWires(wire + 1);
      if (this.tabStamp[wire] === this.stamp) return false;
      this.tabStamp[wire] = this.stamp;
      this.tabIdx[wire] = j;
      table.push(wire);
    }
    return true;
  }

  /**
   * A digest of the last instance on each input wire of the stamped table (template, slot, gates
   * cancelled, which table wires it uses): the data a segment's walks most often differ by.
   */
  private fingerprint(kind: Int8Array): number {
    let h = 0;
    const table = this.replayWires;
    for (let j = 0; j < kind.length; j++) {
      if (kind[j] !== 0) continue;
      const wire = table[j]!;
      const id = this.lastInst[wire]!;
      let v = 7;
      if (id >= 0) {
        const loc = this.locate(id, wire);
        v = loc === -1 ? 11 : this.headDigest(loc, this.lastSlot[wire]!, 0);
      }
      h = (Math.imul(h, 1000003) + v) | 0;
    }
    return h;
  }

  private startRecording(key: number, inputs: ArrayLike<number>): void {
    this.rec = true;
    this.recAbort = false;
    this.recStart = this.nextId;
    this.recKey = key;
    this.recFlags = this.flagState();
    this.stamp++;
    this.recKind.length = 0;
    this.recValue.length = 0;
    this.recWire.length = 0;
    this.recHead.length = 0;
    this.recHeadSlot.length = 0;
    this.recTakes = 0;
    this.recGives.length = 0;
    this.recReads.clear();
    this.recKills.clear();
    this.recMarks.clear();
    for (let i = 0; i < inputs.length; i++) {
      const w = inputs[i]!;
      if (w >= this.wireCap) this.growWires(w + 1);
      if (this.tabStamp[w] === this.stamp) {
        this.recAbort = true; // the same wire twice
        continue;
      }
      this.addWire(w, 0, i);
    }
  }

  private addWire(w: number, kind: number, value: number): number {
    const j = this.recKind.length;
    this.tabStamp[w] = this.stamp;
    this.tabIdx[w] = j;
    this.recKind.push(kind);
    this.recValue.push(value);
    this.recWire.push(w);
    this.recHead.push(-2);
    this.recHeadSlot.push(-1);
    return j;
  }

  private recPop(w: number): void {
    if (this.recGives.length > 0) this.recAbort = true; // taken after one was given back
    this.addWire(w, 2, this.recTakes++);
  }

  private recPush(w: number): void {
    if (this.tabStamp[w] !== this.stamp) {
      this.recAbort = true;
      return;
    }
    this.recGives.push(this.tabIdx[w]!);
  }

  /** A segment instance uses wire w, whose last instance is p: the first time, p is the wire's head. */
  private recTouch(w: number, p: number): void {
    let j = this.tabStamp[w] === this.stamp ? this.tabIdx[w]! : -1;
    if (j < 0) j = this.addWire(w, 1, w);
    if (this.recHead[j] === -2) {
      this.recHead[j] = p;
      this.recHeadSlot[j] = this.lastSlot[w]!;
    }
  }

  private recRead(id: number, w: number): void {
    if (!this.recReads.has(id)) {
      const j = this.tabStamp[w] === this.stamp ? this.tabIdx[w]! : -1;
      if (j < 0) this.recAbort = true;
      this.recReads.set(id, j);
    }
  }

  private recKill(id: number, bits: number): void {
    this.recKills.set(id, (this.recKills.get(id) ?? 0) | bits);
  }

  private recMarked(id: number): void {
    this.recMarks.add(id);
  }

  /** The record of the segment just replayed, or null when it cannot be replayed safely. */
  private buildSegment(extra: number): Segment | null {
    const n = this.nextId - this.recStart;
    const t = new Uint8Array(n);
    const w = new Int32Array(n * 3).fill(-1);
    const dead = new Int32Array(n);
    const mask1 = new Int32Array(n);
    const recheck = new Int32Array(n);
    for (let k = 0; k < n; k++) {
      const x = (this.recStart + k) & this.ringMask;
      t[k] = this.rT[x]!;
      for (let s = 0; s < SLOTS[t[k]!]!; s++) {
        const wire = this.rW[x * 3 + s]!;
        if (this.tabStamp[wire] !== this.stamp) return null;
        w[k * 3 + s] = this.tabIdx[wire]!;
      }
      dead[k] = this.rDead[x]!;
      mask1[k] = this.rMask1[x]!;
      recheck[k] = this.rRecheck[x]!;
    }
    // Paths of the earlier instances read: walk each table wire's history from its head.
    const reads: { j: number; depth: number; id: number; t: number; slot: number; dead: number; pat: number[] }[] = [];
    const want = new Map<number, number[]>();
    for (const [id, j] of this.recReads) {
      if (j < 0) return null;
      const list = want.get(j) ?? [];
      list.push(id);
      want.set(j, list);
    }
    for (const [j, ids] of want) {
      const wire = this.recWire[j]!;
      let cur = this.recHead[j]!;
      let slot = this.recHeadSlot[j]!;
      const left = new Set(ids);
      for (let depth = 0; left.size > 0; depth++) {
        if (cur < 0) return null;
        const loc = this.locate(cur, wire);
        if (loc === -1) return null;
        if (left.has(cur)) {
          left.delete(cur);
          const ct = loc >= 0 ? this.rT[loc]! : this.sT[-2 - loc]!;
          const pat: number[] = [];
          for (let s = 0; s < 3; s++) {
            const ww = s < SLOTS[ct]! ? (loc >= 0 ? this.rW[loc * 3 + s]! : this.sW[(-2 - loc) * 3 + s]!) : -1;
            pat.push(ww >= 0 && this.tabStamp[ww] === this.stamp ? this.tabIdx[ww]! : -1);
          }
          const d = (loc >= 0 ? this.rDead[loc]! : this.sDead[-2 - loc]!) & ~(this.recKills.get(cur) ?? 0);
          reads.push({ j, depth, id: cur, t: ct, slot, dead: d, pat });
        }
        const prev = loc >= 0 ? this.rPrev[loc * 3 + slot]! : this.sPrev[-2 - loc]!;
        slot = loc >= 0 ? this.rPrevSlot[loc * 3 + slot]! : this.sPrevSlot[-2 - loc]!;
        cur = prev;
      }
    }
    reads.sort((a, b) => a.j - b.j || a.depth - b.depth);
    for (const id of this.recKills.keys()) if (!this.recReads.has(id)) return null;
    for (const id of this.recMarks) if (!this.recReads.has(id)) return null;
    const ids = [...this.recReads.keys()].sort((a, b) => a - b);
    const ref = new Map(ids.map((id, i) => [id, i]));
    // The fingerprint of the situation at the start: the heads of the input wires then.
    let fp = 0;
    for (let j = 0; j < this.recKind.length; j++) {
      if (this.recKind[j] !== 0) continue;
      const head = this.recHead[j]!;
      const wire = this.recWire[j]!;
      let v = 7;
      if (head === -2) {
        // Not touched by the segment: its head now is what it was.
        const id = this.lastInst[wire]!;
        if (id >= 0) {
          const loc = this.locate(id, wire);
          if (loc === -1) v = 11;
          else v = this.headDigest(loc, this.lastSlot[wire]!, this.recKills.get(id) ?? 0);
        }
      } else if (head >= 0) {
        const loc = this.locate(head, wire);
        if (loc === -1) v = 11;
        else v = this.headDigest(loc, this.recHeadSlot[j]!, this.recKills.get(head) ?? 0);
      }
      fp = (Math.imul(fp, 1000003) + v) | 0;
    }
    return {
      kind: Int8Array.from(this.recKind),
      value: Int32Array.from(this.recValue),
      takes: this.recTakes,
      gives: Int32Array.from(this.recGives),
      t, w, dead, mask1, recheck,
      readJ: Int32Array.from(reads, (r) => r.j),
      readDepth: Int32Array.from(reads, (r) => r.depth),
      readRef: Int32Array.from(reads, (r) => ref.get(r.id)!),
      refs: ids.length,
      readT: Uint8Array.from(reads, (r) => r.t),
      readSlot: Int8Array.from(reads, (r) => r.slot),
      readDead: Int32Array.from(reads, (r) => r.dead),
      readPat: Int32Array.from(reads.flatMap((r) => r.pat)),
      killRef: Int32Array.from(this.recKills.keys(), (id) => ref.get(id)!),
      killBits: Int32Array.from(this.recKills.values()),
      markRef: Int32Array.from(this.recMarks, (id) => ref.get(id)!),
      extra,
      fp,
    };
  }

  /** fingerprint()'s digest of one instance (with the gates the segment cancelled in it restored). */
  private headDigest(loc: number, slot: number, killed: number): number {
    const ct = loc >= 0 ? this.rT[loc]! : this.sT[-2 - loc]!;
    let v = ct * 8 + slot;
    v = Math.imul(v, 31) + ((loc >= 0 ? this.rDead[loc]! : this.sDead[-2 - loc]!) & ~killed);
    for (let s = 0; s < SLOTS[ct]!; s++) {
      const ww = loc >= 0 ? this.rW[loc * 3 + s]! : this.sW[(-2 - loc) * 3 + s]!;
      v = Math.imul(v, 31) + (this.tabStamp[ww] === this.stamp ? this.tabIdx[ww]! + 1 : 0);
    }
    return v;
  }

  private readonly replayWires: number[] = [];
  /** Per read ref: the instance found now, and a wire it was found along. */
  private replayId = new Int32Array(64);
  private replayWire = new Int32Array(64);

  /** Replays a recorded segment if every recorded read finds the same data; true when done. */
  private tryReplay(seg: Segment): boolean {
    const table = this.replayWires;
    const free = this.freeWires;
    // The reads, wire by wire, walking each history once.
    if (this.replayId.length < seg.refs) {
      this.replayId = new Int32Array(seg.refs * 2);
      this.replayWire = new Int32Array(seg.refs * 2);
    }
    const found = this.replayId;
    const along = this.replayWire;
    found.fill(-1, 0, seg.refs);
    const nr = seg.readJ.length;
    let r = 0;
    while (r < nr) {
      const j = seg.readJ[r]!;
      const wire = table[j]!;
      let cur = this.lastInst[wire]!;
      let slot = this.lastSlot[wire]!;
      let depth = 0;
      for (; r < nr && seg.readJ[r] === j; r++) {
        const want = seg.readDepth[r]!;
        let loc = -1;
        for (;;) {
          if (cur < 0) return false;
          loc = this.locate(cur, wire);
          if (loc === -1) return false;
          if (depth === want) break;
          const prev = loc >= 0 ? this.rPrev[loc * 3 + slot]! : this.sPrev[-2 - loc]!;
          slot = loc >= 0 ? this.rPrevSlot[loc * 3 + slot]! : this.sPrevSlot[-2 - loc]!;
          cur = prev;
          depth++;
        }
        const ct = loc >= 0 ? this.rT[loc]! : this.sT[-2 - loc]!;
        if (ct !== seg.readT[r] || slot !== seg.readSlot[r]) return false;
        if ((loc >= 0 ? this.rDead[loc]! : this.sDead[-2 - loc]!) !== seg.readDead[r]) return false;
        for (let s = 0; s < 3; s++) {
          const ww = s < SLOTS[ct]! ? (loc >= 0 ? this.rW[loc * 3 + s]! : this.sW[(-2 - loc) * 3 + s]!) : -1;
          const idx = ww >= 0 && this.tabStamp[ww] === this.stamp ? this.tabIdx[ww]! : -1;
          if (idx !== seg.readPat[r * 3 + s]) return false;
        }
        const ref = seg.readRef[r]!;
        const seen = found[ref]!;
        if (seen === -1) {
          found[ref] = cur;
          along[ref] = wire;
        } else if (seen !== cur) return false;
      }
    }
    // The same instances in the same order (the walks compare their positions).
    for (let i = 1; i < seg.refs; i++) if (found[i - 1]! >= found[i]!) return false;
    // Replay: cancellations and marks in earlier instances, the wires taken, the instances, the wires given back.
    for (let i = 0; i < seg.killRef.length; i++) {
      const id = found[seg.killRef[i]!]!;
      const loc = this.locate(id, along[seg.killRef[i]!]!);
      if (loc >= 0) this.rDead[loc] = this.rDead[loc]! | seg.killBits[i]!;
      else this.sDead[-2 - loc] = this.sDead[-2 - loc]! | seg.killBits[i]!;
      if (id < this.done) {
        this.lagShort = true;
        this.flagHard ??= "a cancellation reached a part already counted";
      }
    }
    for (let i = 0; i < seg.markRef.length; i++) {
      const id = found[seg.markRef[i]!]!;
      if (id >= this.ringLow) this.rRecheck[id & this.ringMask] = -1;
    }
    free.length -= seg.takes;
    const n = seg.t.length;
    for (let k = 0; k < n; k++) {
      const id = this.open();
      const x = id & this.ringMask;
      const t = seg.t[k]!;
      for (let s = 0; s < SLOTS[t]!; s++) this.rW[x * 3 + s] = table[seg.w[k * 3 + s]!]!;
      this.place(id, x, t);
      this.rDead[x] = seg.dead[k]!;
      this.rMask1[x] = seg.mask1[k]!;
      this.rRecheck[x] = seg.recheck[k]!;
      this.close(id);
    }
    for (let i = 0; i < seg.gives.length; i++) free.push(table[seg.gives[i]!]!);
    return true;
  }

  // ---- the instance store ----------------------------------------------------------------

  /**
   * Keeps a copy of an instance leaving the ring on each wire that may still walk into it: where
   * it is among the wire's last `depth` instances, or the one before an instance not yet through
   * stage 2.
   */
  private evict(old: number): void {
    const x = old & this.ringMask;
    const t = this.rT[x]!;
    const d = this.depth;
    for (let s = 0; s < SLOTS[t]!; s++) {
      const w = this.rW[x * 3 + s]!;
      const next = this.rNext[x * 3 + s]!;
      // Kept when fewer than `depth` instances came after it on w, or the next one on w is not
      // through stage 2 yet (whose walks start here).
      const keep = this.wireSeq[w]! - this.rSeq[x * 3 + s]! < d || next >= this.done;
      if (!keep) continue;
      // Newest first: shift the older copies of this wire down.
      const b = w * d;
      for (let i = d - 1; i > 0; i--) {
        const from = b + i - 1;
        const to = b + i;
        this.sId[to] = this.sId[from]!;
        this.sT[to] = this.sT[from]!;
        this.sW[to * 3] = this.sW[from * 3]!;
        this.sW[to * 3 + 1] = this.sW[from * 3 + 1]!;
        this.sW[to * 3 + 2] = this.sW[from * 3 + 2]!;
        this.sDead[to] = this.sDead[from]!;
        this.sPrev[to] = this.sPrev[from]!;
        this.sPrevSlot[to] = this.sPrevSlot[from]!;
      }
      this.sId[b] = old;
      this.sT[b] = t;
      this.sW[b * 3] = this.rW[x * 3]!;
      this.sW[b * 3 + 1] = this.rW[x * 3 + 1]!;
      this.sW[b * 3 + 2] = this.rW[x * 3 + 2]!;
      this.sDead[b] = this.rDead[x]!;
      this.sPrev[b] = this.rPrev[x * 3 + s]!;
      this.sPrevSlot[b] = this.rPrevSlot[x * 3 + s]!;
    }
  }

  /** Where instance `id` is kept, seen from wire w: ring index, -2 - copy index, or -1. */
  private locate(id: number, w: number): number {
    if (id >= this.ringLow) return id & this.ringMask;
    const b = w * this.depth;
    for (let i = 0; i < this.depth; i++) if (this.sId[b + i] === id) return -2 - (b + i);
    return -1;
  }

  // ---- cancel-inverses -------------------------------------------------------------------

  /** Stage 1: the first cancel-inverses for the new instance. */
  private cancel(id: number, x: number): void {
    const t = this.rT[x]!;
    const n = gatesOf(t);
    let exits = EXIT0[t]!;
    let known = 0;
    let walked = 0;
    const base = GATE_START[t]!;
    for (let p = 0; p < n; p++) {
      const dead = this.rDead[x]!;
      if ((dead >>> p) & 1) continue;
      // A gate whose walk stops inside the instance (given the gates gone so far) stays.
      if (dead !== known) {
        known = dead;
        exits = exitingGates(t, dead);
      }
      if (((exits >>> p) & 1) === 0) continue;
      const e = base + p;
      const kind = G_KIND[e]!;
      if (G_NQ[e] === 0 || kind === KIND_MEASURE || kind === KIND_RESET) continue;
      const partner = this.findPartner(id, x, p);
      if (partner >= 0) {
        const hid = Math.floor(partner / 32);
        const hp = partner % 32;
        const hw = this.rW[x * 3 + G_OP[e * 3 + G_NQ[e]! - 1]!]!;
        const loc = this.locate(hid, hw);
        if (loc >= 0) this.rDead[loc] = this.rDead[loc]! | (1 << hp);
        else this.sDead[-2 - loc] = this.sDead[-2 - loc]! | (1 << hp);
        if (this.rec && hid < this.recStart) this.recKill(hid, 1 << hp);
        this.rDead[x] = this.rDead[x]! | (1 << p);
        if (hid < this.done) {
          this.lagShort = true;
          this.flagHard ??= "a cancellation reached a part already counted";
        }
        // Walks that passed over the partner before it went may go further now: stage 2
        // repeats them (see settle): of the instances after it on its wires, and of this
        // instance's gates walked before. The partner's own later gates see it in its mask.
        for (let i = 0; i < G_NQ[e]!; i++) this.markRecheck(x, G_OP[e * 3 + i]!, hid);
        this.rRecheck[x] = this.rRecheck[x]! | walked;
      } else walked |= 1 << p;
    }
  }

  /** Marks the instances on the wire of slot s between instance `from` and instance x (both exclusive). */
  private markRecheck(x: number, s: number, from: number): void {
    let loc = x;
    let slot = s;
    for (;;) {
      const prev = this.rPrev[loc * 3 + slot]!;
      if (prev <= from || prev < this.ringLow) return;
      const pl = prev & this.ringMask;
      this.rRecheck[pl] = -1;
      if (this.rec && prev < this.recStart) this.recMarked(prev);
      slot = this.rPrevSlot[loc * 3 + slot]!;
      loc = pl;
    }
  }

  /**
   * cancelInverses.ts's findPartner for gate p of instance `id` (at ring index x): the most
   * recent live gate that undoes it with only commuting gates between, as id * 32 + position,
   * or -1.
   */
  private findPartner(id: number, x: number, p: number): number {
    const t = this.rT[x]!;
    const e = GATE_START[t]! + p;
    const nq = G_NQ[e]!;
    const ts = G_OP[e * 3 + nq - 1]!;
    const w = this.rW[x * 3 + ts]!;
    let steps = 0;
    let loc = x;
    let cur = id;
    let slot = ts;
    let k = GATE_SLOT_INDEX[e * 3 + ts]! - 1;
    for (;;) {
      const ct = loc >= 0 ? this.rT[loc]! : this.sT[-2 - loc]!;
      const list = SLOT_GATES[ct * 3 + slot]!;
      const dead = loc >= 0 ? this.rDead[loc]! : this.sDead[-2 - loc]!;
      for (; k >= 0; k--) {
        const hp = list[k]!;
        if ((dead >>> hp) & 1) continue;
        if (steps >= WINDOW) {
          // merge-phases changes how many phase gates a walk diagonal on its qubit passes (never
          // those an X-like or other walk passes: it stops at the first phase gate): only such a
          // walk could reach further in the second cancel-inverses.
          // Stage 1 notes it too: stage 2 repeats only the walks that something changed (settle).
          if (G_ROLE[e * 3 + ts] === ROLE_Z) this.noteSecond("the second cancel-inverses reaches its window");
          return -1;
        }
        steps++;
        const f = GATE_START[ct]! + hp;
        if (this.inversePair(x, e, loc, f) && this.clearBetween(id, x, p, cur, hp)) return cur * 32 + hp;
        if (!this.commute(x, e, loc, f)) return -1;
      }
      // The previous instance on this wire.
      const prev = loc >= 0 ? this.rPrev[loc * 3 + slot]! : this.sPrev[-2 - loc]!;
      if (prev < 0) return -1;
      const ps = loc >= 0 ? this.rPrevSlot[loc * 3 + slot]! : this.sPrevSlot[-2 - loc]!;
      const pl = prev >= this.ringLow ? prev & this.ringMask : this.locate(prev, w);
      if (pl === -1) {
        this.unavailable();
        return -1;
      }
      loc = pl;
      cur = prev;
      slot = ps;
      if (this.rec && cur < this.recStart) this.recRead(cur, w);
      k = SLOT_GATES[(loc >= 0 ? this.rT[loc]! : this.sT[-2 - loc]!) * 3 + slot]!.length - 1;
    }
  }

  private noteSecond(reason: string): void {
    if (this.flagSecond === null) this.flagSecond = reason;
  }

  private unavailable(): void {
    this.historyShort = true;
    if (this.flagHard === null) this.flagHard = "a cancel-inverses walk needed a part no longer kept";
  }

  /** commute.ts's inversePair for gate e of the instance at ring index x and gate f at loc. */
  private inversePair(x: number, e: number, loc: number, f: number): boolean {
    if (INVERSE_KIND[G_KIND[e]!] !== G_KIND[f] || G_COND[e] || G_COND[f]) return false;
    const nq = G_NQ[e]!;
    if (G_NQ[f] !== nq) return false;
    const wa = loc >= 0 ? this.rW : this.sW;
    const xb = (loc >= 0 ? loc : -2 - loc) * 3;
    for (let i = 0; i < nq; i++) {
      if (this.rW[x * 3 + G_OP[e * 3 + i]!] !== wa[xb + G_OP[f * 3 + i]!]) return false;
    }
    return true;
  }

  /** commute.ts's commute for gate e of the instance at ring index x and gate f at loc. */
  private commute(x: number, e: number, loc: number, f: number): boolean {
    const nq = G_NQ[e]!;
    const wa = loc >= 0 ? this.rW : this.sW;
    const xb = (loc >= 0 ? loc : -2 - loc) * 3;
    for (let i = 0; i < nq; i++) {
      const s = G_OP[e * 3 + i]!;
      const w = this.rW[x * 3 + s]!;
      // The role of f on wire w (slots of an instance are distinct wires; unused ones are stale).
      let rh = -1;
      if (wa[xb] === w) rh = G_ROLE[f * 3]!;
      if (rh < 0 && wa[xb + 1] === w) rh = G_ROLE[f * 3 + 1]!;
      if (rh < 0 && wa[xb + 2] === w) rh = G_ROLE[f * 3 + 2]!;
      if (rh < 0) continue;
      const rg = G_ROLE[e * 3 + s]!;
      if (rg === ROLE_OTHER || rg !== rh) return false;
    }
    return true;
  }

  /**
   * cancelInverses.ts's clearBetween: every live gate after gate hp of instance hid on the other
   * qubits of gate p of instance id commutes with it (at most WINDOW of them per qubit).
   */
  private clearBetween(id: number, x: number, p: number, hid: number, hp: number): boolean {
    const t = this.rT[x]!;
    const e = GATE_START[t]! + p;
    const nq = G_NQ[e]!;
    for (let i = 0; i + 1 < nq; i++) {
      const s0 = G_OP[e * 3 + i]!;
      const w = this.rW[x * 3 + s0]!;
      let steps = 0;
      let loc = x;
      let cur = id;
      let slot = s0;
      let k = GATE_SLOT_INDEX[e * 3 + s0]! - 1;
      for (;;) {
        const ct = loc >= 0 ? this.rT[loc]! : this.sT[-2 - loc]!;
        const list = SLOT_GATES[ct * 3 + slot]!;
        const dead = loc >= 0 ? this.rDead[loc]! : this.sDead[-2 - loc]!;
        let stop = false;
        for (; k >= 0; k--) {
          const xp = list[k]!;
          if (cur < hid || (cur === hid && xp <= hp)) {
            stop = true;
            break;
          }
          if ((dead >>> xp) & 1) continue;
          if (++steps > WINDOW) {
            // The gates passed here are diagonal on this qubit (controls), phase gates among them.
            this.noteSecond("the second cancel-inverses reaches its window");
            return false;
          }
          if (!this.commute(x, e, loc, GATE_START[ct]! + xp)) return false;
        }
        if (stop || cur <= hid) break;
        const prev = loc >= 0 ? this.rPrev[loc * 3 + slot]! : this.sPrev[-2 - loc]!;
        if (prev < 0) break;
        const ps = loc >= 0 ? this.rPrevSlot[loc * 3 + slot]! : this.sPrevSlot[-2 - loc]!;
        const pl = prev >= this.ringLow ? prev & this.ringMask : this.locate(prev, w);
        if (pl === -1) {
          this.unavailable();
          return false;
        }
        loc = pl;
        cur = prev;
        slot = ps;
        if (this.rec && cur < this.recStart) this.recRead(cur, w);
        k = SLOT_GATES[(loc >= 0 ? this.rT[loc]! : this.sT[-2 - loc]!) * 3 + slot]!.length - 1;
      }
    }
    return true;
  }

  // ---- final instances: second cancel-inverses (detection), merge-phases, tally ----------

  private settle(id: number): void {
    const x = id & this.ringMask;
    const t = this.rT[x]!;
    const dead = this.rDead[x]!;
    const slots = SLOTS[t]!;
    this.done = id + 1;
    if (this.optimize && this.flagSecond === null) {
      // Stage 2 (the second cancel-inverses, detecting only). A walk from this instance is the
      // one of stage 1 unless a gate it passes went after that: then it is repeated.
      const later = dead ^ this.rMask1[x]!;
      const again = this.rRecheck[x]!;
      if (again !== 0 || later !== 0) {
        const exits = exitingGates(t, dead);
        for (let m = exits; m !== 0; m &= m - 1) {
          const p = 31 - Math.clz32(m & -m);
          if (((again >>> p) & 1) === 0 && (later & ((1 << p) - 1)) === 0) continue;
          const e = GATE_START[t]! + p;
          const kind = G_KIND[e]!;
          if (G_NQ[e] === 0 || kind === KIND_MEASURE || kind === KIND_RESET) continue;
          if (this.findPartner(id, x, p) >= 0) {
            this.noteSecond("the second cancel-inverses would cancel more");
            break;
          }
        }
      }
    }
    if (!this.levels) {
      const base = GATE_START[t]!;
      const n = gatesOf(t);
      for (let p = 0; p < n; p++) {
        if ((dead >>> p) & 1) continue;
        const k = G_KIND[base + p]!;
        if (k === KIND_T || k === KIND_TDG) this.tCount++;
        else if (k === KIND_CX || k === KIND_CZ) this.cnotCount++;
        else if (k === KIND_CCX) this.toffoliCount++;
        else if (k === KIND_MEASURE) this.measurements++;
        if (G_PHASE[base + p]! >= 0) this.phaseGates++;
      }
      return;
    }
    const w0 = this.rW[x * 3]!;
    const w1 = slots > 1 ? this.rW[x * 3 + 1]! : -1;
    const w2 = slots > 2 ? this.rW[x * 3 + 2]! : -1;
    const tr = transferOf(t, dead, slots > 0 ? this.pend[w0]! : 0, w1 >= 0 ? this.pend[w1]! : 0, w2 >= 0 ? this.pend[w2]! : 0, this.optimize);
    this.tCount += tr.tCount;
    this.cnotCount += tr.cnotCount;
    this.toffoliCount += tr.toffoliCount;
    this.measurements += tr.measurements;
    this.phaseGates += tr.phaseGates;
    if (tr.vanished) this.noteSecond("merge-phases removed a run of phase gates alone");
    if (slots === 0) return;
    const lv = this.level;
    const tv = this.tLevel;
    const l0 = lv[w0]!;
    const l1 = w1 >= 0 ? lv[w1]! : 0;
    const l2 = w2 >= 0 ? lv[w2]! : 0;
    const t0 = tv[w0]!;
    const t1 = w1 >= 0 ? tv[w1]! : 0;
    const t2 = w2 >= 0 ? tv[w2]! : 0;
    const lb = this.bitL;
    const tb = this.bitTL;
    if (tr.bit !== null) {
      this.bitL = maxPlus(tr.bit, 0, l0, l1, l2, lb);
      this.bitTL = maxPlus(tr.bitT!, 0, t0, t1, t2, tb);
    }
    const d = tr.d;
    const dt = tr.dt;
    lv[w0] = maxPlus(d, 0, l0, l1, l2, lb);
    tv[w0] = maxPlus(dt, 0, t0, t1, t2, tb);
    this.pend[w0] = tr.pendOut[0]!;
    if (w1 >= 0) {
      lv[w1] = maxPlus(d, 4, l0, l1, l2, lb);
      tv[w1] = maxPlus(dt, 4, t0, t1, t2, tb);
      this.pend[w1] = tr.pendOut[1]!;
    }
    if (w2 >= 0) {
      lv[w2] = maxPlus(d, 8, l0, l1, l2, lb);
      tv[w2] = maxPlus(dt, 8, t0, t1, t2, tb);
      this.pend[w2] = tr.pendOut[2]!;
    }
  }
}

/** max over inputs j of in_j + o[k + j] (NONE: no path from that input). */
function maxPlus(o: Int32Array, k: number, a: number, b: number, c: number, bit: number): number {
  let r = -Infinity;
  const da = o[k]!;
  const db = o[k + 1]!;
  const dc = o[k + 2]!;
  const dd = o[k + 3]!;
  if (da !== NONE) r = a + da;
  if (db !== NONE && b + db > r) r = b + db;
  if (dc !== NONE && c + dc > r) r = c + dc;
  if (dd !== NONE && bit + dd > r) r = bit + dd;
  return r;
}

function sameTable(a: SegmentsOfKey, b: Segment): boolean {
  if (a.takes !== b.takes || a.kind.length !== b.kind.length) return false;
  for (let j = 0; j < a.kind.length; j++) if (a.kind[j] !== b.kind[j] || a.value[j] !== b.value[j]) return false;
  return true;
}
