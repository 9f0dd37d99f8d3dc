// Counting over the free variables of the recovered structure, against outside references.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { adder, CircuitEncoder, multiplier, randomCircuit, randomXorRows, xorSystem, type Encoded, type XorRow } from "../helpers/encoders.js";
import { bruteCount, colouring } from "../helpers/formulas.js";
import { cnfFromClauses, countModels, recoverStructure, type Cnf, type CountOptions } from "../helpers/lib.js";
import { logicSolverCount } from "../helpers/reference.js";

const cnfOf = (f: Encoded): Cnf => cnfFromClauses(f.variables, f.clauses);

async function count(cnf: Cnf, options: CountOptions = {}): Promise<{ models: bigint; enumerated: number }> {
  const r = await countModels(cnf, options);
  if (!r.ok) throw new Error(r.reason);
  return { models: r.models, enumerated: r.enumerated };
}

/** Ordered pairs (a, b) with a < 2^aBits, b < 2^bBits and a * b = n (elementary number theory). */
function factorPairs(n: number, aBits: number, bBits: number): number {
  let pairs = 0;
  for (let a = 0; a < 2 ** aBits; a++) {
    if (a === 0) {
      if (n === 0) pairs += 2 ** bBits;
      continue;
    }
    if (n % a === 0 && n / a < 2 ** bBits) pairs++;
  }
  return pairs;
}

/** Rank over GF(2) of the rows' variable sets, and whether the system is consistent (Gaussian elimination). */
function gf2(n: number, rows: readonly XorRow[]): { rank: number; consistent: boolean } {
  const m = rows.map((r) => {
    let bits = 0n;
    for (const v of r.variables) bits ^= 1n << BigInt(v - 1);
    return { bits, parity: r.parity as number };
  });
  let rank = 0;
  for (let col = 0; col < n; col++) {
    const bit = 1n << BigInt(col);
    const p = m.findIndex((r, i) => i >= rank && (r.bits & bit) !== 0n);
    if (p < 0) continue;
    [m[rank], m[p]] = [m[p]!, m[rank]!];
    for (let i = 0; i < m.length; i++) {
      if (i !== rank && (m[i]!.bits & bit) !== 0n) {
        m[i]!.bits ^= m[rank]!.bits;
        m[i]!.parity ^= m[rank]!.parity;
      }
    }
    rank++;
  }
  return { rank, consistent: m.every((r) => r.bits !== 0n || r.parity === 0) };
}

describe("multipliers a x b = N (outside check: the ordered factor pairs of N within the widths, elementary number theory)", () => {
  it.each([
    [5, 5, 36], [5, 5, 120], [5, 5, 0], [5, 5, 961], [5, 5, 1023], [4, 6, 60], [6, 6, 720], [6, 6, 4093], [8, 8, 5040],
  ])("%i x %i bits = %i", async (aBits, bBits, n) => {
    const f = multiplier(aBits, bBits, BigInt(n));
    const r = await count(cnfOf(f));
    expect(r.models).toBe(BigInt(factorPairs(n, aBits, bBits)));
    // Only the circuit's inputs are enumerated (the rest is computed).
    expect(r.enumerated).toBeLessThanOrEqual(aBits + bBits);
  });
  it("the 5 x 5 multiplier is a 120-variable formula whose 10 inputs are all that is enumerated", async () => {
    const f = multiplier(5, 5, 120n);
    expect(f.variables).toBe(120);
    const s = recoverStructure(cnfOf(f));
    expect(s.free.length).toBe(10);
    expect((await count(cnfOf(f))).enumerated).toBe(10);
  });
  it.each([[3, 3, 6], [3, 3, 4], [3, 4, 12], [4, 4, 36]])("%i x %i bits = %i agrees with the npm package logic-solver", async (a, b, n) => {
    const cnf = cnfOf(multiplier(a, b, BigInt(n)));
    expect((await count(cnf)).models).toBe(BigInt(logicSolverCount(cnf)));
  });
  it("refuses above the limit on free variables, and says so", async () => {
    const cnf = cnfOf(multiplier(6, 6, 720n));
    const r = await countModels(cnf, { maxVariables: 11 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/refusing to enumerate 2\^12 assignments \(12 free variables left by structure recovery, of 180 in clauses; the limit is 11\)/);
    expect((await count(cnf, { maxVariables: 12 })).models).toBe(12n);
  });
});

describe("ripple-carry adders a + b = S (outside check: closed form)", () => {
  it.each([[4, 0], [4, 9], [4, 15], [6, 40], [8, 200], [8, 255]])("%i bits, S = %i: S + 1 models", async (bits, s) => {
    expect((await count(cnfOf(adder(bits, BigInt(s))))).models).toBe(BigInt(s + 1));
  });
  it.each([[4, 16], [4, 30], [6, 100], [4, 31]])("%i bits, S = %i beyond one operand: 2^(bits+1) - 1 - S models", async (bits, s) => {
    expect((await count(cnfOf(adder(bits, BigInt(s))))).models).toBe(BigInt(Math.max(0, 2 ** (bits + 1) - 1 - s)));
  });
});

describe("parity systems (outside check: 2^(n - rank) models over GF(2), rank by Gaussian elimination in the test)", () => {
  it("12 random 4-XOR constraints over 18 variables", async () => {
    for (const seed of [1, 2, 3, 4]) {
      const rows = randomXorRows(18, 12, 4, seed);
      const { rank, consistent } = gf2(18, rows);
      const r = await count(cnfOf(xorSystem(18, rows)));
      expect(r.models).toBe(consistent ? 2n ** BigInt(18 - rank) : 0n);
      expect(r.enumerated).toBeLessThan(18);
    }
  });
  it("random systems of every shape", async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: 2 ** 31 - 1 }), fc.integer({ min: 2, max: 24 }), fc.integer({ min: 1, max: 20 }), fc.integer({ min: 1, max: 5 }), async (seed, n, m, k) => {
        fc.pre(k <= n);
        const rows = randomXorRows(n, m, k, seed);
        const { rank, consistent } = gf2(n, rows);
        const f = xorSystem(n, rows);
        const r = await count(cnfOf(f));
        expect(r.models).toBe(consistent ? 2n ** BigInt(n - rank) : 0n);
        // Parities and XOR definitions alone are solved by elimination, not enumerated (width 1
        // rows are plain unit clauses, and contradictory rows leave plain clauses).
        if (k >= 2 && consistent) expect(r.enumerated).toBe(0);
        if (n <= 14) expect(r.models).toBe(BigInt(bruteCount(n, f.clauses)));
      }),
      { numRuns: 150 },
    );
  });
  it("the same systems with one non-linear clause, counted by enumeration (against a truth table)", async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: 2 ** 31 - 1 }), fc.integer({ min: 3, max: 14 }), fc.integer({ min: 1, max: 10 }), fc.integer({ min: 1, max: 4 }), async (seed, n, m, k) => {
        fc.pre(k <= n);
        const f = xorSystem(n, randomXorRows(n, m, k, seed));
        const clauses = [...f.clauses, [1, -n]];
        expect((await count(cnfFromClauses(n, clauses))).models).toBe(BigInt(bruteCount(n, clauses)));
      }),
      { numRuns: 100 },
    );
  });
});

describe("one-hot colourings (outside check: the chromatic polynomial)", () => {
  const cycle = (n: number): [number, number][] => Array.from({ length: n }, (_, i) => [i, (i + 1) % n]);
  it.each([[5, 3], [6, 3], [7, 4], [9, 3]])("cycle C_%i with k = %i colours: (k-1)^n + (-1)^n (k-1)", async (n, k) => {
    const cnf = colouring(n, cycle(n), k);
    const r = await count(cnf);
    expect(r.models).toBe(BigInt((k - 1) ** n + (-1) ** n * (k - 1)));
    // One colour per vertex is computed from the others.
    expect(r.enumerated).toBeLessThanOrEqual(n * (k - 1));
  });
  it("the wheel W_6 (a hub joined to a 5-cycle) with 4 colours: k * P(C_5, k - 1) = 4 * 30 = 120", async () => {
    const edges: [number, number][] = [...cycle(5).map(([a, b]) => [a + 1, b + 1] as [number, number]), ...[1, 2, 3, 4, 5].map((v) => [0, v] as [number, number])];
    expect((await count(colouring(6, edges, 4))).models).toBe(120n);
  });
});

describe("the structured count agrees with clause-level counting and a truth table (fast-check)", () => {
  it("on random encoded circuits with extra clauses, one-hot groups and parities", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 0, max: 2 ** 31 - 1 }),
        fc.record({
          inputs: fc.integer({ min: 2, max: 6 }),
          gates: fc.integer({ min: 1, max: 10 }),
          maxWidth: fc.integer({ min: 2, max: 4 }),
          forceOutput: fc.boolean(),
          extraClauses: fc.integer({ min: 0, max: 3 }),
          oneHot: fc.constantFrom(0, 3, 4),
          parities: fc.integer({ min: 0, max: 2 }),
        }),
        async (seed, o) => {
          const f = randomCircuit(seed, o);
          fc.pre(f.variables <= 14);
          const cnf = cnfOf(f);
          const plain = await count(cnf, { structure: false });
          expect((await count(cnf)).models).toBe(plain.models);
          expect(plain.models).toBe(BigInt(bruteCount(f.variables, f.clauses)));
        },
      ),
      { numRuns: 150 },
    );
  }, 60_000);
  it("on plain random CNF, including unit clauses, empty clauses and unused variables", async () => {
    const formula = fc.integer({ min: 0, max: 12 }).chain((n) =>
      fc.record({
        n: fc.constant(n + 3),
        clauses: fc.array(fc.array(fc.integer({ min: 1, max: Math.max(1, n) }).chain((v) => fc.constantFrom(v, -v)), { minLength: n === 0 ? 0 : 1, maxLength: 3 }), { maxLength: 3 * n }),
      }),
    );
    await fc.assert(
      fc.asyncProperty(formula, fc.boolean(), async ({ n, clauses }, empty) => {
        const cs = empty ? [...clauses, []] : clauses;
        const cnf = cnfFromClauses(n, cs);
        expect((await count(cnf)).models).toBe(BigInt(bruteCount(n, cs)));
      }),
      { numRuns: 300 },
    );
  });
  it("with free variables fixed by unit clauses, dangling gates and unconstrained inputs", async () => {
    const e = new CircuitEncoder();
    const x = e.inputWord(6);
    const y = e.and([x[0]!, x[1]!]);
    e.xor([x[2]!, x[3]!]); // dangling: computed, constrains nothing
    e.force(-x[4]!);
    e.force(y);
    e.variables += 2; // two variables in no clause
    const f = e.encoded();
    const r = await count(cnfOf(f));
    // x0 = x1 = 1, x4 = 0; x2, x3, x5 and the two unused variables are free: 2^5.
    expect(r.models).toBe(32n);
    expect(r.models).toBe(BigInt(bruteCount(f.variables, f.clauses)));
    expect(r.enumerated).toBe(2);
  });
  it("on workers and on one thread alike", async () => {
    const cnf = cnfOf(multiplier(11, 11, 2n * 3n * 5n * 7n * 11n * 13n * 17n));
    const one = await count(cnf, { threads: 1 });
    expect(one.models).toBe(BigInt(factorPairs(510510, 11, 11)));
    expect((await count(cnf, { threads: 2 })).models).toBe(one.models);
  }, 120_000);
});

describe("the structured kernel's per-block simplification is exact", () => {
  it("every block layout gives one count (random circuits, 8-18 enumerated variables)", async () => {
    const { planStructuredCount } = await import("../../dist/src/count/plan.js");
    const { countStructuredBlocks, structuredBlocks } = await import("../../dist/src/count/kernel.js");
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 2 ** 31 - 1 }),
        fc.record({
          inputs: fc.integer({ min: 8, max: 18 }),
          gates: fc.integer({ min: 4, max: 30 }),
          maxWidth: fc.integer({ min: 2, max: 4 }),
          extraClauses: fc.integer({ min: 0, max: 6 }),
          oneHot: fc.constantFrom(0, 3, 5),
          parities: fc.integer({ min: 0, max: 3 }),
        }),
        (seed, o) => {
          const f = randomCircuit(seed, o);
          const { plan, zero } = planStructuredCount(recoverStructure(cnfOf(f)));
          fc.pre(!zero && plan.enumerated >= 6);
          const counts = [0, 3, plan.enumerated - 5].map((inner) => {
            const p = { ...plan, inner: Math.min(inner, plan.enumerated - 5) };
            return countStructuredBlocks(p, 0, structuredBlocks(p));
          });
          expect(counts[1]).toBe(counts[0]);
          expect(counts[2]).toBe(counts[0]);
        },
      ),
      { numRuns: 150 },
    );
  }, 60_000);
});
