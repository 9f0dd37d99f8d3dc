// The emitters: OpenQASM 3 layout and determinism, OpenQASM 2 checked by an outside simulator
// (the npm package quantum-circuit), JSON as documented data.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { randomKSat } from "../helpers/formulas.js";
import {
  CIRCUIT_FORMAT, cnfFromClauses, collect, compileOracle, emitJson, emitQasm2, emitQasm3, evaluate, qasm2Problem, type Cnf,
} from "../helpers/lib.js";
import { quantumCircuitRun } from "../helpers/reference.js";

const qasm3 = (cnf: Cnf, o = {}): string => collect((s) => emitQasm3(compileOracle(cnf, o).circuit, s, ["header"]));

describe("OpenQASM 3", () => {
  it("writes the expected program for a small phase oracle (mcx basis)", () => {
    const text = qasm3(cnfFromClauses(3, [[1, -2], [2, 3]]), { basis: "mcx" });
    expect(text).toBe(
      [
        "OPENQASM 3.0;",
        "// header",
        'include "stdgates.inc";',
        "qubit[3] vars;",
        "qubit[2] work;",
        "negctrl @ ctrl @ x vars[0], vars[1], work[0];",
        "negctrl(2) @ x vars[1], vars[2], work[1];",
        "x work[1];",
        "negctrl @ z work[0], work[1];",
        "x work[1];",
        "negctrl(2) @ x vars[1], vars[2], work[1];",
        "negctrl @ ctrl @ x vars[0], vars[1], work[0];",
        "",
      ].join("\n"),
    );
  });
  it("declares vars, work and target registers, and classical bits for measured uncomputation", () => {
    const text = qasm3(randomKSat(5, 8, 3, 1), { kind: "flag", basis: "clifford+t", uncompute: "measured" });
    expect(text).toMatch(/^qubit\[5\] vars;$/m);
    expect(text).toMatch(/^qubit\[1\] target;$/m);
    expect(text).toMatch(/^qubit\[\d+\] work;$/m);
    expect(text).toMatch(/^bit\[\d+\] outcome;$/m);
    expect(text).toMatch(/^outcome\[0\] = measure work\[\d+\];$/m);
    expect(text).toMatch(/^if \(outcome\[\d+\]\) \{ cz [^;]+; \}$/m);
    expect(text).toMatch(/^reset work\[\d+\];$/m);
  });
  it("uses only standard-library gates and the ctrl/negctrl modifiers", () => {
    for (const basis of ["mcx", "toffoli", "clifford+t"] as const) {
      const text = qasm3(randomKSat(6, 20, 3, 2), { basis, uncompute: "measured" });
      for (const line of text.split("\n").slice(5)) {
        if (line === "" || line === "}" || /^(outcome\[\d+\] = measure|reset|qubit|bit|gphase)|^if \(outcome\[\d+\]\) \{$/.test(line)) continue;
        const stmt = line.trim().replace(/^if \(outcome\[\d+\]\) \{ (.*) \}$/, "$1");
        expect(stmt).toMatch(/^((ctrl|negctrl)(\(\d+\))? @ )*(x|y|z|h|s|sdg|t|tdg|cx|cz|ccx) [a-z]+\[\d+\](, [a-z]+\[\d+\])*;$/);
      }
    }
  });
  it("writes gphase(pi) for a formula without clauses", () => {
    expect(qasm3(cnfFromClauses(2, []))).toMatch(/^gphase\(pi\);$/m);
  });
  it("is deterministic: byte-identical for the same input and options", () => {
    const f = randomKSat(10, 40, 3, 3);
    for (const basis of ["mcx", "toffoli", "clifford+t"] as const) expect(qasm3(f, { basis })).toBe(qasm3(f, { basis }));
  });
  it("writes in chunks, not one giant string", () => {
    const chunks: string[] = [];
    emitQasm3(compileOracle(randomKSat(50, 2000, 3, 4), { basis: "clifford+t" }).circuit, (s) => chunks.push(s));
    expect(chunks.length).toBeGreaterThan(5);
  });
});

describe("OpenQASM 2 through the npm package quantum-circuit", () => {
  /** Runs every basis input through quantum-circuit and compares with the oracle's definition. */
  function agree(cnf: Cnf, kind: "phase" | "flag", basis: "toffoli" | "clifford+t"): void {
    const oracle = compileOracle(cnf, { kind, basis });
    const qasm = collect((s) => emitQasm2(oracle.circuit, s));
    const n = cnf.variables;
    const target = oracle.circuit.registers.find((r) => r.role === "target");
    for (let x = 0; x < 2 ** n; x++) {
      const input = Array.from({ length: oracle.circuit.qubits }, (_, q) => (q < n ? (x >> q) & 1 : 0));
      const f = evaluate(cnf, input.slice(0, n).map(Boolean));
      const amps = quantumCircuitRun(qasm, input);
      const expectedIndex = kind === "flag" && f ? x + 2 ** target!.start : x;
      const sign = kind === "phase" && f ? -1 : 1;
      expect([...amps.keys()]).toEqual([expectedIndex]);
      const [re, im] = amps.get(expectedIndex)!;
      expect(re).toBeCloseTo(sign, 9);
      expect(im).toBeCloseTo(0, 9);
    }
  }
  const small = fc.integer({ min: 1, max: 4 }).chain((n) =>
    fc.record({ n: fc.constant(n), clauses: fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { minLength: 1, maxLength: 3 }), { minLength: 1, maxLength: 4 }) }),
  );
  it("phase and flag oracles, toffoli basis: amplitudes match on every basis input", { timeout: 120_000 }, () => {
    fc.assert(fc.property(small, fc.constantFrom("phase" as const, "flag" as const), ({ n, clauses }, kind) => agree(cnfFromClauses(n, clauses), kind, "toffoli")), { numRuns: 25 });
  });
  it("a clifford+t oracle of the allotment-pair scenario", { timeout: 120_000 }, () => {
    agree(cnfFromClauses(4, [[1, 2], [-1, -2], [3, 4], [-3, -4], [-1, -3], [-2, -4]]), "phase", "clifford+t");
  });
  it("writes measured uncomputation with one classical register per measurement", () => {
    const text = collect((s) => emitQasm2(compileOracle(randomKSat(5, 8, 3, 1), { basis: "toffoli", uncompute: "measured" }).circuit, s));
    expect(text).toMatch(/^creg outcome0\[1\];$/m);
    // The comment says how outcome[i] of the other forms maps to these cregs.
    expect(text).toMatch(/^\/\/ outcome\[i\] is the one-bit creg outcome<i> /m);
    expect(text).toMatch(/^measure work\[\d+\] -> outcome0\[0\];$/m);
    expect(text).toMatch(/^if\(outcome\d+==1\) cz /m);
  });
  it("refuses gates with more than two controls, saying which basis to use", () => {
    const c = compileOracle(randomKSat(6, 10, 3, 5), { basis: "mcx" }).circuit;
    expect(qasm2Problem(c)).toMatch(/use --basis toffoli/);
  });
});

describe("JSON", () => {
  it("is versioned data that rebuilds the same gate list", () => {
    const oracle = compileOracle(randomKSat(6, 12, 3, 6), { basis: "mcx", uncompute: "measured" });
    const doc = JSON.parse(collect((s) => emitJson(oracle.circuit, s, ["c"])));
    expect(doc).toMatchObject({ format: CIRCUIT_FORMAT, version: 1, qubits: oracle.circuit.qubits, clbits: oracle.circuit.clbits });
    expect(doc.registers.map((r: { name: string }) => r.name)).toEqual(["vars", "work"]);
    expect(doc.gates).toHaveLength(oracle.circuit.gates);
    const kinds = new Set(doc.gates.map((g: { op: string }) => g.op));
    expect([...kinds].every((k) => ["mcx", "mcz", "h", "measure", "reset", "x", "z", "cz", "cx", "ccx"].includes(k as string))).toBe(true);
    expect(doc.gates.some((g: { if?: number }) => g.if !== undefined)).toBe(true);
  });
});
