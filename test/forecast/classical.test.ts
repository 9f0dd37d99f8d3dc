// The classical side: the evaluator's measured rate, the family fit and crossover, and printing
// times that may be astronomically large.
import { describe, expect, it } from "vitest";
import { cnfFromClauses, crossoverOf, fitAt, fitLogLinear, formatCount, formatLog10Count, formatLog10Seconds, formatSeconds, measureEvaluationRate, readDimacsFile } from "../helpers/lib.js";
import { ROOT } from "../helpers/cli.js";
import { join } from "node:path";

describe("measured evaluation rate (clausegate's bit-parallel evaluator)", () => {
  it("walks every assignment evenly: the share of satisfying ones seen is M/N (launch-rota: 49 of 4096)", async () => {
    const { cnf } = await readDimacsFile(join(ROOT, "examples/launch-rota.cnf"));
    const r = measureEvaluationRate(cnf!, 0.05);
    expect(r.evaluationsPerSecond).toBeGreaterThan(0);
    expect(r.evaluations % 32).toBe(0);
    // 4096 assignments are 128 calls; a run of thousands of calls wraps many times, so the share
    // seen is 49/4096 up to the last, partial sweep.
    const sweeps = r.evaluations / 4096;
    expect(sweeps).toBeGreaterThan(10);
    expect(Math.abs(r.satisfyingSeen / r.evaluations - 49 / 4096)).toBeLessThan(49 / 4096 / sweeps + 1e-12);
  });
  it("counts lanes, not calls: x1 alone is true in half of them; no clause at all, in every one", () => {
    const half = measureEvaluationRate(cnfFromClauses(7, [[1]]), 0.02);
    expect(half.satisfyingSeen).toBe(half.evaluations / 2);
    const all = measureEvaluationRate(cnfFromClauses(3, []), 0.02);
    expect(all.satisfyingSeen).toBe(all.evaluations);
  });
});

describe("fitting a family (least squares of log10 seconds on n)", () => {
  it("recovers an exact line and finds where two lines cross", () => {
    const q = fitLogLinear([10, 20, 30], [1e-1, 1e0, 1e1])!;
    expect(q.slope).toBeCloseTo(0.1, 12);
    expect(q.intercept).toBeCloseTo(-2, 12);
    expect(q.rmsDecades).toBeLessThan(1e-12);
    const c = fitLogLinear([10, 20, 30], [1e-6, 1e-3, 1])!;
    expect(c.slope).toBeCloseTo(0.3, 12);
    // -2 + 0.1 n = -9 + 0.3 n at n = 35, where both take 10^1.5 s.
    const x = crossoverOf(q, c)!;
    expect(x.variables).toBeCloseTo(35, 9);
    expect(x.log10Seconds).toBeCloseTo(1.5, 9);
    expect(fitAt(c, 35)).toBeCloseTo(1.5, 9);
  });
  it("has no crossover when the classical line grows no faster, or the quantum line is below already at n = 0", () => {
    const a = { intercept: 0, slope: 0.3, points: 2, rmsDecades: 0 };
    expect(crossoverOf(a, { intercept: -5, slope: 0.2, points: 2, rmsDecades: 0 })).toBeUndefined();
    expect(crossoverOf({ intercept: -9, slope: 0.1, points: 2, rmsDecades: 0 }, a)).toBeUndefined();
  });
  it("needs two distinct sizes and skips times that are not positive and finite", () => {
    expect(fitLogLinear([10, 10], [1, 2])).toBeUndefined();
    expect(fitLogLinear([10, 20, 30], [1, NaN, 0])).toBeUndefined();
    expect(fitLogLinear([10, 20, 30], [1, Infinity, 100])!.points).toBe(2);
  });
});

describe("printing times", () => {
  it("picks a unit a reader can picture", () => {
    expect(formatSeconds(0)).toBe("0 s");
    expect(formatSeconds(2.57e-6)).toBe("2.57 us");
    expect(formatSeconds(0.0040818)).toBe("4.08 ms");
    expect(formatSeconds(42)).toBe("42 s");
    expect(formatSeconds(300)).toBe("5 min");
    expect(formatSeconds(9000)).toBe("2.5 h");
    expect(formatSeconds(5 * 86400)).toBe("5 days");
    expect(formatSeconds(41.2 * 365.25 * 86400)).toBe("41.2 years");
  });
  it("uses exponents for huge times, says when they pass the age of the universe, and never prints Infinity", () => {
    expect(formatSeconds(3.2e15)).toBe("1.01e+8 years");
    expect(formatSeconds(3.2e19)).toBe("1.01e+12 years (longer than the age of the universe)");
    expect(formatSeconds(1e300)).toBe("3.17e+292 years (longer than the age of the universe)");
    expect(formatSeconds(Infinity)).not.toMatch(/Infinity/);
    expect(formatCount(Infinity)).not.toMatch(/Infinity/);
    expect(formatCount(4620)).toBe("4620");
    expect(formatCount(2.6e7)).toBe("2.60e+7");
  });
  it("takes logarithms for what a double cannot hold: as before within range, a power of ten beyond", () => {
    expect(formatLog10Seconds(Math.log10(0.0040818))).toBe("4.08 ms");
    expect(formatLog10Seconds(300)).toBe("3.17e+292 years (longer than the age of the universe)");
    // 10^400 s is 10^(400 - 7.499) years (a Julian year is 31,557,600 s).
    expect(formatLog10Seconds(400)).toBe("10^392.5 years (longer than the age of the universe)");
    expect(formatLog10Count(6)).toBe("1.00e+6");
    expect(formatLog10Count(903.09)).toBe("10^903.1");
  });
});
