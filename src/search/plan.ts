/**
 * Planning a Grover search (Boyer, Brassard, Hoyer & Tapp 1998, "Tight bounds on quantum
 * searching"): with M marked items among N, sin^2(theta) = M/N; after j iterations a measurement
 * finds a marked item with probability sin^2((2j + 1) theta); the best fixed count is
 * k = floor(pi / (4 theta)).
 *
 * Plans are made at any size: N = 2^n, M, k and the classical worst case are whole numbers kept
 * exactly (BigInt) below 2^1024 and by their base-2 logarithm always; theta and k come from the
 * exact ratio M/N in BigInt fixed point (see exact.ts), never from a double M/N.
 */

import { seededRandom } from "../util/random.js";
import {
  bbhtCapRound as capRound, bigToDouble, bitLength, ceilDiv, countOf, EXACT_BITS, isqrt, log2Big, optimalIterationsExact, powerOfTwo,
  scale2, successAfterExact, thetaFixed, type BigCount, type Probability,
} from "./exact.js";

export { EXACT_BITS, type BigCount, type Probability } from "./exact.js";

/** A number of solutions too large for a double: count * 2^shift (a model count times 2^(free variables)). */
export interface ScaledCount {
  /** The count before scaling. */
  readonly count: bigint;
  /** The power of two it is multiplied by. */
  readonly shift: number;
}

/** A number of solutions: a safe integer, a bigint, or count * 2^shift. */
export type Solutions = number | bigint | ScaledCount;

/** A plan for a known number of solutions. */
export interface SearchPlan {
  /** Variables of the search register: n, with N = 2^n. */
  readonly searchQubits: number;
  /** N = 2^n. */
  readonly assignments: BigCount;
  /** M. */
  readonly solutions: BigCount;
  /** The angle theta in radians, sin^2(theta) = M/N (a double: 0 when M = 0, and below 2^-1074 only log2Theta holds it). */
  readonly theta: number;
  /** log2 of theta (-Infinity when M = 0). */
  readonly log2Theta: number;
  /** k = floor(pi / (4 theta)), exact below 2^1024; undefined when M = 0 (no iteration count finds a solution). */
  readonly iterations: BigCount | undefined;
  /** sin^2((2k + 1) theta), relative error below 2^-40 (0 when M = 0). */
  readonly successProbability: number;
  /**
   * 1 - P, to the same relative accuracy even where P rounds to 1; undefined when k is not kept
   * exactly (then it is at most M/N, below 2^-2000).
   */
  readonly failureProbability: number | undefined;
  /** Oracle calls expected until success, repeating the k-iteration run until it succeeds: k / P (Infinity when M = 0 or beyond a double). */
  readonly expectedOracleCalls: number;
  /** log2 of k / P. */
  readonly log2ExpectedOracleCalls: number;
  /** Random guessing with replacement: N / M evaluations expected (Infinity when M = 0 or beyond a double). */
  readonly classicalExpectedEvaluations: number;
  /** log2 of N / M. */
  readonly log2ClassicalExpectedEvaluations: number;
  /** Checking assignments one by one without repetition: N - M + 1 in the worst case, and N when M = 0 (all checked, none found). */
  readonly classicalWorstCase: BigCount;
  /** Bits after the binary point of the fixed-point arithmetic that settled k and P (0: exact rational cases; 53: doubles). */
  readonly precision: number;
  /** `unsatisfiable` (M = 0), `trivial` (M = N), `classical` (M > 3N/4), or `search`. */
  readonly verdict: "unsatisfiable" | "trivial" | "classical" | "search";
}

/** Success probability after j iterations in double precision: sin^2((2j + 1) theta). */
export function successAfter(theta: number, j: number): number {
  const s = Math.sin((2 * j + 1) * theta);
  return s * s;
}

/** M = count * 2^shift with count odd (or 0); throws RangeError when it is not a whole number in 0..2^n. */
function scaled(n: number, M: Solutions): ScaledCount {
  if (!Number.isSafeInteger(n) || n < 0) throw new RangeError(`the search register must have a whole number of qubits, got ${n}`);
  let s: ScaledCount;
  if (typeof M === "number") {
    if (!Number.isSafeInteger(M) || M < 0) throw new RangeError(`solutions must be a whole number, got ${M}`);
    s = { count: BigInt(M), shift: 0 };
  } else if (typeof M === "bigint") s = { count: M, shift: 0 };
  else s = M;
  if (s.count < 0n || !Number.isSafeInteger(s.shift) || s.shift < 0) throw new RangeError("solutions must be a whole number");
  if (s.count === 0n) return { count: 0n, shift: 0 };
  let count = s.count;
  let shift = s.shift;
  while ((count & 0xffffffffn) === 0n) {
    count >>= 32n;
    shift += 32;
  }
  while ((count & 1n) === 0n) {
    count >>= 1n;
    shift++;
  }
  // count is odd: count * 2^shift <= 2^n when count < 2^(n - shift), or count = 1 and shift = n.
  const room = n - shift;
  if (room < 0 || (bitLength(count) > room && !(count === 1n && room === 0))) {
    throw new RangeError(`solutions must be at most 2^${n}, the number of assignments`);
  }
  return { count, shift };
}

/** M as a count. */
function solutionsCount(s: ScaledCount): BigCount {
  if (s.count === 0n) return { exact: 0n, log2: -Infinity };
  const log2 = log2Big(s.count) + s.shift;
  return { exact: bitLength(s.count) + s.shift <= EXACT_BITS ? s.count << BigInt(s.shift) : undefined, log2 };
}

/** 2^x for a real x, without overflowing intermediate powers. */
function pow2(x: number): number {
  if (!Number.isFinite(x)) return x > 0 ? Infinity : 0;
  const i = Math.floor(x);
  return scale2(2 ** (x - i), i);
}

/** theta = asin(sqrt(c / 2^u)) as a double and its log2, from the exact ratio. */
function thetaOf(c: bigint, u: number): { theta: number; log2Theta: number } {
  if (c === 0n) return { theta: 0, log2Theta: -Infinity };
  const log2Ratio = log2Big(c) - u;
  if (log2Ratio < -200) {
    // asin(x) = x (1 + x^2/6 + ...): below 2^-100 the correction is under 2^-200, so theta = sqrt(c / 2^u).
    const bits = bitLength(c);
    let mantissa = bits <= 53 ? Number(c) : Number(c >> BigInt(bits - 53));
    let exponent = (bits <= 53 ? 0 : bits - 53) - u;
    if (exponent % 2 !== 0) {
      mantissa *= 2;
      exponent -= 1;
    }
    return { theta: scale2(Math.sqrt(mantissa), exponent / 2), log2Theta: log2Ratio / 2 };
  }
  const p = Math.max(96, Math.ceil(-log2Ratio / 2) + 96);
  const t = thetaFixed(c, u, p);
  return { theta: bigToDouble(t.v, p), log2Theta: log2Big(t.v) - p };
}

/**
 * Plans a search over 2^n items with M solutions (M a safe integer, a bigint, or count * 2^shift).
 * k is exact (BigInt fixed point, precision raised until the floor is certain) while it is below
 * 2^1024; above that only its log2 is kept, and the success probability is 1 - (at most M/N).
 *
 * @example
 * ```ts
 * planSearch(3, 1).iterations?.exact; // 2n (sin^2(5 theta) = 121/128)
 * planSearch(120, 1).iterations?.exact; // 905502432259640355n (theta = asin(2^-60))
 * ```
 */
export function planSearch(n: number, M: Solutions): SearchPlan {
  const s = scaled(n, M);
  const u = n - s.shift; // M/N = count / 2^u
  const c = s.count;
  const assignments = powerOfTwo(n);
  const solutions = solutionsCount(s);
  const base = { searchQubits: n, assignments, solutions };
  if (c === 0n) {
    return {
      ...base, theta: 0, log2Theta: -Infinity, iterations: undefined, successProbability: 0, failureProbability: 1,
      expectedOracleCalls: Infinity, log2ExpectedOracleCalls: Infinity, classicalExpectedEvaluations: Infinity,
      log2ClassicalExpectedEvaluations: Infinity, classicalWorstCase: assignments, precision: 0, verdict: "unsatisfiable",
    };
  }
  const { theta, log2Theta } = thetaOf(c, u);
  const log2NoverM = u - log2Big(c);
  const classicalExpectedEvaluations = u <= 4096 ? bigToDouble((1n << BigInt(u + 64)) / c, 64) : pow2(log2NoverM);
  const classical = { classicalExpectedEvaluations, log2ClassicalExpectedEvaluations: log2NoverM, classicalWorstCase: worstCase(n, s, u) };
  if (u === 0) {
    // M = N: every assignment is a solution.
    return {
      ...base, ...classical, theta, log2Theta, iterations: { exact: 0n, log2: -Infinity }, successProbability: 1, failureProbability: 0,
      expectedOracleCalls: 0, log2ExpectedOracleCalls: -Infinity, precision: 0, verdict: "trivial",
    };
  }
  const verdict = u <= 4096 && 4n * c > 3n * (1n << BigInt(u)) ? "classical" : "search";
  const k = optimalIterationsExact(c, u);
  if (k === undefined) {
    // k >= 2^1024: pi/(4 theta) to double precision gives its log2; (2k+1) theta is within theta of pi/2.
    const log2K = Math.log2(Math.PI / 4) - log2Theta;
    return {
      ...base, ...classical, theta, log2Theta, iterations: { exact: undefined, log2: log2K }, successProbability: 1, failureProbability: undefined,
      expectedOracleCalls: pow2(log2K), log2ExpectedOracleCalls: log2K, precision: 0, verdict,
    };
  }
  const p: Probability = successAfterExact(c, u, k.k);
  const log2K = log2Big(k.k);
  return {
    ...base, ...classical, theta, log2Theta, iterations: countOf(k.k), successProbability: p.success, failureProbability: p.failure,
    expectedOracleCalls: k.k === 0n ? 0 : bigToDouble(k.k) / p.success, log2ExpectedOracleCalls: log2K - p.log2Success,
    precision: Math.max(k.precision, p.precision), verdict,
  };
}

/** N - M + 1 (N when M = 0). */
function worstCase(n: number, s: ScaledCount, u: number): BigCount {
  if (n < EXACT_BITS) return countOf((1n << BigInt(n)) - (s.count << BigInt(s.shift)) + 1n);
  // N - M + 1 = 2^shift (2^u - count) + 1; the + 1 is below double precision here.
  if (u <= 4096) return { exact: undefined, log2: s.shift + log2Big((1n << BigInt(u)) - s.count) };
  return { exact: undefined, log2: n + Math.log1p(-pow2(log2Big(s.count) - u)) / Math.LN2 };
}

/**
 * The success probability after exactly K iterations (K need not be the plan's k), with the
 * complement, from the exact ratio M/N: sin^2((2K + 1) theta), relative error below 2^-40.
 *
 * @example
 * ```ts
 * successAfterIterations(12, 49, 1).success; // 0.1043 (sin^2(3 theta), theta = asin(sqrt(49/4096)))
 * ```
 */
export function successAfterIterations(n: number, M: Solutions, K: number | bigint): Probability {
  const s = scaled(n, M);
  const j = BigInt(K);
  if (j < 0n) throw new RangeError(`iterations must be a whole number, got ${K}`);
  return successAfterExact(s.count, n - s.shift, j);
}

/** Growth factor of the schedule for an unknown number of solutions (BBHT 1998, Theorem 3). */
export const BBHT_LAMBDA = 6 / 5;

/** One round of the schedule: iterations are drawn uniformly from 0..choices-1. */
export interface ScheduleRound {
  /** Round number r, from 0. */
  readonly round: number;
  /** m = min(lambda^round, sqrt(N)) before rounding, as a double (Infinity beyond the range of a double). */
  readonly bound: number;
  /** log2 of the bound. */
  readonly log2Bound: number;
  /** ceil(m): j is drawn uniformly from {0, ..., choices - 1} (our rounding convention), exact below 2^1024. */
  readonly choices: BigCount;
}

const capRounds = new Map<number, number>();

/** The first round whose bound is sqrt(N): rounds 0..last differ, and every later round is like round `last`. */
export function bbhtLastRound(n: number): number {
  let r = capRounds.get(n);
  if (r === undefined) {
    r = capRound(n);
    if (capRounds.size > 64) capRounds.clear();
    capRounds.set(n, r);
  }
  return r;
}

/**
 * Round r of the BBHT schedule for N = 2^n: m = min((6/5)^r, sqrt N), j drawn from {0, ..., ceil(m) - 1}.
 * ceil((6/5)^r) is computed exactly as ceil(6^r / 5^r); sqrt N is 2^(n/2), rounded up for odd n.
 *
 * @example
 * ```ts
 * bbhtRound(12, 5).choices.exact; // 3n (1.2^5 = 2.48832)
 * ```
 */
export function bbhtRound(n: number, r: number): ScheduleRound {
  const last = bbhtLastRound(n);
  const log2Lambda = Math.log2(BBHT_LAMBDA);
  if (r >= last) {
    // The cap sqrt(N): 2^(n/2) for even n, ceil(sqrt(2^n)) for odd n.
    const choices: BigCount = n / 2 < EXACT_BITS ? countOf(n % 2 === 0 ? 1n << BigInt(n / 2) : isqrt((1n << BigInt(n)) - 1n) + 1n) : { exact: undefined, log2: n / 2 };
    return { round: r, bound: pow2(n / 2), log2Bound: n / 2, choices };
  }
  const log2Bound = r * log2Lambda;
  if (log2Bound < EXACT_BITS - 1) {
    const six = 6n ** BigInt(r);
    const five = 5n ** BigInt(r);
    return { round: r, bound: r <= 200 ? BBHT_LAMBDA ** r : pow2(log2Bound), log2Bound, choices: countOf(ceilDiv(six, five)) };
  }
  return { round: r, bound: pow2(log2Bound), log2Bound, choices: { exact: undefined, log2: log2Bound } };
}

/**
 * Rounds first..first+count-1 of the BBHT schedule, stopping after the last distinct round (the
 * one from which every round is alike).
 *
 * @example
 * ```ts
 * bbhtRounds(6).map((r) => r.choices.exact); // [1n, 2n, 2n, 2n, 3n, 3n, 3n, 4n, 5n, 6n, 7n, 8n, 8n]
 * ```
 */
export function bbhtRounds(n: number, first = 0, count = Infinity): ScheduleRound[] {
  const last = bbhtLastRound(n);
  const rounds: ScheduleRound[] = [];
  for (let r = first; r <= last && r < first + count; r++) rounds.push(bbhtRound(n, r));
  return rounds;
}

/** Average of sin^2((2j + 1) theta) over j = 0..m-1 (BBHT 1998, Lemma 2). */
export function averageSuccess(theta: number, m: number): number {
  if (theta === 0) return 0;
  const s2 = Math.sin(2 * theta);
  // theta = pi/2 (M = N): sin(2 theta) is rounding noise and every j succeeds. A tiny theta keeps the formula.
  if (theta > 1 && Math.abs(s2) < 1e-15) return successAfter(theta, 0);
  return 0.5 - Math.sin(4 * m * theta) / (4 * m * s2);
}

/** Expected oracle calls of a schedule. */
export interface ExpectedCalls {
  /** The expected number of calls (Infinity when M = 0 or beyond the range of a double). */
  readonly calls: number;
  /** Its log2. */
  readonly log2Calls: number;
}

/** Chance of still searching below which the expected-cost sums stop. */
const REACH_FLOOR = 2 ** -60;

/**
 * Expected oracle calls of the BBHT schedule when there are M solutions: round r succeeds with
 * the average of sin^2((2j + 1) theta) over its m choices, which is
 * 1/2 - sin(4 m theta) / (4 m sin(2 theta)), and costs (m - 1)/2 calls on average; summed until
 * the chance of still searching is below 2^-60. For theta below 2^-40 the sum is taken in units
 * of 1/theta (u = m theta), where the average is 1/2 - sin(4u)/(8u) to within theta^2, and the
 * rounds before u reaches 2^-30 add u/(2 (lambda - 1)) calls and no measurable success: that
 * keeps the cost of the sum independent of N.
 *
 * @example
 * ```ts
 * bbhtExpectedCalls(20, 1).calls; // 1453.76..., about 1.42 sqrt(2^20)
 * ```
 */
export function bbhtExpectedCalls(n: number, M: Solutions): ExpectedCalls {
  const s = scaled(n, M);
  const u = n - s.shift;
  if (s.count === 0n) return { calls: Infinity, log2Calls: Infinity };
  if (u === 0) return { calls: 0, log2Calls: -Infinity };
  const { theta, log2Theta } = thetaOf(s.count, u);
  const last = bbhtLastRound(n);
  if (log2Theta >= -40) {
    let reach = 1;
    let total = 0;
    for (let r = 0; reach > REACH_FLOOR && r < 100_000; r++) {
      const round = bbhtRound(n, Math.min(r, last));
      const m = round.choices.exact !== undefined ? Number(round.choices.exact) : pow2(round.log2Bound);
      total += reach * ((m - 1) / 2);
      reach *= 1 - averageSuccess(theta, m);
    }
    return { calls: total, log2Calls: Math.log2(total) };
  }
  const log2Lambda = Math.log2(BBHT_LAMBDA);
  const log2Cap = n / 2 + log2Theta; // u at the cap: theta sqrt(N), at least about sqrt(M) >= 1
  const r0 = Math.max(0, Math.floor((-30 - log2Theta) / log2Lambda));
  let total = pow2(r0 * log2Lambda + log2Theta) / (2 * (BBHT_LAMBDA - 1));
  let reach = 1;
  for (let r = r0; reach > REACH_FLOOR && r < r0 + 100_000; r++) {
    const x = pow2(Math.min(r * log2Lambda + log2Theta, log2Cap));
    total += reach * (x / 2);
    reach *= 0.5 + Math.sin(4 * x) / (8 * x);
  }
  const log2Calls = Math.log2(total) - log2Theta;
  return { calls: pow2(log2Calls), log2Calls };
}

/** A uniform whole number in 0..m-1 from a generator of doubles in [0, 1) (exact rejection sampling above 2^53). */
function uniformBelow(random: () => number, m: bigint): bigint {
  if (m <= 1n << 53n) return BigInt(Math.floor(random() * Number(m)));
  const bits = bitLength(m - 1n);
  for (;;) {
    let x = 0n;
    for (let b = 0; b < bits; b += 32) x = (x << 32n) | BigInt(Math.floor(random() * 2 ** 32));
    x &= (1n << BigInt(bits)) - 1n;
    if (x < m) return x;
  }
}

/**
 * Iteration counts to run in rounds 0..rounds-1, drawn with a seeded generator (mulberry32).
 * Rounds whose choices are not kept exactly (beyond 2^1024) cannot be drawn and end the list.
 *
 * @example
 * ```ts
 * bbhtSequence(12, 5, 7); // five bigints, the r-th below ceil(1.2^r)
 * ```
 */
export function bbhtSequence(n: number, rounds: number, seed: number): bigint[] {
  const last = bbhtLastRound(n);
  const random = seededRandom(seed);
  const out: bigint[] = [];
  for (let r = 0; r < rounds; r++) {
    const choices = bbhtRound(n, Math.min(r, last)).choices.exact;
    if (choices === undefined) break;
    out.push(uniformBelow(random, choices));
  }
  return out;
}
