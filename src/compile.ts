/**
 * The pipeline driver: formula -> oracle plan (search register, structure; synth/plan.ts) ->
 * construction (named, or chosen within a qubit budget) -> logical oracle (synthesis) -> gate
 * basis (lowering) -> work-qubit reuse -> optimizer passes. Costs live in cost/.
 */
import { clauseCount, type Cnf } from "./cnf/cnf.js";
import { recycleCircuit, type Circuit } from "./ir/circuit.js";
import { lower, type Basis, type Uncompute } from "./passes/lower.js";
import { DEFAULT_PIPELINE } from "./passes/registry.js";
import { reuseWork } from "./passes/reuseWork.js";
import { runPasses } from "./passes/runner.js";
import { diffusionCircuit, searchAround } from "./synth/search.js";
import { completeAssignment, type Completion } from "./structure/completion.js";
import {
  constructionName, parseConstruction, planOracle, synthesizePlanned, type Construction, type OracleKind, type OraclePlan, type RegisterMode,
  type SimplifiedCnf, type SimplifyReport, type Strategy, type StructureSummary,
} from "./synth/index.js";
import { chooseAmong, costConstructions, countConstructionOracle, type Prefer } from "./cost/front.js";

/** "1 qubit", "5 qubits": a budget in a message. */
const qubitCount = (n: number): string => `${n} qubit${n === 1 ? "" : "s"}`;

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
  /**
   * A construction by name, parameters included: `wide`, `lean`, `blocks-6` (one level of blocks
   * of 6 clauses), `blocks-4x3` (two levels), `blocks-4-held-30` (30 clauses held as in wide, the
   * rest in blocks of 4), `fanout-1` (wide with a CNOT copy per reading of a variable: logarithmic
   * T-depth), `blocks-6-fanout-1`. Overrides `strategy`; a cost front names its points so. With
   * recovered structure the blocks hold the structure's checks (checked definitions, parities,
   * groups, remaining clauses) instead of clauses, the computed definitions of a free register
   * around them.
   */
  readonly construction?: string;
  /**
   * A qubit budget (search, target and work qubits together): without `construction` or
   * `strategy`, the cheapest construction (by `prefer`) within it is built; with one, it is
   * checked against the budget.
   */
  readonly maxQubits?: number;
  /**
   * What cheapest means when a construction is chosen: `t-count` (default) or `t-depth`; ties go
   * to the other, then to fewer qubits. Given without `maxQubits`, chooses among all candidates.
   */
  readonly prefer?: Prefer;
  /**
   * Told how far compiling has come, as a fraction rising to 1: after planning, synthesis,
   * lowering and each optimizer pass (a million clauses in Clifford+T take a minute or more).
   * For a progress display; nothing else depends on it.
   */
  readonly onProgress?: (fraction: number) => void;
}

/** A compiled oracle. */
export interface Oracle {
  /** The circuit in the chosen basis: search register `vars` (vars[v-1] is variable v), `target`, `work`. */
  readonly circuit: Circuit;
  /** The options it was compiled with, defaults filled in. */
  readonly options: Required<Omit<OracleOptions, "onProgress">>;
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

/**
 * The defaults of {@link OracleOptions}: phase, wide, toffoli, unitary, optimized, full register,
 * structure on, no budget. A compiled oracle's `options.construction` names the construction it
 * was built with.
 */
export const DEFAULT_ORACLE_OPTIONS: Required<Omit<OracleOptions, "onProgress">> = {
  kind: "phase",
  strategy: "wide",
  basis: "toffoli",
  uncompute: "unitary",
  optimize: true,
  validatePasses: false,
  register: "full",
  structure: true,
  construction: "wide",
  maxQubits: Infinity,
  prefer: "t-count",
};

/** How {@link planConstruction} settled the construction. */
export type ConstructionPlan =
  | {
      /** The construction is settled. */
      readonly ok: true;
      /** Construction names to build, best first: the first whose emitted circuit fits the budget is taken. */
      readonly constructions: readonly string[];
    }
  | {
      /** Nothing fits, or a name is unknown. */
      readonly ok: false;
      /** What is wrong, one line. */
      readonly message: string;
      /** With a budget below every candidate: the smallest budget that works. */
      readonly smallestQubits?: number;
    };

/**
 * Settles which construction `options` ask for, without building anything: a named construction
 * or strategy (checked against `maxQubits` when there is one), else, with `maxQubits` or
 * `prefer`, the candidates within the budget, cheapest first. Constructions are those of the
 * oracle plan the register options give (the structure's checks conjoined, when recovery gave
 * some). Returns what is wrong as data (an unknown name, a budget below every construction with
 * the smallest that works).
 *
 * @example
 * ```ts
 * const plan = planConstruction(cnf, { maxQubits: 60, register: "free" });
 * if (!plan.ok) console.error(plan.message);
 * ```
 */
export function planConstruction(cnf: Cnf, options: OracleOptions = {}): ConstructionPlan {
  return planWith(cnf, options, oraclePlanOf(cnf, options));
}

/** The oracle plan (register and structure) the options ask for. */
function oraclePlanOf(cnf: Cnf, options: Pick<OracleOptions, "register" | "structure">): OraclePlan {
  return planOracle(cnf, options.register ?? DEFAULT_ORACLE_OPTIONS.register, options.structure ?? DEFAULT_ORACLE_OPTIONS.structure);
}

/** {@link planConstruction} with the oracle plan at hand. */
function planWith(cnf: Cnf, options: OracleOptions, oraclePlan: OraclePlan): ConstructionPlan {
  const o = { ...DEFAULT_ORACLE_OPTIONS, ...options };
  const Q = options.maxQubits;
  if (Q !== undefined && !(Q === Infinity || (Number.isSafeInteger(Q) && Q >= 0))) return { ok: false, message: `the qubit budget must be a whole number, got ${Q}` };
  if (options.prefer !== undefined && options.prefer !== "t-count" && options.prefer !== "t-depth") return { ok: false, message: `prefer is t-count or t-depth, got ${String(options.prefer)}` };
  let fixed: Construction | undefined;
  if (options.construction !== undefined) {
    const c = parseConstruction(options.construction);
    if (typeof c === "string") return { ok: false, message: c };
    fixed = c;
  } else if (options.strategy !== undefined || (Q === undefined && options.prefer === undefined)) fixed = { family: o.strategy };
  if (fixed !== undefined) {
    if (Q === undefined || Q === Infinity) return { ok: true, constructions: [constructionName(fixed)] };
    const r = countConstructionOracle(oraclePlan, o.kind, fixed, "clifford+t", o.uncompute, o.optimize, false);
    if (r.qubits > Q) return { ok: false, message: `the ${constructionName(fixed)} construction needs ${r.qubits} qubits, more than the budget of ${Q}`, smallestQubits: r.qubits };
    return { ok: true, constructions: [constructionName(fixed)] };
  }
  const costs = costConstructions(cnf, { kind: o.kind, uncompute: o.uncompute, optimize: o.optimize, register: o.register, structure: o.structure });
  const choice = chooseAmong(costs, Q ?? Infinity, o.prefer);
  if (!choice.ok) {
    return { ok: false, message: `no construction fits in ${qubitCount(Q ?? Infinity)}; the smallest (${choice.smallest.construction}) needs ${choice.smallestQubits}`, smallestQubits: choice.smallestQubits };
  }
  return { ok: true, constructions: choice.ranked.map((c) => c.construction) };
}

/** Lowers and optimizes a logical circuit (cost/built.ts repeats these steps; a test holds them equal). */
function finish(logical: Circuit, basis: Basis, uncompute: Uncompute, optimize: boolean, validate: boolean, onProgress?: (fraction: number) => void): Circuit {
  // Reuse work qubits first: a wire that one AND releases and the next takes up then shows the
  // optimizer the gate pairs at the seam (H H, T Tdg) that cancel.
  onProgress?.(PROGRESS_SYNTHESIZED);
  const lowered = lower(logical, { basis, uncompute });
  onProgress?.(PROGRESS_LOWERED);
  let c = reuseWork(lowered);
  if (c !== lowered) recycleCircuit(lowered);
  onProgress?.(PROGRESS_REUSED);
  if (optimize) {
    const input = c;
    const passes = onProgress && ((done: number, total: number): void => onProgress(PROGRESS_REUSED + ((1 - PROGRESS_REUSED) * done) / total));
    c = runPasses(c, DEFAULT_PIPELINE, { validate, recycle: true, ...(passes ? { onProgress: passes } : {}) });
    if (c !== input) recycleCircuit(input);
  }
  onProgress?.(1);
  return c;
}

/** Where compiling stands after planning, synthesis, lowering and work-qubit reuse (the passes take the rest; rough shares of a Clifford+T compile). */
const PROGRESS_PLANNED = 0.1;
const PROGRESS_SYNTHESIZED = 0.25;
const PROGRESS_LOWERED = 0.45;
const PROGRESS_REUSED = 0.55;

/**
 * Compiles a formula into an oracle circuit: the oracle plan first (which variables the search
 * register holds, and the structure recovered), then the construction (named, or the cheapest
 * within `maxQubits` by `prefer`) over that plan. With `maxQubits`, the circuit has at most that
 * many qubits: throws RangeError when no construction fits (or a named one does not, or a name
 * is unknown); {@link planConstruction} says so as data first.
 *
 * @example
 * ```ts
 * const oracle = compileOracle(cnfFromClauses(2, [[1, -2]]), { basis: "clifford+t", uncompute: "measured" });
 * const small = compileOracle(cnf, { maxQubits: 60, uncompute: "measured", register: "free" });
 * small.options.construction; // e.g. "blocks-6"
 * ```
 */
export function compileOracle(cnf: Cnf, options: OracleOptions = {}): Oracle {
  const oraclePlan = oraclePlanOf(cnf, options);
  options.onProgress?.(PROGRESS_PLANNED);
  const plan = planWith(cnf, options, oraclePlan);
  if (!plan.ok) throw new RangeError(plan.message);
  const oracle = compilePlanned(cnf, options, plan, oraclePlan);
  if (oracle === null) throw new RangeError(`no construction's ${options.basis ?? DEFAULT_ORACLE_OPTIONS.basis} circuit fits in ${qubitCount(options.maxQubits ?? Infinity)}`);
  return oracle;
}

/**
 * Compiles the first construction of a plan whose emitted circuit fits the budget (null: none
 * does; the plan's figures are those of the Clifford+T circuit, which another basis may exceed).
 */
export function compilePlanned(cnf: Cnf, options: OracleOptions, plan: ConstructionPlan & { ok: true }, oraclePlan: OraclePlan = oraclePlanOf(cnf, options)): Oracle | null {
  // The options the oracle records: what was built, not who watched.
  const { onProgress: _watcher, ...o } = { ...DEFAULT_ORACLE_OPTIONS, ...options };
  const Q = options.maxQubits ?? Infinity;
  for (const name of plan.constructions) {
    const c = parseConstruction(name) as Construction;
    const logical = synthesizePlanned(oraclePlan, o.kind, c);
    const circuit = finish(logical, o.basis, o.uncompute, o.optimize, o.validatePasses, options.onProgress);
    if (circuit.qubits > Q) continue;
    return {
      circuit, options: { ...o, construction: constructionName(c) }, variables: cnf.variables, clauses: clauseCount(cnf), simplification: summary(oraclePlan.clauses),
      register: oraclePlan.register, completion: oraclePlan.completion, structure: oraclePlan.summary,
    };
  }
  return null;
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
 * With `maxQubits`, the whole circuit (oracle and diffusion taking turns on the work qubits) fits.
 *
 * @example
 * ```ts
 * const c = compileSearch(cnf, { iterations: planSearch(cnf.variables, 1).iterations });
 * ```
 */
export function compileSearch(cnf: Cnf, options: SearchOptions): Circuit {
  const r = searchConstruction(cnf, options);
  if (!r.ok) throw new RangeError(r.message);
  return r.circuit;
}

/**
 * The construction of a compiled search: as {@link compileSearch} chooses it (the first of the
 * plan whose search circuit fits), over the oracle plan the register options give; the diffusion
 * acts on that plan's register.
 */
export function searchConstruction(cnf: Cnf, options: SearchOptions): { ok: true; construction: string; circuit: Circuit } | { ok: false; message: string; smallestQubits?: number } {
  const o = { ...DEFAULT_ORACLE_OPTIONS, ...options, kind: "phase" as const };
  const oraclePlan = oraclePlanOf(cnf, o);
  const n = oraclePlan.register.length;
  const plan = planWith(cnf, { ...options, kind: "phase" }, oraclePlan);
  const Q = options.maxQubits ?? Infinity;
  // Oracle and diffusion take turns on the work wires: the search needs the larger of the two.
  const withDiffusion = (q: number): number => Math.max(q, diffusionOnly(n, o.basis, o.uncompute));
  if (!plan.ok) {
    if (plan.smallestQubits === undefined) return plan;
    const s = withDiffusion(plan.smallestQubits);
    return { ok: false, message: `no search circuit fits in ${qubitCount(Q)}; the smallest needs ${s} (the oracle's and the diffusion's work qubits included)`, smallestQubits: s };
  }
  let smallest = Infinity;
  for (const name of plan.constructions) {
    const c = parseConstruction(name) as Construction;
    const logical = searchAround(synthesizePlanned(oraclePlan, "phase", c), n, options.iterations, options.measure ?? true);
    const circuit = finish(logical, o.basis, o.uncompute, o.optimize, o.validatePasses, options.onProgress);
    if (circuit.qubits <= Q) return { ok: true, construction: constructionName(c), circuit };
    smallest = Math.min(smallest, circuit.qubits);
  }
  const s = withDiffusion(smallest);
  return { ok: false, message: `no search circuit fits in ${qubitCount(Q)}; the smallest needs ${s} (the oracle's and the diffusion's work qubits included)`, smallestQubits: s };
}

/** Qubits of the diffusion alone over n search qubits (its multi-controlled Z's tree). */
function diffusionOnly(n: number, basis: Basis, uncompute: Uncompute): number {
  return finish(diffusionCircuit(n), basis, uncompute, false, false).qubits;
}
