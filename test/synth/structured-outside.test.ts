// Structured oracles against counts from outside sources: the marked register values, times the
// variables that no clause left open constrains, are the formula's models. Each oracle is first
// verified exhaustively (so what it marks is what the check counted).
import { describe, expect, it } from "vitest";
import { adder, multiplier, randomXorRows, xorSystem, type Encoded, type XorRow } from "../helpers/encoders.js";
import { colouring } from "../helpers/formulas.js";
import { cnfFromClauses, compileOracle, verifyOracle, type Cnf, type OracleOptions } from "../helpers/lib.js";
import { logicSolverCount } from "../helpers/reference.js";

const cnfOf = (f: Encoded): Cnf => cnfFromClauses(f.variables, f.clauses);

/**
 * Models of `cnf` as the oracle sees them: the register values it marks (verified exhaustively)
 * times 2^(variables neither on the register, fixed nor computed), which take any value.
 */
async function modelsThroughOracle(cnf: Cnf, o: OracleOptions): Promise<number> {
  const oracle = compileOracle(cnf, o);
  const r = await verifyOracle(cnf, oracle.circuit, { threads: 1, completion: oracle.completion });
  expect(r.counterexample).toBeNull();
  expect(r.method).toBe("exhaustive");
  expect(r.verified).toBe(true);
  const c = oracle.completion;
  const others = cnf.variables - c.register.length - c.fixed.length - c.definitions.length;
  return r.models * 2 ** others;
}

const REGISTERS = [
  { register: "free", basis: "toffoli", uncompute: "measured" },
  { register: "free", basis: "mcx", strategy: "lean", kind: "flag" },
] as const satisfies readonly OracleOptions[];

/** Ordered pairs (a, b) with a < 2^aBits, b < 2^bBits and a * b = n, by trial division (elementary number theory). */
function factorPairs(n: number, aBits: number, bBits: number): number {
  let count = 0;
  for (let a = 0; a < 2 ** aBits; a++) for (let b = 0; b < 2 ** bBits; b++) if (a * b === n) count++;
  return count;
}

describe("multipliers a x b = N: the ordered factor pairs of N (elementary number theory)", () => {
  it.each([[3, 3, 12], [3, 3, 7], [4, 4, 36], [4, 4, 143], [4, 3, 0], [5, 5, 391], [3, 3, 64]])("%i x %i bits = %i", async (a, b, n) => {
    const cnf = cnfOf(multiplier(a, b, BigInt(n)));
    const want = factorPairs(n, a, b);
    for (const o of REGISTERS) expect(await modelsThroughOracle(cnf, o)).toBe(want);
  });
  it("2 x 2 bits = 6 on the full register too", async () => {
    const cnf = cnfOf(multiplier(2, 2, 6n));
    expect(await modelsThroughOracle(cnf, { basis: "toffoli", strategy: "lean" })).toBe(factorPairs(6, 2, 2));
  });
  it.each([[3, 3, 6], [3, 3, 4], [3, 4, 12]])("%i x %i bits = %i agrees with the npm package logic-solver", async (a, b, n) => {
    const cnf = cnfOf(multiplier(a, b, BigInt(n)));
    expect(await modelsThroughOracle(cnf, REGISTERS[0])).toBe(logicSolverCount(cnf));
  });
});

describe("ripple-carry adders a + b = S: S + 1 models for S < 2^bits (closed form)", () => {
  it.each([[4, 0], [4, 9], [4, 15], [6, 40], [8, 200]])("%i bits, S = %i", async (bits, s) => {
    const cnf = cnfOf(adder(bits, BigInt(s)));
    for (const o of REGISTERS) expect(await modelsThroughOracle(cnf, o)).toBe(s + 1);
  });
  it("3 bits, S = 5 on the full register", async () => {
    expect(await modelsThroughOracle(cnfOf(adder(3, 5n)), { basis: "mcx" })).toBe(6);
  });
});

/** Rank and consistency of an XOR system over GF(2), by Gaussian elimination on bit masks. */
function gf2(n: number, rows: readonly XorRow[]): { rank: number; consistent: boolean } {
  const eqs = rows.map((r) => ({ mask: r.variables.reduce((m, v) => m ^ (1 << (v - 1)), 0), rhs: r.parity as number }));
  let rank = 0;
  for (let col = 0; col < n; col++) {
    const p = eqs.findIndex((e, i) => i >= rank && (e.mask >> col) & 1);
    if (p < 0) continue;
    [eqs[rank], eqs[p]] = [eqs[p]!, eqs[rank]!];
    for (let i = 0; i < eqs.length; i++) {
      if (i !== rank && (eqs[i]!.mask >> col) & 1) {
        eqs[i]!.mask ^= eqs[rank]!.mask;
        eqs[i]!.rhs ^= eqs[rank]!.rhs;
      }
    }
    rank++;
  }
  return { rank, consistent: eqs.every((e) => e.mask !== 0 || e.rhs === 0) };
}

describe("parity systems: 2^(n - rank) models when consistent, else none (linear algebra over GF(2), in the test)", () => {
  it.each([[12, 6, 3, 1], [12, 10, 4, 2], [16, 12, 4, 3], [14, 14, 3, 4], [10, 4, 5, 5]])("%i variables, %i random %i-XOR (seed %i)", async (n, m, k, seed) => {
    const rows = randomXorRows(n, m, k, seed);
    const { rank, consistent } = gf2(n, rows);
    const cnf = cnfOf(xorSystem(n, rows));
    const want = consistent ? 2 ** (n - rank) : 0;
    expect(await modelsThroughOracle(cnf, { basis: "toffoli", uncompute: "measured" })).toBe(want);
    for (const o of REGISTERS) expect(await modelsThroughOracle(cnf, o)).toBe(want);
  });
});

describe("one-hot colourings: the chromatic polynomial P(G, k) (graph theory)", () => {
  const cycle = (n: number): [number, number][] => Array.from({ length: n }, (_, i) => [i, (i + 1) % n]);
  const complete = (n: number): [number, number][] => Array.from({ length: n }, (_, i) => Array.from({ length: n - i - 1 }, (_, j) => [i, i + j + 1] as [number, number])).flat();
  const cases: [string, number, [number, number][], number, number][] = [
    // P(C_n, k) = (k - 1)^n + (-1)^n (k - 1)
    ["5-cycle, 3 colours", 5, cycle(5), 3, 2 ** 5 - 2],
    ["4-cycle, 4 colours", 4, cycle(4), 4, 3 ** 4 + 3],
    // P(K_n, k) = k (k - 1) ... (k - n + 1)
    ["K4, 4 colours", 4, complete(4), 4, 24],
    ["K4, 5 colours", 4, complete(4), 5, 120],
    // A pendant vertex multiplies by k - 1.
    ["K4 plus a pendant, 4 colours", 5, [...complete(4), [3, 4]], 4, 24 * 3],
    // P(path of n vertices, k) = k (k - 1)^(n - 1)
    ["path of 6, 3 colours", 6, Array.from({ length: 5 }, (_, i) => [i, i + 1] as [number, number]), 3, 3 * 2 ** 5],
  ];
  it.each(cases)("%s", async (_name, vertices, edges, k, want) => {
    const cnf = colouring(vertices, edges, k);
    // Each exactly-one group is recovered as a group or, with 3 colours, as a NOR definition of one member.
    const found = compileOracle(cnf).structure!;
    expect(found.groups + found.definitions).toBeGreaterThan(0);
    if (cnf.variables <= 20) expect(await modelsThroughOracle(cnf, { basis: "toffoli", uncompute: "measured" })).toBe(want);
    for (const o of REGISTERS) expect(await modelsThroughOracle(cnf, o)).toBe(want);
  });
});
