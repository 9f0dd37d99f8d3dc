/**
 * The rules a circuit must keep, in one place: the circuit readers check each gate's fields with
 * them before building anything (so that a diagnostic can point at the offending value), and
 * `--check-passes` checks every pass's output with them.
 */
import { GATE_KINDS, HAS_POLARITY, QUBIT_ARITY, type GateKind } from "./kinds.js";
import { negated, operands, qubitOf, SEARCH_REGISTER, type Circuit, type RegisterRole } from "./circuit.js";

/**
 * The most qubits a circuit file may declare: 2^26 = 67,108,864. Far above what clausegate writes
 * for a million clauses, and low enough that the simulators' per-qubit arrays stay allocatable
 * (operands are stored as `qubit << 1` in 32-bit integers, which needs fewer than 2^30).
 */
export const MAX_CIRCUIT_QUBITS = 2 ** 26;
/** The most classical bits a circuit file may declare (the same bound). */
export const MAX_CIRCUIT_CLBITS = 2 ** 26;

/** Which field of a gate breaks a rule: its element index (-1 for the field as a whole) and why. */
export interface GateFault {
  readonly field: "qubits" | "negated" | "angle" | "clbit" | "if";
  readonly index: number;
  readonly message: string;
}

/** One gate's fields as a file gives them (values not yet known to be integers). */
export interface GateFields {
  readonly kind: GateKind;
  /** Qubit indices. */
  readonly qubits: ArrayLike<number>;
  /** Positions in `qubits` of controls that fire on |0>. */
  readonly negated: ArrayLike<number>;
  /** The gphase angle in units of pi/4, if given. */
  readonly angle: number | undefined;
  /** The classical bit a measurement writes, if given. */
  readonly clbit: number | undefined;
  /** The classical bit the gate is conditioned on, if any. */
  readonly cond: number | undefined;
  /**
   * A value as the file wrote it, for messages (a reader of text gives its source: a huge
   * number reads back as a double, whose own text would be "1e+23").
   */
  shown?(field: GateFault["field"], index: number): string;
}

const isIndex = (x: number, size: number): boolean => Number.isInteger(x) && x >= 0 && x < size;
/** "expected WHAT in 0..size-1 but found X", or, when there are none to choose from, says so. */
const outOf = (what: string, plural: string, size: number, found: string): string =>
  size === 0 ? `expected ${what}, but the circuit declares no ${plural}; found ${found}` : `expected ${what} in 0..${size - 1} but found ${found}`;
/** A field's value for a message: as the file wrote it when the reader knows, else the number. */
const shownOf = (g: GateFields, field: GateFault["field"], index: number, v: number): string => g.shown?.(field, index) ?? String(v);
/** Kinds whose last qubit is a target (so it cannot carry a polarity). */
const HAS_TARGET: Partial<Record<GateKind, true>> = { mcx: true, and: true, unand: true };

/**
 * Checks gates against a circuit's qubit and classical-bit counts. Reuses one scratch array for
 * the repeated-qubit check, so a million gates cost no allocation.
 */
export class GateChecker {
  private seen: Int32Array;
  private gen = 0;

  constructor(readonly qubits: number, readonly clbits: number, private readonly qubitName: (q: number) => string = (q) => `qubit ${q}`) {
    this.seen = new Int32Array(Math.max(qubits, 0));
  }

  /** The first rule the gate breaks, or null. */
  check(g: GateFields): GateFault | null {
    const { kind, qubits: qs, negated: neg } = g;
    const nq = qs.length;
    const arity = QUBIT_ARITY[kind];
    if (arity >= 0 && nq !== arity) return { field: "qubits", index: -1, message: `expected ${arity} qubit${arity === 1 ? "" : "s"} for ${kind} but found ${nq}` };
    if (HAS_TARGET[kind] && nq < 1) return { field: "qubits", index: -1, message: `expected at least one qubit (the target) for ${kind} but found none` };
    if (++this.gen === 0x7fffffff) {
      this.seen.fill(0);
      this.gen = 1;
    }
    for (let i = 0; i < nq; i++) {
      const q = qs[i]!;
      if (!isIndex(q, this.qubits)) return { field: "qubits", index: i, message: outOf("a qubit", "qubits", this.qubits, shownOf(g, "qubits", i, q)) };
      if (this.seen[q] === this.gen) return { field: "qubits", index: i, message: `expected distinct qubits but ${this.qubitName(q)} appears twice` };
      this.seen[q] = this.gen;
    }
    if (neg.length > 0 && !HAS_POLARITY[kind]) return { field: "negated", index: -1, message: `expected no negated controls: ${kind} has no control polarity` };
    for (let i = 0; i < neg.length; i++) {
      const p = neg[i]!;
      const controls = HAS_TARGET[kind] ? nq - 1 : nq;
      if (!isIndex(p, controls)) {
        const what = controls === 0 ? "none (the gate has no controls)" : `0..${controls - 1}`;
        const target = HAS_TARGET[kind] && p === nq - 1 ? ` (position ${p} is the target, which has no polarity)` : "";
        return { field: "negated", index: i, message: `expected a control position in ${what} but found ${shownOf(g, "negated", i, p)}${target}` };
      }
      for (let k = 0; k < i; k++) if (neg[k] === p) return { field: "negated", index: i, message: `expected distinct positions but ${p} appears twice` };
    }
    if (kind === "gphase") {
      if (g.angle === undefined) return { field: "angle", index: -1, message: "expected an angle for gphase but found none" };
      if (!isIndex(g.angle, 8)) return { field: "angle", index: -1, message: `expected an angle in 0..7 (units of pi/4) but found ${shownOf(g, "angle", -1, g.angle)}` };
    } else if (g.angle !== undefined) return { field: "angle", index: -1, message: `expected no angle: only gphase has one, not ${kind}` };
    if (kind === "measure") {
      if (g.clbit === undefined) return { field: "clbit", index: -1, message: "expected the classical bit a measure writes but found none" };
      if (!isIndex(g.clbit, this.clbits)) return { field: "clbit", index: -1, message: outOf("a classical bit", "classical bits", this.clbits, shownOf(g, "clbit", -1, g.clbit)) };
    } else if (g.clbit !== undefined) return { field: "clbit", index: -1, message: `expected no classical bit: only measure writes one, not ${kind}` };
    if (g.cond !== undefined && !isIndex(g.cond, this.clbits)) {
      return { field: "if", index: -1, message: outOf("a condition on a classical bit", "classical bits", this.clbits, shownOf(g, "if", -1, g.cond)) };
    }
    return null;
  }
}

/** One register as a file gives it (values not yet known to be of the right types). */
export interface RegisterFields {
  readonly name: string;
  readonly role: string;
  readonly start: number;
  readonly size: number;
}

/** Which field of which register breaks a rule ("total": the registers together), and why. */
export interface RegisterFault {
  readonly index: number;
  readonly field: "name" | "role" | "start" | "size" | "total";
  readonly message: string;
}

/** The registers clausegate writes, in this order; each appears at most once. */
export const REGISTER_ORDER: readonly { readonly name: string; readonly role: RegisterRole }[] = [
  { name: SEARCH_REGISTER, role: "search" },
  { name: "target", role: "target" },
  { name: "work", role: "work" },
];

/**
 * Registers: known names with their roles, in the order vars, target, work, each starting where
 * the one before it ends (so none overlap and none leave a gap), sizes in 0..{@link
 * MAX_CIRCUIT_QUBITS} (the target exactly 1), and together `qubits` qubits.
 */
export function checkRegisters(regs: readonly RegisterFields[], qubits: number): RegisterFault | null {
  let end = 0;
  let rank = -1;
  const names = REGISTER_ORDER.map((r) => r.name).join(", ");
  for (let i = 0; i < regs.length; i++) {
    const r = regs[i]!;
    const k = REGISTER_ORDER.findIndex((o) => o.name === r.name);
    if (k < 0) return { index: i, field: "name", message: `expected a register named ${names} but found ${JSON.stringify(r.name)}` };
    if (k <= rank) return { index: i, field: "name", message: `expected the registers in the order ${names}, each once, but found ${r.name} after ${REGISTER_ORDER[rank]!.name}` };
    rank = k;
    const want = REGISTER_ORDER[k]!.role;
    if (r.role !== want) return { index: i, field: "role", message: `expected the role "${want}" for register ${r.name} but found ${JSON.stringify(r.role)}` };
    if (!Number.isInteger(r.size) || r.size < 0 || r.size > MAX_CIRCUIT_QUBITS) {
      return { index: i, field: "size", message: `expected a register size in 0..${MAX_CIRCUIT_QUBITS} but found ${r.size}` };
    }
    if (r.role === "target" && r.size !== 1) return { index: i, field: "size", message: `expected the target register to hold 1 qubit but found ${r.size}` };
    if (r.start !== end) {
      return { index: i, field: "start", message: `expected register ${r.name} to start at qubit ${end}, where the one before it ends, but found ${r.start}` };
    }
    end += r.size;
    if (end > MAX_CIRCUIT_QUBITS) return { index: i, field: "size", message: `expected at most ${MAX_CIRCUIT_QUBITS} qubits in all but the registers hold ${end}` };
  }
  if (end !== qubits) return { index: -1, field: "total", message: `expected the circuit's qubit count to be ${end}, what its registers hold, but found ${qubits}` };
  return null;
}

/** Gates of a built circuit decoded into the fields {@link GateChecker} checks, in arrays reused per gate. */
class DecodedGate implements GateFields {
  kind: GateKind = "x";
  readonly qubits: number[] = [];
  readonly negated: number[] = [];
  angle: number | undefined;
  clbit: number | undefined;
  cond: number | undefined;

  decode(c: Circuit, g: number): this {
    const kind = (this.kind = GATE_KINDS[c.kind[g]!]!);
    const ops = operands(c, g);
    const nq = kind === "gphase" ? 0 : kind === "measure" ? 1 : ops.length;
    this.qubits.length = 0;
    this.negated.length = 0;
    for (let i = 0; i < nq; i++) {
      this.qubits.push(qubitOf(ops[i]!));
      if (negated(ops[i]!)) this.negated.push(i);
    }
    this.angle = kind === "gphase" ? (ops.length === 1 ? ops[0]! : NaN) : undefined;
    this.clbit = kind === "measure" ? (ops.length === 2 ? ops[1]! : NaN) : undefined;
    this.cond = c.cond[g]! === -1 ? undefined : c.cond[g]!;
    return this;
  }
}

/** Returns the first broken invariant of a built circuit, or null. */
export function validateCircuit(c: Circuit): string | null {
  const regs = checkRegisters(c.registers, c.qubits);
  if (regs !== null) return regs.index < 0 ? regs.message : `register ${regs.index}: ${regs.message}`;
  if (c.opStart.length !== c.gates + 1 || c.kind.length !== c.gates || c.cond.length !== c.gates) return "array lengths disagree with the gate count";
  const checker = new GateChecker(c.qubits, c.clbits);
  const gate = new DecodedGate();
  for (let g = 0; g < c.gates; g++) {
    const name = GATE_KINDS[c.kind[g]!];
    if (name === undefined) return `gate ${g}: unknown kind ${c.kind[g]}`;
    const fault = checker.check(gate.decode(c, g));
    if (fault !== null) return `gate ${g} (${name}): ${fault.message}`;
  }
  return null;
}
