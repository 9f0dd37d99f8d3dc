// Constructions composed with structure recovery and the free register: the blocked and fan-out
// constructions conjoin the recovered checks (checked definitions, parities, groups, remaining
// clauses) as they conjoin clauses, around a free register's computed definitions. Every such
// oracle verified (a free register against the formula's projection), budgets on a free register
// kept against the emitted circuit, and the front of free-register oracles reproduced point by point.
import { describe, expect, it } from "vitest";
import { adder, CircuitEncoder, multiplier, randomCircuit, randomXorRows, xorSystem, type Encoded } from "../helpers/encoders.js";
import { colouring } from "../helpers/formulas.js";
import {
  cnfFromClauses, compileOracle, compileSearch, costConstructions, costFront, countCircuit, isFullCompletion, planConstruction, registerOf,
  searchConstruction, verifyOracle, type Cnf, type OracleOptions,
} from "../helpers/lib.js";

const cnfOf = (f: Encoded): Cnf => cnfFromClauses(f.variables, f.clauses);

/** Encoded formulas of every kind recovery finds: gates, parities, one-hot groups, and clauses beside them. */
function formulas(): [string, Cnf][] {
  const oneHot = new CircuitEncoder();
  const a = oneHot.inputWord(5);
  const b = oneHot.inputWord(4);
  oneHot.exactlyOne(a);
  oneHot.atMostOne(b);
  oneHot.clauses.push([-a[0]!, b[0]!], [a[4]!, b[3]!, -b[1]!]);
  return [
    ["2 x 2 multiplier = 6", cnfOf(multiplier(2, 2, 6n))],
    ["3-bit adder = 9", cnfOf(adder(3, 9n))],
    ["5 random 3-XOR over 9 variables", cnfOf(xorSystem(9, randomXorRows(9, 5, 3, 7)))],
    ["one-hot 3-colourings of a 4-cycle", colouring(4, [[0, 1], [1, 2], [2, 3], [3, 0]], 3)],
    ["exactly-one and at-most-one groups with side clauses", cnfOf(oneHot.encoded())],
    ["a random gate network with a group, a parity and side clauses", cnfOf(randomCircuit(11, { inputs: 5, gates: 7, extraClauses: 3, oneHot: 3, parities: 1 }))],
  ];
}

/**
 * Compiles and verifies on every register value (a free register against the projection). A
 * circuit with mid-circuit measurements is simulated state by state, exhaustively up to 12
 * register qubits (sim/verify.ts); above, on sampled values and the solver's models.
 */
async function verified(cnf: Cnf, o: OracleOptions, what: string) {
  const oracle = compileOracle(cnf, o);
  const r = await verifyOracle(cnf, oracle.circuit, { threads: 1, completion: oracle.completion, kind: o.kind ?? "phase" });
  expect(r.problem, what).toBeUndefined();
  expect(r.counterexample, `${what}: ${r.counterexample?.actual}`).toBeNull();
  const measured = o.basis === "clifford+t" && o.uncompute === "measured";
  expect(r.method, what).toBe(measured && oracle.register.length > 12 ? "sampled" : "exhaustive");
  expect(r.verified, what).toBe(true);
  expect(r.register).toBe(o.register === "free" && !isFullCompletion(oracle.completion) ? "free" : "full");
  return oracle;
}

const CONSTRUCTIONS = ["blocks-2", "blocks-3x2", "blocks-2x2x2", "blocks-2-held-2", "fanout-1", "fanout-2", "blocks-3-fanout-1"];

describe("constructions over recovered structure", { timeout: 300_000 }, () => {
  it("every blocked and fan-out construction verified: full and free register, both kinds, both uncomputations (toffoli basis)", async () => {
    for (const [name, cnf] of formulas()) {
      for (const register of ["full", "free"] as const) {
        for (const construction of CONSTRUCTIONS) {
          for (const kind of ["phase", "flag"] as const) {
            for (const uncompute of ["unitary", "measured"] as const) {
              const oracle = await verified(cnf, { register, construction, kind, uncompute }, `${name}, ${register}, ${construction}, ${kind}, ${uncompute}`);
              expect(oracle.options.construction).toBe(construction);
              // The structure went into the circuit (the summary the report prints).
              expect(oracle.structure).not.toBeNull();
              if (register === "free") expect(oracle.circuit.registers.find((r) => r.role === "search")!.size).toBe(registerOf(cnf, { register }).register.length);
            }
          }
        }
      }
    }
  });
  it("in Clifford+T with measured uncomputation too (the mid-circuit measurements of every erased check)", async () => {
    for (const [name, cnf] of formulas()) {
      for (const register of ["full", "free"] as const) {
        for (const construction of ["blocks-2", "fanout-1", "blocks-2-held-2"]) {
          await verified(cnf, { register, construction, basis: "clifford+t", uncompute: "measured", validatePasses: true }, `${name}, ${register}, ${construction}`);
        }
      }
    }
  });
  it("the structure is worth having in every construction: fewer T than the same construction over the clauses", () => {
    // A 3 x 3 multiplier fixed to 35 (36 variables, 30 recovered gate definitions), full register.
    const cnf = cnfOf(multiplier(3, 3, 35n));
    const withStructure = costConstructions(cnf, { uncompute: "measured" });
    const clausesOnly = new Map(costConstructions(cnf, { uncompute: "measured", structure: false }).map((c) => [c.construction, c]));
    let compared = 0;
    for (const c of withStructure) {
      const plain = clausesOnly.get(c.construction);
      if (plain === undefined) continue;
      expect(c.t_count, c.construction).toBeLessThan(plain.t_count);
      compared++;
    }
    expect(compared).toBeGreaterThan(20);
    // And the smallest oracle is smaller with structure: the budget reaches lower.
    const least = (cs: readonly { qubits: number }[]): number => Math.min(...cs.map((c) => c.qubits));
    expect(least(withStructure)).toBeLessThan(least([...clausesOnly.values()]));
  });
});

describe("budgets with a free register", { timeout: 300_000 }, () => {
  // The 3 x 3 multiplier fixed to 35 = 5 x 7 (and 7 x 5): a free register of 2 qubits; the rest computed.
  const cnf = cnfOf(multiplier(3, 3, 35n));
  const costs = costConstructions(cnf, { uncompute: "measured", register: "free" });
  const smallest = Math.min(...costs.map((c) => c.qubits));
  const largest = Math.max(...costs.map((c) => c.qubits));

  it("qubits <= Q for every Q from the smallest up, each oracle verified against the projection, T never rising", async () => {
    expect(registerOf(cnf, { register: "free" }).register.length).toBeLessThan(cnf.variables);
    let lastT = Infinity;
    const chosen = new Set<string>();
    for (let Q = smallest; Q <= largest + 2; Q += 2) {
      const oracle = await verified(cnf, { register: "free", maxQubits: Q, basis: "clifford+t", uncompute: "measured" }, `Q = ${Q}`);
      expect(oracle.circuit.qubits).toBeLessThanOrEqual(Q);
      const t = countCircuit(oracle.circuit).tCount;
      expect(t, `Q = ${Q}: ${oracle.options.construction}`).toBeLessThanOrEqual(lastT);
      lastT = t;
      chosen.add(oracle.options.construction);
      expect(oracle.structure?.used).toBe(true);
    }
    // The budget chooses between constructions, not one oracle for every Q.
    expect(chosen.size).toBeGreaterThan(2);
    // Below the smallest: data first, naming the smallest budget, and a RangeError from compileOracle.
    const plan = planConstruction(cnf, { register: "free", maxQubits: smallest - 1, uncompute: "measured" });
    expect(plan).toMatchObject({ ok: false, smallestQubits: smallest });
    expect(() => compileOracle(cnf, { register: "free", maxQubits: smallest - 1, uncompute: "measured" })).toThrow(RangeError);
  });
  it("the free register's budget reaches below every full-register construction", () => {
    const full = costConstructions(cnf, { uncompute: "measured" });
    expect(smallest).toBeLessThan(Math.min(...full.map((c) => c.qubits)));
  });
  it("a search within a budget: the whole circuit fits, over the free register", () => {
    const r = searchConstruction(cnf, { register: "free", maxQubits: smallest + 4, iterations: 1, uncompute: "measured", basis: "clifford+t" });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.circuit.qubits).toBeLessThanOrEqual(smallest + 4);
    expect(r.circuit.registers.find((x) => x.role === "search")!.size).toBe(registerOf(cnf, { register: "free" }).register.length);
    expect(compileSearch(cnf, { register: "free", construction: r.construction, iterations: 1, uncompute: "measured", basis: "clifford+t" }).qubits).toBe(r.circuit.qubits);
  });
});

describe("the cost front of free-register oracles", { timeout: 300_000 }, () => {
  const cnf = colouring(5, [[0, 1], [1, 2], [2, 3], [3, 4], [4, 0], [0, 2]], 3);
  it("every point's arguments carry --register free and reproduce it exactly", () => {
    const front = costFront(cnf, { uncompute: "measured", register: "free" });
    expect(front.points.length).toBeGreaterThan(3);
    for (const p of front.points) {
      expect(p.options).toBe(`--construction ${p.construction} --basis clifford+t --uncompute measured --register free`);
      const oracle = compileOracle(cnf, { construction: p.construction, basis: "clifford+t", uncompute: "measured", register: "free" });
      const c = countCircuit(oracle.circuit);
      expect([oracle.circuit.qubits, c.tCount, c.tDepth], p.construction).toEqual([p.qubits, p.t_count, p.t_depth]);
    }
  });
  it("without structure the arguments say --no-structure, and the points differ", () => {
    const front = costFront(cnf, { uncompute: "measured", register: "free", structure: false });
    for (const p of front.points) expect(p.options).toMatch(/ --register free --no-structure$/);
    const p = front.points[0]!;
    const oracle = compileOracle(cnf, { construction: p.construction, basis: "clifford+t", uncompute: "measured", register: "free", structure: false });
    expect(oracle.structure).toBeNull();
    expect(oracle.circuit.qubits).toBe(p.qubits);
  });
});
