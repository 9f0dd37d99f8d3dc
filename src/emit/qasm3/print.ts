/** OpenQASM 3 text from the syntax tree: one function per node kind. */
import type { Sink } from "../sink.js";
import type {
  BranchingStatement, ClassicalDeclaration, Program, QuantumGate, QuantumMeasurementStatement, QuantumPhase,
  QuantumReset, QubitDeclaration, Statement,
} from "./ast.js";

export function printHead(p: Program, out: Sink): void {
  out(`OPENQASM ${p.version};\n`);
  for (const c of p.header) out(`// ${c.text}\n`);
  for (const i of p.includes) out(`include "${i.filename}";\n`);
  for (const d of p.declarations) out(d.kind === "QubitDeclaration" ? printQubitDeclaration(d) : printClassicalDeclaration(d));
}

const printQubitDeclaration = (d: QubitDeclaration): string => `qubit[${d.size}] ${d.name};\n`;
const printClassicalDeclaration = (d: ClassicalDeclaration): string => `${d.type}[${d.size}] ${d.name};\n`;

export function printStatement(s: Statement, indent = ""): string {
  switch (s.kind) {
    case "QuantumGate":
      return `${indent}${printGate(s)};\n`;
    case "QuantumPhase":
      return `${indent}${printPhase(s)};\n`;
    case "QuantumMeasurementStatement":
      return `${indent}${printMeasurement(s)};\n`;
    case "QuantumReset":
      return `${indent}${printReset(s)};\n`;
    case "BranchingStatement":
      return printBranch(s, indent);
  }
}

/** A gate's name as written, modifiers and arguments included (`negctrl(2) @ x`). */
export function gateName(g: QuantumGate): string {
  let s = "";
  for (const m of g.modifiers) s += m.count === 1 ? `${m.modifier} @ ` : `${m.modifier}(${m.count}) @ `;
  s += g.name;
  if (g.args.length > 0) s += `(${g.args.join(", ")})`;
  return s;
}

function printGate(g: QuantumGate): string {
  return `${gateName(g)} ${g.qubits.join(", ")}`;
}

const printPhase = (p: QuantumPhase): string => `gphase(${p.argument})`;
const printMeasurement = (m: QuantumMeasurementStatement): string => `${m.target} = measure ${m.qubit}`;
const printReset = (r: QuantumReset): string => `reset ${r.qubit}`;

function printBranch(b: BranchingStatement, indent: string): string {
  if (b.ifBlock.length === 1 && b.ifBlock[0]!.kind !== "BranchingStatement") {
    return `${indent}if (${b.condition}) { ${printStatement(b.ifBlock[0]!).trimEnd()} }\n`;
  }
  return `${indent}if (${b.condition}) {\n${b.ifBlock.map((s) => printStatement(s, `${indent}  `)).join("")}${indent}}\n`;
}
