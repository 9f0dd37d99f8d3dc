/** `clausegate structure FILE|-`: the gate definitions, parities and groups recovered from a formula. */
import { clauseCount, recoverStructure, type Definition, type DefinitionKind, type Structure } from "../internal.js";
import { loadCnf, plural, UserError, writeStdout } from "./io.js";
import { oneInput, parseCommandArgs } from "./options.js";

export const structureHelp = `Usage: clausegate structure FILE|- [options]

Reads a DIMACS CNF file ("-" for standard input) and recovers the structure its encoder put in
the clauses: gate definitions (y = x, y = NOT x, AND / OR of any width with negated inputs,
XOR / XNOR of any width, each from exactly its Tseitin clauses), standalone parity constraints
(all 2^(k-1) clauses of a k-variable XOR), at-most-one and exactly-one groups (pairwise negative
binary clauses over 3 or more variables, with their at-least-one clause), and the clauses left.
Definitions are acyclic and each variable is defined at most once, so the free variables
determine all the others: the models of the formula are the assignments of the free variables
that satisfy the parities, groups and remaining clauses, with the rest computed.

Prints the free variables, the definitions by kind, the parities, groups and remaining clauses,
and the search space before (2^variables) and after (2^free). Declared variables that occur in
no clause are counted apart: any value completes a model.

Options:
  --json                      print {"variables","clauses","free","unused","definitions","parities",
                              "groups","remaining_clauses","search_space","cleanup"}; inputs and
                              clauses are DIMACS literals
  --prefer definitions|groups definitions (default): gate definitions first (fewest free variables);
                              groups: exactly-one and at-most-one groups first
  -h, --help                  show this help
Exit codes: 0, 2 bad input or usage.
`;

export async function structureCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs("structure", {
    args: argv,
    allowPositionals: true,
    options: {
      json: { type: "boolean" },
      prefer: { type: "string" },
      help: { type: "boolean", short: "h" },
    },
  });
  if (values.help) {
    process.stdout.write(structureHelp);
    return 0;
  }
  const file = oneInput(positionals, "structure");
  if (values.prefer !== undefined && values.prefer !== "definitions" && values.prefer !== "groups") {
    throw new UserError(`clausegate structure: error: --prefer expects definitions or groups but got '${values.prefer}'; hint: see clausegate structure --help`);
  }
  const prefer = values.prefer ?? "definitions";
  const cnf = await loadCnf(file);
  const s = recoverStructure(cnf, { prefer });
  if (values.json) writeJson(s, clauseCount(cnf));
  else writeStdout(`${textLines(s, clauseCount(cnf)).join("\n")}\n`);
  return 0;
}

/** Writes the JSON in chunks: a million remaining clauses never sit in one string. */
function writeJson(s: Structure, clauses: number): void {
  let buf = `{"variables":${s.variables},"clauses":${clauses},"free":[${s.free.join(",")}],"unused":${s.unused},"definitions":[`;
  const flush = (force = false): void => {
    if (force || buf.length > 1 << 20) {
      writeStdout(buf);
      buf = "";
    }
  };
  s.definitions.forEach((d, i) => {
    buf += `${i ? "," : ""}{"variable":${d.variable},"kind":"${d.kind}","inputs":[${d.inputs.join(",")}]}`;
    flush();
  });
  buf += `],"parities":[`;
  s.parities.forEach((p, i) => {
    buf += `${i ? "," : ""}{"variables":[${p.variables.join(",")}],"parity":${p.parity}}`;
    flush();
  });
  buf += `],"groups":[`;
  s.groups.forEach((g, i) => {
    buf += `${i ? "," : ""}{"variables":[${g.variables.join(",")}],"exactly_one":${g.exactlyOne}}`;
    flush();
  });
  buf += `],"remaining_clauses":[`;
  const { lits, clauseStart } = s.remaining;
  for (let i = 0; i + 1 < clauseStart.length; i++) {
    // Literal by literal: joining a typed-array view per clause is several times slower.
    buf += i ? ",[" : "[";
    for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) buf += k > clauseStart[i]! ? "," + lits[k]! : lits[k]!;
    buf += "]";
    flush();
  }
  const r = s.report;
  buf += `],"search_space":{"before_log2":${s.variables},"after_log2":${s.free.length}},` +
    `"cleanup":{"clauses_after":${r.cleanedClauses},"duplicate_literals":${r.duplicateLiterals},"tautologies":${r.tautologies},` +
    `"duplicate_clauses":${r.duplicateClauses},"cycles_refused":${r.cyclesRefused}},"unsat":${s.unsat}}\n`;
  flush(true);
}

const KIND_ORDER: readonly DefinitionKind[] = ["and", "or", "xor", "xnor", "equiv", "not"];
const EXAMPLES = 3;
const LISTED = 40;

/** "y = AND(a, -b)", "y = NOT a", "y = a". */
function formula(d: Definition): string {
  if (d.kind === "equiv") return `${d.variable} = ${d.inputs[0]}`;
  if (d.kind === "not") return `${d.variable} = NOT ${d.inputs[0]}`;
  return `${d.variable} = ${d.kind.toUpperCase()}(${d.inputs.join(", ")})`;
}

/** 2^n written out when it is short enough to read, else with its number of digits. */
function power(n: number): string {
  if (n <= 256) return `2^${n} = ${2n ** BigInt(n)}`;
  return `2^${n} (a ${Math.floor(n * Math.log10(2)) + 1}-digit number)`;
}

function list(xs: ArrayLike<number>): string {
  const shown = Array.from({ length: Math.min(xs.length, LISTED) }, (_, i) => xs[i]!);
  return shown.join(" ") + (xs.length > LISTED ? ` ... (${xs.length - LISTED} more)` : "");
}

function textLines(s: Structure, clauses: number): string[] {
  const r = s.report;
  const out: string[] = [];
  const dropped = [
    r.duplicateClauses ? `${r.duplicateClauses} repeated clause${r.duplicateClauses === 1 ? "" : "s"}` : "",
    r.tautologies ? `${r.tautologies} tautolog${r.tautologies === 1 ? "y" : "ies"}` : "",
    r.duplicateLiterals ? `${r.duplicateLiterals} repeated literal${r.duplicateLiterals === 1 ? "" : "s"}` : "",
  ].filter((x) => x !== "");
  out.push(`variables          ${s.variables}`);
  out.push(`clauses            ${clauses}${dropped.length ? ` (dropped ${dropped.join(", ")})` : ""}`);
  out.push(`free variables     ${s.free.length}${s.free.length ? `: ${list(s.free)}` : ""}`);
  if (s.unused) out.push(`                   plus ${s.unused} declared variable${s.unused === 1 ? "" : "s"} in no clause (any value)`);
  out.push(`definitions        ${s.definitions.length}${s.definitions.length ? ` (${plural(r.definitionClauses, "clause")})` : ""}`);
  for (const kind of KIND_ORDER) {
    const ds = s.definitions.filter((d) => d.kind === kind);
    if (ds.length === 0) continue;
    out.push(`  ${kind.padEnd(6)} ${String(ds.length).padStart(7)}   e.g. ${ds.slice(0, EXAMPLES).map(formula).join("; ")}`);
  }
  out.push(`parity constraints ${s.parities.length}${s.parities.length ? ` (${plural(r.parityClauses, "clause")})` : ""}`);
  if (s.parities.length) {
    out.push(`                   e.g. ${s.parities.slice(0, EXAMPLES).map((p) => `XOR(${p.variables.join(", ")}) = ${p.parity}`).join("; ")}`);
  }
  const eo = s.groups.filter((g) => g.exactlyOne);
  const amo = s.groups.filter((g) => !g.exactlyOne);
  out.push(`groups             ${eo.length} exactly-one, ${amo.length} at-most-one${s.groups.length ? ` (${plural(r.groupClauses, "clause")})` : ""}`);
  for (const [name, gs] of [["exactly one of", eo], ["at most one of", amo]] as const) {
    if (gs.length) out.push(`                   e.g. ${gs.slice(0, EXAMPLES).map((g) => `${name} {${g.variables.join(", ")}}`).join("; ")}`);
  }
  const { clauseStart } = s.remaining;
  const remaining = clauseStart.length - 1;
  const widths = new Map<number, number>();
  for (let i = 0; i < remaining; i++) {
    const w = Math.min(4, clauseStart[i + 1]! - clauseStart[i]!);
    widths.set(w, (widths.get(w) ?? 0) + 1);
  }
  const byWidth = [...widths].sort((a, b) => a[0] - b[0]).map(([w, n]) => `${n} of width ${w === 4 ? "4+" : w}`);
  out.push(`remaining clauses  ${remaining}${remaining ? ` (${byWidth.join(", ")})` : ""}`);
  out.push(`search space       ${power(s.variables)}`);
  out.push(`                -> ${power(s.free.length)} over the free variables`);
  if (s.unsat) out.push(`the formula has an empty clause: nothing satisfies it`);
  return out;
}
