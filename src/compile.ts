/**
 * The pipeline driver: formula -> simplified clauses -> logical oracle (synthesis) -> gate basis
 * (lowering) -> optimizer passes -> work-qubit reuse. Also the costs of an oracle, which are
 * always those of its Clifford+T and Toffoli lowerings, whatever basis is emitted.
 */
import { clauseCount, type Cnf } from "./cnf/cnf.js";
import { countCircuit } from "./emit/resources.js";
import { recycleCircuit, type Circuit } from "./ir/circuit.js";
import { lower, type Basis, type Uncompute } from "./passes/lower.js";
import { DEFAULT_PIPELINE } from "./passes/registry.js";
import { reuseWork } from "./passes/reuseWork.js";
import { runPasses } from "./passes/runner.js";
import { diffusionCircuit, searchCircuit } from "./search/build.js";
import { simplify, synthesize, type AnyStrategy, type OracleKind, type SimplifiedCnf, type SimplifyReport, type Strategy } from "./synth/index.js";

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
}

/** The defaults of {@link OracleOptions}: phase, wide, toffoli, unitary, optimized. */
export const DEFAULT_ORACLE_OPTIONS: Required<OracleOptions> = {
  kind: "phase",
  strategy: "wide",
  basis: "toffoli",
  uncompute: "unitary",
  optimize: true,
  validatePasses: false,
};

/** Lowers and optimizes a logical circuit. */
function finish(logical: Circuit, basis: Basis, uncompute: Uncompute, optimize: boolean, validate: boolean, toffoliAnds = false): Circuit {
  // Reuse work qubits first: a wire that one AND releases and the next takes up then shows the
  // optimizer the gate pairs at the seam (H H, T Tdg) that cancel.
  const lowered = lower(logical, { basis, uncompute, ...(toffoliAnds ? { andGate: "toffoli" as const } : {}) });
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
  const simplified = simplify(cnf);
  const logical = synthesize(simplified, o.kind, o.strategy);
  const circuit = finish(logical, o.basis, o.uncompute, o.optimize, o.validatePasses);
  return { circuit, options: o, variables: cnf.variables, clauses: clauseCount(cnf), simplification: summary(simplified) };
}

function summary(s: SimplifiedCnf): Oracle["simplification"] {
  return { ...s.report, clausesKept: s.clauseStart.length - 1, literalsKept: s.lits.length };
}

/** The resource report of an oracle (stable keys, for `--report`). */
export interface ResourceReport {
  /** Declared variables. */
  readonly variables: number;
  /** Clauses in the input. */
  readonly clauses: number;
  /** The oracle's kind, strategy, basis and uncomputation. */
  readonly kind: OracleKind;
  /** See {@link OracleOptions.strategy}. */
  readonly strategy: Strategy;
  /** See {@link OracleOptions.basis}. */
  readonly basis: Basis;
  /** See {@link OracleOptions.uncompute}. */
  readonly uncompute: Uncompute;
  /** Qubits by register, and in all. */
  readonly qubits: {
    /** The search register x. */
    readonly search: number;
    /** Work qubits. */
    readonly work: number;
    /** 1 for a flag oracle, else 0. */
    readonly target: number;
    /** All qubits. */
    readonly total: number;
  };
  /** Gates of the emitted circuit by OpenQASM 3 name. */
  readonly gates: Record<string, number>;
  /** Toffolis in the toffoli-basis lowering (with the chosen uncomputation). */
  readonly toffoli_count: number;
  /** T-count, T-depth and CNOT count of the Clifford+T lowering (with the chosen uncomputation). */
  readonly t_count: number;
  /** T-depth of the Clifford+T lowering (ASAP). */
  readonly t_depth: number;
  /** CX plus CZ gates of the Clifford+T lowering. */
  readonly cnot_count: number;
  /** Depth of the emitted circuit. */
  readonly depth: number;
  /** Measurements in the emitted circuit. */
  readonly measurements: number;
  /** What simplification removed before synthesis. */
  readonly simplification: Oracle["simplification"];
}

/**
 * Counts an oracle's resources. Recompiles the formula in the clifford+t and toffoli bases for
 * the T and Toffoli figures, so pass the same formula the oracle was compiled from.
 */
export function oracleResources(cnf: Cnf, oracle: Oracle): ResourceReport {
  const o = oracle.options;
  const emitted = countCircuit(oracle.circuit);
  const logical = synthesize(simplify(cnf), o.kind, o.strategy);
  const cliffordT = o.basis === "clifford+t" ? emitted : countCircuit(finish(logical, "clifford+t", o.uncompute, o.optimize, false));
  const toffoli = o.basis === "toffoli" ? emitted : countCircuit(finish(logical, "toffoli", o.uncompute, o.optimize, false));
  const reg = (role: string): number => oracle.circuit.registers.find((r) => r.role === role)?.size ?? 0;
  return {
    variables: oracle.variables,
    clauses: oracle.clauses,
    kind: o.kind,
    strategy: o.strategy,
    basis: o.basis,
    uncompute: o.uncompute,
    qubits: { search: reg("search"), work: reg("work"), target: reg("target"), total: oracle.circuit.qubits },
    gates: emitted.gates,
    toffoli_count: toffoli.toffoliCount,
    t_count: cliffordT.tCount,
    t_depth: cliffordT.tDepth,
    cnot_count: cliffordT.cnotCount,
    depth: emitted.depth,
    measurements: emitted.measurements,
    simplification: oracle.simplification,
  };
}

/** One row of the cost table. */
export interface CostRow {
  /** `wide`, `lean`, or the `textbook` reference. */
  readonly strategy: AnyStrategy;
  /** How temporary ANDs are uncomputed. */
  readonly uncompute: Uncompute;
  /** Qubits of the Clifford+T circuit. */
  readonly qubits: number;
  /** Toffolis of the toffoli-basis circuit. */
  readonly toffoli_count: number;
  /** T gates of the Clifford+T circuit. */
  readonly t_count: number;
  /** T-depth of the Clifford+T circuit. */
  readonly t_depth: number;
  /** CX plus CZ gates of the Clifford+T circuit. */
  readonly cnot_count: number;
  /** Depth of the Clifford+T circuit. */
  readonly depth: number;
}

/**
 * Costs of every strategy and uncomputation for one formula, plus the textbook reference
 * (one clause bit per clause, V-chains of 7-T Toffolis, unitary uncomputation).
 */
export function costTable(cnf: Cnf, kind: OracleKind = "phase"): CostRow[] {
  const simplified = simplify(cnf);
  const row = (strategy: AnyStrategy, uncompute: Uncompute): CostRow => {
    const { qubits, toffoli_count, t_count, t_depth, cnot_count, depth } = partCost(synthesize(simplified, kind, strategy), uncompute, strategy === "textbook");
    return { strategy, uncompute, qubits, toffoli_count, t_count, t_depth, cnot_count, depth };
  };
  const rows: CostRow[] = [];
  for (const s of ["wide", "lean"] as const) for (const u of ["unitary", "measured"] as const) rows.push(row(s, u));
  rows.push(row("textbook", "unitary"));
  return rows;
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
 * diffusion (sharing work qubits), measurement of the search register into bits 0..n-1.
 *
 * @example
 * ```ts
 * const c = compileSearch(cnf, { iterations: planSearch(cnf.variables, 1).iterations });
 * ```
 */
export function compileSearch(cnf: Cnf, options: SearchOptions): Circuit {
  const o = { ...DEFAULT_ORACLE_OPTIONS, ...options };
  const logical = searchCircuit(simplify(cnf), o.strategy, options.iterations, options.measure ?? true);
  return finish(logical, o.basis, o.uncompute, o.optimize, o.validatePasses);
}

/** Costs of one part of a search (Clifford+T counts; Toffolis from the toffoli basis). */
export interface PartCost {
  /** Qubits of the Clifford+T circuit. */
  readonly qubits: number;
  /** T gates. */
  readonly t_count: number;
  /** T-depth. */
  readonly t_depth: number;
  /** CX plus CZ gates. */
  readonly cnot_count: number;
  /** Depth. */
  readonly depth: number;
  /** Toffolis in the toffoli basis. */
  readonly toffoli_count: number;
}

/** Clifford+T and toffoli-basis counts of a logical circuit (textbook: ANDs as 7-T Toffolis). */
function partCost(logical: Circuit, uncompute: Uncompute, toffoliAnds = false): PartCost {
  const ctCircuit = finish(logical, "clifford+t", uncompute, true, false, toffoliAnds);
  const ct = countCircuit(ctCircuit);
  const tof = countCircuit(finish(logical, "toffoli", uncompute, true, false, toffoliAnds));
  return { qubits: ctCircuit.qubits, t_count: ct.tCount, t_depth: ct.tDepth, cnot_count: ct.cnotCount, depth: ct.depth, toffoli_count: tof.toffoliCount };
}

/** Costs of a whole search with one strategy and uncomputation. */
export interface SearchCost {
  /** The oracle's strategy. */
  readonly strategy: Strategy;
  /** How temporary ANDs are uncomputed. */
  readonly uncompute: Uncompute;
  /** Grover iterations per run. */
  readonly iterations: number;
  /** One oracle. */
  readonly oracle: PartCost;
  /** One diffusion. */
  readonly diffusion: PartCost;
  /** The whole circuit of one run (K iterations and the measurements). */
  readonly circuit: PartCost;
  /** Runs expected until success (1 / P). */
  readonly expected_runs: number;
  /** T gates over the expected number of runs. */
  readonly expected_t_count: number;
  /** Toffolis over the expected number of runs. */
  readonly expected_toffoli_count: number;
  /** Circuit depth over the expected number of runs (run one after another). */
  readonly expected_depth: number;
}

/** What a whole search costs, per strategy and uncomputation. */
export function searchCosts(cnf: Cnf, iterations: number, successProbability: number, uncompute: Uncompute): SearchCost[] {
  const simplified = simplify(cnf);
  const runs = successProbability > 0 ? 1 / successProbability : Infinity;
  return (["wide", "lean"] as const).map((strategy) => {
    const oracle = partCost(synthesize(simplified, "phase", strategy), uncompute);
    const diff = partCost(diffusionCircuit(cnf.variables), uncompute);
    const whole = partCost(searchCircuit(simplified, strategy, iterations), uncompute);
    return {
      strategy, uncompute, iterations, oracle, diffusion: diff, circuit: whole, expected_runs: runs,
      expected_t_count: whole.t_count * runs, expected_toffoli_count: whole.toffoli_count * runs, expected_depth: whole.depth * runs,
    };
  });
}
