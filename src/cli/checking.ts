/** Running a verification and wording its result, shared by `verify` and `oracle --verify`. */
import {
  completeAssignment, DEFAULT_EXHAUSTIVE_LIMIT, exhaustiveInReach, expectedOfCompletion, MAX_EXHAUSTIVE_LIMIT, proveOracle, verifyOracle, type Circuit, type Cnf, type Completion, type OracleProof, type VerifyResult,
} from "../internal.js";
import { displayName, progress, UserError } from "./io.js";
import { intOption } from "./options.js";

/** The verification options given on the command line. */
export interface VerifyFlags {
  exhaustiveLimit: number;
  samples?: number;
  models?: number;
  conflictLimit?: number;
  /** Seconds a proof's SAT solver may spend (--proof-seconds). */
  proofSeconds?: number;
  seed: number;
  /**
   * `prove`: a proof or nothing (--prove); `sample`: simulation only (--sample); `auto`: exhaustive
   * simulation when in reach, else a proof, else sampled simulation.
   */
  mode: "prove" | "sample" | "auto";
}

export const VERIFY_ARGS = {
  "exhaustive-limit": { type: "string" },
  samples: { type: "string" },
  models: { type: "string" },
  "conflict-limit": { type: "string" },
  "proof-seconds": { type: "string" },
  seed: { type: "string" },
  prove: { type: "boolean" },
  sample: { type: "boolean" },
} as const;

export function verifyFlags(values: Record<string, string | boolean | undefined>): VerifyFlags {
  const str = (k: string): string | undefined => values[k] as string | undefined;
  const samples = intOption(str("samples"), "--samples", 1, 1 << 24);
  const models = intOption(str("models"), "--models", 1, 1 << 16);
  const conflictLimit = intOption(str("conflict-limit"), "--conflict-limit", 0, 2 ** 31 - 1);
  const proofSeconds = intOption(str("proof-seconds"), "--proof-seconds", 1, 86_400);
  if (proofSeconds !== undefined && values.sample === true) {
    throw new UserError("clausegate: error: --proof-seconds bounds a proof, and --sample runs none; hint: leave out --sample or --proof-seconds");
  }
  return {
    exhaustiveLimit: intOption(str("exhaustive-limit"), "--exhaustive-limit", 0, MAX_EXHAUSTIVE_LIMIT) ?? DEFAULT_EXHAUSTIVE_LIMIT,
    ...(samples === undefined ? {} : { samples }),
    ...(models === undefined ? {} : { models }),
    ...(conflictLimit === undefined ? {} : { conflictLimit }),
    ...(proofSeconds === undefined ? {} : { proofSeconds }),
    seed: intOption(str("seed"), "--seed", 0, 2 ** 31 - 1) ?? 1,
    mode: values.prove === true ? "prove" : values.sample === true ? "sample" : "auto",
  };
}

/** What a check found: a proof (or refutation), a simulation, or both (a proof that fell back). */
export interface CheckResult {
  /** True when the circuit passed: proved, or (not under --prove) verified by simulation. */
  readonly ok: boolean;
  /** The proof attempt, or null when simulation sufficed (or --sample). */
  readonly proof: OracleProof | null;
  /** The simulation, or null when the proof decided. */
  readonly simulation: VerifyResult | null;
  /** A free register's completion rule: a proof's counterexample is then a register value. */
  readonly completion?: Completion;
}

/**
 * Checks a circuit as the flags say: under --prove a proof (falling back to simulation, shown
 * but not passing, when the proof is out of reach); by default exhaustive simulation when in
 * reach, else a proof, else sampled simulation; under --sample simulation only.
 */
export async function runCheck(cnf: Cnf, circuit: Circuit, flags: VerifyFlags, kind?: "phase" | "flag", completion?: Completion): Promise<CheckResult> {
  const inputs = completion === undefined ? cnf.variables : completion.register.length;
  if (flags.mode === "sample" || (flags.mode === "auto" && exhaustiveInReach(circuit, inputs, flags.exhaustiveLimit))) {
    const simulation = await runVerification(cnf, circuit, flags, kind, completion);
    return { ok: simulation.verified, proof: null, simulation };
  }
  // A free register is proven against the formula's projection: the completion rule built as a
  // function of the register (fixed values, definitions in order, the clauses over them).
  const proof = proveOracle(cnf, circuit, {
    ...(kind ? { kind } : {}),
    ...(flags.conflictLimit !== undefined ? { conflictLimit: flags.conflictLimit } : {}),
    ...(flags.proofSeconds !== undefined ? { solverSeconds: flags.proofSeconds } : {}),
    ...(completion !== undefined ? { expected: expectedOfCompletion(cnf, completion) } : {}),
  });
  const free = completion !== undefined ? { completion } : {};
  if (proof.status !== "unknown") return { ok: proof.proved, proof, simulation: null, ...free };
  const simulation = await runVerification(cnf, circuit, flags, kind, completion);
  return { ok: flags.mode === "auto" && simulation.verified, proof, simulation, ...free };
}

const seconds = (s: number): string => `${s < 10 ? s.toFixed(2) : s.toFixed(1)} s`;
const METHOD_WORDS: Record<string, string> = {
  structural: "structural hashing (the miter is a constant)",
  bdd: "a BDD over the clause nodes",
  sat: "the CDCL solver",
};

/** Human-readable lines for a check. */
export function checkLines(r: CheckResult, file: string): string[] {
  const p = r.proof;
  const lines: string[] = [];
  if (p !== null && p.status !== "unknown") {
    const how = `proof by ${METHOD_WORDS[p.method] ?? p.method}; miter ${plural(p.miter.variables, "variable")}, ${plural(p.miter.clauses, "clause")}; ${seconds(p.seconds)}`;
    if (p.proved) return [`proved: every assignment, ${how}`];
    const c = p.counterexample!;
    lines.push(`mismatch: ${how}; confirmed by simulating the counterexample`);
    if (r.completion !== undefined) {
      const { register, completed } = registerCounterexample(r.completion, c.assignment);
      lines.push(`counterexample: register value ${register} (register variables as literals), completed to ${completed}`);
    } else lines.push(`counterexample: ${c.dimacs}`);
    if (c.target !== undefined) lines.push(`target before: ${c.target ? 1 : 0}`);
    if (c.outcomes.length > 0) lines.push(`measurement outcomes: ${c.outcomes.map((o) => (o ? 1 : 0)).join("")}`);
    lines.push(`expected: ${c.expected}`, `circuit:  ${c.actual}`);
    return lines;
  }
  // A circuit of the wrong shape (register sizes) is told so alone: the proof's "not proven"
  // line before it would only repeat the mismatch in other words.
  if (p !== null && !r.simulation?.problem) lines.push(`${p.message.replace(/^not proven: /, "not proven: ")} (after ${seconds(p.seconds)}); checked by simulation instead`);
  if (r.simulation !== null) lines.push(...reportLines(r.simulation, file));
  return lines;
}

/** A register value (the prover's inputs) as literals of the register's variables, and its completion as a DIMACS line. */
function registerCounterexample(completion: Completion, value: readonly boolean[]): { register: string; completed: string } {
  const register = Array.from(completion.register, (v, i) => (value[i] ? v : -v));
  const full = completeAssignment(completion, value);
  const completed = Array.from(full, (b, i) => (b ? i + 1 : -(i + 1)));
  return { register: [...register, 0].join(" "), completed: [...completed, 0].join(" ") };
}

/** A check as one JSON object (snake_case keys). */
export function checkJson(r: CheckResult): object {
  const p = r.proof;
  if (p !== null && p.status !== "unknown") {
    const c = p.counterexample;
    return {
      verified: p.proved, method: "proof", proof_method: p.method, miter: { variables: p.miter.variables, clauses: p.miter.clauses },
      seconds: p.seconds, graph_nodes: p.graphNodes,
      counterexample: c ? (r.completion !== undefined ? registerCounterexample(r.completion, c.assignment).completed : c.dimacs) : null,
      ...(c && r.completion !== undefined ? { counterexample_register: registerCounterexample(r.completion, c.assignment).register, counterexample_register_bits: c.assignment.map((b) => (b ? "1" : "0")).join("") } : {}),
      ...(c ? { expected: c.expected, actual: c.actual, outcomes: c.outcomes.map((o) => (o ? 1 : 0)), ...(c.target !== undefined ? { target: c.target ? 1 : 0 } : {}) } : {}),
    };
  }
  return {
    ...reportJson(r.simulation!),
    verified: r.ok,
    ...(p !== null ? { proof: { status: "not proven", reason: p.message.replace(/^not proven: /, ""), seconds: p.seconds, miter: p.miter } } : {}),
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
        : `${r.register === "free" ? `${plural(s.found, "register value")} of the models` : s.found} found by the CDCL solver in ${plural(s.conflicts, "conflict")}${s.all ? " (all there are)" : ""}`;
    // Free register: the near misses are model register values with one bit flipped (verify.ts).
    const near = r.register === "free" ? `${plural(r.falsifying, "register value")} with one bit flipped` : `${plural(r.falsifying, "assignment")} falsifying one clause each`;
    lines.push(`models: ${found}; also checked: ${near}, ${r.samples} random`);
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

