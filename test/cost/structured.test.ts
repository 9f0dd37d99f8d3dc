// Costs of structured oracles (full and free register): the cost table, the resource report and
// the whole-search costs give the figures of the circuits compileOracle and compileSearch build.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { adder, multiplier, randomCircuit, randomXorRows, xorSystem, type Encoded } from "../helpers/encoders.js";
import { randomKSat } from "../helpers/formulas.js";
import { cnfFromClauses, compileOracle, compileSearch, costTable, countCircuit, oracleResources, searchCosts, type Circuit, type Cnf } from "../helpers/lib.js";
import { lowerAndOptimize } from "../../dist/src/cost/built.js";
import { diffusionCircuit } from "../../dist/src/synth/search.js";

const cnfOf = (f: Encoded): Cnf => cnfFromClauses(f.variables, f.clauses);
type Register = "full" | "free";

const formulas = (): [string, Cnf][] => [
  ["3 x 3 multiplier = 12", cnfOf(multiplier(3, 3, 12n))],
  ["4-bit adder = 11", cnfOf(adder(4, 11n))],
  ["8 random 4-XOR over 12", cnfOf(xorSystem(12, randomXorRows(12, 8, 4, 3)))],
  ["random circuit with groups and parities", cnfOf(randomCircuit(21, { gates: 6, oneHot: 4, parities: 2, extraClauses: 2 }))],
];

/** A cost row from built circuits. */
function builtRow(cnf: Cnf, kind: "phase" | "flag", strategy: "wide" | "lean", uncompute: "unitary" | "measured", register: Register, structure: boolean) {
  const ct = compileOracle(cnf, { kind, strategy, uncompute, register, structure, basis: "clifford+t" }).circuit;
  const tof = compileOracle(cnf, { kind, strategy, uncompute, register, structure, basis: "toffoli" }).circuit;
  const k = countCircuit(ct);
  return { strategy, uncompute, qubits: ct.qubits, toffoli_count: countCircuit(tof).toffoliCount, t_count: k.tCount, t_depth: k.tDepth, cnot_count: k.cnotCount, depth: k.depth, exact: true };
}

describe("costTable with structure", () => {
  it("gives the figures of the built structured oracles, full and free register, with and without structure", () => {
    for (const [name, cnf] of formulas()) {
      const cases = [["full", true, "phase"], ["full", true, "flag"], ["free", true, "phase"], ["free", true, "flag"], ["free", false, "phase"]] as const;
      for (const [register, structure, kind] of cases) {
        const rows = costTable(cnf, kind, { register, structure });
        const plain = rows.filter((r) => r.strategy !== "textbook");
        const want = [["wide", "unitary"], ["wide", "measured"], ["lean", "unitary"], ["lean", "measured"]] as const;
        expect(plain, `${name} ${register} ${structure} ${kind}`).toEqual(want.map(([s, u]) => builtRow(cnf, kind, s, u, register, structure)));
        expect(rows.map((r) => r.strategy)).toEqual(["wide", "wide", "lean", "lean", "textbook"]);
      }
    }
  });

  it("on random encoded circuits (fast-check)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), fc.constantFrom("full", "free") as fc.Arbitrary<Register>, (seed, register) => {
        const cnf = cnfOf(randomCircuit(seed, { gates: 1 + (seed % 7), oneHot: seed % 3 ? 0 : 3, parities: seed % 2, extraClauses: seed % 3 }));
        const rows = costTable(cnf, "phase", { register });
        expect(rows[1]).toEqual(builtRow(cnf, "phase", "wide", "measured", register, true));
        expect(rows[3]).toEqual(builtRow(cnf, "phase", "lean", "measured", register, true));
      }),
      { numRuns: 30 },
    );
  });

  it("is the same table with or without structure where nothing is recovered", () => {
    const cnf = randomKSat(12, 50, 3, 7);
    expect(compileOracle(cnf).structure?.used).toBe(false);
    expect(costTable(cnf, "phase", { structure: true })).toEqual(costTable(cnf, "phase", { structure: false }));
  });

  it("shows the structured rows cheaper in T than the clause rows on encoded formulas", () => {
    const cnf = cnfOf(multiplier(4, 4, 143n));
    const [withStructure, without] = [costTable(cnf, "phase", { structure: true }), costTable(cnf, "phase", { structure: false })];
    for (let i = 0; i < 4; i++) expect(withStructure[i]!.t_count).toBeLessThan(without[i]!.t_count);
    expect(withStructure[4]).toEqual(without[4]); // the textbook reference is the clause construction either way
  });
});

describe("oracleResources of structured oracles", () => {
  it("counts the other basis's figures of the oracle it is given and reports its register", () => {
    for (const [, cnf] of formulas()) {
      for (const register of ["full", "free"] as const) {
        for (const strategy of ["wide", "lean"] as const) {
          const oracle = compileOracle(cnf, { register, strategy, basis: "toffoli", uncompute: "measured", kind: "flag" });
          const r = oracleResources(cnf, oracle);
          const ct = countCircuit(compileOracle(cnf, { register, strategy, basis: "clifford+t", uncompute: "measured", kind: "flag" }).circuit);
          expect(r.t_count).toBe(ct.tCount);
          expect(r.cnot_count).toBe(ct.cnotCount);
          expect(r.toffoli_count).toBe(countCircuit(oracle.circuit).toffoliCount);
          expect(r.register).toEqual(Array.from(oracle.register));
          expect(r.qubits.search).toBe(oracle.register.length);
        }
      }
    }
  });
});

describe("searchCosts over a free register", () => {
  it("oracle, diffusion and whole-run figures are those of the built circuits", () => {
    const part = (build: (basis: "toffoli" | "clifford+t") => Circuit) => {
      const ct = build("clifford+t");
      const c = countCircuit(ct);
      return { qubits: ct.qubits, t_count: c.tCount, t_depth: c.tDepth, cnot_count: c.cnotCount, depth: c.depth, toffoli_count: countCircuit(build("toffoli")).toffoliCount };
    };
    for (const [, cnf] of formulas()) {
      for (const register of ["free", "full"] as const) {
        const n = compileOracle(cnf, { register }).register.length;
        for (const uncompute of ["unitary", "measured"] as const) {
          const k = 2;
          for (const s of searchCosts(cnf, k, 0.5, uncompute, { register })) {
            expect(s.oracle).toEqual(part((basis) => compileOracle(cnf, { register, strategy: s.strategy, basis, uncompute }).circuit));
            expect(s.diffusion).toEqual(part((basis) => lowerAndOptimize(diffusionCircuit(n), basis, uncompute, true)));
            expect(s.circuit).toEqual(part((basis) => compileSearch(cnf, { register, strategy: s.strategy, basis, uncompute, iterations: k })));
            expect(s.exact).toBe(true);
          }
        }
      }
    }
  });
});
