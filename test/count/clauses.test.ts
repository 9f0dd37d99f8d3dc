// Exact model counting, checked against published counts and an outside solver.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { bruteCount, colouring, pigeonhole, queens, randomKSat } from "../helpers/formulas.js";
import { cnfFromClauses, countModels, type Cnf } from "../helpers/lib.js";
import { logicSolverCount } from "../helpers/reference.js";

async function count(cnf: Cnf, maxVariables?: number, threads?: number): Promise<bigint> {
  const r = await countModels(cnf, { ...(maxVariables ? { maxVariables } : {}), ...(threads ? { threads } : {}) });
  if (!r.ok) throw new Error(r.reason);
  return r.models;
}

describe("published model counts", () => {
  // OEIS A000170 (number of ways to place n non-attacking queens on an n x n board).
  const a000170 = [1, 0, 0, 2, 10, 4, 40, 92];
  it.each([4, 5, 6, 7, 8])("n-queens n=%i matches OEIS A000170", async (n) => {
    expect(await count(queens(n), n * n)).toBe(BigInt(a000170[n - 1]!));
  });

  // Pigeonhole PHP(n+1, n) is unsatisfiable (Haken 1985: hard for resolution, easy to state).
  it.each([2, 3, 4])("pigeonhole PHP(%i+1, n) is unsatisfiable", async (n) => {
    expect(await count(pigeonhole(n + 1, n), 40)).toBe(0n);
  });
  // With n pigeons and n holes the count is n! (each placement is a permutation).
  it.each([[3, 6n], [4, 24n], [5, 120n]])("pigeonhole PHP(n, n) for n=%i has n! models", async (n, f) => {
    expect(await count(pigeonhole(n, n), 40)).toBe(f);
  });

  // Proper colourings counted by the chromatic polynomial (textbook graph theory):
  // cycle C_n: (k-1)^n + (-1)^n (k-1); complete graph K_n: k!/(k-n)!; tree: k(k-1)^(n-1).
  const cycle = (n: number): [number, number][] => Array.from({ length: n }, (_, i) => [i, (i + 1) % n]);
  const complete = (n: number): [number, number][] => {
    const e: [number, number][] = [];
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) e.push([i, j]);
    return e;
  };
  it.each([[3, 3], [4, 3], [5, 3], [6, 2], [7, 2], [5, 4]])("cycle C_%i with k=%i colours", async (n, k) => {
    expect(await count(colouring(n, cycle(n), k))).toBe(BigInt((k - 1) ** n + (-1) ** n * (k - 1)));
  });
  it.each([[3, 3], [4, 4], [4, 5], [3, 5]])("complete graph K_%i with k=%i colours", async (n, k) => {
    let falling = 1;
    for (let i = 0; i < n; i++) falling *= k - i;
    expect(await count(colouring(n, complete(n), k))).toBe(BigInt(falling));
  });
  it("a tree on 7 vertices with 3 colours: k(k-1)^(n-1) = 192", async () => {
    const tree: [number, number][] = [[0, 1], [0, 2], [1, 3], [1, 4], [2, 5], [5, 6]];
    expect(await count(colouring(7, tree, 3))).toBe(192n);
  });
  it("the Petersen graph has 120 proper 3-colourings (chromatic polynomial at k=3)", async () => {
    const e: [number, number][] = [];
    for (let i = 0; i < 5; i++) e.push([i, (i + 1) % 5], [i, i + 5], [5 + i, 5 + ((i + 2) % 5)]);
    expect(await count(colouring(10, e, 3), 30)).toBe(120n);
  });
});

describe("random formulas against the npm package logic-solver", () => {
  const formula = fc
    .integer({ min: 0, max: 16 })
    .chain((n) =>
      fc.record({
        n: fc.constant(n),
        clauses: fc.array(
          fc.array(fc.integer({ min: 1, max: Math.max(1, n) }).chain((v) => fc.constantFrom(v, -v)), { minLength: n === 0 ? 0 : 1, maxLength: 3 }),
          // At least 2n clauses keeps the model count small enough for the solver to enumerate.
          { minLength: 2 * n, maxLength: n === 0 ? 0 : 4 * n },
        ),
      }),
    );
  it("agree on 200 formulas up to 16 variables", async () => {
    await fc.assert(
      fc.asyncProperty(formula, async ({ n, clauses }) => {
        const cnf = cnfFromClauses(n, clauses);
        expect(await count(cnf)).toBe(BigInt(logicSolverCount(cnf)));
      }),
      { numRuns: 200 },
    );
  });
  it("agree with a plain truth table, including empty clauses and many unused variables", async () => {
    await fc.assert(
      fc.asyncProperty(formula, fc.boolean(), async ({ n, clauses }, empty) => {
        const cs = empty ? [...clauses, []] : clauses;
        expect(await count(cnfFromClauses(n, cs))).toBe(BigInt(bruteCount(n, cs)));
      }),
      { numRuns: 150 },
    );
  });
});

describe("counting strategies agree", () => {
  it("enumeration on one thread, on workers, and splitting give one count (random 3-SAT, 28-32 variables)", async () => {
    for (const [n, m, seed] of [[28, 100, 1], [30, 110, 2]] as const) {
      const f = randomKSat(n, m, 3, seed);
      const one = await count(f, 40, 1);
      expect(await count(f, 40, 2)).toBe(one);
      // The same formula padded with 3 variables used in a tautology goes through the splitter.
      const padded = cnfFromClauses(n + 3, [...Array.from({ length: m }, (_, i) => Array.from(f.lits.subarray(f.clauseStart[i]!, f.clauseStart[i + 1]!))), [n + 1, n + 2, n + 3, -(n + 1)], [n + 1, n + 2], [-(n + 1), n + 3]]);
      // Of the 8 values of the three new variables, (x1 or x2) and (not x1 or x3) leave 4.
      expect(await count(padded, 40)).toBe(one * 4n);
    }
  });
});

describe("limits", () => {
  it("refuses above the variable limit with a clear reason", async () => {
    const r = await countModels(randomKSat(40, 60, 3, 3));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/refusing to enumerate 2\^3\d assignments .* the limit is 34/);
  });
  it("counts declared-but-unused variables without enumerating them", async () => {
    expect(await count(cnfFromClauses(100, [[1, 2], [-1]]))).toBe(2n ** 98n);
  });
  it("reports progress up to 1", async () => {
    const seen: number[] = [];
    await countModels(randomKSat(20, 60, 3, 4), { onProgress: (f) => seen.push(f) });
    expect(seen.at(-1)).toBe(1);
  });
});
