/**
 * What an oracle searches and what it computes: the search register (every declared variable, or
 * only the variables left free by unit propagation and structure recovery), how a register value
 * completes to a model, and the formula synthesis works from (plain clauses, or a recovered
 * structure). Shared by compile.ts and the cost model so that both build the same oracle.
 */
import type { Cnf } from "../cnf/cnf.js";
import { reduceSearch, type Reduction } from "../cnf/reduce.js";
import { fullCompletion, type Completion } from "../structure/completion.js";
import { recoverStructure, type Definition, type Structure } from "../structure/index.js";
import { simplify, type SimplifiedCnf } from "./simplify.js";
import { clauseAnds, structuredAnds } from "./structured.js";

/**
 * `full`: the search register holds every declared variable (vars[v-1] is variable v) and the
 * oracle marks exactly the formula's models. `free`: it holds only the variables left free after
 * unit propagation, dropping unconstrained variables and structure recovery; the rest are fixed or
 * computed (see {@link Completion}).
 */
export type RegisterMode = "full" | "free";

/** What structure recovery gave the oracle. */
export interface StructureSummary {
  /** Gate definitions: checked against their variable (full register) or computed (free register). */
  readonly definitions: number;
  /** Standalone parity constraints, checked with CNOTs. */
  readonly parities: number;
  /** At-most-one and exactly-one groups, checked by a running parity (see synth/structured.ts). */
  readonly groups: number;
  /** Clauses left as plain clauses (after simplification). */
  readonly remainingClauses: number;
  /** Literals in them. */
  readonly remainingLiterals: number;
  /**
   * False when the oracle is the plain clause construction: nothing was recovered, or (full
   * register) the structured construction would not need fewer two-input ANDs.
   */
  readonly used: boolean;
}

/**
 * A recovered structure ready for synthesis, over local variables 1..structure.variables (the
 * declared variables for a full register, the reduced formula's for a free one).
 */
export interface StructuredFormula {
  /** Definitions, parities and groups (its `remaining` is superseded by `remaining` below). */
  readonly structure: Structure;
  /** The local variable held by each search qubit. */
  readonly register: Int32Array;
  /**
   * True (free register): definitions are computed into work qubits, except those of constant
   * variables, which are checked against their constant. False (full register): every
   * definition is checked against its variable's search qubit.
   */
  readonly computeDefinitions: boolean;
  /** Local literals fixed true by unit propagation (constants, not qubits). */
  readonly constants: Int32Array;
  /** The clauses left as clauses, simplified (local variables). */
  readonly remaining: SimplifiedCnf;
}

/** The oracle a formula gets for one register mode and structure setting. */
export interface OraclePlan {
  /** Declared variables of the formula. */
  readonly variables: number;
  /** The DIMACS variable held by each search qubit, in order. */
  readonly register: Int32Array;
  /** How a register value completes to an assignment of every variable. */
  readonly completion: Completion;
  /**
   * The formula as plain simplified clauses over the register's numbering before structure
   * (the declared variables, or the reduced formula's searched variables 1..n'): what the clause
   * constructions (and the textbook reference) work from.
   */
  readonly clauses: SimplifiedCnf;
  /** The structure synthesis uses, or null when the clause construction over `clauses` is the oracle. */
  readonly structured: StructuredFormula | null;
  /** What recovery gave, or null when structure was not asked for. */
  readonly summary: StructureSummary | null;
}

/**
 * Plans the oracle of `cnf`. With `structure` false, or when recovery finds nothing, the oracle is
 * today's clause construction (over all variables, or over the reduced formula for a free
 * register), gate for gate. On a full register structure is used only when it needs fewer
 * two-input ANDs (Toffoli-equivalents) than the clause construction; on a free register always
 * (it shrinks the register).
 */
export function planOracle(cnf: Cnf, mode: RegisterMode, structure: boolean): OraclePlan {
  if (shared === null) return planAnew(cnf, mode, structure);
  let plans = shared.get(cnf);
  if (plans === undefined) shared.set(cnf, (plans = new Map()));
  const key = `${mode}/${structure}`;
  let plan = plans.get(key);
  if (plan === undefined) plans.set(key, (plan = planAnew(cnf, mode, structure)));
  return plan;
}

/** Plans made within {@link sharingPlans}, by formula object, then mode and structure. */
let shared: WeakMap<Cnf, Map<string, OraclePlan>> | null = null;
/** Simplified formulas made within {@link sharingPlans} (plans with and without structure share one). */
let sharedSimplified: WeakMap<Cnf, SimplifiedCnf> | null = null;

/** simplify, once per formula object within {@link sharingPlans}. */
function simplified(cnf: Cnf): SimplifiedCnf {
  if (sharedSimplified === null) return simplify(cnf);
  let s = sharedSimplified.get(cnf);
  if (s === undefined) sharedSimplified.set(cnf, (s = simplify(cnf)));
  return s;
}

/**
 * Runs `work` with the plans of one formula object made once and shared: a command that asks
 * for the register, then both cost tables, planned a million clauses three times (simplification
 * some 2.5 s each time). Only within such a scope, where the caller knows the formula
 * is not changed in place between calls.
 */
export function sharingPlans<T>(work: () => T): T {
  // Within a scope already: its plans are shared too.
  if (shared !== null) return work();
  const before = [shared, sharedSimplified] as const;
  shared = new WeakMap();
  sharedSimplified = new WeakMap();
  try {
    return work();
  } finally {
    [shared, sharedSimplified] = before;
  }
}

function planAnew(cnf: Cnf, mode: RegisterMode, structure: boolean): OraclePlan {
  if (mode === "full") {
    const clauses = simplified(cnf);
    const completion = fullCompletion(cnf.variables);
    if (!structure) return { variables: cnf.variables, register: completion.register, completion, clauses, structured: null, summary: null };
    const s = recoverStructure(cnf);
    if (!recovered(s)) return { variables: cnf.variables, register: completion.register, completion, clauses, structured: null, summary: nothing(clauses) };
    const remaining = simplifyRemaining(s.remaining, clauses);
    const structured: StructuredFormula = { structure: s, register: completion.register, computeDefinitions: false, constants: new Int32Array(0), remaining };
    // The register is the same either way: structure is only worth what it saves. It can save
    // nothing when unit clauses subsume most of a definition's clauses, which the clause
    // construction then drops.
    if (structuredAnds(structured) >= clauseAnds(clauses)) return { variables: cnf.variables, register: completion.register, completion, clauses, structured: null, summary: { ...summaryOf(s, remaining), used: false } };
    return { variables: cnf.variables, register: completion.register, completion, clauses, structured, summary: summaryOf(s, remaining) };
  }
  const r = reduceSearch(cnf);
  const clauses = simplified(r.cnf);
  const fixed = fixedLiterals(r);
  const searched = Int32Array.from(r.searched);
  const plainCompletion: Completion = { variables: cnf.variables, register: searched, fixed, definitions: [] };
  if (!structure || r.unsat) return { variables: cnf.variables, register: searched, completion: plainCompletion, clauses, structured: null, summary: structure ? nothing(clauses) : null };
  const reducedFirst = afterPropagation(cnf, r, clauses, fixed);
  const recoveredFirst = cnf.variables <= DENSE_LIMIT ? beforePropagation(cnf, r, fixed) : null;
  // The smaller register wins (each free variable doubles the search space); on a tie, recovery
  // after propagation (its formula is smaller).
  const best = reducedFirst === null ? recoveredFirst : recoveredFirst === null || reducedFirst.register.length <= recoveredFirst.register.length ? reducedFirst : recoveredFirst;
  return best ?? { variables: cnf.variables, register: searched, completion: plainCompletion, clauses, structured: null, summary: nothing(clauses) };
}

/** Declared variables up to which recovery before propagation is also tried (it indexes by variable). */
const DENSE_LIMIT = 1 << 22;

/**
 * The free register by recovery on the reduced formula (after unit propagation and dropping
 * variables in no open clause): its free variables are the register, its definitions computed.
 * Null when nothing is recovered.
 */
function afterPropagation(cnf: Cnf, r: Reduction, clauses: SimplifiedCnf, fixed: Int32Array): OraclePlan | null {
  const searched = Int32Array.from(r.searched);
  const s = recoverStructure(r.cnf);
  if (!recovered(s)) return null;
  const remaining = simplifyRemaining(s.remaining, clauses);
  const back = (l: number): number => (l > 0 ? searched[l - 1]! : -searched[-l - 1]!);
  const register = Int32Array.from(s.free, (v) => searched[v - 1]!);
  const definitions: Definition[] = s.definitions.map((d) => ({ variable: back(d.variable), kind: d.kind, inputs: d.inputs.map(back) }));
  return {
    variables: cnf.variables,
    register,
    completion: { variables: cnf.variables, register, fixed, definitions },
    clauses,
    structured: { structure: s, register: s.free, computeDefinitions: true, constants: new Int32Array(0), remaining },
    summary: summaryOf(s, remaining),
  };
}

/**
 * The free register by recovery on the whole formula, with the values unit propagation fixes as
 * constants: the register is the free variables that are neither fixed nor in only satisfied
 * clauses (those take 0: flipping one keeps every clause satisfied, and the definitions computed
 * from it keep their values in every model). A definition of a fixed variable becomes a check
 * against its constant. On a circuit whose output propagation forces, recovery after propagation
 * can leave a forced gate as a parity constraint and define an input from it instead; here the
 * circuit's inputs stay the register. Null when nothing is recovered.
 */
function beforePropagation(cnf: Cnf, r: Reduction, fixed: Int32Array): OraclePlan | null {
  const s = recoverStructure(cnf);
  if (!recovered(s)) return null;
  const isFixed = new Uint8Array(cnf.variables + 1);
  for (const l of fixed) isFixed[Math.abs(l)] = 1;
  const open = new Uint8Array(cnf.variables + 1);
  for (const v of r.searched) open[v] = 1;
  const register = s.free.filter((v) => !isFixed[v] && open[v] === 1);
  const definitions = s.definitions.filter((d) => !isFixed[d.variable]);
  const clauses = simplified(cnf);
  const remaining = simplifyRemaining(s.remaining, clauses);
  return {
    variables: cnf.variables,
    register,
    completion: { variables: cnf.variables, register, fixed, definitions },
    clauses: simplified(r.cnf),
    structured: { structure: s, register, computeDefinitions: true, constants: fixed, remaining },
    summary: summaryOf(s, remaining),
  };
}

function recovered(s: Structure): boolean {
  return s.definitions.length > 0 || s.parities.length > 0 || s.groups.length > 0;
}

function nothing(clauses: SimplifiedCnf): StructureSummary {
  return { definitions: 0, parities: 0, groups: 0, remainingClauses: clauses.clauseStart.length - 1, remainingLiterals: clauses.lits.length, used: false };
}

function summaryOf(s: Structure, remaining: SimplifiedCnf): StructureSummary {
  return {
    definitions: s.definitions.length, parities: s.parities.length, groups: s.groups.length,
    remainingClauses: remaining.clauseStart.length - 1, remainingLiterals: remaining.lits.length, used: true,
  };
}

/** The fixed variables of a reduction as DIMACS literals, ascending by variable. */
function fixedLiterals(r: Reduction): Int32Array {
  const out = new Int32Array(r.fixed.size);
  let i = 0;
  for (const [v, value] of [...r.fixed].sort((a, b) => a[0] - b[0])) out[i++] = value ? v : -v;
  return out;
}

/**
 * The remaining clauses that survive simplification of the whole formula (as literal sets), then
 * simplified. A remaining clause that simplification drops is subsumed by another clause of the
 * formula (consumed or remaining), so dropping it keeps the models; and then the structured
 * oracle never pays for a clause the clause construction would not pay for.
 */
function simplifyRemaining(remaining: Cnf, whole: SimplifiedCnf): SimplifiedCnf {
  const m = whole.clauseStart.length - 1;
  const bits = Math.max(4, Math.ceil(Math.log2(2 * m + 2)));
  const mask = (1 << bits) - 1;
  const table = new Int32Array(1 << bits).fill(-1);
  const key = (lits: Int32Array, s: number, e: number): number => {
    let h = e - s;
    for (let k = s; k < e; k++) h = Math.imul(h ^ lits[k]!, 0x9e3779b1) ^ (h >>> 13);
    return h & mask;
  };
  for (let i = 0; i < m; i++) {
    let slot = key(whole.lits, whole.clauseStart[i]!, whole.clauseStart[i + 1]!);
    while (table[slot] !== -1) slot = (slot + 1) & mask;
    table[slot] = i;
  }
  // Both sides list a clause's literals by variable (distinct variables after cleaning), so equal
  // sets are equal sequences.
  const same = (i: number, s: number, e: number): boolean => {
    const ws = whole.clauseStart[i]!;
    if (whole.clauseStart[i + 1]! - ws !== e - s) return false;
    for (let k = 0; k < e - s; k++) if (whole.lits[ws + k] !== remaining.lits[s + k]) return false;
    return true;
  };
  const lits: number[] = [];
  const starts: number[] = [0];
  for (let i = 0; i + 1 < remaining.clauseStart.length; i++) {
    const s = remaining.clauseStart[i]!;
    const e = remaining.clauseStart[i + 1]!;
    let slot = key(remaining.lits, s, e);
    let found = false;
    while (table[slot] !== -1 && !found) {
      found = same(table[slot]!, s, e);
      slot = (slot + 1) & mask;
    }
    if (!found) continue;
    for (let k = s; k < e; k++) lits.push(remaining.lits[k]!);
    starts.push(lits.length);
  }
  return simplify({ variables: remaining.variables, lits: Int32Array.from(lits), clauseStart: Uint32Array.from(starts) });
}
