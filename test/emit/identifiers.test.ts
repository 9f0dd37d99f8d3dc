// Well-formedness beyond the grammar: every name an emitted program declares must be free in the
// one global scope that OpenQASM 3 programs share with their includes.
import { describe, expect, it } from "vitest";
import { randomKSat } from "../helpers/formulas.js";
import {
  cnfFromClauses, collect, compileOracle, compileSearch, emitQasm2, emitQasm3, qasm2Problem, type Circuit, type Cnf,
} from "../helpers/lib.js";

// Gates that `include "stdgates.inc"` declares: OpenQASM 3 specification, "Standard library"
// (the file stdgates.inc as published in the openqasm/openqasm repository, examples/stdgates.inc),
// plus the built-in gates U and gphase (specification, "Built-in quantum instructions").
const STDGATES = [
  "p", "x", "y", "z", "h", "s", "sdg", "t", "tdg", "sx", "rx", "ry", "rz", "cx", "cy", "cz", "cp", "crx", "cry", "crz", "ch",
  "swap", "ccx", "cswap", "cu", "CX", "phase", "cphase", "id", "u1", "u2", "u3", "U", "gphase",
];

// Gates of OpenQASM 2's qelib1.inc: Cross, Bishop, Smolin & Gambetta 2017, "Open Quantum Assembly
// Language", arXiv:1707.03429, appendix (the file as later extended with sx, sxdg, swap, cswap, csx,
// cu, rxx, rzz, rccx, rc3x, c3x, c3sqrtx, c4x, p, cp: from memory), plus the built-ins U and CX.
const QELIB1 = [
  "u3", "u2", "u1", "cx", "id", "u0", "u", "p", "x", "y", "z", "h", "s", "sdg", "t", "tdg", "rx", "ry", "rz", "sx", "sxdg", "cz",
  "cy", "swap", "ch", "ccx", "cswap", "crx", "cry", "crz", "cu1", "cp", "cu3", "csx", "cu", "rxx", "rzz", "rccx", "rc3x", "c3x",
  "c3sqrtx", "c4x", "U", "CX",
];

// OpenQASM 3 keywords and reserved names: the lexer grammar of the specification
// (openqasm/openqasm, source/grammar/qasm3Lexer.g4, "Language keywords", "Types", "Builtin
// identifiers and operations"), the built-in constants (pi, tau, euler and their Unicode forms;
// specification, "Built-in constants") and the built-in functions (specification, "Built-in
// classical functions": arccos ... tan, sizeof, popcount, rotl, rotr, real, imag, mod).
const QASM3_RESERVED = [
  "OPENQASM", "include", "defcalgrammar", "def", "cal", "defcal", "gate", "extern", "box", "let", "break", "continue", "if",
  "else", "end", "return", "for", "while", "in", "switch", "case", "default", "nop", "pragma", "input", "output", "const",
  "readonly", "mutable", "qreg", "qubit", "creg", "bool", "bit", "int", "uint", "float", "angle", "complex", "array", "void",
  "duration", "stretch", "gphase", "inv", "pow", "ctrl", "negctrl", "durationof", "delay", "reset", "measure", "barrier",
  "true", "false", "im", "pi", "π", "tau", "τ", "euler", "ℇ", "arccos", "arcsin", "arctan", "ceiling", "cos", "exp", "floor",
  "log", "mod", "popcount", "pow", "rotl", "rotr", "sin", "sqrt", "tan", "sizeof", "real", "imag",
];

// OpenQASM 2 keywords: Cross et al. 2017, section 3 (the language's statements and built-in functions).
const QASM2_RESERVED = [
  "OPENQASM", "include", "qreg", "creg", "gate", "opaque", "barrier", "measure", "reset", "if", "U", "CX", "pi", "sin", "cos",
  "tan", "exp", "ln", "sqrt",
];

/** Names a program declares: registers, classical bits, gates and subroutines. */
function declared(text: string): string[] {
  const names: string[] = [];
  const patterns = [
    /^\s*qubit\[\d+\]\s+(\w+)\s*;/gm,
    /^\s*qubit\s+(\w+)\s*;/gm,
    /^\s*bit\[\d+\]\s+(\w+)\s*;/gm,
    /^\s*bit\s+(\w+)\s*;/gm,
    /^\s*(?:qreg|creg)\s+(\w+)\s*\[/gm,
    /^\s*gate\s+(\w+)/gm,
    /^\s*def\s+(\w+)/gm,
    /^\s*(?:const\s+)?(?:int|uint|float|angle|bool)(?:\[\d+\])?\s+(\w+)\s*[=;]/gm,
  ];
  for (const p of patterns) for (const m of text.matchAll(p)) names.push(m[1]!);
  return names;
}

function circuits(): { name: string; circuit: Circuit }[] {
  const formulas: [string, Cnf][] = [
    ["random 3-SAT", randomKSat(6, 14, 3, 7)],
    ["with unit clauses", cnfFromClauses(4, [[1], [-2, 3], [2, 3, -4], [1, 4]])],
    ["empty formula", cnfFromClauses(3, [])],
  ];
  const out: { name: string; circuit: Circuit }[] = [];
  for (const [fname, cnf] of formulas) {
    for (const kind of ["phase", "flag"] as const) {
      for (const basis of ["mcx", "toffoli", "clifford+t"] as const) {
        for (const uncompute of ["unitary", "measured"] as const) {
          for (const strategy of ["wide", "lean"] as const) {
            out.push({ name: `${fname} ${kind} ${basis} ${uncompute} ${strategy}`, circuit: compileOracle(cnf, { kind, basis, uncompute, strategy }).circuit });
          }
        }
      }
    }
    out.push({ name: `${fname} search`, circuit: compileSearch(cnf, { iterations: 2, uncompute: "measured" }) });
  }
  return out;
}

describe("declared identifiers", () => {
  const all = circuits();
  it("OpenQASM 3: no declared name is a stdgates.inc gate, a keyword or declared twice", () => {
    const forbidden = new Set([...STDGATES, ...QASM3_RESERVED]);
    for (const { name, circuit } of all) {
      const text = collect((s) => emitQasm3(circuit, s, ["check"]));
      const names = declared(text);
      expect(names.length, name).toBeGreaterThan(0);
      expect(names.filter((n) => forbidden.has(n)), name).toEqual([]);
      expect(new Set(names).size, `${name}: one global scope, each name once`).toBe(names.length);
    }
  });
  it("OpenQASM 2: no declared name is a qelib1.inc gate, a keyword or declared twice", () => {
    const forbidden = new Set([...QELIB1, ...QASM2_RESERVED]);
    let checked = 0;
    for (const { name, circuit } of all) {
      if (qasm2Problem(circuit) !== null) continue;
      const text = collect((s) => emitQasm2(circuit, s, ["check"]));
      const names = declared(text);
      expect(names.filter((n) => forbidden.has(n)), name).toEqual([]);
      expect(new Set(names).size, name).toBe(names.length);
      checked++;
    }
    expect(checked).toBeGreaterThan(20);
  });
  it("the checker itself catches the old clash (qubit[n] x;)", () => {
    const forbidden = new Set([...STDGATES, ...QASM3_RESERVED]);
    expect(declared('OPENQASM 3.0;\ninclude "stdgates.inc";\nqubit[3] x;\nbit[2] outcome;\n').filter((n) => forbidden.has(n))).toEqual(["x"]);
  });
  it("every register the circuit names is declared, and every name used in a statement is declared or a gate", () => {
    for (const { name, circuit } of all.slice(0, 12)) {
      const text = collect((s) => emitQasm3(circuit, s, []));
      const names = new Set(declared(text));
      for (const m of text.matchAll(/\b(\w+)\[\d+\]/g)) {
        if (m[1] === "qubit" || m[1] === "bit") continue;
        expect(names.has(m[1]!), `${name}: ${m[1]} used but not declared`).toBe(true);
      }
    }
  });
});
