/** `clausegate plan`, `clausegate search` and `clausegate draw`: the whole search, costed and pictured. */
import { parseArgs } from "node:util";
import {
  bbhtExpectedCalls, bbhtRounds, bbhtSequence, BBHT_LAMBDA, compileOracle, compileSearch, countModels, DEFAULT_COUNT_LIMIT,
  drawCircuitSvg, drawProblem, planSearch, plotSuccessSvg, reduceSearch,
  searchCosts, type Cnf, type Reduction, type SearchPlan,
} from "../index.js";
import { checkCircuitSize, displayName, loadCnf, UserError, writeAtomic } from "./io.js";
import { choice, intOption, oneInput, ORACLE_ARGS, ORACLE_HELP } from "./options.js";
import { checkFormat, oracleOptions, writeCircuit } from "./oracle.js";

/** Largest search register plan works with: 2^n must stay a finite double. */
const MAX_PLAN_QUBITS = 1000;

/** Exit code of `plan` when the formula has no solution. */
export const EXIT_UNSATISFIABLE = 3;

export const planHelp = `Usage: clausegate plan FILE|- [--solutions M|unknown] [--reduce] [--json] [--plot FILE.svg] [--simulate SEED]

Plans a Grover search for the formula (Boyer, Brassard, Hoyer & Tapp 1998). N = 2^n; M comes from
--solutions or, within ${DEFAULT_COUNT_LIMIT} variables occurring in clauses, from the exact model count. Prints theta
(sin^2 theta = M/N), the iteration count k = floor(pi/(4 theta)), the success probability
sin^2((2k+1) theta), the oracle calls expected until success (k/P, repeating on failure) and the
classical comparison. With M unknown: the round-by-round schedule for an unknown number of
solutions and its expected cost for a range of M.

Options:
  --solutions M|unknown   the number of solutions, if known
  --reduce                plan for the reduced search register (see clausegate search --help)
  --json                  print the plan as JSON
  --plot FILE.svg         plot the success probability against the number of iterations
  --simulate SEED         with M unknown: the iteration counts to run, round by round, drawn with SEED

Exit codes: 0, 3 when M = 0 (the formula is unsatisfiable; the numbers are still printed), 2 bad input.
`;

export const searchHelp = `Usage: clausegate search FILE|- [options]

Writes the complete search circuit: H on the search register, K iterations of the phase oracle and
the diffusion (reflection about the uniform superposition), then the search register measured into
outcome[0..n-1] (outcome[v-1] is variable v). Work qubits are shared by oracle and diffusion.

Options:
  --iterations K              Grover iterations (default: the plan's k)
  --solutions M               plan k for M solutions (default: the exact model count)
  --reduce                    take variables fixed by unit clauses and variables in no clause out of the
                              search register; the report maps every register bit to its variable
  -o, --output FILE           write here (atomically) instead of standard output
  --format qasm3|qasm2|json   output format (default qasm3)
${ORACLE_HELP}
  --report FILE               the whole-run report (JSON): plan, costs of one oracle, one diffusion and the
                              whole circuit, totals over the expected runs, wide and lean side by side
  -h, --help                  show this help
`;

export const drawHelp = `Usage: clausegate draw FILE|- -o FILE.svg [--search [--iterations K]] [oracle options]

Draws the oracle (or with --search the complete search circuit) as an SVG diagram: a filled dot is
a control on |1>, an open dot a control on |0>, a circled plus an X target, boxes single-qubit gates,
a meter a measurement. Refuses circuits too large to read.

Options:
  -o, --output FILE.svg       where to write the drawing (required)
  --search                    draw the search circuit instead of the oracle
  --iterations K              iterations of the drawn search (default: the plan's k)
${ORACLE_HELP}
`;

interface Solutions {
  readonly M: number | undefined;
  readonly source: "exact" | "given" | "unknown";
}

/** The problem to search: the formula, or its reduction. */
function problemOf(cnf: Cnf, reduce: boolean): { cnf: Cnf; reduction: Reduction | undefined } {
  if (!reduce) return { cnf, reduction: undefined };
  const reduction = reduceSearch(cnf);
  return { cnf: reduction.cnf, reduction };
}

async function solutionsOf(cnf: Cnf, raw: string | undefined): Promise<Solutions> {
  if (raw === "unknown") return { M: undefined, source: "unknown" };
  if (raw !== undefined) {
    const M = intOption(raw, "--solutions", 0, Number.MAX_SAFE_INTEGER)!;
    if (M > 2 ** cnf.variables) throw new UserError(`clausegate: error: --solutions ${M} exceeds 2^${cnf.variables} assignments`);
    return { M, source: "given" };
  }
  const r = await countModels(cnf);
  if (!r.ok || r.models > BigInt(Number.MAX_SAFE_INTEGER)) return { M: undefined, source: "unknown" };
  return { M: Number(r.models), source: "exact" };
}

const fmt = (x: number, digits = 6): string => (Number.isFinite(x) ? String(Number(x.toPrecision(digits))) : "infinite");

function planLines(file: string, n: number, s: Solutions, p: SearchPlan, reduction: Reduction | undefined): string[] {
  const N = 2 ** n;
  const lines = [
    `formula: ${displayName(file)}; search register: ${n} qubits, N = ${N}${reduction ? ` (reduced: ${reduction.fixed.size} fixed, ${reduction.free.length} free)` : ""}`,
    `solutions: M = ${s.M} (${s.source === "exact" ? "exact model count" : "given"})`,
    `theta: ${fmt(p.theta)} rad (sin^2 theta = M/N = ${fmt(s.M! / N)})`,
    `iterations: k = floor(pi / (4 theta)) = ${p.iterations}`,
    `success probability: sin^2((2k+1) theta) = ${fmt(p.successProbability, 10)}`,
    `expected oracle calls until success: ${fmt(p.expectedOracleCalls)} (k / P, repeating the run on failure)`,
    `classical: ${fmt(p.classicalExpectedEvaluations)} evaluations expected guessing at random (N/M); ${p.classicalWorstCase} in the worst case checking one by one`,
  ];
  if (p.verdict === "unsatisfiable") lines.push("verdict: the formula is unsatisfiable: no number of iterations finds a solution");
  if (p.verdict === "trivial") lines.push("verdict: every assignment is a solution: no search is needed");
  if (p.verdict === "classical") lines.push("verdict: more than 3/4 of all assignments are solutions: a classical random guess is cheaper than a search");
  return lines;
}

function unknownLines(file: string, n: number, seed: number | undefined): string[] {
  const rounds = bbhtRounds(n);
  const lines = [
    `formula: ${displayName(file)}; search register: ${n} qubits, N = ${2 ** n}; solutions: unknown`,
    `schedule for an unknown number of solutions (Boyer, Brassard, Hoyer & Tapp 1998), lambda = ${BBHT_LAMBDA}:`,
    "round r draws j uniformly from {0, ..., ceil(min(lambda^r, sqrt N)) - 1}, runs j iterations, measures and checks;",
    "on failure the next round follows (from the last row on, every round is like the last row)",
    "round  bound m     j drawn from",
    ...rounds.map((r) => `${String(r.round).padStart(5)}  ${fmt(r.bound, 5).padEnd(10)}  0..${r.choices - 1}`),
    "expected oracle calls of the schedule, by number of solutions M:",
  ];
  for (let M = 1; M <= 2 ** n && lines.length < 60; M *= 2) lines.push(`  M = ${M}: ${fmt(bbhtExpectedCalls(n, M))}`);
  if (seed !== undefined) lines.push(`iteration counts to run, rounds 0..${rounds.length + 9} (seed ${seed}): ${bbhtSequence(n, rounds.length + 10, seed).join(" ")}`);
  return lines;
}

export async function planCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: {
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
  const { cnf, reduction } = problemOf(await loadCnf(file), values.reduce === true);
  const n = cnf.variables;
  if (n > MAX_PLAN_QUBITS) throw new UserError(`${displayName(file)}: error: the search register would have ${n} qubits; plan works with at most ${MAX_PLAN_QUBITS} (N = 2^n must fit a double); hint: try --reduce, or declare only the variables the formula uses`);
  const s = await solutionsOf(cnf, values.solutions);
  if (s.M === undefined) {
    if (values.json) {
      process.stdout.write(`${JSON.stringify({
        variables: cnf.variables, search_qubits: n, solutions: null, solutions_source: "unknown", theta: null, iterations: null,
        success_probability: null, expected_oracle_calls: null, classical_expected_evaluations: null,
        schedule: bbhtRounds(n).map((r) => ({ round: r.round, bound: r.bound, choices: r.choices })),
        ...(seed !== undefined ? { sequence: bbhtSequence(n, bbhtRounds(n).length + 10, seed) } : {}),
      })}\n`);
    } else process.stdout.write(`${unknownLines(file, n, seed).join("\n")}\n`);
    if (values.plot !== undefined) throw new UserError("clausegate plan: error: --plot needs the number of solutions; give --solutions M");
    return 0;
  }
  const p = planSearch(n, s.M);
  if (values.json) {
    const num = (x: number): number | null => (Number.isFinite(x) ? x : null);
    process.stdout.write(`${JSON.stringify({
      variables: reduction ? reduction.searched.length + reduction.fixed.size + reduction.free.length : cnf.variables,
      search_qubits: n, solutions: s.M, solutions_source: s.source, theta: p.theta, iterations: p.iterations,
      success_probability: p.successProbability, expected_oracle_calls: num(p.expectedOracleCalls),
      classical_expected_evaluations: num(p.classicalExpectedEvaluations),
    })}\n`);
  } else process.stdout.write(`${planLines(file, n, s, p, reduction).join("\n")}\n`);
  if (values.plot !== undefined) {
    const svg = plotSuccessSvg(p.theta, p.iterations, `${displayName(file)}: M = ${s.M} of N = ${2 ** n}`);
    writeAtomic(values.plot, (w) => w(svg));
  }
  return p.verdict === "unsatisfiable" ? EXIT_UNSATISFIABLE : 0;
}

/** K from --iterations, --solutions or the exact count. */
async function iterationsFor(cnf: Cnf, rawK: string | undefined, rawM: string | undefined): Promise<{ K: number; plan: SearchPlan | undefined; source: string }> {
  if (rawK !== undefined) {
    const K = intOption(rawK, "--iterations", 0, 1 << 20)!;
    const s = rawM !== undefined ? await solutionsOf(cnf, rawM) : { M: undefined, source: "unknown" as const };
    return { K, plan: s.M === undefined ? undefined : planSearch(cnf.variables, s.M), source: s.source };
  }
  const s = await solutionsOf(cnf, rawM);
  if (s.M === undefined) throw new UserError(`clausegate: error: the number of solutions is unknown (more than ${DEFAULT_COUNT_LIMIT} variables to count); give --iterations K or --solutions M`);
  const plan = planSearch(cnf.variables, s.M);
  if (plan.verdict === "unsatisfiable") throw new UserError("clausegate: error: the formula is unsatisfiable: there is nothing to search for (give --iterations K to build the circuit anyway)", EXIT_UNSATISFIABLE);
  return { K: plan.iterations, plan, source: s.source };
}

export async function searchCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: {
      ...ORACLE_ARGS, iterations: { type: "string" }, solutions: { type: "string" }, reduce: { type: "boolean" },
      output: { type: "string", short: "o" }, format: { type: "string" }, report: { type: "string" }, help: { type: "boolean", short: "h" },
    },
  });
  if (values.help) {
    process.stdout.write(searchHelp);
    return 0;
  }
  const file = oneInput(positionals, "search");
  const format = choice(values.format, "--format", ["qasm3", "qasm2", "json"] as const, "qasm3");
  const o = oracleOptions(values);
  if (values.kind === "flag") throw new UserError("clausegate search: error: a search uses the phase oracle; drop --kind flag");
  const original = await loadCnf(file);
  checkCircuitSize(original, file, "search");
  const { cnf, reduction } = problemOf(original, values.reduce === true);
  const { K, plan, source } = await iterationsFor(cnf, values.iterations, values.solutions);
  const circuit = compileSearch(cnf, { ...o, iterations: K });
  checkFormat(circuit, format);
  const comments = [
    `clausegate search circuit: ${cnf.variables} search qubits, ${K} iteration${K === 1 ? "" : "s"}`,
    `strategy ${o.strategy}, basis ${o.basis}, uncompute ${o.uncompute}; outcome[i] holds vars[i]`,
    ...(reduction ? [`reduced search register: vars[i] is DIMACS variable ${reduction.searched.map((v, i) => `${i}->${v}`).join(" ") || "(none)"}`] : []),
  ];
  if (values.report !== undefined) {
    const report = wholeRunReport(original, cnf, K, plan, source, o.uncompute, reduction);
    writeAtomic(values.report, (w) => w(`${JSON.stringify(report, null, 2)}\n`));
  }
  writeCircuit(circuit, format, comments, values.output);
  return 0;
}

function wholeRunReport(original: Cnf, cnf: Cnf, K: number, plan: SearchPlan | undefined, source: string, uncompute: "unitary" | "measured", reduction: Reduction | undefined) {
  const P = plan ? planSearch(cnf.variables, plan.solutions).successProbability : NaN;
  const costs = searchCosts(cnf, K, Number.isFinite(P) ? P : 0, uncompute);
  const num = (x: number): number | null => (Number.isFinite(x) ? x : null);
  return {
    variables: original.variables,
    search_qubits: cnf.variables,
    iterations: K,
    plan: plan
      ? { solutions: plan.solutions, solutions_source: source, theta: plan.theta, optimal_iterations: plan.iterations, success_probability: plan.successProbability, expected_runs: num(1 / plan.successProbability) }
      : null,
    costs: costs.map((c) => ({ ...c, expected_runs: num(c.expected_runs), expected_t_count: num(c.expected_t_count), expected_toffoli_count: num(c.expected_toffoli_count), expected_depth: num(c.expected_depth) })),
    reduction: reduction
      ? {
          register: reduction.searched.map((v, i) => ({ bit: i, variable: v })),
          fixed: [...reduction.fixed].map(([variable, value]) => ({ variable, value })),
          free: reduction.free,
          completion: "a measured result gives the assignment: variable register[i].variable = outcome[i]; fixed variables take their value; free variables take any value (each choice is a solution)",
        }
      : null,
  };
}

export async function drawCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: { ...ORACLE_ARGS, output: { type: "string", short: "o" }, search: { type: "boolean" }, iterations: { type: "string" }, help: { type: "boolean", short: "h" } },
  });
  if (values.help) {
    process.stdout.write(drawHelp);
    return 0;
  }
  const file = oneInput(positionals, "draw");
  if (values.output === undefined) throw new UserError("clausegate draw: error: expected -o FILE.svg; see clausegate draw --help");
  const o = oracleOptions(values);
  const cnf = await loadCnf(file);
  checkCircuitSize(cnf, file, "draw");
  let circuit;
  let title: string;
  if (values.search) {
    const { K } = await iterationsFor(cnf, values.iterations, undefined);
    circuit = compileSearch(cnf, { ...o, iterations: K });
    title = `search for ${displayName(file)}: ${K} iteration${K === 1 ? "" : "s"}, ${o.strategy}, ${o.basis}, ${o.uncompute}`;
  } else {
    circuit = compileOracle(cnf, o).circuit;
    title = `${o.kind} oracle for ${displayName(file)}: ${o.strategy}, ${o.basis}, ${o.uncompute}`;
  }
  const problem = drawProblem(circuit);
  if (problem !== null) throw new UserError(`clausegate draw: error: refusing to draw: ${problem}`);
  const svg = drawCircuitSvg(circuit, title);
  writeAtomic(values.output, (w) => w(svg));
  return 0;
}
