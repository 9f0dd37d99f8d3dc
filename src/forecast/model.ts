/**
 * From logical counts to a fault-tolerant run: code distance, physical qubits and time of a Grover
 * search on a surface-code machine with 15-to-1 magic-state factories, in two regimes.
 *
 * - Reaction-limited ("enough factories"): every T layer takes one reaction time, and there are
 *   enough factories that magic states never hold the run up (sized to the run's average demand).
 * - One factory: the same machine with a single factory, so the run waits for magic states
 *   (T-count limited).
 *
 * In both, run time = max(T-depth x reaction time, T-count / factory output rate), where the
 * output rate is (factories) / (code cycles per state x cycle time); a run is k iterations, and
 * the expected time until success is run time / success probability (runs repeat until one
 * succeeds). Everything here takes plain numbers; gathering them from a formula is the caller's
 * business (the command line's adapter).
 */
import { chooseDistillation, DISTILLATION_SOURCE, type DistillationProtocol } from "./factories.js";
import { routingPatches, ROUTING_SOURCE } from "./layout.js";
import { codeDistanceFor, LOGICAL_ERROR_MODELS, logicalErrorRate, MAX_CODE_DISTANCE, patchQubits, type LogicalErrorModelName } from "./surfaceCode.js";

/** Logical counts of one part of the search (Clifford+T lowering). */
export interface LogicalWork {
  /** T and T-dagger gates: magic states consumed. */
  readonly tCount: number;
  /** T layers on the longest path. */
  readonly tDepth: number;
  /** Toffolis of the toffoli-basis lowering (reported; the model runs on the T figures). */
  readonly toffoliCount: number;
  /** CNOTs (reported; Clifford gates take no time in this model). */
  readonly cnotCount: number;
  /** Circuit depth (reported; Clifford gates take no time in this model). */
  readonly depth: number;
}

/** What the model needs to know about a search, as plain numbers. */
export interface ForecastInput {
  /** Logical qubits of the search circuit (search register and work qubits). */
  readonly logicalQubits: number;
  /** One oracle call. */
  readonly oracle: LogicalWork;
  /** One Grover iteration (oracle and diffusion). */
  readonly iteration: LogicalWork;
  /** Grover iterations per run, k. */
  readonly iterations: number;
  /** Probability that one run of k iterations finds a solution, P. */
  readonly successProbability: number;
  /** Where these counts come from (echoed in the assumptions). */
  readonly source: string;
}

/** The machine the search runs on. */
export interface Machine {
  /** Physical error rate per operation, p. */
  readonly physicalErrorRate: number;
  /** Surface-code cycle time in seconds. */
  readonly cycleSeconds: number;
  /** Reaction time in seconds: measuring, decoding and acting on a result. */
  readonly reactionSeconds: number;
  /** Largest acceptable probability that the whole expected search suffers a logical failure. */
  readonly failureBudget: number;
  /** The logical-error scaling (see {@link LOGICAL_ERROR_MODELS}). */
  readonly logicalModel: LogicalErrorModelName;
}

/**
 * The defaults of {@link Machine}: p = 1e-3, 1 us cycle, 10 us reaction, 1% failure budget, Fowler & Gidney 2018.
 *
 * @example
 * ```ts
 * forecastSearch(input, { ...DEFAULT_MACHINE, physicalErrorRate: 1e-4 });
 * ```
 */
export const DEFAULT_MACHINE: Machine = {
  physicalErrorRate: 1e-3,
  cycleSeconds: 1e-6,
  reactionSeconds: 1e-5,
  failureBudget: 0.01,
  logicalModel: "fowler-gidney-2018",
};

const GIDNEY_EKERA = "Gidney & Ekera 2021, \"How to factor 2048 bit RSA integers in 8 hours using 20 million noisy qubits\", Quantum 5:433";

/**
 * Why each default of {@link DEFAULT_MACHINE} is what it is.
 *
 * @example
 * ```ts
 * MACHINE_DEFAULT_SOURCES.reactionSeconds; // "default: a 10 us reaction time, as assumed by Gidney & Ekera 2021, ..."
 * ```
 */
export const MACHINE_DEFAULT_SOURCES: Record<keyof Machine, string> = {
  physicalErrorRate: `default: as assumed by ${GIDNEY_EKERA}; also a row of ${DISTILLATION_SOURCE}`,
  cycleSeconds: `default: a 1 us surface-code cycle, as assumed by ${GIDNEY_EKERA}`,
  reactionSeconds: `default: a 10 us reaction time, as assumed by ${GIDNEY_EKERA}`,
  failureBudget: "default (common practice): the whole expected search may fail with probability at most 1%",
  logicalModel: "default: Fowler & Gidney 2018, the scaling the distillation table was computed with",
};

/** One input value of an estimate and where it comes from. */
export interface Assumption {
  /** What it is (snake_case). */
  readonly name: string;
  /** Its value. */
  readonly value: number | string;
  /** Its source: a citation, "given", "measured", "default: ...", or "common practice". */
  readonly source: string;
}

/** Physical qubits by purpose. */
export interface PhysicalQubits {
  /** Patches holding the search circuit's logical qubits (2 d^2 each). */
  readonly data: number;
  /** Routing patches of the layout (2 d^2 each). */
  readonly routing: number;
  /** Magic-state factories. */
  readonly factories: number;
  /** All of them. */
  readonly total: number;
}

/** The estimate under one regime. */
export interface RegimeEstimate {
  /** Code distance of the data and routing patches. */
  readonly codeDistance: number;
  /** Magic-state factories. */
  readonly factories: number;
  /** Physical qubits. */
  readonly physicalQubits: PhysicalQubits;
  /** Seconds per T layer (the reaction time). */
  readonly tLayerSeconds: number;
  /** Seconds the factories together take per magic state (code cycles x cycle time / factories); 0 without factories. */
  readonly stateSeconds: number;
  /** One oracle call. */
  readonly oracleSeconds: number;
  /** One Grover iteration. */
  readonly iterationSeconds: number;
  /** One run of k iterations. */
  readonly runSeconds: number;
  /** Expected time until a run succeeds: runSeconds / P. */
  readonly expectedSeconds: number;
  /** Code cycles of the expected search. */
  readonly expectedCodeCycles: number;
  /** What bounds the run: the T-depth at one reaction time per layer, or the magic-state supply ("none" when the run has no T gate, k = 0). */
  readonly limitedBy: "t-depth" | "magic-states" | "none";
  /** Probability of a logical failure over the expected search, from memory errors and from faulty magic states. */
  readonly logicalFailure: {
    /** Data and routing patches: patches x cycles x p_L(d). */
    readonly memory: number;
    /** Magic states consumed x output error per state. */
    readonly magicStates: number;
    /** Their sum (a union bound). */
    readonly total: number;
  };
}

/** A physical estimate, or why the model cannot give one. */
export type Forecast =
  | {
      /** An estimate was made. */
      readonly ok: true;
      /** The chosen distillation protocol (undefined when the search has no T gate). */
      readonly protocol: DistillationProtocol | undefined;
      /** Largest error per magic state that keeps the magic-state share of the budget. */
      readonly neededOutputError: number | undefined;
      /** Magic states consumed over the expected search: k x T-count per iteration / P. */
      readonly expectedTStates: number;
      /** Logical patches: the circuit's qubits and the routing space. */
      readonly patches: {
        /** One per logical qubit. */
        readonly data: number;
        /** Routing space of the layout. */
        readonly routing: number;
      };
      /** Enough factories that the run is limited by T-depth x reaction time. */
      readonly reactionLimited: RegimeEstimate;
      /** A single factory (T-count limited). */
      readonly oneFactory: RegimeEstimate;
      /** Every input and constant of the estimate, with its source. */
      readonly assumptions: readonly Assumption[];
    }
  | {
      /** The model cannot give an estimate. */
      readonly ok: false;
      /** Why there is no estimate. */
      readonly reason: string;
      /** What to change. */
      readonly hint: string;
      /** The inputs as far as they were read. */
      readonly assumptions: readonly Assumption[];
    };

const finiteAtLeast = (x: number, min: number): boolean => Number.isFinite(x) && x >= min;

/** The first problem with the inputs, or undefined. */
function inputProblem(input: ForecastInput, m: Machine): { reason: string; hint: string } | undefined {
  const model = LOGICAL_ERROR_MODELS[m.logicalModel];
  if (model === undefined) return { reason: `unknown logical-error model '${String(m.logicalModel)}'`, hint: `use one of ${Object.keys(LOGICAL_ERROR_MODELS).join(", ")}` };
  if (!(m.physicalErrorRate > 0 && m.physicalErrorRate < model.threshold)) {
    return { reason: `the physical error rate ${m.physicalErrorRate} is not below the surface-code threshold ${model.threshold} of ${model.name}`, hint: "give an error rate below the threshold" };
  }
  if (!(m.cycleSeconds > 0 && Number.isFinite(m.cycleSeconds))) return { reason: `the cycle time must be a positive number of seconds, got ${m.cycleSeconds}`, hint: "give e.g. 1e-6" };
  if (!(m.reactionSeconds > 0 && Number.isFinite(m.reactionSeconds))) return { reason: `the reaction time must be a positive number of seconds, got ${m.reactionSeconds}`, hint: "give e.g. 1e-5" };
  if (!(m.failureBudget > 0 && m.failureBudget < 1)) return { reason: `the failure budget must lie strictly between 0 and 1, got ${m.failureBudget}`, hint: "give e.g. 0.01" };
  if (!(input.successProbability > 0 && input.successProbability <= 1)) {
    return { reason: `the success probability must lie in (0, 1], got ${input.successProbability}`, hint: "a formula without solutions cannot be searched for" };
  }
  if (!finiteAtLeast(input.iterations, 0) || !finiteAtLeast(input.logicalQubits, 1)) {
    return { reason: `iterations (${input.iterations}) and logical qubits (${input.logicalQubits}) must be finite, with at least one qubit`, hint: "check the logical counts" };
  }
  for (const [part, w] of [["oracle", input.oracle], ["iteration", input.iteration]] as const) {
    for (const [k, v] of Object.entries(w)) {
      if (!finiteAtLeast(v as number, 0)) return { reason: `the ${part}'s ${k} must be a finite count, got ${String(v)}`, hint: "check the logical counts" };
    }
    if (w.tCount > 0 && w.tDepth < 1) return { reason: `the ${part} has T gates but T-depth ${w.tDepth}`, hint: "check the logical counts" };
  }
  return undefined;
}

/**
 * The machine's and the input's figures with their sources, as the first assumptions of a
 * forecast. `iterations` replaces the input's k where it is given as text (a k beyond the range
 * of a double, e.g. "2^117370.0").
 */
export function inputAssumptions(input: ForecastInput, machine: Partial<Machine> = {}, iterations?: string): Assumption[] {
  const m: Machine = { ...DEFAULT_MACHINE, ...machine };
  const given = (k: keyof Machine): string => (machine[k] !== undefined ? "given" : MACHINE_DEFAULT_SOURCES[k]);
  return [
    { name: "physical_error_rate", value: m.physicalErrorRate, source: given("physicalErrorRate") },
    { name: "cycle_seconds", value: m.cycleSeconds, source: given("cycleSeconds") },
    { name: "reaction_seconds", value: m.reactionSeconds, source: given("reactionSeconds") },
    { name: "failure_budget", value: m.failureBudget, source: given("failureBudget") },
    { name: "logical_qubits", value: input.logicalQubits, source: input.source },
    { name: "iterations", value: iterations ?? input.iterations, source: input.source },
    { name: "success_probability", value: input.successProbability, source: input.source },
    { name: "oracle_t_count", value: input.oracle.tCount, source: input.source },
    { name: "oracle_t_depth", value: input.oracle.tDepth, source: input.source },
    { name: "iteration_t_count", value: input.iteration.tCount, source: input.source },
    { name: "iteration_t_depth", value: input.iteration.tDepth, source: input.source },
  ];
}

/**
 * Estimates the physical resources and time of a Grover search from its logical counts.
 *
 * @param input the search's logical counts, iterations and success probability
 * @param machine the machine; missing fields take {@link DEFAULT_MACHINE}, and given ones are
 *   listed as "given" in the assumptions
 *
 * @example
 * ```ts
 * const f = forecastSearch({
 *   logicalQubits: 60, iterations: 7, successProbability: 0.9947, source: "example",
 *   oracle: { tCount: 384, tDepth: 46, toffoliCount: 96, cnotCount: 769, depth: 216 },
 *   iteration: { tCount: 444, tDepth: 58, toffoliCount: 116, cnotCount: 930, depth: 281 },
 * });
 * if (f.ok) f.reactionLimited.expectedSeconds; // 0.0040818... (7 x 58 x 10 us / 0.9947)
 * ```
 */
export function forecastSearch(input: ForecastInput, machine: Partial<Machine> = {}): Forecast {
  const m: Machine = { ...DEFAULT_MACHINE, ...machine };
  const model = LOGICAL_ERROR_MODELS[m.logicalModel];
  const assumptions = inputAssumptions(input, machine);
  const problem = inputProblem(input, m);
  if (problem !== undefined) return { ok: false, ...problem, assumptions };
  assumptions.push(
    { name: "logical_error_model", value: `p_L = ${model.prefactor} (p / ${model.threshold})^((d+1)/2)`, source: `${machine.logicalModel !== undefined ? "given" : "default"}; ${model.source}` },
    { name: "patch_qubits", value: "2 d^2", source: "a rotated surface-code patch: d^2 data and d^2 - 1 measurement qubits, rounded up (common practice)" },
    { name: "routing_patches", value: "n + ceil(sqrt(8 n)) + 1 for n logical qubits", source: ROUTING_SOURCE },
    {
      name: "t_layer_seconds",
      value: m.reactionSeconds,
      source:
        "one reaction time per T layer, Clifford gates taking no time: Clifford gates are commuted past the T gates, which become Pauli-product rotations (Litinski 2019, Quantum 3:128); " +
        "one reaction time per layer whatever the code distance is the time-optimal limit of Fowler 2012 (\"Time-optimal quantum computation\", arXiv:1210.4626), whose extra qubits this model does not count",
    },
    { name: "run", value: "k iterations; the initial Hadamards and the final measurement hold no T gate and take no time", source: "this model" },
    { name: "expected_seconds", value: "run_seconds / success_probability", source: "runs repeat until one succeeds: 1/P runs expected (geometric distribution)" },
    {
      name: "failure_budget_split",
      value: "half to memory errors of data and routing patches, half to faulty magic states",
      source: "an even split, after Beverland et al. 2022 (arXiv:2211.07629), who split evenly among logical, distillation and rotation-synthesis errors; a search oracle has no arbitrary rotation",
    },
    { name: "code_distance", value: "smallest odd d >= 3 with patches x expected code cycles x p_L(d) <= failure_budget / 2", source: "this model" },
    {
      name: "factories_reaction_limited",
      value: "ceil(iteration T-count x state time / (iteration T-depth x reaction time)), at least 1",
      source: "this model: sized to the average demand; states made ahead of use wait in storage that is not counted",
    },
  );

  const iterT = input.iteration.tCount;
  const expectedRuns = 1 / input.successProbability;
  const expectedTStates = input.iterations * iterT * expectedRuns;
  const magicBudget = m.failureBudget / 2;
  const memoryBudget = m.failureBudget / 2;
  let protocol: DistillationProtocol | undefined;
  let neededOutputError: number | undefined;
  if (expectedTStates > 0) {
    neededOutputError = magicBudget / expectedTStates;
    const choice = chooseDistillation(m.physicalErrorRate, neededOutputError);
    if (!choice.ok) return { ok: false, reason: choice.reason, hint: choice.hint, assumptions };
    protocol = choice.protocol;
    assumptions.push({
      name: "magic_state_protocol",
      value: `${protocol.name} at p = ${protocol.physicalErrorRate}: ${protocol.qubits} qubits, ${protocol.codeCycles} code cycles per state, output error ${protocol.outputError}`,
      source: `${DISTILLATION_SOURCE}; ${choice.rule}`,
    });
  }

  const dataPatches = input.logicalQubits;
  const routing = routingPatches(dataPatches);
  const stateSecondsOne = protocol === undefined ? 0 : protocol.codeCycles * m.cycleSeconds;
  const regime = (factories: number): RegimeEstimate | { reason: string; hint: string } => {
    const stateSeconds = factories > 0 ? stateSecondsOne / factories : 0;
    const partSeconds = (w: LogicalWork): number => Math.max(w.tDepth * m.reactionSeconds, w.tCount * stateSeconds);
    const iterationSeconds = partSeconds(input.iteration);
    const runSeconds = input.iterations * iterationSeconds;
    const expectedSeconds = runSeconds / input.successProbability;
    const expectedCodeCycles = expectedSeconds / m.cycleSeconds;
    const patches = dataPatches + routing;
    const d = codeDistanceFor(model, m.physicalErrorRate, patches * expectedCodeCycles, memoryBudget);
    if (d === undefined) {
      return { reason: `no code distance up to ${MAX_CODE_DISTANCE} keeps ${patches} patches over ${expectedCodeCycles.toPrecision(3)} code cycles within the failure budget`, hint: "a lower --error-rate or a looser --failure-budget" };
    }
    const tDepthSeconds = input.iteration.tDepth * m.reactionSeconds;
    const supplySeconds = input.iteration.tCount * stateSeconds;
    const memory = patches * expectedCodeCycles * logicalErrorRate(model, m.physicalErrorRate, d);
    const magicStates = protocol === undefined ? 0 : expectedTStates * protocol.outputError;
    const perPatch = patchQubits(d);
    const physical = { data: dataPatches * perPatch, routing: routing * perPatch, factories: protocol === undefined ? 0 : factories * protocol.qubits };
    return {
      codeDistance: d,
      factories,
      physicalQubits: { ...physical, total: physical.data + physical.routing + physical.factories },
      tLayerSeconds: m.reactionSeconds,
      stateSeconds,
      oracleSeconds: partSeconds(input.oracle),
      iterationSeconds,
      runSeconds,
      expectedSeconds,
      expectedCodeCycles,
      // A relative margin keeps a float rounding of the factory count from flipping the label.
      limitedBy: runSeconds === 0 ? "none" : supplySeconds > tDepthSeconds * (1 + 1e-9) ? "magic-states" : "t-depth",
      logicalFailure: { memory, magicStates, total: memory + magicStates },
    };
  };
  const enough = protocol === undefined || iterT === 0 ? 0 : Math.max(1, Math.ceil((iterT * stateSecondsOne) / (input.iteration.tDepth * m.reactionSeconds)));
  const reactionLimited = regime(enough);
  const oneFactory = regime(protocol === undefined ? 0 : 1);
  if ("reason" in reactionLimited) return { ok: false, ...reactionLimited, assumptions };
  if ("reason" in oneFactory) return { ok: false, ...oneFactory, assumptions };
  return { ok: true, protocol, neededOutputError, expectedTStates, patches: { data: dataPatches, routing }, reactionLimited, oneFactory, assumptions };
}
