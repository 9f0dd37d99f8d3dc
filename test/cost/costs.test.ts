// The public cost functions: the cost table, the resource report and the whole-search costs give
// the figures of the built circuits, report in snake_case, and report progress.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { randomKSat } from "../helpers/formulas.js";
import { cnfFromClauses, compileOracle, compileSearch, costTable, countCircuit, oracleResources, searchCosts, type Cnf } from "../helpers/lib.js";
import { lowerAndOptimize } from "../../dist/src/cost/built.js";
import { planOracle, synthesizePlan } from "../../dist/src/synth/index.js";
import { diffusionCircuit } from "../../dist/src/synth/search.js";

const formula = fc.integer({ min: 1, max: 7 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    clauses: fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { minLength: 1, maxLength: 5 }), { maxLength: 9 }),
  }),
);

function builtRow(cnf: Cnf, kind: "phase" | "flag", strategy: "wide" | "lean" | "textbook", uncompute: "unitary" | "measured") {
  // The oracle compileOracle builds by default (structure used where recovered and cheaper).
  const logical = synthesizePlan(planOracle(cnf, "full", true), kind, strategy);
  const ct = lowerAndOptimize(logical, "clifford+t", uncompute, true, strategy === "textbook");
  const tof = lowerAndOptimize(logical, "toffoli", uncompute, true, strategy === "textbook");
  const k = countCircuit(ct);
  return { strategy, uncompute, qubits: ct.qubits, toffoli_count: countCircuit(tof).toffoliCount, t_count: k.tCount, t_depth: k.tDepth, cnot_count: k.cnotCount, depth: k.depth, exact: true };
}

describe("costTable", () => {
  it("gives the figures of the built circuits, in the documented row order and keys", () => {
    fc.assert(
      fc.property(formula, fc.constantFrom("phase", "flag") as fc.Arbitrary<"phase" | "flag">, ({ n, clauses }, kind) => {
        const cnf = cnfFromClauses(n, clauses);
        const rows = costTable(cnf, kind);
        const plan = [["wide", "unitary"], ["wide", "measured"], ["lean", "unitary"], ["lean", "measured"], ["textbook", "unitary"]] as const;
        expect(rows).toEqual(plan.map(([s, u]) => builtRow(cnf, kind, s, u)));
        expect(Object.keys(rows[0]!)).toEqual(["strategy", "uncompute", "qubits", "toffoli_count", "t_count", "t_depth", "cnot_count", "depth", "exact"]);
      }),
      { numRuns: 25 },
    );
  });

  it("reports progress: increasing fractions ending at 1", () => {
    const seen: number[] = [];
    costTable(randomKSat(30, 120, 3, 5), "phase", { onProgress: (f) => seen.push(f) });
    expect(seen.length).toBeGreaterThan(3);
    expect(seen.at(-1)).toBe(1);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!).toBeGreaterThanOrEqual(seen[i - 1]!);
    expect(seen.every((f) => f >= 0 && f <= 1)).toBe(true);
  });
});

describe("oracleResources", () => {
  it("T and CNOT figures of the Clifford+T lowering and the Toffolis of the toffoli lowering, whatever basis is emitted", () => {
    fc.assert(
      fc.property(formula, fc.constantFrom("mcx", "toffoli", "clifford+t") as fc.Arbitrary<"mcx" | "toffoli" | "clifford+t">, fc.boolean(), ({ n, clauses }, basis, optimize) => {
        const cnf = cnfFromClauses(n, clauses);
        for (const strategy of ["wide", "lean"] as const) {
          for (const uncompute of ["unitary", "measured"] as const) {
            const oracle = compileOracle(cnf, { strategy, basis, uncompute, optimize });
            const r = oracleResources(cnf, oracle);
            const ct = countCircuit(compileOracle(cnf, { strategy, basis: "clifford+t", uncompute, optimize }).circuit);
            const tof = countCircuit(compileOracle(cnf, { strategy, basis: "toffoli", uncompute, optimize }).circuit);
            const emitted = countCircuit(oracle.circuit);
            expect({ t: r.t_count, td: r.t_depth, cx: r.cnot_count, tof: r.toffoli_count, depth: r.depth, gates: r.gates }).toEqual({
              t: ct.tCount, td: ct.tDepth, cx: ct.cnotCount, tof: tof.toffoliCount, depth: emitted.depth, gates: emitted.gates,
            });
          }
        }
      }),
      { numRuns: 20 },
    );
  });

  it("reports every key in snake_case, simplification included", () => {
    const cnf = cnfFromClauses(3, [[1, 1, 2], [1, -1], [1, 2, 3], [2]]);
    const r = oracleResources(cnf, compileOracle(cnf));
    const keys = (o: object): string[] => Object.entries(o).flatMap(([k, v]) => [k, ...(v && typeof v === "object" && !Array.isArray(v) && k !== "gates" ? keys(v) : [])]);
    for (const k of keys(r)) expect(k).toMatch(/^[a-z]+(_[a-z]+)*$/);
    expect(r.simplification).toEqual({
      duplicate_literals: 1, tautologies: 1, repeated: 0, subsumed: 2, subsumption_complete: true, clauses_kept: 1, literals_kept: 1,
    });
  });
});

describe("searchCosts", () => {
  it("oracle, diffusion and whole-run figures are those of the built circuits", () => {
    fc.assert(
      fc.property(formula, fc.integer({ min: 0, max: 3 }), fc.constantFrom("unitary", "measured") as fc.Arbitrary<"unitary" | "measured">, ({ n, clauses }, k, uncompute) => {
        const cnf = cnfFromClauses(n, clauses);
        const costs = searchCosts(cnf, k, 0.5, uncompute);
        const part = (build: (basis: "toffoli" | "clifford+t") => ReturnType<typeof compileSearch>) => {
          const ct = build("clifford+t");
          const c = countCircuit(ct);
          return { qubits: ct.qubits, t_count: c.tCount, t_depth: c.tDepth, cnot_count: c.cnotCount, depth: c.depth, toffoli_count: countCircuit(build("toffoli")).toffoliCount };
        };
        for (const s of costs) {
          expect(s.oracle).toEqual(part((basis) => compileOracle(cnf, { strategy: s.strategy, basis, uncompute }).circuit));
          expect(s.diffusion).toEqual(part((basis) => lowerAndOptimize(diffusionCircuit(n), basis, uncompute, true)));
          expect(s.circuit).toEqual(part((basis) => compileSearch(cnf, { strategy: s.strategy, basis, uncompute, iterations: k })));
          expect(s.exact).toBe(true);
          expect(s.expected_runs).toBe(2);
          expect(s.expected_t_count).toBe(2 * s.circuit.t_count);
        }
      }),
      { numRuns: 25 },
    );
  });
});
