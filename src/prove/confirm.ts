/**
 * Confirming a counterexample by simulation: the proof's claim that one input (assignment,
 * target value, measurement outcomes) goes wrong is checked by running the circuit on exactly
 * that input, with the bit-parallel kernel when the circuit is classical, else with the exact
 * state-vector simulator. A counterexample is returned only when the simulation agrees.
 */
import type { Circuit } from "../ir/circuit.js";
import { simulateClassical } from "../sim/bitsim.js";
import { basisTerm, CircuitFault, runSparse, seededRandom, type Term } from "../sim/sparse.js";

/** One input of the oracle: the assignment, the target's value, the measurement outcomes. */
export interface OracleInput {
  /** Values of variables 1..n. */
  readonly assignment: readonly boolean[];
  /** Initial value of the target (flag oracles). */
  readonly target: boolean;
  /** Outcomes of the X-basis measurements, in order (for the bit-parallel kernel). */
  readonly xOutcomes: readonly boolean[];
  /** Outcomes of every measurement and reset, in order (for the state-vector simulator). */
  readonly allOutcomes: readonly boolean[];
}

/** Where the registers are. */
export interface OracleLayout {
  readonly kind: "phase" | "flag";
  readonly search: number;
  /** The target qubit, or -1. */
  readonly target: number;
  /** The first work qubit. */
  readonly work: number;
}

/**
 * What goes wrong on this input, by simulation (`f`: the expected function's value there); null
 * when the circuit acts as the oracle there.
 */
export function failureOn(c: Circuit, f: boolean, layout: OracleLayout, input: OracleInput): string | null {
  const bits = new Array<boolean>(c.qubits).fill(false);
  input.assignment.forEach((on, v) => (bits[v] = on));
  if (layout.target >= 0) bits[layout.target] = input.target;
  const classical = simulateClassical(c, bits, input.xOutcomes);
  if (!("unsupported" in classical)) {
    if (classical.faultGate >= 0) return `the temporary AND at gate ${classical.faultGate} found its target in the wrong state`;
    return describe(c.qubits, layout, input, f, (q) => classical.qubits[q]!, classical.phase, 0);
  }
  return failureBySparse(c, f, layout, input);
}

/** {@link failureOn} by the exact state-vector simulator alone, `input.allOutcomes` forced. */
export function failureBySparse(c: Circuit, f: boolean, layout: OracleLayout, input: OracleInput): string | null {
  const bits = new Array<boolean>(c.qubits).fill(false);
  input.assignment.forEach((on, v) => (bits[v] = on));
  if (layout.target >= 0) bits[layout.target] = input.target;
  const ones: number[] = [];
  bits.forEach((on, q) => on && ones.push(q));
  let terms: Term[];
  try {
    terms = runSparse(c, [basisTerm(c.qubits, ones)], seededRandom(1), { forced: input.allOutcomes.map((o) => (o ? 1 : 0)) }).terms;
  } catch (e) {
    if (e instanceof CircuitFault) return e.message;
    throw e;
  }
  return failureOfTerms(c, f, layout, input, terms);
}

/** {@link failureBySparse} on the final terms of a run of `c` on `input` already made. */
export function failureOfTerms(c: Circuit, f: boolean, layout: OracleLayout, input: OracleInput, terms: readonly Term[]): string | null {
  const live = terms.filter((t) => t.re * t.re + t.im * t.im > 1e-18);
  if (live.length !== 1) return `the state is a superposition of ${live.length} basis states, not one`;
  const t = live[0]!;
  const bit = (q: number): boolean => ((t.bits[q >>> 5]! >>> (q & 31)) & 1) === 1;
  const sign = Math.abs(t.re - 1) < 1e-9 && Math.abs(t.im) < 1e-9 ? 1 : Math.abs(t.re + 1) < 1e-9 && Math.abs(t.im) < 1e-9 ? -1 : 0;
  const angle = Math.round((Math.atan2(t.im, t.re) / Math.PI) * 4 + 8) % 8;
  return describe(c.qubits, layout, input, f, bit, sign, angle);
}

function describe(qubits: number, layout: OracleLayout, input: OracleInput, f: boolean, bit: (q: number) => boolean, sign: number, angle: number): string | null {
  for (let v = 0; v < layout.search; v++) if (bit(v) !== input.assignment[v]) return `variable ${v + 1} of the search register is changed`;
  if (layout.target >= 0 && bit(layout.target) !== (input.target !== (layout.kind === "flag" && f))) {
    return `the target ends at ${bit(layout.target) ? 1 : 0} where ${input.target !== f ? 1 : 0} is expected (f = ${f ? 1 : 0})`;
  }
  for (let q = layout.work; q < qubits; q++) if (bit(q)) return `work qubit ${q - layout.work} is left at 1`;
  const want = layout.kind === "phase" && f ? -1 : 1;
  if (sign !== want) {
    const got = sign === 0 ? `e^(i pi ${angle}/4)` : String(sign);
    return `the phase is ${got} where ${want} is expected (f = ${f ? 1 : 0})`;
  }
  return null;
}
