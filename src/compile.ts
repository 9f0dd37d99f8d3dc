/**
 * The pipeline driver: formula -> simplified clauses -> logical oracle (synthesis) -> gate basis
 * (lowering) -> work-qubit reuse -> optimizer passes. Costs live in cost/.
 */
import { clauseCount, type Cnf } from "./cnf/cnf.js";
import { recycleCircuit, type Circuit } from "./ir/circuit.js";
import { lower, type Basis, type Uncompute } from "./passes/lower.js";
import { DEFAULT_PIPELINE } from "./passes/registry.js";
import { reuseWork } from "./passes/reuseWork.js";
import { runPasses } from "./passes/runner.js";
import { searchAround } from "./search/build.js";
import { completeAssignment, type Completion } from "./structure/completion.js";
import { planOracle, synthesizePlan, type OracleKind, type OraclePlan, type RegisterMode, type SimplifiedCnf, type SimplifyReport, type Strategy, type StructureSummary } from "./synth/index.js";

/** How to build an oracle. Every field has a default. */
export interface OracleOptions {
  /** `phase` (default): |x> -> (-1)^f(x) |x>. `flag`: |x>|b> -> |x>|b xor f(x)>. */
  readonly kind?: OracleKind;
  /** `wide` (default, fewest T) or `lean` (fewest qubits). */
  readonly strategy?: Strategy;
  /** `toffoli` (default), `mcx` (multi-controlled gates kept whole) or `clifford+t`. */
  readonly basis?: Basis;
  /** `unitary` (default) or `measured` (Gidney 2018: measure and fix up; no T to uncompute). */
  readonly uncompute?: Uncompute;
  /** Run the optimizer passes (default true). */
  readonly optimize?: boolean;
  /** Check the circuit's invariants after every pass, naming the pass that broke one. */
  readonly validatePasses?: boolean;
  /**
   * `full` (default): the search register holds every declared variable (vars[v-1] is variable
   * v) and the oracle marks exactly the models. `free`: it holds only the variables left free
   * by unit propagation, dropping variables in no open clause, and structure recovery; the oracle
   * computes the rest and marks a register value exactly when some model extends it
   * ({@link completeModel} gives that model). {@link Oracle.register} lists the variables held.
   */
  readonly register?: RegisterMode;
  /**
   * Recover gate definitions, parity constraints and one-hot groups from the clauses and compile
   * them natively (default true): definitions checked (full register) or computed (free register),
   * parities by CNOTs, groups by a running parity. False: the clause construction alone. When
   * nothing is recovered the two are the same circuit.
   */
  readonly structure?: boolean;
}

/** A compiled oracle. */
export interface Oracle {
  /** The circuit in the chosen basis: search register `vars` (vars[v-1] is variable v), `target`, `work`. */
  readonly circuit: Circuit;
  /** The options it was compiled with, defaults filled in. */
  readonly options: Required<OracleOptions>;
  /** Declared variables of the formula (the size of the search register). */
  readonly variables: number;
  /** Clauses in the input. */
  readonly clauses: number;
  /** What simplification removed before synthesis. */
  readonly simplification: SimplifyReport & {
    /** Clauses left for synthesis. */
    readonly clausesKept: number;
    /** Literals left for synthesis (L in the cost formulas). */
    readonly literalsKept: number;
  };
  /** The DIMACS variable held by each search qubit, in order (1..n for a full register). */
  readonly register: Int32Array;
  /** How a register value completes to an assignment of every variable (see {@link completeModel}). */
  readonly completion: Completion;
  /** What structure recovery gave the oracle, or null when `structure` was off. */
  readonly structure: StructureSummary | null;
}

/** The defaults of {@link OracleOptions}: phase, wide, toffoli, unitary, optimized, full register, structure on. */
export const DEFAULT_ORACLE_OPTIONS: Required<OracleOptions> = {
  kind: "phase",
  strategy: "wide",
  basis: "toffoli",
  uncompute: "unitary",
  optimize: true,
  validatePasses: false,
  register: "full",
  structure: true,
};

/** Lowers and optimizes a logical circuit (cost/built.ts repeats these steps; a test holds them equal). */
function finish(logical: Circuit, basis: Basis, uncompute: Uncompute, optimize: boolean, validate: boolean): Circuit {
  // Reuse work qubits first: a wire that one AND releases and the next takes up then shows the
  // optimizer the gate pairs at the seam (H H, T Tdg) that cancel.
  const lowered = lower(logical, { basis, uncompute });
  let c = reuseWork(lowered);
  if (c !== lowered) recycleCircuit(lowered);
  if (optimize) {
    const input = c;
    c = runPasses(c, DEFAULT_PIPELINE, { validate, recycle: true });
    if (c !== input) recycleCircuit(input);
  }
  return c;
}

/**
 * Compiles a formula into an oracle circuit.
 *
 * @example
 * ```ts
 * const oracle = compileOracle(cnfFromClauses(2, [[1, -2]]), { basis: "clifford+t", uncompute: "measured" });
 * ```
 */
export function compileOracle(cnf: Cnf, options: OracleOptions = {}): Oracle {
  const o = { ...DEFAULT_ORACLE_OPTIONS, ...options };
  const plan = planOracle(cnf, o.register, o.structure);
  const logical = synthesizePlan(plan, o.kind, o.strategy);
  const circuit = finish(logical, o.basis, o.uncompute, o.optimize, o.validatePasses);
  return {
    circuit, options: o, variables: cnf.variables, clauses: clauseCount(cnf), simplification: summary(plan.clauses),
    register: plan.register, completion: plan.completion, structure: plan.summary,
  };
}

/** What {@link registerOf} gives: the search register and its completion rule, without synthesis. */
export interface RegisterPlan {
  /** The DIMACS variable held by each search qubit, in order. */
  readonly register: Int32Array;
  /** How a register value completes to an assignment of every variable. */
  readonly completion: Completion;
  /** What structure recovery gave, or null when `structure` was off. */
  readonly structure: StructureSummary | null;
}

/**
 * The search register an oracle or search circuit compiled with these options has, and how its
 * values complete to models, without synthesizing anything (the bits a search measures are these
 * variables, in order).
 *
 * @example
 * ```ts
 * // Variable 3 <-> 1 AND 2 (Tseitin): the free register holds the gate's inputs only.
 * registerOf(cnfFromClauses(3, [[-3, 1], [-3, 2], [3, -1, -2]]), { register: "free" }).register; // Int32Array [1, 2]
 * ```
 */
export function registerOf(cnf: Cnf, options: Pick<OracleOptions, "register" | "structure"> = {}): RegisterPlan {
  const plan = planOracle(cnf, options.register ?? DEFAULT_ORACLE_OPTIONS.register, options.structure ?? DEFAULT_ORACLE_OPTIONS.structure);
  return { register: plan.register, completion: plan.completion, structure: plan.summary };
}

/**
 * Completes a value of an oracle's search register (`registerValue[i]` is search qubit i, as
 * measured; nonzero or true is 1) to an assignment of every declared variable (index v - 1 for variable v, 0/1):
 * register variables take their measured values, variables fixed by unit propagation their forced
 * values, defined variables are computed from their definitions in order, and every other
 * variable (one in no clause left open by the fixed values, whose value cannot matter) is 0. For a
 * full register this is the value itself. The result is a model exactly when the oracle marks the
 * register value.
 *
 * @example
 * ```ts
 * const oracle = compileOracle(cnf, { register: "free" });
 * const model = completeModel(oracle, measuredBits); // satisfies cnf when the oracle marks measuredBits
 * ```
 */
export function completeModel(oracle: Pick<Oracle, "completion">, registerValue: ArrayLike<number | boolean>): Uint8Array {
  return completeAssignment(oracle.completion, registerValue);
}

function summary(s: SimplifiedCnf): Oracle["simplification"] {
  return { ...s.report, clausesKept: s.clauseStart.length - 1, literalsKept: s.lits.length };
}

/** Options of {@link compileSearch}: the oracle's, and the number of Grover iterations. */
export interface SearchOptions extends Omit<OracleOptions, "kind"> {
  /** Grover iterations K. */
  readonly iterations: number;
  /** Measure the search register at the end (default true). */
  readonly measure?: boolean;
}

/**
 * Compiles the complete search circuit: H on the search register, K iterations of oracle and
 * diffusion (sharing work qubits), measurement of the search register into bits 0..n-1. The
 * search register is the oracle's: with `register: "free"`, bit i is variable
 * `registerOf(cnf, options).register[i]` and {@link completeModel} completes a measured value.
 *
 * @example
 * ```ts
 * const c = compileSearch(cnf, { iterations: planSearch(cnf.variables, 1).iterations });
 * ```
 */
export function compileSearch(cnf: Cnf, options: SearchOptions): Circuit {
  const o = { ...DEFAULT_ORACLE_OPTIONS, ...options };
  const plan: OraclePlan = planOracle(cnf, o.register, o.structure);
  const logical = searchAround(synthesizePlan(plan, "phase", o.strategy), plan.register.length, options.iterations, options.measure ?? true);
  return finish(logical, o.basis, o.uncompute, o.optimize, o.validatePasses);
}
