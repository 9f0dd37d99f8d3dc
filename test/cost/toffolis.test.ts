// The wide oracle's Toffoli tally (cost/toffolis.ts) against the built toffoli-basis circuit: the
// cost table takes the wide rows' Toffoli counts from it instead of a replay, on the claim that
// the optimizer never removes a Toffoli of that circuit.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { cnfFromClauses, countCircuit, type Cnf } from "../helpers/lib.js";
import { lowerAndOptimize } from "../../dist/src/cost/built.js";
import { wideToffolis } from "../../dist/src/cost/toffolis.js";
import { countConstruction } from "../../dist/src/cost/index.js";
import { planOracle, synthesizePlan } from "../../dist/src/synth/index.js";
import { queens } from "../helpers/formulas.js";

type Kind = "phase" | "flag";
type Unc = "unitary" | "measured";

function builtToffolis(cnf: Cnf, kind: Kind, uncompute: Unc): number {
  const plan = planOracle(cnf, "full", false);
  return countCircuit(lowerAndOptimize(synthesizePlan(plan, kind, "wide"), "toffoli", uncompute, true)).toffoliCount;
}

function tallied(cnf: Cnf, kind: Kind, uncompute: Unc): number {
  return wideToffolis(planOracle(cnf, "full", false).clauses, kind, uncompute).toffoliCount;
}

// Clauses of 1 to 20 literals over few variables, so that neighbouring clauses share controls
// and polarities (where a cancellation would show if one could happen), repeats included.
const formula = fc.integer({ min: 1, max: 24 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    clauses: fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { minLength: 1, maxLength: 20 }), { maxLength: 14 }),
  }),
);

describe("wideToffolis", () => {
  it("equals the Toffoli count of the built, optimized toffoli-basis wide oracle", () => {
    fc.assert(
      fc.property(formula, fc.constantFrom<Kind>("phase", "flag"), fc.constantFrom<Unc>("unitary", "measured"), ({ n, clauses }, kind, uncompute) => {
        const cnf = cnfFromClauses(n, clauses);
        expect(tallied(cnf, kind, uncompute)).toBe(builtToffolis(cnf, kind, uncompute));
      }),
      { numRuns: 300 },
    );
  });

  it("equals the engine's replay on a formula with long clauses and shared prefixes", () => {
    // 6-queens (61 clauses, rows of 6 literals, many pairs sharing a literal) and a run of
    // clauses that share their first two literals, one after another.
    const shared = cnfFromClauses(12, Array.from({ length: 40 }, (_, i) => [1, -2, 3 + (i % 10), ...(i % 3 === 0 ? [-(3 + ((i + 4) % 10))] : [])]));
    for (const cnf of [queens(6), shared]) {
      for (const kind of ["phase", "flag"] as const) {
        for (const uncompute of ["unitary", "measured"] as const) {
          const engine = countConstruction(cnf, { kind, strategy: "wide", basis: "toffoli", uncompute }, { structure: false });
          expect(engine.exact).toBe(true);
          expect(tallied(cnf, kind, uncompute)).toBe(engine.toffoliCount);
          expect(tallied(cnf, kind, uncompute)).toBe(builtToffolis(cnf, kind, uncompute));
        }
      }
    }
  });

  it("is 0 for formulas with no AND (unit clauses, none, unsatisfiable)", () => {
    for (const clauses of [[[1], [-2]], [], [[1], [-1]]]) {
      const cnf = cnfFromClauses(2, clauses);
      for (const kind of ["phase", "flag"] as const) {
        expect(tallied(cnf, kind, "unitary")).toBe(builtToffolis(cnf, kind, "unitary"));
      }
    }
  });
});
