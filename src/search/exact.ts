/**
 * Exact and high-precision arithmetic for planning searches of any size, in BigInt fixed point:
 * a real x is held as the integer round(x * 2^p) with a proven bound on its error in units of
 * 2^-p ("ulps"). Every floor taken from such a value is checked against the bound and recomputed
 * at twice the precision when the bound straddles an integer (Ziv's strategy), so the integers
 * returned are exact; real results carry a relative error below 2^-40.
 */

/** Whole numbers with at most this many binary digits (below 2^1024, the range of a double) are kept exactly. */
export const EXACT_BITS = 1024;

/** A whole number that may exceed a double: exact below 2^EXACT_BITS, always its base-2 logarithm. */
export interface BigCount {
  /** The exact value; undefined when it has more than {@link EXACT_BITS} binary digits. */
  readonly exact: bigint | undefined;
  /** log2 of the value (-Infinity for 0). */
  readonly log2: number;
}

/** Number of binary digits of x >= 0 (0 for 0). */
export function bitLength(x: bigint): number {
  if (x <= 0n) return 0;
  // toString(16) is linear; four bits per digit, the first digit counted exactly.
  const hex = x.toString(16);
  return (hex.length - 1) * 4 + Math.floor(Math.log2(parseInt(hex[0]!, 16))) + 1;
}

/** log2 of x >= 0 to double precision (-Infinity for 0). */
export function log2Big(x: bigint): number {
  if (x <= 0n) return -Infinity;
  const bits = bitLength(x);
  if (bits <= 53) return Math.log2(Number(x));
  return Math.log2(Number(x >> BigInt(bits - 53))) + (bits - 53);
}

/** mantissa * 2^exponent as a double, without overflowing intermediate powers (0 or Infinity outside the range). */
export function scale2(mantissa: number, exponent: number): number {
  if (mantissa === 0 || !Number.isFinite(exponent)) return exponent === Infinity && mantissa !== 0 ? Infinity : 0;
  let m = mantissa;
  let e = exponent;
  while (e > 1000) {
    m *= 2 ** 1000;
    e -= 1000;
    if (!Number.isFinite(m)) return Infinity;
  }
  while (e < -1000) {
    m *= 2 ** -1000;
    e += 1000;
    if (m === 0) return 0;
  }
  return m * 2 ** e;
}

/** x / 2^shift as a double, correctly scaled for any size of x and shift. */
export function bigToDouble(x: bigint, shift = 0): number {
  if (x === 0n) return 0;
  const negative = x < 0n;
  const a = negative ? -x : x;
  const bits = bitLength(a);
  const top = bits <= 64 ? Number(a) : Number(a >> BigInt(bits - 64));
  const v = scale2(top, (bits <= 64 ? 0 : bits - 64) - shift);
  return negative ? -v : v;
}

/** A count from its exact value. */
export function countOf(x: bigint): BigCount {
  return { exact: bitLength(x) <= EXACT_BITS ? x : undefined, log2: log2Big(x) };
}

/** 2^n as a count. */
export function powerOfTwo(n: number): BigCount {
  return { exact: n < EXACT_BITS ? 1n << BigInt(n) : undefined, log2: n };
}

/** floor(sqrt(x)) for x >= 0 (Newton's method from a power of two above the root). */
export function isqrt(x: bigint): bigint {
  if (x < 2n) return x;
  let r = 1n << BigInt(Math.ceil(bitLength(x) / 2));
  for (;;) {
    const next = (r + x / r) >> 1n;
    if (next >= r) return r;
    r = next;
  }
}

/** A fixed-point value: v / 2^p, within err / 2^p of the true value. */
export interface Fixed {
  readonly v: bigint;
  readonly err: bigint;
  readonly p: number;
}

/** atan(1/x) * 2^p for a whole x >= 2 (Taylor series; error at most terms + 1 ulps). */
function atanInverse(x: bigint, p: number): Fixed {
  const one = 1n << BigInt(p);
  const x2 = x * x;
  let power = one / x; // 1 / x^(2j+1), truncated
  let sum = 0n;
  let terms = 0n;
  for (let j = 0n; power !== 0n; j++) {
    const term = power / (2n * j + 1n);
    sum += j % 2n === 0n ? term : -term;
    power /= x2;
    terms++;
  }
  // A power is within 1 + (last error)/x^2 < 1.1 ulps, each quotient within 2.1 ulps.
  return { v: sum, err: 3n * terms + 2n, p };
}

const piCache = new Map<number, Fixed>();

/** pi at precision p (Machin 1706: pi = 16 atan(1/5) - 4 atan(1/239)). */
export function piFixed(p: number): Fixed {
  const cached = piCache.get(p);
  if (cached) return cached;
  const a = atanInverse(5n, p);
  const b = atanInverse(239n, p);
  const r = { v: 16n * a.v - 4n * b.v, err: 16n * a.err + 4n * b.err, p };
  if (piCache.size > 16) piCache.clear();
  piCache.set(p, r);
  return r;
}

/**
 * theta = asin(sqrt(c / 2^u)) at precision p, for 0 <= c <= 2^u. For ratios above 1/2 it is
 * pi/2 - asin(sqrt(1 - c/2^u)), so the series always converges by at least a bit per term:
 * asin(x) = x * sum_j a_j x^(2j), a_0 = 1, a_j = a_(j-1) (2j-1)^2 / ((2j)(2j+1)).
 */
export function thetaFixed(c: bigint, u: number, p: number): Fixed {
  const N = 1n << BigInt(u);
  if (2n * c > N) {
    const rest = thetaFixed(N - c, u, p);
    const pi = piFixed(p);
    return { v: (pi.v >> 1n) - rest.v, err: pi.err / 2n + 1n + rest.err, p };
  }
  const P = BigInt(p);
  // x * 2^p = sqrt(c * 2^(2p) / 2^u); the quotient is exact when 2p >= u.
  const shift = 2 * p - u;
  const t = shift >= 0 ? c << BigInt(shift) : c >> BigInt(-shift);
  const x = isqrt(t);
  let term = 1n << P;
  let sum = term;
  let terms = 0n;
  for (let j = 1n; term !== 0n; j++) {
    term = (term * (2n * j - 1n) * (2n * j - 1n) * c) / ((2n * j) * (2n * j + 1n) * N);
    sum += term;
    terms++;
  }
  // x is within 1.5 ulps (the square root's floor, and the truncated quotient when 2p < u); each
  // term within 2 ulps (ratio <= 1/2) and the neglected tail within 6; sum <= 1.12 and x <= 0.71
  // for ratios <= 1/2, so theta = x * sum is within 2 * terms + 12 ulps.
  const v = (x * sum) >> P;
  return { v, err: 2n * terms + 12n, p };
}

/**
 * sin^2(a) for 0 <= a <= pi/4 + 2^-8 at precision p (Taylor series of sin). The error is the
 * series' (within 2 * terms + 4 ulps) plus the input's times the derivative sin(2a) <= 2a.
 */
function sinSquaredSmall(a: bigint, aErr: bigint, p: number): Fixed {
  const P = BigInt(p);
  const a2 = (a * a) >> P;
  let term = a;
  let sum = a;
  let terms = 0n;
  for (let j = 1n; term !== 0n; j++) {
    term = -((term * a2) >> P) / ((2n * j) * (2n * j + 1n));
    sum += term;
    terms++;
  }
  const s2 = (sum * sum) >> P;
  return { v: s2, err: ((2n * a * aErr) >> P) + 1n + 2n * terms + 4n, p };
}

/** Probabilities as doubles: success P and failure 1 - P, each with a relative error below 2^-40. */
export interface Probability {
  /** The success probability P. */
  readonly success: number;
  /** 1 - P, computed on its own so that it keeps its digits where P rounds to 1. */
  readonly failure: number;
  /** log2 of the success probability (exact where it underflows a double). */
  readonly log2Success: number;
  /** The working precision (bits after the binary point) that reached that accuracy; 0 for exact values, 53 for doubles. */
  readonly precision: number;
}

/** Largest working precision tried before giving up on the relative-error target (never reached in practice). */
const MAX_PRECISION = 1 << 17;

/** Relative accuracy asked of probabilities: the small value must exceed its error bound 2^40 times. */
const RELATIVE_GUARD = 40n;

/** c / 2^u with the common powers of two removed (the same ratio, the smallest u). */
export function normalizeRatio(c: bigint, u: number): { c: bigint; u: number } {
  if (c === 0n) return { c, u };
  let zeros = 0;
  while (zeros < u && ((c >> BigInt(zeros)) & 1n) === 0n) zeros++;
  return { c: c >> BigInt(zeros), u: u - zeros };
}

const probability = (success: number, failure: number, precision: number): Probability => ({ success, failure, log2Success: Math.log2(success), precision });

/**
 * sin^2((2j + 1) theta) and its complement with sin^2(theta) = c / 2^u, 0 <= c <= 2^u, for whole
 * j >= 0. The angle is reduced modulo pi; the smaller of P and 1 - P is computed from an angle
 * below pi/4. The ratios 1/4, 1/2, 3/4 (theta = pi/6, pi/4, pi/3) give rational values by Niven's
 * theorem and are returned exactly; for every other ratio neither value is 0, so the loop ends.
 * When (2j+1) theta < 2^-40 the small-angle form (2j+1)^2 c/2^u is used (relative error < 2^-78).
 */
export function successAfterExact(count: bigint, bits: number, j: bigint): Probability {
  const { c, u } = normalizeRatio(count, bits);
  if (c === 0n) return probability(0, 1, 0);
  if (u === 0) return probability(1, 0, 0); // c = 1 = 2^0: every assignment
  const odd = 2n * j + 1n;
  const log2Angle = log2Big(odd) + (log2Big(c) - u) / 2;
  if (log2Angle < -40) {
    // sin^2(x) = x^2 (1 - x^2/3 + ...), theta^2 = s (1 + s/3 + ...): P = odd^2 s (1 + O(x^2)).
    const log2Success = 2 * log2Big(odd) + log2Big(c) - u;
    const success = bigToDouble(odd * odd * c, u);
    return { success, failure: 1 - success, log2Success, precision: 53 };
  }
  // c is odd now: u = 2 means a ratio of 1/4 or 3/4, u = 1 a ratio of 1/2.
  if (u === 2) {
    const hit = j % 3n === 1n; // (2j+1) pi/6 is an odd multiple of pi/2, or (2j+1) pi/3 a multiple of pi
    if (c === 1n) return hit ? probability(1, 0, 0) : probability(0.25, 0.75, 0);
    return hit ? probability(0, 1, 0) : probability(0.75, 0.25, 0);
  }
  if (u === 1) return probability(0.5, 0.5, 0); // c = 1: theta = pi/4
  let p = Math.max(96, Math.ceil(-2 * Math.min(0, log2Angle) + 2 * log2Big(odd)) + 96);
  for (; p <= MAX_PRECISION; p *= 2) {
    const theta = thetaFixed(c, u, p);
    const pi = piFixed(p);
    const phi = odd * theta.v;
    const m = phi / pi.v; // floor, possibly off by one near a multiple of pi
    const r = phi - m * pi.v;
    const err = odd * theta.err + (m + 1n) * pi.err + 2n;
    // a: the distance to the nearest multiple of pi (sin^2 small); b: to the nearest odd multiple of pi/2.
    const a = r < pi.v - r ? r : pi.v - r;
    const absA = a < 0n ? -a : a;
    const b = (pi.v >> 1n) - absA;
    const absB = b < 0n ? -b : b;
    const small = absA <= absB ? absA : absB;
    if (small <= err << RELATIVE_GUARD) continue;
    const s = sinSquaredSmall(small, err, p);
    if (s.v <= s.err << RELATIVE_GUARD) continue;
    const v = bigToDouble(s.v, p);
    return absA <= absB ? probability(v, 1 - v, p) : { success: 1 - v, failure: v, log2Success: Math.log2(1 - v), precision: p };
  }
  // Unreachable for ratios other than the rational cases above; keep double precision as a last resort.
  const theta = Math.asin(Math.sqrt(bigToDouble(c, u)));
  const s = Math.sin(Number(odd) * theta) ** 2;
  return probability(s, 1 - s, 53);
}

/**
 * k = floor(pi / (4 theta)) with sin^2(theta) = c / 2^u, 0 < c <= 2^u, exactly, or undefined when
 * k would have more than maxBits binary digits (then only its logarithm is meaningful).
 */
export function optimalIterationsExact(count: bigint, bits: number, maxBits = EXACT_BITS): { k: bigint; precision: number } | undefined {
  const { c, u } = normalizeRatio(count, bits);
  const log2K = Math.log2(Math.PI / 4) - (log2Big(c) - u) / 2;
  if (log2K > maxBits) return undefined;
  const N = 1n << BigInt(u);
  if (2n * c > N) return { k: 0n, precision: 0 }; // theta > pi/4
  if (2n * c === N) return { k: 1n, precision: 0 }; // theta = pi/4 exactly
  // Above ratio 1/4, pi/(4 theta) < 3/2; below it, pi/(4 theta) is never a whole number (Niven), so the loop ends.
  let p = Math.max(96, Math.ceil(2 * Math.max(0, log2K)) + 96);
  for (; p <= MAX_PRECISION; p *= 2) {
    const P = BigInt(p);
    const theta = thetaFixed(c, u, p);
    const pi = piFixed(p);
    const lowTheta = theta.v - theta.err;
    if (lowTheta <= 0n) continue;
    const lo = ((pi.v - pi.err) << P) / (4n * (theta.v + theta.err));
    const hi = ((pi.v + pi.err) << P) / (4n * lowTheta) + 1n;
    const kLo = lo >> P;
    if (kLo === hi >> P) return { k: kLo, precision: p };
  }
  return undefined;
}

/** ln 2 and ln(6/5) at precision p: 2 atanh(1/3) and 2 atanh(1/11). */
function atanhInverseTwice(x: bigint, p: number): bigint {
  const one = 1n << BigInt(p);
  const x2 = x * x;
  let power = one / x;
  let sum = 0n;
  for (let j = 0n; power !== 0n; j++) {
    sum += power / (2n * j + 1n);
    power /= x2;
  }
  return 2n * sum;
}

/**
 * The first round r of the BBHT schedule with (6/5)^r >= sqrt(2^n), i.e. r = ceil(n ln 2 / (2 ln 1.2)),
 * exactly: with 160 bits the quotient is far from a whole number (it is irrational for n > 0).
 */
export function bbhtCapRound(n: number): number {
  if (n <= 0) return 0;
  const p = 160;
  const ln2 = atanhInverseTwice(3n, p);
  const ln12 = atanhInverseTwice(11n, p);
  const num = BigInt(n) * ln2;
  const den = 2n * ln12;
  const q = num / den;
  return Number(q * den === num ? q : q + 1n);
}

/** ceil(x / y) for y > 0. */
export function ceilDiv(x: bigint, y: bigint): bigint {
  return x >= 0n ? (x + y - 1n) / y : -(-x / y);
}
