/**
 * Printing times that range from nanoseconds to far beyond the age of the universe: a unit a
 * reader can picture, three significant digits, and exponents once years run into the thousands.
 */

/**
 * Seconds in a (Julian) year.
 *
 * @example
 * ```ts
 * 1e9 / SECONDS_PER_YEAR; // 31.7 years
 * ```
 */
export const SECONDS_PER_YEAR = 365.25 * 86400;

/**
 * Age of the universe in years (Planck Collaboration 2018: 13.8 billion years), for scale.
 *
 * @example
 * ```ts
 * formatSeconds(UNIVERSE_AGE_YEARS * SECONDS_PER_YEAR * 2); // "2.76e+10 years (longer than the age of the universe)"
 * ```
 */
export const UNIVERSE_AGE_YEARS = 1.38e10;

const sig = (x: number): string => {
  const t = x.toPrecision(3);
  return t.includes("e") ? t : String(Number(t));
};

/**
 * A duration in words: "850 ns", "4.08 ms", "2.5 h", "3.1 days", "41.2 years", "1.20e+15 years
 * (longer than the age of the universe)". Never "Infinity": a non-finite input says so.
 *
 * @example
 * ```ts
 * formatSeconds(0.0040818); // "4.08 ms"
 * formatSeconds(3.2e19);    // "1.01e+12 years"
 * ```
 */
export function formatSeconds(seconds: number): string {
  if (Number.isNaN(seconds)) return "not defined";
  if (!Number.isFinite(seconds)) return "beyond the range of a double";
  if (seconds === 0) return "0 s";
  const s = Math.abs(seconds);
  if (s < 1e-6) return `${sig(seconds * 1e9)} ns`;
  if (s < 1e-3) return `${sig(seconds * 1e6)} us`;
  if (s < 1) return `${sig(seconds * 1e3)} ms`;
  if (s < 120) return `${sig(seconds)} s`;
  if (s < 7200) return `${sig(seconds / 60)} min`;
  if (s < 2 * 86400) return `${sig(seconds / 3600)} h`;
  if (s < 2 * SECONDS_PER_YEAR) return `${sig(seconds / 86400)} days`;
  const years = seconds / SECONDS_PER_YEAR;
  if (years < 1e4) return `${sig(years)} years`;
  const text = `${years.toExponential(2)} years`;
  return years > UNIVERSE_AGE_YEARS ? `${text} (longer than the age of the universe)` : text;
}

/**
 * A count or ratio for people: whole numbers as they are up to a million, then three digits
 * with an exponent ("4.21e+9").
 *
 * @example
 * ```ts
 * formatCount(4620);  // "4620"
 * formatCount(2.6e7); // "2.60e+7"
 * ```
 */
export function formatCount(x: number): string {
  if (!Number.isFinite(x)) return Number.isNaN(x) ? "not defined" : "beyond the range of a double";
  if (Math.abs(x) < 1e6 && Number.isInteger(x)) return String(x);
  if (Math.abs(x) >= 1e-3 && Math.abs(x) < 1e6) return sig(x);
  return x.toExponential(2);
}

/** "10^70663.1": a power of ten with one decimal of its exponent. */
const powerOfTen = (log10: number): string => `10^${log10.toFixed(1)}`;

/**
 * A count given by its base-10 logarithm: as {@link formatCount} while the count fits a double,
 * else as a power of ten ("10^70663.1").
 *
 * @example
 * ```ts
 * formatLog10Count(6);     // "1.00e+6"
 * formatLog10Count(70663.1); // "10^70663.1"
 * ```
 */
export function formatLog10Count(log10: number): string {
  const x = 10 ** log10;
  return Number.isFinite(x) ? formatCount(x) : powerOfTen(log10);
}

/**
 * A duration given by the base-10 logarithm of its seconds: as {@link formatSeconds} while it
 * fits a double, else in years as a power of ten ("10^70650.6 years (longer than the age of the
 * universe)").
 *
 * @example
 * ```ts
 * formatLog10Seconds(0);      // "1 s"
 * formatLog10Seconds(70658.1); // "10^70650.6 years (longer than the age of the universe)"
 * ```
 */
export function formatLog10Seconds(log10: number): string {
  const x = 10 ** log10;
  if (Number.isFinite(x)) return formatSeconds(x);
  return `${powerOfTen(log10 - Math.log10(SECONDS_PER_YEAR))} years (longer than the age of the universe)`;
}
