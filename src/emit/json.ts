/**
 * The JSON form of a circuit, for programs. Schema (version 1):
 *
 *   { "format": "clausegate-circuit", "version": 1, "comments": [..],
 *     "qubits": Q, "clbits": C,
 *     "registers": [{ "name": "vars", "role": "search", "start": 0, "size": n }, ...],
 *     "gates": [ { "op": KIND, "qubits": [..] , ... }, ... ] }
 *
 * KIND is one of x y z h s sdg t tdg cx cz ccx mcx mcz and unand gphase measure reset. Qubits
 * are global indices (register `start` + offset). For mcx/and/unand the last qubit is the
 * target and the others controls; for mcz the phase is -1 when every qubit matches. Optional
 * fields: "negated": positions in "qubits" of controls that fire on |0>; "angle": the gphase
 * angle in units of pi/4 (0..7); "clbit": the bit a measure writes; "if": the classical bit that
 * must be 1 for the gate to act.
 */
import { GATE_KINDS, OPERAND_LAYOUT } from "../ir/kinds.js";
import { negated, operands, qubitOf, type Circuit } from "../ir/circuit.js";
import { batched, type Sink } from "./sink.js";

/** The `format` field of clausegate's JSON circuits. */
export const CIRCUIT_FORMAT = "clausegate-circuit";
/** The schema version written in the `version` field. */
export const CIRCUIT_FORMAT_VERSION = 1;

/**
 * Writes `c` as versioned JSON (schema above) to `out`, one gate per line.
 *
 * @example
 * ```ts
 * const text = collect((sink) => emitJson(compileOracle(cnf).circuit, sink));
 * ```
 */
export function emitJson(c: Circuit, out: Sink, comments: readonly string[] = []): void {
  const w = batched(out);
  w.write(`{"format":"${CIRCUIT_FORMAT}","version":${CIRCUIT_FORMAT_VERSION},"comments":${JSON.stringify(comments)},\n`);
  w.write(`"qubits":${c.qubits},"clbits":${c.clbits},"registers":${JSON.stringify(c.registers)},\n"gates":[`);
  for (let g = 0; g < c.gates; g++) w.write(`${g === 0 ? "\n" : ",\n"}${gateJson(c, g)}`);
  w.write("\n]}\n");
  w.flush();
}

function gateJson(c: Circuit, g: number): string {
  const kind = GATE_KINDS[c.kind[g]!]!;
  const ops = operands(c, g);
  let s = `{"op":"${kind}"`;
  const layout = OPERAND_LAYOUT[kind];
  if (layout === "angle") s += `,"qubits":[],"angle":${ops[0]}`;
  else if (layout === "qubit-clbit") s += `,"qubits":[${qubitOf(ops[0]!)}],"clbit":${ops[1]}`;
  else {
    s += `,"qubits":[${Array.from(ops, qubitOf).join(",")}]`;
    const neg: number[] = [];
    ops.forEach((op, i) => {
      if (negated(op)) neg.push(i);
    });
    if (neg.length > 0) s += `,"negated":[${neg.join(",")}]`;
  }
  if (c.cond[g]! >= 0) s += `,"if":${c.cond[g]}`;
  return `${s}}`;
}
