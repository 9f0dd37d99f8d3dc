/**
 * Circuit -> OpenQASM 3 syntax: the program head, then statements one gate at a time (a
 * generator, so a million-gate circuit is never held as a tree).
 */
import { GATE_KINDS, K } from "../../ir/kinds.js";
import { negated, operands, OUTCOME_REGISTER, qubitOf, type Circuit } from "../../ir/circuit.js";
import { angleText, qubitNamer } from "../names.js";
import type { Program, QuantumGate, QuantumGateModifier, Statement } from "./ast.js";

export { OUTCOME_REGISTER };

export function programHead(c: Circuit, comments: readonly string[]): Program {
  return {
    kind: "Program",
    version: "3.0",
    header: comments.map((text) => ({ kind: "Comment", text })),
    includes: [{ kind: "Include", filename: "stdgates.inc" }],
    declarations: [
      ...c.registers.filter((r) => r.size > 0).map((r) => ({ kind: "QubitDeclaration" as const, name: r.name, size: r.size })),
      ...(c.clbits > 0 ? [{ kind: "ClassicalDeclaration" as const, type: "bit" as const, name: OUTCOME_REGISTER, size: c.clbits }] : []),
    ],
  };
}

/**
 * Visits the statements of every gate in order (usually one per gate; a Z-type gate whose
 * qubits all fire on |0> needs X around it). A callback rather than a generator: this runs once
 * per gate of circuits with millions of them.
 */
export function forEachStatement(c: Circuit, visit: (s: Statement) => void, name: (q: number) => string = qubitNamer(c)): void {
  for (let g = 0; g < c.gates; g++) {
    const cond = c.cond[g]!;
    const k = c.kind[g]!;
    if (cond < 0 && k <= K.ccx) {
      // Fixed gates (x ... ccx): the common case, without the general path's allocations.
      const s = c.opStart[g]!;
      const e = c.opStart[g + 1]!;
      const qubits: string[] = [];
      for (let i = s; i < e; i++) qubits.push(name(c.ops[i]! >>> 1));
      visit({ kind: "QuantumGate", modifiers: NONE, name: GATE_KINDS[k]!, args: NONE_ARGS, qubits });
      continue;
    }
    const body = gateStatements(c, g, name);
    if (cond >= 0) visit({ kind: "BranchingStatement", condition: `${OUTCOME_REGISTER}[${cond}]`, ifBlock: body });
    else for (const st of body) visit(st);
  }
}

const NONE: readonly QuantumGateModifier[] = [];
const NONE_ARGS: readonly string[] = [];

const gate = (gname: string, qubits: string[], modifiers: QuantumGateModifier[] = [], args: string[] = []): QuantumGate => ({
  kind: "QuantumGate",
  modifiers,
  name: gname,
  args,
  qubits,
});

function gateStatements(c: Circuit, g: number, name: (q: number) => string): Statement[] {
  const kind = GATE_KINDS[c.kind[g]!]!;
  const ops = operands(c, g);
  switch (kind) {
    case "gphase":
      return [{ kind: "QuantumPhase", argument: angleText(ops[0]!) }];
    case "measure":
      return [{ kind: "QuantumMeasurementStatement", qubit: name(qubitOf(ops[0]!)), target: `${OUTCOME_REGISTER}[${ops[1]}]` }];
    case "reset":
      return [{ kind: "QuantumReset", qubit: name(qubitOf(ops[0]!)) }];
    case "mcx":
    case "and":
    case "unand":
      return [controlled("x", Array.from(ops.subarray(0, -1)), qubitOf(ops[ops.length - 1]!), name)];
    case "mcz":
      return mcz(Array.from(ops), name);
    default:
      return [gate(kind, Array.from(ops, (op) => name(qubitOf(op))))];
  }
}

/** A gate under controls with polarities: the usual names where they exist (x, cx, ccx, z, cz). */
function controlled(base: "x" | "z", ctrls: number[], target: number, name: (q: number) => string): QuantumGate {
  const qubits = [...ctrls.map((op) => name(qubitOf(op))), name(target)];
  const allPositive = ctrls.every((op) => !negated(op));
  if (allPositive && ctrls.length <= (base === "x" ? 2 : 1)) return gate(["", "c", "cc"][ctrls.length] + base, qubits);
  const modifiers: QuantumGateModifier[] = [];
  for (const op of ctrls) {
    const m = negated(op) ? "negctrl" : "ctrl";
    const last = modifiers[modifiers.length - 1];
    if (last?.modifier === m) modifiers[modifiers.length - 1] = { ...last, count: last.count + 1 };
    else modifiers.push({ kind: "QuantumGateModifier", modifier: m, count: 1 });
  }
  return gate(base, qubits, modifiers);
}

/** Phase -1 when every qubit matches its polarity: Z on a qubit that fires on |1>, controlled by the rest. */
function mcz(ops: number[], name: (q: number) => string): Statement[] {
  if (ops.length === 0) return [{ kind: "QuantumPhase", argument: "pi" }];
  let t = ops.findIndex((op) => !negated(op));
  const wrap = t < 0;
  if (wrap) t = ops.length - 1;
  const target = qubitOf(ops[t]!);
  const ctrls = ops.filter((_, i) => i !== t);
  const z = controlled("z", ctrls, target, name);
  if (!wrap) return [z];
  const x = gate("x", [name(target)]);
  return [x, z, x];
}
