/** Running a verification and wording its result, shared by `verify` and `oracle --verify`. */
import {
  DEFAULT_EXHAUSTIVE_LIMIT, MAX_EXHAUSTIVE_LIMIT, verifyOracle, type Circuit, type Cnf, type Completion, type VerifyResult,
} from "../internal.js";
import { displayName, progress } from "./io.js";
import { intOption } from "./options.js";

/** The verification options given on the command line. */
export interface VerifyFlags {
  exhaustiveLimit: number;
  samples?: number;
  models?: number;
  conflictLimit?: number;
  seed: number;
}

export const VERIFY_ARGS = {
  "exhaustive-limit": { type: "string" },
  samples: { type: "string" },
  models: { type: "string" },
  "conflict-limit": { type: "string" },
  seed: { type: "string" },
} as const;

export function verifyFlags(values: Record<string, string | boolean | undefined>): VerifyFlags {
  const str = (k: string): string | undefined => values[k] as string | undefined;
  const samples = intOption(str("samples"), "--samples", 1, 1 << 24);
  const models = intOption(str("models"), "--models", 1, 1 << 16);
  const conflictLimit = intOption(str("conflict-limit"), "--conflict-limit", 0, 2 ** 31 - 1);
  return {
    exhaustiveLimit: intOption(str("exhaustive-limit"), "--exhaustive-limit", 0, MAX_EXHAUSTIVE_LIMIT) ?? DEFAULT_EXHAUSTIVE_LIMIT,
    ...(samples === undefined ? {} : { samples }),
    ...(models === undefined ? {} : { models }),
    ...(conflictLimit === undefined ? {} : { conflictLimit }),
    seed: intOption(str("seed"), "--seed", 0, 2 ** 31 - 1) ?? 1,
  };
}

/**
 * Runs the verification with a progress bar on a TTY. `completion`: the oracle's register and
 * completion rule (a free register is checked against the formula's projection).
 */
export async function runVerification(cnf: Cnf, circuit: Circuit, flags: VerifyFlags, kind?: "phase" | "flag", completion?: Completion): Promise<VerifyResult> {
  const bar = progress("verifying");
  try {
    return await verifyOracle(cnf, circuit, { ...flags, ...(kind ? { kind } : {}), ...(completion ? { completion } : {}), onProgress: bar.update });
  } finally {
    bar.stop();
  }
}

const plural = (k: number, one: string, many = `${one}s`): string => `${k} ${k === 1 ? one : many}`;

/** Human-readable lines for a result. */
export function reportLines(r: VerifyResult, file: string): string[] {
  if (r.problem) return [`${displayName(file)}: not an oracle for this formula: ${r.problem}`];
  const free = r.register === "free";
  // A free register is checked against the projection: its inputs are register values, and a
  // value is "satisfying" when its completion is a model.
  const how = `${r.method} (${plural(r.assignments, free ? "register value" : "assignment")}, ${r.simulator} simulator${free ? "; free register, against the formula's projection" : ""})`;
  const counts = free ? `${r.models} extending to a model, ${r.nonModels} not` : `${r.models} satisfying, ${r.nonModels} not`;
  const lines: string[] = [];
  if (r.counterexample) {
    const c = r.counterexample;
    lines.push(`mismatch: ${how}`);
    if (c.registerDimacs !== undefined) lines.push(`counterexample: register value ${c.registerDimacs} (register variables as literals), completed to ${c.dimacs}`);
    else lines.push(`counterexample: ${c.dimacs}`);
    lines.push(`expected: ${c.expected}`, `circuit:  ${c.actual}`);
  } else if (r.verified) lines.push(`verified: ${how}; ${counts}`);
  else lines.push(`not verified: ${how}; ${counts}`, `reason: ${r.unchecked}${/budget/.test(r.unchecked ?? "") ? "; hint: raise --conflict-limit" : ""}`);
  const s = r.modelSearch;
  if (s) {
    const found = s.status === "unsat"
      ? `none, as the CDCL solver proved in ${plural(s.conflicts, "conflict")}`
      : s.status === "unknown"
        ? `none found by the CDCL solver within its budget of ${plural(s.conflictLimit, "conflict")}`
        : `${s.found} found by the CDCL solver in ${plural(s.conflicts, "conflict")}${s.all ? " (all there are)" : ""}`;
    lines.push(`models: ${found}; also checked: ${plural(r.falsifying, "assignment")} falsifying one clause each, ${r.samples} random`);
  }
  for (const note of r.notes) lines.push(`note: ${note}`);
  return lines;
}

/** The result as one JSON object (snake_case keys). */
export function reportJson(r: VerifyResult): object {
  const c = r.counterexample;
  const s = r.modelSearch;
  return {
    verified: r.verified, method: r.method, simulator: r.simulator, assignments: r.assignments, models: r.models, non_models: r.nonModels,
    model_search: s ? { method: "cdcl", status: s.status, found: s.found, all: s.all, conflicts: s.conflicts, conflict_limit: s.conflictLimit } : null,
    falsifying: r.falsifying,
    random_samples: r.samples,
    notes: r.notes,
    register: r.register,
    counterexample: c ? c.dimacs : null,
    ...(c?.registerDimacs !== undefined ? { counterexample_register: c.registerDimacs, counterexample_register_bits: (c.registerValue ?? []).map((b) => (b ? "1" : "0")).join("") } : {}),
    ...(c ? { expected: c.expected, actual: c.actual } : {}),
    ...(r.unchecked ? { unchecked: r.unchecked } : {}),
    ...(r.problem ? { problem: r.problem } : {}),
  };
}

