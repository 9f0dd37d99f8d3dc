/**
 * `clausegate forecast FILE...`: from the logical counts of a Grover search to a fault-tolerant
 * run (code distance, physical qubits, factories, time), side by side with the classical time.
 *
 * The physical model (src/forecast) takes plain numbers. {@link forecastInputOf} is the adapter
 * that gathers them from today's APIs (countModels, planSearch, searchCosts); it is the one place
 * to re-point when those move.
 */
import {
  countSolutions, crossoverOf, DEFAULT_MACHINE, fitLogLinear, forecastSearch, formatCount, formatLog10Count, formatLog10Seconds, formatSeconds, inputAssumptions, LOGICAL_ERROR_MODELS,
  MAX_TABULATED_ERROR_RATE, measureEvaluationRate, planSearch, plotForecastSvg, searchConstruction, searchCosts, sharingPlans, clauseCount, constructionSearchCost, parseConstruction,
  type Assumption, type Cnf, type Crossover, type Forecast, type ForecastInput, type ForecastPlotSeries, type LogLinearFit,
  type LogicalErrorModelName, type Machine, type RegimeEstimate, type RegisterMode, type Uncompute, type Strategy,
} from "../internal.js";
import { checkCircuitSize, checkFreeRegister, displayName, EXIT_UNSATISFIABLE, loadCnf, plural, UserError, writeAtomic } from "./io.js";
import { choice, oracleOptions, parseCommandArgs, REGISTER_ARGS, registerHelp, type CliOracleOptions } from "./options.js";
import { registerText, searchProblem } from "./register.js";
import { claimOutput, printLater } from "./output.js";

/** Seconds the classical evaluator is timed on each formula. */
const MEASURE_SECONDS = 0.2;

export const forecastHelp = `Usage: clausegate forecast FILE... [options]

Estimates what a Grover search for each formula would take on a fault-tolerant surface-code
machine, and sets it beside the classical time. It is a model, not a measurement: every estimate
is printed with its assumptions and their sources.

Logical counts come from clausegate's Clifford+T lowering of a one-iteration search circuit (the
oracle and the diffusion), the plan's k iterations and success probability P (M from the exact
count, as clausegate plan; when M cannot be counted, M = 1 is assumed and said). The search register
is the free register by default (as clausegate plan and search: N = 2^n over the n free variables,
the others computed by the oracle); --register full searches every declared variable. Then:
  - code distance: the smallest odd d whose logical error, p_L = 0.1 (100 p)^((d+1)/2) per patch
    per code cycle (Fowler & Gidney 2018), keeps the whole expected search within half the
    failure budget; 2 d^2 physical qubits per patch; routing space of Litinski's fast block
    (2n + sqrt(8n) + 1 tiles, Litinski 2019, "A Game of Surface Codes");
  - magic states: a 15-to-1 factory from Litinski 2019 ("Magic state distillation: not as costly
    as you think", Table 1), the cheapest whose output error keeps the other half of the budget;
  - time: run = max(T-depth x reaction time, T-count x state time / factories) over k iterations;
    expected = run / P. Two regimes: enough factories that T-depth x reaction time bounds the run,
    and one factory (T-count bound). Clifford gates take no time, and a T layer takes one reaction
    time whatever d: the time-optimal limit of Fowler 2012, whose extra qubits are not counted;
  - classical: N/M evaluations (N when M is unknown) over the same search register (a brute force
    over the free variables completes each value and checks it) at the rate clausegate's
    bit-parallel evaluator reaches on the formula, measured for ${MEASURE_SECONDS} s at run time.
Several files (a family at growing sizes): one table, least-squares lines of log10(time) against
the number of variables, and where a quantum line crosses the classical one (an extrapolation).

Options:
${registerHelp("free")}
  --strategy wide|lean        oracle strategy (default wide: fewest T)
  --construction NAME         the oracle's construction instead (as clausegate oracle --construction:
                              blocks-B, blocks-B1xB2, blocks-B-held-H, fanout-U, ...)
  --max-qubits Q              the cheapest construction whose one-iteration search circuit (search, work
                              qubits; Clifford+T) has at most Q logical qubits; exit 2, naming the smallest
                              Q that works, when none fits
  --prefer t-count|t-depth    what cheapest means (default t-count); without --max-qubits, among every
                              construction
  --uncompute unitary|measured
                              unitary inverse (default) or measurement and fix-up (Gidney 2018)
  --basis mcx|toffoli|clifford+t
                              accepted for symmetry with the other commands; the model always uses the
                              Clifford+T lowering (a T gate is what consumes a magic state)
  --error-rate P              physical error rate (default ${DEFAULT_MACHINE.physicalErrorRate}, the rate Gidney & Ekera 2021 assume;
                              at most ${MAX_TABULATED_ERROR_RATE}, the highest rate of the distillation table)
  --cycle-time SECONDS        surface-code cycle (default ${DEFAULT_MACHINE.cycleSeconds}: Gidney & Ekera 2021)
  --reaction-time SECONDS     time per T layer (default ${DEFAULT_MACHINE.reactionSeconds}: Gidney & Ekera 2021)
  --failure-budget F          largest acceptable chance of a logical failure over the whole expected
                              search (default ${DEFAULT_MACHINE.failureBudget}, common practice); half to memory, half to magic states
  --logical-model fowler-gidney-2018|fowler-2012
                              p_L scaling: 0.1 (100 p)^((d+1)/2) (default, Fowler & Gidney 2018) or
                              0.03 (p / 0.0057)^((d+1)/2) (Fowler, Mariantoni, Martinis & Cleland 2012)
  --classical-time SECONDS[,SECONDS...]
                              a solver's measured time, one per file in order; printed beside the model
  --json                      print JSON (one object for one file; {"forecasts": [...], "fits": ...} for several)
  --plot FILE.svg             plot expected time against variables: quantum (both regimes) and classical
  -h, --help                  show this help

Exit codes: 0, 3 when a formula is unsatisfiable (the others are still estimated), 2 bad input.
`;

const POSITIVE = /^(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?$/i;

/** A positive real option within (0, max]; undefined when absent. */
function realOption(raw: string | undefined, name: string, max: number, maxText: string): number | undefined {
  if (raw === undefined) return undefined;
  const v = POSITIVE.test(raw) ? Number(raw) : NaN;
  if (!(v > 0) || !Number.isFinite(v) || v > max) {
    throw new UserError(`clausegate forecast: error: ${name} expects a number greater than 0 and at most ${maxText} but got '${raw}'; hint: see clausegate forecast --help`);
  }
  return v;
}

/** Where the solution count came from. */
type SolutionsSource = "exact" | "assumed";

/** What the adapter gathers for one formula, besides the model's plain input. */
interface Gathered {
  readonly input: ForecastInput;
  /** Search qubits (n of N = 2^n). */
  readonly searchQubits: number;
  /** The register searched, in words. */
  readonly register: string;
  readonly solutions: number;
  readonly solutionsSource: SolutionsSource;
  /** k (Infinity beyond the range of a double: see log2Iterations). */
  readonly iterations: number;
  /** log2 of k, at any size (-Infinity for k = 0). */
  readonly log2Iterations: number;
  readonly successProbability: number;
}

/**
 * The adapter: the model's plain numbers for one formula from today's APIs. The search register
 * (free by default, as plan and search) and M over it from the exact count (M = 1 when it cannot
 * be counted), k and P from planSearch, the oracle's and one iteration's Clifford+T counts from
 * searchCosts with one iteration and the same register (the initial Hadamards and the final
 * measurement of that circuit hold no T gate, so its T figures are one iteration's).
 * Undefined M = 0: nothing to search for.
 */
export async function forecastInputOf(
  cnf: Cnf, strategy: Strategy, uncompute: Uncompute, registerOptions: { register: RegisterMode; structure: boolean } = { register: "free", structure: true }, construction?: string,
): Promise<Gathered | { unsatisfiable: true }> {
  const problem = searchProblem(cnf, registerOptions);
  const counted = await countSolutions(problem.counted);
  const exact = counted.ok;
  const M = exact ? Number(counted.solutions.count) * 2 ** counted.solutions.shift : 1;
  if (M === 0) return { unsatisfiable: true };
  const plan = planSearch(problem.n, M);
  // k as a double: exact below 2^53, and beyond that the model's times are estimates anyway;
  // Infinity past 2^1024 (log2Iterations keeps it).
  const k = plan.iterations === undefined ? 0 : plan.iterations.exact !== undefined ? Number(plan.iterations.exact) : 2 ** plan.iterations.log2;
  const log2k = plan.iterations === undefined ? -Infinity : plan.iterations.exact !== undefined ? Math.log2(Number(plan.iterations.exact)) : plan.iterations.log2;
  // A named construction (or one chosen within a budget) is costed by itself; else the strategy's row.
  const costs = construction !== undefined
    ? constructionSearchCost(cnf, construction, 1, plan.successProbability, uncompute, registerOptions)
    : searchCosts(cnf, 1, plan.successProbability, uncompute, registerOptions, strategy)[0]!;
  const work = (p: { t_count: number; t_depth: number; toffoli_count: number; cnot_count: number; depth: number }) => ({
    tCount: p.t_count, tDepth: p.t_depth, toffoliCount: p.toffoli_count, cnotCount: p.cnot_count, depth: p.depth,
  });
  const solutionsText = exact
    ? `M = ${M} from the exact ${problem.mode === "free" ? "count of register values that extend to a model" : "model count"}`
    : "M = 1 assumed (the count was out of reach)";
  const register = `${problem.n} search qubit${problem.n === 1 ? "" : "s"}, ${registerText(problem)}`;
  return {
    input: {
      logicalQubits: costs.circuit.qubits,
      oracle: work(costs.oracle),
      iteration: work(costs.circuit),
      iterations: k,
      successProbability: plan.successProbability,
      source: `clausegate: Clifford+T lowering of a one-iteration search circuit (${construction === undefined || construction === "wide" || construction === "lean" ? `strategy ${construction ?? strategy}` : `construction ${construction}`}, uncompute ${uncompute}, ${problem.mode} register${registerOptions.structure ? "" : ", no structure"}); k and P from the Grover plan over N = 2^${problem.n} with ${solutionsText} (Boyer, Brassard, Hoyer & Tapp 1998)`,
    },
    searchQubits: problem.n,
    register,
    solutions: M,
    solutionsSource: exact ? "exact" : "assumed",
    iterations: k,
    log2Iterations: log2k,
    successProbability: plan.successProbability,
  };
}

/**
 * Why there is no quantum estimate when k is beyond the range of a double: the magic states of
 * the expected search (k x the iteration's T-count / P) and the error each may have, in powers of
 * ten. Such a search needs each state below 10^-300 or so, hundreds of decades beyond every
 * tabulated protocol.
 */
function beyondDoubles(g: Gathered, m: Machine): string {
  const log10States = g.log2Iterations * Math.log10(2) + Math.log10(g.input.iteration.tCount) - Math.log10(g.successProbability);
  const log10Need = Math.log10(m.failureBudget / 2) - log10States;
  return `no quantum estimate: k = 2^${g.log2Iterations.toFixed(1)} iterations of ${g.input.iteration.tCount} T gates consume about 10^${log10States.toFixed(1)} magic states over the expected search, so each must fail with probability at most 10^${log10Need.toFixed(1)}, far beyond every tabulated distillation protocol (Litinski 2019, "Magic state distillation: not as costly as you think", Quantum 3:205, Table 1); plan and cost give the search's logical figures at this size`;
}

/** One file's result: the model's estimate (or why there is none) and the classical side. */
interface Row {
  readonly file: string;
  readonly variables: number;
  readonly clauses: number;
  readonly registerMode: RegisterMode;
  readonly gathered: Gathered | undefined;
  readonly forecast: Forecast | undefined;
  readonly limit: string | undefined;
  readonly rate: number;
  readonly measuredSeconds: number;
  readonly log10Evaluations: number | undefined;
  /** Undefined also when it exceeds a double (see log10ClassicalSeconds). */
  readonly classicalSeconds: number | undefined;
  readonly log10ClassicalSeconds: number | undefined;
  readonly solverSeconds: number | undefined;
  readonly assumptions: readonly Assumption[];
}

const num = (x: number | undefined): number | null => (x !== undefined && Number.isFinite(x) ? x : null);

function regimeJson(r: RegimeEstimate) {
  return {
    code_distance: r.codeDistance,
    factories: r.factories,
    physical_qubits: r.physicalQubits,
    t_layer_seconds: r.tLayerSeconds,
    state_seconds: r.stateSeconds,
    oracle_seconds: r.oracleSeconds,
    iteration_seconds: r.iterationSeconds,
    run_seconds: r.runSeconds,
    expected_seconds: r.expectedSeconds,
    expected_code_cycles: r.expectedCodeCycles,
    limited_by: r.limitedBy,
    logical_failure: { memory: r.logicalFailure.memory, magic_states: r.logicalFailure.magicStates, total: r.logicalFailure.total },
  };
}

function rowJson(r: Row) {
  const f = r.forecast?.ok ? r.forecast : undefined;
  const g = r.gathered;
  const w = (x: ForecastInput["oracle"]) => ({ t_count: x.tCount, t_depth: x.tDepth, toffoli_count: x.toffoliCount, cnot_count: x.cnotCount, depth: x.depth });
  const quantum = f?.reactionLimited.expectedSeconds;
  return {
    model: "a model, not a measurement: see assumptions",
    file: displayName(r.file),
    variables: r.variables,
    clauses: r.clauses,
    search_qubits: g ? g.searchQubits : null,
    register_mode: r.registerMode,
    solutions: g ? g.solutions : 0,
    solutions_source: g ? g.solutionsSource : "exact",
    iterations: g && Number.isFinite(g.iterations) ? g.iterations : null,
    iterations_log2: g ? num(g.log2Iterations) : null,
    success_probability: g ? g.successProbability : null,
    code_distance: f ? f.reactionLimited.codeDistance : null,
    physical_qubits: f ? f.reactionLimited.physicalQubits.total : null,
    factories: f ? f.reactionLimited.factories : null,
    run_seconds: f ? f.reactionLimited.runSeconds : null,
    expected_seconds: f ? f.reactionLimited.expectedSeconds : null,
    classical_expected_seconds: num(r.classicalSeconds),
    classical_expected_evaluations: r.log10Evaluations === undefined ? null : num(10 ** r.log10Evaluations),
    classical_expected_evaluations_log10: num(r.log10Evaluations),
    classical_expected_seconds_log10: num(r.log10ClassicalSeconds),
    classical_evaluations_per_second: r.rate,
    solver_seconds: num(r.solverSeconds),
    quantum_over_classical: quantum !== undefined && r.classicalSeconds ? num(quantum / r.classicalSeconds) : null,
    quantum_over_solver: quantum !== undefined && r.solverSeconds ? num(quantum / r.solverSeconds) : null,
    headline_regime: "reaction_limited",
    regimes: f ? { reaction_limited: regimeJson(f.reactionLimited), one_factory: regimeJson(f.oneFactory) } : null,
    logical: g
      ? {
          qubits: g.input.logicalQubits,
          routing_patches: f ? f.patches.routing : null,
          oracle: w(g.input.oracle),
          iteration: w(g.input.iteration),
          run: { t_count: g.iterations * g.input.iteration.tCount, t_depth: g.iterations * g.input.iteration.tDepth },
          expected_t_states: f ? f.expectedTStates : null,
        }
      : null,
    magic_state_protocol: f?.protocol
      ? {
          name: f.protocol.name, physical_error_rate: f.protocol.physicalErrorRate, output_error: f.protocol.outputError, qubits: f.protocol.qubits,
          code_cycles: f.protocol.codeCycles, needed_output_error: num(f.neededOutputError),
        }
      : null,
    model_limit: r.limit ?? null,
    assumptions: r.assumptions,
  };
}

/** "classical brute force is faster by a factor 2.0e+4 (quantum 4.08 ms, classical 205 ns)". */
function comparison(quantum: number, classical: number, what: string): string {
  const numbers = `quantum model ${formatSeconds(quantum)}, ${what} ${formatSeconds(classical)}`;
  if (quantum === classical) return `the quantum model and ${what} take the same time (${numbers})`;
  if (quantum === 0) return `the quantum model takes no time by its own rules (no T gate to run) (${numbers})`;
  return quantum < classical
    ? `the quantum model is faster than ${what} by a factor ${formatCount(classical / quantum)} (${numbers})`
    : `${what} is faster than the quantum model by a factor ${formatCount(quantum / classical)} (${numbers})`;
}

function regimeLines(f: Extract<Forecast, { ok: true }>): string[] {
  const a = f.reactionLimited;
  const b = f.oneFactory;
  const rows: [string, string, string][] = [
    ["code distance", String(a.codeDistance), String(b.codeDistance)],
    ["factories", String(a.factories), String(b.factories)],
    ["physical qubits: data", formatCount(a.physicalQubits.data), formatCount(b.physicalQubits.data)],
    ["  routing", formatCount(a.physicalQubits.routing), formatCount(b.physicalQubits.routing)],
    ["  factories", formatCount(a.physicalQubits.factories), formatCount(b.physicalQubits.factories)],
    ["  total", formatCount(a.physicalQubits.total), formatCount(b.physicalQubits.total)],
    ["time per oracle call", formatSeconds(a.oracleSeconds), formatSeconds(b.oracleSeconds)],
    ["time per iteration", formatSeconds(a.iterationSeconds), formatSeconds(b.iterationSeconds)],
    ["time per run (k iterations)", formatSeconds(a.runSeconds), formatSeconds(b.runSeconds)],
    ["expected until success (run / P)", formatSeconds(a.expectedSeconds), formatSeconds(b.expectedSeconds)],
    ["run bounded by", a.limitedBy === "t-depth" ? "T-depth x reaction" : a.limitedBy, b.limitedBy === "t-depth" ? "T-depth x reaction" : b.limitedBy],
    ["logical failure (expected search)", a.logicalFailure.total === 0 ? "0" : a.logicalFailure.total.toPrecision(2), b.logicalFailure.total === 0 ? "0" : b.logicalFailure.total.toPrecision(2)],
  ];
  const w0 = Math.max(...rows.map((r) => r[0].length));
  const w1 = Math.max("enough factories".length, ...rows.map((r) => r[1].length));
  return [
    `  ${"".padEnd(w0)}  ${"enough factories".padEnd(w1)}  one factory`,
    ...rows.map((r) => `  ${r[0].padEnd(w0)}  ${r[1].padEnd(w1)}  ${r[2]}`),
  ];
}

/** A value for people: 1e-6 rather than 0.000001, six digits at most. */
function valueText(v: number | string): string {
  if (typeof v === "string") return v;
  const a = Math.abs(v);
  return a !== 0 && (a < 1e-3 || a >= 1e9) ? Number(v.toPrecision(3)).toExponential() : String(Number(v.toPrecision(6)));
}

/** The assumptions, one line per source: neighbours with the same source share a line. */
function assumptionLines(list: readonly Assumption[]): string[] {
  const lines = ["assumptions (value: source):"];
  for (let i = 0; i < list.length; ) {
    let j = i + 1;
    while (j < list.length && list[j]!.source === list[i]!.source) j++;
    const values = list.slice(i, j).map((a) => `${a.name} = ${valueText(a.value)}`).join(", ");
    lines.push(`  - ${values}: ${list[i]!.source}`);
    i = j;
  }
  return lines;
}

function singleText(r: Row): string[] {
  const lines = [`forecast for ${displayName(r.file)}: A MODEL, NOT A MEASUREMENT; every assumption is listed below`];
  const g = r.gathered;
  if (g === undefined) lines.push(`  ${plural(r.variables, "variable")}, ${plural(r.clauses, "clause")}; ${r.limit}`);
  else {
    const i = g.input;
    lines.push(
      `  search register: ${g.register}`,
      `  N = 2^${g.searchQubits}; ${g.solutionsSource === "exact" ? `M = ${g.solutions} (exact count)` : "M unknown: M = 1 assumed"}; k = ${Number.isFinite(g.iterations) ? formatCount(g.iterations) : `2^${g.log2Iterations.toFixed(1)}`} iteration${g.iterations === 1 ? "" : "s"}, success probability ${g.successProbability.toPrecision(6)}`,
      `  one oracle call: T-count ${i.oracle.tCount}, T-depth ${i.oracle.tDepth}, Toffolis ${i.oracle.toffoliCount}, CNOTs ${i.oracle.cnotCount}`,
      `  one iteration: T-count ${i.iteration.tCount}, T-depth ${i.iteration.tDepth}; logical qubits ${i.logicalQubits}`,
    );
  }
  const f = r.forecast;
  if (f?.ok) {
    lines.push(
      `  routing patches ${f.patches.routing}; magic states over the expected search ${formatCount(f.expectedTStates)}` +
        (f.protocol ? `, each allowed to fail with probability ${f.neededOutputError!.toExponential(1)}` : ""),
    );
    if (f.protocol) lines.push(`  factory: ${f.protocol.name} (Litinski 2019, Table 1, p = ${f.protocol.physicalErrorRate}): ${f.protocol.qubits} qubits, ${f.protocol.codeCycles} code cycles per state, output error ${f.protocol.outputError}`);
    lines.push(...regimeLines(f));
  } else if (g !== undefined) lines.push(`  ${r.limit}`);
  if (r.log10ClassicalSeconds !== undefined) {
    lines.push(
      `  classical brute force: ${formatLog10Count(r.log10Evaluations!)} ${r.log10Evaluations === 0 ? "evaluation" : "evaluations"} expected (${g?.solutionsSource === "exact" ? "N/M" : "N: M unknown"}) at ${formatCount(Math.round(r.rate))} assignments/s ` +
        `(clausegate's bit-parallel evaluator on this formula, measured for ${r.measuredSeconds.toPrecision(2)} s): ${formatLog10Seconds(r.log10ClassicalSeconds)}`,
    );
  }
  if (r.solverSeconds !== undefined) lines.push(`  solver: ${formatSeconds(r.solverSeconds)} (given with --classical-time)`);
  if (f?.ok && r.classicalSeconds !== undefined) {
    for (const [regime, e] of [["enough factories", f.reactionLimited], ["one factory", f.oneFactory]] as const) {
      lines.push(`  comparison (${regime}): ${comparison(e.expectedSeconds, r.classicalSeconds, "classical brute force")}`);
      if (r.solverSeconds !== undefined) lines.push(`  comparison (${regime}): ${comparison(e.expectedSeconds, r.solverSeconds, "the solver")}`);
    }
  }
  lines.push(...assumptionLines(r.assumptions));
  return lines;
}

/** The fitted lines and crossovers of a family. */
interface FamilyFits {
  readonly fits: Record<string, LogLinearFit | undefined>;
  readonly crossovers: { quantum: string; against: string; crossover: Crossover; withinData: boolean }[];
}

function familyFits(rows: readonly Row[]): FamilyFits {
  const ok = rows.filter((r) => r.forecast?.ok);
  const est = (r: Row) => (r.forecast as Extract<Forecast, { ok: true }>);
  const fits: Record<string, LogLinearFit | undefined> = {
    reaction_limited: fitLogLinear(ok.map((r) => r.variables), ok.map((r) => est(r).reactionLimited.expectedSeconds)),
    one_factory: fitLogLinear(ok.map((r) => r.variables), ok.map((r) => est(r).oneFactory.expectedSeconds)),
    classical: fitLogLinear(rows.map((r) => r.variables), rows.map((r) => r.classicalSeconds ?? NaN)),
    solver: fitLogLinear(rows.map((r) => r.variables), rows.map((r) => r.solverSeconds ?? NaN)),
  };
  // "Within the data" means between sizes where both series have points.
  const sizes: Record<string, number[]> = {
    reaction_limited: ok.map((r) => r.variables),
    one_factory: ok.map((r) => r.variables),
    classical: rows.filter((r) => r.classicalSeconds !== undefined).map((r) => r.variables),
    solver: rows.filter((r) => r.solverSeconds !== undefined).map((r) => r.variables),
  };
  const crossovers: FamilyFits["crossovers"] = [];
  for (const q of ["reaction_limited", "one_factory"]) {
    for (const c of ["classical", "solver"]) {
      const a = fits[q];
      const b = fits[c];
      if (a === undefined || b === undefined) continue;
      const x = crossoverOf(a, b);
      const lo = Math.max(Math.min(...sizes[q]!), Math.min(...sizes[c]!));
      const hi = Math.min(Math.max(...sizes[q]!), Math.max(...sizes[c]!));
      if (x !== undefined) crossovers.push({ quantum: q, against: c, crossover: x, withinData: x.variables >= lo && x.variables <= hi });
    }
  }
  return { fits, crossovers };
}

const REGIME_WORDS: Record<string, string> = {
  reaction_limited: "quantum, enough factories",
  one_factory: "quantum, one factory",
  classical: "classical brute force",
  solver: "solver (given)",
};

function fitText(name: string, f: LogLinearFit | undefined): string {
  if (f === undefined) return `  ${REGIME_WORDS[name]}: no fit (fewer than two sizes)`;
  return `  ${REGIME_WORDS[name]}: log10(seconds) = ${f.intercept.toFixed(3)} + ${f.slope.toFixed(4)} n over ${f.points} points (rms residual ${f.rmsDecades.toFixed(2)} decades; ${(f.slope / Math.log10(2)).toFixed(3)} doublings per variable)`;
}

function crossoverText(c: FamilyFits["crossovers"][number]): string {
  const where = c.withinData ? "within the sizes given" : "extrapolated beyond the sizes given";
  return `  ${REGIME_WORDS[c.quantum]} drops below ${REGIME_WORDS[c.against]} at n = ${c.crossover.variables.toFixed(1)} variables, where both take ${formatSeconds(10 ** c.crossover.log10Seconds)} (fitted lines, ${where})`;
}

function familyText(rows: readonly Row[], fam: FamilyFits): string[] {
  const head = ["file", "vars", "M", "k", "d", "phys. qubits", "factories", "expected (enough f.)", "expected (one f.)", "classical brute force", "solver", "quantum/classical"];
  const body = rows.map((r) => {
    const f = r.forecast?.ok ? r.forecast : undefined;
    const g = r.gathered;
    return [
      displayName(r.file),
      String(r.variables),
      g ? (g.solutionsSource === "exact" ? String(g.solutions) : "1?") : "0",
      g ? (Number.isFinite(g.iterations) ? formatCount(g.iterations) : `2^${g.log2Iterations.toFixed(1)}`) : "-",
      f ? String(f.reactionLimited.codeDistance) : "-",
      f ? formatCount(f.reactionLimited.physicalQubits.total) : "-",
      f ? String(f.reactionLimited.factories) : "-",
      f ? formatSeconds(f.reactionLimited.expectedSeconds) : "-",
      f ? formatSeconds(f.oneFactory.expectedSeconds) : "-",
      r.log10ClassicalSeconds !== undefined ? formatLog10Seconds(r.log10ClassicalSeconds) : "-",
      r.solverSeconds !== undefined ? formatSeconds(r.solverSeconds) : "-",
      f && r.classicalSeconds ? formatCount(f.reactionLimited.expectedSeconds / r.classicalSeconds) : "-",
    ];
  });
  // The age-of-the-universe remark would widen the table: a star in the cell, a footnote below.
  const LONG = " (longer than the age of the universe)";
  let starred = false;
  for (const b of body) {
    for (let i = 0; i < b.length; i++) {
      if (b[i]!.endsWith(LONG)) {
        b[i] = `${b[i]!.slice(0, -LONG.length)}*`;
        starred = true;
      }
    }
  }
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i]!.length)));
  const line = (cells: string[]): string => cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join("  ");
  const lines = [
    `forecast for ${rows.length} formulas: A MODEL, NOT A MEASUREMENT; assumptions below (M "1?": unknown, 1 assumed; d, qubits and factories: enough-factories regime)`,
    line(head),
    ...body.map(line),
  ];
  if (starred) lines.push("* longer than the age of the universe (13.8 billion years)");
  for (const r of rows) if (r.limit !== undefined) lines.push(`${displayName(r.file)}: ${r.limit}`);
  lines.push("fits (least squares of log10 expected seconds on the number of variables n; lines extrapolate, they are not estimates):");
  for (const k of ["reaction_limited", "one_factory", "classical", "solver"]) if (k !== "solver" || rows.some((r) => r.solverSeconds !== undefined)) lines.push(fitText(k, fam.fits[k]));
  if (fam.crossovers.length === 0) lines.push("crossover: none: no quantum line drops below a classical line at a positive size");
  else lines.push("crossover:", ...fam.crossovers.map(crossoverText));
  // Assumptions shared by every row once; per-file inputs (logical counts, measured rate) are in --json.
  const first = rows.find((r) => r.forecast?.ok) ?? rows[0]!;
  const perFile = new Set(["search_register_variables", "logical_qubits", "iterations", "success_probability", "oracle_t_count", "oracle_t_depth", "iteration_t_count", "iteration_t_depth", "magic_state_protocol", "classical_evaluations_per_second", "classical_expected_evaluations", "solver_seconds"]);
  lines.push(...assumptionLines(first.assumptions.filter((a) => !perFile.has(a.name))));
  lines.push("  - per-file inputs (logical counts, k, P, factory protocol, the evaluator's measured rate): in --json, each with its source");
  return lines;
}

function plotOf(rows: readonly Row[], fam: FamilyFits, machine: Machine): string {
  const ok = rows.filter((r) => r.forecast?.ok);
  const est = (r: Row) => (r.forecast as Extract<Forecast, { ok: true }>);
  const fitOf = (k: string) => (fam.fits[k] ? { fit: { intercept: fam.fits[k]!.intercept, slope: fam.fits[k]!.slope } } : {});
  const series: ForecastPlotSeries[] = [
    { label: "quantum, enough factories (T-depth x reaction)", role: "quantum", points: ok.map((r) => ({ variables: r.variables, seconds: est(r).reactionLimited.expectedSeconds })), ...fitOf("reaction_limited") },
    { label: "quantum, one factory (T-count)", role: "quantum-one-factory", points: ok.map((r) => ({ variables: r.variables, seconds: est(r).oneFactory.expectedSeconds })), ...fitOf("one_factory") },
    { label: "classical brute force (measured rate x N/M)", role: "classical", points: rows.filter((r) => r.classicalSeconds !== undefined).map((r) => ({ variables: r.variables, seconds: r.classicalSeconds! })), ...fitOf("classical") },
  ];
  if (rows.some((r) => r.solverSeconds !== undefined)) {
    series.push({ label: "solver (given)", role: "solver", points: rows.filter((r) => r.solverSeconds !== undefined).map((r) => ({ variables: r.variables, seconds: r.solverSeconds! })), ...fitOf("solver") });
  }
  const notes = [
    `A MODEL, NOT A MEASUREMENT. Surface code: p = ${machine.physicalErrorRate}, cycle ${formatSeconds(machine.cycleSeconds)}, reaction ${formatSeconds(machine.reactionSeconds)}, failure budget ${machine.failureBudget},`,
    `p_L: ${LOGICAL_ERROR_MODELS[machine.logicalModel].citation}; 15-to-1 factories from Litinski 2019 (Table 1); routing: Litinski 2019 fast block.`,
    "Classical: N/M evaluations (N when M is unknown) at the rate of clausegate's bit-parallel evaluator, measured on each formula.",
    "Dashed: least-squares lines of log10(seconds) on n, extended beyond the data (an extrapolation):",
    ...["reaction_limited", "one_factory", "classical", "solver"].filter((k) => fam.fits[k]).map((k) => fitText(k, fam.fits[k]).trim()),
    ...fam.crossovers.map((c) => crossoverText(c).trim()),
    ...rows.filter((r) => r.limit !== undefined).map((r) => `No quantum point for ${displayName(r.file)}: ${r.limit!.replace(/^no quantum estimate: /, "").split(";")[0]}.`),
  ];
  return plotForecastSvg({
    title: `clausegate forecast: expected time to a solution, ${rows.length} formula${rows.length === 1 ? "" : "s"}`,
    series,
    crossovers: fam.crossovers.filter((c) => c.against === "classical" || c.against === "solver").map((c) => ({
      label: `crossover (${c.quantum === "reaction_limited" ? "enough factories" : "one factory"} vs ${c.against}): n = ${c.crossover.variables.toFixed(1)}`,
      variables: c.crossover.variables,
      log10Seconds: c.crossover.log10Seconds,
    })),
    notes,
  });
}

export async function forecastCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs("forecast", {
    args: argv,
    allowPositionals: true,
    options: {
      ...REGISTER_ARGS,
      strategy: { type: "string" }, basis: { type: "string" }, uncompute: { type: "string" },
      construction: { type: "string" }, "max-qubits": { type: "string" }, prefer: { type: "string" },
      "error-rate": { type: "string" }, "cycle-time": { type: "string" }, "reaction-time": { type: "string" },
      "failure-budget": { type: "string" }, "logical-model": { type: "string" }, "classical-time": { type: "string" },
      json: { type: "boolean" }, plot: { type: "string" }, help: { type: "boolean", short: "h" },
    },
  });
  if (values.help) {
    process.stdout.write(forecastHelp);
    return 0;
  }
  if (positionals.length === 0) throw new UserError("clausegate forecast: error: expected one or more input files (or - for standard input); hint: see clausegate forecast --help");
  if (positionals.filter((p) => p === "-").length > 1) throw new UserError("clausegate forecast: error: standard input (-) can be read only once; hint: name the files");
  // The oracle options as the other commands read them (--strategy against --construction, ...).
  const oracle: CliOracleOptions = oracleOptions(values, "free");
  const reg = { register: oracle.register, structure: oracle.structure };
  const strategy = oracle.strategy ?? "wide";
  const { uncompute, basis } = oracle;
  const chooses = oracle.maxQubits !== undefined || oracle.prefer !== undefined;
  const logicalModel = choice(values["logical-model"], "--logical-model", Object.keys(LOGICAL_ERROR_MODELS) as LogicalErrorModelName[], "fowler-gidney-2018");
  const machine: Partial<Machine> = {};
  const p = realOption(values["error-rate"], "--error-rate", MAX_TABULATED_ERROR_RATE, `${MAX_TABULATED_ERROR_RATE} (the distillation table's highest rate)`);
  if (p !== undefined) Object.assign(machine, { physicalErrorRate: p });
  const cycle = realOption(values["cycle-time"], "--cycle-time", 3600, "3600 seconds");
  if (cycle !== undefined) Object.assign(machine, { cycleSeconds: cycle });
  const reaction = realOption(values["reaction-time"], "--reaction-time", 3600, "3600 seconds");
  if (reaction !== undefined) Object.assign(machine, { reactionSeconds: reaction });
  const budget = realOption(values["failure-budget"], "--failure-budget", 0.5, "0.5");
  if (budget !== undefined) Object.assign(machine, { failureBudget: budget });
  if (values["logical-model"] !== undefined) Object.assign(machine, { logicalModel });
  let solver: number[] | undefined;
  if (values["classical-time"] !== undefined) {
    solver = values["classical-time"].split(",").map((s) => realOption(s.trim(), "--classical-time", Number.MAX_VALUE, "a finite number of seconds")!);
    if (solver.length !== positionals.length) {
      throw new UserError(`clausegate forecast: error: --classical-time gives ${solver.length} time${solver.length === 1 ? "" : "s"} for ${positionals.length} file${positionals.length === 1 ? "" : "s"}; hint: give one time per file, in order, separated by commas`);
    }
  }
  const full: Machine = { ...DEFAULT_MACHINE, ...machine };
  claimOutput("the forecast", "-");
  claimOutput("the plot", values.plot);

  const rows: Row[] = [];
  let unsatisfiable = false;
  for (const [i, file] of positionals.entries()) {
    const cnf = await loadCnf(file);
    checkCircuitSize(cnf, file, "forecast", reg.register);
    // The register's check (before a construction is chosen or anything costed) and the figures
    // plan the same formula: once (sharingPlans).
    let construction: string | undefined;
    const gathered = await sharingPlans(async () => {
      if (reg.register === "free") checkFreeRegister(searchProblem(cnf, reg).n, file, "forecast");
      construction = constructionFor(cnf, file, oracle, chooses);
      return forecastInputOf(cnf, strategy, uncompute, reg, construction);
    });
    const measured = measureEvaluationRate(cnf, MEASURE_SECONDS);
    const solverSeconds = solver?.[i];
    const extra: Assumption[] = [
      { name: "oracle_options", value: `${construction === undefined ? `strategy ${strategy}` : `construction ${construction}`}, uncompute ${uncompute}, basis ${basis}`, source: `${values.strategy || values.construction || values.uncompute || values.basis ? "given" : "default"}; the model always uses the Clifford+T lowering (a T gate consumes one magic state), whatever the basis` },
      ...constructionAssumptions(oracle, construction),
      {
        name: "search_register", value: `${reg.register}${reg.structure ? "" : ", no structure"}`,
        source: `${values.register !== undefined || values["no-structure"] ? "given" : "default (the free register, as clausegate plan and search)"}; ${reg.register === "free" ? "the variables left free by unit propagation and structure recovery; the oracle computes the others" : "every declared variable"}`,
      },
      ...("searchQubits" in gathered ? [{ name: "search_register_variables", value: gathered.register, source: "clausegate: the register of this formula" }] : []),
      { name: "classical_evaluations_per_second", value: measured.evaluationsPerSecond, source: `measured: clausegate's bit-parallel evaluator (evaluateWords, 32 assignments per call) on this formula for ${measured.seconds.toPrecision(2)} s on this machine` },
    ];
    if ("unsatisfiable" in gathered) {
      unsatisfiable = true;
      rows.push({
        file, variables: cnf.variables, clauses: clauseCount(cnf), registerMode: reg.register, gathered: undefined, forecast: undefined,
        limit: "the formula is unsatisfiable (exact model count 0): no number of iterations finds a solution, so there is nothing to estimate",
        rate: measured.evaluationsPerSecond, measuredSeconds: measured.seconds, log10Evaluations: undefined, classicalSeconds: undefined, log10ClassicalSeconds: undefined, solverSeconds,
        assumptions: [...extra, ...(solverSeconds !== undefined ? [{ name: "solver_seconds", value: solverSeconds, source: "given (--classical-time)" }] : [])],
      });
      continue;
    }
    // A k beyond the range of a double (a register of some 2,000 qubits or more): the model's
    // numbers cannot be formed, and the magic states it would need are read in logarithms.
    const forecast = Number.isFinite(gathered.iterations) ? forecastSearch(gathered.input, machine) : undefined;
    // Brute force over the same register the quantum search uses: N = 2^n register values.
    const log10Evaluations = gathered.searchQubits * Math.log10(2) - Math.log10(gathered.solutions);
    const log10ClassicalSeconds = log10Evaluations - Math.log10(measured.evaluationsPerSecond);
    const classicalSeconds = Number.isFinite(10 ** log10ClassicalSeconds) ? 10 ** log10ClassicalSeconds : undefined;
    const k2 = `2^${gathered.log2Iterations.toFixed(1)}`;
    rows.push({
      file, variables: cnf.variables, clauses: clauseCount(cnf), registerMode: reg.register, gathered, forecast,
      limit: forecast === undefined ? beyondDoubles(gathered, { ...DEFAULT_MACHINE, ...machine }) : forecast.ok ? undefined : `no quantum estimate: ${forecast.reason}; ${forecast.hint}`,
      rate: measured.evaluationsPerSecond, measuredSeconds: measured.seconds, log10Evaluations, classicalSeconds, log10ClassicalSeconds, solverSeconds,
      assumptions: [
        ...(forecast?.assumptions ?? inputAssumptions(gathered.input, machine, k2)),
        ...extra,
        {
          name: "classical_expected_evaluations", value: Number.isFinite(10 ** log10Evaluations) ? 10 ** log10Evaluations : `10^${log10Evaluations.toFixed(1)}`,
          source: `${gathered.solutionsSource === "exact" ? "N/M: random guessing with replacement, M from the exact count" : "N: M is unknown (the count was out of reach); the hardest case, M = 1"}; N = 2^${gathered.searchQubits} over the same search register as the quantum search (a value of the free register is completed, then checked)`,
        },
        ...(solverSeconds !== undefined ? [{ name: "solver_seconds", value: solverSeconds, source: "given (--classical-time)" }] : []),
      ],
    });
  }

  const fam = familyFits(rows);
  if (values.json) {
    const doc = rows.length === 1
      ? rowJson(rows[0]!)
      : {
          model: "a model, not a measurement: see each forecast's assumptions",
          forecasts: rows.map(rowJson),
          fits: Object.fromEntries(Object.entries(fam.fits).map(([k, f]) => [k, f ? { intercept: f.intercept, slope: f.slope, points: f.points, rms_decades: f.rmsDecades, of: "log10(expected seconds) = intercept + slope x variables, least squares" } : null])),
          crossovers: fam.crossovers.map((c) => ({ quantum: c.quantum, against: c.against, variables: c.crossover.variables, log10_seconds: c.crossover.log10Seconds, within_data: c.withinData, from: "fitted lines (an extrapolation)" })),
        };
    printLater(`${JSON.stringify(doc, null, 2)}\n`);
  } else {
    const text = rows.length === 1 ? singleText(rows[0]!) : familyText(rows, fam);
    printLater(`${text.join("\n")}\n`);
  }
  if (values.plot !== undefined) {
    const svg = plotOf(rows, fam, full);
    writeAtomic(values.plot, (w) => w(svg), "the plot");
  }
  return unsatisfiable ? EXIT_UNSATISFIABLE : 0;
}

/**
 * The construction a forecast costs: the one named, or (with --max-qubits or --prefer) the
 * cheapest whose one-iteration Clifford+T search circuit fits the budget, as clausegate search
 * settles it; undefined for the strategy's row. A budget nothing meets is a usage error naming the
 * smallest that works.
 */
function constructionFor(cnf: Cnf, file: string, o: CliOracleOptions, chooses: boolean): string | undefined {
  if (!chooses) {
    const named = o.construction === undefined ? undefined : parseConstruction(o.construction);
    if (typeof named === "string") throw new UserError(`clausegate forecast: error: ${named}; hint: see clausegate oracle --help for the construction names`);
    return o.construction;
  }
  const r = searchConstruction(cnf, { ...o, basis: "clifford+t", iterations: 1, measure: false });
  if (!r.ok) {
    const hint = r.smallestQubits === undefined ? "see clausegate oracle --help for the construction names" : `give --max-qubits ${r.smallestQubits} or more`;
    throw new UserError(`${displayName(file)}: error: ${r.message}; hint: ${hint}`);
  }
  return r.construction;
}

/** The budget options in the assumptions: the construction costed, and the budget and preference that chose it. */
function constructionAssumptions(o: CliOracleOptions, construction: string | undefined): Assumption[] {
  if (construction === undefined) return [];
  const chosen = o.construction === undefined;
  const budget = o.maxQubits !== undefined ? `whose one-iteration search circuit has at most ${o.maxQubits} logical qubits` : "among every candidate";
  return [
    {
      name: "construction", value: construction,
      source: chosen
        ? `chosen: the cheapest construction by ${o.prefer ?? "t-count"} ${budget} (Clifford+T, as clausegate search --max-qubits chooses it)`
        : `given (--construction)${o.maxQubits !== undefined ? ", its one-iteration search circuit checked against --max-qubits" : ""}`,
    },
    ...(o.maxQubits !== undefined ? [{ name: "max_logical_qubits", value: o.maxQubits, source: "given (--max-qubits): search, work qubits of the search circuit" }] : []),
    ...(o.prefer !== undefined ? [{ name: "prefer", value: o.prefer, source: "given (--prefer)" }] : []),
  ];
}
