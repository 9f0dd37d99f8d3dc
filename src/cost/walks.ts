/**
 * cancel-inverses' walks (passes/cancelInverses.ts) over template instances: findPartner,
 * clearBetween and the stage-2 repeats, for the counting engine (engine.ts: a ring of recent
 * instances and per-wire copies of older ones) and the sweep (sweep.ts: the ring alone).
 */
import { G_KIND, G_NQ, G_OP, G_ROLE, GATE_START, SLOT_GATES, TEMPLATE_COUNT, WINDOW, commuteOn, exitingGates, inverseOn, ROLE_Z } from "./templates.js";
import { K } from "../ir/kinds.js";

/** The instances a walk reads. */
export interface WalkStore {
  /** Ring of instances (index id & ringMask): template, wires per slot, cancelled gates, the previous instance on each slot's wire and its slot there. */
  readonly rT: Uint8Array;
  readonly rW: Int32Array;
  readonly rDead: Int32Array;
  readonly rPrev: Int32Array;
  readonly rPrevSlot: Int8Array;
  /** Per instance: gates cancelled right after its own stage 1; gates whose stage-2 walk is repeated (-1: all). */
  readonly rMask1: Int32Array;
  readonly rRecheck: Int32Array;
  readonly ringMask: number;
  /** The oldest instance still in the ring. */
  readonly ringLow: number;
  /**
   * Copies of instances that left the ring, 8 ints each (+0 id, +1 template, +2..4 wires, +5
   * cancelled gates, +6 previous instance on the wire, +7 its slot); a copy is located as
   * -2 - its index. Empty where nothing is copied.
   */
  readonly cp: Int32Array;
  /** Wires whose gates before the first one put were left out (see EngineOptions.truncated), and the hits. */
  readonly truncated: Uint8Array | null;
  readonly truncatedHits: number[];
  /** Where instance `id`, no longer in the ring, is kept, seen from wire w: -2 - its copy's index, or -1. */
  locate(id: number, w: number): number;
  /** The second cancel-inverses might act (see engine.ts). */
  noteSecond(reason: string): void;
  /** A walk needed an instance no longer kept. */
  unavailable(): void;
}

/** The gates of each template whose walk can leave it when nothing is cancelled (templates.ts's exitingGates). */
export const EXIT0 = Int32Array.from({ length: TEMPLATE_COUNT }, (_, t) => exitingGates(t, 0));

/** Index of gate e in its slot's list, per slot: GATE_SLOT_INDEX[e * 3 + s]. */
export const GATE_SLOT_INDEX = new Int8Array(GATE_START[TEMPLATE_COUNT]! * 3).fill(-1);
for (let t = 0; t < TEMPLATE_COUNT; t++) {
  for (let s = 0; s < 3; s++) {
    const list = SLOT_GATES[t * 3 + s]!;
    for (let i = 0; i < list.length; i++) GATE_SLOT_INDEX[(GATE_START[t]! + list[i]!) * 3 + s] = i;
  }
}

const inversePair = (st: WalkStore, x: number, e: number, loc: number, f: number): boolean =>
  inverseOn(e, st.rW, x * 3, f, loc >= 0 ? st.rW : st.cp, loc >= 0 ? loc * 3 : -loc);

const commute = (st: WalkStore, x: number, e: number, loc: number, f: number): boolean =>
  commuteOn(e, st.rW, x * 3, f, loc >= 0 ? st.rW : st.cp, loc >= 0 ? loc * 3 : -loc);

/**
 * cancelInverses.ts's findPartner for gate p of instance `id` (at ring index x): the most recent
 * live gate that undoes it with only commuting gates between, as id * 32 + position, or -1.
 */
export function findPartner(st: WalkStore, id: number, x: number, p: number): number {
  const t = st.rT[x]!;
  const e = GATE_START[t]! + p;
  const nq = G_NQ[e]!;
  const ts = G_OP[e * 3 + nq - 1]!;
  const w = st.rW[x * 3 + ts]!;
  let steps = 0;
  let loc = x;
  let cur = id;
  let slot = ts;
  let k = GATE_SLOT_INDEX[e * 3 + ts]! - 1;
  for (;;) {
    const ct = loc >= 0 ? st.rT[loc]! : st.cp[-1 - loc]!;
    const list = SLOT_GATES[ct * 3 + slot]!;
    const dead = loc >= 0 ? st.rDead[loc]! : st.cp[3 - loc]!;
    for (; k >= 0; k--) {
      const hp = list[k]!;
      if ((dead >>> hp) & 1) continue;
      if (steps >= WINDOW) {
        // merge-phases changes how many phase gates a walk diagonal on its qubit passes (never
        // those an X-like or other walk passes: it stops at the first phase gate): only such a
        // walk could reach further in the second cancel-inverses.
        // Stage 1 notes it too: stage 2 repeats only the walks that something changed (settle).
        if (G_ROLE[e * 3 + ts] === ROLE_Z) st.noteSecond("the second cancel-inverses reaches its window");
        return -1;
      }
      steps++;
      const f = GATE_START[ct]! + hp;
      if (inversePair(st, x, e, loc, f) && clearBetween(st, id, x, p, cur, hp)) return cur * 32 + hp;
      if (!commute(st, x, e, loc, f)) return -1;
    }
    // The previous instance on this wire.
    const prev = loc >= 0 ? st.rPrev[loc * 3 + slot]! : st.cp[4 - loc]!;
    if (prev < 0) {
      if (st.truncated !== null && st.truncated[w] === 1) st.truncatedHits.push(w);
      return -1;
    }
    const ps = loc >= 0 ? st.rPrevSlot[loc * 3 + slot]! : st.cp[5 - loc]!;
    const pl = prev >= st.ringLow ? prev & st.ringMask : st.locate(prev, w);
    if (pl === -1) {
      st.unavailable();
      return -1;
    }
    loc = pl;
    cur = prev;
    slot = ps;
    k = SLOT_GATES[(loc >= 0 ? st.rT[loc]! : st.cp[-1 - loc]!) * 3 + slot]!.length - 1;
  }
}

/**
 * cancelInverses.ts's clearBetween: every live gate after gate hp of instance hid on the other
 * qubits of gate p of instance id commutes with it (at most WINDOW of them per qubit).
 */
function clearBetween(st: WalkStore, id: number, x: number, p: number, hid: number, hp: number): boolean {
  const t = st.rT[x]!;
  const e = GATE_START[t]! + p;
  const nq = G_NQ[e]!;
  for (let i = 0; i + 1 < nq; i++) {
    const s0 = G_OP[e * 3 + i]!;
    const w = st.rW[x * 3 + s0]!;
    let steps = 0;
    let loc = x;
    let cur = id;
    let slot = s0;
    let k = GATE_SLOT_INDEX[e * 3 + s0]! - 1;
    for (;;) {
      const ct = loc >= 0 ? st.rT[loc]! : st.cp[-1 - loc]!;
      const list = SLOT_GATES[ct * 3 + slot]!;
      const dead = loc >= 0 ? st.rDead[loc]! : st.cp[3 - loc]!;
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
          st.noteSecond("the second cancel-inverses reaches its window");
          return false;
        }
        if (!commute(st, x, e, loc, GATE_START[ct]! + xp)) return false;
      }
      if (stop || cur <= hid) break;
      const prev = loc >= 0 ? st.rPrev[loc * 3 + slot]! : st.cp[4 - loc]!;
      if (prev < 0) {
        if (st.truncated !== null && st.truncated[w] === 1) st.truncatedHits.push(w);
        break;
      }
      const ps = loc >= 0 ? st.rPrevSlot[loc * 3 + slot]! : st.cp[5 - loc]!;
      const pl = prev >= st.ringLow ? prev & st.ringMask : st.locate(prev, w);
      if (pl === -1) {
        st.unavailable();
        return false;
      }
      loc = pl;
      cur = prev;
      slot = ps;
      k = SLOT_GATES[(loc >= 0 ? st.rT[loc]! : st.cp[-1 - loc]!) * 3 + slot]!.length - 1;
    }
  }
  return true;
}

/** Marks the instances on the wire of slot s between instance `from` and instance x (both exclusive) for stage 2. */
export function markRecheck(st: WalkStore, x: number, s: number, from: number): void {
  let loc = x;
  let slot = s;
  for (;;) {
    const prev = st.rPrev[loc * 3 + slot]!;
    if (prev <= from || prev < st.ringLow) return;
    const pl = prev & st.ringMask;
    st.rRecheck[pl] = -1;
    slot = st.rPrevSlot[loc * 3 + slot]!;
    loc = pl;
  }
}

/**
 * The stage-2 walks of the instance at ring index x: the gates a cancellation since its stage 1
 * may let go further. `each(p)` is told of each gate to walk again; it returns false to stop.
 */
export function restageWalks(st: WalkStore, x: number, each: (p: number) => boolean): void {
  const t = st.rT[x]!;
  const dead = st.rDead[x]!;
  const later = dead ^ st.rMask1[x]!;
  const again = st.rRecheck[x]!;
  if (again === 0 && later === 0) return;
  const exits = exitingGates(t, dead);
  for (let m = exits; m !== 0; m &= m - 1) {
    const p = 31 - Math.clz32(m & -m);
    if (((again >>> p) & 1) === 0 && (later & ((1 << p) - 1)) === 0) continue;
    const e = GATE_START[t]! + p;
    const kind = G_KIND[e]!;
    if (G_NQ[e] === 0 || kind === K.measure || kind === K.reset) continue;
    if (!each(p)) return;
  }
}
