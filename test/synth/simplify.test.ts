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
  it("sorts and deduplicates a clause of 100,000 literals given in descending order (the long-clause sort path)", () => {
    const n = 100_000;
    const long: number[] = [];
    for (let v = n; v >= 1; v--) long.push(v % 3 === 0 ? -v : v);
    long.push(7, 7, -9); // duplicates of literals already present
    const s = simplify(cnfFromClauses(n + 2, [long, [n + 1, -(n + 2)]]));
    expect(s.report).toEqual({ duplicateLiterals: 3, tautologies: 0, repeated: 0, subsumed: 0, subsumptionComplete: true });
    const out = clausesOf({ variables: n + 2, lits: s.lits, clauseStart: s.clauseStart });
    expect(out).toHaveLength(2);
    expect(out[0]).toEqual(Array.from({ length: n }, (_, i) => ((i + 1) % 3 === 0 ? -(i + 1) : i + 1)));
    expect(out[1]).toEqual([n + 1, -(n + 2)]);
  });
  it("finds a tautology whose two literals stand far apart in a long clause", () => {
    const long = Array.from({ length: 50_000 }, (_, i) => 50_000 - i);
    long.push(-25_000);
    const s = simplify(cnfFromClauses(50_000, [long, [1, 2]]));
    expect(s.report.tautologies).toBe(1);
    expect(clausesOf({ variables: 50_000, lits: s.lits, clauseStart: s.clauseStart })).toEqual([[1, 2]]);
  });
  it("checks short clauses against a long one by binary search: keeps it unless one lies inside it", () => {
    const n = 60_000;
    // Signs alternate from +n: +n, -(n-1), +(n-2), ...; so n-1, n-3, ... stand negated.
    const long = Array.from({ length: n }, (_, i) => (i % 2 === 0 ? n - i : -(n - i)));
    const near = [[-(n - 1), n - 3], [n, n - 1], [-2, 1, 4], [-(n - 3), n - 2, -(n - 5), n - 7]];
    const kept = simplify(cnfFromClauses(n, [long, ...near]));
    expect(kept.report).toMatchObject({ subsumed: 0, repeated: 0, subsumptionComplete: true });
    expect(clausesOf({ variables: n, lits: kept.lits, clauseStart: kept.clauseStart })).toHaveLength(5);
    const inside = [-(n - 3), n - 2, -(n - 5), n - 4];
    const gone = simplify(cnfFromClauses(n, [long, ...near, inside]));
    expect(gone.report).toMatchObject({ subsumed: 1, subsumptionComplete: true });
    expect(clausesOf({ variables: n, lits: gone.lits, clauseStart: gone.clauseStart })).toEqual([
      [n - 3, -(n - 1)], [n - 1, n], [1, -2, 4], [n - 7, -(n - 5), -(n - 3), n - 2], [-(n - 5), n - 4, -(n - 3), n - 2],
    ]);
  });
  it("keeps exactly the minimal clauses, deduplicated and sorted (short and long clauses mixed)", () => {
    const key = (l: number): number => (l < 0 ? -2 * l + 1 : 2 * l);
    const subset = (d: number[], c: number[]): boolean => d.every((l) => c.includes(l));
    // Most literals take the formula's own sign for their variable, so long clauses are rarely
    // tautologies and short clauses often lie inside long ones (both subset-test paths run).
    const formula = fc.record({ n: fc.integer({ min: 2, max: 60 }), signs: fc.integer() }).chain(({ n, signs }) => {
      const own = (v: number): number => ((signs >>> (v % 32)) & 1 ? v : -v);
      const lit = fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(own(v), own(v), own(v), own(v), own(v), -own(v)));
      const coherent = fc.integer({ min: 1, max: n }).map(own);
      return fc.record({
        n: fc.constant(n),
        clauses: fc.array(
          fc.oneof(
            fc.array(lit, { maxLength: 4 }),
            fc.array(coherent, { minLength: 1, maxLength: 4 }),
            fc.array(coherent, { minLength: 30, maxLength: 150 }),
          ),
          { maxLength: 14 },
        ),
      });
    });
    fc.assert(
      fc.property(formula, ({ n, clauses }) => {
        const s = simplify(cnfFromClauses(n, clauses));
        const out = clausesOf({ variables: n, lits: s.lits, clauseStart: s.clauseStart });
        const inputs = clauses
          .map((c) => [...new Set(c)].sort((a, b) => key(a) - key(b)))
          .filter((c) => !c.some((l) => c.includes(-l)));
        if (inputs.some((c) => c.length === 0)) {
          expect(s.unsat).toBe(true); // empty clauses are kept as they are: the formula is false
          return;
        }
        for (const c of out) {
          expect(c.every((l, i) => i === 0 || key(c[i - 1]!) < key(l))).toBe(true); // sorted, distinct
          expect(inputs.some((d) => JSON.stringify(d) === JSON.stringify(c))).toBe(true); // one of the inputs
        }
        for (let i = 0; i < out.length; i++) for (let j = 0; j < out.length; j++) if (i !== j) expect(subset(out[i]!, out[j]!)).toBe(false);
        for (const c of inputs) expect(out.some((d) => subset(d, c))).toBe(true); // nothing lost
      }),
      { numRuns: 300 },
    );
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
  it("keeps the first of equal clauses when all have one length (the hashed path), in order", () => {
    const key = (l: number): number => (l < 0 ? -2 * l + 1 : 2 * l);
    // Few variables and clauses of 3 distinct variables: many clauses repeat, in any literal order.
    const clause = fc.uniqueArray(fc.integer({ min: 1, max: 5 }), { minLength: 3, maxLength: 3 }).chain((vs) =>
      fc.tuple(...vs.map((v) => fc.constantFrom(v, -v))),
    );
    fc.assert(
      fc.property(fc.array(clause, { minLength: 1, maxLength: 200 }), (clauses) => {
        const s = simplify(cnfFromClauses(5, clauses));
        const seen = new Set<string>();
        const want: number[][] = [];
        for (const c of clauses) {
          const sorted = [...c].sort((a, b) => key(a) - key(b));
          const k = sorted.join(" ");
          if (seen.has(k)) continue;
          seen.add(k);
          want.push(sorted);
        }
        expect(clausesOf({ variables: 5, lits: s.lits, clauseStart: s.clauseStart })).toEqual(want);
        expect(s.report.repeated).toBe(clauses.length - want.length);
        expect(s.report.subsumed).toBe(0);
        expect(s.report.subsumptionComplete).toBe(true);
      }),
      { numRuns: 300, seed: 20261203 },
    );
  });
  it("finds a repeat among clauses of one length whose signatures all collide, with no budget to run out of", () => {
    // 8,192 distinct clauses of 16 literals, each v or v + 16 for v = 1..16 (v and v + 16 share a
    // signature bit, so every candidate of the occurrence lists passes their filter: that path ran
    // out of its budget here and kept the repeat), then the last one again. Clause i takes v + 16
    // where bit v - 1 of i * 40503 mod 2^16 is set (an odd multiplier: distinct for distinct i).
    const clauses: number[][] = [];
    for (let i = 0; i < 8192; i++) {
      const bits = Math.imul(i, 40503) & 0xffff;
      clauses.push(Array.from({ length: 16 }, (_, v) => ((bits >>> v) & 1 ? v + 17 : v + 1)));
    }
    clauses.push([...clauses[8191]!]);
    const s = simplify(cnfFromClauses(32, clauses));
    expect(s.report).toEqual({ duplicateLiterals: 0, tautologies: 0, repeated: 1, subsumed: 0, subsumptionComplete: true });
    expect(s.clauseStart.length - 1).toBe(8192);
  });
});
