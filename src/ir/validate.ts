/** Structural invariants of a circuit; checked after every pass in debug mode. */
import { GATE_KINDS, HAS_POLARITY, QUBIT_ARITY } from "./kinds.js";
import { negated, operands, qubitOf, type Circuit } from "./circuit.js";

/** Returns the first broken invariant, or null. */
export function validateCircuit(c: Circuit): string | null {
  let regTotal = 0;
  for (const r of c.registers) {
    if (r.start !== regTotal) return `register ${r.name} starts at ${r.start}, expected ${regTotal}`;
    regTotal += r.size;
  }
  if (regTotal !== c.qubits) return `registers cover ${regTotal} qubits, the circuit has ${c.qubits}`;
  if (c.opStart.length !== c.gates + 1 || c.kind.length !== c.gates || c.cond.length !== c.gates) return "array lengths disagree with the gate count";
  for (let g = 0; g < c.gates; g++) {
    const name = GATE_KINDS[c.kind[g]!];
    if (name === undefined) return `gate ${g}: unknown kind ${c.kind[g]}`;
    const ops = operands(c, g);
    const cond = c.cond[g]!;
    if (cond < -1 || cond >= c.clbits) return `gate ${g} (${name}): condition on bit ${cond} of ${c.clbits}`;
    const qubitOps = name === "gphase" ? 0 : name === "measure" ? 1 : ops.length;
    const arity = QUBIT_ARITY[name];
    if (arity >= 0 && qubitOps !== arity) return `gate ${g} (${name}): ${qubitOps} qubits, expected ${arity}`;
    if (name === "measure" && (ops.length !== 2 || ops[1]! < 0 || ops[1]! >= c.clbits)) return `gate ${g} (measure): bad classical bit`;
    if (name === "gphase" && (ops.length !== 1 || ops[0]! < 0 || ops[0]! > 7)) return `gate ${g} (gphase): angle must be 0..7 eighths of 2pi`;
    if ((name === "mcx" || name === "and" || name === "unand") && qubitOps < 1) return `gate ${g} (${name}): no target`;
    const seen = new Set<number>();
    for (let i = 0; i < qubitOps; i++) {
      const q = qubitOf(ops[i]!);
      if (q < 0 || q >= c.qubits) return `gate ${g} (${name}): qubit ${q} out of range 0..${c.qubits - 1}`;
      if (seen.has(q)) return `gate ${g} (${name}): qubit ${q} used twice`;
      seen.add(q);
      const isTarget = (name === "mcx" || name === "and" || name === "unand") && i === qubitOps - 1;
      if (negated(ops[i]!) && (!HAS_POLARITY[name] || isTarget)) return `gate ${g} (${name}): operand ${i} has a polarity it cannot have`;
    }
  }
  return null;
}
