/**
 * Exact model counting at the clause level: exhaustive bit-parallel enumeration of every
 * variable that occurs in a clause (see clauseKernel.ts), split over all cores with
 * worker_threads when the work is large enough to pay for starting them. The public
 * `countModels` (src/count/) puts structure recovery in front of this and falls back to it when
 * recovery does not shrink the enumeration.
 */
import { countInWorkers } from "./workers.js";
import { availableParallelism } from "node:os";
import type { Cnf } from "../cnf/cnf.js";
import { blockCount, countBlocks, planCount } from "./clauseKernel.js";
import { countBySplitting } from "./clauseSplit.js";

/** Options of {@link countModels}. */
export interface CountOptions {
  /**
   * Refuse to enumerate more variables than this: the free variables that structure recovery
   * leaves when it helps (`countModels`), else the variables occurring in clauses (declared
   * variables in no clause only double the count and cost nothing). Default 34; at most 1000.
   * Above 30 occurring variables the clause-level counter splits on variables with unit
   * propagation before enumerating, which is fast on structured formulas and may still take
   * exponential time on random ones.
   */
  readonly maxVariables?: number;
  /** Worker threads to use; default: the number of cores. 1 counts on the calling thread. */
  readonly threads?: number;
  /** Called with the fraction of the enumeration done, from 0 to 1. */
  readonly onProgress?: (fraction: number) => void;
}

/** The result of {@link countModels}: the count, or why counting was refused. */
export type CountResult =
  | {
      /** The count is exact. */
      readonly ok: true;
      /** Satisfying assignments over all declared variables. */
      readonly models: bigint;
      /**
       * Variables that were enumerated: the free variables left by structure recovery, or every
       * variable occurring in a clause when recovery did not help; 0 when the count came from
       * Gaussian elimination (a purely linear structure).
       */
      readonly enumerated: number;
    }
  | {
      /** Counting was refused. */
      readonly ok: false;
      /** Why, worded for a user, with what to do. */
      readonly reason: string;
      /** Variables that would have been enumerated (free ones, or all occurring in clauses). */
      readonly enumerated: number;
      /**
       * Set when the count was refused for its size: the power of two it is a multiple of (the
       * declared variables that constrain nothing), too large to write out.
       */
      readonly doubling?: number;
    };

/** Default limit on enumerated variables: 2^34 assignments take about a minute on two cores. */
export const DEFAULT_COUNT_LIMIT = 34;
/** Variables that only double the count beyond which the count is too large to write out. */
export const MAX_DOUBLING_VARIABLES = 1_000_000;
/** Decimal digits of 2^e: floor(e log10 2) + 1 (2^e is never a power of ten for e > 0). */
export function digitsOfPowerOfTwo(e: number): number {
  return Math.floor(e * Math.log10(2)) + 1;
}

/** The reason a count that is a multiple of 2^e (e above MAX_DOUBLING_VARIABLES) is refused; `why` says where the e variables come from. */
export function doublingTooLarge(e: number, why: string, enumerated: number): CountResult {
  const digits = String(digitsOfPowerOfTwo(e)).replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return { ok: false, enumerated, doubling: e, reason: `the count is a multiple of 2^${e} (${why}), which alone has ${digits} digits; hint: declare only the variables the formula uses` };
}

/** Hard ceiling for the limit. */
export const MAX_COUNT_LIMIT = 1000;
/** Above this many variables, split with propagation instead of enumerating everything. */
export const SPLIT_ABOVE = 30;
/** Below this many enumerated variables, counting on the calling thread is faster than workers. */
const PARALLEL_FROM = 27;

/**
 * Counts the satisfying assignments of `cnf` over all its declared variables, exactly, by
 * enumerating every variable that occurs in a clause.
 *
 * @example
 * ```ts
 * const r = await countModels(cnfFromClauses(3, [[1, 2]]));
 * if (r.ok) console.log(r.models); // 6n
 * ```
 */
export async function countModels(cnf: Cnf, options: CountOptions = {}): Promise<CountResult> {
  const limit = options.maxVariables ?? DEFAULT_COUNT_LIMIT;
  const plan = planCount(cnf.variables, cnf.lits, cnf.clauseStart);
  if (!Number.isInteger(limit) || limit < 0 || limit > MAX_COUNT_LIMIT) {
    return { ok: false, reason: `the variable limit must be a whole number in 0..${MAX_COUNT_LIMIT}, got ${limit}; hint: pass a limit in that range`, enumerated: plan.used };
  }
  if (plan.unsat) return { ok: true, models: 0n, enumerated: 0 };
  if (plan.free > MAX_DOUBLING_VARIABLES) {
    return doublingTooLarge(plan.free, `${plan.free} declared variables occur in no clause`, plan.used);
  }
  if (plan.used > limit) {
    const seconds = 2 ** plan.used / 2e9;
    return {
      ok: false,
      enumerated: plan.used,
      reason: `refusing to enumerate 2^${plan.used} assignments (${plan.used} variables occur in clauses; the limit is ${limit}): ` +
        `that would take ${humanTime(seconds)} on two cores; hint: raise the limit to try anyway (--max-variables N)`,
    };
  }
  if (plan.used > SPLIT_ABOVE) {
    const models = countBySplitting(plan, options.onProgress);
    return { ok: true, models: models << BigInt(plan.free), enumerated: plan.used };
  }
  const blocks = blockCount(plan);
  const threads = Math.max(1, Math.min(options.threads ?? availableParallelism(), blocks));
  let found: number;
  if (threads === 1 || plan.used < PARALLEL_FROM) {
    found = 0;
    const step = Math.max(1, Math.floor(blocks / 64));
    for (let b = 0; b < blocks; b += step) {
      found += countBlocks(plan, b, Math.min(blocks, b + step));
      options.onProgress?.(Math.min(blocks, b + step) / blocks);
    }
  } else {
    found = await countInWorkers(new URL("./clauseWorker.js", import.meta.url), plan, blocks, threads, options.onProgress);
  }
  return { ok: true, models: BigInt(found) << BigInt(plan.free), enumerated: plan.used };
}


/** "about 12 seconds", "about 3 minutes", "under a second", ...: a duration for messages. */
export function humanTime(seconds: number): string {
  if (seconds < 1) return "under a second";
  if (seconds < 120) return `about ${Math.ceil(seconds)} second${Math.ceil(seconds) === 1 ? "" : "s"}`;
  if (seconds < 7200) return `about ${Math.round(seconds / 60)} minutes`;
  if (seconds < 172800) return `about ${Math.round(seconds / 3600)} hours`;
  if (seconds < 63072000) return `about ${Math.round(seconds / 86400)} days`;
  const years = seconds / 31557600;
  // 2^n / rate overflows a double above n = 1024 or so: say it by its power of ten instead.
  if (!Number.isFinite(years) || years >= 1e15) return `about 10^${Number.isFinite(years) ? Math.floor(Math.log10(years)) : "300+"} years or more`;
  return `about ${Math.round(years).toLocaleString("en-US")} years`;
}
