/** `clausegate oracle` and `clausegate cost`: compile a formula, write the circuit, report its costs. */
import { parseArgs } from "node:util";
import { compileOracle, costTable, oracleResources, type Cnf, type Oracle } from "../internal.js";
import { checkCircuitSize, displayName, loadCnf, progress, writeAtomic } from "./io.js";
import { checkLines, runCheck, VERIFY_ARGS, verifyFlags } from "./checking.js";
import { checkFormat, FORMATS, writeCircuit, type Format } from "./circuits.js";
import { choice, oneInput, ORACLE_ARGS, ORACLE_HELP, oracleOptions } from "./options.js";

export const oracleHelp = `Usage: clausegate oracle FILE|- [options]

Compiles a DIMACS CNF formula into a quantum oracle and writes it (OpenQASM 3 by default). The
search register vars holds the variables (vars[v-1] is DIMACS variable v), work holds work qubits
(returned to |0>), target the flag oracle's output qubit.

Options:
  -o, --output FILE           write here (atomically) instead of standard output
  --format qasm3|qasm2|json   output format (default qasm3)
${ORACLE_HELP}
  --report FILE               also write the resource report (JSON)
  --verify                    verify the oracle first (as clausegate verify: simulation in reach, else a
                              proof); write only if it passes; takes
                              verify's --exhaustive-limit, --samples, --models, --conflict-limit and --seed
  --prove                     prove the oracle first (as clausegate verify --prove, any size); write only
                              if the proof succeeds; takes --conflict-limit
  -h, --help                  show this help
`;

export const costHelp = `Usage: clausegate cost FILE|- [--kind phase|flag] [--json]

Prints what an oracle for the formula costs, one row per strategy and uncomputation, and a
textbook reference row (a clause bit per clause, V-chains of 7-T Toffolis). Qubits, T-count,
T-depth, CNOTs and depth are those of the Clifford+T circuit; Toffolis those of the toffoli basis;
all after work-qubit reuse and the optimizer passes, exactly as clausegate oracle emits them. The
figures are counted without building the circuits (memory for a few numbers per qubit); a row the
counting cannot make exact says so ("upper bound"; "exact": false in --json).

Options:
  --kind phase|flag   the oracle's kind (default phase)
  --json              print JSON: variables, clauses, kind, rows
  -h, --help          show this help
`;

function describe(o: Oracle): string[] {
  const { kind, strategy, basis, uncompute } = o.options;
  return [
    `clausegate ${kind} oracle: ${o.variables} variables, ${o.clauses} clauses`,
    `strategy ${strategy}, basis ${basis}, uncompute ${uncompute}${o.options.optimize ? "" : ", not optimized"}`,
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
  if (values.prove) {
    const r = await runCheck(cnf, oracle.circuit, { ...flags, mode: "prove" }, options.kind);
    process.stderr.write(`${checkLines(r, file).join("\n")}\n`);
    if (!r.ok) {
      process.stderr.write(r.proof?.counterexample
        ? "clausegate oracle: error: the oracle failed its proof; nothing was written; hint: please report this with the input\n"
        : "clausegate oracle: error: the oracle was not proven; nothing was written; hint: raise --conflict-limit, or use --verify to check it by simulation\n");
      return 1;
    }
  } else if (values.verify) {
    // As clausegate verify: exhaustive simulation when in reach, else a proof (--sample: sampling).
    const r = await runCheck(cnf, oracle.circuit, flags, options.kind);
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
    writeAtomic(report, (w) => w(`${JSON.stringify(r, null, 2)}\n`), "the report");
  }
  writeCircuit(oracle.circuit, format, describe(oracle), output);
}

export async function costCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: { kind: { type: "string" }, json: { type: "boolean" }, help: { type: "boolean", short: "h" } },
  });
  if (values.help) {
    process.stdout.write(costHelp);
    return 0;
  }
  const file = oneInput(positionals, "cost");
  const kind = choice(values.kind, "--kind", ["phase", "flag"], "phase");
  const cnf = await loadCnf(file);
  checkCircuitSize(cnf, file, "cost");
  const bar = progress("costing");
  let rows;
  try {
    rows = costTable(cnf, kind, { onProgress: bar.update });
  } finally {
    bar.stop();
  }
  if (values.json) {
    process.stdout.write(`${JSON.stringify({ variables: cnf.variables, clauses: cnf.clauseStart.length - 1, kind, rows }, null, 2)}\n`);
    return 0;
  }
  // A column for rows whose figures are upper bounds, only when there is one.
  const bounds = rows.some((r) => !r.exact);
  const head = ["strategy", "uncompute", "qubits", "Toffolis", "T-count", "T-depth", "CNOTs", "depth", ...(bounds ? ["figures"] : [])];
  const body = rows.map((r) => [
    ...[r.strategy, r.uncompute, r.qubits, r.toffoli_count, r.t_count, r.t_depth, r.cnot_count, r.depth].map(String),
    ...(bounds ? [r.exact ? "exact" : "upper bound"] : []),
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i]!.length)));
  const line = (cells: string[]): string => cells.map((c, i) => (i < 2 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join("  ");
  process.stdout.write(`${kind} oracle for ${displayName(file)}: ${cnf.variables} variables, ${cnf.clauseStart.length - 1} clauses\n`);
  process.stdout.write(`${line(head)}\n${body.map(line).join("\n")}\n`);
  return 0;
}
