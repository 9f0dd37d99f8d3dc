/**
 * The number of solutions of a search at any header size: the exact model count of the variables
 * that occur in clauses, times 2^(declared variables in no clause), kept as count * 2^shift so a
 * header declaring 2^31 - 1 variables costs nothing.
 */
import type { Cnf } from "../cnf/cnf.js";
import { countModels, type CountOptions } from "../count/index.js";
import type { ScaledCount } from "./plan.js";
import { occurringVariables } from "./reduce.js";

/** The result of {@link countSolutions}. */
export type SolutionsCount =
  | {
      /** The count is exact. */
      readonly ok: true;
      /** Satisfying assignments of all declared variables: count * 2^shift. */
      readonly solutions: ScaledCount;
      /** Variables occurring in clauses. */
      readonly occurring: number;
    }
  | {
      /** Counting was refused (too many variables occur in clauses). */
      readonly ok: false;
      /** Variables occurring in clauses. */
      readonly occurring: number;
    };

/**
 * Counts the satisfying assignments of a formula over all its declared variables, exactly, as
 * count * 2^shift: the variables that occur in clauses are counted (within `maxVariables` of
 * {@link CountOptions}), each declared variable in no clause doubles the count.
 *
 * @example
 * ```ts
 * const r = await countSolutions(cnfFromClauses(2_000_000, [[1, 2]]));
 * if (r.ok) console.log(r.solutions); // { count: 3n, shift: 1999998 }
 * ```
 */
export async function countSolutions(cnf: Cnf, options: CountOptions = {}): Promise<SolutionsCount> {
  const { variables, literals } = occurringVariables(cnf);
  const lits = new Int32Array(literals.length);
  for (let k = 0; k < literals.length; k++) {
    const v = (literals[k]! >> 1) + 1;
    lits[k] = (literals[k]! & 1) === 1 ? -v : v;
  }
  const r = await countModels({ variables: variables.length, lits, clauseStart: cnf.clauseStart }, options);
  if (!r.ok) return { ok: false, occurring: variables.length };
  return { ok: true, solutions: { count: r.models, shift: cnf.variables - variables.length }, occurring: variables.length };
}
