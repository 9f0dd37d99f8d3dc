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
import { searchCircuit } from "./search/build.js";
import { simplify, synthesize, type OracleKind, type SimplifiedCnf, type SimplifyReport, type Strategy } from "./synth/index.js";

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
  const simplified = simplify(cnf);
  const logical = synthesize(simplified, o.kind, o.strategy);
  const circuit = finish(logical, o.basis, o.uncompute, o.optimize, o.validatePasses);
  return { circuit, options: o, variables: cnf.variables, clauses: clauseCount(cnf), simplification: summary(simplified) };
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
