/**
 * What one template instance (with some of its gates cancelled) does to the ASAP tally, as a
 * max-plus map: the level of each slot's wire afterwards is the largest of (level of input j +
 * d[j]) over the slots' wires before it and the classical bit it reads. Levels and T-levels are
 * separate maps (emit/resources.ts computes them independently). merge-phases is part of it: a
 * phase gate only adds to its wire's pending run, and a gate that is not diagonal on a wire first
 * places the run's merged phase there (passes/mergePhases.ts), so the map also depends on the
 * pending runs it finds and says what it leaves.
 *
 * Computed once per (template, cancelled gates, pending runs, optimize) and cached.
 */
import { K } from "../ir/kinds.js";
import { G_COND, G_IS_T, G_KIND, G_NQ, G_OP, G_PHASE, G_ROLE, GATE_START, gatesOf, ROLE_Z, SLOTS } from "./templates.js";

/** Pending run on a wire: phase in eighths (bits 0-2), a phase gate in the run (8), a gate diagonal there (16). */
export const HAS_PHASE = 8;
export const HAS_Z = 16;

/** Shortest gate sequence for a phase of k eighths (merge-phases' table). */
const SEQUENCE: readonly (readonly number[])[] = [
  [], [K.t], [K.s], [K.s, K.t], [K.z], [K.z, K.t], [K.sdg], [K.tdg],
];

/** "No path" in a map. */
export const NONE = -1;

export interface Transfer {
  /** Slots of the template. */
  readonly slots: number;
  /** d[s * 4 + j]: path length from input j (slot 0..2, 3 = the bit read) to slot s's level; NONE when none. */
  readonly d: Int32Array;
  /** The same for T-levels. */
  readonly dt: Int32Array;
  /** Path lengths to the measured bit (d[j] of its level), or null when nothing is measured. */
  readonly bit: Int32Array | null;
  /** The same for the bit's T-level. */
  readonly bitT: Int32Array | null;
  /** Pending runs left on each slot. */
  readonly pendOut: Uint8Array;
  readonly tCount: number;
  readonly cnotCount: number;
  readonly toffoliCount: number;
  readonly measurements: number;
  /** Phase gates met (merged or not). */
  readonly phaseGates: number;
  /** A run made of phase gates alone merged to nothing here (see engine.ts). */
  readonly vanished: boolean;
}

const cache = new Map<number, Transfer>();
/** A direct-mapped cache in front of the map (this runs once per template instance). */
const FRONT_BITS = 13;
const frontKey = new Float64Array(1 << FRONT_BITS).fill(-1);
const frontVal: Transfer[] = new Array<Transfer>(1 << FRONT_BITS);

/** The transfer of template t with cancelled gates `dead`, pending runs p0..p2 on its slots. */
export function transferOf(t: number, dead: number, p0: number, p1: number, p2: number, optimize: boolean): Transfer {
  const hi = ((optimize ? 16 : 0) + t) * 32 + (dead >>> 27);
  const lo = ((dead & 0x7ffffff) * 32768 + (p0 | (p1 << 5) | (p2 << 10)));
  const key = hi * 2 ** 42 + lo;
  const h = (Math.imul(lo | 0, 0x9e3779b1) ^ Math.imul((lo / 4294967296) | 0 ^ hi, 0x85ebca6b)) >>> (32 - FRONT_BITS);
  if (frontKey[h] === key) return frontVal[h]!;
  let tr = cache.get(key);
  if (tr === undefined) {
    tr = compute(t, dead, [p0, p1, p2], optimize);
    cache.set(key, tr);
  }
  frontKey[h] = key;
  frontVal[h] = tr;
  return tr;
}

/** Max-plus vectors over the 4 inputs. */
type Vec = Int32Array;

function unit(j: number): Vec {
  const v = new Int32Array(4).fill(NONE);
  v[j] = 0;
  return v;
}

function compute(t: number, dead: number, pend: number[], optimize: boolean): Transfer {
  const slots = SLOTS[t]!;
  const lv: Vec[] = [unit(0), unit(1), unit(2)];
  const tv: Vec[] = [unit(0), unit(1), unit(2)];
  let bitL: Vec = unit(3);
  let bitT: Vec = unit(3);
  let measured = false;
  let tCount = 0;
  let cnotCount = 0;
  let toffoliCount = 0;
  let measurements = 0;
  let phaseGates = 0;
  let vanished = false;
  const bump = (v: Vec, by: number): void => {
    for (let j = 0; j < 4; j++) if (v[j]! !== NONE) v[j]! += by;
  };
  const flush = (s: number): void => {
    const st = pend[s]!;
    pend[s] = 0;
    if ((st & HAS_PHASE) === 0) return;
    const k = st & 7;
    if (k === 0 && (st & HAS_Z) === 0) vanished = true;
    for (const kind of SEQUENCE[k]!) {
      const isT = kind === K.t || kind === K.tdg;
      bump(lv[s]!, 1);
      if (isT) {
        bump(tv[s]!, 1);
        tCount++;
      }
    }
  };
  const base = GATE_START[t]!;
  for (let p = 0; p < gatesOf(t); p++) {
    if ((dead >>> p) & 1) continue;
    const e = base + p;
    const kind = G_KIND[e]!;
    if (kind === K.gphase) continue;
    if (optimize && G_PHASE[e]! >= 0) {
      const s = G_OP[e * 3]!;
      const st = pend[s]!;
      pend[s] = (((st & 7) + G_PHASE[e]!) & 7) | HAS_PHASE | (st & HAS_Z);
      phaseGates++;
      continue;
    }
    if (!optimize && G_PHASE[e]! >= 0) phaseGates++;
    const nq = G_NQ[e]!;
    const l = G_COND[e] ? Int32Array.from(bitL) : new Int32Array(4).fill(NONE);
    const tl = G_COND[e] ? Int32Array.from(bitT) : new Int32Array(4).fill(NONE);
    for (let i = 0; i < nq; i++) {
      const s = G_OP[e * 3 + i]!;
      if (optimize) {
        if (G_ROLE[e * 3 + s] !== ROLE_Z) flush(s);
        else pend[s] = pend[s]! | HAS_Z;
      }
      for (let j = 0; j < 4; j++) {
        l[j] = Math.max(l[j]!, lv[s]![j]!);
        tl[j] = Math.max(tl[j]!, tv[s]![j]!);
      }
    }
    bump(l, 1);
    if (G_IS_T[e]) {
      bump(tl, 1);
      tCount++;
    }
    for (let i = 0; i < nq; i++) {
      const s = G_OP[e * 3 + i]!;
      lv[s] = Int32Array.from(l);
      tv[s] = Int32Array.from(tl);
    }
    if (kind === K.cx || kind === K.cz) cnotCount++;
    else if (kind === K.ccx) toffoliCount++;
    else if (kind === K.measure) {
      measurements++;
      bitL = Int32Array.from(l);
      bitT = Int32Array.from(tl);
      measured = true;
    }
  }
  const d = new Int32Array(12).fill(NONE);
  const dt = new Int32Array(12).fill(NONE);
  for (let s = 0; s < slots; s++) {
    for (let j = 0; j < 4; j++) {
      d[s * 4 + j] = lv[s]![j]!;
      dt[s * 4 + j] = tv[s]![j]!;
    }
  }
  return {
    slots, d, dt, bit: measured ? bitL : null, bitT: measured ? bitT : null, pendOut: Uint8Array.from(pend),
    tCount, cnotCount, toffoliCount, measurements, phaseGates, vanished,
  };
}

/** merge-phases' flush of a wire's pending run at the end of the circuit: (gates, T gates). */
export function finalRun(st: number): { gates: number; tGates: number; vanished: boolean } {
  if ((st & HAS_PHASE) === 0) return { gates: 0, tGates: 0, vanished: false };
  const seq = SEQUENCE[st & 7]!;
  const tGates = seq.filter((k) => k === K.t || k === K.tdg).length;
  return { gates: seq.length, tGates, vanished: (st & 7) === 0 && (st & HAS_Z) === 0 };
}
