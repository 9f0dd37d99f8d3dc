/**
 * Proof that a circuit is the oracle of a formula, for every input at once (any size).
 *
 * 1. The circuit runs symbolically (symbolic.ts): every wire becomes a Boolean function of the
 *    inputs in a hashed AND/XOR graph (graph.ts), the phase a polynomial over Z8. The classical
 *    bases (mcx, toffoli; measured uncomputation read by its unitary meaning: the X-basis
 *    outcome is a free input and the fix-up must cancel its phase) need nothing else.
 *    Clifford+T circuits are validated at the gate level: each Hadamard opens a path variable
 *    (sum over paths, Amy 2018) and each gadget of the lowering (7-T Toffoli, Amy, Maslov, Mosca
 *    & Roetteler 2013; 4-T temporary AND and its measured uncomputation, Gidney 2018) closes it
 *    again into the classical gate it stands for; a circuit whose Hadamards do not close so is
 *    "not proven" (the caller falls back to simulation), never wrongly proven.
 * 2. The miter (miter.ts) is one literal: true on exactly the inputs (assignment, target value,
 *    measurement outcomes) where the circuit is not the oracle. Built in the same hashed graph as
 *    the formula, it is usually the constant false outright ("structural" proof, no solver).
 * 3. Otherwise: a short SAT attempt for a counterexample, a BDD over the formula's clause nodes
 *    (bdd.ts; counters of violated clauses need it), then the SAT solver on the Tseitin encoding
 *    of the miter's cone (tseitin.ts): unsatisfiable is a proof. A model is a counterexample,
 *    returned only after simulating the circuit on that one input confirms it (confirm.ts).
 *
 * The solver is the project's own CDCL solver (cnf/solve.ts), chosen by measurement over the npm
 * packages logic-solver and z3-solver (DEVELOPERS.md, "The prover").
 *
 * The expected function is the formula by default; `expected` replaces it by any function given
 * as a graph (the hook for oracles whose search register is a subset of the variables).
 */
import type { Cnf } from "../cnf/cnf.js";
import { evaluate } from "../cnf/evaluate.js";
import { CdclSolver } from "../cnf/solve.js";
import type { Circuit } from "../ir/circuit.js";
import { K } from "../ir/kinds.js";
import { compileBitProgram } from "../sim/bitsim.js";
import { failureOn, type OracleLayout } from "./confirm.js";
import { FALSE, OUTCOME, TARGET, TRUE, VAR, type Graph } from "./graph.js";
import { cutBddProof } from "./bdd.js";
import { cancelPairs } from "./cancel.js";
import { falsify, falsifyBySimulation, type FalsifyingInput, type SimulatedFailure } from "./falsify.js";
import { buildMiter, formulaLiteral } from "./miter.js";
import { REDUCTIONS, SymbolicRun, type Unsupported } from "./symbolic.js";
import { coneSize, encodeCone } from "./tseitin.js";

/** Builds Boolean functions in the prover's hashed graph (literals: `(node << 1) | complemented`). */
export interface FunctionBuilder {
  /** The constant false literal (0). */
  readonly FALSE: number;
  /** The constant true literal (1). */
  readonly TRUE: number;
  /** The AND of literals (true for none). */
  and(lits: ArrayLike<number>): number;
  /** The OR of literals (false for none). */
  or(lits: ArrayLike<number>): number;
  /** The XOR of two literals. */
  xor(a: number, b: number): number;
  /** The complement of a literal. */
  not(lit: number): number;
}

/**
 * The function an oracle must mark, in place of the formula: the hook for oracles whose search
 * register holds only some of the formula's variables (the others computed in work qubits), for
 * example "some model of the formula extends the register's value" given as a circuit of AND, OR
 * and XOR over the register bits.
 */
export interface ExpectedFunction {
  /** Size of the search register (the function's inputs). */
  readonly inputs: number;
  /**
   * Returns the function's literal, built over `inputs` (one literal per search qubit) with `b`.
   * `cuts` may receive nodes (literal >>> 1) worth treating as free variables in the BDD step
   * (sub-functions the circuit also computes, like the formula's clauses); optional.
   */
  build(b: FunctionBuilder, inputs: Int32Array, cuts: number[]): number;
  /** The function's value on one register value (for the simulation that confirms a counterexample). */
  evaluate(inputs: readonly boolean[]): boolean;
}

/** Options of {@link proveOracle}. */
export interface ProveOptions {
  /**
   * The oracle's kind: `phase` (|x> -> (-1)^f(x) |x>) or `flag` (|x>|b> -> |x>|b xor f(x)>).
   * Default: `flag` when the circuit has a target register, else `phase`.
   */
  readonly kind?: "phase" | "flag";
  /** Conflicts the SAT solver may spend on the miter before the answer is "unknown" (default 1,000,000). */
  readonly conflictLimit?: number;
  /**
   * Seconds the SAT solver may spend on the miter, looked at every 256 conflicts (default
   * 20): a miter the solver finds hard (the lean counter's, on SATLIB ais6, takes some 4,000
   * conflicts a second) would otherwise hold the caller for minutes before the answer "unknown".
   * Whichever of this and conflictLimit runs out first ends the attempt; with a time budget, a
   * proof near it may end "proved" on a fast machine and "unknown" on a slow one (Infinity: none).
   */
  readonly solverSeconds?: number;
  /** Nodes the BDD over the clause nodes may make before it gives way to the solver (default 4,000,000). */
  readonly bddNodeLimit?: number;
  /** Largest miter (Tseitin clauses) given to the SAT solver (default 5,000,000). */
  readonly satClauseLimit?: number;
  /** The function to mark instead of the formula (see {@link ExpectedFunction}). */
  readonly expected?: ExpectedFunction;
}

/**
 * How a proof (or refutation) was reached. `simulation`: a refutation found by evaluating the
 * miter on chosen inputs (models, their neighbours, clause-violating and random assignments)
 * before any solver ran.
 */
export type ProofMethod = "structural" | "simulation" | "bdd" | "sat" | "none";

/** An input on which the circuit is not the oracle, confirmed by simulating the circuit there. */
export interface ProofCounterexample {
  /** Values of variables 1..n. */
  readonly assignment: boolean[];
  /** The assignment as a DIMACS line of literals, e.g. `-1 2 -3 0`. */
  readonly dimacs: string;
  /** The target's value before the circuit (flag oracles), else undefined. */
  readonly target?: boolean;
  /** Outcomes of the circuit's measurements, in order (X-basis ones first drawn by the prover). */
  readonly outcomes: boolean[];
  /** What the oracle should do there. */
  readonly expected: string;
  /** What the circuit does there, by simulation. */
  readonly actual: string;
}

/** The result of {@link proveOracle}. */
export interface OracleProof {
  /**
   * `proved`: the circuit is the oracle for every input; `refuted`: it is not, and
   * `counterexample` shows an input where it fails (confirmed by simulation); `unknown`: neither
   * (a gate pattern the prover does not reduce, or a budget ran out): fall back to simulation.
   */
  readonly status: "proved" | "refuted" | "unknown";
  /** `status === "proved"`. */
  readonly proved: boolean;
  /**
   * `structural`: the miter is the constant false (or true) after hashing and constant
   * propagation, no solver call; `bdd`: its BDD over the clause nodes is false; `sat`: the SAT
   * solver decided it; `none`: not decided.
   */
  readonly method: ProofMethod;
  /** Size of the miter's CNF (Tseitin encoding of its cone); 0 and 0 when it is a constant. */
  readonly miter: {
    /** CNF variables. */
    readonly variables: number;
    /** CNF clauses. */
    readonly clauses: number;
  };
  /** Wall time of the whole proof, in seconds. */
  readonly seconds: number;
  /** With status `refuted`: where the circuit fails. */
  readonly counterexample?: ProofCounterexample;
  /** What was shown, or why it is unknown. */
  readonly message: string;
  /** Nodes of the hashed graph (the size of the symbolic simulation). */
  readonly graphNodes: number;
}

const dimacsOf = (a: readonly boolean[]): string => `${a.map((on, v) => (on ? v + 1 : -(v + 1))).join(" ")}${a.length ? " " : ""}0`;

/**
 * Before reduction QUICK_AFTER (the first closes the lowering's gadgets, with `regroup` at the
 * seams too; the later ones are for rarer seams and cost far more when they fail), or after one
 * that ran out of its work budget, a simulation of the first reduction's focus inputs and of
 * QUICK_INPUTS of the falsifier's inputs, at most QUICK_SECONDS: a dropped CNOT in a wide
 * Clifford+T oracle at 60 variables made the third reduction run 180 s before it gave up, one in
 * a lean oracle at 100 the second 77 s, and a duplicated one in blocks-6 at 60 the second 200 s.
 */
const QUICK_AFTER = 1;
const QUICK_INPUTS = 32;
const QUICK_SECONDS = 5;

/** Conflicts of the first, short SAT attempt (counterexamples are usually found at once). */
const QUICK_CONFLICTS = 3_000;
/** See ProveOptions.solverSeconds (common practice: a budget a user waits for at a terminal). */
export const DEFAULT_SOLVER_SECONDS = 20;

/**
 * Proves that `circuit` is the phase or flag oracle of `cnf` for every assignment: the right
 * phase or target flip, the search register unchanged, every work qubit back at 0, for every
 * measurement outcome, with no other phase. Works on any circuit of the IR whose measurements
 * are X-basis erasures or of settled values; Clifford+T circuits must reduce as the lowering's
 * gadgets do (see the module comment); anything else gives `unknown`, never a wrong answer.
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
  const inputs = options.expected?.inputs ?? cnf.variables;
  const none = (message: string, graphNodes = 0, miter = { variables: 0, clauses: 0 }): OracleProof => ({
    status: "unknown", proved: false, method: "none", miter, seconds: seconds(), message, graphNodes,
  });
  if (search === undefined || search.start !== 0 || search.size !== inputs) {
    return none(`the search register has ${search?.size ?? 0} qubits, the function ${inputs} inputs`);
  }
  if (kind === "flag" && (targetReg === undefined || targetReg.size !== 1)) return none("a flag oracle needs a target register of one qubit");
  const target = kind === "flag" ? targetReg!.start : -1;
  const work = Math.max(search.size, targetReg !== undefined ? targetReg.start + targetReg.size : 0);
  const layout: OracleLayout = { kind, search: search.size, target, work };

  const valueOf = options.expected === undefined ? (a: readonly boolean[]) => evaluate(cnf, a) : (a: readonly boolean[]) => options.expected!.evaluate(a);
  const refuted = (method: ProofMethod, miter: OracleProof["miter"], graphNodes: number, assignment: boolean[], targetValue: boolean, outcomes: boolean[], fx: boolean, failure: string): OracleProof => {
    const expected = kind === "phase"
      ? `phase ${fx ? "-1" : "+1"} (the formula is ${fx ? "" : "not "}satisfied), every work qubit back to |0>`
      : `target flipped ${fx ? "" : "not "}(the formula is ${fx ? "" : "not "}satisfied), every work qubit back to |0>`;
    return {
      status: "refuted", proved: false, method, miter, seconds: seconds(), message: `refuted: ${failure}`, graphNodes,
      counterexample: {
        assignment, dimacs: dimacsOf(assignment), ...(target >= 0 ? { target: targetValue } : {}), outcomes, expected, actual: failure,
      },
    };
  };
  /**
   * A circuit the symbolic run cannot reduce: no proof, but simulation on the falsifier's
   * chosen inputs (first the `focus` ones) may still show it wrong (falsify.ts).
   */
  const unreduced = (message: string, graphNodes: number, focus: readonly FalsifyingInput[] = []): OracleProof => {
    // As long as the reductions took (at least 10 s), up to 128 inputs: a wrong gadget may fail on one input in ten.
    const budget = Math.max(UNREDUCED_SECONDS, seconds() * UNREDUCED_SHARE);
    const hit = falsifyBySimulation(circuit, inputs, options.expected === undefined ? cnf : null, valueOf, layout, UNREDUCED_INPUTS, budget, focus);
    if (hit === null) return none(message, graphNodes);
    return refuted("simulation", { variables: 0, clauses: 0 }, graphNodes, hit.assignment, hit.target, hit.outcomes, hit.f, hit.failure);
  };

  // The path-sum reductions in turn (symbolic.ts, REDUCTIONS): the first whose path variables all
  // close. Each is exact.
  type Attempt = { run: SymbolicRun; f: number; cuts: number[] } | { stuck: Unsupported; run: SymbolicRun } | { open: number } | { hit: SimulatedFailure; size: number };
  let quick = true;
  // Inputs where the first reduction's stuck Hadamard may go wrong: the quick simulation takes
  // them first, the last one goes on where it stopped.
  let stuckFocus: FalsifyingInput[] | null = null;
  const focusProgress = { focusDone: 0 };
  const attempt = (c: Circuit): Attempt => {
    let lastSize = 0;
    let spent = false;
    for (const [i, reduction] of REDUCTIONS.entries()) {
      if ((i >= QUICK_AFTER || spent) && quick) {
        // The later reductions can take minutes where a wrong gadget leaves a path open, and a
        // few simulated inputs usually show such a circuit wrong: those first, briefly.
        quick = false;
        const hit = falsifyBySimulation(circuit, inputs, options.expected === undefined ? cnf : null, valueOf, layout, QUICK_INPUTS, QUICK_SECONDS, stuckFocus ?? [], focusProgress);
        if (hit !== null) return { hit, size: lastSize };
      }
      const run = new SymbolicRun(c, search.size, target, reduction);
      // The expected function's clause nodes first, as cut points: the circuit's ANDs then reuse them.
      const cuts: number[] = [];
      const f = options.expected === undefined ? formulaLiteral(run.g, cnf, run.vars, cuts) : options.expected.build(builderOf(run.g), run.vars, cuts);
      run.g.setCuts(cuts);
      const stuck = run.run();
      if (stuck !== null) return { stuck, run };
      if (stuckFocus === null && run.stuckAt !== null) stuckFocus = focusOnFactors(run, [run.stuckAt.stray, ...run.stuckAt.factors], inputs, options.expected === undefined ? cnf : null);
      lastSize = run.g.size;
      spent ||= run.exhausted;
      if (run.exhausted || run.openPaths()) continue;
      return { run, f, cuts };
    }
    return { open: lastSize };
  };
  let tried = attempt(circuit);
  let origin: Int32Array | null = null;
  if (!("f" in tried) && !("hit" in tried)) {
    // Pairs that cancel may hide what the run reads (cancel.ts); the rewrite is exact. (A
    // simulated failure already found stands: the retry would only spend the later reductions.)
    const simpler = cancelPairs(circuit);
    if (simpler !== null) {
      const again = attempt(simpler.circuit);
      if ("f" in again || "stuck" in again || "hit" in again) {
        tried = again;
        origin = simpler.origin;
      }
    }
  }
  if ("hit" in tried) {
    const { hit } = tried;
    return refuted("simulation", { variables: 0, clauses: 0 }, tried.size, hit.assignment, hit.target, hit.outcomes, hit.f, hit.failure);
  }
  if ("stuck" in tried) {
    const { stuck, run } = tried;
    const gate = origin === null ? stuck.gate : origin[stuck.gate]!;
    return unreduced(`not proven: gate ${gate} is ${stuck.reason}`, run.g.size, focusAt(run, circuit, gate, inputs, options.expected === undefined ? cnf : null));
  }
  if ("open" in tried) {
    return unreduced("not proven: the Clifford+T circuit does not reduce to a classical one (a Hadamard's path variable is never summed out: no gadget of the lowering matches there)", tried.open, (stuckFocus ?? []).slice(focusProgress.focusDone));
  }
  const chosen = tried;
  const { run, f, cuts } = chosen;
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
    const fx = valueOf(assignment);
    const failure = failureOn(circuit, fx, layout, { assignment, target: targetValue, xOutcomes, allOutcomes: outcomes });
    if (failure === null) {
      return none("not proven: the prover's counterexample does not fail in simulation (a prover bug: please report it)", g.size, miter);
    }
    return refuted(method, miter, g.size, assignment, targetValue, outcomes, fx, failure);
  };
  const proved = (method: ProofMethod, miter: OracleProof["miter"], message: string): OracleProof => ({
    status: "proved", proved: true, method, miter, seconds: seconds(), message, graphNodes: g.size,
  });

  if (root === FALSE) return proved("structural", { variables: 0, clauses: 0 }, "proved: the miter is the constant false after structural hashing");
  if (root === TRUE) return refute(() => false, "structural", { variables: 0, clauses: 0 });

  const miter = coneSize(g, root);
  // The falsification front-end (falsify.ts): a wrong circuit usually fails on some chosen input.
  let early: OracleProof | null = null;
  falsify(g, root, inputs, options.expected === undefined ? cnf : null, {
    accept: (input) => {
      const r = refute((node) => {
        const role = g.role(node);
        if (role === VAR) return input.assignment[g.index(node)] === true;
        if (role === TARGET) return input.target;
        if (role === OUTCOME) return input.outcomes[g.index(node)] === true;
        return false;
      }, "simulation", miter);
      if (r.status !== "refuted") return false;
      early = r;
      return true;
    },
  });
  if (early !== null) return early;
  if (miter.clauses > (options.satClauseLimit ?? 5_000_000)) {
    const cut = cutBddProof(g, root, cuts, options.bddNodeLimit ?? 4_000_000);
    if (cut.proved) return proved("bdd", miter, `proved: the miter is false over the clause nodes (${cut.variables} BDD variables, ${cut.nodes} nodes)`);
    return none(`not proven: the miter has ${miter.clauses} clauses, more than the solver is given, and its BDD over the clause nodes ${cut.exhausted ? "outgrew its budget" : "is not false"}`, g.size, miter);
  }
  const enc = encodeCone(g, root);
  const solver = new CdclSolver(enc.cnf.variables);
  solver.addCnf(enc.cnf);
  const counterexample = (): OracleProof => {
    const model = solver.model();
    const values = new Map<number, boolean>();
    for (let i = 0; i < enc.inputNodes.length; i++) values.set(enc.inputNodes[i]!, model[enc.inputVars[i]! - 1] === 1);
    return refute((node) => {
      const r = g.role(node);
      return (r === VAR || r === TARGET || r === OUTCOME) && values.get(node) === true;
    }, "sat", miter);
  };
  const limit = options.conflictLimit ?? 1_000_000;
  // A short attempt first: a wrong circuit usually shows at once, and then the BDD is not needed.
  let status = solver.solve(Math.min(QUICK_CONFLICTS, limit));
  if (status === "sat") return counterexample();
  if (status === "unsat") return proved("sat", miter, `proved: the miter is unsatisfiable (${solver.conflicts} conflicts)`);
  const cut = cutBddProof(g, root, cuts, options.bddNodeLimit ?? 4_000_000);
  if (cut.proved) return proved("bdd", miter, `proved: the miter is false over the clause nodes (${cut.variables} BDD variables, ${cut.nodes} nodes)`);
  const budget = options.solverSeconds ?? DEFAULT_SOLVER_SECONDS;
  status = solver.solve(limit - solver.conflicts, performance.now() + budget * 1000);
  const outOfTime = solver.timedOut;
  if (status === "sat") return counterexample();
  if (status === "unsat") return proved("sat", miter, `proved: the miter is unsatisfiable (${solver.conflicts} conflicts)`);
  const ran = outOfTime ? `its time budget, ${budget} s, at ${solver.conflicts} conflicts` : `its budget of ${limit} conflicts`;
  return none(`not proven: the solver ran out of ${ran}${cut.exhausted ? ", and the BDD over the clause nodes outgrew its budget" : ""}`, g.size, miter);
}

/** Inputs sought per value of a wire the run stopped at. */
const FOCUS_PER_VALUE = 4;

/**
 * Where the symbolic run stopped at a measurement or reset of a wire whose value depends on the
 * input: inputs on which that wire is 1 and inputs on which it is 0, each with the outcomes of the
 * measurements before it. A dropped Hadamard before a measurement goes wrong only where the wire
 * is 1, and a wire deep in a counter is 1 on few inputs, which the falsifier's first candidates
 * (random, models, clause-violating) seldom are: the falsifier's cone evaluation looks for them
 * over all its candidates, then the solver (a short budget) if none has the value.
 */
function focusAt(run: SymbolicRun, c: Circuit, gate: number, n: number, cnf: Cnf | null): FalsifyingInput[] {
  if (c.kind[gate] !== K.measure && c.kind[gate] !== K.reset) return [];
  const g = run.g;
  const wire = run.wires[c.ops[c.opStart[gate]!]! >>> 1]!;
  if (wire <= 1 || g.hasPath(wire)) return [];
  const out: FalsifyingInput[] = [];
  const forced = (outcome: (node: number) => boolean): boolean[] => run.events.map((e) => (e.literal <= 1 ? e.literal === TRUE : outcome(e.literal >>> 1) !== ((e.literal & 1) === 1)));
  const first: FalsifyingInput[] = [];
  for (const lit of [wire, wire ^ 1]) {
    let found = 0;
    falsify(g, lit, n, cnf, {
      accept: (input) => {
        out.push({ assignment: input.assignment, target: input.target, outcomes: forced((node) => input.outcomes[g.index(node)] === true) });
        if (found === 0) first.push(out[out.length - 1]!);
        return ++found >= FOCUS_PER_VALUE;
      },
    });
    if (found > 0) continue;
    const enc = encodeCone(g, lit);
    const solver = new CdclSolver(enc.cnf.variables);
    if (!solver.addCnf(enc.cnf) || solver.solve(FOCUS_CONFLICTS) !== "sat") continue;
    const model = solver.model();
    const values = new Map<number, boolean>();
    for (let i = 0; i < enc.inputNodes.length; i++) values.set(enc.inputNodes[i]!, model[enc.inputVars[i]! - 1] === 1);
    const at = (l: number): boolean => (l <= 1 ? l === TRUE : (values.get(l >>> 1) === true) !== ((l & 1) === 1));
    out.push({ assignment: Array.from(run.vars, at), target: run.target >= 0 && at(run.target), outcomes: forced((node) => values.get(node) === true) });
    first.push(out[out.length - 1]!);
  }
  // The wire takes both values: its measurement's outcome depends on the input, which no oracle's
  // does. Where every branch still looks right on its own input, forcing the outcome the other
  // input gives shows it (the simulator finds that outcome impossible there).
  if (first.length === 2) first.forEach((input, i) => out.push({ ...input, outcomes: [...input.outcomes, i === 1] }));
  return out;
}

/**
 * Where a Hadamard could not sum its path variable out (symbolic.ts, `stuckAt`): inputs on which
 * its stray sum (the first literal) is 1, on which all the path-free factors of the variable's
 * phase terms (the other literals) are 1, on which each is 0, and on which each is 1. Those
 * factors are what the stray phase of a wrong gadget (a dropped CNOT inside it) is conditioned
 * on, and one value is often rare (a clause node, 0 only where the clause is violated): the
 * falsifier's candidates (random, models, clause-violating, hill climbs) filtered by it, no solver.
 */
export function focusOnFactors(run: SymbolicRun, factors: readonly number[], n: number, cnf: Cnf | null): FalsifyingInput[] {
  const g = run.g;
  const out: FalsifyingInput[] = [];
  const forced = (outcome: (node: number) => boolean): boolean[] => run.events.map((e) => (e.literal <= 1 ? e.literal === TRUE : outcome(e.literal >>> 1) !== ((e.literal & 1) === 1)));
  // The stray sum first, only where it is 1; then all factors at 1 at once (a CNOT moved off a
  // blocks-6 gadget at 200 variables fails only there); then each factor at 0 (for a clause node
  // the rare value), then each at 1.
  const rest = factors.slice(1);
  const lits = [factors[0]!, ...(rest.length > 1 ? [g.and(rest)] : []), ...rest.map((l) => l ^ 1), ...rest];
  for (const lit of lits) {
    if (lit > 1) {
      let found = 0;
      falsify(g, lit, n, cnf, {
        accept: (input) => {
          out.push({ assignment: input.assignment, target: input.target, outcomes: forced((node) => input.outcomes[g.index(node)] === true) });
          return ++found >= FOCUS_PER_FACTOR;
        },
      });
    }
  }
  return out;
}

/** Inputs sought per factor of a stuck Hadamard's path variable. */
const FOCUS_PER_FACTOR = 4;

/** Inputs and seconds (at least; else the share of the time the reductions took) of the last simulation. */
const UNREDUCED_INPUTS = 128;
const UNREDUCED_SECONDS = 10;
const UNREDUCED_SHARE = 1;

/** Conflicts the solver may spend looking for an input on which a stuck wire has a value. */
const FOCUS_CONFLICTS = 20_000;

/** The public face of the graph for an expected function. */
function builderOf(g: Graph): FunctionBuilder {
  return {
    FALSE, TRUE,
    and: (lits) => g.and(lits),
    or: (lits) => g.or(lits),
    xor: (a, b) => g.xor(a, b),
    not: (l) => l ^ 1,
  };
}

/** The state-vector simulator checks every assignment only up to this many variables (as sim/verify.ts). */
const STATE_VECTOR_EXHAUSTIVE = 12;

/**
 * True when simulation can check every assignment of `variables` variables under the exhaustive
 * limit `limit`: the bit-parallel kernel runs the circuit (classical gates and X-basis erasure)
 * up to `limit`, the state-vector simulator up to 12. Above that, verification proves instead.
 */
export function exhaustiveInReach(circuit: Circuit, variables: number, limit: number): boolean {
  const classical = !("unsupported" in compileBitProgram(circuit));
  return variables <= (classical ? limit : Math.min(limit, STATE_VECTOR_EXHAUSTIVE));
}
