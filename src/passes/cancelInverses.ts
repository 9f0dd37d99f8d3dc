/**
 * cancel-inverses: removes a gate and an earlier gate that undoes it (X X, H H, CX CX, CCX CCX,
 * T Tdg, S Sdg, and/unand pairs ...), also when the gates between them commute with it
 * (for example X on a CX target passes other CX targets on the same qubit). Looks back at most
 * WINDOW gates per qubit, so the pass stays linear.
 */
import { emptyLike, type Circuit } from "../ir/circuit.js";
import { GATE_KINDS } from "../ir/kinds.js";
import { commute, inversePair, qubitCount } from "./commute.js";
import { qubitOf } from "../ir/circuit.js";

const WINDOW = 16;

export function cancelInverses(c: Circuit): Circuit {
  const alive = new Uint8Array(c.gates).fill(1);
  /** Per qubit, the gates touching it so far (alive or not; dead ones are skipped). */
  const onQubit: number[][] = Array.from({ length: c.qubits }, () => []);
  for (let g = 0; g < c.gates; g++) {
    const n = qubitCount(c, g);
    const qs: number[] = [];
    for (let i = 0; i < n; i++) qs.push(qubitOf(c.ops[c.opStart[g]! + i]!));
    const partner = n > 0 && GATE_KINDS[c.kind[g]!] !== "measure" && GATE_KINDS[c.kind[g]!] !== "reset" ? findPartner(c, g, qs, onQubit, alive) : -1;
    if (partner >= 0) {
      alive[partner] = 0;
      alive[g] = 0;
      continue;
    }
    for (const q of qs) onQubit[q]!.push(g);
  }
  const out = emptyLike(c);
  for (let g = 0; g < c.gates; g++) if (alive[g]) out.copy(c, g);
  return out.finish();
}

/** The most recent gate that undoes g with only commuting gates in between, or -1. */
function findPartner(c: Circuit, g: number, qs: number[], onQubit: number[][], alive: Uint8Array): number {
  const list = onQubit[qs[0]!]!;
  let steps = 0;
  for (let i = list.length - 1; i >= 0 && steps < WINDOW; i--) {
    const h = list[i]!;
    if (!alive[h]) continue;
    steps++;
    if (inversePair(c, h, g) && clearBetween(c, g, h, qs, onQubit, alive)) return h;
    if (!commute(c, g, h)) return -1;
  }
  return -1;
}

/** True when every alive gate after h on g's other qubits commutes with g. */
function clearBetween(c: Circuit, g: number, h: number, qs: number[], onQubit: number[][], alive: Uint8Array): boolean {
  for (let k = 1; k < qs.length; k++) {
    const list = onQubit[qs[k]!]!;
    let steps = 0;
    for (let i = list.length - 1; i >= 0; i--) {
      const x = list[i]!;
      if (x <= h) break;
      if (!alive[x]) continue;
      if (++steps > WINDOW || !commute(c, g, x)) return false;
    }
  }
  return true;
}
