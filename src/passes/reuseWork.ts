/**
 * reuse-work: renumbers work qubits so that qubits whose lifetimes do not overlap share one
 * wire. Every work qubit is |0> before its first gate and after its last (computed, then
 * uncomputed or measured and reset), so a later qubit can take over a finished one. Lifetimes
 * are intervals; taking the lowest free wire in order of first use needs exactly as many wires
 * as the most lifetimes that overlap at one point (interval-graph colouring).
 */
import { CircuitBuilder, layoutOf, qubitOf, type Circuit } from "../ir/circuit.js";
import { qubitCount } from "./commute.js";

export function reuseWork(c: Circuit): Circuit {
  const layout = layoutOf(c);
  const base = layout.search + layout.target;
  const first = new Int32Array(c.qubits).fill(-1);
  const last = new Int32Array(c.qubits).fill(-1);
  for (let g = 0; g < c.gates; g++) {
    const n = qubitCount(c, g);
    for (let i = 0; i < n; i++) {
      const q = qubitOf(c.ops[c.opStart[g]! + i]!);
      if (first[q]! < 0) first[q] = g;
      last[q] = g;
    }
  }
  // Walk gates in order: at a qubit's first use take the lowest free wire; after its last, free it.
  const wire = new Int32Array(c.qubits).fill(-1);
  for (let q = 0; q < base; q++) wire[q] = q;
  const free = new MinHeap();
  let wires = 0;
  const endingAt: number[][] = [];
  for (let q = base; q < c.qubits; q++) if (last[q]! >= 0) (endingAt[last[q]!] ??= []).push(q);
  const startingAt: number[][] = [];
  for (let q = base; q < c.qubits; q++) if (first[q]! >= 0) (startingAt[first[q]!] ??= []).push(q);
  for (let g = 0; g < c.gates; g++) {
    for (const q of startingAt[g] ?? []) wire[q] = free.size > 0 ? free.pop() : base + wires++;
    for (const q of endingAt[g] ?? []) free.push(wire[q]!);
  }
  const out = new CircuitBuilder({ ...layout, work: wires }, c.gates);
  const ops = c.ops.slice();
  for (let g = 0; g < c.gates; g++) {
    const n = qubitCount(c, g);
    for (let p = c.opStart[g]!; p < c.opStart[g]! + n; p++) ops[p] = (wire[qubitOf(ops[p]!)]! << 1) | (ops[p]! & 1);
    out.addN(c.kind[g]!, ops.subarray(c.opStart[g]!, c.opStart[g + 1]!), c.cond[g]!);
  }
  return out.finish();
}

class MinHeap {
  private a: number[] = [];
  get size(): number {
    return this.a.length;
  }
  push(x: number): void {
    const a = this.a;
    a.push(x);
    for (let i = a.length - 1; i > 0; ) {
      const p = (i - 1) >> 1;
      if (a[p]! <= a[i]!) break;
      [a[p], a[i]] = [a[i]!, a[p]!];
      i = p;
    }
  }
  pop(): number {
    const a = this.a;
    const top = a[0]!;
    const end = a.pop()!;
    if (a.length > 0) {
      a[0] = end;
      for (let i = 0; ; ) {
        const l = 2 * i + 1;
        const r = l + 1;
        let m = i;
        if (l < a.length && a[l]! < a[m]!) m = l;
        if (r < a.length && a[r]! < a[m]!) m = r;
        if (m === i) break;
        [a[m], a[i]] = [a[i]!, a[m]!];
        i = m;
      }
    }
    return top;
  }
}
