/**
 * Counting a circuit made of repeated blocks (the lean oracle: one block per clause, each the same
 * template sequence up to which qubits it uses) with work per block instead of per template
 * instance, exactly as the counting engine (engine.ts) counts it instance by instance.
 *
 * The engine's result for a stream depends, for each block, only on the block and on what its
 * walks can see: the recent instances on the wires it touches (cancel-inverses looks back at most
 * WINDOW live gates per wire), the pending phase runs and the levels of those wires. So the
 * counting runs in two passes over the blocks, each a state machine with a memo:
 *
 * 1. Cancellation. The state holds, for every work wire, its instances back to the third gate
 *    before the open (last) block that stops every walk (an H, a measurement, a conditioned gate)
 *    or 17 live gates, whichever comes first, and the open block's instances on its search qubits.
 *    Older instances on a search qubit are reached, when a walk needs them, through the chain of
 *    blocks that used the qubit before ("projections", named in the key only when a replay asks:
 *    the key first says nothing of them, except the newest gate of a qubit the block starts with
 *    an X on, which that X's walk always reads; a projection's place among the state's instances,
 *    in circuit order, is in the key with it: a walk stops at its partner by instance number).
 *    Ages up to RECENT blocks are exact in the state; older instances are identified by the
 *    driver. The state is interned, so the key of a block is a few numbers. A key seen before gives the next state, the wires the block's work qubits get
 *    (work-qubit reuse), the cancelled gates of the block before it, the cancellations into older
 *    blocks (a wire left idle for many blocks is taken up again) and the stage-2 walks redone. A
 *    new key is replayed: a small engine is given the state's instances as context
 *    (engine.preload), the block is put into it, and every instance a cancellation may let walk
 *    further goes through stage 2 again (engine.restage); the latest walk of a gate is the one
 *    that counts, as the engine's single stage 2 at the end would see it.
 * 2. Tally (depth, T-depth, merge-phases, counts) of each block, in circuit order, over its final
 *    cancelled gates and the same per-instance maps as the engine (transfer.ts). Levels are kept
 *    relative to the highest level of the work wires the last block touched (interned with their
 *    pending phase runs); a search qubit's level is stored as a number, and a block's map says how
 *    high it may be without mattering (it enters the key exactly only when it does).
 *
 * Exactness: nothing is guessed. A replay sees everything the engine would see for that block,
 * or says what it misses and is done again with more. Where it cannot go on (a walk reaching the
 * end of a work wire's kept tail, a cancellation into a projected instance) or when blocks rarely
 * repeat (their replays cost more than the engine would: REPLAY_COST; STATE_SHARE), the block counting stops (`null`) and the
 * caller counts with the engine instead.
 */
import { CountingEngine, type EngineResult } from "./engine.js";
import { Interner, KeyTable } from "./keyTable.js";
import { FIRST_TOUCH, G_KIND, G_PHASE, G_ROLE, GATE_START, ROLE_OTHER, gatesOf, LAST_TOUCH, SLOT_GATES, SLOTS, T_ERASE_HEAD, T_ERASE_TAIL, T_MEASURE, T_X, TEMPLATE_COUNT } from "./templates.js";
import type { InstanceSink } from "./lowering.js";
import { finalRun, NONE, transferOf } from "./transfer.js";
import { K } from "../ir/kinds.js";

// ---- shapes ------------------------------------------------------------------------------

/**
 * A block's template sequence over local references: 0..k-1 its search (or target) qubits,
 * k..k+p-1 the persistent work qubits of the whole circuit (the lean counter), then the block's own
 * work qubits, one reference per span (a qubit given back and taken again is a new reference).
 */
export interface Shape {
  /** Template instances. */
  readonly n: number;
  readonly t: Uint8Array;
  /** Local references per slot (n * 3; -1 where the template has no such slot). */
  readonly ref: Int32Array;
  /** Slots whose qubit is never used again after the instance (frees its wire). */
  readonly dies: Uint8Array;
  /** Search/target qubit references. */
  readonly k: number;
  /** Persistent references. */
  readonly p: number;
  /** All references. */
  readonly refs: number;
  /** Per qubit reference q < k: its instances in order, as j * 4 + slot. */
  readonly onVar: Int32Array[];
  /** Some instance measures or is conditioned on a measurement. */
  readonly usesBit: boolean;
  /**
   * Per instance, the X instances before it. A state numbers an instance j - xBefore[j] (its
   * canonical number): the X gates a block needs first vary from block to block, the rest not.
   */
  readonly xBefore: Int32Array;
  /** Canonical number -> instance. */
  readonly fromCanon: Int32Array;
  /** The X instances, in order (an X instance's canonical number is -2 - its rank here). */
  readonly xAt: Int32Array;
  /** Qubit slots that get an X (a mask; slots above 30 are left out). */
  readonly xSlots: number;
}

/** Records the instances a lowering puts, as a shape. Ids below k + p are the qubit and persistent references. */
export class ShapeRecorder implements InstanceSink {
  private readonly t: number[] = [];
  private readonly ref: number[] = [];
  private readonly dies: number[] = [];
  private readonly current = new Map<number, number>();
  private next: number;

  constructor(private readonly k: number, private readonly p: number) {
    this.next = k + p;
  }

  put(t: number, a: number, b: number, c: number, dies: number): void {
    this.t.push(t);
    const ids = [a, b, c];
    for (let s = 0; s < 3; s++) {
      const v = ids[s]!;
      if (s >= SLOTS[t]! || v < 0) {
        this.ref.push(-1);
        continue;
      }
      if (v < this.k + this.p) {
        this.ref.push(v);
        continue;
      }
      let r = this.current.get(v);
      if (r === undefined) this.current.set(v, (r = this.next++));
      this.ref.push(r);
    }
    this.dies.push(dies);
    // A span ends with the instance whose slot dies: the id taken again is a new reference.
    for (let s = 0; s < SLOTS[t]!; s++) if ((dies >>> s) & 1 && ids[s]! >= this.k + this.p) this.current.delete(ids[s]!);
  }

  finish(): Shape {
    const n = this.t.length;
    const t = Uint8Array.from(this.t);
    const ref = Int32Array.from(this.ref);
    const onVar: number[][] = Array.from({ length: this.k }, () => []);
    let usesBit = false;
    for (let j = 0; j < n; j++) {
      const tt = t[j]!;
      if (tt === T_MEASURE || tt === T_ERASE_HEAD || tt === T_ERASE_TAIL) usesBit = true;
      for (let s = 0; s < SLOTS[tt]!; s++) {
        const r = ref[j * 3 + s]!;
        if (r >= 0 && r < this.k) onVar[r]!.push(j * 4 + s);
      }
    }
    const xBefore = new Int32Array(n);
    const fromCanon: number[] = [];
    const xAt: number[] = [];
    let xSlots = 0;
    for (let j = 0; j < n; j++) {
      xBefore[j] = xAt.length;
      if (t[j] === T_X) {
        xAt.push(j);
        if (ref[j * 3]! < Math.min(this.k, 31)) xSlots |= 1 << ref[j * 3]!;
      } else fromCanon.push(j);
    }
    return {
      n, t, ref, dies: Uint8Array.from(this.dies), k: this.k, p: this.p, refs: this.next, onVar: onVar.map((l) => Int32Array.from(l)), usesBit,
      xBefore, fromCanon: Int32Array.from(fromCanon), xAt: Int32Array.from(xAt), xSlots,
    };
  }
}

/**
 * The blocks of a circuit, in order, for the block counter. Qubit references of a block are
 * search or target qubits (their wire is the qubit); `occurrence` numbers each (block, slot) so
 * that the counter can chain a qubit's uses.
 */
export interface BlockSource {
  /** Blocks, the last included. */
  readonly blocks: number;
  /** Search and target qubits (their wires come first). */
  readonly base: number;
  /** Persistent work references (same in every shape). */
  readonly persistent: number;
  /** The shape of an id. */
  shape(id: number): Shape;
  /** Block b (called once per block, in order): its shape id; its qubits into `vars`. */
  next(b: number, vars: Int32Array): number;
  /** The qubits of an earlier block (random access) into `vars`. */
  varsOf(b: number, vars: Int32Array): void;
  /** Occurrence number of slot q of block b, in [0, occurrences): each (block, qubit slot) has its own. */
  occurrence(b: number, q: number): number;
  /** The block of an occurrence. */
  blockOf(occurrence: number): number;
  /** The qubit slot of an occurrence in its block. */
  slotOf(occurrence: number): number;
  /** Occurrence numbers. */
  readonly occurrences: number;
  /** Largest k over shapes (sizes buffers). */
  readonly maxK: number;
}

/** Options of the block counter: as the engine's. */
export interface BlockOptions {
  readonly optimize: boolean;
  readonly levels: boolean;
  readonly progress?: (fraction: number) => void;
  /**
   * Changes of role among a work wire's live gates a state keeps (default: no limit; see
   * KEEP_SWITCHES). A walk that reaches past them makes the counting stop with `stoppedOnTail`.
   */
  readonly keepSwitches?: number;
}

// ---- constants -----------------------------------------------------------------------------

/** Live gates kept per work wire before the open block: a walk sees at most WINDOW + 1 (clearBetween). */
const KEEP_LIVE = 17;
/**
 * Ages up to this are kept exactly in a state (a wire used in every block, the counter's top
 * bit, has instances some 17 blocks old); an older instance is "ancient", identified by the
 * driver (absolute), so that a wire left idle does not make a new state every block.
 */
const RECENT = 24;
/** Age of an ancient instance. */
const ANCIENT = -1;
/** Replays allowed before the counting checks whether the engine would be faster (see run). */
const REPLAYS_FREE = 4000;
/**
 * What a replay and a block cost the block counter, in template instances of the engine's
 * replay of the same stream (measured, lean Clifford+T unitary run: a replay some 100 us, a
 * block 1.2 us, the engine 0.5 us an instance: random 3-SAT of a million clauses, 2,600 replays
 * in 2 million blocks, 2.5 s; 4-SAT of 100,000 clauses, 17,311 replays, 2.0 s against the
 * engine's 6.0 s; 5-SAT of a million clauses, 199,000 replays, 20-24 s against some 70 s).
 */
const REPLAY_COST = 200;
const BLOCK_COST = 2.4;
/**
 * The counting checks at every power of two of the blocks done from CHECK_FROM blocks and
 * REPLAYS_FREE replays on (the replays at half of it recorded): the
 * replays so far, grown to the whole formula as a power law fitted to them (replays(b) over
 * replays(b / 2)), against the engine's instances for the whole formula. Replays level off where
 * blocks repeat (4-SAT: 12,555 replays in the 60,000 blocks of 30,000 clauses, 17,311 in 200,000,
 * 22,013 in 600,000), so that a long formula pays them back; where nearly every block replays
 * (random 6- and 7-SAT) the fit says so at the first check. The old rule, 5% of the blocks done,
 * gave up on every random 4-SAT formula: a million clauses, `cost` 170 s against 21.7 s.
 */
const CHECK_FROM = 4096;
/**
 * The fit overestimates where replays level off late (random 5-SAT of a million clauses: 853,000
 * fitted at 32,768 blocks, 199,000 in the end): the counting gives up only when the fitted cost
 * exceeds the engine's by this factor (6- and 7-SAT: by 3 and more).
 */
const FIT_MARGIN = 1.5;
/**
 * Replays never exceed this share of the blocks (the memo's memory: some 1.3 KB a replay); a fit
 * beyond FIT_MARGIN times it gives up at once rather than run into it (a review measured random
 * 5-SAT of 100,000 clauses running to a cap of a quarter, 114,000 blocks, 3-4 s a run for nothing).
 */
const REPLAY_CAP = 0.4;
/**
 * Or when new states keep coming (more than this share of the blocks): clauses of mixed widths
 * leave each work wire with the tail of whichever clause used it last, so that nearly every
 * block makes a new state (widths 3 and 4 mixed: 59,658 states in 60,000 blocks, 230 MB), while
 * uniform random k-SAT has a few hundred states in all.
 */
const STATE_SHARE = 0.05;
/** Or when the states take more than this many numbers (4 bytes each), whatever their count. */
const STATE_INTS = 16 << 20;
/** Numbers per qubit in BlockCounter.qc. */
const QC = 8;
/** Instance numbers per block in an absolute identity b * SPAN + j. */
const SPAN = 1 << 22;
/** Depths of a qubit's chain a key may hold, in instances. */
const DEPTHS = [0, 1, 2, 4, 8, 16, 32, 64, 1 << 30];
const NEG = -1e15;

/** Gates of each template on each slot, as a mask: SLOT_MASK[t * 3 + s]. */
const SLOT_MASK = new Int32Array(TEMPLATE_COUNT * 3);
/** Those that stop every walk along that slot's wire (role "other": H, measure, conditioned gates). */
const SLOT_STOP = new Int32Array(TEMPLATE_COUNT * 3);
for (let t = 0; t < TEMPLATE_COUNT; t++) {
  for (let s = 0; s < 3; s++) {
    for (const g of SLOT_GATES[t * 3 + s]!) {
      SLOT_MASK[t * 3 + s]! |= 1 << g;
      if (G_ROLE[(GATE_START[t]! + g) * 3 + s] === ROLE_OTHER) SLOT_STOP[t * 3 + s]! |= 1 << g;
    }
  }
}
/**
 * A work wire's tail stops at the third live gate before the open block that stops every walk
 * (a walk along the wire sees nothing beyond the first; two more allow for cancellations of the
 * first ones), if that comes before KEEP_LIVE live gates. A walk that would need more makes the
 * block counting stop (it is noticed: the wire is marked truncated).
 */
const KEEP_STOPS = 3;
/**
 * With BlockOptions.keepSwitches, nor further back than that many changes of role among the live
 * gates (a walk passes only gates of its own role: see commuteOn). In the toffoli basis with
 * unitary uncomputation no gate stops every walk, and 17 live gates of a counter wire reached
 * back over many blocks: a million random clauses made 803 states (125 with 3 changes) and took
 * 5.3-6.3 s instead of 3.3-3.7 s (a loaded machine). Where cancellations cascade from the mark
 * outwards (small formulas), a walk needs more: the caller counts again without the limit (see
 * stoppedOnTail).
 */
export const KEEP_SWITCHES = 3;

/** The slots touched by the gates in `mask` of template t, as a mask. */
function gatesOnSlots(t: number, mask: number): number {
  let slots = 0;
  for (let s = 0; s < 3; s++) if (SLOT_MASK[t * 3 + s]! & mask) slots |= 1 << s;
  return slots;
}

function popcount(x: number): number {
  x = x - ((x >>> 1) & 0x55555555);
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  return (Math.imul((x + (x >>> 4)) & 0x0f0f0f0f, 0x01010101) >>> 24);
}

// ---- the cancellation state ----------------------------------------------------------------

/** A cancellation state, decoded. */
interface CState {
  /** Work wires so far. */
  readonly W: number;
  /** Free work wires, bottom to top. */
  readonly free: Int32Array;
  /** Persistent reference -> work wire (-1: none yet, or freed). */
  readonly per: Int32Array;
  /** Instances, in circuit order: ancient ones first, then the block before the open one, then the open block. */
  readonly n: number;
  readonly age: Int32Array;
  /** Canonical number in its block (see Shape.xBefore; an X instance -2 - its rank among them); -1 for ancient instances. */
  readonly j: Int32Array;
  readonly t: Uint8Array;
  /** Per slot: work wire w >= 0, qubit group g as -2 - g, -1 none. */
  readonly ref: Int32Array;
  /** Per instance, the slots on whose wire tail it is. */
  readonly link: Uint8Array;
  readonly dead: Int32Array;
  readonly mask1: Int32Array;
  readonly recheck: Int32Array;
  /** Qubit groups (distinct search/target qubits referred to). */
  readonly G: number;
  /** Per group: its slot in the open block, or -1. */
  readonly hotSlot: Int32Array;
  /** Per work wire: instances before its tail exist. */
  readonly trunc: Uint8Array;
  /** Ancient instances (the first ones). */
  readonly ancient: number;
  /** First instance of the open block. */
  readonly openStart: number;
  /** Instance index of (age, j) for ages 0 to RECENT (built on demand). */
  recent?: Map<number, number>;
  /** Per work wire, the oldest age on its tail (a large number for ancient; built on demand). */
  oldest?: Int32Array;
}

function encodeState(s: CState): Int32Array {
  const out: number[] = [s.W, s.free.length, ...s.free, s.per.length, ...s.per, s.n, s.G, ...s.hotSlot, ...s.trunc];
  for (let x = 0; x < s.n; x++) {
    out.push(s.age[x]!, s.j[x]!, s.t[x]!, s.ref[x * 3]!, s.ref[x * 3 + 1]!, s.ref[x * 3 + 2]!, s.link[x]!, s.dead[x]!, s.mask1[x]!, s.recheck[x]!);
  }
  return Int32Array.from(out);
}

function decodeState(a: Int32Array): CState {
  let p = 0;
  const W = a[p++]!;
  const nf = a[p++]!;
  const free = a.slice(p, p + nf);
  p += nf;
  const np = a[p++]!;
  const per = a.slice(p, p + np);
  p += np;
  const n = a[p++]!;
  const G = a[p++]!;
  const hotSlot = a.slice(p, p + G);
  p += G;
  const trunc = Uint8Array.from(a.subarray(p, p + W));
  p += W;
  const age = new Int32Array(n);
  const j = new Int32Array(n);
  const t = new Uint8Array(n);
  const ref = new Int32Array(n * 3);
  const link = new Uint8Array(n);
  const dead = new Int32Array(n);
  const mask1 = new Int32Array(n);
  const recheck = new Int32Array(n);
  let ancient = 0;
  let openStart = n;
  for (let x = 0; x < n; x++) {
    age[x] = a[p++]!;
    j[x] = a[p++]!;
    t[x] = a[p++]!;
    ref[x * 3] = a[p++]!;
    ref[x * 3 + 1] = a[p++]!;
    ref[x * 3 + 2] = a[p++]!;
    link[x] = a[p++]!;
    dead[x] = a[p++]!;
    mask1[x] = a[p++]!;
    recheck[x] = a[p++]!;
    if (age[x] === ANCIENT) ancient++;
    if (age[x] === 0 && openStart === n) openStart = x;
  }
  return { W, free, per, n, age, j, t, ref, link, dead, mask1, recheck, G, hotSlot, trunc, ancient, openStart };
}

/** What one block does to the cancellation state (a memo entry). */
interface CValue {
  readonly next: number;
  /** Work wire of each reference of the block (-1 for qubit references), interned. */
  readonly phys: number;
  /** Final cancelled gates of the open block's instances, interned (-1: no open block). */
  readonly deadClass: number;
  /** The second cancel-inverses might act. */
  readonly second: boolean;
  /** Per ancient instance of the next state: ancient index in this one (>= 0), or -1 - index of an instance of the block before the open one. */
  readonly ancientSrc: Int32Array;
  /** Per group of the next state: group of this one (>= 0), or -1 - slot of the block. */
  readonly groupSrc: Int32Array;
  /**
   * Cancellations into older instances, (where, index, cancelled gates) each: where 0 an instance
   * of the state (not of the open block: those are in deadClass), 1 a projection of the key.
   */
  readonly kills: Int32Array;
  /** Stage-2 walks done, (where, index, gates walked, gates finding a partner) each; where 0, 1 as in kills. */
  readonly stage2: Int32Array;
}

const NO_PROJECTIONS: Projected[] = [];

/** Ref codes of a projected instance in a key. */
const R_NONE = -1;
const R_OUT = -2;
const rGroup = (g: number): number => -3 - g;

/** A chain position of a key: a qubit of the block or of the open block whose older instances may be needed. */
interface ChainPos {
  /** Group of the state (-1: a qubit new to the state). */
  group: number;
  /** Slot of the block (-1: a qubit of the open block only). */
  slot: number;
  /** The qubit. */
  qubit: number;
  /** Latest occurrence to project from. */
  start: number;
  depth: number;
}

export class BlockCounter {
  private readonly src: BlockSource;
  private readonly opts: BlockOptions;
  private readonly base: number;
  // Cancellation state.
  private readonly states = new Interner();
  private readonly decoded: CState[] = [];
  private readonly memo = new KeyTable();
  private readonly values: CValue[] = [];
  private readonly refines: Int32Array[] = [];
  private readonly physes = new Interner();
  private readonly deadClasses = new Interner();
  private state = 0;
  private ancientAbs = new Float64Array(0);
  private groupQubit = new Int32Array(0);
  // Per block: shape, wires, cancelled gates (for projections and the tally).
  private readonly blockShape: Int32Array;
  private readonly blockPhys: Int32Array;
  private readonly blockDead: Int32Array;
  private readonly prevOcc: Int32Array;
  /** Per qubit (QC numbers each, one cache line): its latest occurrence, then its tag cache (see tagOf). */
  private readonly qc: Int32Array;
  private second = false;
  /** Gates whose latest stage-2 walk found a partner: (block * SPAN + j) * 32 + gate -> block * SPAN + j. */
  private readonly positive = new Map<number, number>();
  /** The projections of the last key built with some (their blocks, for a value's updates). */
  private lastProj: Projected[] = [];
  /** Replays done (memo misses), for the tests and the bench. */
  replays = 0;
  /** The next check of what the replays cost (see CHECK_FROM), and the replays at the last one. */
  private nextCheck = CHECK_FROM / 2;
  private replaysAtHalf = 0;
  /** Milliseconds: when run started, pass 1 (cancellations, replays included), pass 2 (tally), replays. */
  readonly timing = { start: 0, pass1: 0, pass2: 0, replay: 0 };
  private instances = 0;
  // Tally.
  private readonly tally: Tally;
  private keyBuf = new Int32Array(256);
  private rowBuf = new Int32Array(0);
  private encBuf = new Int32Array(0);
  /** The engine replays run on (reset for each). */
  private engine: CountingEngine | null = null;

  constructor(src: BlockSource, opts: BlockOptions) {
    this.src = src;
    this.opts = opts;
    this.keepSwitches = opts.keepSwitches ?? Infinity;
    this.base = src.base;
    this.blockShape = new Int32Array(src.blocks);
    this.blockPhys = new Int32Array(src.blocks);
    this.blockDead = new Int32Array(src.blocks).fill(-1);
    this.prevOcc = new Int32Array(src.occurrences).fill(-1);
    this.qc = new Int32Array(src.base * QC).fill(-2);
    for (let q = 0; q < src.base; q++) this.qc[q * QC] = -1;
    const empty: CState = {
      W: 0, free: new Int32Array(0), per: new Int32Array(src.persistent).fill(-1), n: 0, age: new Int32Array(0), j: new Int32Array(0),
      t: new Uint8Array(0), ref: new Int32Array(0), link: new Uint8Array(0), dead: new Int32Array(0), mask1: new Int32Array(0),
      recheck: new Int32Array(0), G: 0, hotSlot: new Int32Array(0), trunc: new Uint8Array(0), ancient: 0, openStart: 0,
    };
    this.state = this.intern(empty);
    this.tally = opts.levels ? new LevelTally(src, opts.optimize) : new CountTally(src);
  }

  private intern(s: CState): number {
    const id = this.states.id(encodeState(s));
    if (this.decoded.length === id) this.decoded.push(decodeState(this.states.get(id)));
    return id;
  }

  /** Counts the whole circuit; null when the block counting cannot go on (count with the engine). */
  run(): EngineResult | null {
    this.timing.start = performance.now();
    const src = this.src;
    let vars = new Int32Array(Math.max(1, src.maxK));
    let prevVars = new Int32Array(Math.max(1, src.maxK));
    const step = Math.max(1, Math.floor(src.blocks / 100));
    const progress = this.opts.progress;
    // Pass 1: cancellations, block by block; a block's cancelled gates may still change later
    // (a wire left idle is taken up again many blocks on).
    for (let b = 0; b < src.blocks; b++) {
      if (progress && b % step === 0) progress((0.8 * b) / src.blocks);
      const sh = src.next(b, vars);
      const v = this.transition(b, sh, vars);
      if (v === null) return null;
      // A formula whose blocks rarely repeat: the engine is faster, and holds less.
      if (b + 1 === this.nextCheck) {
        this.nextCheck *= 2;
        const half = this.replaysAtHalf;
        this.replaysAtHalf = this.replays;
        // The first checks decide nothing on a long formula: its first blocks replay the most
        // (random 5-SAT of a million clauses fits 1.2 million replays at 8,192 blocks, against
        // 199,000 in the end); from a 64th of the blocks on, a wrong guess costs a few percent.
        if (this.replays > REPLAYS_FREE && b + 1 >= CHECK_FROM && b + 1 >= src.blocks / 64) {
          // replays(B) = replays(b) (B / b)^alpha, alpha fitted over the last doubling (at most 1).
          const alpha = Math.min(1, Math.log2(this.replays / Math.max(1, half)));
          const projected = this.replays * Math.pow(src.blocks / (b + 1), alpha);
          const blocksCost = projected * REPLAY_COST + src.blocks * BLOCK_COST;
          const engineCost = (this.instances / b) * src.blocks;
          if (blocksCost > FIT_MARGIN * engineCost || projected > FIT_MARGIN * REPLAY_CAP * src.blocks) return this.giveUp(b, `${this.replays} replays in ${b + 1} blocks, some ${Math.round(projected)} in all ${src.blocks}`);
        }
      }
      if (this.replays > REPLAYS_FREE) {
        if (this.replays > REPLAY_CAP * src.blocks) return this.giveUp(b, `${this.replays} replays in ${b + 1} blocks of ${src.blocks}`);
        if (this.states.size > REPLAYS_FREE + STATE_SHARE * b) return this.giveUp(b, `${this.states.size} states in ${b + 1} blocks`);
      }
      if (this.states.ints > STATE_INTS) return this.giveUp(b, `states of ${this.states.ints} numbers in ${b + 1} blocks`);
      this.blockShape[b] = sh;
      this.blockPhys[b] = v.phys;
      if (b > 0) {
        this.blockDead[b - 1] = v.deadClass;
        this.noteTags(b - 1, prevVars);
      }
      const shape = src.shape(sh);
      this.instances += shape.n;
      for (let q = 0; q < shape.k; q++) {
        const o = src.occurrence(b, q);
        this.prevOcc[o] = this.qc[vars[q]! * QC]!;
        this.qc[vars[q]! * QC] = o;
      }
      const swap = prevVars;
      prevVars = vars;
      vars = swap;
    }
    // The last block: its stage 2 and cancelled gates (an empty block after it).
    if (src.blocks > 0) {
      const v = this.transition(src.blocks, -1, vars);
      if (v === null) return null;
      this.blockDead[src.blocks - 1] = v.deadClass;
    }
    // Pass 2: the tally, in circuit order, over the final cancelled gates.
    this.timing.pass1 = performance.now() - this.timing.start;
    for (let b = 0; b < src.blocks; b++) {
      if (progress && b % step === 0) progress(0.8 + (0.2 * b) / src.blocks);
      this.tallyBlock(b);
    }
    // The second cancel-inverses: a gate still alive whose latest stage-2 walk found a partner.
    let positive = false;
    for (const [g, blockJ] of this.positive) {
      const b = Math.floor(blockJ / SPAN);
      const j = blockJ % SPAN;
      const dead = this.blockDead[b]! >= 0 ? this.deadClasses.get(this.blockDead[b]!)[j]! : 0;
      if (((dead >>> (g % 32)) & 1) === 0) positive = true;
    }
    const r = this.tally.finish(this.decoded[this.state]!.W);
    this.timing.pass2 = performance.now() - this.timing.start - this.timing.pass1;
    const secondBound = this.second || positive || r.vanished;
    const exact = !(this.opts.optimize && r.phaseGates >= 2 && secondBound);
    return {
      qubits: this.base + this.decoded[this.state]!.W,
      tCount: r.tCount,
      tDepth: r.tDepth,
      cnotCount: r.cnotCount,
      toffoliCount: r.toffoliCount,
      depth: r.depth,
      measurements: r.measurements,
      instances: this.instances,
      exact,
      upperBound: !exact,
      reason: exact ? null : "the second cancel-inverses might cancel more",
      historyShort: false,
      lagShort: false,
      secondNeeded: false,
    };
  }

  private tallyBlock(b: number): void {
    const vars = this.tallyVars;
    this.src.varsOf(b, vars);
    this.tally.block(this.blockShape[b]!, this.blockDead[b]!, this.blockPhys[b]!, this.physes.get(this.blockPhys[b]!), vars, this.deadClasses);
  }
  private readonly tallyVars = new Int32Array(256);

  // ---- one block of the cancellation state machine ---------------------------------------

  /** Instance number of canonical number jc in block ob. */
  private trueJ(ob: number, jc: number): number {
    const shape = this.src.shape(this.blockShape[ob]!);
    return jc >= 0 ? shape.fromCanon[jc]! : shape.xAt[-2 - jc]!;
  }

  /** Block b (shape sh; -1: the empty block after the last) over the current state. */
  private transition(b: number, sh: number, vars: Int32Array): CValue | null {
    const S = this.decoded[this.state]!;
    const shape = sh >= 0 ? this.src.shape(sh) : null;
    const k = shape?.k ?? 0;
    const slotGroup = this.slotGroup.length >= k ? this.slotGroup : (this.slotGroup = new Int32Array(k * 2));
    for (let q = 0; q < k; q++) {
      slotGroup[q] = -1;
      for (let g = 0; g < S.G; g++) if (this.groupQubit[g] === vars[q]) slotGroup[q] = g;
    }
    // The key without chains: the state, the block, which of its qubits the state knows.
    let n = 0;
    const key = this.keyBuf;
    key[n++] = this.state;
    key[n++] = sh;
    for (let q = 0; q < k; q++) key[n++] = slotGroup[q]!;
    // A qubit the block puts an X on first: that X's walk reads the qubit's newest gate before
    // this block. When that gate is simple to name (see tagOf), the key names it right away.
    const xs = shape === null ? 0 : shape.xSlots;
    let fast = 0;
    if (xs !== 0) {
      const n0 = n;
      key[n++] = -3;
      for (let q = 0; q < k && q < 31; q++) {
        if (((xs >>> q) & 1) === 0) continue;
        const tag = slotGroup[q]! >= 0 ? -1 : this.tagOf(b, S, vars[q]!);
        if (tag < 0) {
          fast = 0;
          n = n0;
          break;
        }
        fast |= 1 << q;
        key[n++] = tag;
        // Where the named gate's instance stands among the state's (see projections).
        key[n++] = this.posOf(b, S, this.qc[vars[q]! * QC + 4]!, this.qc[vars[q]! * QC + 5]!);
        // The other qubits the named gate touches (a Toffoli's second control, a conditioned
        // CZ's partner): which of the state's or the block's qubits they are, if any.
        const at = vars[q]! * QC;
        for (let o = 6; o < 8; o++) {
          const other = this.qc[at + o]!;
          if (other < 0) continue;
          let code = -2;
          for (let g = 0; g < S.G; g++) if (this.groupQubit[g] === other) code = -3 - g;
          if (code === -2) for (let q2 = 0; q2 < k; q2++) if (vars[q2] === other) code = -100 - q2;
          key[n++] = code;
        }
      }
      if (fast !== 0 && !this.distinctTops(vars, fast, k)) {
        fast = 0;
        n = n0;
      }
    }
    let e = this.memo.get(key, n);
    let pos: ChainPos[] | null = null;
    this.lastProj = NO_PROJECTIONS;
    for (let round = 0; ; round++) {
      if (e === -1) {
        if (pos === null) {
          pos = this.chains(b, S, k, slotGroup, vars);
          if (fast !== 0) for (const p of pos) if (p.slot >= 0 && p.slot < 31 && ((fast >>> p.slot) & 1) === 1) p.depth = 1;
          if (fast !== 0) this.lastProj = this.projections(b, S, pos).entries;
        }
        this.replays++;
        const t0 = performance.now();
        const proj = this.projections(b, S, pos);
        const r = this.replay(b, S, shape, k, slotGroup, pos, proj);
        this.timing.replay += performance.now() - t0;
        if (r === null) return null;
        if (r instanceof Int32Array) {
          e = -2 - this.refines.length;
          this.refines.push(r);
        } else {
          e = this.values.length;
          this.values.push(r);
        }
        this.memo.set(this.keyBuf, n, e);
      }
      if (e >= 0) {
        const v = this.values[e]!;
        this.apply(b, S, v, vars);
        return v;
      }
      // Deeper into the chains named, then again.
      if (pos === null) {
        pos = this.chains(b, S, k, slotGroup, vars);
        if (fast !== 0) for (const p of pos) if (p.slot >= 0 && p.slot < 31 && ((fast >>> p.slot) & 1) === 1) p.depth = 1;
      }
      const ask = this.refines[-2 - e]!;
      let grew = false;
      for (const p of ask) {
        const c = pos[p]!;
        const d = DEPTHS.indexOf(c.depth);
        if (d + 1 < DEPTHS.length) {
          c.depth = DEPTHS[d + 1]!;
          grew = true;
        }
      }
      if (!grew || round > 64) return this.giveUp(b, "a walk needs more than the chains hold");
      n = this.chainKey(b, S, k, pos);
      e = this.memo.get(this.keyBuf, n);
    }
  }
  private slotGroup = new Int32Array(64);

  /**
   * A number naming the newest live gate on a qubit before block b, as a key's projection of
   * depth 1 would (its template, slot, gate, the work wires of the slots it touches, whether
   * more gates lie before it), or -1 when that is not simple: the gate is in an instance the state
   * may hold (its block less than two blocks back, or a work wire's tail reaching that far back),
   * touches another qubit, or the qubit's newest instance has no live gate on it. 0: no gate before.
   * Cached per qubit until its next use or a later cancellation into an earlier block.
   */
  private tagOf(b: number, S: CState, qubit: number): number {
    const occ = this.qc[qubit * QC]!;
    if (occ < 0) return 0;
    let top: number;
    let ob: number;
    const c = this.qc;
    const at = qubit * QC;
    if (c[at + 1] === occ && c[at + 2] === this.killCount) {
      top = c[at + 3]!;
      ob = c[at + 4]!;
    } else {
      ob = this.src.blockOf(occ);
      top = this.computeTag(occ);
      c[at + 1] = occ;
      c[at + 2] = this.killCount;
      c[at + 3] = top;
      c[at + 4] = ob;
      c[at + 5] = this.lastTopJ;
      c[at + 6] = c[at + 7] = -1;
      if (top >= 0 && (this.tagOthers[top * 2]! >= 0 || this.tagOthers[top * 2 + 1]! >= 0)) {
        this.src.varsOf(ob, this.projVars);
        if (this.tagOthers[top * 2]! >= 0) c[at + 6] = this.projVars[this.tagOthers[top * 2]!]!;
        if (this.tagOthers[top * 2 + 1]! >= 0) c[at + 7] = this.projVars[this.tagOthers[top * 2 + 1]!]!;
      }
    }
    if (top < 0) return -1;
    const age = b - 1 - ob;
    if (age < 2) return -1;
    // Not in the state: its work wires' tails do not reach back to it.
    const t = this.tagWires[top * 2]!;
    const w2 = this.tagWires[top * 2 + 1]!;
    const oldest = (S.oldest ??= oldestAges(S));
    if (t >= 0 && (t >= S.W || oldest[t]! >= age)) return -1;
    if (w2 >= 0 && (w2 >= S.W || oldest[w2]! >= age)) return -1;
    return top + 1;
  }
  private tagWires: number[] = [];
  /** The instance of the gate tagIn last named, and the qubit slots of its block it touches besides (-1: none). */
  private lastTopJ = -1;
  private readonly lastOthers = new Int32Array(2);
  /** Per tag: the other qubit slots its gate touches (two each, -1: none). */
  private readonly tagOthers: number[] = [];

  /** The tags of block b's qubits, now that its cancelled gates are known (they are computed per kind of block, once). */
  private noteTags(b: number, vars: Int32Array): void {
    const sh = this.blockShape[b]!;
    const shape = this.src.shape(sh);
    this.shapeTagKey[0] = sh;
    this.shapeTagKey[1] = this.blockDead[b]!;
    this.shapeTagKey[2] = this.blockPhys[b]!;
    let e = this.shapeTagIds.get(this.shapeTagKey, 3);
    if (e < 0) {
      e = this.shapeTags.length;
      this.shapeTags.push(Int32Array.from({ length: shape.k }, (_, q) => this.tagIn(shape, this.deadClasses.get(this.blockDead[b]!), this.physes.get(this.blockPhys[b]!), q, false)));
      this.shapeTagIds.set(this.shapeTagKey, 3, e);
    }
    const tags = this.shapeTags[e]!;
    const c = this.qc;
    for (let q = 0; q < shape.k; q++) {
      const occ = this.src.occurrence(b, q);
      let tag = tags[q]!;
      // Gates before this block on the qubit: the tag says so (when the block's own do not).
      if (tag >= 0 && this.prevOcc[occ]! >= 0 && this.tagMore[tag] === 0) tag = this.tagIn(shape, this.deadClasses.get(this.blockDead[b]!), this.physes.get(this.blockPhys[b]!), q, true);
      const at = vars[q]! * QC;
      c[at + 1] = occ;
      c[at + 2] = this.killCount;
      c[at + 3] = tag;
      c[at + 4] = b;
      const list = shape.onVar[q]!;
      c[at + 5] = list.length > 0 ? list[list.length - 1]! >> 2 : -1;
      c[at + 6] = tag >= 0 && this.tagOthers[tag * 2]! >= 0 ? vars[this.tagOthers[tag * 2]!]! : -1;
      c[at + 7] = tag >= 0 && this.tagOthers[tag * 2 + 1]! >= 0 ? vars[this.tagOthers[tag * 2 + 1]!]! : -1;
    }
  }
  private readonly shapeTagIds = new KeyTable();
  private readonly shapeTags: Int32Array[] = [];
  private readonly shapeTagKey = new Int32Array(3);
  private readonly tagMore: number[] = [];
  private readonly tagIds = new KeyTable();
  private readonly tagKey = new Int32Array(8);
  /** Cancellations into blocks before the open one so far (a cached tag may then be stale). */
  private killCount = 0;

  /** The tag (see tagOf) of the newest live gate of an occurrence's qubit, or -1. */
  private computeTag(occ: number): number {
    const ob = this.src.blockOf(occ);
    const shape = this.src.shape(this.blockShape[ob]!);
    return this.tagIn(shape, this.deadClasses.get(this.blockDead[ob]!), this.physes.get(this.blockPhys[ob]!), this.src.slotOf(occ), this.prevOcc[occ]! >= 0);
  }

  /** The tag of qubit slot q0's newest live gate in a block (shape, cancelled gates, wires); `before`: gates exist before the block. */
  private tagIn(shape: Shape, dc: Int32Array, phys: Int32Array, q0: number, before: boolean): number {
    const list = shape.onVar[q0]!;
    if (list.length === 0) return -1;
    const js = list[list.length - 1]!;
    const j = js >> 2;
    this.lastTopJ = j;
    this.lastOthers[0] = this.lastOthers[1] = -1;
    const s = js & 3;
    const t = shape.t[j]!;
    const gates = SLOT_GATES[t * 3 + s]!;
    let g = gates.length - 1;
    while (g >= 0 && ((dc[j]! >>> gates[g]!) & 1)) g--;
    if (g < 0) return -1;
    const mask = 1 << gates[g]!;
    let more = list.length > 1 || before ? 1 : 0;
    for (let g2 = g - 1; g2 >= 0; g2--) if (((dc[j]! >>> gates[g2]!) & 1) === 0) more = 1;
    const touched = gatesOnSlots(t, mask);
    const key = this.tagKey;
    key[0] = t;
    key[1] = s;
    key[2] = mask;
    key[3] = key[4] = key[5] = R_NONE;
    key[6] = more;
    let w0 = -1;
    let w1 = -1;
    for (let s2 = 0; s2 < SLOTS[t]!; s2++) {
      if ((touched & (1 << s2)) === 0) continue;
      const lr = shape.ref[j * 3 + s2]!;
      if (lr < 0) continue;
      if (lr < shape.k) {
        if (lr === q0) key[3 + s2] = -5;
        else {
          // Another qubit of that block: named by slot here; by who it is in the key (see transition).
          key[3 + s2] = -10 - lr;
          if (this.lastOthers[0] === -1) this.lastOthers[0] = lr;
          else this.lastOthers[1] = lr;
        }
      } else {
        key[3 + s2] = phys[lr]!;
        if (w0 === -1) w0 = phys[lr]!;
        else w1 = phys[lr]!;
      }
    }
    let id = this.tagIds.get(key, 7);
    if (id < 0) {
      id = this.tagIds.size;
      this.tagIds.set(key, 7, id);
      this.tagWires.push(w0, w1);
      this.tagMore.push(more);
      this.tagOthers.push(this.lastOthers[0]!, this.lastOthers[1]!);
    }
    return id;
  }

  /** Whether the newest instances of the fast qubits are distinct (a shared one would be one projection). */
  private distinctTops(vars: Int32Array, fast: number, k: number): boolean {
    let count = 0;
    for (let q = 0; q < k && q < 31; q++) {
      if (((fast >>> q) & 1) === 0) continue;
      const at = vars[q]! * QC;
      if (this.qc[at]! < 0) continue;
      // tagOf just filled the cache for this qubit.
      const id = this.qc[at + 4]! * SPAN + this.qc[at + 5]!;
      for (let i = 0; i < count; i++) if (this.topSeen[i] === id) return false;
      this.topSeen[count++] = id;
    }
    return true;
  }
  private readonly topSeen = new Float64Array(64);

  /** The chain positions of block b: the open block's qubits (hot groups), then the block's other qubits. */
  private chains(b: number, S: CState, k: number, slotGroup: Int32Array, vars: Int32Array): ChainPos[] {
    const pos = this.posList;
    pos.length = 0;
    const at = (group: number, slot: number, qubit: number, start: number): void => {
      let p = this.posPool[pos.length];
      if (p === undefined) this.posPool.push((p = { group, slot, qubit, start, depth: 0 }));
      else {
        p.group = group;
        p.slot = slot;
        p.qubit = qubit;
        p.start = start;
        p.depth = 0;
      }
      pos.push(p);
    };
    for (let g = 0; g < S.G; g++) {
      if (S.hotSlot[g]! < 0) continue;
      let slot = -1;
      for (let q = 0; q < k; q++) if (slotGroup[q] === g) slot = q;
      const o = this.src.occurrence(b - 1, S.hotSlot[g]!);
      at(g, slot, this.groupQubit[g]!, this.prevOcc[o]!);
    }
    for (let q = 0; q < k; q++) {
      const g = slotGroup[q]!;
      if (g >= 0 && S.hotSlot[g]! >= 0) continue;
      at(g, q, vars[q]!, this.qc[vars[q]! * QC]!);
    }
    return pos;
  }
  private readonly posList: ChainPos[] = [];
  private readonly projVars = new Int32Array(256);
  private readonly projPool: Projected[] = [];
  private projUsed = 0;

  private projEntry(kind: number, a: number, s: number, chain: number, t: number, r0: number, r1: number, r2: number, mask: number, block: number, j: number): Projected {
    let e = this.projPool[this.projUsed];
    if (e === undefined) this.projPool.push((e = { kind, a, s, chain, t, r0, r1, r2, mask, pos: 0, ord: 0, block, j }));
    else {
      e.kind = kind;
      e.a = a;
      e.s = s;
      e.chain = chain;
      e.t = t;
      e.r0 = r0;
      e.r1 = r1;
      e.r2 = r2;
      e.mask = mask;
      e.pos = 0;
      e.ord = 0;
      e.block = block;
      e.j = j;
    }
    this.projUsed++;
    return e;
  }
  private readonly posPool: ChainPos[] = [];

  private apply(b: number, S: CState, v: CValue, vars: Int32Array): void {
    const N = this.decoded[v.next]!;
    const before = this.ancientAbs;
    if (N.ancient > 0 || S.ancient > 0) {
      const abs = this.spareAbs.length >= N.ancient ? this.spareAbs : new Float64Array(N.ancient * 2);
      for (let x = 0; x < N.ancient; x++) {
        const s = v.ancientSrc[x]!;
        if (s >= 0) abs[x] = before[s]!;
        else {
          const y = -1 - s;
          const ob = b - 1 - S.age[y]!;
          abs[x] = ob * SPAN + this.trueJ(ob, S.j[y]!);
        }
      }
      this.spareAbs = before;
      this.ancientAbs = abs;
    }
    const gq = this.spareGroups.length >= N.G ? this.spareGroups : new Int32Array(N.G * 2);
    for (let g = 0; g < N.G; g++) {
      const s = v.groupSrc[g]!;
      gq[g] = s >= 0 ? this.groupQubit[s]! : vars[-1 - s]!;
    }
    this.spareGroups = this.groupQubit;
    this.groupQubit = gq;
    if (v.kills.length > 0 || v.stage2.length > 0) {
      if (v.kills.length > 0) this.killCount++;
      for (let i = 0; i < v.kills.length; i += 3) {
        const a = this.absOf(b, S, before, v.kills[i]!, v.kills[i + 1]!);
        const ob = Math.floor(a / SPAN);
        const d = Int32Array.from(this.deadClasses.get(this.blockDead[ob]!));
        d[a % SPAN] = v.kills[i + 2]!;
        this.blockDead[ob] = this.deadClasses.id(d);
      }
      for (let i = 0; i < v.stage2.length; i += 4) {
        const hit = v.stage2[i + 3]!;
        // Nothing to record: no partner now, none found before.
        if (hit === 0 && this.positive.size === 0) continue;
        const a = this.absOf(b, S, before, v.stage2[i]!, v.stage2[i + 1]!);
        const walked = v.stage2[i + 2]!;
        for (let m = walked; m !== 0; m &= m - 1) {
          const p = 31 - Math.clz32(m & -m);
          if ((hit >>> p) & 1) this.positive.set(a * 32 + p, a);
          else this.positive.delete(a * 32 + p);
        }
      }
    }
    this.state = v.next;
    if (v.second) this.second = true;
  }
  /** Where an instance of the state (where 0) or a projection of the key (1) comes from, as block * SPAN + j. */
  private absOf(b: number, S: CState, ancient: Float64Array, where: number, x: number): number {
    if (where === 1) return this.lastProj[x]!.block * SPAN + this.lastProj[x]!.j;
    if (S.age[x] === ANCIENT) return ancient[x]!;
    const ob = b - 1 - S.age[x]!;
    return ob * SPAN + this.trueJ(ob, S.j[x]!);
  }

  private spareGroups = new Int32Array(0);
  private spareAbs = new Float64Array(0);

  /** The key with the chains' depths and what they name, into keyBuf; returns its length. */
  private chainKey(b: number, S: CState, k: number, pos: ChainPos[]): number {
    const proj = this.projections(b, S, pos);
    this.lastProj = proj.entries;
    let n = 2 + k;
    const need = n + 2 * pos.length + 13 * proj.entries.length + 4;
    if (this.keyBuf.length < need) {
      const bigger = new Int32Array(need * 2);
      bigger.set(this.keyBuf.subarray(0, n));
      this.keyBuf = bigger;
    }
    const key = this.keyBuf;
    key[n++] = -1; // marks a key with chains
    for (let c = 0; c < pos.length; c++) {
      key[n++] = pos[c]!.depth;
      key[n++] = pos[c]!.depth > 0 ? proj.more[c]! : -1;
    }
    for (const e of proj.entries) {
      key[n++] = e.kind;
      key[n++] = e.a;
      key[n++] = e.s;
      key[n++] = e.chain;
      if (e.kind === 0) {
        key[n++] = e.t;
        key[n++] = e.r0;
        key[n++] = e.r1;
        key[n++] = e.r2;
        key[n++] = e.mask;
        key[n++] = e.pos;
        key[n++] = e.ord;
      }
    }
    return n;
  }

  /**
   * The gates the key's chains name: per chain, the first `depth` live gates on the qubit before
   * the open block, newest first, by instance: an instance of the state (kind 1, a = its index:
   * all of it is known), one already named by an earlier chain (kind 2, a = its entry), or one
   * known only through its block (kind 0: its template, the wires of the slots its named gates
   * touch as key refs, the named gates, and where it stands among the state's instances).
   */
  private projections(b: number, S: CState, pos: ChainPos[]): { entries: Projected[]; more: Int32Array } {
    const entries = this.projEntries;
    entries.length = 0;
    this.projUsed = 0;
    if (this.projMore.length < pos.length) this.projMore = new Int32Array(pos.length * 2);
    const more = this.projMore;
    const vars = this.projVars;
    for (let c = 0; c < pos.length; c++) {
      const p = pos[c]!;
      let left = p.depth;
      let occ = p.start;
      let exhausted = true;
      while (left > 0 && occ >= 0) {
        const ob = this.src.blockOf(occ);
        const q0 = this.src.slotOf(occ);
        occ = this.prevOcc[occ]!;
        const shape = this.src.shape(this.blockShape[ob]!);
        const dc = this.deadClasses.get(this.blockDead[ob]!);
        const list = shape.onVar[q0]!;
        let varsRead = false;
        for (let i = list.length - 1; i >= 0; i--) {
          const j = list[i]! >> 2;
          const s = list[i]! & 3;
          const t = shape.t[j]!;
          const absId = ob * SPAN + j;
          let again = -1;
          for (let e = 0; e < entries.length; e++) if (entries[e]!.kind !== 2 && entries[e]!.block * SPAN + entries[e]!.j === absId) again = e;
          if (again >= 0) {
            entries.push(this.projEntry(2, again, s, c, 0, 0, 0, 0, 0, ob, j));
            const first = entries[again]!;
            if (first.kind === 0) left -= popcount(first.mask & SLOT_MASK[t * 3 + s]!);
            else left -= popcount(SLOT_MASK[t * 3 + s]! & ~dc[j]!);
            if (left <= 0) {
              exhausted = i === 0 && occ < 0;
              break;
            }
            continue;
          }
          const inState = this.stateIndex(S, b, ob, j);
          if (inState >= 0) {
            entries.push(this.projEntry(1, inState, s, c, 0, 0, 0, 0, 0, ob, j));
            left -= popcount(SLOT_MASK[t * 3 + s]! & ~dc[j]!);
            if (left <= 0) {
              exhausted = i === 0 && occ < 0;
              break;
            }
            continue;
          }
          // Its live gates on this qubit, newest first, up to what is left to name.
          const gates = SLOT_GATES[t * 3 + s]!;
          let mask = 0;
          let g = gates.length - 1;
          for (; g >= 0 && left > 0; g--) {
            if ((dc[j]! >>> gates[g]!) & 1) continue;
            mask |= 1 << gates[g]!;
            left--;
          }
          // The wires of the slots those gates touch.
          const phys = this.physes.get(this.blockPhys[ob]!);
          const touched = gatesOnSlots(t, mask);
          let r0 = R_NONE;
          let r1 = R_NONE;
          let r2 = R_NONE;
          for (let s2 = 0; s2 < SLOTS[t]!; s2++) {
            if ((touched & (1 << s2)) === 0) continue;
            const lr = shape.ref[j * 3 + s2]!;
            if (lr < 0) continue;
            let code: number;
            if (lr < shape.k) {
              if (!varsRead) {
                this.src.varsOf(ob, vars);
                varsRead = true;
              }
              const qb = vars[lr]!;
              code = R_OUT;
              for (let g2 = 0; g2 < S.G; g2++) if (this.groupQubit[g2] === qb) code = rGroup(g2);
              if (code === R_OUT) for (let c2 = 0; c2 < pos.length; c2++) if (pos[c2]!.group < 0 && pos[c2]!.qubit === qb) code = rGroup(S.G + c2);
            } else code = phys[lr]!;
            if (s2 === 0) r0 = code;
            else if (s2 === 1) r1 = code;
            else r2 = code;
          }
          entries.push(this.projEntry(0, 0, s, c, t, r0, r1, r2, mask, ob, j));
          if (left <= 0) {
            let rest = false;
            for (; g >= 0; g--) if (((dc[j]! >>> gates[g]!) & 1) === 0) rest = true;
            exhausted = !rest && i === 0 && occ < 0;
            break;
          }
        }
      }
      more[c] = exhausted && occ < 0 ? 0 : 1;
      if (p.depth > 0 && left > 0) more[c] = 0;
    }
    // Where an instance known only through its block goes among the state's, and among the
    // other projections: exactly where it stands in the circuit. A walk from the block stops at
    // its partner by instance number (clearBetween, markRecheck): a projection put before an
    // older state instance it follows (an ancient one on a work wire left idle since) would end
    // that walk on the wrong side. Both numbers are in the key.
    let ranked = 0;
    for (let e = 0; e < entries.length; e++) {
      const x = entries[e]!;
      if (x.kind !== 0) continue;
      x.pos = this.posOf(b, S, x.block, x.j);
      ranked++;
    }
    if (ranked > 0) {
      const order = this.projOrder;
      order.length = 0;
      for (let e = 0; e < entries.length; e++) if (entries[e]!.kind === 0) order.push(entries[e]!);
      order.sort((u, v) => u.block - v.block || u.j - v.j);
      for (let r = 0; r < order.length; r++) order[r]!.ord = r;
    }
    this.projResult.entries = entries;
    this.projResult.more = more;
    return this.projResult;
  }
  private readonly projEntries: Projected[] = [];
  private readonly projOrder: Projected[] = [];

  /**
   * How many of the state's instances come before instance j of block ob in the circuit (the
   * state keeps them in circuit order: ancient ones first, identified by the driver, then by age).
   */
  private posOf(b: number, S: CState, ob: number, j: number): number {
    const at = ob * SPAN + j;
    // Often older than every instance of the state (nothing ancient, the block further back than the oldest age).
    if (S.n === 0 || this.absAt(b, S, 0) >= at) return 0;
    let lo = 1;
    let hi = S.n;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (this.absAt(b, S, mid) < at) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }

  /** Instance x of the state, as block * SPAN + j. */
  private absAt(b: number, S: CState, x: number): number {
    if (S.age[x] === ANCIENT) return this.ancientAbs[x]!;
    const sb = b - 1 - S.age[x]!;
    return sb * SPAN + this.trueJ(sb, S.j[x]!);
  }
  private projMore = new Int32Array(16);
  private readonly projResult: { entries: Projected[]; more: Int32Array } = { entries: [], more: new Int32Array(0) };

  /** Index in the state of instance j of block ob (the open block is b - 1), or -1. */
  private stateIndex(S: CState, b: number, ob: number, j: number): number {
    const age = b - 1 - ob;
    if (age <= RECENT) {
      const shape = this.src.shape(this.blockShape[ob]!);
      const jc = shape.t[j] === T_X ? -2 - shape.xBefore[j]! : j - shape.xBefore[j]!;
      if (S.recent === undefined) {
        S.recent = new Map();
        for (let x = S.ancient; x < S.n; x++) S.recent.set(S.age[x]! * SPAN + S.j[x]!, x);
      }
      return S.recent.get(age * SPAN + jc) ?? -1;
    }
    const absId = ob * SPAN + j;
    for (let x = 0; x < S.ancient; x++) if (this.ancientAbs[x] === absId) return x;
    return -1;
  }

  // ---- a replay (memo miss) ---------------------------------------------------------------

  /** The chain positions whose wires a walk reached the start of (to deepen), or null when that was not a chain's wire. */
  private deepen(b: number, hits: number[], chainWire: number[], G: number, k: number, offW: number): Int32Array | null {
    const ask = new Set<number>();
    for (const w of hits) {
      const c = chainWire.indexOf(w);
      if (c < 0) {
        // A work wire's kept tail: the limit on its changes of role may be the cause.
        if (w >= offW) this.stoppedOnTail = this.keepSwitches !== Infinity;
        return this.giveUp(b, `a walk reached the start of wire ${w} (groups ${G}, slots ${k}, work from ${offW})`);
      }
      ask.add(c);
    }
    return Int32Array.from(ask);
  }

  /** Why the block counting stopped (for the tests and the bench), or null. */
  stopped: string | null = null;
  /** It stopped at a work wire's tail kept short by keepSwitches: counting again without the limit may go through. */
  stoppedOnTail = false;
  private readonly keepSwitches: number;

  private giveUp(b: number, why: string): null {
    this.stopped = `block ${b}: ${why}`;
    return null;
  }

  /**
   * Replays block b over the state with a small engine. Returns the memo value, the chain
   * positions to deepen (their walks reached what the key left out), or null (the block counting
   * cannot go on).
   */
  private replay(b: number, S: CState, shape: Shape | null, k: number, slotGroup: Int32Array, pos: ChainPos[], proj: { entries: Projected[]; more: Int32Array }): CValue | Int32Array | null {
    const G = S.G;
    // Wires of the replay: state groups, the block's new qubits, work wires, one "elsewhere".
    const slotWire = new Int32Array(k);
    for (let q = 0; q < k; q++) slotWire[q] = slotGroup[q]! >= 0 ? slotGroup[q]! : G + q;
    const chainWire = pos.map((p) => (p.group >= 0 ? p.group : G + p.slot));
    const maxW = S.W + (shape ? shape.refs : 0) + 1;
    const offW = G + k;
    const OUT = offW + maxW;
    const nw = OUT + 1;
    const truncated = new Uint8Array(nw);
    for (let g = 0; g < G; g++) truncated[g] = 1;
    for (let q = 0; q < k; q++) truncated[G + q] = 1;
    for (let c = 0; c < pos.length; c++) truncated[chainWire[c]!] = pos[c]!.depth > 0 ? proj.more[c]! : 1;
    for (let w = 0; w < S.W; w++) truncated[offW + w] = S.trunc[w]!;
    truncated[OUT] = 1;
    const eng = (this.engine ??= new CountingEngine({ base: nw, optimize: this.opts.optimize, levels: false, lag: Infinity, wires: nw, ids: 1024, second: true, truncated, ring: 1024 }));
    eng.resetReplay(nw, truncated);
    // Context: the state's instances with the projections inserted where they stand.
    const extraLink = new Uint8Array(S.n);
    const projLink = new Uint8Array(proj.entries.length);
    for (let e = 0; e < proj.entries.length; e++) {
      const p = proj.entries[e]!;
      const first = p.kind === 2 ? proj.entries[p.a]! : p;
      const at = p.kind === 2 ? p.a : e;
      if (first.kind === 1) extraLink[first.a] = extraLink[first.a]! | (1 << p.s);
      else projLink[at] = projLink[at]! | (1 << p.s);
    }
    const keyWire = (code: number): number => {
      if (code >= 0) return offW + code;
      if (code === R_NONE || code === R_OUT) return OUT;
      const g = -3 - code;
      return g < G ? g : chainWire[g - G]!;
    };
    const stateWire = (code: number): number => (code >= 0 ? offW + code : code === -1 ? OUT : -2 - code);
    const idOf = new Int32Array(S.n);
    // Projected instances by insertion point, in circuit order (ord).
    const byPos = new Map<number, number[]>();
    for (let e = 0; e < proj.entries.length; e++) {
      const p = proj.entries[e]!;
      if (p.kind !== 0) continue;
      let l = byPos.get(p.pos);
      if (l === undefined) byPos.set(p.pos, (l = []));
      l.push(e);
    }
    for (const l of byPos.values()) if (l.length > 1) l.sort((u, v) => proj.entries[u]!.ord - proj.entries[v]!.ord);
    // Instances before the open block had their stage 2: preloaded as if just done (mask1 = dead),
    // so that restage sees only what this block changes. A projection is only its named gates.
    const projId = new Int32Array(proj.entries.length).fill(-1);
    for (let x = 0; x <= S.n; x++) {
      const here = byPos.get(x);
      if (here !== undefined) {
        for (const e of here) {
          const p = proj.entries[e]!;
          projId[e] = eng.preload(p.t, keyWire(p.r0), keyWire(p.r1), keyWire(p.r2), projLink[e]!, ~p.mask, ~p.mask, 0);
        }
      }
      if (x === S.n) break;
      const open = x >= S.openStart;
      idOf[x] = eng.preload(S.t[x]!, stateWire(S.ref[x * 3]!), stateWire(S.ref[x * 3 + 1]!), stateWire(S.ref[x * 3 + 2]!), S.link[x]! | extraLink[x]!, S.dead[x]!, open ? S.mask1[x]! : S.dead[x]!, open ? S.recheck[x]! : 0);
    }
    const NP = eng.instances;
    // Work-qubit reuse for the block (as engine.put: wires at first use, freed after the last).
    const free = Array.from(S.free);
    const per = Int32Array.from(S.per);
    let W = S.W;
    const phys = new Int32Array(shape ? shape.refs : 0).fill(-1);
    const cur = new Int32Array(shape ? shape.refs : 0).fill(-1);
    if (shape) {
      for (let r = shape.k; r < shape.k + shape.p; r++) cur[r] = per[r - shape.k]!;
      for (let j = 0; j < shape.n; j++) {
        const t = shape.t[j]!;
        const touch = FIRST_TOUCH[t]!;
        for (let i = 0; i < touch.length; i++) {
          const r = shape.ref[j * 3 + touch[i]!]!;
          if (r < shape.k) continue;
          if (cur[r]! < 0) {
            cur[r] = free.length > 0 ? free.pop()! : W++;
            if (r < shape.k + shape.p) per[r - shape.k] = cur[r]!;
          }
          if (phys[r]! < 0) phys[r] = cur[r]!;
        }
        const w3 = [0, 0, 0];
        for (let s = 0; s < 3; s++) {
          const r = shape.ref[j * 3 + s]!;
          w3[s] = r < 0 ? OUT : r < shape.k ? slotWire[r]! : offW + cur[r]!;
        }
        eng.put(t, w3[0]!, w3[1]!, w3[2]!, 0);
        // A walk reached what the key left out: the replay is for nothing but that.
        if (eng.truncatedHits.length > 0) break;
        const dies = shape.dies[j]!;
        if (dies !== 0) {
          const order = LAST_TOUCH[t]!;
          for (let i = 0; i < order.length; i++) {
            const s = order[i]!;
            if (((dies >>> s) & 1) === 0) continue;
            const r = shape.ref[j * 3 + s]!;
            if (r < shape.k) continue;
            free.push(cur[r]!);
            cur[r] = -1;
            if (r < shape.k + shape.p) per[r - shape.k] = -1;
          }
        }
      }
    }
    if (eng.truncatedHits.length > 0) return this.deepen(b, eng.truncatedHits, chainWire, G, k, offW);
    // A projection is known only by its named gates: a cancellation into it, or a walk of its own
    // to repeat, would need the rest.
    for (let e = 0; e < proj.entries.length; e++) {
      const id = projId[e]!;
      if (id < 0) continue;
      if (eng.deadOf(id) !== ~proj.entries[e]!.mask || eng.recheckOf(id) !== 0) return this.giveUp(b, "a cancellation reached a projected instance");
    }
    // Stage 2 of the open block, and again for older instances a cancellation here lets walk
    // further (the latest walk of a gate is the one that counts: see run).
    // A first walk (the open block's) that finds nothing changes nothing: not recorded.
    const stage2: number[] = [];
    for (let x = 0; x < S.n; x++) {
      const [walked, positive] = eng.restage(idOf[x]!);
      if (walked !== 0 && (positive !== 0 || x < S.openStart)) stage2.push(0, x, walked, positive);
    }
    if (eng.truncatedHits.length > 0) return this.deepen(b, eng.truncatedHits, chainWire, G, k, offW);
    const kills: number[] = [];
    for (let x = 0; x < S.openStart; x++) if (eng.deadOf(idOf[x]!) !== S.dead[x]) kills.push(0, x, eng.deadOf(idOf[x]!));
    const total = eng.instances;
    // The open block's final cancelled gates, in block order (its stage 2 is done).
    let deadClass = -1;
    if (S.openStart < S.n) {
      const d = new Int32Array(this.src.shape(this.blockShape[b - 1]!).n);
      for (let x = S.openStart; x < S.n; x++) d[this.trueJ(b - 1, S.j[x]!)] = eng.deadOf(idOf[x]!);
      deadClass = this.deadClasses.id(d);
    }
    // The next state: every work wire's tail (the block's instances and 17 live gates before),
    // the block's qubits' instances of this block.
    const stateOfId = new Int32Array(total).fill(-1);
    for (let x = 0; x < S.n; x++) stateOfId[idOf[x]!] = x;
    const keep = new Uint8Array(total);
    const linkOf = new Uint8Array(total);
    const trunc = new Uint8Array(W);
    for (let w = 0; w < W; w++) {
      let e = eng.lastOn(offW + w);
      let live = 0;
      let stops = 0;
      let switches = 0;
      let role = -1;
      while (e >= 0) {
        const id = e >> 2;
        const s = e & 3;
        if (id < NP) {
          if (live >= KEEP_LIVE || stops >= KEEP_STOPS || switches >= this.keepSwitches) break;
          const x = stateOfId[id]!;
          if (x < 0) return this.giveUp(b, "a projected instance on a work wire");
          const t = S.t[x]!;
          const alive = ~eng.deadOf(id);
          live += popcount(SLOT_MASK[t * 3 + s]! & alive);
          stops += popcount(SLOT_STOP[t * 3 + s]! & alive);
          // Role changes among the live gates, newest first: a walk along the wire passes only
          // gates of its own role (templates.ts, commuteOn).
          const gates = SLOT_GATES[t * 3 + s]!;
          for (let i = gates.length - 1; i >= 0; i--) {
            if (((alive >>> gates[i]!) & 1) === 0) continue;
            const r = G_ROLE[(GATE_START[t]! + gates[i]!) * 3 + s]!;
            if (r !== role || r === ROLE_OTHER) switches++;
            role = r;
          }
        }
        keep[id] = 1;
        linkOf[id] = linkOf[id]! | (1 << s);
        e = eng.prevOn(id, s);
      }
      trunc[w] = e >= 0 ? 1 : w < S.W ? S.trunc[w]! : 0;
    }
    for (let q = 0; q < k; q++) {
      for (let e = eng.lastOn(slotWire[q]!); e >= 0 && e >> 2 >= NP; e = eng.prevOn(e >> 2, e & 3)) {
        keep[e >> 2] = 1;
        linkOf[e >> 2] = linkOf[e >> 2]! | (1 << (e & 3));
      }
    }
    for (let id = NP; id < total; id++) keep[id] = 1;
    // Groups: the block's qubits first, in slot order, then the others in order of first reference.
    const groupOfWire = new Map<number, number>();
    const groupSrc: number[] = [];
    const hot: number[] = [];
    const groupFor = (wire: number): number => {
      let g = groupOfWire.get(wire);
      if (g === undefined) {
        g = groupSrc.length;
        groupOfWire.set(wire, g);
        const slot = slotWire.indexOf(wire);
        groupSrc.push(wire < G ? wire : -1 - slot);
        hot.push(slot);
      }
      return g;
    };
    for (let q = 0; q < k; q++) groupFor(slotWire[q]!);
    // The instances' rows (age, j, template, refs, link, dead, mask1, recheck), in circuit order.
    if (this.rowBuf.length < total * 10) this.rowBuf = new Int32Array(total * 20);
    const rows = this.rowBuf;
    let n = 0;
    const ancientSrc: number[] = [];
    for (let id = 0; id < total; id++) {
      if (!keep[id]) continue;
      const x = stateOfId[id]!;
      const o = n * 10;
      let age: number;
      if (x >= 0) {
        age = S.age[x] === ANCIENT || S.age[x] === RECENT ? ANCIENT : S.age[x]! + 1;
        rows[o + 1] = age === ANCIENT ? -1 : S.j[x]!;
        rows[o + 2] = S.t[x]!;
        if (age === ANCIENT) ancientSrc.push(S.age[x] === ANCIENT ? x : -1 - x);
        for (let s = 0; s < 3; s++) {
          const c = S.ref[x * 3 + s]!;
          rows[o + 3 + s] = c >= 0 ? c : c === -1 ? -1 : -2 - groupFor(-2 - c);
        }
      } else {
        const jj = id - NP;
        age = 0;
        const t = shape!.t[jj]!;
        rows[o + 1] = t === T_X ? -2 - shape!.xBefore[jj]! : jj - shape!.xBefore[jj]!;
        rows[o + 2] = t;
        for (let s = 0; s < 3; s++) {
          const r = shape!.ref[jj * 3 + s]!;
          rows[o + 3 + s] = r < 0 ? -1 : r < shape!.k ? -2 - groupFor(slotWire[r]!) : phys[r]! >= 0 ? phys[r]! : -1;
        }
      }
      rows[o] = age;
      rows[o + 6] = linkOf[id]!;
      rows[o + 7] = eng.deadOf(id);
      rows[o + 8] = age === 0 ? eng.mask1Of(id) : 0;
      rows[o + 9] = age === 0 ? eng.recheckOf(id) : 0;
      n++;
    }
    // The next state's canonical numbers (encodeState's layout), written straight.
    const G2 = groupSrc.length;
    const size = 3 + free.length + per.length + 2 + G2 + W + 10 * n;
    if (this.encBuf.length < size) this.encBuf = new Int32Array(size * 2);
    const enc = this.encBuf;
    let p = 0;
    enc[p++] = W;
    enc[p++] = free.length;
    for (const f of free) enc[p++] = f;
    enc[p++] = per.length;
    for (let i = 0; i < per.length; i++) enc[p++] = per[i]!;
    enc[p++] = n;
    enc[p++] = G2;
    for (let g = 0; g < G2; g++) enc[p++] = hot[g]!;
    for (let w = 0; w < W; w++) enc[p++] = trunc[w]!;
    enc.set(rows.subarray(0, 10 * n), p);
    p += 10 * n;
    const next = this.states.id(enc, p);
    if (this.decoded.length === next) this.decoded.push(decodeState(this.states.get(next)));
    return {
      next, phys: this.physes.id(phys), deadClass, second: eng.secondReason !== null,
      ancientSrc: Int32Array.from(ancientSrc), groupSrc: Int32Array.from(groupSrc), kills: Int32Array.from(kills), stage2: Int32Array.from(stage2),
    };
  }
}

interface Projected {
  kind: number;
  a: number;
  s: number;
  chain: number;
  t: number;
  r0: number;
  r1: number;
  r2: number;
  /** Kind 0: the gates named (the others are left out). */
  mask: number;
  /** Kind 0: state instances before it (see projections). */
  pos: number;
  /** Kind 0: its rank among the key's kind-0 projections, in circuit order. */
  ord: number;
  block: number;
  j: number;
}

// ---- the tally ----------------------------------------------------------------------------

interface TallyResult {
  tCount: number;
  cnotCount: number;
  toffoliCount: number;
  measurements: number;
  phaseGates: number;
  depth: number;
  tDepth: number;
  vanished: boolean;
}

interface Tally {
  block(shape: number, deadClass: number, physId: number, phys: Int32Array, vars: Int32Array, deads: Interner): void;
  finish(workWires: number): TallyResult;
}

/** Counts only (a toffoli-basis run): the live gates of each block, as engine.settle without levels. */
class CountTally implements Tally {
  private readonly memo = new KeyTable();
  private readonly rows: number[][] = [];
  private readonly key = new Int32Array(2);
  private readonly sum = [0, 0, 0, 0, 0];

  constructor(private readonly src: BlockSource) {}

  block(shape: number, deadClass: number, _physId: number, _phys: Int32Array, _vars: Int32Array, deads: Interner): void {
    this.key[0] = shape;
    this.key[1] = deadClass;
    let e = this.memo.get(this.key, 2);
    if (e < 0) {
      const sh = this.src.shape(shape);
      const dead = deadClass >= 0 ? deads.get(deadClass) : new Int32Array(sh.n);
      const row = [0, 0, 0, 0, 0];
      for (let j = 0; j < sh.n; j++) {
        const t = sh.t[j]!;
        const base = GATE_START[t]!;
        for (let p = 0; p < gatesOf(t); p++) {
          if ((dead[j]! >>> p) & 1) continue;
          const kk = G_KIND[base + p]!;
          if (kk === K.t || kk === K.tdg) row[0]!++;
          else if (kk === K.cx || kk === K.cz) row[1]!++;
          else if (kk === K.ccx) row[2]!++;
          else if (kk === K.measure) row[3]!++;
          if (G_PHASE[base + p]! >= 0) row[4]!++;
        }
      }
      e = this.rows.length;
      this.rows.push(row);
      this.memo.set(this.key, 2, e);
    }
    const row = this.rows[e]!;
    for (let i = 0; i < 5; i++) this.sum[i]! += row[i]!;
  }

  finish(): TallyResult {
    const [tCount, cnotCount, toffoliCount, measurements, phaseGates] = this.sum as [number, number, number, number, number];
    return { tCount, cnotCount, toffoliCount, measurements, phaseGates, depth: 0, tDepth: 0, vanished: false };
  }
}

/** A level state, decoded: the work wires the last block touched (and the classical bit, wire -1), relative to the highest. */
interface LState {
  readonly n: number;
  readonly wire: Int32Array;
  readonly rel: Int32Array;
  readonly relT: Int32Array;
  readonly pend: Uint8Array;
  /** Index of a wire in this state (built on demand). */
  at?: Map<number, number>;
}

/** A block's effect on the levels (a memo entry). Inputs: the block's wires not in the state ("cold"). */
interface LValue {
  readonly next: number;
  readonly dL: number;
  readonly dT: number;
  /** Per cold input: how high (relative to the state's reference) it may be without reaching a state wire's level. */
  readonly tauL: Float64Array;
  readonly tauT: Float64Array;
  /** Per qubit of the block: its level from the state's wires (relative; NEG: none) and per cold input the path length (NEG: none). */
  readonly outL: Float64Array;
  readonly outT: Float64Array;
  readonly dl: Float64Array;
  readonly dt: Float64Array;
  readonly outPend: Uint8Array;
  /** State wires the block does not touch: (wire, rel, relT, pend) each, to store as numbers. */
  readonly demote: Int32Array;
  readonly counts: Float64Array;
  readonly vanished: boolean;
}

const BIT = -1;
const DOM = -2147483648;

/** Levels, merge-phases and counts of each block (engine.settle with levels), block by block. */
class LevelTally implements Tally {
  private readonly states = new Interner();
  private readonly decoded: LState[] = [];
  private readonly memo = new KeyTable();
  private readonly values: LValue[] = [];
  private state: number;
  private ref = 0;
  private refT = 0;
  /** Per qubit (three numbers, one cache line): level, T-level, pending phase run. */
  private readonly qv: Float64Array;
  private workL = new Float64Array(64);
  private workT = new Float64Array(64);
  private workP = new Uint8Array(64);
  private bitL = 0;
  private bitT = 0;
  private readonly sum = [0, 0, 0, 0, 0];
  private vanished = false;
  private key = new Int32Array(64);

  constructor(private readonly src: BlockSource, private readonly optimize: boolean) {
    this.qv = new Float64Array(src.base * 3);
    this.state = this.intern({ n: 0, wire: new Int32Array(0), rel: new Int32Array(0), relT: new Int32Array(0), pend: new Uint8Array(0) });
  }

  private intern(s: LState): number {
    const a = new Int32Array(1 + 4 * s.n);
    a[0] = s.n;
    for (let i = 0; i < s.n; i++) {
      a[1 + i] = s.wire[i]!;
      a[1 + s.n + i] = s.rel[i]!;
      a[1 + 2 * s.n + i] = s.relT[i]!;
      a[1 + 3 * s.n + i] = s.pend[i]!;
    }
    const id = this.states.id(a);
    if (id === this.decoded.length) this.decoded.push(s);
    return id;
  }

  private room(w: number): void {
    if (w < this.workL.length) return;
    const n = Math.max(w + 1, this.workL.length * 2);
    const l = new Float64Array(n);
    l.set(this.workL);
    this.workL = l;
    const t = new Float64Array(n);
    t.set(this.workT);
    this.workT = t;
    const p = new Uint8Array(n);
    p.set(this.workP);
    this.workP = p;
  }

  /** The cold inputs of a block over a state (cached per state, shape and wires). */
  private layout(shapeId: number, physId: number, phys: Int32Array): Layout {
    this.layoutKey[0] = this.state;
    this.layoutKey[1] = shapeId;
    this.layoutKey[2] = physId;
    let e = this.layoutIds.get(this.layoutKey, 3);
    if (e < 0) {
      const S = this.decoded[this.state]!;
      if (S.at === undefined) {
        S.at = new Map();
        for (let i = 0; i < S.n; i++) S.at.set(S.wire[i]!, i);
      }
      const sh = this.src.shape(shapeId);
      const inputs = blockInputs(sh, phys);
      const cold: number[] = [];
      for (let i = 0; i < inputs.length; i++) {
        const w = inputs[i]!;
        if (w.kind === 0) cold.push(i);
        else if (!S.at.has(w.kind === 2 ? BIT : w.id)) cold.push(i);
      }
      const kind = Int32Array.from(cold, (i) => inputs[i]!.kind);
      const id = Int32Array.from(cold, (i) => inputs[i]!.id);
      e = this.layouts.length;
      this.layouts.push({ inputs, cold: Int32Array.from(cold), kind, id });
      this.layoutIds.set(this.layoutKey, 3, e);
    }
    return this.layouts[e]!;
  }
  private readonly layoutIds = new KeyTable();
  private readonly layouts: Layout[] = [];
  private readonly layoutKey = new Int32Array(3);
  private coldL = new Float64Array(64);
  private coldT = new Float64Array(64);

  block(shapeId: number, deadClass: number, physId: number, phys: Int32Array, vars: Int32Array, deads: Interner): void {
    const sh = this.src.shape(shapeId);
    const lay = this.layout(shapeId, physId, phys);
    const C = lay.cold.length;
    if (this.coldL.length < C) {
      this.coldL = new Float64Array(C * 2);
      this.coldT = new Float64Array(C * 2);
    }
    let n = 0;
    if (this.key.length < 8 + C * 3) this.key = new Int32Array(16 + C * 6);
    const key = this.key;
    key[n++] = this.state;
    key[n++] = shapeId;
    key[n++] = deadClass;
    key[n++] = physId;
    // Cold inputs: their pending phase runs (in the key) and levels (checked against the entry).
    for (let c = 0; c < C; c++) {
      const kind = lay.kind[c]!;
      const id = lay.id[c]!;
      let p = 0;
      if (kind === 0) {
        const q = vars[id]!;
        p = this.qv[q * 3 + 2]!;
        this.coldL[c] = this.qv[q * 3]!;
        this.coldT[c] = this.qv[q * 3 + 1]!;
      } else if (kind === 1) {
        this.room(id);
        p = this.workP[id]!;
        this.coldL[c] = this.workL[id]!;
        this.coldT[c] = this.workT[id]!;
      } else {
        this.coldL[c] = this.bitL;
        this.coldT[c] = this.bitT;
      }
      key[n++] = p;
    }
    const n0 = n;
    let e = this.memo.get(key, n);
    if (e < 0) {
      e = this.values.length;
      this.values.push(this.compute(sh, deadClass, phys, deads, lay, key.slice(4, n0), null));
      this.memo.set(key, n, e);
    }
    let v = this.values[e]!;
    // The cold inputs must not reach the state's wires above what the entry assumed.
    let ok = true;
    for (let c = 0; c < C; c++) if (this.coldL[c]! - this.ref > v.tauL[c]! || this.coldT[c]! - this.refT > v.tauT[c]!) ok = false;
    if (!ok) {
      const exact = new Float64Array(C * 2);
      n = n0;
      for (let c = 0; c < C; c++) {
        const rl = this.coldL[c]! - this.ref;
        const rt = this.coldT[c]! - this.refT;
        exact[c * 2] = rl <= v.tauL[c]! ? NEG : rl;
        exact[c * 2 + 1] = rt <= v.tauT[c]! ? NEG : rt;
        key[n++] = exact[c * 2] === NEG ? DOM : rl;
        key[n++] = exact[c * 2 + 1] === NEG ? DOM : rt;
      }
      e = this.memo.get(key, n);
      if (e < 0) {
        e = this.values.length;
        this.values.push(this.compute(sh, deadClass, phys, deads, lay, key.slice(4, n0), exact));
        this.memo.set(key, n, e);
      }
      v = this.values[e]!;
      for (let c = 0; c < C; c++) {
        if ((exact[c * 2] === NEG && this.coldL[c]! - this.ref > v.tauL[c]!) || (exact[c * 2 + 1] === NEG && this.coldT[c]! - this.refT > v.tauT[c]!)) {
          throw new Error("block counter: a level assumed below its bound is not");
        }
      }
    }
    // Qubit outputs, from the inputs read above.
    const k = sh.k;
    for (let q = 0; q < k; q++) {
      let l = v.outL[q]! === NEG ? NEG : v.outL[q]! + this.ref;
      let t = v.outT[q]! === NEG ? NEG : v.outT[q]! + this.refT;
      for (let c = 0; c < C; c++) {
        const dl = v.dl[q * C + c]!;
        const dt = v.dt[q * C + c]!;
        if (dl !== NEG && this.coldL[c]! + dl > l) l = this.coldL[c]! + dl;
        if (dt !== NEG && this.coldT[c]! + dt > t) t = this.coldT[c]! + dt;
      }
      const qb = vars[q]!;
      if (l !== NEG) this.qv[qb * 3] = l;
      if (t !== NEG) this.qv[qb * 3 + 1] = t;
      this.qv[qb * 3 + 2] = v.outPend[q]!;
    }
    for (let i = 0; i < v.demote.length; i += 4) {
      const w = v.demote[i]!;
      const l = v.demote[i + 1]! + this.ref;
      const t = v.demote[i + 2]! + this.refT;
      if (w === BIT) {
        this.bitL = l;
        this.bitT = t;
        continue;
      }
      this.room(w);
      this.workL[w] = l;
      this.workT[w] = t;
      this.workP[w] = v.demote[i + 3]!;
    }
    this.ref += v.dL;
    this.refT += v.dT;
    this.state = v.next;
    for (let i = 0; i < 5; i++) this.sum[i]! += v.counts[i]!;
    if (v.vanished) this.vanished = true;
  }

  /**
   * The block's effect, computed instance by instance as engine.settle does, with each level a
   * max-plus vector: a number from the state's wires and the cold inputs given exactly, and a path
   * length from each other cold input.
   */
  private compute(sh: Shape, deadClass: number, phys: Int32Array, deads: Interner, lay: Layout, pends: Int32Array, exact: Float64Array | null): LValue {
    const S = this.decoded[this.state]!;
    const inputs = lay.inputs;
    const cold = lay.cold;
    const C = cold.length;
    const width = 1 + C;
    const nIn = inputs.length;
    const L: Float64Array[] = [];
    const T: Float64Array[] = [];
    const P = new Uint8Array(nIn);
    const coldAt = new Int32Array(nIn).fill(-1);
    for (let c = 0; c < C; c++) coldAt[cold[c]!] = c;
    for (let i = 0; i < nIn; i++) {
      const l = new Float64Array(width).fill(NEG);
      const t = new Float64Array(width).fill(NEG);
      const w = inputs[i]!;
      const c = coldAt[i]!;
      if (c < 0) {
        const x = S.at!.get(w.kind === 2 ? BIT : w.id)!;
        l[0] = S.rel[x]!;
        t[0] = S.relT[x]!;
        P[i] = S.pend[x]!;
      } else {
        if (exact !== null && exact[c * 2] !== NEG) l[0] = exact[c * 2]!;
        else l[1 + c] = 0;
        if (exact !== null && exact[c * 2 + 1] !== NEG) t[0] = exact[c * 2 + 1]!;
        else t[1 + c] = 0;
        P[i] = pends[c]!;
      }
      L.push(l);
      T.push(t);
    }
    const bitIn = inputs.findIndex((w) => w.kind === 2);
    const dead = deadClass >= 0 ? deads.get(deadClass) : new Int32Array(sh.n);
    const counts = new Float64Array(5);
    let vanished = false;
    const negVec = new Float64Array(width).fill(NEG);
    const slotIn = [0, 0, 0];
    for (let j = 0; j < sh.n; j++) {
      const t = sh.t[j]!;
      const slots = SLOTS[t]!;
      for (let s = 0; s < 3; s++) slotIn[s] = s < slots ? inputIndex(inputs, sh, phys, sh.ref[j * 3 + s]!) : -1;
      const tr = transferOf(t, dead[j]!, slots > 0 ? P[slotIn[0]!]! : 0, slots > 1 ? P[slotIn[1]!]! : 0, slots > 2 ? P[slotIn[2]!]! : 0, this.optimize);
      counts[0]! += tr.tCount;
      counts[1]! += tr.cnotCount;
      counts[2]! += tr.toffoliCount;
      counts[3]! += tr.measurements;
      counts[4]! += tr.phaseGates;
      if (tr.vanished) vanished = true;
      if (slots === 0) continue;
      const l0 = L[slotIn[0]!]!;
      const l1 = slots > 1 ? L[slotIn[1]!]! : negVec;
      const l2 = slots > 2 ? L[slotIn[2]!]! : negVec;
      const t0 = T[slotIn[0]!]!;
      const t1 = slots > 1 ? T[slotIn[1]!]! : negVec;
      const t2 = slots > 2 ? T[slotIn[2]!]! : negVec;
      const lb = bitIn >= 0 ? L[bitIn]! : negVec;
      const tb = bitIn >= 0 ? T[bitIn]! : negVec;
      if (tr.bit !== null) {
        if (bitIn < 0) throw new Error("block counter: a measurement in a block not marked as using the bit");
        L[bitIn] = vecMaxPlus(tr.bit, 0, l0, l1, l2, lb, width);
        T[bitIn] = vecMaxPlus(tr.bitT!, 0, t0, t1, t2, tb, width);
      }
      const n0 = vecMaxPlus(tr.d, 0, l0, l1, l2, lb, width);
      const m0 = vecMaxPlus(tr.dt, 0, t0, t1, t2, tb, width);
      let n1: Float64Array | null = null;
      let m1: Float64Array | null = null;
      let n2: Float64Array | null = null;
      let m2: Float64Array | null = null;
      if (slots > 1) {
        n1 = vecMaxPlus(tr.d, 4, l0, l1, l2, lb, width);
        m1 = vecMaxPlus(tr.dt, 4, t0, t1, t2, tb, width);
      }
      if (slots > 2) {
        n2 = vecMaxPlus(tr.d, 8, l0, l1, l2, lb, width);
        m2 = vecMaxPlus(tr.dt, 8, t0, t1, t2, tb, width);
      }
      L[slotIn[0]!] = n0;
      T[slotIn[0]!] = m0;
      P[slotIn[0]!] = tr.pendOut[0]!;
      if (slots > 1) {
        L[slotIn[1]!] = n1!;
        T[slotIn[1]!] = m1!;
        P[slotIn[1]!] = tr.pendOut[1]!;
      }
      if (slots > 2) {
        L[slotIn[2]!] = n2!;
        T[slotIn[2]!] = m2!;
        P[slotIn[2]!] = tr.pendOut[2]!;
      }
    }
    // Outputs: work wires and the bit go to the next state; qubits are stored as numbers.
    const tauL = new Float64Array(C).fill(Infinity);
    const tauT = new Float64Array(C).fill(Infinity);
    let dL = NEG;
    let dT = NEG;
    for (let i = 0; i < nIn; i++) {
      if (inputs[i]!.kind === 0) continue;
      const l = L[i]!;
      const t = T[i]!;
      for (let c = 0; c < C; c++) {
        if (l[1 + c]! !== NEG) tauL[c] = Math.min(tauL[c]!, l[0]! === NEG ? -Infinity : l[0]! - l[1 + c]!);
        if (t[1 + c]! !== NEG) tauT[c] = Math.min(tauT[c]!, t[0]! === NEG ? -Infinity : t[0]! - t[1 + c]!);
      }
      if (l[0]! > dL) dL = l[0]!;
      if (t[0]! > dT) dT = t[0]!;
    }
    const hotOut: { wire: number; l: number; t: number; p: number }[] = [];
    for (let i = 0; i < nIn; i++) {
      const w = inputs[i]!;
      if (w.kind === 0) continue;
      hotOut.push({ wire: w.kind === 2 ? BIT : w.id, l: L[i]![0]!, t: T[i]![0]!, p: P[i]! });
    }
    if (dL === NEG) dL = 0;
    if (dT === NEG) dT = 0;
    // T-levels of a state wire may be NEG only where the state's own are (never: they start at 0).
    hotOut.sort((a, b) => a.wire - b.wire);
    const touched = new Set(hotOut.map((h) => h.wire));
    const demote: number[] = [];
    for (let x = 0; x < S.n; x++) if (!touched.has(S.wire[x]!)) demote.push(S.wire[x]!, S.rel[x]!, S.relT[x]!, S.pend[x]!);
    const next = this.intern({
      n: hotOut.length,
      wire: Int32Array.from(hotOut, (h) => h.wire),
      rel: Int32Array.from(hotOut, (h) => (h.l === NEG ? DOM : h.l - dL)),
      relT: Int32Array.from(hotOut, (h) => (h.t === NEG ? DOM : h.t - dT)),
      pend: Uint8Array.from(hotOut, (h) => h.p),
    });
    const k = sh.k;
    const outL = new Float64Array(k);
    const outT = new Float64Array(k);
    const dl = new Float64Array(k * C);
    const dt = new Float64Array(k * C);
    const outPend = new Uint8Array(k);
    for (let q = 0; q < k; q++) {
      outL[q] = L[q]![0]!;
      outT[q] = T[q]![0]!;
      outPend[q] = P[q]!;
      for (let c = 0; c < C; c++) {
        dl[q * C + c] = L[q]![1 + c]!;
        dt[q * C + c] = T[q]![1 + c]!;
      }
    }
    return { next, dL, dT, tauL, tauT, outL, outT, dl, dt, outPend, demote: Int32Array.from(demote), counts, vanished };
  }

  finish(workWires: number): TallyResult {
    const S = this.decoded[this.state]!;
    this.room(workWires);
    for (let x = 0; x < S.n; x++) {
      const w = S.wire[x]!;
      if (w === BIT) continue;
      this.workL[w] = S.rel[x]! + this.ref;
      this.workT[w] = S.relT[x]! + this.refT;
      this.workP[w] = S.pend[x]!;
    }
    let depth = 0;
    let tDepth = 0;
    const flush = (l: number, t: number, p: number): void => {
      let L = l;
      let T = t;
      if (this.optimize) {
        const run = finalRun(p);
        L += run.gates;
        T += run.tGates;
        this.sum[0]! += run.tGates;
      }
      depth = Math.max(depth, L);
      tDepth = Math.max(tDepth, T);
    };
    // In qubit order, as engine.finish (the order does not change the figures).
    for (let q = 0; q < this.src.base; q++) flush(this.qv[q * 3]!, this.qv[q * 3 + 1]!, this.qv[q * 3 + 2]!);
    for (let w = 0; w < workWires; w++) flush(this.workL[w]!, this.workT[w]!, this.workP[w]!);
    const [tCount, cnotCount, toffoliCount, measurements, phaseGates] = this.sum as [number, number, number, number, number];
    return { tCount, cnotCount, toffoliCount, measurements, phaseGates, depth, tDepth, vanished: this.vanished };
  }
}

/** The inputs of a block over a level state: all, and those not in the state (kind and id of each). */
interface Layout {
  readonly inputs: Input[];
  readonly cold: Int32Array;
  readonly kind: Int32Array;
  readonly id: Int32Array;
}

/** A wire of a block: a qubit slot (kind 0, id = slot), a work wire (kind 1, id = wire), the bit (kind 2). */
interface Input {
  readonly kind: number;
  readonly id: number;
}

const inputCache = new WeakMap<Shape, Map<Int32Array, Input[]>>();

function blockInputs(sh: Shape, phys: Int32Array): Input[] {
  let m = inputCache.get(sh);
  if (m === undefined) inputCache.set(sh, (m = new Map()));
  let r = m.get(phys);
  if (r !== undefined) return r;
  r = [];
  for (let q = 0; q < sh.k; q++) r.push({ kind: 0, id: q });
  const seen = new Set<number>();
  for (let j = 0; j < sh.n; j++) {
    for (let s = 0; s < SLOTS[sh.t[j]!]!; s++) {
      const lr = sh.ref[j * 3 + s]!;
      if (lr < sh.k) continue;
      const w = phys[lr]!;
      if (!seen.has(w)) {
        seen.add(w);
        r.push({ kind: 1, id: w });
      }
    }
  }
  if (sh.usesBit) r.push({ kind: 2, id: 0 });
  m.set(phys, r);
  return r;
}

function inputIndex(inputs: Input[], sh: Shape, phys: Int32Array, lr: number): number {
  if (lr < sh.k) return lr;
  const w = phys[lr]!;
  for (let i = sh.k; i < inputs.length; i++) if (inputs[i]!.kind === 1 && inputs[i]!.id === w) return i;
  throw new Error("block counter: a work wire missing from the block's inputs");
}

/** max over inputs j of (in_j + o[k + j]) as a max-plus vector (NEG: no path). */
function vecMaxPlus(o: Int32Array, k: number, a: Float64Array, b: Float64Array, c: Float64Array, bit: Float64Array, width: number): Float64Array {
  const r = new Float64Array(width).fill(NEG);
  const ins = [a, b, c, bit];
  for (let j = 0; j < 4; j++) {
    const d = o[k + j]!;
    if (d === NONE) continue;
    const v = ins[j]!;
    for (let i = 0; i < width; i++) if (v[i]! !== NEG && v[i]! + d > r[i]!) r[i] = v[i]! + d;
  }
  return r;
}

/** Per work wire of a state, the oldest age among the instances on its tail (ancient: a large number). */
function oldestAges(S: CState): Int32Array {
  const oldest = new Int32Array(S.W);
  for (let x = 0; x < S.n; x++) {
    const age = S.age[x] === ANCIENT ? 1 << 30 : S.age[x]!;
    for (let s = 0; s < 3; s++) {
      const w = S.ref[x * 3 + s]!;
      if (w >= 0 && ((S.link[x]! >>> s) & 1) === 1 && age > oldest[w]!) oldest[w] = age;
    }
  }
  return oldest;
}
