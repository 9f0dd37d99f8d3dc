/**
 * Extrapolating a family of estimates: a straight line through log10(seconds) against the number
 * of variables (least squares), and where two such lines cross. Search times grow exponentially
 * in the number of variables (about 2^(n/2) oracle calls for Grover, 2^n evaluations for brute
 * force), so on a log scale a line is the natural first fit; the lines are extrapolations, and
 * every output that uses them says so.
 */

/** A least-squares line log10(seconds) = intercept + slope x variables. */
export interface LogLinearFit {
  /** log10(seconds) at 0 variables. */
  readonly intercept: number;
  /** Decades of seconds per added variable. */
  readonly slope: number;
  /** Points the line was fitted to. */
  readonly points: number;
  /** Root-mean-square residual in decades. */
  readonly rmsDecades: number;
}

/**
 * Fits log10(seconds) = intercept + slope x n by least squares. Points with a non-positive or
 * non-finite time are skipped; undefined when fewer than two distinct n remain.
 *
 * @example
 * ```ts
 * fitLogLinear([10, 20, 30], [1e-3, 1, 1e3]); // intercept -6, slope 0.3 (three decades per ten variables)
 * ```
 */
export function fitLogLinear(variables: readonly number[], seconds: readonly number[]): LogLinearFit | undefined {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < Math.min(variables.length, seconds.length); i++) {
    const s = seconds[i]!;
    if (s > 0 && Number.isFinite(s) && Number.isFinite(variables[i]!)) {
      xs.push(variables[i]!);
      ys.push(Math.log10(s));
    }
  }
  if (new Set(xs).size < 2) return undefined;
  const k = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / k;
  const my = ys.reduce((a, b) => a + b, 0) / k;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < k; i++) {
    sxy += (xs[i]! - mx) * (ys[i]! - my);
    sxx += (xs[i]! - mx) ** 2;
  }
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  let ss = 0;
  for (let i = 0; i < k; i++) ss += (ys[i]! - (intercept + slope * xs[i]!)) ** 2;
  return { intercept, slope, points: k, rmsDecades: Math.sqrt(ss / k) };
}

/**
 * log10(seconds) of a fit at n variables.
 *
 * @example
 * ```ts
 * 10 ** fitAt(fitLogLinear([10, 20], [1e-3, 1])!, 30); // 1000 seconds at 30 variables, extrapolated
 * ```
 */
export function fitAt(fit: LogLinearFit, variables: number): number {
  return fit.intercept + fit.slope * variables;
}

/** Where a quantum line drops below a classical one. */
export interface Crossover {
  /** Variables at the crossing (a real number: the fitted lines cross between whole sizes). */
  readonly variables: number;
  /** log10(seconds) of both at the crossing. */
  readonly log10Seconds: number;
}

/**
 * The number of variables beyond which the quantum line lies below the classical one, if the
 * classical line grows faster (it must, for there to be a crossover at larger sizes). Undefined
 * when the quantum line never gets below, or is below already at 0 variables.
 *
 * @example
 * ```ts
 * crossoverOf({ intercept: 0, slope: 0.15, points: 3, rmsDecades: 0 }, { intercept: -9, slope: 0.3, points: 3, rmsDecades: 0 });
 * // { variables: 60, log10Seconds: 9 }
 * ```
 */
export function crossoverOf(quantum: LogLinearFit, classical: LogLinearFit): Crossover | undefined {
  const dSlope = classical.slope - quantum.slope;
  if (!(dSlope > 0)) return undefined;
  const variables = (quantum.intercept - classical.intercept) / dSlope;
  if (!Number.isFinite(variables) || variables <= 0) return undefined;
  return { variables, log10Seconds: fitAt(quantum, variables) };
}
