/**
 * cancel-inverses: removes a gate and an earlier gate that undoes it (X X, H H, CX CX, CCX CCX,
 * T Tdg, S Sdg, and/unand pairs ...), also when the gates between them commute with it
 * (for example X on a CX target passes other CX targets on the same qubit). Looks back at most
 * WINDOW gates per qubit, so the pass stays linear.
 *
 * The gates on each qubit form a backward linked list over operand slots (`prev`), so the walk
 * allocates nothing per gate.
 */
import { emptyLike, qubitOf, type Circuit } from "../ir/circuit.js";
import { scratchInt32 } from "../ir/scratch.js";
import { K } from "../ir/kinds.js";
import { commute, inversePair, qubitCount } from "./commute.js";

export const WINDOW = 16;

export function cancelInverses(c: Circuit): Circuit {
  const alive = new Uint8Array(c.gates).fill(1);
  const gateOfSlot = scratchInt32("cancel.gateOfSlot", c.ops.length);
  const prev = scratchInt32("cancel.prev", c.ops.length).fill(-1); // previous slot on the same qubit
  const last = scratchInt32("cancel.last", c.qubits).fill(-1); // last slot on each qubit
  for (let g = 0; g < c.gates; g++) {
    const n = qubitCount(c, g);
    const s = c.opStart[g]!;
    const kind = c.kind[g]!;
    if (n > 0 && kind !== K.measure && kind !== K.reset) {
      // Walk back along the target (the last operand): controls are shared by many gates, a
      // target by few, so the partner, if any, is found in fewer steps there.
      const partner = findPartner(c, g, s, n, last, prev, gateOfSlot, alive);
      if (partner >= 0) {
        alive[partner] = 0;
        alive[g] = 0;
        continue;
      }
    }
    for (let i = 0; i < n; i++) {
      const q = qubitOf(c.ops[s + i]!);
      gateOfSlot[s + i] = g;
      prev[s + i] = last[q]!;
      last[q] = s + i;
    }
  }
  if (alive.indexOf(0) < 0) return c; // nothing cancelled: the same circuit
  const out = emptyLike(c);
  for (let g = 0; g < c.gates; g++) if (alive[g]) out.copy(c, g);
  return out.finish();
}

/** The most recent gate that undoes g with only commuting gates in between, or -1. */
function findPartner(
  c: Circuit, g: number, s: number, n: number, last: Int32Array, prev: Int32Array, gateOfSlot: Int32Array, alive: Uint8Array,
): number {
  let steps = 0;
  for (let slot = last[qubitOf(c.ops[s + n - 1]!)]!; slot >= 0 && steps < WINDOW; slot = prev[slot]!) {
    const h = gateOfSlot[slot]!;
    if (!alive[h]) continue;
    steps++;
    if (inversePair(c, h, g) && clearBetween(c, g, h, s, n, last, prev, gateOfSlot, alive)) return h;
    if (!commute(c, g, h)) return -1;
  }
  return -1;
}

/** True when every alive gate after h on g's other qubits commutes with g. */
function clearBetween(
  c: Circuit, g: number, h: number, s: number, n: number, last: Int32Array, prev: Int32Array, gateOfSlot: Int32Array, alive: Uint8Array,
): boolean {
  for (let k = 0; k + 1 < n; k++) {
    let steps = 0;
    for (let slot = last[qubitOf(c.ops[s + k]!)]!; slot >= 0; slot = prev[slot]!) {
      const x = gateOfSlot[slot]!;
      if (x <= h) break;
      if (!alive[x]) continue;
      if (++steps > WINDOW || !commute(c, g, x)) return false;
    }
  }
  return true;
}
