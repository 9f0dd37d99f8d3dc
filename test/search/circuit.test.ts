// The complete search circuit, run in the exact state-vector simulator: the probability of
// measuring a satisfying assignment equals sin^2((2K+1) theta) (BBHT 1998) for several K.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  basisTerm, cnfFromClauses, compileSearch, countModels, evaluate, runSparse, seededRandom, successAfter, type Cnf,
} from "../helpers/lib.js";

async function models(cnf: Cnf): Promise<number> {
  const r = await countModels(cnf);
  if (!r.ok) throw new Error(r.reason);
  return Number(r.models);
}

function successProbability(cnf: Cnf, K: number, opts: Parameters<typeof compileSearch>[1] extends infer O ? Omit<O, "iterations"> : never): number {
  const c = compileSearch(cnf, { ...opts, iterations: K, measure: false });
  const run = runSparse(c, [basisTerm(c.qubits, [])], seededRandom(K + 1));
  const n = cnf.variables;
  let p = 0;
  for (const t of run.terms) {
    const a = Array.from({ length: n }, (_, v) => ((t.bits[v >>> 5]! >>> (v & 31)) & 1) === 1);
    if (evaluate(cnf, a)) p += t.re * t.re + t.im * t.im;
  }
  return p;
}

const formula = fc.integer({ min: 1, max: 6 }).chain((n) =>
  fc.record({ n: fc.constant(n), clauses: fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { minLength: 1, maxLength: 3 }), { maxLength: 8 }) }),
);

describe("search circuits in the state-vector simulator", () => {
  it("P(satisfying) = sin^2((2K+1) theta) to 1e-9 for K = 0..3, every basis and uncomputation", async () => {
    await fc.assert(
      fc.asyncProperty(formula, fc.constantFrom("mcx", "toffoli", "clifford+t"), fc.constantFrom("unitary", "measured"), fc.constantFrom("wide", "lean"),
        async ({ n, clauses }, basis, uncompute, strategy) => {
          const cnf = cnfFromClauses(n, clauses);
          const theta = Math.asin(Math.sqrt((await models(cnf)) / 2 ** n));
          for (const K of [0, 1, 2, 3]) {
            expect(Math.abs(successProbability(cnf, K, { basis, uncompute, strategy }) - successAfter(theta, K))).toBeLessThan(1e-9);
          }
        }),
      { numRuns: 40 },
    );
  });
  it("a 10-qubit search at its optimal K (allotment row: 4 of 4096 would be 12 qubits; here 10 variables, 1 solution)", async () => {
    // x1..x10 all true is the only model: ten unit clauses and one wide clause that changes nothing.
    const cnf = cnfFromClauses(10, [...Array.from({ length: 10 }, (_, v) => [v + 1]), [1, 2, 3]]);
    const theta = Math.asin(Math.sqrt(1 / 1024));
    for (const K of [1, 25]) expect(Math.abs(successProbability(cnf, K, { basis: "toffoli" }) - successAfter(theta, K))).toBeLessThan(1e-9);
  });
  it("stays exactly 0 when the formula is unsatisfiable", () => {
    const cnf = cnfFromClauses(4, [[1, 2], [-1], [-2], [3, 4]]);
    for (const K of [0, 1, 2]) expect(successProbability(cnf, K, { basis: "clifford+t", uncompute: "measured" })).toBe(0);
  });
});
