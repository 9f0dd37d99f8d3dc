/**
 * The sweep: the counting engine's replay (engine.ts) for streams whose cancellations stay close
 * together, such as the wide and textbook oracles (a million clauses' wide oracle cancels 4 gates
 * of its 11 million template instances, all at the mark's root, and the textbook oracle cancels
 * one H pair per clause on its reused V-chain wire, two operations apart), without the engine's
 * per-wire copies of old instances.
 *
 * The engine walks every gate that can leave its template back along its target. Most walks
 * stop at the first gate they meet: a gate acting there in another role (Z, X or other, as
 * commute.ts's roles) stops them unless it undoes them, and an undoing gate acts in the same
 * role. So the sweep keeps, per wire, a summary of the gates since the wire's last change of role
 * (the "stretch" a walk of that role could pass): the role, how many gates, which phase kinds, an
 * X, whether one or more gates on several qubits (and a hash of the last one's kind and wires),
 * the kind of the newest gate. A walk is replayed (as the engine does it, over a short ring of
 * recent instances) only when the summary says it could find a partner; otherwise it stops without
 * one, as the engine's would. Once a gate on a wire is cancelled the wire's summary no longer
 * bounds its stretch (the stretch may now reach past the cancelled gate): every walk of the
 * stretch's role along that wire is replayed until the wire changes role again (a walk of
 * another role still stops at the newest gate, which is live and known).
 *
 * The tally (levels, merge-phases, counts) is the engine's (tally.ts). The sweep gives up
 * (returns null: run the engine) where the engine would need more than the ring (a walk reaching
 * an instance that left it, a cancellation reaching an instance already counted), or where the
 * engine would report an upper bound.
 * test/cost/sweep.test.ts holds its figures equal to the engine's.
 */
import { INVERSE_KIND, K, ROLE_OTHER, ROLE_X, ROLE_Z } from "../ir/kinds.js";
import type { EngineResult, WireMemory } from "./engine.js";
import type { InstanceSink } from "./lowering.js";
import {
  FIRST_TOUCH, G_COND, G_KIND, G_NQ, G_OP, G_PHASE, G_ROLE, GATE_START, LAST_TOUCH, SLOT_GATES, SLOTS, TEMPLATE_COUNT, WINDOW,
  exitingGates, gatesOf,
} from "./templates.js";
import { InstanceTally } from "./tally.js";
import { WireReuse } from "./reuse.js";
import { EXIT0, findPartner, GATE_SLOT_INDEX, markRecheck, restageWalks, type WalkStore } from "./walks.js";

/** Instances kept (a power of two) and instances replayed before one is counted. */
const RING = 1 << 10;
const LAG = RING >> 2;

/** Summary modes: the role of the wire's current stretch. */
const MODE_NONE = 0;
const MODE_Z = 1;
const MODE_X = 2;
const MODE_OTHER = 3;
/** In `cnt`: the stretch may reach past a cancelled gate (replay every walk). */
const DIRTY = 128;
const COUNT_MASK = 127;
/**
 * In `flags`: a phase gate of eighths k (bit PHASE_BIT[k]), an X, a gate on several qubits, any
 * other one-qubit gate, two gates on several qubits (then `mh` no longer says which they are).
 */
const PHASE_BIT = [0, 1, 2, 0, 4, 0, 8, 16];
const F_X = 32;
const F_MULTI = 64;
const F_ODD = 128;
const F_MULTI2 = 256;

/** A hash of a gate's kind and operand wires in order (equal gates, equal hashes). */
function gateHash(kind: number, nq: number, w0: number, w1: number, w2: number): number {
  let h = Math.imul(kind + 1, 0x9e3779b1);
  h = Math.imul(h ^ w0, 0x85ebca6b);
  if (nq > 1) h = Math.imul(h ^ w1, 0xc2b2ae35);
  if (nq > 2) h = Math.imul(h ^ w2, 0x27d4eb2f);
  return (h ^ (h >>> 15)) | 1; // never 0 (none)
}

/** Thrown to stop the stream where the sweep gives up. */
class GiveUp extends Error {}

/** Options of a sweep. */
export interface SweepOptions {
  /** Search + target qubits: ids below this are wires themselves. */
  readonly base: number;
  /** Depth, T-depth and merge-phases (false: Toffolis, T and CNOTs only). */
  readonly levels: boolean;
  /** Wires expected (sizes the per-wire tables once). */
  readonly wires?: number;
  /** Qubit ids expected. */
  readonly ids?: number;
  /** The per-wire tables' memory, shared with the other runs of a cost table (see EngineOptions.wireMemory). */
  readonly wireMemory?: WireMemory;
  /** As EngineOptions.keepFreed: report when the last this-many wires still free at the end were freed. */
  readonly keepFreed?: number;
}

/** Summary flag a live gate adds on its slot s: FLAG_OF[e * 3 + s] (0 where it does not touch s). */
const FLAG_OF = new Uint8Array(GATE_START[TEMPLATE_COUNT]! * 3);
for (let e = 0; e < GATE_START[TEMPLATE_COUNT]!; e++) {
  const nq = G_NQ[e]!;
  for (let i = 0; i < nq; i++) {
    const s = G_OP[e * 3 + i]!;
    const role = G_ROLE[e * 3 + s]!;
    if (nq > 1) FLAG_OF[e * 3 + s] = F_MULTI;
    else if (role === ROLE_Z && G_PHASE[e]! >= 0) FLAG_OF[e * 3 + s] = PHASE_BIT[G_PHASE[e]!]!;
    else if (role === ROLE_X && G_KIND[e] === K.x) FLAG_OF[e * 3 + s] = F_X;
    else FLAG_OF[e * 3 + s] = F_ODD;
  }
}

/** A summary: mode, count (with DIRTY), flags, kind of the last gate, hash of the last gate on several qubits (0: none). */
interface Summary {
  mode: number;
  cnt: number;
  flags: number;
  lastKind: number;
  mh: number;
}

/** Adds a live gate of the given role, flag, kind and hash to a summary (the rule of the whole sweep). */
function addTo(m: Summary, role: number, flag: number, kind: number, hash: number): void {
  const mode = role === ROLE_Z ? MODE_Z : role === ROLE_X ? MODE_X : MODE_OTHER;
  const c = m.cnt;
  if (mode !== MODE_OTHER && mode === m.mode) {
    m.cnt = (c & DIRTY) | Math.min(COUNT_MASK, (c & COUNT_MASK) + 1);
    if ((flag & F_MULTI) !== 0) {
      if ((m.flags & F_MULTI) !== 0) m.flags |= F_MULTI2;
      m.mh = hash;
    }
    m.flags |= flag;
  } else {
    // A change of role: the gate before bounds the new stretch (unless it is cancelled later),
    // and a gate of role "other" bounds it itself. After a cancellation the role of the live
    // gate before is not known: the wire stays dirty until a change is seen.
    m.cnt = (c & DIRTY) !== 0 && m.mode === MODE_NONE && mode !== MODE_OTHER ? DIRTY | 1 : 1;
    m.mode = mode;
    m.flags = flag;
    m.mh = (flag & F_MULTI) !== 0 ? hash : 0;
  }
  m.lastKind = kind;
}

/** A wire's summary as one number (see SweepCounter.sum). */
function pack(m: Summary): number {
  return m.mode | (m.cnt << 2) | (m.flags << 10) | (m.lastKind << 19);
}

function unpack(m: Summary, v: number, mh: number): void {
  m.mode = v & 3;
  m.cnt = (v >>> 2) & 255;
  m.flags = (v >>> 10) & 511;
  m.lastKind = (v >>> 19) & 255;
  m.mh = mh;
}

/** A wire with no gate yet. */
const EMPTY_SUM = 255 << 19;

/**
 * What the live gates of one slot of a template do to the summary of its wire, folded once:
 * either a stretch of one role (accumulated onto the wire's when it has that role), or, when the
 * role changes inside or a gate has role "other", a summary of their own from the last change on.
 */
interface SlotFold {
  /** Live gates on the slot. */
  readonly n: number;
  /** The role changes between two of them, or one has role "other": `fixed` is the result. */
  readonly breaks: boolean;
  /** Without a break: their role and flags (F_MULTI2 with two gates on several qubits). */
  readonly role: number;
  readonly flag: number;
  /** The last gate on several qubits of the final stretch (-1: none), whose hash goes to `mh`. */
  readonly lastMulti: number;
  /** The summary they make from an empty one (with a break: whatever the wire had). */
  readonly fixed: Summary;
}

const foldCache = new Map<number, SlotFold>();
/** A direct-mapped cache in front of the map (folds of instances with cancelled gates, per instance). */
const FRONT_BITS = 10;
const frontKey = new Float64Array(1 << FRONT_BITS).fill(-1);
const frontVal: SlotFold[] = new Array<SlotFold>(1 << FRONT_BITS);

/** The fold of the first `upto` gates of slot s of template t (all of them by default), gates `dead` left out. */
function slotFold(t: number, dead: number, s: number, upto = SLOT_GATES[t * 3 + s]!.length): SlotFold {
  const hi = (t * 3 + s) * 64 + upto;
  const key = hi * 4294967296 + (dead >>> 0);
  const h = (Math.imul(dead, 0x9e3779b1) ^ Math.imul(hi, 0x85ebca6b)) >>> (32 - FRONT_BITS);
  if (frontKey[h] === key) return frontVal[h]!;
  let f = foldCache.get(key);
  if (f !== undefined) {
    frontKey[h] = key;
    frontVal[h] = f;
    return f;
  }
  const list = SLOT_GATES[t * 3 + s]!.subarray(0, upto);
  const base = GATE_START[t]!;
  let n = 0;
  let breaks = false;
  let role = -1;
  let flag = 0;
  let lastMulti = -1;
  const fixed: Summary = { mode: MODE_NONE, cnt: 0, flags: 0, lastKind: 255, mh: 0 };
  for (let i = 0; i < list.length; i++) {
    if ((dead >>> list[i]!) & 1) continue;
    const e = base + list[i]!;
    const r = G_ROLE[e * 3 + s]!;
    if ((n > 0 && r !== role) || r === ROLE_OTHER) breaks = true;
    role = r;
    const fl = FLAG_OF[e * 3 + s]!;
    if ((fl & F_MULTI) !== 0 && (flag & F_MULTI) !== 0) flag |= F_MULTI2;
    flag |= fl;
    // The hash is the instance's: 1 marks "some" here; fold() puts the real one.
    addTo(fixed, r, fl, G_KIND[e]!, 1);
    if (fixed.mh === 0) lastMulti = -1;
    else if ((fl & F_MULTI) !== 0) lastMulti = e;
    n++;
  }
  f = { n, breaks, role, flag, lastMulti, fixed };
  foldCache.set(key, f);
  return f;
}

const FOLD0: SlotFold[] = [];
for (let t = 0; t < TEMPLATE_COUNT; t++) for (let s = 0; s < 3; s++) FOLD0[t * 3 + s] = slotFold(t, 0, s);
/** With nothing dead: the fold of the gates before gate e on its target's slot, PRE0[e]. */
const PRE0: SlotFold[] = [];
for (let t = 0; t < TEMPLATE_COUNT; t++) {
  for (let e = GATE_START[t]!; e < GATE_START[t + 1]!; e++) {
    const nq = G_NQ[e]!;
    const ts = nq > 0 ? G_OP[e * 3 + nq - 1]! : 0;
    PRE0[e] = slotFold(t, 0, ts, nq > 0 ? GATE_SLOT_INDEX[e * 3 + ts]! : 0);
  }
}

/**
 * Counts a stream of template instances as the engine does (optimizer on), or gives up. Use
 * through {@link sweepCount}.
 */
export class SweepCounter implements InstanceSink, WalkStore {
  private readonly base: number;
  // Instances, in a ring (as the engine's).
  readonly rT = new Uint8Array(RING);
  readonly rW = new Int32Array(RING * 3);
  readonly rDead = new Int32Array(RING);
  readonly rMask1 = new Int32Array(RING);
  readonly rRecheck = new Int32Array(RING);
  readonly rPrev = new Int32Array(RING * 3);
  readonly rPrevSlot = new Int8Array(RING * 3);
  readonly ringMask = RING - 1;
  /** The oldest instance still in the ring. */
  ringLow = 0;
  /** No copies of instances that left the ring, no left-out parts (see walks.ts's WalkStore). */
  readonly cp = new Int32Array(0);
  readonly truncated = null;
  readonly truncatedHits: number[] = [];
  private nextId = 0;
  private done = 0;

  // Wires.
  // Levels as 32-bit integers, half the engine's bytes (a million clauses' wide oracle has 3.2
  // million wires): a level past 2^32 - 1 makes the sweep give up, and the engine counts.
  private lvl: Uint32Array = new Uint32Array(0);
  private tlvl: Uint32Array = new Uint32Array(0);
  private pend: Uint8Array = new Uint8Array(0);
  private readonly levels: boolean;
  private lastId: Int32Array = new Int32Array(0);
  private lastSlot: Uint8Array = new Uint8Array(0);
  /** The summary of each wire, packed: mode (bits 0-1), count with DIRTY (2-9), flags (10-18), kind of the last gate (19-26). */
  private sum: Int32Array = new Int32Array(0);
  private mh: Int32Array = new Int32Array(0);
  private wireCap = 0;

  private readonly reuse: WireReuse;
  private readonly keepFreed: number;

  private readonly tally: InstanceTally;
  private flagSecond: string | null = null;
  /** Walks replayed (a measure of how often the summaries could not decide). */
  walks = 0;
  /** Why the sweep gave up, or null. */
  gaveUp: string | null = null;

  private readonly wireMemory: WireMemory | null;

  constructor(opts: SweepOptions) {
    this.base = opts.base;
    this.tally = new InstanceTally(opts.levels, true);
    this.levels = opts.levels;
    this.wireMemory = opts.wireMemory ?? null;
    this.keepFreed = opts.keepFreed ?? 0;
    this.growWires(Math.max(64, opts.base + 64, opts.wires ?? 0));
    this.reuse = new WireReuse(opts.base, opts.ids ?? 0, (opts.keepFreed ?? 0) > 0);
  }

  /** Bytes per wire of the tables below (levels, T-levels and phase runs only when levels are wanted). */
  private wireBytes(): number {
    return (this.levels ? 4 + 4 + 1 : 0) + 4 + 4 + 4 + 1;
  }

  private growWires(n: number): void {
    if (n <= this.wireCap) return;
    const cap = Math.max(n, Math.ceil(this.wireCap * 1.5));
    const held = this.wireMemory?.buffer ?? null;
    let buf: ArrayBuffer;
    if (this.wireCap === 0 && held !== null && held.byteLength >= cap * this.wireBytes()) buf = held;
    else {
      buf = new ArrayBuffer(cap * this.wireBytes());
      if (this.wireMemory !== null) this.wireMemory.buffer = buf;
    }
    let at = 0;
    const u32 = (old: Uint32Array): Uint32Array => {
      if (!this.levels) return old;
      const b = new Uint32Array(buf, at, cap);
      at += 4 * cap;
      b.set(old);
      b.fill(0, old.length);
      return b;
    };
    const i32 = (old: Int32Array, fill: number): Int32Array => {
      const b = new Int32Array(buf, at, cap);
      at += 4 * cap;
      b.set(old);
      b.fill(fill, old.length);
      return b;
    };
    const u8 = (old: Uint8Array, fill: number): Uint8Array => {
      const b = new Uint8Array(buf, at, cap);
      at += cap;
      b.set(old);
      b.fill(fill, old.length);
      return b;
    };
    this.lvl = u32(this.lvl);
    this.tlvl = u32(this.tlvl);
    this.lastId = i32(this.lastId, -1);
    this.mh = i32(this.mh, 0);
    this.sum = i32(this.sum, EMPTY_SUM);
    this.pend = this.levels ? u8(this.pend, 0) : this.pend;
    this.tally.lvl = this.lvl;
    this.tally.tlvl = this.tlvl;
    this.tally.pend = this.pend;
    this.lastSlot = u8(this.lastSlot, 0);
    this.wireCap = cap;
  }

  private giveUp(reason: string): never {
    this.gaveUp = reason;
    throw new GiveUp(reason);
  }

  private wireFor(v: number): number {
    const w = this.reuse.wireFor(v);
    if (w >= this.wireCap) this.growWires(w + 1);
    return w;
  }

  put(t: number, a: number, b: number, c: number, dies: number): void {
    const id = this.nextId++;
    // This instance takes the ring slot of the one RING before it.
    if (id >= RING) this.ringLow = id - RING + 1;
    if (id > 0x7ffffff0) this.giveUp("more than 2^31 template instances");
    const x = id & (RING - 1);
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
      this.rPrev[x * 3 + s] = this.lastId[w]!;
      this.rPrevSlot[x * 3 + s] = this.lastSlot[w]!;
      this.lastId[w] = id;
      this.lastSlot[w] = s;
    }
    this.cancel(id, x);
    this.rMask1[x] = this.rDead[x]!;
    if (dies !== 0) {
      const order = LAST_TOUCH[t]!;
      for (let i = 0; i < order.length; i++) {
        const s = order[i]!;
        if (((dies >>> s) & 1) === 0) continue;
        this.reuse.release(s === 0 ? a : s === 1 ? b : c, id);
      }
    }
    while (this.done <= id - LAG) this.settle(this.done);
  }

  /** The engine's figures, or null where the sweep gave up. */
  finish(): EngineResult | null {
    if (this.gaveUp !== null) return null;
    try {
      while (this.done < this.nextId) this.settle(this.done);
    } catch (e) {
      if (e instanceof GiveUp) return null;
      throw e;
    }
    const wires = this.base + this.reuse.workWires;
    const { depth, tDepth } = this.tally.finish(wires);
    const tally = this.tally;
    if (tally.overflow) {
      this.gaveUp = "a level past 2^32 - 1";
      return null;
    }
    // As the engine: the second cancel-inverses runs only when merge-phases met two phase gates.
    if (tally.phaseGates >= 2 && this.flagSecond !== null) {
      this.gaveUp = this.flagSecond;
      return null;
    }
    return {
      qubits: wires, tCount: tally.tCount, tDepth, cnotCount: tally.cnotCount, toffoliCount: tally.toffoliCount,
      depth, measurements: tally.measurements, instances: this.nextId, exact: true, upperBound: false, reason: null,
      historyShort: false, lagShort: false, secondNeeded: false,
      ...(this.keepFreed > 0 ? { freedAt: this.reuse.freedAt(this.keepFreed) } : {}),
    };
  }

  // ---- the summaries -----------------------------------------------------------------------

  /**
   * Whether gate p of the instance at ring index x (dead gates `dead`) could find a partner
   * walking along its target's wire, by that wire's summary as it stands before the gate (false:
   * its walk stops without one, as the engine's would).
   */
  private mayPair(x: number, t: number, dead: number, p: number): boolean {
    const e = GATE_START[t]! + p;
    if (G_COND[e]) return false; // undoes nothing (commute.ts), and stops at its first gate
    const nq = G_NQ[e]!;
    const ts = G_OP[e * 3 + nq - 1]!;
    const w = this.rW[x * 3 + ts]!;
    const m = this.at;
    unpack(m, this.sum[w]!, this.mh[w]!);
    // With the instance's own live gates before it on that slot.
    this.combine(m, x, dead === 0 ? PRE0[e]! : slotFold(t, dead, ts, GATE_SLOT_INDEX[e * 3 + ts]!));
    const c = m.cnt;
    // A dirty wire: the stretch may reach past a cancelled gate. But every gate added since the
    // last cancellation on it is live (a cancellation resets the mode to none), so while the mode
    // is known the newest gate is known: a walk of another role stops there, and a walk of role
    // "other" pairs only with it.
    const known = (c & DIRTY) === 0 || m.mode !== MODE_NONE;
    const role = G_ROLE[e * 3 + ts]!;
    if (role === ROLE_OTHER) return !known || INVERSE_KIND[G_KIND[e]!] === m.lastKind;
    if ((role === ROLE_Z ? MODE_Z : MODE_X) !== m.mode) return !known;
    if ((c & DIRTY) !== 0) return true;
    if ((c & COUNT_MASK) >= WINDOW - 1) return true;
    // A walker passes every gate of its stretch that shares only this wire with it; its partner
    // has its kind's inverse and as many qubits.
    const f = m.flags;
    if (nq > 1) {
      // Its partner would be the gate of the inverse kind on the same wires in the same order.
      if ((f & F_MULTI2) !== 0) return true;
      if ((f & F_MULTI) === 0) return false;
      const w0 = this.rW[x * 3 + G_OP[e * 3]!]!;
      const w1 = this.rW[x * 3 + G_OP[e * 3 + 1]!]!;
      const w2 = nq > 2 ? this.rW[x * 3 + G_OP[e * 3 + 2]!]! : -1;
      return m.mh === gateHash(INVERSE_KIND[G_KIND[e]!]!, nq, w0, w1, w2);
    }
    if ((f & F_ODD) !== 0) return true;
    if (role === ROLE_Z) {
      const k = G_PHASE[e]!;
      return k < 0 || (f & PHASE_BIT[(8 - k) & 7]!) !== 0;
    }
    return G_KIND[e] !== K.x || (f & F_X) !== 0;
  }

  private readonly at: Summary = { mode: 0, cnt: 0, flags: 0, lastKind: 255, mh: 0 };

  /** gateHash of gate e of the instance at ring index x. */
  private hashOf(x: number, e: number): number {
    const nq = G_NQ[e]!;
    const w0 = this.rW[x * 3 + G_OP[e * 3]!]!;
    const w1 = nq > 1 ? this.rW[x * 3 + G_OP[e * 3 + 1]!]! : -1;
    const w2 = nq > 2 ? this.rW[x * 3 + G_OP[e * 3 + 2]!]! : -1;
    return gateHash(G_KIND[e]!, nq, w0, w1, w2);
  }

  /** Folds gates of the instance at ring index x (as folded in f) into summary m. */
  private combine(m: Summary, x: number, f: SlotFold): void {
    if (f.n === 0) return;
    if (f.breaks) {
      m.mode = f.fixed.mode;
      m.cnt = f.fixed.cnt;
      m.flags = f.fixed.flags;
      m.lastKind = f.fixed.lastKind;
      m.mh = f.lastMulti >= 0 ? this.hashOf(x, f.lastMulti) : 0;
      return;
    }
    const mode = f.role === ROLE_Z ? MODE_Z : MODE_X;
    const c = m.cnt;
    const n = Math.min(COUNT_MASK, f.n);
    if (mode === m.mode) {
      m.cnt = (c & DIRTY) | Math.min(COUNT_MASK, (c & COUNT_MASK) + n);
      m.flags = m.flags | f.flag | ((m.flags & f.flag & F_MULTI) !== 0 ? F_MULTI2 : 0);
      if (f.lastMulti >= 0) m.mh = this.hashOf(x, f.lastMulti);
    } else {
      m.cnt = (c & DIRTY) !== 0 && m.mode === MODE_NONE ? DIRTY | n : n;
      m.mode = mode;
      m.flags = f.flag;
      m.mh = f.lastMulti >= 0 ? this.hashOf(x, f.lastMulti) : 0;
    }
    m.lastKind = f.fixed.lastKind;
  }

  /** Folds the instance's live gates into the summaries of its wires. */
  private fold(x: number, t: number, dead: number): void {
    const m = this.at;
    for (let s = 0; s < SLOTS[t]!; s++) {
      const f = dead === 0 ? FOLD0[t * 3 + s]! : slotFold(t, dead, s);
      if (f.n === 0) continue;
      const w = this.rW[x * 3 + s]!;
      unpack(m, this.sum[w]!, this.mh[w]!);
      this.combine(m, x, f);
      this.sum[w] = pack(m);
      this.mh[w] = m.mh;
    }
  }

  /** A gate on these wires was cancelled: their stretches may now reach past it. */
  private dirty(x: number, e: number): void {
    for (let i = 0; i < G_NQ[e]!; i++) {
      const w = this.rW[x * 3 + G_OP[e * 3 + i]!]!;
      this.sum[w] = (this.sum[w]! & ~3) | (DIRTY << 2);
    }
  }

  // ---- cancel-inverses (engine.ts's, over the ring) -----------------------------------------

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
      if (dead !== known) {
        known = dead;
        exits = exitingGates(t, dead);
      }
      const e = base + p;
      if (((exits >>> p) & 1) !== 0) {
        const kind = G_KIND[e]!;
        const nq = G_NQ[e]!;
        if (nq !== 0 && kind !== K.measure && kind !== K.reset) {
          const partner = this.mayPair(x, t, dead, p) ? findPartner(this, id, x, p) : -1;
          if (partner >= 0) {
            const hid = Math.floor(partner / 32);
            const hp = partner % 32;
            if (hid < this.done) this.giveUp("a cancellation reached a part already counted");
            const hx = hid & (RING - 1);
            this.rDead[hx] = this.rDead[hx]! | (1 << hp);
            this.rDead[x] = this.rDead[x]! | (1 << p);
            this.dirty(x, e);
            for (let i = 0; i < nq; i++) markRecheck(this, x, G_OP[e * 3 + i]!, hid);
            this.rRecheck[x] = this.rRecheck[x]! | walked;
            continue;
          }
          walked |= 1 << p;
        }
      }
    }
    this.fold(x, t, this.rDead[x]!);
  }


  /** Nothing older than the ring is kept. */
  locate(): number {
    return -1;
  }

  unavailable(): void {
    this.giveUp("a walk reached an instance no longer kept");
  }

  noteSecond(reason: string): void {
    if (this.flagSecond === null) this.flagSecond = reason;
  }

  // ---- stage 2 (detecting) and the tally: engine.ts's settle --------------------------------

  private settle(id: number): void {
    const x = id & (RING - 1);
    const t = this.rT[x]!;
    const dead = this.rDead[x]!;
    const slots = SLOTS[t]!;
    this.done = id + 1;
    if (this.flagSecond === null && (this.rRecheck[x] !== 0 || dead !== this.rMask1[x])) {
      restageWalks(this, x, (p) => {
        if (findPartner(this, id, x, p) < 0) return true;
        this.noteSecond("the second cancel-inverses would cancel more");
        return false;
      });
    }
    const w0 = slots > 0 ? this.rW[x * 3]! : -1;
    const w1 = slots > 1 ? this.rW[x * 3 + 1]! : -1;
    const w2 = slots > 2 ? this.rW[x * 3 + 2]! : -1;
    if (this.tally.add(t, dead, w0, w1, w2)) this.noteSecond("merge-phases removed a run of phase gates alone");
  }
}

/**
 * Runs `emit` into a sweep; the engine's figures for that stream (optimizer on), or null where
 * the sweep gave up (the caller then runs the engine).
 */
export function sweepCount(opts: SweepOptions, emit: (sink: SweepCounter) => void): EngineResult | null {
  const sweep = new SweepCounter(opts);
  try {
    emit(sweep);
  } catch (e) {
    if (e instanceof GiveUp) return null;
    throw e;
  }
  return sweep.finish();
}
