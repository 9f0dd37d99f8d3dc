/** `clausegate oracle` and `clausegate cost`: compile a formula, write the circuit, report its costs. */
import { parseArgs } from "node:util";
import { compileOracle, costTable, oracleResources, reduceSearch, registerOf, type Cnf, type CostRow, type Oracle } from "../internal.js";
import { checkCircuitSize, displayName, loadCnf, progress, writeAtomic } from "./io.js";
import { checkLines, runCheck, VERIFY_ARGS, verifyFlags } from "./checking.js";
import { checkFormat, FORMATS, writeCircuit, type Format } from "./circuits.js";
import { choice, oneInput, ORACLE_ARGS, ORACLE_HELP, oracleOptions, REGISTER_ARGS, registerHelp, registerOptions } from "./options.js";
import { problemOfOracle, registerJson, registerText, structureJson, structureText, type SearchProblem } from "./register.js";

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
                              proof); write only if it passes; takes
                              verify's --exhaustive-limit, --samples, --models, --conflict-limit and --seed
  --prove                     prove the oracle first (as clausegate verify --prove, any size); write only
                              if the proof succeeds; takes --conflict-limit
  -h, --help                  show this help
`;

export const costHelp = `Usage: clausegate cost FILE|- [--kind phase|flag] [--register full|free] [--no-structure] [--json]

Prints what an oracle for the formula costs, one row per strategy and uncomputation, with the
structure recovered from the clauses (gate definitions, parities, one-hot groups compiled natively)
and without it (the clause construction alone), and a textbook reference row (a clause bit per
clause, V-chains of 7-T Toffolis). Qubits, T-count, T-depth, CNOTs and depth are those of the
Clifford+T circuit; Toffolis those of the toffoli basis; all after work-qubit reuse and the optimizer
passes, exactly as clausegate oracle emits them. The figures are counted without building the
circuits (memory for a few numbers per qubit); a row the counting cannot make exact says so ("upper
bound"; "exact": false in --json). When recovery finds nothing, the rows with structure would repeat
those without it and are left out (said in a note; "recovered": {"used": false} in --json).

Options:
  --kind phase|flag           the oracle's kind (default phase)
${registerHelp("full")}
                              (with it, cost shows the rows without structure only)
  --json                      print JSON: variables, clauses, kind, register_mode, register (the DIMACS
                              variable of each search qubit), recovered, rows (each with structure:
                              true|false)
  -h, --help                  show this help
`;

function describe(o: Oracle, cnf: Cnf): string[] {
  const { kind, strategy, basis, uncompute } = o.options;
  return [
    `clausegate ${kind} oracle: ${o.variables} variables, ${o.clauses} clauses`,
    `strategy ${strategy}, basis ${basis}, uncompute ${uncompute}${o.options.optimize ? "" : ", not optimized"}`,
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
  const { values, positionals } = parseArgs({
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
  const file = oneInput(positionals, "oracle");
  const format = choice(values.format, "--format", FORMATS, "qasm3");
  const options = oracleOptions(values);
  const cnf = await loadCnf(file);
  checkCircuitSize(cnf, file, "oracle");
  const oracle = compileOracle(cnf, options);
  noteSimplification(oracle, file);
  const completionOf = options.register === "free" ? oracle.completion : undefined;
  if (values.prove) {
    const r = await runCheck(cnf, oracle.circuit, { ...flags, mode: "prove" }, options.kind, completionOf);
    process.stderr.write(`${checkLines(r, file).join("\n")}\n`);
    if (!r.ok) {
      process.stderr.write(r.proof?.counterexample
        ? "clausegate oracle: error: the oracle failed its proof; nothing was written; hint: please report this with the input\n"
        : "clausegate oracle: error: the oracle was not proven; nothing was written; hint: raise --conflict-limit, or use --verify to check it by simulation\n");
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
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: { kind: { type: "string" }, ...REGISTER_ARGS, json: { type: "boolean" }, help: { type: "boolean", short: "h" } },
  });
  if (values.help) {
    process.stdout.write(costHelp);
    return 0;
  }
  const file = oneInput(positionals, "cost");
  const kind = choice(values.kind, "--kind", ["phase", "flag"], "phase");
  const reg = registerOptions(values, "full");
  const cnf = await loadCnf(file);
  checkCircuitSize(cnf, file, "cost");
  // What recovery gives (the register too): rows with structure only when it gives something.
  const withStructure = reg.structure ? registerOf(cnf, { register: reg.register, structure: true }) : undefined;
  const recovered = withStructure?.structure ?? null;
  const both = recovered !== null && recovered.used;
  // A free register differs with and without structure (recovery computes defined variables).
  const plainRegister = both && reg.register === "full" ? withStructure! : registerOf(cnf, { register: reg.register, structure: false });
  const bar = progress("costing");
  let rows: (CostRow & { structure: boolean })[];
  try {
    // Two tables share the bar: the first half with structure, the second without.
    const half = (start: number) => (f: number) => bar.update(both ? start + f / 2 : f);
    const structured = both ? costTable(cnf, kind, { register: reg.register, structure: true, onProgress: half(0) }) : [];
    const plain = costTable(cnf, kind, { register: reg.register, structure: false, onProgress: half(0.5) });
    // The textbook reference is the same circuit either way: listed once, with the plain rows.
    rows = [
      ...structured.filter((r) => r.strategy !== "textbook").map((r) => ({ ...r, structure: true })),
      ...plain.map((r) => ({ ...r, structure: false })),
    ];
  } finally {
    bar.stop();
  }
  const problemOf = (plan: typeof plainRegister, structure: boolean): SearchProblem => reg.register === "full"
    ? { mode: "full", structure, n: cnf.variables, variables: cnf.variables, plan: undefined, counted: cnf }
    : { mode: "free", structure, n: plan.register.length, variables: cnf.variables, plan, counted: reduceSearch(cnf).cnf };
  // The registers of the rows: with structure (when shown) and without.
  const problems = [...(both ? [problemOf(withStructure!, true)] : []), problemOf(plainRegister, false)];
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
  const head = ["strategy", "uncompute", "structure", "qubits", "Toffolis", "T-count", "T-depth", "CNOTs", "depth", ...(bounds ? ["figures"] : [])];
  const body = rows.map((r) => [
    ...[r.strategy, r.uncompute, r.strategy === "textbook" ? "-" : r.structure ? "yes" : "no", r.qubits, r.toffoli_count, r.t_count, r.t_depth, r.cnot_count, r.depth].map(String),
    ...(bounds ? [r.exact ? "exact" : "upper bound"] : []),
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i]!.length)));
  const line = (cells: string[]): string => cells.map((c, i) => (i < 3 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join("  ");
  process.stdout.write(`${kind} oracle for ${displayName(file)}: ${cnf.variables} variables, ${clauses} clauses\n`);
  for (const p of reg.register === "free" ? problems : problems.slice(0, 1)) {
    const which = reg.register === "free" && both ? (p.structure ? " (rows with structure)" : " (rows without structure)") : "";
    process.stdout.write(`search register${which}: ${p.n} qubit${p.n === 1 ? "" : "s"}, ${registerText(p)}\n`);
  }
  process.stdout.write(`structure: ${structureText(recovered)}${recovered !== null && !recovered.used ? " (the rows with structure would repeat those below)" : ""}\n`);
  process.stdout.write(`${line(head)}\n${body.map(line).join("\n")}\n`);
  return 0;
}
