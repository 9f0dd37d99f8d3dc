/**
 * The classical side of the comparison: how fast this machine checks assignments with
 * clausegate's own bit-parallel evaluator (`evaluateWords`, 32 assignments per call), measured
 * on the formula itself for a short fixed time.
 */
import type { Cnf } from "../cnf/cnf.js";
import { evaluateWords } from "../cnf/evaluate.js";

/** A measured evaluation rate. */
export interface EvaluationRate {
  /** Assignments checked per second. */
  readonly evaluationsPerSecond: number;
  /** Assignments checked while measuring. */
  readonly evaluations: number;
  /** Seconds measured (after the warm-up). */
  readonly seconds: number;
  /** Satisfying assignments seen while measuring (counted so the work cannot be skipped; repeats when the space is small). */
  readonly satisfyingSeen: number;
}

/** The lane patterns of the first five variables: bit j of word v is bit v of j. */
const LANES = [0xaaaaaaaa | 0, 0xcccccccc | 0, 0xf0f0f0f0 | 0, 0xff00ff00 | 0, 0xffff0000 | 0];

function popcount(x: number): number {
  x -= (x >>> 1) & 0x55555555;
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  return (((x + (x >>> 4)) & 0x0f0f0f0f) * 0x01010101) >>> 24;
}

/**
 * Measures how many assignments per second `evaluateWords` checks on this formula: it walks the
 * assignments in order, 32 per call (the first five variables vary across the lanes, the others
 * count up), for a warm-up of a quarter of `seconds` (at most 50 ms, so the JIT has compiled the
 * loop) and then for `seconds`, wrapping around when the space is smaller than the time allows.
 *
 * @example
 * ```ts
 * measureEvaluationRate(cnfFromClauses(3, [[1, -2], [2, 3]]), 0.05).evaluationsPerSecond; // e.g. 2e8
 * ```
 */
export function measureEvaluationRate(cnf: Cnf, seconds = 0.2): EvaluationRate {
  const n = cnf.variables;
  const words = new Int32Array(Math.max(n, 1));
  for (let v = 0; v < Math.min(n, 5); v++) words[v] = LANES[v]!;
  const high = Math.max(0, n - 5);
  // Counting the high variables up to 2^30 blocks is plenty for a fraction of a second.
  const wrapBits = Math.min(high, 30);
  let block = 0;
  let satisfyingSeen = 0;
  const run = (limitMs: number): { calls: number; ms: number } => {
    const start = performance.now();
    let calls = 0;
    let now = start;
    while (now - start < limitMs) {
      for (let i = 0; i < 256; i++) {
        satisfyingSeen += popcount(evaluateWords(cnf, words));
        // Next block: the low bits of the counter that turn over are the trailing ones, then one more.
        const next = wrapBits === 0 ? 0 : (block + 1) % 2 ** wrapBits;
        let changed = block ^ next;
        for (let b = 0; changed !== 0; b++, changed >>>= 1) if (changed & 1) words[5 + b] = (next >>> b) & 1 ? -1 : 0;
        block = next;
      }
      calls += 256;
      now = performance.now();
    }
    return { calls, ms: now - start };
  };
  run(Math.min(50, (seconds * 1000) / 4));
  satisfyingSeen = 0;
  const { calls, ms } = run(seconds * 1000);
  const evaluations = calls * 32;
  return { evaluationsPerSecond: evaluations / (ms / 1000), evaluations, seconds: ms / 1000, satisfyingSeen };
}
