/**
 * The complete search circuit at the logical level: H on every search qubit, K iterations of
 * (phase oracle, diffusion), then the search register measured into classical bits 0..n-1.
 * Diffusion is 2|s><s| - I exactly: H on all, a phase flip of |0...0> (a Z controlled on every
 * qubit being 0), H on all, and a global phase of -1 that makes the reflection exact.
 */
import { CircuitBuilder, K, neg, pos, type Circuit } from "../ir/circuit.js";
import type { SimplifiedCnf } from "./simplify.js";
import { synthesize, type Strategy } from "./index.js";
import { synthesizeConstruction, type Construction } from "./construction.js";

/** Appends the diffusion (reflection about the uniform superposition) over qubits 0..n-1. */
export function diffusion(b: CircuitBuilder, n: number): void {
  if (n === 0) return;
  for (let q = 0; q < n; q++) b.add(K.h, pos(q));
  b.addN(K.mcz, Array.from({ length: n }, (_, q) => neg(q)));
  for (let q = 0; q < n; q++) b.add(K.h, pos(q));
  b.add(K.gphase, 4);
}

/** A circuit holding only the diffusion over n qubits (for costing it alone). */
export function diffusionCircuit(n: number): Circuit {
  const b = new CircuitBuilder({ search: n, target: 0 });
  diffusion(b, n);
  return b.finish();
}

/**
 * The logical search circuit with `iterations` Grover iterations. Without `measure` the final
 * measurements are left out (to look at the state they would sample).
 */
export function searchCircuit(f: SimplifiedCnf, strategy: Strategy | Construction, iterations: number, measure = true): Circuit {
  const oracle = typeof strategy === "string" ? synthesize(f, "phase", strategy) : synthesizeConstruction(f, "phase", strategy);
  return searchAround(oracle, f.variables, iterations, measure);
}

/**
 * The logical search circuit around a given logical phase oracle whose search register is qubits
 * 0..n-1 (what {@link searchCircuit} does for a clause oracle; compile.ts for the oracle of any plan).
 */
export function searchAround(oracle: Circuit, n: number, iterations: number, measure = true): Circuit {
  const oracleWork = oracle.qubits - n;
  const b = new CircuitBuilder({ search: n, target: 0, clbits: n }, iterations * (oracle.gates + 3 * n + 2) + 2 * n);
  for (let q = 0; q < n; q++) b.add(K.h, pos(q));
  for (let i = 0; i < iterations; i++) {
    // Each iteration's oracle gets fresh work qubits; work-qubit reuse folds them onto few wires.
    const base = b.qubits;
    for (let w = 0; w < oracleWork; w++) b.newWork();
    for (let g = 0; g < oracle.gates; g++) {
      const remapped: number[] = [];
      for (let p = oracle.opStart[g]!; p < oracle.opStart[g + 1]!; p++) {
        const op = oracle.ops[p]!;
        const q = op >>> 1;
        // A phase oracle's operands are qubits, except gphase's angle.
        remapped.push(oracle.kind[g] !== K.gphase && q >= n ? ((q - n + base) << 1) | (op & 1) : op);
      }
      b.addN(oracle.kind[g]!, remapped);
    }
    diffusion(b, n);
  }
  if (measure) for (let q = 0; q < n; q++) b.add(K.measure, pos(q), q);
  return b.finish();
}
