/**
 * Costs by building: the circuit that compile.ts emits (lower, reuse work qubits, optimizer
 * passes), counted gate by gate. The reference the counting engine is tested against, and its
 * fallback on small circuits where the engine reports it cannot be exact.
 */
import { recycleCircuit, type Circuit } from "../ir/circuit.js";
import { countCircuit, type CircuitCounts } from "../emit/resources.js";
import { lower, type Uncompute } from "../passes/lower.js";
import { DEFAULT_PIPELINE } from "../passes/registry.js";
import { reuseWork } from "../passes/reuseWork.js";
import { runPasses } from "../passes/runner.js";

/**
 * compile.ts's pipeline after synthesis (a test holds the two equal): lower, reuse work qubits
 * (so that the optimizer sees the seams where one AND's wire is taken up by the next), passes.
 * `toffoliAnds`: every 2-input AND a full Toffoli, uncomputed unitarily (the textbook reference).
 */
export function lowerAndOptimize(logical: Circuit, basis: "toffoli" | "clifford+t", uncompute: Uncompute, optimize: boolean, toffoliAnds = false): Circuit {
  const lowered = lower(logical, { basis, uncompute, ...(toffoliAnds ? { andGate: "toffoli" as const } : {}) });
  let c = reuseWork(lowered);
  if (c !== lowered) recycleCircuit(lowered);
  if (optimize) {
    const input = c;
    c = runPasses(c, DEFAULT_PIPELINE, { recycle: true });
    if (c !== input) recycleCircuit(input);
  }
  return c;
}

/** Counts of the built circuit, and its qubits. */
export function builtCounts(logical: Circuit, basis: "toffoli" | "clifford+t", uncompute: Uncompute, optimize: boolean, toffoliAnds = false): CircuitCounts & { qubits: number } {
  const c = lowerAndOptimize(logical, basis, uncompute, optimize, toffoliAnds);
  return { ...countCircuit(c), qubits: c.qubits };
}
