// verifyOracle on free-register oracles: checked against the formula's projection (a register
// value is marked exactly when some model extends it), exhaustively or sampled, on both
// simulators and in workers; a failure names the register value and its completion.
import { describe, expect, it } from "vitest";
import { multiplier, randomCircuit, type Encoded } from "../helpers/encoders.js";
import { colouring, rng } from "../helpers/formulas.js";
import { cnfFromClauses, compileOracle, evaluate, fullCompletion, verifyOracle, type Cnf } from "../helpers/lib.js";

const cnfOf = (f: Encoded): Cnf => cnfFromClauses(f.variables, f.clauses);

describe("verifyOracle with a free register", () => {
  it("checks every register value and counts those whose completion is a model", async () => {
    const cnf = cnfOf(multiplier(4, 4, 143n));
    const o = compileOracle(cnf, { register: "free", basis: "toffoli", uncompute: "measured" });
    expect(o.register.length).toBeLessThan(cnf.variables);
    const r = await verifyOracle(cnf, o.circuit, { completion: o.completion });
    expect(r).toMatchObject({ verified: true, method: "exhaustive", register: "free", assignments: 2 ** o.register.length, models: 2 });
  });

  it("names the failing register value and its completion", async () => {
    // The free oracle of 15 = a x b checked against 21 = a x b: same register, different marks.
    const a = cnfOf(multiplier(3, 3, 15n));
    const b = cnfOf(multiplier(3, 3, 21n));
    const o = compileOracle(a, { register: "free", basis: "mcx" });
    const other = compileOracle(b, { register: "free", basis: "mcx" });
    expect(Array.from(other.register)).toEqual(Array.from(o.register));
    const r = await verifyOracle(b, o.circuit, { completion: other.completion, threads: 1 });
    expect(r.verified).toBe(false);
    const c = r.counterexample!;
    expect(c.registerValue).toHaveLength(o.register.length);
    expect(c.registerDimacs).toBe(`${c.registerValue!.map((on, i) => (on ? o.register[i]! : -o.register[i]!)).join(" ")} 0`);
    expect(c.assignment).toHaveLength(b.variables);
    expect(c.dimacs.split(" ")).toHaveLength(b.variables + 1);
    // The completion agrees with the register value on the register's variables.
    c.registerValue!.forEach((on, i) => expect(c.assignment[o.register[i]! - 1]).toBe(on));
    expect(c.expected).toContain(evaluate(b, c.assignment) ? "phase -1" : "phase +1");
  });

  it("refuses a register of the wrong size or a completion of another formula, with the reason", async () => {
    const cnf = cnfOf(multiplier(3, 3, 12n));
    const free = compileOracle(cnf, { register: "free" });
    const full = compileOracle(cnf);
    const wrongSize = await verifyOracle(cnf, full.circuit, { completion: free.completion });
    expect(wrongSize.verified).toBe(false);
    expect(wrongSize.problem).toBe(`the search register vars has ${cnf.variables} qubits but the free register holds ${free.register.length} variables`);
    const other = await verifyOracle(cnfFromClauses(3, [[1, 2]]), free.circuit, { completion: free.completion });
    expect(other.problem).toBe(`the register's completion is for a formula of ${cnf.variables} variables but this one declares 3`);
  });

  it("says every register value completes to a model when none is unmarked (not that every assignment satisfies)", async () => {
    const cnf = cnfFromClauses(3, [[1], [-2]]);
    const o = compileOracle(cnf, { register: "free", basis: "toffoli" });
    const r = await verifyOracle(cnf, o.circuit, { completion: o.completion });
    expect(r).toMatchObject({ verified: true, register: "free", nonModels: 0 });
    expect(r.notes).toEqual(["no unmarked inputs: every register value completes to a model"]);
  });

  it("treats the full register's completion as the plain check", async () => {
    const cnf = cnfFromClauses(4, [[1, -2], [2, 3, -4]]);
    const o = compileOracle(cnf, { basis: "mcx" });
    const r = await verifyOracle(cnf, o.circuit, { completion: fullCompletion(4) });
    expect(r).toMatchObject({ verified: true, register: "full", assignments: 16 });
  });

  it("samples register values above the exhaustive limit (model projections, one bit flipped, random)", async () => {
    // Enough register values that 200 random ones and the chosen ones are under half of them
    // (a larger sample checks every value instead).
    const cnf = cnfOf(randomCircuit(4, { inputs: 12, gates: 8, oneHot: 4 }));
    const o = compileOracle(cnf, { register: "free", basis: "toffoli", uncompute: "measured", kind: "flag" });
    expect(o.register.length).toBeGreaterThan(9);
    const r = await verifyOracle(cnf, o.circuit, { completion: o.completion, exhaustiveLimit: 3, samples: 200, threads: 1 });
    expect(r).toMatchObject({ verified: true, method: "sampled", register: "free" });
    expect(r.models).toBeGreaterThan(0);
    expect(r.nonModels).toBeGreaterThan(0);
  });

  it("runs Clifford+T free oracles on the state-vector simulator", async () => {
    const cnf = cnfOf(multiplier(3, 3, 12n));
    const o = compileOracle(cnf, { register: "free", basis: "clifford+t", uncompute: "measured" });
    const r = await verifyOracle(cnf, o.circuit, { completion: o.completion });
    expect(r).toMatchObject({ verified: true, simulator: "state-vector", method: "exhaustive", register: "free" });
    const wrong = compileOracle(cnfOf(multiplier(3, 3, 6n)), { register: "free", basis: "clifford+t" });
    if (wrong.register.length === o.register.length) {
      const bad = await verifyOracle(cnf, wrong.circuit, { completion: o.completion });
      expect(bad.verified).toBe(false);
      expect(bad.counterexample?.registerDimacs).toMatch(/ 0$/);
    }
  });

  it("splits a large register over worker threads (the completion travels with the job)", async () => {
    // One-hot 4-colourings of a 7-cycle: 28 variables, P(C7, 4) = 3^7 - 3 = 2184 (chromatic polynomial).
    const cnf = colouring(7, Array.from({ length: 7 }, (_, i) => [i, (i + 1) % 7] as [number, number]), 4);
    const o = compileOracle(cnf, { register: "free", basis: "toffoli", uncompute: "measured" });
    expect(o.register.length).toBeGreaterThanOrEqual(20);
    const r = await verifyOracle(cnf, o.circuit, { completion: o.completion, threads: 2 });
    expect(r).toMatchObject({ verified: true, method: "exhaustive", register: "free" });
    const others = cnf.variables - o.register.length - o.completion.fixed.length - o.completion.definitions.length;
    expect(r.models * 2 ** others).toBe(2184);
  });
});

describe("verifyOracle's model search over a free register", () => {
  it("counts distinct register values, not models that differ only outside the register", async () => {
    // A seeded random 3-SAT formula over variables 1 to 14 (near the threshold: few models);
    // variables 15 to 17 occur in no clause: each model of 1..14 comes with all 8 values of
    // them, and all 8 have the same register value.
    const r3 = rng(20261203);
    const clauses = Array.from({ length: 52 }, () => {
      const vs = new Set<number>();
      while (vs.size < 3) vs.add(1 + Math.floor(r3() * 14));
      return [...vs].map((v) => (r3() < 0.5 ? v : -v));
    });
    const cnf = cnfFromClauses(17, clauses);
    const o = compileOracle(cnf, { register: "free", basis: "toffoli", uncompute: "measured" });
    const r = await verifyOracle(cnf, o.circuit, { completion: o.completion, exhaustiveLimit: 1, samples: 2, models: 1000, threads: 1 });
    expect(r).toMatchObject({ verified: true, method: "sampled", register: "free" });
    // Expected by enumeration: the distinct register values of the models (the solver found them all).
    const values = new Set<string>();
    let models = 0;
    for (let x = 0; x < 1 << 17; x++) {
      const a = Array.from({ length: 17 }, (_, v) => (x >> v) & 1);
      if (!evaluate(cnf, Uint8Array.from(a))) continue;
      models++;
      values.add(Array.from(o.register, (v) => a[v - 1]).join(""));
    }
    expect(r.modelSearch).toMatchObject({ status: "sat", all: true });
    expect(models).toBeGreaterThan(values.size);
    expect(r.modelSearch!.found).toBe(values.size);
  });
});

describe("verifyOracle's chosen neighbours over a free register", () => {
  it("flips every bit of every register value found when there are at most 32 such pairs", async () => {
    // x1 = x2 = ... = x10 as a chain of implications and x11 fixed by a unit clause, structure
    // recovery off: a register of the 10 free variables and 2 models (all 0, all 1). Their 20
    // one-bit neighbours are all non-models; each must be checked (value j mod 2 with bit j mod 10
    // reached only 10 of them).
    const clauses = [...Array.from({ length: 9 }, (_, i) => [[-(i + 1), i + 2], [i + 1, -(i + 2)]]).flat(), [11]];
    const cnf = cnfFromClauses(11, clauses);
    const o = compileOracle(cnf, { register: "free", structure: false, basis: "toffoli", uncompute: "measured" });
    expect(o.register.length).toBe(10);
    const r = await verifyOracle(cnf, o.circuit, { completion: o.completion, exhaustiveLimit: 1, samples: 2, threads: 1 });
    expect(r).toMatchObject({ verified: true, method: "sampled", register: "free", modelSearch: { found: 2, all: true } });
    expect(r.falsifying).toBe(20);
  });
});
