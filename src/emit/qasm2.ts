/**
 * The OpenQASM 2.0 emitter (qelib1.inc, qreg/creg), for toolchains that read only 2.0. Gates with
 * more than two controls cannot be written (2.0 has no control modifier): use the toffoli or
 * clifford+t basis. Measured uncomputation is written exactly: every measurement gets a one-bit
 * register of its own, so that `if (m3==1) cz ...` tests that one outcome.
 */
import { GATE_KINDS } from "../ir/kinds.js";
import { negated, operands, qubitOf, type Circuit } from "../ir/circuit.js";
import { qubitNamer } from "./names.js";
import { batched, type Sink } from "./sink.js";

/** Why `c` cannot be written as OpenQASM 2.0, or null when it can. */
export function qasm2Problem(c: Circuit): string | null {
  if (c.qubits === 0) return "the circuit has no qubits; OpenQASM 2.0 cannot declare an empty register";
  for (let g = 0; g < c.gates; g++) {
    const kind = GATE_KINDS[c.kind[g]!]!;
    const n = operands(c, g).length;
    if ((kind === "mcx" || kind === "and" || kind === "unand") && n - 1 > 2) {
      return `a ${n - 1}-controlled X gate (the qelib1.inc of OpenQASM 2.0, Cross et al. 2017, has none beyond ccx); use --basis toffoli or --basis clifford+t`;
    }
    if (kind === "mcz" && n > 2) return `a ${n - 1}-controlled Z gate (the qelib1.inc of OpenQASM 2.0, Cross et al. 2017, has none beyond cz); use --basis toffoli or --basis clifford+t`;
  }
  return null;
}

/** Writes `c` as OpenQASM 2.0; throws if {@link qasm2Problem} says it cannot be written. */
export function emitQasm2(c: Circuit, out: Sink, comments: readonly string[] = []): void {
  const problem = qasm2Problem(c);
  if (problem !== null) throw new Error(problem);
  const w = batched(out);
  const name = qubitNamer(c);
  w.write("OPENQASM 2.0;\n");
  for (const t of comments) w.write(`// ${t}\n`);
  w.write('include "qelib1.inc";\n');
  for (const r of c.registers) if (r.size > 0) w.write(`qreg ${r.name}[${r.size}];\n`);
  // OpenQASM 2 conditions test a whole creg: one creg per bit, named so that outcome[i] of the
  // OpenQASM 3 and JSON forms (and of the comments above) is outcome<i> here.
  if (c.clbits > 0) w.write(`// outcome[i] is the one-bit creg outcome<i> (OpenQASM 2 conditions test a whole creg)\n`);
  for (let b = 0; b < c.clbits; b++) w.write(`creg outcome${b}[1];\n`);
  for (let g = 0; g < c.gates; g++) {
    const cond = c.cond[g]!;
    const prefix = cond >= 0 ? `if(outcome${cond}==1) ` : "";
    for (const line of gateLines(c, g, name)) w.write(`${prefix}${line};\n`);
  }
  w.flush();
}

function gateLines(c: Circuit, g: number, name: (q: number) => string): string[] {
  const kind = GATE_KINDS[c.kind[g]!]!;
  const ops = Array.from(operands(c, g));
  switch (kind) {
    case "gphase": {
      // A global phase as gates: X Z X Z = -I; for other angles u1(a) X u1(a) X = e^(ia) I.
      const q = name(0);
      const k = ops[0]! % 8;
      if (k === 0) return [];
      if (k === 4) return [`x ${q}`, `z ${q}`, `x ${q}`, `z ${q}`];
      const a = `${k}*pi/4`;
      return [`u1(${a}) ${q}`, `x ${q}`, `u1(${a}) ${q}`, `x ${q}`];
    }
    case "measure":
      return [`measure ${name(qubitOf(ops[0]!))} -> outcome${ops[1]}[0]`];
    case "reset":
      return [`reset ${name(qubitOf(ops[0]!))}`];
    case "mcx":
    case "and":
    case "unand":
      return withPolarity(ops.slice(0, -1), name, (qs) => `${["x", "cx", "ccx"][qs.length]} ${[...qs, name(qubitOf(ops[ops.length - 1]!))].join(",")}`);
    case "mcz":
      if (ops.length === 0) return gateLines({ ...c, kind: Uint8Array.of(GATE_KINDS.indexOf("gphase")), ops: Int32Array.of(4), opStart: Uint32Array.of(0, 1), cond: Int32Array.of(-1), gates: 1 }, 0, name);
      return withPolarity(ops, name, (qs) => `${["", "z", "cz"][qs.length]} ${qs.join(",")}`);
    default:
      return [`${kind} ${ops.map((op) => name(qubitOf(op))).join(",")}`];
  }
}

/** X around controls that fire on |0>. */
function withPolarity(ctrls: number[], name: (q: number) => string, body: (qs: string[]) => string): string[] {
  const flips = ctrls.filter(negated).map((op) => `x ${name(qubitOf(op))}`);
  return [...flips, body(ctrls.map((op) => name(qubitOf(op)))), ...flips];
}
