/** `clausegate oracle` and `clausegate cost`: compile a formula, write the circuit, report its costs. */
import {
  chooseAmong, constructionRow, costConstructions, costFront, costTables, oracleResources, plotFrontSvg, reduceSearch, registerOf, sharingPlans, type Cnf, type ConstructionCost,
  type CostRow, type Oracle, type RegisterMode,
} from "../internal.js";
import { checkCheckSize, checkCircuitSize, checkFreeRegister, displayName, loadCnf, plural, progress, UserError, writeAtomic } from "./io.js";
import { claimOutput } from "./output.js";
import { checkLines, runCheck, VERIFY_ARGS, verifyFlags } from "./checking.js";
import { checkFormat, FORMATS, writeCircuit, type Format } from "./circuits.js";
import {
  choice, compileWithOptions, constructionPhrase, intOption, oneInput, ORACLE_ARGS, ORACLE_HELP, oracleOptions, parseCommandArgs, REGISTER_ARGS, registerHelp,
  registerOptions,
} from "./options.js";
import { problemOfOracle, registerJson, registerText, searchProblem, structureJson, structureText, type SearchProblem } from "./register.js";

export const oracleHelp = `Usage: clausegate oracle FILE|- [options]

Compiles a DIMACS CNF formula into a quantum oracle and writes it (OpenQASM 3 by default). The
search register vars holds the variables (vars[v-1] is DIMACS variable v; with --register free only
the free variables, vars[i] being the i-th variable listed in the circuit's comments and in the
report's register), work holds work qubits (returned to |0>), target the flag oracle's output qubit.
Gate definitions, parity constraints and one-hot groups recovered from the clauses (clausegate
structure) are compiled natively: checked against their variables with a full register, computed
into work qubits with a free one; --no-structure compiles the clauses alone.

Options:
  -o, --output FILE           write here (atomically) instead of standard output
  --format qasm3|qasm2|json   output format (default qasm3)
${ORACLE_HELP}
${registerHelp("full")}
  --report FILE               also write the resource report (JSON); register lists the DIMACS variable
                              of each search qubit, register_mode and structure the options, recovered
                              what structure recovery gave, completion (free register) how a register
                              value completes to a model
  --verify                    verify the oracle first (as clausegate verify: simulation in reach, else a
                              proof); write only if it passes; takes verify's --exhaustive-limit,
                              --samples, --models, --conflict-limit, --proof-seconds, --seed and --sample
                              (which refuse to be given without --verify or --prove)
  --prove                     prove the oracle first (as clausegate verify --prove, any size); write only
                              if the proof succeeds; takes --conflict-limit and --proof-seconds (the
                              simulation's options and --verify are refused with it)
  -h, --help                  show this help
Exit codes: 0 written, 1 --verify or --prove failed (nothing written), 2 bad input or usage.
`;

export const costHelp = `Usage: clausegate cost FILE|- [--kind phase|flag] [--register full|free] [--no-structure] [--threads 1|2] [--json]
       clausegate cost FILE|- --max-qubits Q [--prefer t-count|t-depth] [--uncompute U] [--kind K] [--register R] [--no-structure] [--json]
       clausegate cost FILE|- --front [--json] [--plot FILE.svg] [--kind K] [--uncompute U] [--basis B] [--register R] [--no-structure]

Prints what an oracle for the formula costs, one row per strategy and uncomputation, with the
structure recovered from the clauses (gate definitions, parities, one-hot groups compiled natively)
and without it (the clause construction alone), and a textbook reference row (a clause bit per
clause, V-chains of 7-T Toffolis). Qubits, T-count, T-depth, CNOTs and depth are those of the
Clifford+T circuit; Toffolis those of the toffoli basis; all after work-qubit reuse and the optimizer
passes, exactly as clausegate oracle emits them. The figures are counted without building the
circuits (memory for a few numbers per qubit); a row the counting cannot make exact says so ("upper
bound"; "exact": false in --json). When recovery finds nothing, the rows with structure would repeat
those without it and are left out (said in a note; "recovered": {"used": false} in --json).

With --max-qubits: the construction clausegate oracle --max-qubits Q builds, one row per
uncomputation (or the one given). With --front: every construction clausegate knows for the
formula (wide, lean, blocks of clauses at one to three levels, held clauses, fan-out copies) is
counted, and the non-dominated points (no other has at most as many qubits, T gates and T-depth
and fewer of one) are printed with the oracle arguments that reproduce each exactly. Counting
every candidate takes as long as some hundred oracles.

Options:
  --kind phase|flag           the oracle's kind (default phase)
${registerHelp("full")}
                              (without --front or --max-qubits, cost shows the rows without structure
                              only; with them, the constructions of the clauses alone)
  --json                      print JSON: variables, clauses, kind, register_mode, register (the DIMACS
                              variable of each search qubit), recovered, rows (each with structure:
                              true|false); --front: points, each with qubits, t_count, t_depth,
                              construction, options; and the references
  --threads 1|2               threads counting the table (default 2 on a machine with two cores or more;
                              the table's runs are shared between them: on a million clauses about a
                              third less wait for half again the peak memory; 1 for the lower peak)
  --max-qubits Q              the cheapest construction within Q qubits; exit 2 naming the smallest Q that works
  --prefer t-count|t-depth    what cheapest means (default t-count; ties: the other, then qubits)
  --front                     the cost front (qubits, T-count, T-depth)
  --plot FILE.svg             with --front: T-count and T-depth against qubits, wide, lean and textbook marked
  --uncompute unitary|measured
                              with --front or --max-qubits: the uncomputation counted (--front: default
                              measured, which never costs more T; --max-qubits: both unless given)
  --basis mcx|toffoli|clifford+t
                              with --front: the basis the points' arguments name (default clifford+t, whose
                              emitted circuit has exactly the figures; the figures are Clifford+T's anyway)
  -h, --help                  show this help
Exit codes: 0, 2 bad input or usage.
`;

function describe(o: Oracle, cnf: Cnf): string[] {
  const { kind, construction, basis, uncompute } = o.options;
  return [
    `clausegate ${kind} oracle: ${plural(o.variables, "variable")}, ${plural(o.clauses, "clause")}`,
    `${constructionPhrase(construction)}, basis ${basis}, uncompute ${uncompute}${o.options.optimize ? "" : ", not optimized"}`,
    `search register: ${registerText(problemOfOracle(cnf, o), true)}`,
    `structure: ${structureText(o.structure)}`,
  ];
}

function noteSimplification(o: Oracle, file: string): void {
  const s = o.simplification;
  const parts: string[] = [];
  if (s.duplicateLiterals) parts.push(`${s.duplicateLiterals} duplicate literal${s.duplicateLiterals > 1 ? "s" : ""}`);
  if (s.tautologies) parts.push(`${s.tautologies} tautolog${s.tautologies > 1 ? "ies" : "y"}`);
  if (s.repeated) parts.push(`${s.repeated} repeated clause${s.repeated > 1 ? "s" : ""}`);
  if (s.subsumed) parts.push(`${s.subsumed} subsumed clause${s.subsumed > 1 ? "s" : ""}`);
  if (parts.length > 0) process.stderr.write(`${displayName(file)}: note: simplified before synthesis: removed ${parts.join(", ")}\n`);
  if (!s.subsumptionComplete) process.stderr.write(`${displayName(file)}: note: the subsumption check stopped at its work budget\n`);
}

export async function oracleCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs("oracle", {
    args: argv,
    allowPositionals: true,
    options: {
      ...ORACLE_ARGS,
      ...REGISTER_ARGS,
      output: { type: "string", short: "o" },
      format: { type: "string" },
      report: { type: "string" },
      verify: { type: "boolean" },
      ...VERIFY_ARGS,
      help: { type: "boolean", short: "h" },
    },
  });
  if (values.help) {
    process.stdout.write(oracleHelp);
    return 0;
  }
  const flags = verifyFlags(values);
  if (!values.verify && !values.prove) {
    const unused = (["exhaustive-limit", "samples", "models", "conflict-limit", "proof-seconds", "seed", "sample"] as const).find((k) => values[k] !== undefined);
    if (unused !== undefined) {
      throw new UserError(`clausegate oracle: error: --${unused} shapes the check that --verify or --prove runs, and neither is given; hint: add --verify (or --prove), or leave out --${unused}`);
    }
  }
  if (values.prove && values.sample) {
    throw new UserError("clausegate oracle: error: --prove and --sample ask for a proof and for sampling only; hint: give one of them");
  }
  if (values.prove && values.verify) {
    throw new UserError("clausegate oracle: error: --prove and --verify ask for a proof and for a simulation (or a proof where none is in reach); hint: give one of them");
  }
  if (values.prove) {
    // A proof takes only a conflict budget: the simulation's options would be silently ignored.
    const unused = (["exhaustive-limit", "samples", "models", "seed"] as const).find((k) => values[k] !== undefined);
    if (unused !== undefined) {
      throw new UserError(`clausegate oracle: error: --${unused} shapes the simulation that --verify runs, and --prove runs none; hint: use --verify instead, or leave out --${unused}`);
    }
  }
  const file = oneInput(positionals, "oracle");
  const format = choice(values.format, "--format", FORMATS, "qasm3");
  const options = oracleOptions(values);
  claimOutput("the report", values.report);
  claimOutput("the circuit", values.output ?? "-");
  const cnf = await loadCnf(file);
  checkCircuitSize(cnf, file, "oracle", options.register);
  if (values.verify || values.prove) checkCheckSize(cnf, file, values.prove ? "oracle --prove" : "oracle --verify");
  // The free register's size before anything is built; the compilation plans the same (sharingPlans).
  const oracle = sharingPlans(() => {
    if (options.register === "free") checkFreeRegister(registerOf(cnf, options).register.length, file, "oracle");
    return compileWithOptions(cnf, options, "oracle");
  });
  noteSimplification(oracle, file);
  const completionOf = options.register === "free" ? oracle.completion : undefined;
  if (values.prove) {
    const r = await runCheck(cnf, oracle.circuit, { ...flags, mode: "prove" }, options.kind, completionOf);
    process.stderr.write(`${checkLines(r, file).join("\n")}\n`);
    if (!r.ok) {
      process.stderr.write(r.proof?.counterexample
        ? "clausegate oracle: error: the oracle failed its proof; nothing was written; hint: please report this with the input\n"
        : "clausegate oracle: error: the oracle was not proven; nothing was written; hint: raise --conflict-limit or --proof-seconds, or use --verify to check it by simulation\n");
      return 1;
    }
  } else if (values.verify) {
    // As clausegate verify: exhaustive simulation when in reach, else a proof (--sample: sampling).
    const r = await runCheck(cnf, oracle.circuit, flags, options.kind, completionOf);
    process.stderr.write(`${checkLines(r, file).join("\n")}\n`);
    if (!r.ok) {
      process.stderr.write(r.proof?.counterexample ?? r.simulation?.counterexample
        ? "clausegate oracle: error: the oracle failed verification; nothing was written; hint: please report this with the input\n"
        : "clausegate oracle: error: the verification was inconclusive; nothing was written; hint: raise --conflict-limit or --exhaustive-limit, or write without --verify\n");
      return 1;
    }
  }
  writeOracle(oracle, cnf, format, values.output, values.report);
  return 0;
}

/** Writes the circuit (and report) of an oracle. */
export function writeOracle(oracle: Oracle, cnf: Cnf, format: Format, output?: string, report?: string): void {
  checkFormat(oracle.circuit, format);
  if (report !== undefined) {
    const r = oracleResources(cnf, oracle);
    const { register_mode, structure, completion } = registerJson(problemOfOracle(cnf, oracle));
    const doc = { ...r, register_mode, structure, recovered: structureJson(oracle.structure), completion };
    writeAtomic(report, (w) => w(`${JSON.stringify(doc, null, 2)}\n`), "the report");
  }
  writeCircuit(oracle.circuit, format, describe(oracle, cnf), output);
}

export async function costCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs("cost", {
    args: argv,
    allowPositionals: true,
    options: {
      kind: { type: "string" }, ...REGISTER_ARGS, json: { type: "boolean" }, front: { type: "boolean" }, plot: { type: "string" }, "max-qubits": { type: "string" },
      prefer: { type: "string" }, uncompute: { type: "string" }, basis: { type: "string" }, threads: { type: "string" }, help: { type: "boolean", short: "h" },
    },
  });
  if (values.help) {
    process.stdout.write(costHelp);
    return 0;
  }
  const file = oneInput(positionals, "cost");
  const kind = choice(values.kind, "--kind", ["phase", "flag"], "phase");
  const reg = registerOptions(values, "full");
  if (values.plot !== undefined && !values.front) throw new UserError("clausegate cost: error: --plot draws the cost front; hint: add --front");
  if (values.front && values["max-qubits"] !== undefined) throw new UserError("clausegate cost: error: --front lists every budget's best point and --max-qubits one budget's; hint: give one of them");
  if (values.prefer !== undefined && values["max-qubits"] === undefined) throw new UserError("clausegate cost: error: --prefer chooses within --max-qubits; hint: add --max-qubits Q (or see every point with --front)");
  if (values.basis !== undefined && !values.front) throw new UserError("clausegate cost: error: --basis only names the basis in --front's arguments (the figures are those of the Clifford+T circuit); hint: add --front or leave out --basis");
  if (values.uncompute !== undefined && !values.front && values["max-qubits"] === undefined) {
    throw new UserError("clausegate cost: error: the table shows both uncomputations; hint: leave out --uncompute, or add --front or --max-qubits");
  }
  const uncompute = values.uncompute === undefined ? undefined : choice(values.uncompute, "--uncompute", ["unitary", "measured"] as const, "measured");
  const basis = values.basis === undefined ? undefined : choice(values.basis, "--basis", ["mcx", "toffoli", "clifford+t"] as const, "clifford+t");
  const maxQubits = intOption(values["max-qubits"], "--max-qubits", 1, 1 << 30);
  const threads = intOption(values.threads, "--threads", 1, 2);
  if (threads !== undefined && (values.front || maxQubits !== undefined)) throw new UserError("clausegate cost: error: --threads shares the table's runs; --front and --max-qubits count on one thread; hint: leave out --threads");
  const prefer = choice(values.prefer, "--prefer", ["t-count", "t-depth"] as const, "t-count");
  claimOutput("the cost front", "-");
  claimOutput("the plot", values.plot);
  const cnf = await loadCnf(file);
  checkCircuitSize(cnf, file, "cost", reg.register);
  // The register lines and both tables plan the same formula: once each (sharingPlans).
  return sharingPlans(async () => {
    if (reg.register === "free") checkFreeRegister(registerOf(cnf, reg).register.length, file, "cost");
    const head = `${kind} oracle for ${displayName(file)}: ${plural(cnf.variables, "variable")}, ${plural(cnf.clauseStart.length - 1, "clause")}`;
    if (values.front) return frontCommand(cnf, file, head, { kind, uncompute: uncompute ?? "measured", basis: basis ?? "clifford+t", json: values.json === true, plot: values.plot, ...reg });
    if (maxQubits !== undefined) return budgetCommand(cnf, head, { kind, uncompute, maxQubits, prefer, json: values.json === true, ...reg });
    // What recovery gives (the register too): rows with structure only when it gives something.
    const withStructure = reg.structure ? registerOf(cnf, { register: reg.register, structure: true }) : undefined;
    const recovered = withStructure?.structure ?? null;
    const both = recovered !== null && recovered.used;
    // A free register differs with and without structure (recovery computes defined variables).
    const plainRegister = both && reg.register === "full" ? withStructure! : registerOf(cnf, { register: reg.register, structure: false });
    const bar = progress("costing");
    let rows: (CostRow & { structure: boolean })[];
    try {
      // Both tables' runs shared between two threads where there are two cores. The textbook
      // reference is the same circuit either way: counted once, with the plain rows.
      const tables = await costTables(cnf, kind, [
        ...(both ? [{ register: reg.register, structure: true, textbook: false }] : []),
        { register: reg.register, structure: false },
      ], { onProgress: (f) => bar.update(f), ...(threads !== undefined ? { threads } : {}) });
      const structured = both ? tables[0]! : [];
      const plain = tables[tables.length - 1]!;
      rows = [
        ...structured.map((r) => ({ ...r, structure: true })),
        ...plain.map((r) => ({ ...r, structure: false })),
      ];
    } finally {
      bar.stop();
    }
    const problemOf = (plan: typeof plainRegister, structure: boolean): SearchProblem => reg.register === "full"
      ? { mode: "full", structure, n: cnf.variables, variables: cnf.variables, plan: undefined, counted: cnf }
      : { mode: "free", structure, n: plan.register.length, variables: cnf.variables, plan, counted: reduceSearch(cnf).cnf };
    // The registers of the rows: with structure (when shown) and without.
    // Without structure rows (none recovered), the one register line says recovery ran, unless it was off.
    const problems = [...(both ? [problemOf(withStructure!, true)] : []), problemOf(plainRegister, both ? false : reg.structure)];
    const clauses = cnf.clauseStart.length - 1;
    if (values.json) {
      const lists = problems.map((p) => registerJson(p).register);
      const doc = {
        variables: cnf.variables, clauses, kind, register_mode: reg.register, register: lists[0],
        ...(both && reg.register === "free" ? { register_without_structure: lists[1] } : {}),
        recovered: structureJson(recovered), rows,
      };
      process.stdout.write(`${JSON.stringify(doc, null, 2)}\n`);
      return 0;
    }
    // A column for rows whose figures are upper bounds, only when there is one.
    const bounds = rows.some((r) => !r.exact);
    const headCells = ["strategy", "uncompute", "structure", "qubits", "Toffolis", "T-count", "T-depth", "CNOTs", "depth", ...(bounds ? ["figures"] : [])];
    const body = rows.map((r) => [
      ...[r.strategy, r.uncompute, r.strategy === "textbook" ? "-" : r.structure ? "yes" : "no", r.qubits, r.toffoli_count, r.t_count, r.t_depth, r.cnot_count, r.depth].map(String),
      ...(bounds ? [r.exact ? "exact" : "upper bound"] : []),
    ]);
    process.stdout.write(`${head}\n`);
    for (const p of reg.register === "free" ? problems : problems.slice(0, 1)) {
      const which = reg.register === "free" && both ? (p.structure ? " (rows with structure)" : " (rows without structure)") : "";
      process.stdout.write(`search register${which}: ${p.n} qubit${p.n === 1 ? "" : "s"}, ${registerText(p)}\n`);
    }
    process.stdout.write(`structure: ${structureText(recovered)}${recovered !== null && !recovered.used ? " (the rows with structure would repeat those below)" : ""}\n`);
    process.stdout.write(`${table(headCells, body, (i) => i < 3)}\n`);
    return 0;
  });
}

/** Lines of a table: columns where `left(i)` left-aligned, the others right-aligned. */
function table(head: string[], body: string[][], left: (column: number) => boolean): string {
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i]!.length)));
  const line = (cells: string[]): string => cells.map((c, i) => (left(i) ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join("  ").trimEnd();
  return [line(head), ...body.map(line)].join("\n");
}

/** `cost --front`: the non-dominated constructions, as a table, JSON or a plot. */
/** The register options of a cost run. */
interface RegisterChoice {
  readonly register: RegisterMode;
  readonly structure: boolean;
}

/** The register line of `cost --front` and `cost --max-qubits`, and its JSON fields (the oracle's register and what recovery gave). */
function registerOfCost(cnf: Cnf, o: RegisterChoice): { text: string; json: Record<string, unknown> } {
  const p = searchProblem(cnf, o);
  const recovered = o.structure ? registerOf(cnf, o).structure : null;
  const { register_mode, register } = registerJson(p);
  return {
    text: `search register: ${p.n} qubit${p.n === 1 ? "" : "s"}, ${registerText(p)}\nstructure: ${structureText(recovered)}`,
    json: { register_mode, register, recovered: structureJson(recovered) },
  };
}

function frontCommand(cnf: Cnf, file: string, head: string, o: RegisterChoice & { kind: "phase" | "flag"; uncompute: "unitary" | "measured"; basis: string; json: boolean; plot: string | undefined }): number {
  const bar = progress("costing constructions");
  let front;
  try {
    front = costFront(cnf, { kind: o.kind, uncompute: o.uncompute, basis: o.basis, register: o.register, structure: o.structure, onProgress: bar.update });
  } finally {
    bar.stop();
  }
  if (o.plot !== undefined) {
    const svg = plotFrontSvg({
      title: `cost front: ${displayName(file)} (${o.kind}, ${o.uncompute} uncomputation, ${o.register} register${o.structure ? "" : ", no structure"}, Clifford+T)`,
      points: front.points,
      candidates: front.candidates,
      references: [front.references.wide, front.references.lean, front.references.textbook].map((r) => ({ label: r.construction, qubits: r.qubits, t_count: r.t_count, t_depth: r.t_depth })),
    });
    writeAtomic(o.plot, (w) => w(svg), "the plot");
  }
  const reg = registerOfCost(cnf, o);
  if (o.json) {
    const ref = (r: ConstructionCost) => ({ construction: r.construction, qubits: r.qubits, t_count: r.t_count, t_depth: r.t_depth });
    const { wide, lean, textbook } = front.references;
    process.stdout.write(`${JSON.stringify({
      variables: cnf.variables, clauses: cnf.clauseStart.length - 1, kind: o.kind, uncompute: o.uncompute, points: front.points,
      references: { wide: ref(wide), lean: ref(lean), textbook: ref(textbook) }, ...reg.json,
    }, null, 2)}\n`);
    return 0;
  }
  const rows = front.points.map((p) => [String(p.qubits), String(p.t_count), String(p.t_depth), p.construction, p.options]);
  process.stdout.write(`${head}\n${reg.text}\ncost front: ${front.points.length} of ${front.candidates.length} constructions are not dominated (${o.uncompute} uncomputation; Clifford+T figures)\n`);
  process.stdout.write(`${table(["qubits", "T-count", "T-depth", "construction", "oracle arguments"], rows, (i) => i >= 3)}\n`);
  return 0;
}

/** `cost --max-qubits`: the construction chosen within the budget, per uncomputation. */
function budgetCommand(cnf: Cnf, head: string, o: RegisterChoice & { kind: "phase" | "flag"; uncompute: "unitary" | "measured" | undefined; maxQubits: number; prefer: "t-count" | "t-depth"; json: boolean }): number {
  const modes = o.uncompute === undefined ? (["unitary", "measured"] as const) : [o.uncompute];
  const bar = progress("costing constructions");
  const rows = [];
  try {
    for (const uncompute of modes) {
      const choice = chooseAmong(costConstructions(cnf, { kind: o.kind, uncompute, register: o.register, structure: o.structure }), o.maxQubits, o.prefer);
      if (!choice.ok) {
        throw new UserError(`clausegate cost: error: no construction fits in ${plural(o.maxQubits, "qubit")}; the smallest (${choice.smallest.construction}) needs ${choice.smallestQubits}; hint: give --max-qubits ${choice.smallestQubits} or more`);
      }
      rows.push(constructionRow(cnf, o.kind, choice.chosen, uncompute, o));
    }
  } finally {
    bar.stop();
  }
  const reg = registerOfCost(cnf, o);
  if (o.json) {
    process.stdout.write(`${JSON.stringify({ variables: cnf.variables, clauses: cnf.clauseStart.length - 1, kind: o.kind, max_qubits: o.maxQubits, prefer: o.prefer, ...reg.json, rows }, null, 2)}\n`);
    return 0;
  }
  const bounds = rows.some((r) => !r.exact);
  const body = rows.map((r) => [
    ...[r.construction, r.uncompute, r.qubits, r.toffoli_count, r.t_count, r.t_depth, r.cnot_count, r.depth].map(String),
    ...(bounds ? [r.exact ? "exact" : "upper bound"] : []),
  ]);
  process.stdout.write(`${head}\n${reg.text}\nwithin ${plural(o.maxQubits, "qubit")}, preferring ${o.prefer}:\n`);
  process.stdout.write(`${table(["construction", "uncompute", "qubits", "Toffolis", "T-count", "T-depth", "CNOTs", "depth", ...(bounds ? ["figures"] : [])], body, (i) => i < 2)}\n`);
  return 0;
}
