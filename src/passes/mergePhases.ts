/**
 * merge-phases: runs of single-qubit phase gates (T, S, Z, Sdg, Tdg) on a qubit become the
 * shortest equivalent sequence (T T -> S, S S -> Z, T Tdg -> nothing, ...). A run may span gates
 * that are diagonal on that qubit (controls, CZ), since phase gates commute with those; the
 * merged gates are placed where the run ends. A run of r gates becomes at most min(r, 2) gates.
 */
import { emptyLike, pos, qubitOf, type Circuit, type CircuitBuilder } from "../ir/circuit.js";
import { GATE_KINDS, K, PHASE_EIGHTHS, ROLE_Z } from "../ir/kinds.js";
import { qubitCount, roleCodeOn } from "./commute.js";

/** Shortest sequence for e^(i pi k/4) on |1>, k = 0..7. */
const SEQUENCE: readonly (readonly number[])[] = [
  [], [K.t], [K.s], [K.s, K.t], [K.z], [K.z, K.t], [K.sdg], [K.tdg],
];

export function mergePhases(c: Circuit): Circuit {
  // Runs need two phase gates on one qubit; with fewer than two in the circuit there is nothing to merge.
  let phaseGates = 0;
  for (let g = 0; g < c.gates && phaseGates < 2; g++) if (PHASE_EIGHTHS[GATE_KINDS[c.kind[g]!]!] !== undefined) phaseGates++;
  if (phaseGates < 2) return c;
  const out = emptyLike(c);
  const pending = new Int8Array(c.qubits);
  const count = new Int32Array(c.qubits);
  const flush = (q: number): void => {
    if (count[q] === 0) return;
    emitPhase(out, q, pending[q]!);
    pending[q] = 0;
    count[q] = 0;
  };
  for (let g = 0; g < c.gates; g++) {
    const name = GATE_KINDS[c.kind[g]!]!;
    const eighths = PHASE_EIGHTHS[name];
    if (eighths !== undefined && c.cond[g]! < 0) {
      const q = qubitOf(c.ops[c.opStart[g]!]!);
      pending[q] = (pending[q]! + eighths) % 8;
      count[q]!++;
      continue;
    }
    const n = qubitCount(c, g);
    for (let i = 0; i < n; i++) {
      const q = qubitOf(c.ops[c.opStart[g]! + i]!);
      if (roleCodeOn(c, g, q) !== ROLE_Z) flush(q);
    }
    out.copy(c, g);
  }
  for (let q = 0; q < c.qubits; q++) flush(q);
  return out.finish();
}

function emitPhase(out: CircuitBuilder, q: number, k: number): void {
  for (const kind of SEQUENCE[k]!) out.add(kind, pos(q));
}
