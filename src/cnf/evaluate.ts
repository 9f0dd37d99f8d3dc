/**
 * Classical evaluation of a formula: one assignment at a time, or 32 at a time with one bit per
 * assignment in each 32-bit word (bit-parallel).
 */
import { clauseCount, type Cnf } from "./cnf.js";

/**
 * True when `assignment` satisfies every clause. `assignment[v - 1]` is the value of variable v
 * (any truthy value is true).
 *
 * @example
 * ```ts
 * evaluate(cnfFromClauses(2, [[1, -2]]), [false, false]); // true
 * ```
 */
export function evaluate(cnf: Cnf, assignment: ArrayLike<boolean | number>): boolean {
  if (assignment.length < cnf.variables) {
    throw new RangeError(`assignment has ${assignment.length} values; the formula has ${cnf.variables} variables`);
  }
  const { lits, clauseStart } = cnf;
  const m = clauseCount(cnf);
  for (let i = 0; i < m; i++) {
    let sat = false;
    for (let k = clauseStart[i]!; k < clauseStart[i + 1]! && !sat; k++) {
      const l = lits[k]!;
      const v = assignment[(l < 0 ? -l : l) - 1] ? 1 : 0;
      sat = l > 0 ? v === 1 : v === 0;
    }
    if (!sat) return false;
  }
  return true;
}

/**
 * Evaluates 32 assignments at once. `words[v - 1]` holds variable v for the 32 assignments, one
 * per bit; the result has bit j set when assignment j satisfies the formula.
 *
 * @example
 * ```ts
 * // x1 in bit j is j & 1: lanes 1, 3, 5, ... satisfy [[1]].
 * evaluateWords(cnfFromClauses(1, [[1]]), Int32Array.of(0xaaaaaaaa)); // 0xaaaaaaaa | 0
 * ```
 */
export function evaluateWords(cnf: Cnf, words: ArrayLike<number>): number {
  if (words.length < cnf.variables) {
    throw new RangeError(`got ${words.length} words; the formula has ${cnf.variables} variables`);
  }
  const { lits, clauseStart } = cnf;
  const m = clauseCount(cnf);
  let acc = -1;
  for (let i = 0; i < m && acc !== 0; i++) {
    let c = 0;
    for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) {
      const l = lits[k]!;
      c |= l > 0 ? words[l - 1]! : ~words[-l - 1]!;
    }
    acc &= c;
  }
  return acc | 0;
}
