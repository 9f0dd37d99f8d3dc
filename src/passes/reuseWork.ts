/**
 * reuse-work: renumbers work qubits so that qubits whose lifetimes do not overlap share one
 * wire. Every work qubit is |0> before its first gate and after its last (computed, then
 * uncomputed or measured and reset), so a later qubit can take over a finished one. Lifetimes
 * are intervals; taking any free wire in order of first use needs exactly as many wires as
 * the most lifetimes that overlap at one point (interval-graph colouring).
 */
import { CircuitBuilder, layoutOf, qubitOf, type Circuit } from "../ir/circuit.js";
import { scratchInt32 } from "../ir/scratch.js";
import { qubitCount } from "./commute.js";

export function reuseWork(c: Circuit): Circuit {
  const layout = layoutOf(c);
  const base = layout.search + layout.target;
  const first = scratchInt32("reuse.first", c.qubits).fill(-1);
  const last = scratchInt32("reuse.last", c.qubits).fill(-1);
  for (let g = 0; g < c.gates; g++) {
    const n = qubitCount(c, g);
    for (let i = 0; i < n; i++) {
      const q = qubitOf(c.ops[c.opStart[g]! + i]!);
      if (first[q]! < 0) first[q] = g;
      last[q] = g;
    }
  }
  // Walk gates in order: at a qubit's first use take the lowest free wire; after its last, free it.
  const wire = scratchInt32("reuse.wire", c.qubits).fill(-1);
  for (let q = 0; q < base; q++) wire[q] = q;
  // Any free wire will do (greedy colouring in order of first use is optimal for intervals);
  // a stack makes the choice O(1) and deterministic.
  const free: number[] = [];
  let wires = 0;
  for (let g = 0; g < c.gates; g++) {
    const n = qubitCount(c, g);
    const s = c.opStart[g]!;
    for (let i = 0; i < n; i++) {
      const q = qubitOf(c.ops[s + i]!);
      if (q >= base && first[q] === g) wire[q] = free.length > 0 ? free.pop()! : base + wires++;
    }
    for (let i = 0; i < n; i++) {
      const q = qubitOf(c.ops[s + i]!);
      if (q >= base && last[q] === g) free.push(wire[q]!);
    }
  }
  // Nothing to fold: keep the circuit as it is rather than only renumbering its wires.
  if (wires === c.qubits - base) return c;
  const out = new CircuitBuilder({ ...layout, work: wires }, c.gates);
  const ops = scratchInt32("reuse.ops", c.ops.length);
  ops.set(c.ops);
  for (let g = 0; g < c.gates; g++) {
    const n = qubitCount(c, g);
    for (let p = c.opStart[g]!; p < c.opStart[g]! + n; p++) ops[p] = (wire[qubitOf(ops[p]!)]! << 1) | (ops[p]! & 1);
    out.copy(c, g, ops);
  }
  return out.finish();
}
