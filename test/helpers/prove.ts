/** Helpers for the prover's tests: circuit edits (mutations) and an independent check of a counterexample. */
import { basisTerm, evaluate, runSparse, seededRandom, type Circuit, type Cnf, type ProofCounterexample } from "./lib.js";

// The mutations live in the bench (the prover bench's `mutants` mode sweeps them too).
export { edit, mutate, MUTATIONS, type Mutation } from "../../dist/bench/mutants.js";

/**
 * True when the circuit is not the oracle on the counterexample's input, by the exact sparse
 * state-vector simulator (not the prover's own confirmation, which uses the bit-parallel kernel
 * for classical circuits), with the counterexample's measurement outcomes forced.
 */
export function failsOn(c: Circuit, cnf: Cnf, kind: "phase" | "flag", ce: ProofCounterexample): boolean {
  const f = evaluate(cnf, ce.assignment);
  const target = c.registers.find((r) => r.role === "target");
  const ones = ce.assignment.flatMap((on, v) => (on ? [v] : []));
  const t0 = kind === "flag" && ce.target === true;
  const input = t0 ? [...ones, target!.start] : ones;
  let terms;
  try {
    terms = runSparse(c, [basisTerm(c.qubits, input)], seededRandom(1), { forced: ce.outcomes.map((o) => (o ? 1 : 0)) }).terms;
  } catch {
    return true; // an outcome the input cannot give: the measurement depends on the input
  }
  const live = terms.filter((t) => t.re * t.re + t.im * t.im > 1e-18);
  if (live.length !== 1) return true;
  const t = live[0]!;
  const want = kind === "flag" && (t0 !== f) ? [...ones, target!.start] : ones;
  const expected = basisTerm(c.qubits, want);
  if (t.bits.join(",") !== expected.bits.join(",")) return true;
  const sign = kind === "phase" && f ? -1 : 1;
  // Forced outcomes leave the amplitude scaled by 2^(-m/2); the phase must still be the sign.
  const norm = Math.hypot(t.re, t.im);
  return Math.abs(t.re / norm - sign) > 1e-9 || Math.abs(t.im / norm) > 1e-9;
}
