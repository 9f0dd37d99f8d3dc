/**
 * Structure recovery: the pipeline stage between reading and synthesis that finds what the
 * encoder put into the clauses (gate definitions, parity constraints, one-hot groups) so that
 * later stages search only the free variables and compute the rest. Imports cnf/ only.
 * The algorithm and its published background are in recover.ts.
 */
import type { Cnf } from "../cnf/cnf.js";
import { BY_DEFINITION, BY_GROUP, BY_PARITY, KEPT, recoverRaw, type RawStructure } from "./recover.js";

/** The function a definition computes; inputs are DIMACS literals. */
export type DefinitionKind = "equiv" | "not" | "and" | "or" | "xor" | "xnor";

/**
 * `variable` equals the function `kind` of `inputs`: equiv: the input; not: its negation; and /
 * or: the AND / OR of the input literals (which may be negated); xor / xnor: the XOR of the inputs
 * / its negation. Inputs of equiv, not, xor and xnor are positive (plain variables).
 */
export interface Definition {
  /** The defined DIMACS variable. */
  readonly variable: number;
  /** The function it equals. */
  readonly kind: DefinitionKind;
  /** The function's inputs as DIMACS literals (negative: negated). */
  readonly inputs: readonly number[];
}

/** The XOR of `variables` must equal `parity`. */
export interface Parity {
  /** DIMACS variables, ascending. */
  readonly variables: readonly number[];
  /** The value their XOR must take. */
  readonly parity: 0 | 1;
}

/** At most one of `variables` is true; exactly one when `exactlyOne`. */
export interface Group {
  /** DIMACS variables, ascending. */
  readonly variables: readonly number[];
  /** The group's at-least-one clause was present (and consumed). */
  readonly exactlyOne: boolean;
}

/** What structure recovery removed, found and kept, in clauses. */
export interface StructureReport {
  /** Clauses in the input. */
  readonly clauses: number;
  /** Clauses after dropping repeated literals, tautologies and repeated clauses. */
  readonly cleanedClauses: number;
  /** Literals that stood twice in one clause. */
  readonly duplicateLiterals: number;
  /** Clauses holding a literal and its negation (always true), dropped. */
  readonly tautologies: number;
  /** Clauses equal to an earlier one (as sets of literals), dropped. */
  readonly duplicateClauses: number;
  /** Cleaned clauses consumed by definitions. */
  readonly definitionClauses: number;
  /** Cleaned clauses consumed by parity constraints. */
  readonly parityClauses: number;
  /** Cleaned clauses consumed by groups. */
  readonly groupClauses: number;
  /** Definitions refused because they would have closed a cycle (a variable left free instead). */
  readonly cyclesRefused: number;
  /** The acyclicity check's budget ran out on a huge formula: some definitions were not tried. */
  readonly budgetExhausted: boolean;
}

/**
 * A formula as structure: the models of the formula are exactly the assignments that give the
 * free variables any values, compute each defined variable from its definition (in the order
 * given), and satisfy every parity constraint, group and remaining clause. So the models
 * correspond one to one to the free assignments that pass those checks (times 2^unused).
 */
export interface Structure {
  /** Declared variables of the formula. */
  readonly variables: number;
  /**
   * The free variables that occur in some clause, ascending. Variables in no clause are free
   * too (any value); they are counted in `unused`, not listed.
   */
  readonly free: Int32Array;
  /** Declared variables that occur in no clause (after dropping tautologies). */
  readonly unused: number;
  /** Gate definitions in topological order: every input is free or defined earlier. */
  readonly definitions: readonly Definition[];
  /** Standalone parity constraints: complete k-XOR clause sets that define no variable. */
  readonly parities: readonly Parity[];
  /** At-most-one and exactly-one groups (3 or more variables each, disjoint). */
  readonly groups: readonly Group[];
  /** Every clause not consumed by the above, cleaned (literals sorted by variable). */
  readonly remaining: Cnf;
  /** Some clause is empty: nothing satisfies the formula (the empty clause is in `remaining`). */
  readonly unsat: boolean;
  /** What was dropped, consumed and refused, in clauses. */
  readonly report: StructureReport;
}

/** Options of {@link recoverStructure}. */
export interface StructureOptions {
  /**
   * "definitions" (default): gate definitions first, as they leave the fewest free variables;
   * an exactly-one group then usually becomes a NOR definition of one member plus an at-most-one
   * group of the rest. "groups": exactly-one and at-most-one groups first, then definitions.
   */
  readonly prefer?: "definitions" | "groups";
}

/** Indexed by the kind codes of recover.ts (EQUIV = 0 ... XNOR = 5). */
const KIND_NAMES: readonly DefinitionKind[] = ["equiv", "not", "and", "or", "xor", "xnor"];

/**
 * Recovers gate definitions, parity constraints and at-most-one / exactly-one groups from a
 * formula's clauses. Linear in the formula's size up to hash-table effects; never fails.
 *
 * @example
 * ```ts
 * // y3 <-> y1 AND y2, as Tseitin encodes it, with y3 forced true.
 * const s = recoverStructure(cnfFromClauses(3, [[-3, 1], [-3, 2], [3, -1, -2], [3]]));
 * s.definitions; // [{ variable: 3, kind: "and", inputs: [1, 2] }]
 * Array.from(s.free); // [1, 2]
 * ```
 */
export function recoverStructure(cnf: Cnf, options: StructureOptions = {}): Structure {
  const raw = recoverRaw(cnf.variables, cnf.lits, cnf.clauseStart, options.prefer === "groups");
  return publicStructure(cnf, raw);
}

function publicStructure(cnf: Cnf, raw: RawStructure): Structure {
  const { clean, consumed } = raw;
  const { varOf, codes, start } = clean;
  const lit = (code: number): number => (code & 1 ? -varOf[code >>> 1]! : varOf[code >>> 1]!);
  const definitions: Definition[] = [];
  for (let d = 0; d < raw.defVar.length; d++) {
    const inputs: number[] = [];
    for (let k = raw.defInStart[d]!; k < raw.defInStart[d + 1]!; k++) inputs.push(lit(raw.defIn[k]!));
    definitions.push({ variable: varOf[raw.defVar[d]!]!, kind: KIND_NAMES[raw.defKind[d]!]!, inputs });
  }
  const parities: Parity[] = [];
  for (let g = 0; g + 1 < raw.parStart.length; g++) {
    const variables: number[] = [];
    for (let k = raw.parStart[g]!; k < raw.parStart[g + 1]!; k++) variables.push(varOf[raw.parVars[k]!]!);
    parities.push({ variables, parity: raw.parValue[g] ? 1 : 0 });
  }
  const groups: Group[] = [];
  for (let g = 0; g + 1 < raw.grpStart.length; g++) {
    const variables: number[] = [];
    for (let k = raw.grpStart[g]!; k < raw.grpStart[g + 1]!; k++) variables.push(varOf[raw.grpVars[k]!]!);
    groups.push({ variables: variables.sort((a, b) => a - b), exactlyOne: raw.grpExactlyOne[g] === 1 });
  }
  const m = start.length - 1;
  let keptClauses = 0;
  let keptLits = 0;
  const counts = [0, 0, 0, 0];
  for (let i = 0; i < m; i++) {
    counts[consumed[i]!]!++;
    if (consumed[i] === KEPT) {
      keptClauses++;
      keptLits += start[i + 1]! - start[i]!;
    }
  }
  const lits = new Int32Array(keptLits);
  const clauseStart = new Uint32Array(keptClauses + 1);
  let nl = 0;
  let nc = 0;
  for (let i = 0; i < m; i++) {
    if (consumed[i] !== KEPT) continue;
    for (let k = start[i]!; k < start[i + 1]!; k++) lits[nl++] = lit(codes[k]!);
    clauseStart[++nc] = nl;
  }
  let freeCount = 0;
  let occurring = 0;
  for (let x = 0; x < clean.u; x++) {
    if (!raw.occurs[x]) continue;
    occurring++;
    if (!raw.defined[x]) freeCount++;
  }
  const free = new Int32Array(freeCount);
  let f = 0;
  for (let x = 0; x < clean.u; x++) if (raw.occurs[x] && !raw.defined[x]) free[f++] = varOf[x]!;
  return {
    variables: cnf.variables,
    free,
    unused: cnf.variables - occurring,
    definitions,
    parities,
    groups,
    remaining: { variables: cnf.variables, lits, clauseStart },
    unsat: clean.empty,
    report: {
      clauses: cnf.clauseStart.length - 1,
      cleanedClauses: m,
      duplicateLiterals: clean.duplicateLiterals,
      tautologies: clean.tautologies,
      duplicateClauses: clean.duplicateClauses,
      definitionClauses: counts[BY_DEFINITION]!,
      parityClauses: counts[BY_PARITY]!,
      groupClauses: counts[BY_GROUP]!,
      cyclesRefused: raw.cyclesRefused,
      budgetExhausted: raw.budgetExhausted,
    },
  };
}

/**
 * Completes an assignment of the free variables: computes every defined variable from its
 * definition, in order. `assignment[v - 1]` is the value of variable v (as in `evaluate`); only
 * the free variables' entries are read. Returns a new array of 0/1 over all declared variables.
 *
 * @example
 * ```ts
 * const s = recoverStructure(cnfFromClauses(3, [[-3, 1], [-3, 2], [3, -1, -2]]));
 * extendAssignment(s, [1, 1, 0]); // Uint8Array [1, 1, 1]: variable 3 = 1 AND 1
 * ```
 */
export function extendAssignment(structure: Structure, assignment: ArrayLike<boolean | number>): Uint8Array {
  const n = structure.variables;
  if (assignment.length < n) {
    throw new RangeError(`assignment has ${assignment.length} values; the formula has ${n} variables`);
  }
  const out = new Uint8Array(n);
  for (let v = 0; v < n; v++) out[v] = assignment[v] ? 1 : 0;
  const value = (l: number): number => (l > 0 ? out[l - 1]! : 1 - out[-l - 1]!);
  for (const d of structure.definitions) {
    let r: number;
    switch (d.kind) {
      case "equiv":
        r = value(d.inputs[0]!);
        break;
      case "not":
        r = 1 - value(d.inputs[0]!);
        break;
      case "and":
        r = 1;
        for (const l of d.inputs) r &= value(l);
        break;
      case "or":
        r = 0;
        for (const l of d.inputs) r |= value(l);
        break;
      case "xor":
      case "xnor":
        r = d.kind === "xnor" ? 1 : 0;
        for (const l of d.inputs) r ^= value(l);
        break;
    }
    out[d.variable - 1] = r;
  }
  return out;
}

/**
 * True when a full assignment satisfies the structure's parity constraints, groups and
 * remaining clauses (the definitions are not checked: {@link extendAssignment} makes them hold).
 *
 * @example
 * ```ts
 * const s = recoverStructure(cnfFromClauses(3, [[-3, 1], [-3, 2], [3, -1, -2], [3]]));
 * satisfiesStructure(s, extendAssignment(s, [1, 1, 0])); // true: the unit clause 3 holds
 * ```
 */
export function satisfiesStructure(structure: Structure, assignment: ArrayLike<boolean | number>): boolean {
  const at = (v: number): number => (assignment[v - 1] ? 1 : 0);
  for (const p of structure.parities) {
    let x = 0;
    for (const v of p.variables) x ^= at(v);
    if (x !== p.parity) return false;
  }
  for (const g of structure.groups) {
    let ones = 0;
    for (const v of g.variables) ones += at(v);
    if (ones > 1 || (g.exactlyOne && ones === 0)) return false;
  }
  const { lits, clauseStart } = structure.remaining;
  for (let i = 0; i + 1 < clauseStart.length; i++) {
    let sat = false;
    for (let k = clauseStart[i]!; k < clauseStart[i + 1]! && !sat; k++) {
      const l = lits[k]!;
      sat = l > 0 ? at(l) === 1 : at(-l) === 0;
    }
    if (!sat) return false;
  }
  return true;
}

/** The result of {@link evaluateStructured}. */
export interface StructuredEvaluation {
  /** The completed assignment over all declared variables (0/1, index v - 1 for variable v). */
  readonly assignment: Uint8Array;
  /** It satisfies the parities, groups and remaining clauses: it is a model of the formula. */
  readonly satisfied: boolean;
}

/**
 * Evaluates the formula through its structure: completes the free variables' values with
 * {@link extendAssignment} and checks the rest with {@link satisfiesStructure}. The result is
 * true exactly when the completed assignment is a model of the formula.
 *
 * @example
 * ```ts
 * const s = recoverStructure(cnfFromClauses(3, [[-3, 1], [-3, 2], [3, -1, -2], [3]]));
 * evaluateStructured(s, [1, 0, 0]).satisfied; // false: 3 = 1 AND 0 = 0, but 3 is forced true
 * ```
 */
export function evaluateStructured(structure: Structure, assignment: ArrayLike<boolean | number>): StructuredEvaluation {
  const full = extendAssignment(structure, assignment);
  return { assignment: full, satisfied: satisfiesStructure(structure, full) };
}
