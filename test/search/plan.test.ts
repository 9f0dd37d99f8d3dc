// Grover planning against the exact values of Boyer, Brassard, Hoyer & Tapp 1998 ("Tight bounds
// on quantum searching"): sin^2(theta) = M/N, P_j = sin^2((2j+1) theta), k = floor(pi/(4 theta)).
// Small-N fractions below are exact arithmetic from that formula (sin(3t) = 3 sin t - 4 sin^3 t and
// sin(5t) = 5 sin t - 20 sin^3 t + 16 sin^5 t, trigonometric identities, common practice). Values for
// large N were computed independently with mpmath 1.3.0 (an arbitrary-precision library for Python)
// at 600 to 4000 bits: k = int(floor(pi/(4*asin(sqrt(M/N))))) and 1 - sin((2k+1) theta)^2.
import { describe, expect, it } from "vitest";
import {
  averageSuccess, bbhtExpectedCalls, bbhtLastRound, bbhtRound, bbhtRounds, bbhtSequence, planSearch, successAfter, successAfterIterations,
} from "../helpers/lib.js";
import { rng } from "../helpers/formulas.js";

const theta = (n: number, M: number): number => Math.asin(Math.sqrt(M / 2 ** n));
const k = (n: number, M: number | bigint): bigint | undefined => planSearch(n, M).iterations?.exact;

describe("success probabilities (exact values)", () => {
  it("N=4, M=1: k = 1 and P = 1", () => {
    const p = planSearch(2, 1);
    expect(p.iterations?.exact).toBe(1n);
    // M/N = 1/4: theta = pi/6 exactly, 3 theta = pi/2 (Niven's rational case, returned exactly).
    expect(p.successProbability).toBe(1);
    expect(p.failureProbability).toBe(0);
  });
  it("N=8, M=1: 25/32 after one iteration, 121/128 after two", () => {
    expect(successAfter(theta(3, 1), 1)).toBeCloseTo(25 / 32, 12);
    expect(successAfter(theta(3, 1), 2)).toBeCloseTo(121 / 128, 12);
    expect(successAfterIterations(3, 1, 1).success).toBeCloseTo(25 / 32, 14);
    expect(successAfterIterations(3, 1, 2).failure).toBeCloseTo(7 / 128, 15);
  });
  it("N=16, M=1: 121/256, 3721/4096, 63001/65536", () => {
    expect(successAfter(theta(4, 1), 1)).toBeCloseTo(121 / 256, 12);
    expect(successAfter(theta(4, 1), 2)).toBeCloseTo(3721 / 4096, 12);
    expect(successAfter(theta(4, 1), 3)).toBeCloseTo(63001 / 65536, 12);
    expect(successAfterIterations(4, 1, 3).failure).toBeCloseTo(2535 / 65536, 15);
  });
  it("N=32, M=1, j=4: 536431921/536870912", () => {
    expect(successAfter(theta(5, 1), 4)).toBeCloseTo(536431921 / 536870912, 12);
    expect(successAfterIterations(5, 1, 4).failure / (438991 / 536870912)).toBeCloseTo(1, 10);
  });
  it("optimal k for M=1 and n = 2..10: 1, 2, 3, 4, 6, 8, 12, 17, 25", () => {
    expect([2, 3, 4, 5, 6, 7, 8, 9, 10].map((n) => k(n, 1))).toEqual([1n, 2n, 3n, 4n, 6n, 8n, 12n, 17n, 25n]);
  });
  it("N=16, M=4 and N=8, M=2: one iteration finds a solution with certainty", () => {
    expect(planSearch(4, 4)).toMatchObject({ iterations: { exact: 1n }, successProbability: 1, failureProbability: 0 });
    expect(successAfter(theta(3, 2), 1)).toBeCloseTo(1, 12);
  });
  it("P after one and two iterations equals s(3-4s)^2 and s(5-20s+16s^2)^2, for K other than k", () => {
    for (const [n, M] of [[12, 49], [10, 3], [20, 1001], [7, 9]] as const) {
      const s = M / 2 ** n;
      expect(successAfterIterations(n, M, 1).success / (s * (3 - 4 * s) ** 2)).toBeCloseTo(1, 12);
      expect(successAfterIterations(n, M, 2).success / (s * (5 - 20 * s + 16 * s * s) ** 2)).toBeCloseTo(1, 12);
      expect(successAfterIterations(n, M, 0).success).toBe(s);
    }
    // launch-rota: M = 49 of 4096; one iteration: 1/sin^2(3 theta) = 9.5915 expected runs (mpmath).
    expect(1 / successAfterIterations(12, 49, 1).success).toBeCloseTo(9.59152110760040, 10);
  });
  it("the rational cases of Niven's theorem are exact: M/N = 1/4, 1/2, 3/4", () => {
    expect(successAfterIterations(6, 16, 4)).toMatchObject({ success: 1, failure: 0 }); // 9 pi/6
    expect(successAfterIterations(6, 16, 2)).toMatchObject({ success: 0.25 }); // 5 pi/6
    expect(successAfterIterations(6, 48, 1)).toMatchObject({ success: 0, failure: 1 }); // 3 pi/3
    expect(successAfterIterations(6, 32, 7)).toMatchObject({ success: 0.5 });
  });
});

describe("any size: exact k and accurate probabilities (values from mpmath)", () => {
  it("k is exact beyond 2^53: N = 2^120, 2^200, 2^1000", () => {
    expect(k(120, 1)).toBe(905502432259640355n);
    expect(k(200, 7)).toBe(376305380284707550202764859524n);
    expect(k(1000, 1)).toBe(2570914971524086683315846037875939215408691242278396887548503728521960802140875178210076011489729391262437212946553557454058405555761667574606553601308n);
  });
  it("the failure probability keeps its digits where P rounds to 1", () => {
    expect(planSearch(120, 1).failureProbability! / 1.22740525817197e-37).toBeCloseTo(1, 10);
    expect(planSearch(200, 7).failureProbability! / 4.23109628814536e-60).toBeCloseTo(1, 10);
    expect(planSearch(1000, 1).failureProbability! / 4.78273110213887e-302).toBeCloseTo(1, 10);
    expect(planSearch(30, 1).failureProbability! / 6.7927367235195e-10).toBeCloseTo(1, 10);
  });
  it("agrees with double precision where double precision is enough (n <= 40, random M)", () => {
    const random = rng(11);
    for (let t = 0; t < 300; t++) {
      const n = 1 + Math.floor(random() * 40);
      const M = 1 + Math.floor(random() * (2 ** n - 1));
      const q = Math.PI / (4 * theta(n, M));
      if (Math.abs(q - Math.round(q)) < 1e-6) continue; // too close to a whole number for doubles to settle
      const p = planSearch(n, M);
      expect(p.iterations!.exact).toBe(BigInt(Math.floor(q)));
      expect(Math.abs(p.successProbability - successAfter(theta(n, M), Math.floor(q)))).toBeLessThan(1e-9);
    }
  });
  it("N = 2^60 and 2^(2^31 - 1) are planned, not refused; N - M + 1 is exact", () => {
    const p = planSearch(60, 1);
    expect(p.assignments.exact).toBe(1152921504606846976n);
    expect(p.classicalWorstCase.exact).toBe(1152921504606846976n);
    const huge = planSearch(2 ** 31 - 1, 1);
    expect(huge.iterations?.exact).toBeUndefined();
    expect(huge.iterations?.log2).toBeCloseTo(Math.log2(Math.PI / 4) + (2 ** 31 - 1) / 2, 6);
    expect(huge.successProbability).toBe(1);
    expect(huge.failureProbability).toBeUndefined();
    expect(huge.classicalWorstCase.log2).toBe(2 ** 31 - 1);
  });
  it("M as count * 2^shift: only the ratio sets theta and k", () => {
    const a = planSearch(2 ** 31 - 1, { count: 1n, shift: 2 ** 31 - 2 });
    expect(a.iterations?.exact).toBe(1n);
    expect(a.successProbability).toBe(0.5);
    expect(a.solutions.log2).toBe(2 ** 31 - 2);
    expect(planSearch(70, { count: 3n, shift: 60 }).iterations?.exact).toBe(planSearch(10, 3).iterations?.exact);
  });
  it("rejects M above N", () => {
    expect(() => planSearch(3, 9)).toThrow(RangeError);
    expect(() => planSearch(3, { count: 1n, shift: 4 })).toThrow(RangeError);
    expect(() => planSearch(3, 8)).not.toThrow();
  });
});

describe("special cases", () => {
  it("M = 0: unsatisfiable, no iteration count (k is undefined, not 0)", () => {
    expect(planSearch(5, 0)).toMatchObject({ verdict: "unsatisfiable", iterations: undefined, successProbability: 0, expectedOracleCalls: Infinity });
  });
  it("M = N: no search needed", () => {
    expect(planSearch(3, 8)).toMatchObject({ verdict: "trivial", iterations: { exact: 0n }, successProbability: 1, expectedOracleCalls: 0 });
  });
  it("M > 3N/4: classical sampling is cheaper (common practice), numbers still given", () => {
    const p = planSearch(3, 7);
    expect(p.verdict).toBe("classical");
    expect(p.classicalExpectedEvaluations).toBeCloseTo(8 / 7, 12);
  });
  it("classical comparison: N/M expected with replacement; worst case N - M + 1, and N when M = 0", () => {
    expect(planSearch(10, 4)).toMatchObject({ classicalExpectedEvaluations: 256, classicalWorstCase: { exact: 1021n } });
    expect(planSearch(6, 1).classicalWorstCase.exact).toBe(64n);
    expect(planSearch(6, 0).classicalWorstCase.exact).toBe(64n);
    expect(planSearch(6, 64).classicalWorstCase.exact).toBe(1n);
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
  it("rounds grow by 6/5 up to sqrt(N); choices = ceil(6^r / 5^r) exactly", () => {
    const r = bbhtRounds(6);
    expect(r[0]).toMatchObject({ round: 0, bound: 1, choices: { exact: 1n } });
    expect(r[1]!.bound).toBeCloseTo(1.2, 12);
    expect(r.at(-1)!.bound).toBe(8);
    expect(r.at(-1)!.choices.exact).toBe(8n);
    expect(r.map((x) => x.choices.exact)).toEqual([1n, 2n, 2n, 2n, 3n, 3n, 3n, 4n, 5n, 6n, 7n, 8n, 8n]);
    expect(bbhtRound(200, 50).choices.exact).toBe((6n ** 50n + 5n ** 50n - 1n) / 5n ** 50n);
  });
  it("the last distinct round is the first with (6/5)^r >= sqrt(N) (checked in integers: 36^r >= 2^n 25^r)", () => {
    for (let n = 1; n <= 300; n++) {
      const r = BigInt(bbhtLastRound(n));
      expect(36n ** r >= (1n << BigInt(n)) * 25n ** r).toBe(true);
      expect(36n ** (r - 1n) < (1n << BigInt(n)) * 25n ** (r - 1n)).toBe(true);
    }
    expect(bbhtLastRound(2 ** 31 - 1)).toBe(Math.ceil(((2 ** 31 - 1) * Math.LN2) / (2 * Math.log(1.2))));
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
          const m = Number(rounds[Math.min(r, rounds.length - 1)]!.choices.exact);
          const j = Math.floor(random() * m);
          total += j;
          if (random() < successAfter(t, j)) break;
        }
      }
      expect(total / runs / bbhtExpectedCalls(n, M).calls).toBeCloseTo(1, 1);
    }
  });
  it("for tiny theta the scaled sum equals the direct round-by-round sum (n = 90, 100, 104)", () => {
    for (const n of [90, 100, 104]) {
      // The direct sum, as BBHT define it: every round, exact choices, doubles throughout.
      const t = theta(n, 1);
      const last = bbhtLastRound(n);
      let reach = 1;
      let total = 0;
      for (let r = 0; reach > 1e-18; r++) {
        const m = Number(bbhtRound(n, Math.min(r, last)).choices.exact);
        total += (reach * (m - 1)) / 2;
        reach *= 1 - averageSuccess(t, m);
      }
      expect(bbhtExpectedCalls(n, 1).calls / total).toBeCloseTo(1, 6);
    }
  });
  it("costs about 1.43 sqrt(N/M) at any size, continuously across the switch to the scaled sum", () => {
    for (const n of [60, 79, 80, 81, 82, 200, 4000, 2 ** 31 - 1]) {
      const c = bbhtExpectedCalls(n, 1);
      expect(c.log2Calls - n / 2).toBeGreaterThan(0.5);
      expect(c.log2Calls - n / 2).toBeLessThan(0.53);
    }
    expect(bbhtExpectedCalls(10, 0).calls).toBe(Infinity);
    expect(bbhtExpectedCalls(10, 1024).calls).toBe(0);
  });
  it("the seeded sequence of iteration counts is reproducible and within each round's range", () => {
    const s = bbhtSequence(8, 30, 5);
    expect(bbhtSequence(8, 30, 5)).toEqual(s);
    const rounds = bbhtRounds(8);
    s.forEach((j, r) => expect(j < rounds[Math.min(r, rounds.length - 1)]!.choices.exact!).toBe(true));
    const big = bbhtSequence(400, 200, 1);
    expect(big).toHaveLength(200);
    big.forEach((j, r) => expect(j < bbhtRound(400, r).choices.exact!).toBe(true));
  });
});
