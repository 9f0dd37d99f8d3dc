// Grover planning against the exact values of Boyer, Brassard, Hoyer & Tapp 1998 ("Tight bounds
// on quantum searching"): sin^2(theta) = M/N, P_j = sin^2((2j+1) theta), k = floor(pi/(4 theta)).
// Fractions below are that formula evaluated in exact arithmetic (Boyer, Brassard, Hoyer & Tapp 1998,
// "Tight bounds on quantum searching").
import { describe, expect, it } from "vitest";
import { averageSuccess, bbhtExpectedCalls, bbhtRounds, bbhtSequence, planSearch, successAfter } from "../helpers/lib.js";
import { rng } from "../helpers/formulas.js";

const theta = (n: number, M: number): number => Math.asin(Math.sqrt(M / 2 ** n));

describe("success probabilities (exact values)", () => {
  it("N=4, M=1: k = 1 and P = 1", () => {
    const p = planSearch(2, 1);
    expect(p.iterations).toBe(1);
    expect(p.successProbability).toBeCloseTo(1, 12);
  });
  it("N=8, M=1: 25/32 after one iteration, 121/128 after two", () => {
    expect(successAfter(theta(3, 1), 1)).toBeCloseTo(25 / 32, 12);
    expect(successAfter(theta(3, 1), 2)).toBeCloseTo(121 / 128, 12);
  });
  it("N=16, M=1: 121/256, 3721/4096, 63001/65536", () => {
    expect(successAfter(theta(4, 1), 1)).toBeCloseTo(121 / 256, 12);
    expect(successAfter(theta(4, 1), 2)).toBeCloseTo(3721 / 4096, 12);
    expect(successAfter(theta(4, 1), 3)).toBeCloseTo(63001 / 65536, 12);
  });
  it("N=32, M=1, j=4: 536431921/536870912", () => {
    expect(successAfter(theta(5, 1), 4)).toBeCloseTo(536431921 / 536870912, 12);
  });
  it("optimal k for M=1 and n = 2..10: 1, 2, 3, 4, 6, 8, 12, 17, 25", () => {
    expect([2, 3, 4, 5, 6, 7, 8, 9, 10].map((n) => planSearch(n, 1).iterations)).toEqual([1, 2, 3, 4, 6, 8, 12, 17, 25]);
  });
  it("N=16, M=4 and N=8, M=2: one iteration finds a solution with certainty", () => {
    expect(planSearch(4, 4)).toMatchObject({ iterations: 1 });
    expect(planSearch(4, 4).successProbability).toBeCloseTo(1, 12);
    expect(successAfter(theta(3, 2), 1)).toBeCloseTo(1, 12);
  });
});

describe("special cases", () => {
  it("M = 0: unsatisfiable, no iteration count helps", () => {
    expect(planSearch(5, 0)).toMatchObject({ verdict: "unsatisfiable", successProbability: 0, expectedOracleCalls: Infinity });
  });
  it("M = N: no search needed", () => {
    expect(planSearch(3, 8)).toMatchObject({ verdict: "trivial", iterations: 0, successProbability: 1, expectedOracleCalls: 0 });
  });
  it("M > 3N/4: classical sampling is cheaper (common practice), numbers still given", () => {
    const p = planSearch(3, 7);
    expect(p.verdict).toBe("classical");
    expect(p.classicalExpectedEvaluations).toBeCloseTo(8 / 7, 12);
  });
  it("classical comparison: N/M expected with replacement, N - M + 1 in the worst case", () => {
    expect(planSearch(10, 4)).toMatchObject({ classicalExpectedEvaluations: 256, classicalWorstCase: 1021 });
  });
});

describe("unknown number of solutions (BBHT 1998)", () => {
  it("the average success over j in {0..m-1} matches 1/2 - sin(4 m theta)/(4 m sin 2 theta) (BBHT Lemma 2)", () => {
    for (const [n, M, m] of [[6, 1, 5], [8, 3, 9], [10, 7, 13]] as const) {
      const t = theta(n, M);
      let avg = 0;
      for (let j = 0; j < m; j++) avg += successAfter(t, j) / m;
      expect(averageSuccess(t, m)).toBeCloseTo(avg, 12);
    }
  });
  it("rounds grow by 6/5 up to sqrt(N)", () => {
    const r = bbhtRounds(6);
    expect(r[0]).toEqual({ round: 0, bound: 1, choices: 1 });
    expect(r[1]!.bound).toBeCloseTo(1.2, 12);
    expect(r.at(-1)!.bound).toBe(8);
    expect(r.at(-1)!.choices).toBe(8);
  });
  it("the expected number of oracle calls agrees with a seeded simulation of the schedule", () => {
    const n = 8;
    for (const M of [1, 4, 20]) {
      const t = theta(n, M);
      const rounds = bbhtRounds(n);
      const random = rng(M);
      let total = 0;
      const runs = 20000;
      for (let run = 0; run < runs; run++) {
        for (let r = 0; ; r++) {
          const m = rounds[Math.min(r, rounds.length - 1)]!.choices;
          const j = Math.floor(random() * m);
          total += j;
          if (random() < successAfter(t, j)) break;
        }
      }
      expect(total / runs / bbhtExpectedCalls(n, M)).toBeCloseTo(1, 1);
    }
  });
  it("the seeded sequence of iteration counts is reproducible and within each round's range", () => {
    const s = bbhtSequence(8, 30, 5);
    expect(bbhtSequence(8, 30, 5)).toEqual(s);
    const rounds = bbhtRounds(8);
    s.forEach((j, r) => expect(j).toBeLessThan(rounds[Math.min(r, rounds.length - 1)]!.choices));
  });
});
