/** `clausegate plan`, `clausegate search` and `clausegate draw`: the whole search, costed and pictured. */
import {
  bbhtExpectedCalls, bbhtLastRound, bbhtRounds, bbhtSequence, BBHT_LAMBDA, compileOracle, compileSearch, countSolutions, DEFAULT_COUNT_LIMIT,
  drawCircuitSvg, drawProblem, DRAW_LIMITS, EXACT_BITS, planSearch, plotSuccessSvg, searchCosts, constructionSearchCost,
  successAfterIterations, type BigCount, type Circuit, type Cnf, type OracleOptions, type ScheduleRound, type SearchPlan,
  type Solutions,
} from "../internal.js";
import { checkCircuitSize, checkFreeRegister, displayName, EXIT_UNSATISFIABLE, loadCnf, plural, progress, UserError, withProgress, writeAtomic } from "./io.js";
import { claimOutput, printLater } from "./output.js";
import {
  basicOptions, choice, compileWithOptions, constructionLabel, constructionPhrase, intOption, oneInput, ORACLE_ARGS, ORACLE_HELP, oracleOptions, REGISTER_ARGS,
  parseCommandArgs, registerHelp, registerOptions, settleSearchOptions, type CliOracleOptions,
} from "./options.js";
import { checkFormat, writeCircuit } from "./circuits.js";
import { registerJson, registerText, searchProblem, type SearchProblem } from "./register.js";
import { checkShots, completionLines, COMPLETE_ARGS, shotLines, SHOTS_HELP, shotsOptions } from "./shots.js";


/** Most Grover iterations `search` and `draw --search` build (2^20). */
const MAX_ITERATIONS = 1 << 20;

/**
 * Most gates of a search circuit `search` builds (and of each circuit its whole-run report costs):
 * about 100 bytes a gate at peak while lowering and optimizing, so about 1 GB.
 */
export const MAX_SEARCH_GATES = 10_000_000;

/** The oracle options without --kind (a search always uses the phase oracle). */
const SEARCH_ORACLE_HELP = ORACLE_HELP.split("\n").filter((line) => !line.trimStart().startsWith("--kind")).join("\n");

const NUMBERS_NOTE = `Whole numbers are exact: N, M, k and the classical worst case are printed in full below 2^${EXACT_BITS}
(with about 2^x beside large ones) and as about 2^x above it. In JSON, a whole number that a double
cannot hold exactly (above 2^53) is a decimal string, one above 2^${EXACT_BITS} is null, and every such
field has a log2_ twin (null for log2 of 0). theta and k come from the exact ratio M/N in BigInt fixed
point: k = floor(pi/(4 theta)) is exact (the precision is raised until the floor is certain), the
success probability and its complement have a relative error below 2^-40.`;

export const planHelp = `Usage: clausegate plan FILE|- [--register full|free] [--no-structure] [--solutions M|unknown] [--json] [--plot FILE.svg] [--simulate SEED]

Plans a Grover search for the formula (Boyer, Brassard, Hoyer & Tapp 1998), at any size. N = 2^n for a
search register of n qubits: by default the free register (the variables left free by unit propagation
and structure recovery; the others are computed from them), with --register full every declared
variable. M is the number of register values that extend to a model: from --solutions, or counted
exactly (free register: the models of the formula left by unit propagation, which correspond one to one
to those values; full register: the model count, each variable in no clause doubling it; the count
enumerates the free variables of the recovered structure, within ${DEFAULT_COUNT_LIMIT} of them). Prints theta
(sin^2 theta = M/N), the iteration count k = floor(pi/(4 theta)), the success probability
sin^2((2k+1) theta), the oracle calls expected until success (k/P, repeating on failure) and the
classical comparison. With M unknown: the round-by-round schedule for an unknown number of solutions
and its expected cost for a range of M.

${NUMBERS_NOTE}

Options:
${registerHelp("free")}
  --reduce                    an alias of --register free (the default; kept for existing scripts)
  --solutions M|unknown       register values that extend to a model, if known (a whole number up to 2^n)
  --json                      print the plan as JSON (snake_case keys); register_mode, structure,
                              register (the DIMACS variable of each search qubit, in order; null for a
                              full register above 2^20 qubits) and, for a free register, completion
                              (the rule, fixed values, definitions in order, other_variables)
  --plot FILE.svg             plot the success probability against the number of iterations
  --simulate SEED             with M unknown: the iteration counts to run, round by round, drawn with SEED
  -h, --help                  show this help

Exit codes: 0, 3 when M = 0 (the formula is unsatisfiable; the numbers are still printed), 2 bad input.
`;

export const searchHelp = `Usage: clausegate search FILE|- [options]

Writes the complete search circuit: H on the search register, K iterations of the phase oracle and
the diffusion (reflection about the uniform superposition), then the search register measured into
outcome[0..n-1] (outcome[i] is vars[i]). By default the search register is the free register: it
holds only the variables left free by unit propagation and structure recovery, and the oracle
computes the others; the circuit's comments and the report name the variable of each qubit. A
measured value completes to a model: register variables as measured, fixed variables their forced
value, defined variables computed in order, every other variable any value (0 chosen); --shots and
--complete print such completions. Work qubits are shared by oracle and diffusion. The circuit's
size is estimated from the formula and K before it is built; circuits above ${MAX_SEARCH_GATES} gates are
refused (clausegate plan gives the numbers at any size).

Options:
  --iterations K              Grover iterations, 0..${MAX_ITERATIONS} (default: the plan's k)
  --solutions M               register values that extend to a model: sets k, and with --iterations the
                              success probability of the report (default: counted exactly, as plan does)
${registerHelp("free")}
  --reduce                    an alias of --register free (the default; kept for existing scripts)
  -o, --output FILE           write here (atomically) instead of standard output
  --format qasm3|qasm2|json   output format (default qasm3)
${SEARCH_ORACLE_HELP}
  --report FILE               the whole-run report (JSON): plan, costs of one oracle, one diffusion and the
                              whole circuit of K iterations, totals over the runs expected at the success
                              probability of K iterations (sin^2((2K+1) theta)), wide and lean side by side
                              (and the circuit's own construction when it is another one);
                              register_mode, structure, register and completion as in clausegate plan --json
${SHOTS_HELP}
  -h, --help                  show this help

Exit codes: 0, 1 when a value given to --complete does not complete to a model, 2 bad input or a
circuit too large to build or simulate, 3 when the formula is unsatisfiable (or --solutions 0 says so)
and --iterations is not given (there is nothing to search for).
`;

export const drawHelp = `Usage: clausegate draw FILE|- -o FILE.svg [--search [--iterations K]] [oracle options]

Draws the oracle (or with --search the complete search circuit) as an SVG diagram: a filled dot is
a control on |1>, an open dot a control on |0>, a circled plus an X target, boxes single-qubit gates,
a meter a measurement. Refuses circuits too large to read (more than ${DRAW_LIMITS.qubits} qubits or ${DRAW_LIMITS.gates} gates), naming
options that would draw, when some do.

Options:
  -o, --output FILE.svg       where to write the drawing (required)
  --search                    draw the search circuit instead of the oracle
  --iterations K              iterations of the drawn search (with --search; default: the plan's k)
${ORACLE_HELP}
${registerHelp("full")}
  -h, --help                  show this help

Exit codes: 0, 2 bad input or a circuit too large to draw, 3 with --search when the formula is
unsatisfiable and --iterations is not given.
`;

/**
 * A double for people: `digits` significant digits below 10^digits, whole above it (the values
 * printed are accurate to far more digits than that), in exponent form from 10^15, and about 2^x
 * outside the range of a double.
 */
function real(x: number, log2: number, digits = 6): string {
  if (Number.isFinite(x) && x !== 0 && Math.abs(x) >= 1e-300) {
    if (Math.abs(x) < 10 ** digits) return String(Number(x.toPrecision(digits)));
    if (Math.abs(x) < 1e15) return String(Math.round(x));
    return `${x.toPrecision(digits)} (about 2^${Number(log2.toFixed(3))})`;
  }
  if (x === 0 && log2 === -Infinity) return "0";
  if (!Number.isFinite(log2)) return "infinite";
  return `about 2^${Number(log2.toFixed(3))}`;
}

/** A whole number for people: exact digits (with about 2^x beside large ones), or about 2^x. */
function whole(b: BigCount): string {
  if (b.exact !== undefined) return b.exact >= 1n << 64n ? `${b.exact} (about 2^${Number(b.log2.toFixed(3))})` : String(b.exact);
  return `about 2^${Number(b.log2.toFixed(3))}`;
}

/** N = 2^n with its digits when kept. */
function assignmentsText(n: number): string {
  if (n <= 64) return `N = ${n === 0 ? "1" : `2^${n} = ${1n << BigInt(n)}`}`;
  return n < EXACT_BITS ? `N = 2^${n} = ${1n << BigInt(n)}` : `N = 2^${n}`;
}

/** A whole number in JSON: a number when a double holds it exactly, a decimal string above 2^53, null above 2^1024. */
function jsonWhole(b: BigCount | undefined): number | string | null {
  if (b === undefined || b.exact === undefined) return null;
  return b.exact <= BigInt(Number.MAX_SAFE_INTEGER) ? Number(b.exact) : b.exact.toString();
}

/** A real or a logarithm in JSON: null when not finite. */
const jsonReal = (x: number | undefined): number | null => (x !== undefined && Number.isFinite(x) ? x : null);

interface Known {
  readonly M: Solutions;
  readonly source: "exact" | "given";
}
interface Unknown {
  readonly M: undefined;
  readonly source: "unknown";
  /** Why M is not known, for the text. */
  readonly why: string;
}
type SolutionsFound = Known | Unknown;

/** Parses --solutions M for a register of n qubits (any size: M is read as a BigInt). */
function givenSolutions(raw: string, n: number, command: string): bigint {
  if (!/^\d+$/.test(raw)) throw new UserError(`clausegate ${command}: error: --solutions expects a whole number or 'unknown' but got '${raw}'; hint: give the number of models, or unknown`);
  const M = BigInt(raw);
  const digits = M === 0n ? 0 : M.toString(2).length;
  if (digits > n + 1 || (digits === n + 1 && M !== 1n << BigInt(n))) {
    throw new UserError(`clausegate ${command}: error: --solutions ${raw} exceeds the ${n < 64 ? String(1n << BigInt(n)) : `2^${n}`} assignments of ${plural(n, "search qubit")}; hint: give a number in 0..${n < 64 ? String(1n << BigInt(n)) : `2^${n}`}`);
  }
  return M;
}

/**
 * M for the search register: --solutions, or the exact model count of the variables that occur
 * in clauses times 2^(variables in no clause), so a header of any size costs nothing. For a free
 * register the formula counted is the one left by unit propagation (SearchProblem.counted).
 */
async function solutionsOf(problem: SearchProblem, raw: string | undefined, command: string): Promise<SolutionsFound> {
  if (raw === "unknown") return { M: undefined, source: "unknown", why: "--solutions unknown" };
  if (raw !== undefined) return { M: givenSolutions(raw, problem.n, command), source: "given" };
  const bar = progress("counting models");
  const r = await countSolutions(problem.counted, { onProgress: bar.update });
  bar.stop();
  if (!r.ok) {
    return {
      M: undefined, source: "unknown",
      why: `${r.occurring} variables occur in clauses and the exact count stops at ${DEFAULT_COUNT_LIMIT}; give --solutions M if you know it`,
    };
  }
  return { M: r.solutions, source: "exact" };
}

/** Where M came from, for the text. */
function sourceText(s: Known, problem: SearchProblem): string {
  if (s.source === "given") return "given";
  return problem.mode === "free" ? "exact model count: register values that extend to a model" : "exact model count";
}

function planLines(file: string, problem: SearchProblem, s: Known, p: SearchPlan): string[] {
  const n = problem.n;
  const ratioLog2 = p.solutions.log2 - n;
  const lines = [
    `formula: ${displayName(file)}; search register: ${plural(n, "qubit")}, ${assignmentsText(n)}`,
    `register: ${registerText(problem)}`,
    `solutions: M = ${whole(p.solutions)} (${sourceText(s, problem)})`,
  ];
  if (p.verdict === "unsatisfiable") {
    lines.push(
      "theta: 0 rad (sin^2 theta = M/N = 0)",
      "iterations: none: with M = 0 no number of iterations finds a solution (theta = 0, so pi/(4 theta) is undefined)",
      "success probability: 0 for any number of iterations",
      "expected oracle calls until success: never (there is no solution)",
      `classical: guessing at random never succeeds; checking one by one tests ${p.classicalWorstCase.exact === 1n ? "the only assignment" : `all ${whole(p.classicalWorstCase)} assignments`} and finds none`,
      "verdict: the formula is unsatisfiable: no number of iterations finds a solution",
    );
    return lines;
  }
  const k = p.iterations!;
  const expected = real(p.classicalExpectedEvaluations, p.log2ClassicalExpectedEvaluations);
  const evaluations = `${expected} evaluation${expected === "1" ? "" : "s"}`;
  const failure = p.failureProbability === undefined
    ? `; 1 - P is at most M/N = ${real(2 ** ratioLog2, ratioLog2)}`
    : p.failureProbability > 0 && p.failureProbability < 1e-4 ? ` (1 - P = ${real(p.failureProbability, Math.log2(p.failureProbability))})` : "";
  lines.push(
    `theta: ${real(p.theta, p.log2Theta)} rad (sin^2 theta = M/N = ${real(2 ** ratioLog2, ratioLog2)})`,
    `iterations: k = floor(pi / (4 theta)) = ${whole(k)}`,
    `success probability: sin^2((2k+1) theta) = ${p.failureProbability === undefined ? "1" : real(p.successProbability, Math.log2(p.successProbability), 10)}${failure}`,
    `expected oracle calls until success: ${real(p.expectedOracleCalls, p.log2ExpectedOracleCalls)} (k / P, repeating the run on failure)`,
    `classical: ${evaluations} expected guessing at random (N/M); ${whole(p.classicalWorstCase)} in the worst case checking one by one (N - M + 1)`,
  );
  if (p.verdict === "trivial") lines.push("verdict: every assignment is a solution: no search is needed");
  if (p.verdict === "classical") lines.push("verdict: more than 3/4 of all assignments are solutions: a classical random guess is cheaper than a search");
  return lines;
}

function planJson(original: Cnf, problem: SearchProblem, s: Known, p: SearchPlan) {
  const n = problem.n;
  return {
    variables: original.variables,
    search_qubits: n,
    n_assignments: jsonWhole(p.assignments),
    log2_n_assignments: n,
    solutions: jsonWhole(p.solutions),
    log2_solutions: jsonReal(p.solutions.log2),
    solutions_source: s.source,
    theta: p.theta === 0 && p.verdict !== "unsatisfiable" ? null : p.theta,
    log2_theta: jsonReal(p.log2Theta),
    iterations: jsonWhole(p.iterations),
    log2_iterations: jsonReal(p.iterations?.log2),
    success_probability: p.successProbability,
    failure_probability: jsonReal(p.failureProbability),
    expected_oracle_calls: jsonReal(p.expectedOracleCalls),
    log2_expected_oracle_calls: jsonReal(p.log2ExpectedOracleCalls),
    classical_expected_evaluations: jsonReal(p.classicalExpectedEvaluations),
    log2_classical_expected_evaluations: jsonReal(p.log2ClassicalExpectedEvaluations),
    classical_worst_case: jsonWhole(p.classicalWorstCase),
    log2_classical_worst_case: jsonReal(p.classicalWorstCase.log2),
    verdict: p.verdict,
    precision_bits: p.precision,
    ...registerJson(problem),
  };
}

/** Rows of the schedule shown: all of them up to 80, else the first 64 and the last 8. */
function scheduleRows(n: number): { rows: ScheduleRound[]; omitted: [number, number] | undefined } {
  const last = bbhtLastRound(n);
  if (last < 80) return { rows: bbhtRounds(n), omitted: undefined };
  return { rows: [...bbhtRounds(n, 0, 64), ...bbhtRounds(n, last - 7, 8)], omitted: [64, last - 8] };
}

/** The M at which the schedule's expected cost is listed: every power of two up to N, or 25 spread evenly. */
function sampleExponents(n: number): number[] {
  if (n <= 24) return Array.from({ length: n + 1 }, (_, e) => e);
  return [...new Set(Array.from({ length: 25 }, (_, i) => Math.round((i * n) / 24)))];
}

/** Rounds of the seeded sequence: through 10 rounds past the last distinct one, at most 200. */
const sequenceRounds = (n: number): number => Math.min(bbhtLastRound(n) + 11, 200);

function powerOfTwoText(e: number): string {
  return e === 0 ? "1" : e <= 64 ? `2^${e} = ${1n << BigInt(e)}` : `2^${e}`;
}

function unknownLines(file: string, problem: SearchProblem, why: string, seed: number | undefined): string[] {
  const n = problem.n;
  const { rows, omitted } = scheduleRows(n);
  const last = bbhtLastRound(n);
  const lines = [
    `formula: ${displayName(file)}; search register: ${plural(n, "qubit")}, ${assignmentsText(n)}; solutions: unknown (${why})`,
    `register: ${registerText(problem)}`,
    `schedule for an unknown number of solutions (Boyer, Brassard, Hoyer & Tapp 1998), lambda = ${BBHT_LAMBDA}:`,
    "round r draws j uniformly from {0, ..., ceil(min(lambda^r, sqrt N)) - 1}, runs j iterations, measures and checks;",
    `on failure the next round follows (from round ${last} on, every round is like round ${last})`,
    "round  bound m     j drawn from",
  ];
  for (const r of rows) {
    if (omitted && r.round === omitted[1] + 1) lines.push(`  ... rounds ${omitted[0]}..${omitted[1]}: each bound is lambda times the one before`);
    const top = r.choices.exact !== undefined ? String(r.choices.exact - 1n) : `about 2^${Number(r.log2Bound.toFixed(3))}`;
    lines.push(`${String(r.round).padStart(5)}  ${real(r.bound, r.log2Bound, 5).padEnd(10)}  0..${top}`);
  }
  lines.push("expected oracle calls of the schedule, by number of solutions M:");
  for (const e of sampleExponents(n)) {
    const c = bbhtExpectedCalls(n, { count: 1n, shift: e });
    lines.push(`  M = ${powerOfTwoText(e)}: ${real(c.calls, c.log2Calls)}`);
  }
  if (seed !== undefined) {
    const seq = bbhtSequence(n, sequenceRounds(n), seed);
    lines.push(`iteration counts to run, rounds 0..${seq.length - 1} (seed ${seed}): ${seq.join(" ")}`);
  }
  return lines;
}

function unknownJson(original: Cnf, problem: SearchProblem, seed: number | undefined) {
  const n = problem.n;
  const { rows, omitted } = scheduleRows(n);
  return {
    variables: original.variables,
    search_qubits: n,
    n_assignments: jsonWhole({ exact: n < EXACT_BITS ? 1n << BigInt(n) : undefined, log2: n }),
    log2_n_assignments: n,
    solutions: null,
    solutions_source: "unknown",
    theta: null,
    iterations: null,
    success_probability: null,
    expected_oracle_calls: null,
    classical_expected_evaluations: null,
    schedule_growth: BBHT_LAMBDA,
    schedule_last_round: bbhtLastRound(n),
    schedule_omitted_rounds: omitted ? { first: omitted[0], last: omitted[1] } : null,
    schedule: rows.map((r) => ({
      round: r.round, bound: jsonReal(r.bound), log2_bound: r.log2Bound, choices: jsonWhole(r.choices), log2_choices: jsonReal(r.choices.log2),
    })),
    expected_oracle_calls_by_solutions: sampleExponents(n).map((e) => {
      const c = bbhtExpectedCalls(n, { count: 1n, shift: e });
      return {
        solutions: jsonWhole({ exact: e < EXACT_BITS ? 1n << BigInt(e) : undefined, log2: e }), log2_solutions: e,
        expected_oracle_calls: jsonReal(c.calls), log2_expected_oracle_calls: jsonReal(c.log2Calls),
      };
    }),
    ...(seed !== undefined ? { sequence: bbhtSequence(n, sequenceRounds(n), seed).map((j) => jsonWhole({ exact: j, log2: 0 })) } : {}),
    ...registerJson(problem),
  };
}

export async function planCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs("plan", {
    args: argv,
    allowPositionals: true,
    options: {
      ...REGISTER_ARGS,
      solutions: { type: "string" }, reduce: { type: "boolean" }, json: { type: "boolean" }, plot: { type: "string" },
      simulate: { type: "string" }, help: { type: "boolean", short: "h" },
    },
  });
  if (values.help) {
    process.stdout.write(planHelp);
    return 0;
  }
  const file = oneInput(positionals, "plan");
  const seed = intOption(values.simulate, "--simulate", 0, 2 ** 31 - 1);
  const reg = registerOptions(values, "free");
  claimOutput("the plan", "-");
  claimOutput("the plot", values.plot);
  const original = await loadCnf(file);
  const problem = searchProblem(original, reg);
  const n = problem.n;
  const s = await solutionsOf(problem, values.solutions, "plan");
  if (s.M === undefined) {
    // Checked before anything is printed: nothing reaches standard output before an error.
    if (values.plot !== undefined) throw new UserError(`clausegate plan: error: --plot needs the number of solutions, which is unknown (${s.why}); hint: give --solutions M`);
    if (values.json) process.stdout.write(`${JSON.stringify(unknownJson(original, problem, seed))}\n`);
    else process.stdout.write(`${unknownLines(file, problem, s.why, seed).join("\n")}\n`);
    return 0;
  }
  if (seed !== undefined) throw new UserError("clausegate plan: error: --simulate draws the schedule for an unknown number of solutions; hint: add --solutions unknown");
  const p = planSearch(n, s.M);
  if (values.plot !== undefined) {
    const svg = plotSuccessSvg(p.theta, p.iterations ?? 0, `${displayName(file)}: M = ${whole(p.solutions)} of ${assignmentsText(n)}`, { successProbability: p.successProbability });
    writeAtomic(values.plot, (w) => w(svg), "the plot");
  }
  if (values.json) process.stdout.write(`${JSON.stringify(planJson(original, problem, s, p))}\n`);
  else process.stdout.write(`${planLines(file, problem, s, p).join("\n")}\n`);
  return p.verdict === "unsatisfiable" ? EXIT_UNSATISFIABLE : 0;
}

interface Iterations {
  /** Iterations to build. */
  readonly K: number;
  /** M, when known (for the report). */
  readonly solutions: SolutionsFound | undefined;
  /** The plan for M, when known. */
  readonly plan: SearchPlan | undefined;
}

/**
 * K from --iterations, or the plan's k for M from --solutions or the exact count. M is also
 * found with --iterations when `needM` (the whole-run report prices K iterations at their own
 * success probability).
 */
async function iterationsFor(problem: SearchProblem, rawK: string | undefined, rawM: string | undefined, command: string, needM: boolean): Promise<Iterations> {
  if (rawK !== undefined) {
    const K = intOption(rawK, "--iterations", 0, MAX_ITERATIONS)!;
    if (!needM && rawM === undefined) return { K, solutions: undefined, plan: undefined };
    const s = await solutionsOf(problem, rawM, command);
    return { K, solutions: s, plan: s.M === undefined ? undefined : planSearch(problem.n, s.M) };
  }
  const s = await solutionsOf(problem, rawM, command);
  if (s.M === undefined) throw new UserError(`clausegate ${command}: error: the number of solutions is unknown (${s.why}); hint: give --iterations K or --solutions M`);
  const plan = planSearch(problem.n, s.M);
  if (plan.verdict === "unsatisfiable") {
    const why = s.source === "given" ? "--solutions 0 says no assignment satisfies the formula" : "the formula is unsatisfiable";
    throw new UserError(`clausegate ${command}: error: ${why}: there is nothing to search for; hint: give --iterations K to build the circuit anyway`, EXIT_UNSATISFIABLE);
  }
  const k = plan.iterations!;
  if (k.exact === undefined || k.exact > BigInt(MAX_ITERATIONS)) {
    throw new UserError(`clausegate ${command}: error: the plan's k = ${whole(k)} iterations is more than clausegate ${command} builds (${MAX_ITERATIONS} at most); hint: clausegate plan gives the numbers at any size, or give --iterations K for a shorter search`);
  }
  return { K: Number(k.exact), solutions: s, plan };
}

/** A search circuit's size estimated from one iteration: gates(0) + K (gates(1) - gates(0)). */
interface SizeEstimate {
  readonly gates: number;
  readonly qubits: number;
  readonly perIteration: number;
  readonly base: number;
}

function estimateSearch(cnf: Cnf, o: Omit<OracleOptions, "kind">, K: number): SizeEstimate {
  const c0 = compileSearch(cnf, { ...o, iterations: 0 });
  if (K === 0) return { gates: c0.gates, qubits: c0.qubits, perIteration: 0, base: c0.gates };
  const c1 = compileSearch(cnf, { ...o, iterations: 1 });
  const perIteration = Math.max(1, c1.gates - c0.gates);
  return { gates: c0.gates + K * perIteration, qubits: c1.qubits, perIteration, base: c0.gates };
}

/** Most iterations whose estimated circuit stays within `limit` gates. */
const iterationsWithin = (e: SizeEstimate, limit: number): number => Math.max(0, Math.floor((limit - e.base) / e.perIteration));

/**
 * Refuses, before building, a search circuit above MAX_SEARCH_GATES: first from a lower bound
 * that needs no compilation (each iteration has a diffusion of at least 2n + 2 gates), then from
 * the size of one compiled iteration; with a report, also the Clifford+T circuits it costs.
 */
function checkSearchSize(file: string, cnf: Cnf, n: number, o: CliOracleOptions, K: number, report: boolean): void {
  const hint = (fits: number): string => `hint: ${fits > 0 ? `--iterations ${fits} or fewer fits` : "no number of iterations fits"}, or clausegate plan ${displayName(file)} gives the numbers only`;
  const lower = K * (2 * n + 2) + 2 * n;
  if (lower > MAX_SEARCH_GATES) {
    throw new UserError(`clausegate search: error: ${plural(K, "iteration")} on ${plural(n, "search qubit")} make a circuit of more than ${lower} gates; clausegate search builds at most ${MAX_SEARCH_GATES}; ${hint(iterationsWithin(estimateSearch(cnf, o, 1), MAX_SEARCH_GATES))}`);
  }
  if (K < 3) return; // at most about three oracles: as cheap to build as to estimate
  const e = estimateSearch(cnf, o, K);
  if (e.gates > MAX_SEARCH_GATES) {
    throw new UserError(`clausegate search: error: the circuit would have about ${e.gates} gates on ${plural(e.qubits, "qubit")} (${plural(K, "iteration")} of about ${e.perIteration} gates); clausegate search builds at most ${MAX_SEARCH_GATES}; ${hint(iterationsWithin(e, MAX_SEARCH_GATES))}`);
  }
  if (!report) return;
  const named = o.construction !== undefined && o.construction !== "wide" && o.construction !== "lean" ? [o.construction] : [];
  for (const strategy of ["wide", "lean", ...named]) {
    const choice: { strategy: "wide" | "lean" } | { construction: string } = strategy === "wide" || strategy === "lean" ? { strategy } : { construction: strategy };
    const ct = estimateSearch(cnf, { ...basicOptions(o), ...choice, basis: "clifford+t" }, K);
    if (ct.gates > MAX_SEARCH_GATES) {
      throw new UserError(`clausegate search: error: the report costs the ${strategy} Clifford+T circuit of about ${ct.gates} gates (${plural(K, "iteration")}); clausegate search costs at most ${MAX_SEARCH_GATES}; ${hint(iterationsWithin(ct, MAX_SEARCH_GATES))} (or leave out --report)`);
    }
  }
}

export async function searchCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs("search", {
    args: argv,
    allowPositionals: true,
    options: {
      ...ORACLE_ARGS, ...REGISTER_ARGS, ...COMPLETE_ARGS, iterations: { type: "string" }, solutions: { type: "string" }, reduce: { type: "boolean" },
      output: { type: "string", short: "o" }, format: { type: "string" }, report: { type: "string" }, help: { type: "boolean", short: "h" },
    },
  });
  if (values.help) {
    process.stdout.write(searchHelp);
    return 0;
  }
  const file = oneInput(positionals, "search");
  const format = choice(values.format, "--format", ["qasm3", "qasm2", "json"] as const, "qasm3");
  if (values.kind !== undefined) throw new UserError("clausegate search: error: --kind is not an option of search: a search always uses the phase oracle; hint: leave out --kind");
  let o = oracleOptions(values, "free");
  const sampling = shotsOptions(values);
  // With --shots the circuit is written only where -o says: a format for no file is a mistake.
  if (sampling.shots !== undefined && values.output === undefined && values.format !== undefined) {
    throw new UserError("clausegate search: error: --format sets the circuit file's format, but with --shots the circuit is written only with -o; hint: add -o FILE to write the circuit, or leave out --format");
  }
  if (values.solutions === "unknown") throw new UserError("clausegate search: error: --solutions unknown cannot set k; hint: give --iterations K (clausegate plan --solutions unknown prints a schedule)");
  // Every output that goes to standard output is claimed before any is written.
  if (sampling.complete !== undefined) claimOutput("the completions", "-");
  else {
    if (sampling.shots !== undefined) claimOutput("the shots", "-");
    claimOutput("the report", values.report);
    claimOutput("the circuit", sampling.shots !== undefined ? values.output : values.output ?? "-");
  }
  const original = await loadCnf(file);
  if (o.register === "full") checkCircuitSize(original, file, "search");
  const problem = searchProblem(original, o);
  checkFreeRegister(problem.n, file, "search");
  if (sampling.complete !== undefined) {
    // Values measured elsewhere: completed and checked; nothing is built.
    const r = completionLines(file, original, problem, sampling.complete);
    printLater(`${r.lines.join("\n")}\n`);
    return r.allModels ? 0 : 1;
  }
  const { K, solutions, plan } = await iterationsFor(problem, values.iterations, values.solutions, "search", values.report !== undefined);
  o = settleSearchOptions(original, o, "search");
  checkSearchSize(file, original, problem.n, o, K, values.report !== undefined);
  if (sampling.shots !== undefined) checkShots(file, original, problem, o, K, sampling.shots);
  const circuit = withProgress("compiling", (onProgress) => compileSearch(original, { ...o, iterations: K, onProgress }));
  checkFormat(circuit, format);
  const comments = [
    `clausegate search circuit: ${plural(problem.n, "search qubit")}, ${plural(K, "iteration")}`,
    `${constructionPhrase(constructionLabel(o))}, basis ${o.basis}, uncompute ${o.uncompute}${o.structure ? "" : ", no structure"}; outcome[i] holds vars[i]`,
    `search register: ${registerText(problem, true)}`,
    ...(problem.mode === "free" ? ["a measured value completes to a model: register variables as measured, fixed ones forced, defined ones computed in order, others 0 (clausegate search --complete BITS)"] : []),
  ];
  if (values.report !== undefined) {
    const report = wholeRunReport(original, problem, K, solutions, plan, o);
    writeAtomic(values.report, (w) => w(`${JSON.stringify(report, null, 2)}\n`), "the report");
  }
  if (sampling.shots !== undefined) {
    // The shots go to standard output; the circuit only where -o says.
    const lines = shotLines(file, original, problem, o, K, sampling.shots, sampling.seed);
    if (values.output !== undefined) writeCircuit(circuit, format, comments, values.output);
    printLater(`${lines.join("\n")}\n`);
    return 0;
  }
  writeCircuit(circuit, format, comments, values.output);
  return 0;
}

/**
 * The whole-run report: the costs of one run of K iterations, and their totals over the runs
 * expected at the success probability of those K iterations, sin^2((2K+1) theta), with theta from
 * M (--solutions or the exact count). K need not be the plan's k.
 */
function wholeRunReport(original: Cnf, problem: SearchProblem, K: number, s: SolutionsFound | undefined, plan: SearchPlan | undefined, o: CliOracleOptions) {
  const built = s?.M !== undefined ? successAfterIterations(problem.n, s.M, K) : undefined;
  const costOptions = { register: o.register, structure: o.structure };
  // Wide and lean always; the circuit's own construction beside them when it is another one.
  const other = o.construction !== undefined && o.construction !== "wide" && o.construction !== "lean" ? o.construction : undefined;
  const costs = [
    ...searchCosts(original, K, built?.success ?? 0, o.uncompute, costOptions),
    ...(other !== undefined ? [constructionSearchCost(original, other, K, built?.success ?? 0, o.uncompute, costOptions)] : []),
  ];
  const runsLog2 = built ? -built.log2Success : Infinity;
  return {
    variables: original.variables,
    search_qubits: problem.n,
    iterations: K,
    plan: plan && built && s?.M !== undefined
      ? {
          solutions: jsonWhole(plan.solutions),
          log2_solutions: jsonReal(plan.solutions.log2),
          solutions_source: s.source,
          theta: plan.theta,
          log2_theta: jsonReal(plan.log2Theta),
          optimal_iterations: jsonWhole(plan.iterations),
          optimal_success_probability: plan.successProbability,
          iterations: K,
          success_probability: built.success,
          failure_probability: built.failure,
          expected_runs: jsonReal(built.success > 0 ? 1 / built.success : Infinity),
          log2_expected_runs: jsonReal(runsLog2),
        }
      : null,
    plan_note: plan
      ? plan.verdict === "unsatisfiable" ? "M = 0: no run succeeds, so the expected totals are null" : null
      : `the number of solutions is unknown (${s?.M === undefined && s ? s.why : "not counted"}), so the expected totals are null; give --solutions M`,
    costs: costs.map((c) => ({
      ...c,
      expected_runs: jsonReal(c.expected_runs),
      expected_t_count: jsonReal(c.expected_t_count),
      expected_toffoli_count: jsonReal(c.expected_toffoli_count),
      expected_depth: jsonReal(c.expected_depth),
    })),
    // The circuit's construction (costed above beside wide and lean when it is another one).
    construction: constructionLabel(o),
    ...registerJson(problem),
  };
}

/**
 * Option sets tried when a drawing is refused, each with the flags that select it. A construction
 * the options fix (by name or budget) stays; otherwise the strategy varies too.
 */
function drawCandidates(o: CliOracleOptions): { options: CliOracleOptions; flags: string[] }[] {
  const out: { options: CliOracleOptions; flags: string[] }[] = [];
  const fixed = o.construction !== undefined || o.maxQubits !== undefined || o.prefer !== undefined;
  // A construction settled by a budget is drawn as it is (another basis only ever needs fewer qubits).
  const { maxQubits: _budget, ...base } = o;
  const current = o.strategy ?? "wide";
  // The free register leaves out variables that unit propagation fixes or the formula defines.
  for (const register of o.register === "full" ? (["full", "free"] as const) : [o.register]) {
    for (const strategy of fixed ? [undefined] : (["wide", "lean"] as const)) {
      for (const basis of ["mcx", "toffoli", "clifford+t"] as const) {
        for (const uncompute of ["unitary", "measured"] as const) {
          const flags = [
            ...(register !== o.register ? [`--register ${register}`] : []),
            ...(strategy !== undefined && strategy !== current ? [`--strategy ${strategy}`] : []),
            ...(basis !== o.basis ? [`--basis ${basis}`] : []),
            ...(uncompute !== o.uncompute ? [`--uncompute ${uncompute}`] : []),
          ];
          if (flags.length > 0) out.push({ options: { ...(o.construction !== undefined ? base : o), register, ...(strategy !== undefined ? { strategy } : {}), basis, uncompute }, flags });
        }
      }
    }
  }
  return out.sort((a, b) => a.flags.length - b.flags.length);
}

const fits = (c: Circuit): boolean => drawProblem(c) === null;

/**
 * Options that draw what was refused, computed by compiling the alternatives (only for formulas
 * whose search register fits a diagram): fewest changed options first, then fewest gates; for a
 * search also fewer iterations.
 */
function drawSuggestion(cnf: Cnf, n: number, o: CliOracleOptions, search: boolean, K: number): string {
  const none = search
    ? `no strategy, basis or number of iterations draws it within ${DRAW_LIMITS.qubits} qubits and ${DRAW_LIMITS.gates} gates; clausegate plan and clausegate cost give the numbers`
    : `no strategy, basis or uncomputation draws it within ${DRAW_LIMITS.qubits} qubits and ${DRAW_LIMITS.gates} gates; clausegate cost gives the numbers, or draw a smaller formula`;
  if (n > DRAW_LIMITS.qubits) return none;
  const found: { flags: string[]; circuit: Circuit }[] = [];
  const fewest = (): number => Math.min(Infinity, ...found.map((f) => f.flags.length));
  const build = (opts: CliOracleOptions, k: number): Circuit => (search ? compileSearch(cnf, { ...opts, iterations: k }) : compileOracle(cnf, opts).circuit);
  // K iterations above the diffusion's lower bound fit with no option set: do not build them (K may be 2^20).
  const tooManyIterations = search && K * (2 * n + 2) + 2 * n > DRAW_LIMITS.gates;
  for (const c of tooManyIterations ? [] : drawCandidates(o)) {
    if (c.flags.length > fewest()) break;
    const circuit = build(c.options, K);
    if (fits(circuit)) found.push({ flags: c.flags, circuit });
  }
  if (search && found.length === 0 && K > 1) {
    // Fewer iterations: the most that fit with each option set, checked by building it.
    for (const c of [{ options: o, flags: [] as string[] }, ...drawCandidates(o)]) {
      if (c.flags.length + 1 > fewest()) break;
      const e = estimateSearch(cnf, c.options, 1);
      let k = Math.min(K - 1, iterationsWithin(e, DRAW_LIMITS.gates));
      let circuit: Circuit | undefined;
      for (; k >= 1; k--) {
        circuit = build(c.options, k);
        if (fits(circuit)) break;
      }
      if (k >= 1 && circuit) found.push({ flags: [...c.flags, `--iterations ${k}`], circuit });
    }
  }
  if (found.length === 0) return none;
  const best = found.sort((a, b) => a.flags.length - b.flags.length || a.circuit.gates - b.circuit.gates)[0]!;
  return `${best.flags.join(" ")} draws it (${plural(best.circuit.qubits, "qubit")}, ${plural(best.circuit.gates, "gate")})`;
}

export async function drawCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs("draw", {
    args: argv,
    allowPositionals: true,
    options: { ...ORACLE_ARGS, ...REGISTER_ARGS, output: { type: "string", short: "o" }, search: { type: "boolean" }, iterations: { type: "string" }, help: { type: "boolean", short: "h" } },
  });
  if (values.help) {
    process.stdout.write(drawHelp);
    return 0;
  }
  const file = oneInput(positionals, "draw");
  if (values.output === undefined) throw new UserError("clausegate draw: error: expected -o FILE.svg; hint: name the drawing's file, e.g. -o oracle.svg");
  if (values.iterations !== undefined && values.search !== true) throw new UserError("clausegate draw: error: --iterations sets the iterations of a search; hint: add --search, or leave out --iterations to draw the oracle");
  let o = oracleOptions(values);
  if (values.search && o.kind === "flag") throw new UserError("clausegate draw: error: a search uses the phase oracle; hint: leave out --kind flag, or leave out --search to draw the flag oracle");
  claimOutput("the drawing", values.output);
  const cnf = await loadCnf(file);
  const what = values.search ? "search circuit" : "oracle";
  const register = searchProblem(cnf, o);
  const n = register.n;
  // Sizes first: the search register alone is one qubit per register variable.
  if (n > DRAW_LIMITS.qubits) {
    const free = o.register === "full" ? ", or --register free" : "";
    throw new UserError(`clausegate draw: error: refusing to draw: the ${what} has at least ${n} qubits (one per ${o.register === "full" ? "variable" : "variable of the free register"}); diagrams stay readable up to ${DRAW_LIMITS.qubits} qubits and ${DRAW_LIMITS.gates} gates; hint: draw a formula with at most ${DRAW_LIMITS.qubits} ${o.register === "full" ? "variables" : "free variables"}${free}, or clausegate cost ${displayName(file)} for the numbers`);
  }
  checkCircuitSize(cnf, file, "draw", o.register);
  let circuit: Circuit;
  let title: string;
  let K = 0;
  const registerWords = o.register === "free" ? `, free register of ${plural(n, "qubit")}` : "";
  if (values.search) {
    K = (await iterationsFor(register, values.iterations, undefined, "draw", false)).K;
    const lower = K * (2 * n + 2) + 2 * n;
    if (lower > DRAW_LIMITS.gates) {
      throw new UserError(`clausegate draw: error: refusing to draw: ${plural(K, "iteration")} on ${plural(n, "qubit")} make more than ${lower} gates; diagrams stay readable up to ${DRAW_LIMITS.gates} gates; hint: ${drawSuggestion(cnf, n, o, true, K)}`);
    }
    o = settleSearchOptions(cnf, o, "draw");
    circuit = compileSearch(cnf, { ...o, iterations: K });
    title = `search for ${displayName(file)}: ${plural(K, "iteration")}, ${constructionLabel(o)}, ${o.basis}, ${o.uncompute}${registerWords}`;
  } else {
    const oracle = compileWithOptions(cnf, o, "draw");
    // Suggestions keep the construction chosen, with the budget that chose it.
    const { prefer: _prefer, strategy: _strategy, ...rest } = o;
    o = { ...rest, construction: oracle.options.construction };
    circuit = oracle.circuit;
    title = `${o.kind} oracle for ${displayName(file)}: ${oracle.options.construction}, ${o.basis}, ${o.uncompute}${registerWords}`;
  }
  const problem = drawProblem(circuit);
  if (problem !== null) throw new UserError(`clausegate draw: error: refusing to draw: ${problem}; hint: ${drawSuggestion(cnf, n, o, values.search === true, K)}`);
  const svg = drawCircuitSvg(circuit, title);
  writeAtomic(values.output, (w) => w(svg), "the drawing");
  return 0;
}
