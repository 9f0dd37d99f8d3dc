/**
 * fold-x-polarity: X q, then gates that use q only as a control with a polarity
 * (multi-controlled X/Z, temporary ANDs), then X q again: the two X gates go and those
 * controls flip polarity (control on |1> becomes control on |0> and back).
 */
import { emptyLike, qubitOf, type Circuit } from "../ir/circuit.js";
import { GATE_KINDS, HAS_POLARITY, K } from "../ir/kinds.js";
import { qubitCount } from "./commute.js";

export function foldXPolarity(c: Circuit): Circuit {
  // Bases without polarity (toffoli, clifford+t) have nothing to fold.
  if (!c.kind.some((k) => HAS_POLARITY[GATE_KINDS[k]!])) return c;
  // The gates on each qubit in order, as one CSR table: uses[useStart[q] .. useStart[q+1]).
  const useStart = new Uint32Array(c.qubits + 1);
  for (let g = 0; g < c.gates; g++) {
    const n = qubitCount(c, g);
    for (let i = 0; i < n; i++) useStart[qubitOf(c.ops[c.opStart[g]! + i]!) + 1]!++;
  }
  for (let q = 0; q < c.qubits; q++) useStart[q + 1]! += useStart[q]!;
  const fill = useStart.slice(0, c.qubits);
  const uses = new Int32Array(useStart[c.qubits]!);
  for (let g = 0; g < c.gates; g++) {
    const n = qubitCount(c, g);
    for (let i = 0; i < n; i++) uses[fill[qubitOf(c.ops[c.opStart[g]! + i]!)]!++] = g;
  }
  const drop = new Uint8Array(c.gates);
  const ops = c.ops.slice();
  const isX = (g: number): boolean => c.kind[g] === K.x && c.cond[g]! < 0;
  for (let q = 0; q < c.qubits; q++) {
    const end = useStart[q + 1]!;
    for (let i = useStart[q]!; i < end; i++) {
      if (!isX(uses[i]!)) continue;
      let j = i + 1;
      while (j < end && controlOnly(c, uses[j]!, q)) j++;
      if (j < end && j > i + 1 && isX(uses[j]!)) {
        drop[uses[i]!] = 1;
        drop[uses[j]!] = 1;
        for (let k = i + 1; k < j; k++) flipPolarity(c, ops, uses[k]!, q);
        i = j;
      }
    }
  }
  if (drop.indexOf(1) < 0) return c;
  const out = emptyLike(c);
  for (let g = 0; g < c.gates; g++) {
    if (!drop[g]) out.copy(c, g, ops);
  }
  return out.finish();
}

/** True when gate g uses q only as a control of a kind with polarity (never as its target). */
function controlOnly(c: Circuit, g: number, q: number): boolean {
  const name = GATE_KINDS[c.kind[g]!]!;
  if (!HAS_POLARITY[name]) return false;
  const n = qubitCount(c, g);
  const hasTarget = name !== "mcz";
  for (let i = 0; i < n; i++) {
    if (qubitOf(c.ops[c.opStart[g]! + i]!) === q) return !(hasTarget && i === n - 1);
  }
  return false;
}

function flipPolarity(c: Circuit, ops: Int32Array, g: number, q: number): void {
  for (let p = c.opStart[g]!; p < c.opStart[g + 1]!; p++) if (qubitOf(ops[p]!) === q) ops[p]! ^= 1;
}
