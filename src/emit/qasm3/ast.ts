/**
 * A small OpenQASM 3 syntax tree, node names as in the specification. Only what clausegate
 * emits: a straight-line program of gates, measurements, resets and one-statement branches.
 */

export interface Program {
  readonly kind: "Program";
  readonly version: string;
  readonly header: readonly Comment[];
  readonly includes: readonly Include[];
  readonly declarations: readonly (QubitDeclaration | ClassicalDeclaration)[];
}

export interface Comment {
  readonly kind: "Comment";
  readonly text: string;
}

export interface Include {
  readonly kind: "Include";
  readonly filename: string;
}

export interface QubitDeclaration {
  readonly kind: "QubitDeclaration";
  readonly name: string;
  readonly size: number;
}

export interface ClassicalDeclaration {
  readonly kind: "ClassicalDeclaration";
  readonly type: "bit";
  readonly name: string;
  readonly size: number;
}

/** `ctrl(n) @` or `negctrl(n) @`. */
export interface QuantumGateModifier {
  readonly kind: "QuantumGateModifier";
  readonly modifier: "ctrl" | "negctrl";
  readonly count: number;
}

export interface QuantumGate {
  readonly kind: "QuantumGate";
  readonly modifiers: readonly QuantumGateModifier[];
  readonly name: string;
  readonly args: readonly string[];
  readonly qubits: readonly string[];
}

export interface QuantumPhase {
  readonly kind: "QuantumPhase";
  readonly argument: string;
}

export interface QuantumMeasurementStatement {
  readonly kind: "QuantumMeasurementStatement";
  readonly qubit: string;
  readonly target: string;
}

export interface QuantumReset {
  readonly kind: "QuantumReset";
  readonly qubit: string;
}

export interface BranchingStatement {
  readonly kind: "BranchingStatement";
  readonly condition: string;
  readonly ifBlock: readonly Statement[];
}

export type Statement = QuantumGate | QuantumPhase | QuantumMeasurementStatement | QuantumReset | BranchingStatement;
