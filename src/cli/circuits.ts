/** Writing circuits in the output formats, shared by the commands that make circuits. */
import { emitJson, emitQasm2, emitQasm3, qasm2Problem, type Circuit } from "../internal.js";
import { UserError, withProgress, writeAtomic } from "./io.js";
import { isStandardOutput } from "./output.js";

/** The output formats of the circuit-writing commands. */
export const FORMATS = ["qasm3", "qasm2", "json"] as const;

/** Output formats of the circuit-writing commands. */
export type Format = (typeof FORMATS)[number];

/** Refuses, before anything is written, a circuit the format cannot express. */
export function checkFormat(circuit: Circuit, format: Format): void {
  const problem = format === "qasm2" ? qasm2Problem(circuit) : null;
  if (problem === null) return;
  if (circuit.qubits === 0) {
    throw new UserError("clausegate: error: cannot write OpenQASM 2.0: the circuit has no qubits, and OpenQASM 2.0 cannot declare an empty register; hint: write --format qasm3 or json");
  }
  // qasm2Problem names the gate, then (after ';') the bases that avoid it: the hint says that here.
  throw new UserError(`clausegate: error: cannot write OpenQASM 2.0: the circuit has ${problem.split(";")[0]}; hint: choose --basis toffoli or --basis clifford+t, or write --format qasm3 or json`);
}

/** Writes a circuit in a format to a file (atomically) or standard output. */
export function writeCircuit(circuit: Circuit, format: Format, comments: readonly string[], output: string | undefined): void {
  checkFormat(circuit, format);
  const emit = (sink: (s: string) => void): void => {
    if (format === "qasm3") emitQasm3(circuit, sink, comments);
    else if (format === "qasm2") emitQasm2(circuit, sink, comments);
    else emitJson(circuit, sink, comments);
  };
  if (output === undefined || isStandardOutput(output)) {
    writeAtomic(output ?? "-", emit, "the circuit", true);
    return;
  }
  // Into a file: a bar by bytes against an estimate (OpenQASM 3 some 30 bytes a gate).
  const expected = Math.max(1, circuit.gates * (format === "json" ? 40 : 30));
  withProgress("writing", (onProgress) => {
    let bytes = 0;
    let next = 0;
    writeAtomic(output, (sink) => emit((chunk) => {
      sink(chunk);
      bytes += chunk.length;
      if (bytes >= next) {
        onProgress(Math.min(0.99, bytes / expected));
        next = bytes + (1 << 20);
      }
    }), "the circuit", true);
    onProgress(1);
  });
}

