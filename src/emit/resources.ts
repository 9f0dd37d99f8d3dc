/** Counting a circuit's resources: gates by emitted name, T-count and T-depth, CNOTs, depth. */
import { GATE_KINDS, IS_CNOT, IS_T, OPERAND_LAYOUT, TOFFOLI_AT_THREE } from "../ir/kinds.js";
import { operands, qubitOf, type Circuit } from "../ir/circuit.js";
import { forEachStatement } from "./qasm3/lower.js";
import { gateName } from "./qasm3/print.js";
import type { Statement } from "./qasm3/ast.js";

/** Counts of one circuit. */
export interface CircuitCounts {
  /** OpenQASM 3 gate name (with modifiers, e.g. `ctrl(3) @ x`) -> count, as emitted. */
  readonly gates: Record<string, number>;
  /** T and Tdg gates. */
  readonly tCount: number;
  /** Largest number of T/Tdg gates on any path (ASAP layering). */
  readonly tDepth: number;
  /** CX gates plus CZ gates (a CZ is one CNOT between Hadamards). */
  readonly cnotCount: number;
  /** CCX gates (and 2-controlled X gates). */
  readonly toffoliCount: number;
  /** ASAP depth: every gate but gphase is one layer on the qubits (and classical bit) it uses. */
  readonly depth: number;
  /** Measurements. */
  readonly measurements: number;
}

/**
 * Counts a circuit's gates, T-count, T-depth, CNOTs, Toffolis, depth and measurements.
 *
 * @example
 * ```ts
 * countCircuit(compileOracle(cnf, { basis: "clifford+t" }).circuit).tCount;
 * ```
 */
export function countCircuit(c: Circuit): CircuitCounts {
  const gates: Record<string, number> = {};
  const tally = (s: Statement): void => {
    if (s.kind === "BranchingStatement") {
      for (const inner of s.ifBlock) tally(inner);
      return;
    }
    const key = s.kind === "QuantumGate" ? gateName(s) : s.kind === "QuantumPhase" ? "gphase" : s.kind === "QuantumReset" ? "reset" : "measure";
    gates[key] = (gates[key] ?? 0) + 1;
  };
  forEachStatement(c, tally, () => "q");
  const sorted: Record<string, number> = {};
  for (const k of Object.keys(gates).sort()) sorted[k] = gates[k]!;

  let tCount = 0;
  let cnotCount = 0;
  let toffoliCount = 0;
  let measurements = 0;
  const level = new Int32Array(c.qubits);
  const tLevel = new Int32Array(c.qubits);
  const bitLevel = new Int32Array(c.clbits);
  const bitTLevel = new Int32Array(c.clbits);
  let depth = 0;
  let tDepth = 0;
  for (let g = 0; g < c.gates; g++) {
    const kind = GATE_KINDS[c.kind[g]!]!;
    const ops = operands(c, g);
    const layout = OPERAND_LAYOUT[kind];
    if (layout === "angle") continue;
    const nq = layout === "qubit-clbit" ? 1 : ops.length;
    if (kind === "t" || kind === "tdg") tCount++;
    if (IS_CNOT[kind]) cnotCount++;
    if (TOFFOLI_AT_THREE[kind] && nq === 3) toffoliCount++;
    if (layout === "qubit-clbit") measurements++;
    const cond = c.cond[g]!;
    let l = cond >= 0 ? bitLevel[cond]! : 0;
    let tl = cond >= 0 ? bitTLevel[cond]! : 0;
    for (let i = 0; i < nq; i++) {
      const q = qubitOf(ops[i]!);
      l = Math.max(l, level[q]!);
      tl = Math.max(tl, tLevel[q]!);
    }
    l++;
    if (IS_T[kind]) tl++;
    for (let i = 0; i < nq; i++) {
      const q = qubitOf(ops[i]!);
      level[q] = l;
      tLevel[q] = tl;
    }
    if (layout === "qubit-clbit") {
      bitLevel[ops[1]!] = l;
      bitTLevel[ops[1]!] = tl;
    }
    depth = Math.max(depth, l);
    tDepth = Math.max(tDepth, tl);
  }
  return { gates: sorted, tCount, tDepth, cnotCount, toffoliCount, depth, measurements };
}
