// Simplification keeps exactly the satisfying assignments over the declared variables.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { simplify } from "../../dist/src/synth/simplify.js";
import { clausesOf, cnfFromClauses, evaluate } from "../helpers/lib.js";

describe("simplify", () => {
  it("drops duplicate literals, tautologies, repeated and subsumed clauses, and says how many", () => {
    const s = simplify(cnfFromClauses(4, [[1, 1, 2], [3, -3], [1, 2], [2, 1], [1, 2, 4], [-4]]));
    expect(s.report).toEqual({ duplicateLiterals: 1, tautologies: 1, repeated: 2, subsumed: 1, subsumptionComplete: true });
    expect(clausesOf({ variables: 4, lits: s.lits, clauseStart: s.clauseStart })).toEqual([[1, 2], [-4]]);
  });
  it("finds complementary unit clauses unsatisfiable", () => {
    expect(simplify(cnfFromClauses(2, [[1], [2], [-1]])).unsat).toBe(true);
  });
  it("keeps the set of satisfying assignments (random formulas, every assignment)", () => {
    const formula = fc.integer({ min: 1, max: 8 }).chain((n) =>
      fc.record({ n: fc.constant(n), clauses: fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { maxLength: 4 }), { maxLength: 12 }) }),
    );
    fc.assert(
      fc.property(formula, ({ n, clauses }) => {
        const before = cnfFromClauses(n, clauses);
        const s = simplify(before);
        const after = { variables: n, lits: s.lits, clauseStart: s.clauseStart };
        for (let x = 0; x < 2 ** n; x++) {
          const a = Array.from({ length: n }, (_, v) => ((x >> v) & 1) === 1);
          expect(s.unsat ? false : evaluate(after, a)).toBe(evaluate(before, a));
        }
      }),
      { numRuns: 300 },
    );
  });
});
