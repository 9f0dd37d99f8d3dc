// Reducing the search register: unit propagation and variables in no clause. Checked against
// brute-force model counts and against headers far larger than any array could hold.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { cnfFromClauses, countModels, countSolutions, evaluate, reduceSearch, type Cnf } from "../helpers/lib.js";
import { bruteCount } from "../helpers/formulas.js";

async function models(cnf: Cnf): Promise<number> {
  const r = await countModels(cnf);
  if (!r.ok) throw new Error(r.reason);
  return Number(r.models);
}

const formula = fc.integer({ min: 1, max: 7 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    clauses: fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { minLength: 1, maxLength: 3 }), { maxLength: 9 }),
  }),
);

describe("reducing the search register", () => {
  it("keeps the models: count(original) = count(reduced) x 2^(free variables), and every reduced model completes to a model", async () => {
    await fc.assert(
      fc.asyncProperty(formula, async ({ n, clauses }) => {
        const cnf = cnfFromClauses(n, clauses);
        const r = reduceSearch(cnf);
        const expected = r.unsat ? 0 : (await models(r.cnf)) * 2 ** r.freeCount;
        expect(bruteCount(n, clauses)).toBe(expected);
        expect(r.searched.length + r.fixed.size + r.freeCount).toBe(n);
        if (r.unsat) return;
        // Complete each model of the reduced formula (free variables false) and check it on the original.
        for (let a = 0; a < 2 ** r.searched.length; a++) {
          const bits = r.searched.map((_, i) => ((a >> i) & 1) === 1);
          if (!evaluate(r.cnf, bits)) continue;
          const full = Array.from({ length: n }, () => false);
          r.searched.forEach((v, i) => (full[v - 1] = bits[i]!));
          for (const [v, value] of r.fixed) full[v - 1] = value;
          expect(evaluate(cnf, full)).toBe(true);
        }
      }),
      { numRuns: 300 },
    );
  });
  it("fixes variables of unit clauses and drops variables in no clause", () => {
    const r = reduceSearch(cnfFromClauses(5, [[1], [-1, 2, 3], [3, -4]]));
    expect([...r.fixed]).toEqual([[1, true]]);
    expect(r.free).toEqual([{ first: 5, last: 5 }]);
    expect(r.searched).toEqual([2, 3, 4]);
  });
  it("propagates along a chain, through repeated literals, and ignores tautologies", () => {
    const r = reduceSearch(cnfFromClauses(6, [[3, 3], [-3, 4], [-4, -5, -5], [5, 6, -6], [1, 2]]));
    expect([...r.fixed]).toEqual([[3, true], [4, true], [5, false]]);
    expect(r.searched).toEqual([1, 2]);
    expect(r.free).toEqual([{ first: 6, last: 6 }]);
    expect(r.unsat).toBe(false);
  });
  it("finds a contradiction by propagation", () => {
    expect(reduceSearch(cnfFromClauses(3, [[1], [-1, 2], [-2, -1]])).unsat).toBe(true);
    expect(reduceSearch(cnfFromClauses(3, [[1], [-1]])).unsat).toBe(true);
  });
  it("allocates by the literals, not the header: 2^31 - 1 declared variables", () => {
    const cnf = cnfFromClauses(2 ** 31 - 1, [[1, 2], [-1, 5], [7], [-7, 2 ** 31 - 1]]);
    const r = reduceSearch(cnf);
    expect(r.searched).toEqual([1, 2, 5]);
    expect([...r.fixed]).toEqual([[7, true], [2 ** 31 - 1, true]]);
    expect(r.free).toEqual([{ first: 3, last: 4 }, { first: 6, last: 6 }, { first: 8, last: 2 ** 31 - 2 }]);
    expect(r.freeCount).toBe(2 ** 31 - 1 - 5);
  });
});

describe("counting solutions at any header size", () => {
  it("counts the occurring variables and scales by 2^(variables in no clause)", async () => {
    const r = await countSolutions(cnfFromClauses(2 ** 31 - 1, [[1, 2], [-1, 5]]));
    expect(r.ok).toBe(true);
    // (1 or 2) and (not 1 or 5) over 1, 2, 5: 4 of 8 assignments (brute force below).
    if (r.ok) expect(r.solutions).toEqual({ count: 4n, shift: 2 ** 31 - 4 });
    expect(bruteCount(3, [[1, 2], [-1, 3]])).toBe(4);
  });
});
