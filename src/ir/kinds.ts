/**
 * The one closed list of gate kinds. Every table below is a Record over it, so adding a kind
 * without saying how to name, invert and classify it fails to compile.
 *
 * Operand layout (all in one Int32Array, see circuit.ts):
 *   - qubit operands are encoded `(qubit << 1) | negated`; `negated` is 1 for a control that
 *     fires on |0> (only in kinds with polarity: mcx, mcz, and, unand), else 0;
 *   - `mcx`, `and`, `unand`: controls..., target (target last);
 *   - `mcz`: qubits...; the phase is -1 when every qubit matches its polarity;
 *   - `gphase`: one raw operand, the angle in units of pi/4 (0..7);
 *   - `measure`: qubit, then the raw classical bit index;
 *   - every gate may be conditioned on one classical bit being 1 (see Circuit.cond).
 */
export const GATE_KINDS = [
  "x", "y", "z", "h", "s", "sdg", "t", "tdg",
  "cx", "cz", "ccx",
  "mcx", "mcz",
  "and", "unand",
  "gphase", "measure", "reset",
] as const;

/** The name of a gate kind. */
export type GateKind = (typeof GATE_KINDS)[number];

/** Kind name -> small integer stored in Circuit.kind. */
export const K = Object.fromEntries(GATE_KINDS.map((k, i) => [k, i])) as { readonly [P in GateKind]: number };

/**
 * What a kind's operands are, in order: `qubits` (each encoded `(qubit << 1) | negated`),
 * `controls-target` (the same, target last), `angle` (one raw number, units of pi/4) or
 * `qubit-clbit` (one encoded qubit, then a raw classical-bit index). Readers, writers, counters
 * and simulators take the operand layout from here.
 */
export type OperandLayout = "qubits" | "controls-target" | "angle" | "qubit-clbit";
export const OPERAND_LAYOUT: Record<GateKind, OperandLayout> = {
  x: "qubits", y: "qubits", z: "qubits", h: "qubits", s: "qubits", sdg: "qubits", t: "qubits", tdg: "qubits",
  cx: "controls-target", cz: "qubits", ccx: "controls-target",
  mcx: "controls-target", mcz: "qubits", and: "controls-target", unand: "controls-target",
  gphase: "angle", measure: "qubit-clbit", reset: "qubits",
};

/** Encodes qubit q as an operand; `negated` marks a control that fires on |0>. */
export const encodeQubit = (q: number, negated = false): number => (q << 1) | (negated ? 1 : 0);

/** How many qubit operands a kind has; -1 when variable. */
export const QUBIT_ARITY: Record<GateKind, number> = {
  x: 1, y: 1, z: 1, h: 1, s: 1, sdg: 1, t: 1, tdg: 1,
  cx: 2, cz: 2, ccx: 3,
  mcx: -1, mcz: -1, and: -1, unand: -1,
  gphase: 0, measure: 1, reset: 1,
};

/** Kinds whose controls carry a polarity. */
export const HAS_POLARITY: Record<GateKind, boolean> = {
  x: false, y: false, z: false, h: false, s: false, sdg: false, t: false, tdg: false,
  cx: false, cz: false, ccx: false,
  mcx: true, mcz: true, and: true, unand: true,
  gphase: false, measure: false, reset: false,
};

/** The kind that undoes a kind on the same operands (null: not a unitary, e.g. measure). */
export const INVERSE: Record<GateKind, GateKind | null> = {
  x: "x", y: "y", z: "z", h: "h", s: "sdg", sdg: "s", t: "tdg", tdg: "t",
  cx: "cx", cz: "cz", ccx: "ccx",
  mcx: "mcx", mcz: "mcz", and: "unand", unand: "and",
  gphase: "gphase", measure: null, reset: null,
};

/**
 * How a gate acts on each qubit it touches, for commutation: "z" when it is diagonal there
 * (phase gates, controls), "x" when it acts as a bit flip there (X, targets of controlled X),
 * "other" otherwise. Two gates commute when on every shared qubit both are "z" or both "x".
 * Returns the role of operand position `i` of `n` qubit operands.
 */
export type Role = "z" | "x" | "other";
export function roleOf(kind: GateKind, i: number, n: number): Role {
  switch (kind) {
    case "z": case "s": case "sdg": case "t": case "tdg": case "cz": case "mcz":
      return "z";
    case "x":
      return "x";
    case "cx": case "ccx": case "mcx":
      return i === n - 1 ? "x" : "z";
    case "and": case "unand":
      // The target of a temporary AND must be |0> before (and) or hold the AND (unand): it
      // commutes with nothing there; its controls are only read.
      return i === n - 1 ? "other" : "z";
    case "y": case "h": case "measure": case "reset": case "gphase":
      return "other";
  }
}

/** Phase exponent (units of pi/4) of single-qubit diagonal gates, for merging runs of them. */
export const PHASE_EIGHTHS: Partial<Record<GateKind, number>> = { t: 1, s: 2, z: 4, sdg: 6, tdg: 7 };

/** Two-qubit gates that count as one CNOT in cost reports (a CZ is one CNOT between Hadamards). */
export const IS_CNOT: Record<GateKind, boolean> = Object.fromEntries(GATE_KINDS.map((k) => [k, k === "cx" || k === "cz"])) as Record<GateKind, boolean>;

/** Kinds that are a Toffoli when they have exactly three qubit operands (ccx always has). */
export const TOFFOLI_AT_THREE: Record<GateKind, boolean> = Object.fromEntries(
  GATE_KINDS.map((k) => [k, k === "ccx" || k === "mcx" || k === "and" || k === "unand"]),
) as Record<GateKind, boolean>;

/** T-type gates (non-Clifford). */
export const IS_T: Record<GateKind, boolean> = Object.fromEntries(GATE_KINDS.map((k) => [k, k === "t" || k === "tdg"])) as Record<GateKind, boolean>;

/** Role codes for hot loops: the numeric form of {@link Role}. */
export const ROLE_Z = 0;
export const ROLE_X = 1;
export const ROLE_OTHER = 2;
const roleCode = (r: Role): number => (r === "z" ? ROLE_Z : r === "x" ? ROLE_X : ROLE_OTHER);
/** Role of a kind on its operands other than the last, and on the last, by kind number. */
export const ROLE_BODY = Uint8Array.from(GATE_KINDS, (k) => roleCode(roleOf(k, 0, 3)));
export const ROLE_LAST = Uint8Array.from(GATE_KINDS, (k) => roleCode(roleOf(k, 2, 3)));
/** Inverse kind by kind number, -1 when none. */
export const INVERSE_KIND = Int8Array.from(GATE_KINDS, (k) => (INVERSE[k] === null ? -1 : GATE_KINDS.indexOf(INVERSE[k]!)));
