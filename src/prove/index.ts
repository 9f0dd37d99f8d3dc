/**
 * Proof that a circuit is the oracle of a formula, for every input at once (any size).
 *
 * 1. The circuit runs symbolically (symbolic.ts): every wire becomes a Boolean function of the
 *    inputs in a hashed AND/XOR graph (graph.ts), the phase a polynomial over Z8, Hadamards path
 *    sums that the Clifford+T gadgets close again. This covers the classical bases (mcx,
 *    toffoli; measured uncomputation by its unitary meaning) and Clifford+T translation
 *    validation alike.
 * 2. The miter (miter.ts) is one literal: some input on which the circuit is not the oracle.
 *    Built in the same graph as the formula, it is usually the constant false outright
 *    ("structural" proof, no solver).
 * 3. Otherwise its cone is Tseitin-encoded (tseitin.ts) and given to the CDCL solver
 *    (cnf/solve.ts): unsatisfiable is a proof ("sat" method); a model is a counterexample, which
 *    is returned only after simulating the circuit on that one input confirms it (confirm.ts).
 */
import type { Cnf } from "../cnf/cnf.js";
import { CdclSolver } from "../cnf/solve.js";
import type { Circuit } from "../ir/circuit.js";
import { failureOn, type OracleLayout } from "./confirm.js";
import { FALSE, OUTCOME, TARGET, TRUE, VAR } from "./graph.js";
import { cutBddProof } from "./bdd.js";
import { buildMiter, formulaLiteral } from "./miter.js";
import { SymbolicRun } from "./symbolic.js";
import { coneSize, encodeCone } from "./tseitin.js";

/** Options of {@link proveOracle}. */
export interface ProveOptions {
  /**
   * The oracle's kind: `phase` (|x> -> (-1)^f(x) |x>) or `flag` (|x>|b> -> |x>|b xor f(x)>).
   * Default: `flag` when the circuit has a target register, else `phase`.
   */
  readonly kind?: "phase" | "flag";
  /** Conflicts the SAT solver may spend before the answer is "unknown" (default 2,000,000). */
  readonly conflictLimit?: number;
  /** Nodes the BDD over the clause cut points may make before it gives way to the solver (default 10,000,000). */
  readonly bddNodeLimit?: number;
  /** Largest miter (Tseitin clauses) given to the SAT solver (default 5,000,000). */
  readonly satClauseLimit?: number;
}

/** How a proof (or refutation) was reached. */
export type ProofMethod = "structural" | "bdd" | "sat" | "none";

/** The result of {@link proveOracle}. */
export interface OracleProof {
  /**
   * `proved`: the circuit is the oracle for every input; `refuted`: it is not, and
   * `counterexample` shows an input where it fails (confirmed by simulation); `unknown`: neither
   * (a gate pattern the prover does not reduce, or the solver's budget ran out): fall back to
   * simulation.
   */
  readonly status: "proved" | "refuted" | "unknown";
  /** `status === "proved"`. */
  readonly proved: boolean;
  /**
   * `structural`: the miter was the constant false (or true) after hashing and constant
   * propagation, no solver call; `bdd`: its BDD over the clause cut points is false (see
   * bdd.ts); `sat`: the SAT solver decided it; `none`: not decided.
   */
  readonly method: ProofMethod;
  /** Size of the CNF given to the solver (0 and 0 when no solver call was needed). */
  readonly miter: {
    /** CNF variables. */
    readonly variables: number;
    /** CNF clauses. */
    readonly clauses: number;
  };
  /** Wall time of the whole proof, in seconds. */
  readonly seconds: number;
  /** Values of variables 1..n on which the circuit fails (status `refuted`). */
  readonly counterexample?: boolean[];
  /** With the counterexample: the target's initial value (flag oracles). */
  readonly targetValue?: boolean;
  /** With the counterexample: the outcomes of the circuit's measurements and resets, in order. */
  readonly outcomes?: boolean[];
  /** What was shown, what goes wrong on the counterexample, or why it is unknown. */
  readonly message: string;
  /** Nodes of the hashed graph (a measure of the symbolic simulation's size). */
  readonly graphNodes: number;
}

/**
 * Proves that `circuit` is the phase or flag oracle of `cnf` for every assignment: the right
 * phase or target flip, the search register unchanged, every work qubit back at 0, for every
 * measurement outcome. Works on the mcx and toffoli bases (measured uncomputation included) and
 * on Clifford+T circuits whose Hadamards close as the lowering's gadgets do (see the module
 * comment); anything else gives `unknown`, never a wrong answer.
 *
 * @example
 * ```ts
 * const cnf = cnfFromClauses(3, [[1, -2], [2, 3]]);
 * const proof = proveOracle(cnf, compileOracle(cnf, { basis: "toffoli" }).circuit);
 * proof.proved; // true
 * proof.method; // "structural"
 * ```
 */
export function proveOracle(cnf: Cnf, circuit: Circuit, options: ProveOptions = {}): OracleProof {
  const t0 = performance.now();
  const seconds = (): number => (performance.now() - t0) / 1000;
  const search = circuit.registers.find((r) => r.role === "search");
  const targetReg = circuit.registers.find((r) => r.role === "target");
  const kind = options.kind ?? (targetReg !== undefined && targetReg.size > 0 ? "flag" : "phase");
  const none = (message: string, graphNodes = 0): OracleProof => ({
    status: "unknown", proved: false, method: "none", miter: { variables: 0, clauses: 0 }, seconds: seconds(), message, graphNodes,
  });
  if (search === undefined || search.start !== 0 || search.size !== cnf.variables) {
    return none(`the search register has ${search?.size ?? 0} qubits, the formula ${cnf.variables} variables`);
  }
  if (kind === "flag" && (targetReg === undefined || targetReg.size !== 1)) return none("a flag oracle needs a target register of one qubit");
  const target = kind === "flag" ? targetReg!.start : -1;
  const work = Math.max(search.size, targetReg !== undefined ? targetReg.start + targetReg.size : 0);
  const layout: OracleLayout = { kind, search: search.size, target, work };

  const run = new SymbolicRun(circuit, search.size, target);
  // The formula's clause nodes first, as cut points: the circuit's ANDs then reuse them.
  const clauseNodes: number[] = [];
  const f = formulaLiteral(run.g, cnf, run.vars, clauseNodes);
  run.g.setCuts(clauseNodes);
  const stuck = run.run();
  if (stuck !== null) return none(`not proven: gate ${stuck.gate} is ${stuck.reason}`, run.g.size);
  if (run.openPaths()) return none("not proven: the Clifford+T circuit does not reduce to a classical one (a Hadamard's path variable is never summed out)", run.g.size);
  const state = run.state();
  const root = buildMiter(state, f, kind, target, work);
  const g = state.graph;

  // A counterexample from values of the graph's inputs, confirmed by simulation.
  const refute = (value: (node: number) => boolean, method: ProofMethod, miter: OracleProof["miter"]): OracleProof => {
    const lit = (l: number): boolean => (l <= 1 ? l === TRUE : value(l >>> 1) !== ((l & 1) === 1));
    const assignment = Array.from(state.vars, (v) => lit(v));
    const targetValue = state.target >= 0 ? lit(state.target) : false;
    const outcomes = state.events.map((e) => lit(e.literal));
    const xOutcomes = state.events.filter((e) => e.xBasis).map((e) => lit(e.literal));
    const failure = failureOn(circuit, cnf, layout, { assignment, target: targetValue, xOutcomes, allOutcomes: outcomes });
    if (failure === null) {
      return { ...none("not proven: the prover's counterexample does not fail in simulation (a prover bug: please report it)", g.size), seconds: seconds() };
    }
    return {
      status: "refuted", proved: false, method, miter, seconds: seconds(), counterexample: assignment,
      ...(target >= 0 ? { targetValue } : {}), ...(outcomes.length > 0 ? { outcomes } : {}), message: failure, graphNodes: g.size,
    };
  };

  if (root === FALSE) {
    return { status: "proved", proved: true, method: "structural", miter: { variables: 0, clauses: 0 }, seconds: seconds(), message: "proved: the miter is the constant false after structural hashing", graphNodes: g.size };
  }
  if (root === TRUE) return refute(() => false, "structural", { variables: 0, clauses: 0 });

  const miter = coneSize(g, root);
  const cut = cutBddProof(g, root, clauseNodes, options.bddNodeLimit ?? 10_000_000);
  if (cut.proved) {
    return { status: "proved", proved: true, method: "bdd", miter, seconds: seconds(), message: `proved: the miter is false over the clause cut points (${cut.variables} BDD variables, ${cut.nodes} nodes)`, graphNodes: g.size };
  }
  if (miter.clauses > (options.satClauseLimit ?? 5_000_000)) {
    return { ...none(`not proven: the miter has ${miter.clauses} clauses, more than the solver is given${cut.exhausted ? ", and its BDD over the clause cut points outgrew its budget" : ""}`, g.size), miter };
  }
  const enc = encodeCone(g, root);
  const solver = new CdclSolver(enc.cnf.variables);
  solver.addCnf(enc.cnf);
  const status = solver.solve(options.conflictLimit ?? 2_000_000);
  if (status === "unsat") {
    return { status: "proved", proved: true, method: "sat", miter, seconds: seconds(), message: `proved: the miter is unsatisfiable (${solver.conflicts} conflicts)`, graphNodes: g.size };
  }
  if (status === "unknown") return { ...none(`not proven: the solver ran out of its budget of conflicts (${solver.conflicts})`, g.size), miter };
  const model = solver.model();
  const values = new Map<number, boolean>();
  for (let i = 0; i < enc.inputNodes.length; i++) values.set(enc.inputNodes[i]!, model[enc.inputVars[i]! - 1] === 1);
  return refute((node) => {
    const r = g.role(node);
    return (r === VAR || r === TARGET || r === OUTCOME) && values.get(node) === true;
  }, "sat", miter);
}
