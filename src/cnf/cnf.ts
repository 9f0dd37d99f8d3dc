/**
 * The CNF formula in flat form (CSR): all literals of all clauses in one Int32Array, and the start
 * of each clause in another, so that hot loops touch no per-clause or per-literal objects.
 *
 * Invariants: `clauseStart[0] === 0`, `clauseStart` is non-decreasing, its last entry equals the
 * number of literals, and every literal `l` has `1 <= |l| <= variables`. A clause may be empty
 * (the formula is then unsatisfiable) and may repeat literals.
 */
export interface Cnf {
  /** Declared number of variables; variables are 1..variables and need not all occur. */
  readonly variables: number;
  /** Literals in DIMACS form: +v or -v. */
  readonly lits: Int32Array;
  /** Clause `i` is `lits[clauseStart[i] .. clauseStart[i+1])`; length is clauses + 1. */
  readonly clauseStart: Uint32Array;
}

/** Number of clauses in a formula. */
export function clauseCount(cnf: Cnf): number {
  return cnf.clauseStart.length - 1;
}

/**
 * Builds a {@link Cnf} from clause arrays; convenient for tests and programs, not for hot paths.
 *
 * @example
 * ```ts
 * const f = cnfFromClauses(3, [[1, -2], [2, 3]]);
 * ```
 */
export function cnfFromClauses(variables: number, clauses: readonly (readonly number[])[]): Cnf {
  if (!Number.isInteger(variables) || variables < 0 || variables > 2147483647) {
    throw new RangeError(`variables must be an integer in 0..2147483647, got ${variables}`);
  }
  let total = 0;
  for (const c of clauses) total += c.length;
  const lits = new Int32Array(total);
  const clauseStart = new Uint32Array(clauses.length + 1);
  let k = 0;
  clauses.forEach((c, i) => {
    for (const l of c) {
      if (!Number.isInteger(l) || l === 0 || Math.abs(l) > variables) {
        throw new RangeError(`clause ${i + 1}: literal ${l} is not in ±1..±${variables}`);
      }
      lits[k++] = l;
    }
    clauseStart[i + 1] = k;
  });
  return { variables, lits, clauseStart };
}

/** The clauses as plain arrays (for tests, printing and programs). */
export function clausesOf(cnf: Cnf): number[][] {
  const out: number[][] = [];
  for (let i = 0; i + 1 < cnf.clauseStart.length; i++) {
    out.push(Array.from(cnf.lits.subarray(cnf.clauseStart[i]!, cnf.clauseStart[i + 1]!)));
  }
  return out;
}
