/** Outside references: model counts by the npm package logic-solver (MiniSat in JavaScript). */
import Logic from "logic-solver";
import { clausesOf, type Cnf } from "./lib.js";

/**
 * Counts models by solving and forbidding each model found. Every declared variable is made
 * known to the solver (x or not x), so unused variables double the count as they should.
 */
export function logicSolverCount(cnf: Cnf, cap = 1 << 16): number {
  const s = new Logic.Solver();
  const name = (l: number): string => (l > 0 ? `v${l}` : `-v${-l}`);
  for (let v = 1; v <= cnf.variables; v++) s.require(Logic.or(`v${v}`, Logic.not(`v${v}`)));
  for (const c of clausesOf(cnf)) s.require(Logic.or(...c.map(name)));
  let n = 0;
  for (let sol = s.solve(); sol !== null; sol = s.solve()) {
    if (++n > cap) throw new Error(`more than ${cap} models: too many to enumerate`);
    s.forbid(sol.getFormula());
  }
  return n;
}

import QuantumCircuit from "quantum-circuit";

/**
 * Runs an OpenQASM 2.0 program in the npm package quantum-circuit (a general-purpose state-vector
 * simulator) from the basis state whose qubit k is `input[k]`; qubits are numbered across the
 * qregs in declaration order. Returns the nonzero amplitudes by basis index (bit k = qubit k).
 * Throws when the import reports any error.
 */
export function quantumCircuitRun(qasm: string, input: number[]): Map<number, [number, number]> {
  const c = new QuantumCircuit();
  const errors: unknown[] = [];
  // quantum-circuit sizes its state by the wires that gates touch: an identity on every
  // declared qubit keeps idle qubits (a variable in no clause) in the state.
  qasm = qasm.replace(/^qreg (\w+)\[(\d+)\];$/gm, (line, name: string, size: string) =>
    `${line}\n${Array.from({ length: Number(size) }, (_, i) => `id ${name}[${i}];`).join("\n")}`);
  // The @types package declares every optional parameter as required: pass them as undefined.
  c.importQASM(qasm, (e: unknown[]) => {
    if (e && e.length) errors.push(...e);
  }, undefined);
  if (errors.length > 0) throw new Error(`quantum-circuit import errors: ${JSON.stringify(errors)}`);
  c.run(input);
  const out = new Map<number, [number, number]>();
  for (const s of c.stateAsArray(true, undefined, undefined, undefined) as { index: number; amplitude: { re: number; im: number } }[]) {
    out.set(s.index, [s.amplitude.re, s.amplitude.im]);
  }
  return out;
}
