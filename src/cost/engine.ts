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
 * 3. merge-phases (passes/mergePhases.ts), replayed exactly per qubit (transfer.ts), then the
 *    ASAP tally of emit/resources.ts (depth, T-depth, counts) with one level per wire.
 * 4. The second cancel-inverses runs on merge-phases' output; it is replayed on the first one's
 *    output after each instance is final, detecting only. That is the same pass as far as it can
 *    act: merge-phases only moves a phase gate later past gates diagonal on its qubit (never past
 *    a gate it blocks: those are not diagonal there) and merges a run into at most two gates, so
 *    a walk sees the same gates stop it, unless a run of phase gates alone vanishes or a walk
 *    diagonal on its qubit reaches the window (both detected). When it might act, the figures
 *    are upper bounds: it only removes gates, and removing a gate grows no count and no ASAP level.
 * drop-identities only merges global phases here (no multi-controlled gates are left), and
 * fold-x-polarity finds no polarity in the toffoli and clifford+t bases: neither changes a figure.
 *
 * Memory: a ring of recent instances, copies of the last few instances of each wire that left it,
 * and a few numbers per wire. An instance is final (counted) once `lag` later instances were
 * replayed. A cancellation reaching an instance already counted, or a walk needing an instance no
 * longer kept, makes the run fall short (lagShort, historyShort): cost/index.ts then runs it again
 * keeping more, at last everything, so that a shortfall never reaches a result.
 */
import { K } from "../ir/kinds.js";
import {
  FIRST_TOUCH, LAST_TOUCH, G_KIND, G_NQ, G_OP, GATE_START, SLOTS, TRAIL_GATES,
  exitingGates, gatesOf,
} from "./templates.js";
import type { InstanceSink } from "./lowering.js";
import { InstanceTally } from "./tally.js";
import { WireReuse } from "./reuse.js";
import { EXIT0, findPartner, markRecheck, restageWalks, type WalkStore } from "./walks.js";

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
  /** Wires expected (search, target and work), to size the per-wire tables once. */
  readonly wires?: number;
  /** Qubit ids expected (see LoweringStream), to size the id-to-wire table once. */
  readonly ids?: number;
  /**
   * Replay the second cancel-inverses (stage 2; default true). The pipeline runs it only when
   * merge-phases met two phase gates or more: a run without it that meets fewer is exact, one
   * that meets more says so (secondNeeded) and must be run again with it.
   */
  readonly second?: boolean;
  /**
   * For a replay of one part of a circuit over a given context (see blocks.ts): a flag per wire
   * whose gates before the first one put here exist but were left out. A walk that would go past
   * them is noted (`truncatedHits`) instead of being taken as the start of the wire.
   */
  readonly truncated?: Uint8Array;
  /** With lag Infinity: instances expected (sizes the ring once). */
  readonly ring?: number;
  /**
   * Use the whole lag from the first instance (default false: the window starts short and grows
   * with the stream, so that small circuits stay cheap, which makes a stream whose cancellations
   * reach far early on fall short, e.g. a search's second iteration taking up the first one's wires).
   */
  readonly eagerLag?: boolean;
  /**
   * Report when the last this-many wires still free at the end were freed (EngineResult.freedAt):
   * a search's diffusion takes them up next (see cost/index.ts searchCostOf).
   */
  readonly keepFreed?: number;
  /**
   * A holder for the per-wire records' memory, shared by the runs of one cost table: a run takes
   * the buffer left by the one before (a million clauses' wide oracle needs some 200 MB of them)
   * instead of allocating its own while the last one waits for the garbage collector.
   */
  readonly wireMemory?: WireMemory;
  /**
   * Defer the trails of freed wires (default false): the gates a work qubit's last instance has on
   * it after its last gate touching another qubit (TRAIL_GATES; an uncomputed AND's closing Tdg
   * and H) are tallied only when the wire is taken again (before the new use's first instance is
   * tallied) or at the end. Nothing else touches the wire meanwhile, so its levels and phase run
   * come out the same; but the new use's opening gates may cancel them however long the wire sat
   * free, which without this makes the run fall short (lagShort) and keep every instance: clauses
   * of mixed widths leave wires deep in reuse's stack for most of the circuit.
   */
  readonly deferTrails?: boolean;
}

/** See EngineOptions.wireMemory (also the lowering's AND records: see RecordMemory). */
export interface WireMemory {
  buffer: ArrayBuffer | null;
  records: Int32Array<ArrayBuffer> | null;
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
  /** Run without stage 2, the circuit turned out to have two phase gates or more (see EngineOptions.second). */
  readonly secondNeeded: boolean;
  /**
   * With EngineOptions.keepFreed: the instance numbers at which the wires still free at the end
   * were freed, the last `keepFreed` of them, oldest first (reuse takes the last one first).
   */
  readonly freedAt?: Int32Array;
  /**
   * True for a Toffoli count tallied from the logical operations (toffolis.ts): `toffoliCount`
   * and `instances` (operations) hold; the other figures are 0, not counted.
   */
  readonly toffoliOnly?: boolean;
}

const KIND_MEASURE = K.measure;
const KIND_RESET = K.reset;

export class CountingEngine implements InstanceSink, WalkStore {
  private base: number;
  private readonly optimize: boolean;
  private readonly second: boolean;
  /** Instances replayed before one is final; grows with the stream up to maxLag. */
  private lag = 64;
  private readonly maxLag: number;
  private ringSize: number;
  ringMask: number;
  /** The oldest instance still in the ring (older ones survive only as a wire's copy). */
  ringLow = 0;

  // Instances, in a ring.
  rT: Uint8Array;
  rW: Int32Array;
  rDead: Int32Array;
  rPrev: Int32Array;
  rPrevSlot: Int8Array;
  private rNext: Int32Array;
  /** Cancelled gates of each instance right after its own stage 1. */
  rMask1: Int32Array;
  /** Per slot: how many instances its wire had with this one (see evict). */
  private rSeq: Int32Array;
  /** Gates whose walk stage 2 repeats: a gate they passed went after their stage 1 (-1: all). */
  rRecheck: Int32Array;
  /** Slots whose qubit died with the instance (see deferTrails). */
  private rDies: Uint8Array;
  private nextId = 0;
  /** Instances below this have been through stage 2 and the tally. */
  private done = 0;

  // Wires.
  /**
   * Per-wire columns, in one buffer (a wide oracle has millions of wires): the last instance on
   * the wire (-1: none) and its slot there, the instances on it so far (only with more than one
   * copy kept: see evict), its pending phase run (merge-phases), its level and T-level. With one
   * copy, 54 bytes per wire (3.2 million wires for a million clauses' wide oracle: 175 MB,
   * against 64 bytes in whole records before).
   */
  private lastId = new Int32Array(0);
  private lastSlot = new Uint8Array(0);
  private seq = new Int32Array(0);
  private pend = new Uint8Array(0);
  private lvl = new Float64Array(0);
  private tlvl = new Float64Array(0);
  /**
   * `depth` copies per wire of instances that left the ring, 8 ints each, newest first (+ 0 id,
   * -1 none; + 1 template; + 2..4 wires; + 5 cancelled gates; + 6 previous instance on the wire;
   * + 7 its slot), cs ints per wire: a walk along a wire seldom used may need the last few
   * instances on it long after they left.
   */
  cp = new Int32Array(0);
  /** Ints per wire in cp. */
  private readonly cs: number;
  /** Copies kept per wire. */
  private readonly depth: number;

  private wireCap = 0;
  private readonly wireMemory: WireMemory | null;
  /** See EngineOptions.deferTrails: per wire, the instance whose trail waits (-1: none) and the trail's gates. */
  private readonly defer: boolean;
  private defId = new Int32Array(0);
  private defMask = new Int32Array(0);

  // Virtual ids -> wires.
  private readonly reuse: WireReuse;
  private readonly keepFreed: number;

  // Figures.
  private readonly tally: InstanceTally;
  private flagHard: string | null = null;
  private historyShort = false;
  private lagShort = false;
  private flagBound: string | null = null;
  /** Set when the second cancel-inverses might change something (irrelevant if it never runs). */
  private flagSecond: string | null = null;
  truncated: Uint8Array | null;
  /** Wires where a walk reached the left-out part (see EngineOptions.truncated). */
  readonly truncatedHits: number[] = [];
  /** In restage: window events are the walk's own result, not a flag of the run. */
  private probing = false;
  private probeHit = false;

  constructor(opts: EngineOptions) {
    this.base = opts.base;
    this.optimize = opts.optimize;
    this.second = opts.second ?? true;
    this.tally = new InstanceTally(opts.levels, opts.optimize);
    this.maxLag = opts.lag ?? 65536;
    this.lag = this.maxLag === Infinity || opts.eagerLag === true ? this.maxLag : Math.min(1024, this.maxLag);
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
    this.rDies = new Uint8Array(0);
    this.defer = opts.deferTrails ?? false;
    // Keeping every instance, none ever leaves the ring: no copies per wire, no per-slot sequence
    // numbers (12 bytes per instance: 138 MB of bw_large.d's 11.5 million).
    this.depth = this.maxLag === Infinity ? 1 : (opts.history ?? 1);
    this.growRing(this.maxLag === Infinity ? (opts.ring ?? 4096) : 0);
    this.cs = 8 * this.depth;
    this.wireMemory = opts.wireMemory ?? null;
    this.growWires(Math.max(64, this.base + 64, opts.wires ?? 0));
    this.reuse = new WireReuse(this.base, opts.ids ?? 0, (opts.keepFreed ?? 0) > 0);
    this.truncated = opts.truncated ?? null;
    this.keepFreed = opts.keepFreed ?? 0;
  }

  /** A ring for the current lag (at least twice the lag and a margin for walks), entries kept. */
  private growRing(atLeast = 0): void {
    let r = Math.max(256, this.ringSize);
    const want = Number.isFinite(this.lag) ? this.lag * 2 + 64 : 0;
    while (r < Math.max(atLeast, want)) r *= 2;
    if (r === this.ringSize) return;
    const old = { size: this.ringSize, mask: this.ringMask, rT: this.rT, rW: this.rW, rDead: this.rDead, rPrev: this.rPrev, rPrevSlot: this.rPrevSlot, rNext: this.rNext, rMask1: this.rMask1, rRecheck: this.rRecheck, rSeq: this.rSeq, rDies: this.rDies };
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
    this.rSeq = new Int32Array(this.depth > 1 ? r * 3 : 0);
    this.rDies = new Uint8Array(this.defer ? r : 0);
    for (let id = this.ringLow; id < this.nextId; id++) {
      const a = id & old.mask;
      const b = id & this.ringMask;
      this.rT[b] = old.rT[a]!;
      this.rDead[b] = old.rDead[a]!;
      this.rMask1[b] = old.rMask1[a]!;
      this.rRecheck[b] = old.rRecheck[a]!;
      if (this.defer) this.rDies[b] = old.rDies[a]!;
      for (let s = 0; s < 3; s++) {
        this.rW[b * 3 + s] = old.rW[a * 3 + s]!;
        this.rPrev[b * 3 + s] = old.rPrev[a * 3 + s]!;
        this.rPrevSlot[b * 3 + s] = old.rPrevSlot[a * 3 + s]!;
        this.rNext[b * 3 + s] = old.rNext[a * 3 + s]!;
        if (this.depth > 1) this.rSeq[b * 3 + s] = old.rSeq[a * 3 + s]!;
      }
    }
  }

  /** Bytes of the wire columns for `cap` wires. */
  private wireBytes(cap: number): number {
    return cap * (8 + 8 + 4 + (this.depth > 1 ? 4 : 0) + 4 * this.cs + 1 + 1);
  }

  private growWires(n: number): void {
    if (n <= this.wireCap) return;
    // Growing by half: these tables are the engine's largest (a wide oracle has a wire per literal).
    const cap = Math.max(n, Math.ceil(this.wireCap * 1.5));
    const held = this.wireMemory?.buffer ?? null;
    let buf: ArrayBuffer;
    if (this.wireCap === 0 && held !== null && held.byteLength >= this.wireBytes(cap)) {
      // The buffer of an earlier run (every column is set below).
      buf = held;
    } else {
      buf = new ArrayBuffer(this.wireBytes(cap));
      if (this.wireMemory !== null) this.wireMemory.buffer = buf;
    }
    // One buffer, carved into columns (wider elements first, for alignment).
    let at = 0;
    const lvl = new Float64Array(buf, at, cap);
    at += 8 * cap;
    const tlvl = new Float64Array(buf, at, cap);
    at += 8 * cap;
    const lastId = new Int32Array(buf, at, cap);
    at += 4 * cap;
    // Instances per wire are read only to keep more than one copy (see evict).
    const seqCap = this.depth > 1 ? cap : 0;
    const seq = new Int32Array(buf, at, seqCap);
    at += 4 * seqCap;
    const cp = new Int32Array(buf, at, cap * this.cs);
    at += 4 * cap * this.cs;
    const lastSlot = new Uint8Array(buf, at, cap);
    at += cap;
    const pend = new Uint8Array(buf, at, cap);
    const old = this.wireCap;
    if (old > 0) {
      lvl.set(this.lvl);
      tlvl.set(this.tlvl);
      lastId.set(this.lastId);
      if (seqCap > 0) seq.set(this.seq);
      cp.set(this.cp);
      lastSlot.set(this.lastSlot);
      pend.set(this.pend);
    }
    // New wires: no instance, no copies ("none" marks), level 0, no pending run.
    lvl.fill(0, old);
    tlvl.fill(0, old);
    lastId.fill(-1, old);
    if (seqCap > 0) seq.fill(0, old);
    if (this.depth === 1) cp.fill(-1, old * this.cs);
    else {
      cp.fill(0, old * this.cs);
      for (let i = old * this.cs; i < cap * this.cs; i += 8) cp[i] = -1;
    }
    lastSlot.fill(0, old);
    pend.fill(0, old);
    this.lvl = lvl;
    this.tlvl = tlvl;
    this.tally.lvl = lvl;
    this.tally.tlvl = tlvl;
    this.tally.pend = pend;
    this.lastId = lastId;
    this.seq = seq;
    this.cp = cp;
    this.lastSlot = lastSlot;
    this.pend = pend;
    if (this.defer) {
      const defId = new Int32Array(cap).fill(-1);
      defId.set(this.defId);
      const defMask = new Int32Array(cap);
      defMask.set(this.defMask);
      this.defId = defId;
      this.defMask = defMask;
    }
    this.wireCap = cap;
  }

  /** An empty wire: no instance, no copies. */
  private clearWire(w: number): void {
    this.lvl[w] = 0;
    this.tlvl[w] = 0;
    this.lastId[w] = -1;
    if (this.depth > 1) this.seq[w] = 0;
    this.lastSlot[w] = 0;
    this.pend[w] = 0;
    const b = w * this.cs;
    this.cp.fill(0, b, b + this.cs);
    for (let i = 0; i < this.depth; i++) this.cp[b + 8 * i] = -1;
  }

  private wireFor(v: number): number {
    const w = this.reuse.wireFor(v);
    if (w >= this.wireCap) this.growWires(w + 1);
    return w;
  }

  // ---- input -----------------------------------------------------------------------------

  put(t: number, a: number, b: number, c: number, dies: number): void {
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
    const x = id & this.ringMask;
    if (id - this.ringSize >= this.ringLow) {
      this.evict(id - this.ringSize);
      this.ringLow = id - this.ringSize + 1;
    }
    // Wires in the order of first use (reuse takes them in that order).
    const touch = FIRST_TOUCH[t]!;
    for (let i = 0; i < touch.length; i++) {
      const s = touch[i]!;
      this.rW[x * 3 + s] = this.wireFor(s === 0 ? a : s === 1 ? b : c);
    }
    this.rT[x] = t;
    this.rDead[x] = 0;
    this.rRecheck[x] = 0;
    const slots = SLOTS[t]!;
    for (let s = 0; s < slots; s++) {
      const w = this.rW[x * 3 + s]!;
      const p = this.lastId[w]!;
      const ps = this.lastSlot[w]!;
      this.rPrev[x * 3 + s] = p;
      this.rPrevSlot[x * 3 + s] = ps;
      this.rNext[x * 3 + s] = -1;
      if (p >= this.ringLow) this.rNext[(p & this.ringMask) * 3 + ps] = id;
      this.lastId[w] = id;
      this.lastSlot[w] = s;
      if (this.depth > 1) this.rSeq[x * 3 + s] = ++this.seq[w]!;
    }
    if (this.optimize) this.cancel(id, x);
    this.rMask1[x] = this.rDead[x]!;
    if (this.defer) this.rDies[x] = dies;
    if (dies !== 0) {
      // Freed in the order of their last gate, as reuseWork frees them.
      const order = LAST_TOUCH[t]!;
      for (let i = 0; i < order.length; i++) {
        const s = order[i]!;
        if (((dies >>> s) & 1) === 0) continue;
        this.reuse.release(s === 0 ? a : s === 1 ? b : c, id);
      }
    }
    while (this.done <= id - this.lag) this.settle(this.done);
  }

  /** Flushes everything; call once after the last instance. */
  finish(): EngineResult {
    while (this.done < this.nextId) this.settle(this.done);
    const wires = this.base + this.reuse.workWires;
    if (this.defer) for (let w = 0; w < wires; w++) if (this.defId[w]! >= 0) this.flushTrail(w);
    const { depth, tDepth } = this.tally.finish(wires);
    // The second cancel-inverses runs only when merge-phases made a new circuit (two or more
    // phase gates); otherwise the runner skips it.
    const tally = this.tally;
    if (tally.phaseGates >= 2 && this.flagSecond !== null && this.flagBound === null) this.flagBound = this.flagSecond;
    const secondNeeded = this.optimize && !this.second && tally.phaseGates >= 2;
    if (secondNeeded) this.flagHard ??= "the second cancel-inverses was not replayed";
    const exact = this.flagHard === null && this.flagBound === null;
    return {
      qubits: wires,
      tCount: tally.tCount,
      tDepth,
      cnotCount: tally.cnotCount,
      toffoliCount: tally.toffoliCount,
      depth,
      measurements: tally.measurements,
      instances: this.nextId,
      exact,
      upperBound: !exact && this.flagHard === null,
      reason: this.flagHard ?? this.flagBound,
      historyShort: this.historyShort,
      lagShort: this.lagShort,
      secondNeeded,
      ...(this.keepFreed > 0 ? { freedAt: this.reuse.freedAt(this.keepFreed) } : {}),
    };
  }

  /** Instances replayed so far. */
  get instances(): number {
    return this.nextId;
  }

  // ---- replaying one part over a given context (blocks.ts) -------------------------------

  /**
   * Puts an instance of the context: wires given directly (the engine must have been made with
   * `base` above every wire used, lag Infinity), linked into the gate lists of the slots in `link`
   * only, with the gates already cancelled and the stage-1 facts it had. Nothing is walked.
   */
  preload(t: number, w0: number, w1: number, w2: number, link: number, dead: number, mask1: number, recheck: number): number {
    const id = this.nextId++;
    if (id >= this.ringSize) this.growRing(this.ringSize * 2);
    const x = id & this.ringMask;
    this.rT[x] = t;
    this.rW[x * 3] = w0;
    this.rW[x * 3 + 1] = w1;
    this.rW[x * 3 + 2] = w2;
    this.rDead[x] = dead;
    this.rMask1[x] = mask1;
    this.rRecheck[x] = recheck;
    for (let s = 0; s < 3; s++) {
      this.rNext[x * 3 + s] = -1;
      if (s >= SLOTS[t]! || ((link >>> s) & 1) === 0) {
        this.rPrev[x * 3 + s] = -1;
        continue;
      }
      const w = this.rW[x * 3 + s]!;
      const p = this.lastId[w]!;
      const ps = this.lastSlot[w]!;
      this.rPrev[x * 3 + s] = p;
      this.rPrevSlot[x * 3 + s] = ps;
      if (p >= 0) this.rNext[(p & this.ringMask) * 3 + ps] = id;
      this.lastId[w] = id;
      this.lastSlot[w] = s;
      if (this.depth > 1) this.rSeq[x * 3 + s] = ++this.seq[w]!;
    }
    return id;
  }

  /**
   * Starts a new replay on this engine (one made with lag Infinity; blocks.ts replays thousands of
   * blocks): no instances, wires 0..base-1 empty, the given truncated flags. The arrays are kept.
   */
  resetReplay(base: number, truncated: Uint8Array): void {
    this.base = base;
    if (base + 64 > this.wireCap) this.growWires(base + 64);
    for (let w = 0; w < base; w++) this.clearWire(w);
    this.nextId = 0;
    this.done = 0;
    this.ringLow = 0;
    this.reuse.reset(base);
    this.tally.reset();
    this.flagHard = null;
    this.historyShort = false;
    this.lagShort = false;
    this.flagBound = null;
    this.flagSecond = null;
    this.truncatedHits.length = 0;
    this.truncated = truncated;
  }

  /** Instances below `id` count as already through stage 2 and the tally (context instances). */
  settledBelow(id: number): void {
    this.done = id;
  }

  /** Stage 2 (and the tally, which a replay ignores) of the instances up to `id` inclusive. */
  settleThrough(id: number): void {
    while (this.done <= id) this.settle(this.done);
  }

  /**
   * Stage 2 (see settle) of instance `id` now, for the gates a cancellation since its stage 1 (or
   * since it was preloaded with mask1 = dead and no recheck) may let go further. Returns the gates
   * walked and, among them, those that find a partner or reach the window diagonally (what settle
   * would flag), as two masks. Sets no flag: the block counter keeps the latest result per gate.
   */
  restage(id: number): [walked: number, positive: number] {
    const x = id & this.ringMask;
    let walked = 0;
    let positive = 0;
    restageWalks(this, x, (p) => {
      walked |= 1 << p;
      this.probing = true;
      this.probeHit = false;
      const found = findPartner(this, id, x, p) >= 0;
      this.probing = false;
      if (found || this.probeHit) positive |= 1 << p;
      return true;
    });
    return [walked, positive];
  }

  /** Cancelled gates of instance `id` (kept in the ring). */
  deadOf(id: number): number {
    return this.rDead[id & this.ringMask]!;
  }

  /** Gates cancelled right after instance `id`'s own stage 1. */
  mask1Of(id: number): number {
    return this.rMask1[id & this.ringMask]!;
  }

  /** Gates of instance `id` whose walk stage 2 repeats. */
  recheckOf(id: number): number {
    return this.rRecheck[id & this.ringMask]!;
  }

  /** The last instance on wire w (-1: none) and its slot there, as id * 4 + slot. */
  lastOn(w: number): number {
    const id = this.lastId[w]!;
    return id < 0 ? -1 : id * 4 + this.lastSlot[w]!;
  }

  /** The instance before `id` on the wire of its slot s, as id * 4 + slot (-1: none). */
  prevOn(id: number, s: number): number {
    const x = id & this.ringMask;
    const p = this.rPrev[x * 3 + s]!;
    return p < 0 ? -1 : p * 4 + this.rPrevSlot[x * 3 + s]!;
  }

  /** A cancellation reached an instance already counted (with settledBelow: a context instance). */
  get reachedSettled(): boolean {
    return this.lagShort;
  }

  /** Why the second cancel-inverses might act, or null. */
  get secondReason(): string | null {
    return this.flagSecond;
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
      // Kept when fewer than `depth` instances came after it on w (with one copy: when it is the
      // last on w, which its link says without reading w's record), or the next one on w is not
      // through stage 2 yet (whose walks start here).
      const keep = (d === 1 ? next === -1 : this.seq[w]! - this.rSeq[x * 3 + s]! < d) || next >= this.done;
      if (!keep) continue;
      // Newest first: shift the older copies of this wire down.
      const cp = this.cp;
      const b = w * this.cs;
      if (d > 1) cp.copyWithin(b + 8, b, b + 8 * (d - 1));
      cp[b] = old;
      cp[b + 1] = t;
      cp[b + 2] = this.rW[x * 3]!;
      cp[b + 3] = this.rW[x * 3 + 1]!;
      cp[b + 4] = this.rW[x * 3 + 2]!;
      cp[b + 5] = this.rDead[x]!;
      cp[b + 6] = this.rPrev[x * 3 + s]!;
      cp[b + 7] = this.rPrevSlot[x * 3 + s]!;
    }
  }

  /** Where instance `id` is kept, seen from wire w: ring index, -2 - the index of its copy in cp, or -1. */
  locate(id: number, w: number): number {
    if (id >= this.ringLow) return id & this.ringMask;
    const b = w * this.cs;
    for (let i = 0; i < this.depth; i++) if (this.cp[b + 8 * i] === id) return -2 - (b + 8 * i);
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
      const partner = findPartner(this, id, x, p);
      if (partner >= 0) {
        const hid = Math.floor(partner / 32);
        const hp = partner % 32;
        const hw = this.rW[x * 3 + G_OP[e * 3 + G_NQ[e]! - 1]!]!;
        const loc = this.locate(hid, hw);
        if (loc >= 0) this.rDead[loc] = this.rDead[loc]! | (1 << hp);
        else this.cp[3 - loc] = this.cp[3 - loc]! | (1 << hp);
        this.rDead[x] = this.rDead[x]! | (1 << p);
        // A deferred trail of a freed wire may be cancelled however old its instance is.
        if (hid < this.done && !(this.defer && this.defId[hw] === hid && ((this.defMask[hw]! >>> hp) & 1) === 1)) {
          this.lagShort = true;
          this.flagHard ??= "a cancellation reached a part already counted";
        }
        // Walks that passed over the partner before it went may go further now: stage 2
        // repeats them (see settle): of the instances after it on its wires, and of this
        // instance's gates walked before. The partner's own later gates see it in its mask.
        for (let i = 0; i < G_NQ[e]!; i++) markRecheck(this, x, G_OP[e * 3 + i]!, hid);
        this.rRecheck[x] = this.rRecheck[x]! | walked;
      } else walked |= 1 << p;
    }
  }

  noteSecond(reason: string): void {
    if (this.probing) {
      this.probeHit = true;
      return;
    }
    if (this.flagSecond === null) this.flagSecond = reason;
  }

  unavailable(): void {
    this.historyShort = true;
    if (this.flagHard === null) this.flagHard = "a cancel-inverses walk needed a part no longer kept";
  }

  // ---- final instances: second cancel-inverses (detection), merge-phases, tally ----------

  private settle(id: number): void {
    const x = id & this.ringMask;
    const t = this.rT[x]!;
    const dead = this.rDead[x]!;
    const slots = SLOTS[t]!;
    this.done = id + 1;
    if (this.optimize && this.second && this.flagSecond === null && (this.rRecheck[x] !== 0 || dead !== this.rMask1[x])) {
      // Stage 2 (the second cancel-inverses, detecting only). A walk from this instance is the
      // one of stage 1 unless a gate it passes went after that: then it is repeated.
      restageWalks(this, x, (p) => {
        if (findPartner(this, id, x, p) < 0) return true;
        this.noteSecond("the second cancel-inverses would cancel more");
        return false;
      });
    }
    const w0 = slots > 0 ? this.rW[x * 3]! : -1;
    const w1 = slots > 1 ? this.rW[x * 3 + 1]! : -1;
    const w2 = slots > 2 ? this.rW[x * 3 + 2]! : -1;
    let later = 0;
    if (this.defer) {
      // A wire taken again: the trail of its last use first. Then this instance's own trails on the wires it frees.
      if (w0 >= 0 && this.defId[w0]! >= 0) this.flushTrail(w0);
      if (w1 >= 0 && this.defId[w1]! >= 0) this.flushTrail(w1);
      if (w2 >= 0 && this.defId[w2]! >= 0) this.flushTrail(w2);
      const dies = this.rDies[x]!;
      for (let s = 0; s < slots; s++) {
        const trail = TRAIL_GATES[t * 3 + s]!;
        if (((dies >>> s) & 1) === 0 || trail === 0) continue;
        const w = this.rW[x * 3 + s]!;
        later |= trail;
        this.defId[w] = id;
        this.defMask[w] = trail;
      }
    }
    if (this.tally.add(t, dead | later, w0, w1, w2)) this.noteSecond("merge-phases removed a run of phase gates alone");
  }

  /** Tallies the deferred trail on wire w (see EngineOptions.deferTrails), with whatever of it was cancelled since. */
  private flushTrail(w: number): void {
    const id = this.defId[w]!;
    this.defId[w] = -1;
    const loc = this.locate(id, w);
    if (loc === -1) {
      // Kept by construction (evict keeps a wire's last instance until the next one is final).
      this.unavailable();
      return;
    }
    const t = loc >= 0 ? this.rT[loc]! : this.cp[-1 - loc]!;
    const dead = loc >= 0 ? this.rDead[loc]! : this.cp[3 - loc]!;
    const slots = SLOTS[t]!;
    const ws = (s: number): number => (s >= slots ? -1 : loc >= 0 ? this.rW[loc * 3 + s]! : this.cp[-loc + s]!);
    const all = gatesOf(t) === 32 ? -1 : (1 << gatesOf(t)) - 1;
    if (this.tally.add(t, dead | (all & ~this.defMask[w]!), ws(0), ws(1), ws(2))) this.noteSecond("merge-phases removed a run of phase gates alone");
  }
}
