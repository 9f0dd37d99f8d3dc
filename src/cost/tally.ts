/**
 * The ASAP tally of emit/resources.ts (depth, T-depth, counts) with merge-phases, over template
 * instances whose cancelled gates are known: one level and T-level per wire, the pending phase
 * run of each wire, and the maps of transfer.ts. Shared by the counting engine (engine.ts) and the
 * sweep (sweep.ts), which differ only in how they find the cancelled gates.
 */
import { K } from "../ir/kinds.js";
import { G_KIND, G_PHASE, GATE_START, gatesOf, SLOTS } from "./templates.js";
import { finalRun, NONE, transferOf } from "./transfer.js";

/** The largest level 32-bit level tables hold. */
const LEVEL_LIMIT = 0xffffffff;

export class InstanceTally {
  tCount = 0;
  cnotCount = 0;
  toffoliCount = 0;
  measurements = 0;
  /** Phase gates met (merge-phases runs only when there are two or more). */
  phaseGates = 0;
  private bitL = 0;
  private bitTL = 0;
  /**
   * Per wire: level, T-level, pending phase run (transfer.ts); the owner carves and grows them
   * (the sweep keeps levels in 32 bits and reads `overflow`).
   */
  lvl: Float64Array | Uint32Array = new Float64Array(0);
  tlvl: Float64Array | Uint32Array = new Float64Array(0);
  pend: Uint8Array = new Uint8Array(0);
  /** A level went past 2^32 - 1 (32-bit levels then hold wrong values). A T-level is never above its level. */
  overflow = false;

  /** `levels`: depth, T-depth and merge-phases (false: counts alone); `optimize`: the passes were replayed. */
  constructor(private readonly levels: boolean, private readonly optimize: boolean) {}

  /**
   * Tallies instance t (gates `dead` cancelled) on wires w0..w2 (-1 where the template has no such
   * slot). Returns true when merge-phases removed a run of phase gates alone there.
   */
  add(t: number, dead: number, w0: number, w1: number, w2: number): boolean {
    if (!this.levels) {
      const base = GATE_START[t]!;
      const n = gatesOf(t);
      for (let p = 0; p < n; p++) {
        if ((dead >>> p) & 1) continue;
        const k = G_KIND[base + p]!;
        if (k === K.t || k === K.tdg) this.tCount++;
        else if (k === K.cx || k === K.cz) this.cnotCount++;
        else if (k === K.ccx) this.toffoliCount++;
        else if (k === K.measure) this.measurements++;
        if (G_PHASE[base + p]! >= 0) this.phaseGates++;
      }
      return false;
    }
    const slots = SLOTS[t]!;
    const pend = this.pend;
    const tr = transferOf(t, dead, slots > 0 ? pend[w0]! : 0, w1 >= 0 ? pend[w1]! : 0, w2 >= 0 ? pend[w2]! : 0, this.optimize);
    this.tCount += tr.tCount;
    this.cnotCount += tr.cnotCount;
    this.toffoliCount += tr.toffoliCount;
    this.measurements += tr.measurements;
    this.phaseGates += tr.phaseGates;
    if (slots === 0) return tr.vanished;
    const lv = this.lvl;
    const tv = this.tlvl;
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
    const n0 = maxPlus(d, 0, l0, l1, l2, lb);
    lv[w0] = n0;
    tv[w0] = maxPlus(dt, 0, t0, t1, t2, tb);
    pend[w0] = tr.pendOut[0]!;
    let top = n0;
    if (w1 >= 0) {
      const n1 = maxPlus(d, 4, l0, l1, l2, lb);
      lv[w1] = n1;
      tv[w1] = maxPlus(dt, 4, t0, t1, t2, tb);
      pend[w1] = tr.pendOut[1]!;
      if (n1 > top) top = n1;
    }
    if (w2 >= 0) {
      const n2 = maxPlus(d, 8, l0, l1, l2, lb);
      lv[w2] = n2;
      tv[w2] = maxPlus(dt, 8, t0, t1, t2, tb);
      pend[w2] = tr.pendOut[2]!;
      if (n2 > top) top = n2;
    }
    if (top > LEVEL_LIMIT) this.overflow = true;
    return tr.vanished;
  }

  /** merge-phases' last flush (in qubit order) and the depths over wires 0..wires-1. */
  finish(wires: number): { depth: number; tDepth: number } {
    let depth = 0;
    let tDepth = 0;
    if (!this.levels) return { depth, tDepth };
    for (let w = 0; w < wires; w++) {
      if (this.optimize) {
        const run = finalRun(this.pend[w]!);
        if (this.lvl[w]! + run.gates > LEVEL_LIMIT) this.overflow = true;
        this.lvl[w]! += run.gates;
        this.tlvl[w]! += run.tGates;
        this.tCount += run.tGates;
        this.pend[w] = 0;
      }
      depth = Math.max(depth, this.lvl[w]!);
      tDepth = Math.max(tDepth, this.tlvl[w]!);
    }
    return { depth, tDepth };
  }

  /** Counts and the measured bit back to zero (the per-wire tables are the owner's). */
  reset(): void {
    this.tCount = 0;
    this.cnotCount = 0;
    this.toffoliCount = 0;
    this.measurements = 0;
    this.phaseGates = 0;
    this.bitL = 0;
    this.bitTL = 0;
    this.overflow = false;
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
