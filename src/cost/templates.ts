/**
 * Gate templates: the fixed gate sequences that lowering emits for one step (a temporary AND, its
 * inverse, a 7-T Toffoli, a measured erasure, a single gate), over 1 to 3 qubit slots. The
 * counting engine handles a circuit as a stream of template instances instead of single gates.
 *
 * The multi-gate templates are recorded from the lowering's own gadget functions, so they cannot
 * drift from what `passes/lower.ts` emits. The per-gate tables (roles, inverses, which gates of a
 * template an optimizer walk can leave the template from) use the same numeric tables as the passes.
 */
import { CircuitBuilder, K, qubitOf } from "../ir/circuit.js";
import { INVERSE_KIND, PHASE_EIGHTHS, ROLE_BODY, ROLE_LAST, ROLE_OTHER, ROLE_Z, GATE_KINDS } from "../ir/kinds.js";
import { temporaryAnd, temporaryAndInverse, toffoli7 } from "../passes/lower.js";
import { WINDOW } from "../passes/cancelInverses.js";

export { WINDOW };

/** Template ids. */
export const T_X = 0;
export const T_H = 1;
export const T_Z = 2;
export const T_CX = 3;
export const T_CZ = 4;
export const T_CCX = 5;
export const T_MEASURE = 6;
export const T_GPHASE = 7;
/** Gidney 2018 temporary AND into a fresh qubit (slots a, b, t). */
export const T_AND = 8;
/** Its exact inverse (slots a, b, t). */
export const T_UNAND = 9;
/** Amy, Maslov, Mosca & Roetteler 2013 7-T Toffoli (slots a, b, c). */
export const T_TOF7 = 10;
/** First half of a measured erasure (Gidney 2018): h t; measure t. */
export const T_ERASE_HEAD = 11;
/** Second half: cz a, b conditioned on the outcome; reset t (slots a, b, t). */
export const T_ERASE_TAIL = 12;
export const TEMPLATE_COUNT = 13;

/** Largest number of gates in one template (a 7-T Toffoli: 19). Dead-gate masks are 32-bit. */
export const MAX_TEMPLATE_GATES = 32;

/** Gate tables of all templates, flattened: gate `g` of template `t` is entry `GATE_START[t] + g`. */
export const GATE_START = new Int32Array(TEMPLATE_COUNT + 1);
/** Gate kind (a number of `K`). */
export let G_KIND = new Uint8Array(0);
/** Qubit operands of the gate (measure: 1, gphase: 0). */
export let G_NQ = new Uint8Array(0);
/** Slot of qubit operand i (i = 0..2), -1 when absent. */
export let G_OP = new Int8Array(0);
/** 1 when the gate is conditioned on the template's classical bit. */
export let G_COND = new Uint8Array(0);
/** Role code (ROLE_Z / ROLE_X / ROLE_OTHER) of the gate on slot s, -1 when it does not touch s. */
export let G_ROLE = new Int8Array(0);
/** 1 for T and Tdg. */
export let G_IS_T = new Uint8Array(0);
/** Phase in eighths of a turn of an unconditioned single-qubit phase gate, else -1. */
export let G_PHASE = new Int8Array(0);
/** Slots of each template. */
export const SLOTS = new Uint8Array(TEMPLATE_COUNT);
/** Gates of each template touching slot s, ascending: SLOT_GATES[t * 3 + s]. */
export const SLOT_GATES: Uint8Array[] = [];
/** Slots in the order of their first use (the order in which work-qubit reuse takes wires). */
export const FIRST_TOUCH: Uint8Array[] = [];
/** Slots in the order of their last use (the order in which work-qubit reuse frees wires). */
export const LAST_TOUCH: Uint8Array[] = [];
/** Template names (for messages and tests). */
export const NAMES: readonly string[] = ["x", "h", "z", "cx", "cz", "ccx", "measure", "gphase", "and", "unand", "toffoli7", "erase-head", "erase-tail"];

interface Raw {
  kind: number;
  slots: number[];
  cond: boolean;
}

function recorded(emit: (b: CircuitBuilder) => void): Raw[] {
  const b = new CircuitBuilder({ search: 3, target: 0 });
  emit(b);
  const c = b.finish();
  const out: Raw[] = [];
  for (let g = 0; g < c.gates; g++) {
    const slots: number[] = [];
    for (let p = c.opStart[g]!; p < c.opStart[g + 1]!; p++) slots.push(qubitOf(c.ops[p]!));
    out.push({ kind: c.kind[g]!, slots, cond: false });
  }
  return out;
}

const one = (kind: number, ...slots: number[]): Raw[] => [{ kind, slots, cond: false }];

function build(): void {
  const raw: Raw[][] = [];
  raw[T_X] = one(K.x, 0);
  raw[T_H] = one(K.h, 0);
  raw[T_Z] = one(K.z, 0);
  raw[T_CX] = one(K.cx, 0, 1);
  raw[T_CZ] = one(K.cz, 0, 1);
  raw[T_CCX] = one(K.ccx, 0, 1, 2);
  raw[T_MEASURE] = one(K.measure, 0);
  raw[T_GPHASE] = [{ kind: K.gphase, slots: [], cond: false }];
  raw[T_AND] = recorded((b) => temporaryAnd(b, 0, 1, 2));
  raw[T_UNAND] = recorded((b) => temporaryAndInverse(b, 0, 1, 2));
  raw[T_TOF7] = recorded((b) => toffoli7(b, 0, 1, 2));
  raw[T_ERASE_HEAD] = [{ kind: K.h, slots: [0], cond: false }, { kind: K.measure, slots: [0], cond: false }];
  raw[T_ERASE_TAIL] = [{ kind: K.cz, slots: [0, 1], cond: true }, { kind: K.reset, slots: [2], cond: false }];
  let total = 0;
  for (let t = 0; t < TEMPLATE_COUNT; t++) {
    GATE_START[t] = total;
    total += raw[t]!.length;
    if (raw[t]!.length > MAX_TEMPLATE_GATES) throw new Error(`template ${NAMES[t]} has more than ${MAX_TEMPLATE_GATES} gates`);
  }
  GATE_START[TEMPLATE_COUNT] = total;
  G_KIND = new Uint8Array(total);
  G_NQ = new Uint8Array(total);
  G_OP = new Int8Array(total * 3).fill(-1);
  G_COND = new Uint8Array(total);
  G_ROLE = new Int8Array(total * 3).fill(-1);
  G_IS_T = new Uint8Array(total);
  G_PHASE = new Int8Array(total).fill(-1);
  for (let t = 0; t < TEMPLATE_COUNT; t++) {
    let slots = 0;
    const touch: number[] = [];
    const onSlot: number[][] = [[], [], []];
    raw[t]!.forEach((r, i) => {
      const e = GATE_START[t]! + i;
      G_KIND[e] = r.kind;
      G_NQ[e] = r.slots.length;
      G_COND[e] = r.cond ? 1 : 0;
      G_IS_T[e] = r.kind === K.t || r.kind === K.tdg ? 1 : 0;
      const eighths = PHASE_EIGHTHS[GATE_KINDS[r.kind]!];
      if (eighths !== undefined && !r.cond) G_PHASE[e] = eighths;
      r.slots.forEach((s, j) => {
        G_OP[e * 3 + j] = s;
        // As commute.ts's roleCodeOn: a conditioned gate has no role but "other" on any qubit.
        G_ROLE[e * 3 + s] = r.cond ? ROLE_OTHER : j === r.slots.length - 1 ? ROLE_LAST[r.kind]! : ROLE_BODY[r.kind]!;
        slots = Math.max(slots, s + 1);
        if (!touch.includes(s)) touch.push(s);
        onSlot[s]!.push(i);
      });
    });
    SLOTS[t] = slots;
    FIRST_TOUCH[t] = Uint8Array.from(touch);
    // reuseWork frees a qubit after its last gate, the qubits of one gate in operand order.
    const lastAt: [number, number, number][] = [];
    raw[t]!.forEach((r, i) => r.slots.forEach((sl, j) => {
      const k = lastAt.findIndex((x) => x[0] === sl);
      if (k >= 0) lastAt.splice(k, 1);
      lastAt.push([sl, i, j]);
    }));
    lastAt.sort((x, y) => x[1] - y[1] || x[2] - y[2]);
    LAST_TOUCH[t] = Uint8Array.from(lastAt.map((x) => x[0]));
    for (let s = 0; s < 3; s++) SLOT_GATES[t * 3 + s] = Uint8Array.from(onSlot[s]!);
  }
}
build();

/**
 * TRAIL_GATES[t * 3 + s]: the gates of template t on slot s after its last gate there that touches
 * another slot, as a mask (single-qubit, unconditioned, no measurement or reset; 0 where none):
 * when the slot's qubit dies with the instance they are the last gates its wire has until the
 * wire is taken again, and nothing but that next use can cancel them (see engine.ts, deferred
 * trails).
 */
export const TRAIL_GATES = new Int32Array(TEMPLATE_COUNT * 3);
for (let t = 0; t < TEMPLATE_COUNT; t++) {
  for (let s = 0; s < 3; s++) {
    const on = SLOT_GATES[t * 3 + s]!;
    let mask = 0;
    for (let i = on.length - 1; i >= 0; i--) {
      const e = GATE_START[t]! + on[i]!;
      if (G_NQ[e] !== 1 || G_COND[e] || G_KIND[e] === K.measure || G_KIND[e] === K.reset) break;
      mask |= 1 << on[i]!;
    }
    TRAIL_GATES[t * 3 + s] = mask;
  }
}

/** Number of gates of template t. */
export const gatesOf = (t: number): number => GATE_START[t + 1]! - GATE_START[t]!;

/** True when gate kinds `a` and `b` undo each other (same operands assumed). */
const inverseKinds = (a: number, b: number): boolean => INVERSE_KIND[a] === b;

/**
 * The gates of template t (with the gates in `dead` removed) whose cancel-inverses walk, along
 * their target, can leave the template: every other live gate meets a live gate of the same
 * template first that stops the walk (it neither undoes nor commutes with it), or the pass's
 * window, both without a partner. A walk through gates that commute with the walker goes on; a
 * gate that meets its inverse inside the template counts as leaving (whether it is a partner
 * depends on the gates around: the real walk decides). Slots are distinct qubits.
 *
 * Returns a bit mask of such gates; cached per (template, dead mask).
 */
export function exitingGates(t: number, dead: number): number {
  const key = t * 4294967296 + (dead >>> 0);
  const h = (Math.imul(dead, 0x9e3779b1) ^ Math.imul(t + 1, 0x85ebca6b)) >>> (32 - EXIT_BITS);
  if (exitKey[h] === key) return exitVal[h]!;
  let m = exitCache.get(key);
  if (m === undefined) {
    m = computeExiting(t, dead);
    exitCache.set(key, m);
  }
  exitKey[h] = key;
  exitVal[h] = m;
  return m;
}
const exitCache = new Map<number, number>();
const EXIT_BITS = 12;
const exitKey = new Float64Array(1 << EXIT_BITS).fill(-1);
const exitVal = new Int32Array(1 << EXIT_BITS);

function computeExiting(t: number, dead: number): number {
  const base = GATE_START[t]!;
  const n = gatesOf(t);
  let mask = 0;
  for (let p = 0; p < n; p++) {
    if ((dead >>> p) & 1) continue;
    const e = base + p;
    const nq = G_NQ[e]!;
    const kind = G_KIND[e]!;
    if (nq === 0 || kind === K.measure || kind === K.reset) continue; // never walks
    const target = G_OP[e * 3 + nq - 1]!;
    let exits = true;
    let steps = 0;
    for (let h = p - 1; h >= 0; h--) {
      if ((dead >>> h) & 1) continue;
      const f = base + h;
      if (G_ROLE[f * 3 + target]! < 0) continue; // not on the target
      if (steps === WINDOW) {
        exits = false; // the pass gives up after WINDOW live gates
        break;
      }
      steps++;
      // A partner inside the template depends on the gates around it (clearBetween): let the
      // caller walk for real.
      if (inverseInTemplate(e, f)) break;
      if (!commuteInTemplate(e, f)) {
        exits = false;
        break;
      }
    }
    if (exits) mask |= 1 << p;
  }
  return mask;
}

/** commute.ts's rule for two gates of one template (slots stand for distinct qubits). */
export function commuteInTemplate(e: number, f: number): boolean {
  const nq = G_NQ[e]!;
  for (let i = 0; i < nq; i++) {
    const s = G_OP[e * 3 + i]!;
    const rh = G_ROLE[f * 3 + s]!;
    if (rh < 0) continue;
    const rg = G_ROLE[e * 3 + s]!;
    if (rg === ROLE_OTHER || rg !== rh) return false;
  }
  return true;
}

/** True when gates e and f of one template undo each other (same slots in the same order, no condition). */
export function inverseInTemplate(e: number, f: number): boolean {
  if (G_COND[e] || G_COND[f]) return false;
  if (!inverseKinds(G_KIND[e]!, G_KIND[f]!)) return false;
  if (G_NQ[e] !== G_NQ[f]) return false;
  for (let i = 0; i < G_NQ[e]!; i++) if (G_OP[e * 3 + i] !== G_OP[f * 3 + i]) return false;
  return true;
}

/**
 * commute.ts's inversePair for gate e of an instance whose slots' wires are ew[eb..eb+2] and gate f
 * of one whose are fw[fb..fb+2]: inverse kinds, no condition, the same wires in the same order.
 */
export function inverseOn(e: number, ew: Int32Array, eb: number, f: number, fw: Int32Array, fb: number): boolean {
  if (INVERSE_KIND[G_KIND[e]!] !== G_KIND[f] || G_COND[e] || G_COND[f]) return false;
  const nq = G_NQ[e]!;
  if (G_NQ[f] !== nq) return false;
  for (let i = 0; i < nq; i++) if (ew[eb + G_OP[e * 3 + i]!] !== fw[fb + G_OP[f * 3 + i]!]) return false;
  return true;
}

/** commute.ts's commute for gate e and gate f of instances on the given wires (as inverseOn). */
export function commuteOn(e: number, ew: Int32Array, eb: number, f: number, fw: Int32Array, fb: number): boolean {
  const nq = G_NQ[e]!;
  for (let i = 0; i < nq; i++) {
    const s = G_OP[e * 3 + i]!;
    const w = ew[eb + s]!;
    // The role of f on wire w (slots of an instance are distinct wires; unused ones are stale).
    let rh = -1;
    if (fw[fb] === w) rh = G_ROLE[f * 3]!;
    if (rh < 0 && fw[fb + 1] === w) rh = G_ROLE[f * 3 + 1]!;
    if (rh < 0 && fw[fb + 2] === w) rh = G_ROLE[f * 3 + 2]!;
    if (rh < 0) continue;
    const rg = G_ROLE[e * 3 + s]!;
    if (rg === ROLE_OTHER || rg !== rh) return false;
  }
  return true;
}

export { ROLE_Z, ROLE_OTHER };
