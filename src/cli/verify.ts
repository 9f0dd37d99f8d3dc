/** `clausegate verify`: check an oracle against its formula; `oracle --verify` uses it too. */
import { readFile } from "node:fs/promises";
import { parseArgs } from "node:util";
import {
  compileOracle, DEFAULT_EXHAUSTIVE_LIMIT, formatDiagnostic, MAX_EXHAUSTIVE_LIMIT, readCircuit, verifyOracle,
  type Circuit, type Cnf, type VerifyResult,
} from "../index.js";
import { checkCircuitSize, displayName, loadCnf, progress, UserError } from "./io.js";
import { choice, intOption, oneInput, ORACLE_ARGS, ORACLE_HELP } from "./options.js";
import { oracleOptions } from "./oracle.js";

export const verifyHelp = `Usage: clausegate verify FILE.cnf [--circuit CIRCUIT] [options]

Checks that a circuit is an oracle for the formula: for every checked assignment x, the phase
(or the target bit) equals f(x), every work qubit is back to |0>, the search register is
unchanged and there is no stray phase. Without --circuit, compiles the formula with the given
oracle options and checks the result. With it, reads a circuit clausegate wrote (JSON, or
OpenQASM 3 as clausegate emits it).

All 2^n assignments are checked when n is at most the exhaustive limit (the bit-parallel
simulator, for mcx and toffoli circuits); above it, a seeded sample plus satisfying assignments
found by a quick local search. Clifford+T circuits run in the exact state-vector simulator,
exhaustively up to 12 variables.

Options:
  --circuit FILE              the circuit to check (.json or OpenQASM 3)
${ORACLE_HELP}
  --exhaustive-limit N        check every assignment up to N variables (default ${DEFAULT_EXHAUSTIVE_LIMIT}, at most ${MAX_EXHAUSTIVE_LIMIT})
  --samples K                 assignments to sample above the limit (default 4096; 256 for state vectors)
  --seed S                    seed for samples and measurement outcomes (default 1)
  --json                      print {"verified":..,"method":..,"assignments":..,"counterexample":..}
  -h, --help                  show this help

Exit codes: 0 verified, 1 a mismatch (the first counterexample is printed), 2 bad input.
`;

export interface VerifyFlags {
  exhaustiveLimit: number;
  samples?: number;
  seed: number;
}

export const VERIFY_ARGS = {
  "exhaustive-limit": { type: "string" },
  samples: { type: "string" },
  seed: { type: "string" },
} as const;

export function verifyFlags(values: Record<string, string | boolean | undefined>): VerifyFlags {
  const str = (k: string): string | undefined => values[k] as string | undefined;
  const samples = intOption(str("samples"), "--samples", 1, 1 << 24);
  return {
    exhaustiveLimit: intOption(str("exhaustive-limit"), "--exhaustive-limit", 0, MAX_EXHAUSTIVE_LIMIT) ?? DEFAULT_EXHAUSTIVE_LIMIT,
    ...(samples === undefined ? {} : { samples }),
    seed: intOption(str("seed"), "--seed", 0, 2 ** 31 - 1) ?? 1,
  };
}

/** Runs the verification with a progress bar on a TTY. */
export async function runVerification(cnf: Cnf, circuit: Circuit, flags: VerifyFlags, kind?: "phase" | "flag"): Promise<VerifyResult> {
  const bar = progress("verifying");
  try {
    return await verifyOracle(cnf, circuit, { ...flags, ...(kind ? { kind } : {}), onProgress: bar.update });
  } finally {
    bar.stop();
  }
}

/** Human-readable lines for a result. */
export function reportLines(r: VerifyResult, file: string): string[] {
  if (r.problem) return [`${displayName(file)}: not an oracle for this formula: ${r.problem}`];
  const how = `${r.method} (${r.assignments} assignment${r.assignments === 1 ? "" : "s"}, ${r.simulator} simulator)`;
  if (r.verified) return [`verified: ${how}; ${r.models} satisfying`];
  const c = r.counterexample!;
  return [`mismatch: ${how}`, `counterexample: ${c.dimacs}`, `expected: ${c.expected}`, `circuit:  ${c.actual}`];
}

export async function verifyCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: { ...ORACLE_ARGS, ...VERIFY_ARGS, circuit: { type: "string" }, json: { type: "boolean" }, help: { type: "boolean", short: "h" } },
  });
  if (values.help) {
    process.stdout.write(verifyHelp);
    return 0;
  }
  const file = oneInput(positionals, "verify");
  const flags = verifyFlags(values);
  const cnf = await loadCnf(file);
  checkCircuitSize(cnf, file, "verify");
  let circuit: Circuit;
  let kind: "phase" | "flag" | undefined;
  if (values.circuit !== undefined) {
    circuit = await loadCircuit(values.circuit);
    if (values.kind !== undefined) kind = choice(values.kind, "--kind", ["phase", "flag"] as const, "phase");
  } else {
    const o = oracleOptions(values);
    circuit = compileOracle(cnf, o).circuit;
    kind = o.kind;
  }
  const r = await runVerification(cnf, circuit, flags, kind);
  if (values.json) {
    const c = r.counterexample;
    process.stdout.write(`${JSON.stringify({
      verified: r.verified, method: r.method, simulator: r.simulator, assignments: r.assignments, models: r.models,
      counterexample: c ? c.dimacs : null, ...(c ? { expected: c.expected, actual: c.actual } : {}), ...(r.problem ? { problem: r.problem } : {}),
    })}\n`);
  } else {
    process.stdout.write(`${reportLines(r, values.circuit ?? file).join("\n")}\n`);
  }
  return r.verified ? 0 : 1;
}

async function loadCircuit(path: string): Promise<Circuit> {
  let text: string;
  try {
    text = await readFile(path, "utf8");
  } catch {
    throw new UserError(`${path}: error: cannot read the circuit; check the path`);
  }
  if (/^\s*OPENQASM\s+2/.test(text)) {
    throw new UserError(`${path}:1:1: error: expected OpenQASM 3 or clausegate JSON but found OpenQASM 2.0; hint: verify the OpenQASM 3 or JSON form of the oracle`);
  }
  const { circuit, diagnostics } = readCircuit(text);
  if (circuit === undefined) throw new UserError(diagnostics.map((d) => formatDiagnostic(d, path)).join("\n"));
  return circuit;
}
