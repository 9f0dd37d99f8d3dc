/**
 * Exact model counting with structure recovery in front: when the formula's clauses encode gate
 * definitions (structure/), only the free variables are enumerated and the defined ones are
 * computed, 32 assignments per word (kernel.ts); a purely linear structure (XORs, parities,
 * unit clauses) is solved by Gaussian elimination instead (linear.ts). When recovery does not
 * shrink the enumeration, the clause-level counter (clauses.ts) counts as before.
 */
import { countInWorkers } from "./workers.js";
import { availableParallelism } from "node:os";
import type { Cnf } from "../cnf/cnf.js";
import {
  countModels as countByClauses,
  DEFAULT_COUNT_LIMIT,
  doublingTooLarge,
  humanTime,
  MAX_COUNT_LIMIT,
  MAX_DOUBLING_VARIABLES,
  SPLIT_ABOVE,
  type CountOptions as ClauseCountOptions,
  type CountResult,
} from "./clauses.js";
import { recoverStructure } from "../structure/index.js";
import { countStructuredBlocks, newStructuredScratch, structuredBlocks } from "./kernel.js";
import { countLinear, isLinear } from "./linear.js";
import { planStructuredCount } from "./plan.js";

/** Options of {@link countModels}. */
export interface CountOptions extends ClauseCountOptions {
  /**
   * Recover gate definitions, parity constraints and one-hot groups first and enumerate only
   * the free variables that they leave (default true). With false, every variable that occurs
   * in a clause is enumerated. `maxVariables` limits whichever is enumerated.
   */
  readonly structure?: boolean;
}

/** Free variables up to which enumeration is preferred over splitting: 2^15 words at most. */
const STRUCTURED_BEFORE_SPLITTING = 20;
/** Kernel operations (words x literals) above which workers pay for their start-up. */
const PARALLEL_WORK = 2 ** 27;
/** Kernel operations per second on one core, for the refusal message's estimate (measured order). */
const OPS_PER_SECOND = 1e9;

/**
 * Counts the satisfying assignments of `cnf` over all its declared variables, exactly. Gate
 * definitions recovered from the clauses are computed rather than enumerated, so a
 * Tseitin-encoded circuit costs 2^inputs, not 2^variables.
 *
 * @example
 * ```ts
 * const r = await countModels(cnfFromClauses(3, [[1, 2]]));
 * if (r.ok) console.log(r.models); // 6n
 * ```
 */
export async function countModels(cnf: Cnf, options: CountOptions = {}): Promise<CountResult> {
  const limit = options.maxVariables ?? DEFAULT_COUNT_LIMIT;
  if (options.structure === false || !Number.isInteger(limit) || limit < 0 || limit > MAX_COUNT_LIMIT) return countByClauses(cnf, options);
  const s = recoverStructure(cnf);
  const occurring = s.free.length + s.definitions.length;
  if (s.definitions.length === 0 && s.parities.length === 0 && s.groups.length === 0) return countByClauses(cnf, options);
  const { plan, doubling, zero, cost } = planStructuredCount(s);
  if (zero) return { ok: true, models: 0n, enumerated: 0 };
  if (isLinear(plan)) {
    // Only XORs, parities and unit clauses: Gaussian elimination instead of enumeration.
    const linear = countLinear(plan);
    if (linear !== undefined && doubling <= MAX_DOUBLING_VARIABLES) return { ok: true, models: linear << BigInt(doubling), enumerated: 0 };
  }
  const F = plan.enumerated;
  if (F >= occurring || !structureWins(F, cost, occurring, cnf.lits.length, limit)) return countByClauses(cnf, options);
  if (doubling > MAX_DOUBLING_VARIABLES) {
    return doublingTooLarge(doubling, `${doubling} variables are free and constrain nothing, ${s.unused} of them in no clause`, F);
  }
  if (F > limit) {
    const seconds = (2 ** F / 32) * cost / (2 * OPS_PER_SECOND);
    return {
      ok: false,
      enumerated: F,
      reason: `refusing to enumerate 2^${F} assignments (${F} free variables left by structure recovery, of ${occurring} in clauses; the limit is ${limit}): ` +
        `that would take ${humanTime(seconds)} on two cores; hint: raise the limit to try anyway (--max-variables N)`,
    };
  }
  const blocks = structuredBlocks(plan);
  const threads = Math.max(1, Math.min(options.threads ?? availableParallelism(), blocks));
  let found: number;
  if (threads === 1 || (2 ** F / 32) * cost < PARALLEL_WORK) {
    found = 0;
    const step = Math.max(1, Math.floor(blocks / 64));
    const scratch = newStructuredScratch(plan);
    for (let b = 0; b < blocks; b += step) {
      found += countStructuredBlocks(plan, b, Math.min(blocks, b + step), scratch);
      options.onProgress?.(Math.min(blocks, b + step) / blocks);
    }
  } else {
    found = await countInWorkers(new URL("./worker.js", import.meta.url), plan, blocks, threads, options.onProgress);
  }
  return { ok: true, models: BigInt(found) << BigInt(doubling), enumerated: F };
}

/**
 * Whether enumerating the F free variables beats the clause-level counter on `used` occurring
 * variables: always when that counter would refuse; against its plain enumeration (up to
 * SPLIT_ABOVE variables) when it takes fewer word operations; against its splitting with unit
 * propagation (which settles formulas such as n-queens quickly) only when F is small.
 */
function structureWins(F: number, cost: number, used: number, literals: number, limit: number): boolean {
  if (used > limit) return true;
  if (used <= SPLIT_ABOVE) return 2 ** F * cost < 2 ** used * (literals + 1);
  return F <= STRUCTURED_BEFORE_SPLITTING;
}

