// Harmful mutants the prover once left "unknown" (the sampled cross-check of the bench's mutants
// sweep caught them): each must now be refuted with a counterexample that fails in the sparse
// simulator. The gates are fixed places in oracles of one random 3-SAT formula, found by the sweep
// at 100 and 200 variables and reproduced here at 20.
import { describe, expect, it } from "vitest";
import { CircuitBuilder, K } from "../helpers/circuits.js";
import { randomKSat } from "../helpers/formulas.js";
import { edit, failsOn } from "../helpers/prove.js";
import { compileOracle, proveOracle, type Circuit } from "../helpers/lib.js";
import { cancelPairs } from "../../dist/src/prove/cancel.js";
import { formulaLiteral } from "../../dist/src/prove/miter.js";
import { REDUCTIONS, SymbolicRun } from "../../dist/src/prove/symbolic.js";

const cnf = randomKSat(20, 60, 3, 1020);
const drop = (c: Circuit, at: number): Circuit => edit(c, (_b, g) => g === at);
const duplicate = (c: Circuit, at: number): Circuit => edit(c, (b, g) => {
  if (g === at) b.copy(c, g);
  return false;
});

describe("harmful mutants refuted with a counterexample", () => {
  const lean = compileOracle(cnf, { kind: "flag", construction: "lean", basis: "mcx", uncompute: "measured", structure: false }).circuit;
  const cases: [string, () => Circuit][] = [
    // The wire is 1 on few inputs (a counter's carry), so the first candidates never see the wrong
    // phase; the inputs are now sought where the symbolic run stopped, on the wire itself.
    ["a dropped H before a measurement (lean, measured): a measurement of the wire", () => {
      expect(lean.kind[166]).toBe(K.h);
      expect(lean.kind[167]).toBe(K.measure);
      return drop(lean, 166);
    }],
    // H H opened a path variable that nothing closed; cancelled, it is the case above.
    ["a duplicated H before a measurement (lean, measured)", () => duplicate(lean, 166)],
    // Every branch looks right on its own input; the outcome one input draws cannot happen on another.
    ["a dropped CNOT in a Clifford+T gadget (wide, measured): a measurement's outcome depends on the input", () => {
      const wide = compileOracle(cnf, { kind: "flag", construction: "wide", basis: "clifford+t", uncompute: "measured", structure: false }).circuit;
      expect(wide.kind[123]).toBe(K.cx);
      return drop(wide, 123);
    }],
  ];
  for (const [name, make] of cases) {
    it(name, () => {
      const mutated = make();
      const p = proveOracle(cnf, mutated, { kind: "flag", conflictLimit: 20_000 });
      expect(p.status, p.message).toBe("refuted");
      expect(failsOn(mutated, cnf, "flag", p.counterexample!)).toBe(true);
    });
  }
});

// Found by the sweep at 60 variables (the bench's formula, seed 1000 + n): a CNOT dropped from or
// duplicated in a Clifford+T gadget of the blocks-6 oracle with unitary uncomputation. No reduction closes the
// gadget's path variable, and the oracle fails on about one input in ten (only where a clause node
// the stray phase depends on is 0 in the flag case): the inputs are now sought on the stuck
// Hadamard's factors, and the last simulation runs as long as the reductions took.
describe("harmful Clifford+T gadget mutants of the blocks-6 oracle at 60 variables", () => {
  const cnf60 = randomKSat(60, 180, 3, 1060);
  // The duplicated CNOT fails on every input and the quick simulation found it, but the retry
  // after cancelling the pair dropped that finding and ran the later reductions for 210 s.
  const cases: ["phase" | "flag", "drop" | "duplicate", number][] = [
    ["phase", "drop", 23885],
    ["flag", "drop", 2428],
    ["flag", "duplicate", 13851],
  ];
  for (const [kind, how, at] of cases) {
    it(`a ${how === "drop" ? "dropped" : "duplicated"} CNOT (${kind}, gate ${at}) is refuted with a counterexample, within a minute`, () => {
      const c = compileOracle(cnf60, { kind, construction: "blocks-6", basis: "clifford+t", uncompute: "unitary", structure: false }).circuit;
      expect(c.kind[at]).toBe(K.cx);
      const mutated = how === "drop" ? drop(c, at) : duplicate(c, at);
      const p = proveOracle(cnf60, mutated, { kind, conflictLimit: 20_000 });
      expect(p.status, p.message).toBe("refuted");
      expect(failsOn(mutated, cnf60, kind, p.counterexample!)).toBe(true);
      expect(p.seconds).toBeLessThan(60);
    });
  }
});

// The sweep's one "undecided" lean mutant at 60 variables: the CNOT that closes a Clifford+T
// gadget of the counter's carry chain (control 73, counter bit 5) moved onto search variable 49
// in the increment of clause 84. It flips that variable only where 32 of the first 84 clauses are
// violated, which neither random inputs nor the hill climbs' early steps reach; the tops of
// climbs over random prefixes now come among the first simulated inputs.
describe("a harmful wrong target in the lean Clifford+T counter at 60 variables", () => {
  it("is refuted with a counterexample", () => {
    const cnf60 = randomKSat(60, 180, 3, 1060);
    const c = compileOracle(cnf60, { kind: "phase", construction: "lean", basis: "clifford+t", uncompute: "unitary", structure: false }).circuit;
    const at = 20195;
    expect(c.kind[at]).toBe(K.cx);
    expect(Array.from(c.ops.subarray(c.opStart[at]!, c.opStart[at + 1]!))).toEqual([73 << 1, 72 << 1]);
    const ops = c.ops.slice();
    ops[c.opStart[at]! + 1] = 48 << 1;
    const mutated: Circuit = { ...c, ops };
    const p = proveOracle(cnf60, mutated, { kind: "phase", conflictLimit: 20_000 });
    expect(p.status, p.message).toBe("refuted");
    expect(failsOn(mutated, cnf60, "phase", p.counterexample!)).toBe(true);
  });
});

// The sweep at 200 variables: the CNOT that closes a blocks-6 gadget moved onto a search variable.
// It fails only where both path-free factors of the stuck Hadamard's terms are 1 (one input in
// four); the inputs where all are 1 now come first, so the quick simulation finds it (178 s, now 4 s).
describe("a CNOT moved off a blocks-6 Clifford+T gadget at 200 variables", () => {
  it("is refuted with a counterexample within a minute", () => {
    const cnf200 = randomKSat(200, 600, 3, 1200);
    const c = compileOracle(cnf200, { kind: "phase", construction: "blocks-6", basis: "clifford+t", uncompute: "unitary", structure: false }).circuit;
    const at = 91476;
    expect(Array.from(c.ops.subarray(c.opStart[at]!, c.opStart[at + 1]!))).toEqual([210 << 1, 211 << 1]);
    const ops = c.ops.slice();
    ops[c.opStart[at]! + 1] = 134 << 1;
    const mutated: Circuit = { ...c, ops };
    const p = proveOracle(cnf200, mutated, { kind: "phase", conflictLimit: 20_000 });
    expect(p.status, p.message).toBe("refuted");
    expect(failsOn(mutated, cnf200, "phase", p.counterexample!)).toBe(true);
    expect(p.seconds).toBeLessThan(60);
  });
});

describe("cancelPairs (the exact rewrite before a second symbolic run)", () => {
  it("cancels adjacent equal self-inverse gates, nested pairs too, and keeps the rest in order", () => {
    const b = new CircuitBuilder({ search: 2, target: 0, work: 1, clbits: 1 });
    b.add(K.h, 4).add(K.x, 0).add(K.x, 0).add(K.h, 4).add(K.t, 2).add(K.t, 2).add(K.h, 4).add(K.measure, 4, 0).add(K.h, 4).add(K.h, 4);
    const r = cancelPairs(b.finish())!;
    expect(Array.from(r.origin)).toEqual([4, 5, 6, 7]);
    expect(Array.from(r.circuit.kind)).toEqual([K.t, K.t, K.h, K.measure]);
    expect(Array.from(r.circuit.ops.subarray(r.circuit.opStart[3]!, r.circuit.opStart[4]!))).toEqual([4, 0]);
    expect(cancelPairs(r.circuit)).toBeNull();
  });
});

describe("a reduction stops at its effort limit inside a gate, not only between gates", () => {
  // The bench sweep's blocks-6 flag oracle with measured uncomputation at 60 variables (bench/prove.ts
  // mutants: formula seed 1060), its CNOT 14,930 put twice: the third reduction's expansion of one
  // gate's phase terms ran 108 s and reached 2.1 billion operand reads (50 times the limit) before
  // the check between gates saw it; the proof took 347 s. Now the run stops at the limit (2 s) and
  // the simulation that follows refutes the mutant.
  it("the run ends exhausted within a hair of its limit, and the prover refutes the mutant", () => {
    const cnf60 = randomKSat(60, 180, 3, 1060);
    const c = compileOracle(cnf60, { kind: "flag", construction: "blocks-6", basis: "clifford+t", uncompute: "measured", structure: false }).circuit;
    expect(c.kind[14930]).toBe(K.cx);
    const mutated = duplicate(c, 14930);
    const target = c.registers.find((r) => r.role === "target")!.start;
    const run = new SymbolicRun(mutated, 60, target, REDUCTIONS[2]);
    const cuts: number[] = [];
    formulaLiteral(run.g, cnf60, run.vars, cuts);
    run.g.setCuts(cuts);
    run.run();
    const limit = 1024 * mutated.gates + 20_000_000; // EFFORT_PER_GATE x gates + EFFORT_BASE (symbolic.ts)
    expect(run.exhausted).toBe(true);
    expect(run.g.effort).toBeLessThan(1.01 * limit);
    const proof = proveOracle(cnf60, mutated, { kind: "flag" });
    expect(proof.status).toBe("refuted");
    expect(failsOn(mutated, cnf60, "flag", proof.counterexample!)).toBe(true);
  });
});
