// Every optimizer pass keeps the circuit's exact action (simulated on every basis input,
// global phase included) and never adds gates: checked on random circuits.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { arbitraryCircuit, checkPassLaws, CircuitBuilder, K } from "../helpers/circuits.js";
import { PASSES, DEFAULT_PIPELINE } from "../../dist/src/passes/registry.js";
import { runPasses } from "../../dist/src/passes/runner.js";
import { collect, emitQasm3 } from "../helpers/lib.js";

describe("optimizer pass laws", () => {
  for (const name of Object.keys(PASSES)) {
    it(`${name}: same action, never more gates`, () => {
      fc.assert(fc.property(arbitraryCircuit(4), (c) => checkPassLaws(PASSES[name]!.run, c)), { numRuns: 300 });
    });
  }
  it("the default pipeline: same action, never more gates", () => {
    fc.assert(fc.property(arbitraryCircuit(5, 40), (c) => checkPassLaws((x) => runPasses(x, DEFAULT_PIPELINE, { validate: true }), c)), { numRuns: 200 });
  });
});

describe("what the passes do", () => {
  // Operands are encoded (qubit << 1) | negated: 4 is qubit 2, 5 qubit 2 firing on |0>.
  const text = (b: CircuitBuilder): string =>
    collect((s) => emitQasm3(runPasses(b.finish(), DEFAULT_PIPELINE), s))
      .split("\n")
      .filter((l) => !/^(OPENQASM|include|qubit|bit)/.test(l))
      .join("\n");
  it("cancels X pairs, H pairs and CX pairs, also through commuting gates", () => {
    const b = new CircuitBuilder({ search: 3, target: 0 });
    b.add(K.x, 4).add(K.cx, 0, 4).add(K.x, 4); // X on a CX target passes the CX
    b.add(K.h, 2).add(K.h, 2);
    b.add(K.cx, 0, 2).add(K.z, 0).add(K.cx, 0, 2); // Z on the control commutes with CX
    // x q2; cx q0 q2; x q2 | h q1; h q1 | cx q0 q1; z q0; cx q0 q1
    expect(text(b)).toBe("cx vars[0], vars[2];\nz vars[0];\n");
  });
  it("merges phase gates: T T -> S, S S -> Z, T Tdg -> nothing", () => {
    const b = new CircuitBuilder({ search: 2, target: 0 });
    b.add(K.t, 0).add(K.t, 0).add(K.s, 2).add(K.s, 2).add(K.t, 0).add(K.tdg, 0);
    expect(text(b)).toBe("s vars[0];\nz vars[1];\n");
  });
  it("folds X conjugation into control polarity", () => {
    const b = new CircuitBuilder({ search: 3, target: 0 });
    b.add(K.x, 0).addN(K.mcx, [0, 2, 4]).add(K.x, 0);
    expect(text(b)).toBe("negctrl @ ctrl @ x vars[0], vars[1], vars[2];\n");
  });
});
