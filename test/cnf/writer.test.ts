// The canonical writer: read(write(cnf)) is the identity; evaluation agrees bit-parallel or not.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { clausesOf, cnfFromClauses, evaluate, evaluateWords, readDimacs, writeDimacs } from "../helpers/lib.js";

const formula = fc.integer({ min: 0, max: 40 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    clauses: fc.array(fc.array(fc.integer({ min: 1, max: Math.max(1, n) }).chain((v) => fc.constantFrom(v, -v)), { maxLength: n === 0 ? 0 : 6 }), { maxLength: 20 }),
  }),
);

describe("writeDimacs", () => {
  it("round-trips through the reader", () => {
    fc.assert(
      fc.property(formula, fc.array(fc.string(), { maxLength: 3 }), ({ n, clauses }, comments) => {
        const cnf = cnfFromClauses(n, clauses);
        const back = readDimacs(writeDimacs(cnf, comments.map((c) => c.replace(/[^ -~]/g, "?"))));
        expect(back.diagnostics).toEqual([]);
        expect(back.cnf!.variables).toBe(n);
        expect(clausesOf(back.cnf!)).toEqual(clauses);
      }),
      { numRuns: 300 },
    );
  });
  it("writes the canonical form", () => {
    expect(writeDimacs(cnfFromClauses(3, [[1, -2], [], [3]]), ["a", ""])).toBe("c a\nc\np cnf 3 3\n1 -2 0\n0\n3 0\n");
  });
});

describe("evaluate and evaluateWords", () => {
  it("agree lane by lane", () => {
    fc.assert(
      fc.property(formula, fc.array(fc.integer(), { minLength: 40, maxLength: 40 }), ({ n, clauses }, words) => {
        const cnf = cnfFromClauses(n, clauses);
        const mask = evaluateWords(cnf, words);
        for (let lane = 0; lane < 32; lane++) {
          const a = words.slice(0, n).map((w) => ((w >>> lane) & 1) === 1);
          expect(((mask >>> lane) & 1) === 1).toBe(evaluate(cnf, a));
        }
      }),
      { numRuns: 200 },
    );
  });
  it("treats an empty clause as false and no clauses as true", () => {
    expect(evaluate(cnfFromClauses(1, [[]]), [true])).toBe(false);
    expect(evaluate(cnfFromClauses(1, []), [false])).toBe(true);
  });
});
