/**
 * A cheap falsification front-end for the miter: before any solver runs, the miter's cone is
 * evaluated bit-parallel (32 inputs per word, BATCH words per pass) on inputs where a wrong
 * circuit tends to show. A mutant of an oracle usually differs near the formula's satisfying
 * set or where some count of violated clauses reaches an unusual value, so the inputs are:
 *
 *   - models of the formula (the CDCL solver, each found model blocked), their one-flip
 *     neighbours and random two-flip neighbours;
 *   - for each clause, an assignment violating that clause and (if the solver finds one)
 *     satisfying every other: a model of the formula minus the clause, with the clause forced
 *     false;
 *   - the trajectories of a hill climb that maximizes the number of violated clauses (a lean
 *     counter's high bits are reached only there) and of one that minimizes it;
 *   - uniformly random assignments.
 *
 * The target's initial value and the measurement outcomes are drawn at random per input. This is
 * random simulation as a falsifier, the first step of SAT sweeping (Kuehlmann, Paruthi, Krohm &
 * Ganai 2002, "Robust Boolean reasoning for equivalence checking and functional property
 * verification"; from memory): most wrong circuits fail on some of these inputs, and then no
 * solver runs. A hit is only a candidate: the caller confirms it by simulating the circuit.
 */
import type { Cnf } from "../cnf/cnf.js";
import { CdclSolver } from "../cnf/solve.js";
import type { Circuit } from "../ir/circuit.js";
import { basisTerm, CircuitFault, runSparse } from "../sim/sparse.js";
import { seededRandom } from "../util/random.js";
import { failureBySparse, failureOfTerms, type OracleLayout } from "./confirm.js";
import { AND, CONST, INPUT, OUTCOME, TARGET, VAR, type Graph } from "./graph.js";
import { operandsFor } from "./tseitin.js";

/** Words per node per pass (32 inputs each). */
const BATCH = 8;
const LANES = BATCH * 32;

/** The miter's cone in topological order, ready to be evaluated on batches of inputs. */
export class ConeEvaluator {
  /** Cone nodes in increasing id order (operands come before the nodes built from them). */
  private readonly order: Int32Array;
  /** Position of each cone node in `order`, -1 outside the cone. */
  private readonly pos: Int32Array;
  private readonly values: Int32Array;
  private readonly hits = new Int32Array(BATCH);
  /** The outcome inputs' count (largest index + 1). */
  readonly outcomes: number;

  constructor(private readonly g: Graph, private readonly root: number) {
    const seen = new Uint8Array(g.size);
    const stack = [root >>> 1];
    const nodes: number[] = [];
    let outcomes = 0;
    while (stack.length > 0) {
      const n = stack.pop()!;
      if (seen[n] === 1) continue;
      seen[n] = 1;
      nodes.push(n);
      const k = g.kind(n);
      if (k === INPUT) {
        if (g.role(n) === OUTCOME) outcomes = Math.max(outcomes, g.index(n) + 1);
        continue;
      }
      if (k === CONST) continue;
      const ops = operandsFor(g, n);
      for (let i = 0; i < ops.length; i++) if (seen[ops[i]! >>> 1] === 0) stack.push(ops[i]! >>> 1);
    }
    this.order = Int32Array.from(nodes).sort();
    this.pos = new Int32Array(g.size).fill(-1);
    for (let i = 0; i < this.order.length; i++) this.pos[this.order[i]!] = i;
    this.values = new Int32Array(this.order.length * BATCH);
    this.outcomes = outcomes;
  }

  /** Nodes in the cone. */
  get size(): number {
    return this.order.length;
  }

  /**
   * Evaluates the root on up to LANES inputs: `vars[v]` word w holds variable v's value in
   * lanes 32w..32w+31 (BATCH words per variable), likewise `target` and `outcomes[o]`. Returns
   * the root's BATCH words (a view, valid until the next run).
   */
  run(vars: Int32Array, target: Int32Array, outcomes: Int32Array): Int32Array {
    const g = this.g;
    const val = this.values;
    const pos = this.pos;
    const order = this.order;
    for (let i = 0; i < order.length; i++) {
      const n = order[i]!;
      const at = i * BATCH;
      const k = g.kind(n);
      if (k === INPUT) {
        const r = g.role(n);
        const src = r === VAR ? vars : r === TARGET ? target : r === OUTCOME ? outcomes : null;
        const off = r === TARGET ? 0 : g.index(n) * BATCH;
        for (let w = 0; w < BATCH; w++) val[at + w] = src === null ? 0 : src[off + w]!;
        continue;
      }
      if (k === CONST) {
        val.fill(0, at, at + BATCH);
        continue;
      }
      const ops = operandsFor(g, n);
      const and = k === AND;
      for (let w = 0; w < BATCH; w++) val[at + w] = and ? -1 : 0;
      for (let j = 0; j < ops.length; j++) {
        const o = ops[j]!;
        const src = pos[o >>> 1]! * BATCH;
        const neg = (o & 1) === 1 ? -1 : 0;
        if (and) for (let w = 0; w < BATCH; w++) val[at + w] = val[at + w]! & (val[src + w]! ^ neg);
        else for (let w = 0; w < BATCH; w++) val[at + w] = val[at + w]! ^ val[src + w]! ^ neg;
      }
    }
    const top = pos[this.root >>> 1]! * BATCH;
    const neg = (this.root & 1) === 1 ? -1 : 0;
    for (let w = 0; w < BATCH; w++) this.hits[w] = val[top + w]! ^ neg;
    return this.hits;
  }
}

/** One input of the miter where it is true (to be confirmed by simulation). */
export interface FalsifyingInput {
  readonly assignment: boolean[];
  readonly target: boolean;
  /** Outcome inputs by index. */
  readonly outcomes: boolean[];
}

/** Options of {@link falsify}. */
export interface FalsifyOptions extends CandidateOptions {
  /** Seed of the random choices (default 1). */
  readonly seed?: number;
  /**
   * Called with each input the miter is true on; returns true to stop (the input was
   * confirmed), false to go on looking.
   */
  readonly accept: (input: FalsifyingInput) => boolean;
}

/**
 * Evaluates the miter on the candidate inputs (see the module comment) for assignments of
 * `n` variables; `cnf` (null: none, only random inputs) steers them toward the formula's models.
 * Returns the input `accept` took, or null.
 */
export function falsify(g: Graph, root: number, n: number, cnf: Cnf | null, opts: FalsifyOptions): FalsifyingInput | null {
  const cone = new ConeEvaluator(g, root);
  const r = seededRandom(opts.seed ?? 1);
  const vars = new Int32Array(Math.max(1, n) * BATCH);
  const target = new Int32Array(BATCH);
  const mixed = new Int32Array(BATCH);
  const outcomes = new Int32Array(Math.max(1, cone.outcomes) * BATCH);
  const pending: Uint8Array[] = [];
  const word = (): number => (r() * 0x100000000) | 0;
  const flush = (): FalsifyingInput | null => {
    if (pending.length === 0) return null;
    vars.fill(0);
    for (let lane = 0; lane < pending.length; lane++) {
      const a = pending[lane]!;
      const w = lane >>> 5;
      const bit = 1 << (lane & 31);
      for (let v = 0; v < n; v++) if (a[v] === 1) vars[v * BATCH + w]! |= bit;
    }
    // Half the lanes (at random) get random outcomes, the other half all outcomes 0: a wrong
    // circuit may fail only when no fix-up fires, which random outcomes almost never give.
    for (let w = 0; w < BATCH; w++) {
      target[w] = word();
      mixed[w] = word();
    }
    for (let i = 0; i < outcomes.length; i++) outcomes[i] = word() & mixed[i % BATCH]!;
    const hits = cone.run(vars, target, outcomes);
    for (let w = 0; w < BATCH; w++) {
      for (let bits = hits[w]!; bits !== 0; bits &= bits - 1) {
        const bit = 31 - Math.clz32(bits & -bits);
        const lane = w * 32 + bit;
        if (lane >= pending.length) break;
        const at = (x: Int32Array, i: number): boolean => ((x[i * BATCH + w]! >>> bit) & 1) === 1;
        const input: FalsifyingInput = {
          assignment: Array.from({ length: n }, (_, v) => at(vars, v)),
          target: at(target, 0),
          outcomes: Array.from({ length: cone.outcomes }, (_, o) => at(outcomes, o)),
        };
        // Not confirmed would be a prover bug; the next hit may still be confirmed.
        if (opts.accept(input)) return input;
      }
    }
    pending.length = 0;
    return null;
  };
  for (const a of candidates(n, cnf, r, opts)) {
    pending.push(a);
    if (pending.length === LANES) {
      const found = flush();
      if (found !== null) return found;
    }
  }
  return flush();
}

/** Options of {@link candidates}. */
export interface CandidateOptions {
  /** Uniformly random assignments (default 4096). */
  readonly random?: number;
  /** Models to look for (default 8). */
  readonly models?: number;
  /** Conflicts the model searches may spend in all (default 20,000). */
  readonly conflictLimit?: number;
}

/**
 * The candidate assignments of the module comment, the sources taken in turn (one from each
 * while they last), so that a short prefix already holds some of every kind.
 */
export function* candidates(n: number, cnf: Cnf | null, r: () => number, opts: CandidateOptions = {}): Generator<Uint8Array> {
  const uniform = (): Uint8Array => {
    const a = new Uint8Array(n);
    for (let v = 0; v < n; v++) a[v] = r() < 0.5 ? 1 : 0;
    return a;
  };
  function* random(): Generator<Uint8Array> {
    for (let i = 0; i < (opts.random ?? 4096); i++) yield uniform();
  }
  const sources: Iterator<Uint8Array>[] = [random()];
  if (cnf !== null && cnf.variables === n) {
    const f = cnf;
    const models: Uint8Array[] = [];
    // Models, and their neighbours; then, for each clause, an assignment that violates just it.
    sources.push((function* (): Generator<Uint8Array> {
      const limit = opts.conflictLimit ?? 20_000;
      const solver = new CdclSolver(n, 1);
      if (solver.addCnf(f)) {
        while (models.length < (opts.models ?? 8) && solver.conflicts < limit) {
          if (solver.solve(limit - solver.conflicts) !== "sat") break;
          const m = solver.model();
          models.push(m);
          yield m;
          if (!solver.blockModel()) break;
        }
      }
      for (const m of models) {
        for (let v = 0; v < n; v++) {
          const a = m.slice();
          a[v]! ^= 1;
          yield a;
        }
        for (let k = 0; k < 2 * n; k++) {
          const a = m.slice();
          const u = Math.floor(r() * n);
          const v = Math.floor(r() * n);
          a[u]! ^= 1;
          if (v !== u) a[v]! ^= 1;
          yield a;
        }
      }
    })());
    sources.push((function* (): Generator<Uint8Array> {
      // One clause violated, every other satisfied where a short local search finds it so: from
      // a model (or a random assignment), the clause's literals set false and frozen, the rest
      // repaired.
      const clauses = f.clauseStart.length - 1;
      const frozen = new Uint8Array(n);
      for (let i = 0; i < clauses && i < 5000; i++) {
        const a = models.length > 0 ? models[i % models.length]!.slice() : uniform();
        for (let k = f.clauseStart[i]!; k < f.clauseStart[i + 1]!; k++) {
          const l = f.lits[k]!;
          a[Math.abs(l) - 1] = l > 0 ? 0 : 1;
          frozen[Math.abs(l) - 1] = 1;
        }
        const walk = new Walk(f, a, frozen, r);
        walk.run(false, n, 1);
        for (let k = f.clauseStart[i]!; k < f.clauseStart[i + 1]!; k++) frozen[Math.abs(f.lits[k]!) - 1] = 0;
        yield walk.a.slice();
      }
    })());
    sources.push((function* (): Generator<Uint8Array> {
      // Hill climbs on the number of violated clauses, up and down; every step is an input.
      // Some climbs count only the clauses of a prefix: a counter of violated clauses then
      // passes through every value at that clause, high ones included.
      const m = f.clauseStart.length - 1;
      for (let restart = 0; restart < 64; restart++) {
        for (const up of [true, false]) {
          const prefix = restart < 4 ? m : Math.max(1, Math.ceil(m * (0.1 + 0.9 * r())));
          const walk = new Walk(f, uniform(), new Uint8Array(n), r, prefix);
          yield* walk.run(up, 4 * n, up ? m + 1 : 0);
        }
      }
    })());
    sources.push((function* (): Generator<Uint8Array> {
      // Only the top of each upward climb over a random prefix: where each input costs a
      // simulation, the highest counter values at a clause (a counter's high bit is 1 only
      // where some 32 of the first 84 clauses are violated) must come in the first few dozen.
      const m = f.clauseStart.length - 1;
      for (let restart = 0; restart < 256; restart++) {
        const prefix = Math.max(1, Math.ceil(m * (0.1 + 0.9 * r())));
        const walk = new Walk(f, uniform(), new Uint8Array(n), r, prefix);
        const steps = walk.run(true, 4 * n, m + 1);
        yield steps.length > 0 ? steps[steps.length - 1]! : walk.a.slice();
      }
    })());
  }
  while (sources.length > 0) {
    for (let i = 0; i < sources.length; i++) {
      const next = sources[i]!.next();
      if (next.done === true) sources.splice(i--, 1);
      else yield next.value;
    }
  }
}

/** Occurrence lists of a formula, shared by the walks over it. */
const occurrences = new WeakMap<Cnf, { start: Int32Array; at: Int32Array; clauseOf: Int32Array }>();

/**
 * A greedy local search over assignments that raises or lowers the number of violated clauses,
 * one flip at a time (the best flip of a variable not frozen, ties at random; a random flip when
 * none improves), after GSAT (Selman, Levesque & Mitchell 1992).
 */
class Walk {
  private readonly start: Int32Array;
  private readonly at: Int32Array;
  private readonly clauseOf: Int32Array;
  /** Each clause's count of true literals. */
  private readonly trueLits: Int32Array;
  private violated = 0;

  /** Only clauses before `prefix` count (default: all). */
  constructor(private readonly cnf: Cnf, readonly a: Uint8Array, private readonly frozen: Uint8Array, private readonly r: () => number, private readonly prefix = cnf.clauseStart.length - 1) {
    let occ = occurrences.get(cnf);
    if (occ === undefined) {
      const n = cnf.variables;
      const m = cnf.clauseStart.length - 1;
      const start = new Int32Array(n + 1);
      for (let k = 0; k < cnf.lits.length; k++) start[Math.abs(cnf.lits[k]!)]!++;
      for (let v = 1; v <= n; v++) start[v]! += start[v - 1]!;
      const at = new Int32Array(cnf.lits.length);
      const fill = start.slice();
      const clauseOf = new Int32Array(cnf.lits.length);
      for (let i = 0; i < m; i++) {
        for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
          at[--fill[Math.abs(cnf.lits[k]!)]!] = k;
          clauseOf[k] = i;
        }
      }
      occurrences.set(cnf, (occ = { start, at, clauseOf }));
    }
    this.start = occ.start;
    this.at = occ.at;
    this.clauseOf = occ.clauseOf;
    const m = cnf.clauseStart.length - 1;
    this.trueLits = new Int32Array(m);
    for (let i = 0; i < m; i++) {
      for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) if (this.isTrue(cnf.lits[k]!)) this.trueLits[i]!++;
      if (this.trueLits[i] === 0 && i < prefix) this.violated++;
    }
  }

  private isTrue(l: number): boolean {
    return (this.a[Math.abs(l) - 1] === 1) === l > 0;
  }

  /** Change in the number of violated clauses if variable v (1-based) flips. */
  private gain(v: number): number {
    let d = 0;
    for (let p = this.start[v - 1]!; p < this.start[v]!; p++) {
      const k = this.at[p]!;
      if (this.clauseOf[k]! >= this.prefix) continue;
      const t = this.trueLits[this.clauseOf[k]!]!;
      if (this.isTrue(this.cnf.lits[k]!)) d += t === 1 ? 1 : 0;
      else d -= t === 0 ? 1 : 0;
    }
    return d;
  }

  private flip(v: number): void {
    for (let p = this.start[v - 1]!; p < this.start[v]!; p++) {
      const k = this.at[p]!;
      const i = this.clauseOf[k]!;
      const before = this.trueLits[i]!;
      this.trueLits[i] = before + (this.isTrue(this.cnf.lits[k]!) ? -1 : 1);
      if (i >= this.prefix) continue;
      if (before === 0) this.violated--;
      else if (this.trueLits[i] === 0) this.violated++;
    }
    this.a[v - 1]! ^= 1;
  }

  /**
   * Up to `steps` flips that raise (`up`) or lower the violated count, stopping once it reaches
   * `goal` (at least, going up; at most, going down): the assignments passed through.
   */
  run(up: boolean, steps: number, goal: number): Uint8Array[] {
    const n = this.cnf.variables;
    const out: Uint8Array[] = [];
    let stalls = 0;
    for (let step = 0; step < steps && stalls < 8; step++) {
      if (up ? this.violated >= goal : this.violated <= goal) break;
      let best = 0;
      let pick = -1;
      let ties = 0;
      for (let v = 1; v <= n; v++) {
        if (this.frozen[v - 1] === 1) continue;
        const d = up ? this.gain(v) : -this.gain(v);
        if (d > best) {
          best = d;
          pick = v;
          ties = 1;
        } else if (d === best && best > 0 && this.r() * ++ties < 1) pick = v;
      }
      if (pick < 0) {
        stalls++;
        pick = 1 + Math.floor(this.r() * n);
        if (this.frozen[pick - 1] === 1) continue;
      }
      this.flip(pick);
      out.push(this.a.slice());
    }
    return out;
  }
}

/** An input on which simulation shows the circuit is not the oracle. */
export interface SimulatedFailure {
  readonly assignment: boolean[];
  readonly target: boolean;
  /** Every measurement's and reset's outcome, in order, as the simulation drew them. */
  readonly outcomes: boolean[];
  /** The expected function's value there. */
  readonly f: boolean;
  /** What goes wrong (confirm.ts). */
  readonly failure: string;
}

/** Focus inputs {@link falsifyBySimulation} simulates however long they take. */
const FOCUS_FIRST = 8;

/**
 * For circuits the symbolic run cannot reduce (a Clifford+T circuit whose Hadamards no gadget
 * closes, a measurement of a value that depends on the input): the exact state-vector simulator
 * on the `focus` inputs (chosen by the caller where the run stopped; their `outcomes` are the
 * first measurements' outcomes, forced), then on the first candidate assignments, with
 * measurement outcomes drawn and recorded, until one fails or `maxInputs` candidates or
 * `seconds` have passed (the first 8 focus inputs in any case; `progress` counts the focus inputs
 * simulated). Only a refutation can come of it, never a proof.
 */
export function falsifyBySimulation(
  c: Circuit, n: number, cnf: Cnf | null, value: (assignment: readonly boolean[]) => boolean, layout: OracleLayout,
  maxInputs = 128, seconds = 10, focus: readonly FalsifyingInput[] = [], progress?: { focusDone: number },
): SimulatedFailure | null {
  const t0 = performance.now();
  const r = seededRandom(7);
  let seed = 1;
  const simulate = (assignment: boolean[], target: boolean, forced: readonly boolean[], drawn?: (outcomes: boolean[]) => void): SimulatedFailure | null => {
    const f = value(assignment);
    const recorded: number[] = [];
    const ones: number[] = [];
    assignment.forEach((on, q) => on && ones.push(q));
    if (target) ones.push(layout.target);
    let outcomes: boolean[];
    let failure: string | null;
    // The exact simulator also for classical circuits: its recorded outcomes name the input.
    try {
      const run = runSparse(c, [basisTerm(c.qubits, ones)], seededRandom(++seed), { forced: forced.map((o) => (o ? 1 : 0)), record: recorded });
      outcomes = recorded.map((o) => o === 1);
      failure = failureOfTerms(c, f, layout, { assignment, target, xOutcomes: [], allOutcomes: outcomes }, run.terms);
    } catch (e) {
      if (!(e instanceof CircuitFault)) throw e;
      // The forced outcome that could not happen is not recorded: the input names it, and the
      // run with it forced reports the fault.
      outcomes = recorded.length < forced.length ? forced.slice(0, recorded.length + 1) : recorded.map((o) => o === 1);
      failure = failureBySparse(c, f, layout, { assignment, target, xOutcomes: [], allOutcomes: outcomes });
    }
    if (failure === null) drawn?.(outcomes);
    return failure === null ? null : { assignment, target, outcomes, f, failure };
  };
  for (const [i, input] of focus.entries()) {
    // The first few focus inputs whatever the clock says: a loaded machine must not skip them.
    if (i >= FOCUS_FIRST && performance.now() - t0 > seconds * 1000) return null;
    const hit = simulate(input.assignment, layout.target >= 0 && input.target, input.outcomes);
    if (progress !== undefined) progress.focusDone++;
    if (hit !== null) return hit;
  }
  // Three inputs in four are given the outcomes the first one drew: in an oracle they are
  // possible for every input (each X-basis outcome has probability 1/2, any other measurement
  // reads a constant), so one that cannot happen there shows the circuit measures the input. The
  // fourth draws its own, for branches that go wrong only on other outcomes.
  let reference: boolean[] | null = null;
  let k = 0;
  for (const a of candidates(n, cnf, r, { random: maxInputs })) {
    if (k++ >= maxInputs || performance.now() - t0 > seconds * 1000) break;
    const hit = simulate(Array.from(a, (x) => x === 1), layout.target >= 0 && r() < 0.5, reference !== null && k % 4 !== 0 ? reference : [], (o) => (reference ??= o));
    if (hit !== null) return hit;
  }
  return null;
}
