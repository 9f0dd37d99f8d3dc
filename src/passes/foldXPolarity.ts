/**
 * fold-x-polarity: X q, then gates that use q only as a control with a polarity
 * (multi-controlled X/Z, temporary ANDs), then X q again: the two X gates go and those
 * controls flip polarity (control on |1> becomes control on |0> and back).
 */
import { emptyLike, qubitOf, type Circuit } from "../ir/circuit.js";
import { GATE_KINDS, HAS_POLARITY } from "../ir/kinds.js";
import { qubitCount } from "./commute.js";

export function foldXPolarity(c: Circuit): Circuit {
  const uses: number[][] = Array.from({ length: c.qubits }, () => []);
  for (let g = 0; g < c.gates; g++) {
    const n = qubitCount(c, g);
    for (let i = 0; i < n; i++) uses[qubitOf(c.ops[c.opStart[g]! + i]!)]!.push(g);
  }
  const drop = new Uint8Array(c.gates);
  const ops = c.ops.slice();
  const isX = (g: number): boolean => GATE_KINDS[c.kind[g]!] === "x" && c.cond[g]! < 0;
  for (let q = 0; q < c.qubits; q++) {
    const list = uses[q]!;
    for (let i = 0; i < list.length; i++) {
      if (!isX(list[i]!)) continue;
      let j = i + 1;
      while (j < list.length && controlOnly(c, list[j]!, q)) j++;
      if (j < list.length && j > i + 1 && isX(list[j]!)) {
        drop[list[i]!] = 1;
        drop[list[j]!] = 1;
        for (let k = i + 1; k < j; k++) flipPolarity(c, ops, list[k]!, q);
        i = j;
      }
    }
  }
  const out = emptyLike(c);
  for (let g = 0; g < c.gates; g++) {
    if (!drop[g]) out.addN(c.kind[g]!, ops.subarray(c.opStart[g]!, c.opStart[g + 1]!), c.cond[g]!);
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
