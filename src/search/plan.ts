/**
 * Planning a Grover search (Boyer, Brassard, Hoyer & Tapp 1998, "Tight bounds on quantum
 * searching"): with M marked items among N, sin^2(theta) = M/N; after j iterations a measurement
 * finds a marked item with probability sin^2((2j + 1) theta); the best fixed count is
 * k = floor(pi / (4 theta)).
 */

import { seededRandom } from "../util/random.js";

/** A plan for a known number of solutions. */
export interface SearchPlan {
  /** Variables of the search register (log2 N). */
  readonly searchQubits: number;
  /** M. */
  readonly solutions: number;
  /** The angle theta, with sin^2(theta) = M/N (radians). */
  readonly theta: number;
  /** k = floor(pi / (4 theta)); 0 when M = 0 or M = N. */
  readonly iterations: number;
  /** sin^2((2k + 1) theta). */
  readonly successProbability: number;
  /** Oracle calls expected until success, repeating the k-iteration run until it succeeds: k / P. */
  readonly expectedOracleCalls: number;
  /** Random guessing with replacement: N / M evaluations expected (Infinity when M = 0). */
  readonly classicalExpectedEvaluations: number;
  /** Checking assignments one by one without repetition: N - M + 1 in the worst case. */
  readonly classicalWorstCase: number;
  /** `unsatisfiable` (M = 0), `trivial` (M = N), `classical` (M > 3N/4), or `search`. */
  readonly verdict: "unsatisfiable" | "trivial" | "classical" | "search";
}

/** Success probability after j iterations: sin^2((2j + 1) theta). */
export function successAfter(theta: number, j: number): number {
  const s = Math.sin((2 * j + 1) * theta);
  return s * s;
}

/**
 * Plans a search over 2^n items with M solutions.
 *
 * @example
 * ```ts
 * planSearch(3, 1).iterations; // 2 (sin^2(5 theta) = 121/128)
 * ```
 */
export function planSearch(n: number, M: number): SearchPlan {
  const N = 2 ** n;
  if (!Number.isInteger(M) || M < 0 || M > N) throw new RangeError(`solutions must be a whole number in 0..${N}, got ${M}`);
  const theta = Math.asin(Math.sqrt(M / N));
  const base = { searchQubits: n, solutions: M, theta, classicalWorstCase: N - M + 1 };
  if (M === 0) {
    return { ...base, iterations: 0, successProbability: 0, expectedOracleCalls: Infinity, classicalExpectedEvaluations: Infinity, verdict: "unsatisfiable" };
  }
  const iterations = M === N ? 0 : Math.floor(Math.PI / (4 * theta));
  const successProbability = successAfter(theta, iterations);
  return {
    ...base,
    iterations,
    successProbability,
    expectedOracleCalls: iterations / successProbability,
    classicalExpectedEvaluations: N / M,
    verdict: M === N ? "trivial" : 4 * M > 3 * N ? "classical" : "search",
  };
}

/** Growth factor of the schedule for an unknown number of solutions (BBHT 1998, Theorem 3). */
export const BBHT_LAMBDA = 6 / 5;

/** One round of the schedule: iterations are drawn uniformly from 0..choices-1. */
export interface ScheduleRound {
  /** Round number r, from 0. */
  readonly round: number;
  /** m = min(lambda^round, sqrt(N)) before rounding. */
  readonly bound: number;
  /** ceil(m): j is drawn uniformly from {0, ..., choices - 1} (our rounding convention). */
  readonly choices: number;
}

/**
 * The rounds of the BBHT schedule until the bound reaches sqrt(N) (it stays there after).
 * Rounding convention: round r draws j uniformly from {0, ..., ceil(min(lambda^r, sqrt N)) - 1}.
 */
export function bbhtRounds(n: number): ScheduleRound[] {
  const cap = Math.sqrt(2 ** n);
  const rounds: ScheduleRound[] = [];
  for (let r = 0; ; r++) {
    const bound = Math.min(BBHT_LAMBDA ** r, cap);
    rounds.push({ round: r, bound, choices: Math.max(1, Math.ceil(bound - 1e-12)) });
    if (bound >= cap) break;
  }
  return rounds;
}

/**
 * Expected oracle calls of the BBHT schedule when there are M solutions: round r succeeds with
 * the average of sin^2((2j + 1) theta) over its choices, which is
 * 1/2 - sin(4 m theta) / (4 m sin(2 theta)) for m choices, and costs (m - 1)/2 calls on average.
 * Summed until the chance of still searching is below 1e-12.
 */
export function bbhtExpectedCalls(n: number, M: number): number {
  const N = 2 ** n;
  if (M <= 0) return Infinity;
  const theta = Math.asin(Math.sqrt(M / N));
  const rounds = bbhtRounds(n);
  let reach = 1;
  let total = 0;
  for (let r = 0; reach > 1e-12 && r < 100000; r++) {
    const m = rounds[Math.min(r, rounds.length - 1)]!.choices;
    const p = M === N ? 1 : averageSuccess(theta, m);
    total += reach * ((m - 1) / 2);
    reach *= 1 - p;
  }
  return total;
}

/** Average of sin^2((2j + 1) theta) over j = 0..m-1 (BBHT 1998, Lemma 2). */
export function averageSuccess(theta: number, m: number): number {
  const s2 = Math.sin(2 * theta);
  if (Math.abs(s2) < 1e-15) return successAfter(theta, 0);
  return 0.5 - Math.sin(4 * m * theta) / (4 * m * s2);
}

/** Iteration counts to run, round by round, drawn with a seeded generator (mulberry32). */
export function bbhtSequence(n: number, rounds: number, seed: number): number[] {
  const schedule = bbhtRounds(n);
  const random = seededRandom(seed);
  return Array.from({ length: rounds }, (_, r) => Math.floor(random() * schedule[Math.min(r, schedule.length - 1)]!.choices));
}
