/**
 * Verifying an oracle circuit against its formula: the phase (or target bit) equals f(x) for
 * every checked assignment, every work qubit returns to |0>, the search register is unchanged
 * and there is no stray phase. Exhaustive up to a variable limit, sampled above it. The
 * bit-parallel simulator runs classical circuits (the mcx and toffoli bases, with unitary or
 * measured uncomputation); Clifford+T circuits go through the exact state-vector simulator.
 */
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import type { Cnf } from "../cnf/cnf.js";
import { evaluate } from "../cnf/evaluate.js";
import { DEFAULT_CONFLICT_LIMIT, findModels } from "../cnf/findModels.js";
import { SEARCH_REGISTER, type Circuit } from "../ir/circuit.js";
import { K } from "../ir/kinds.js";
import { completeAssignment, isFullCompletion, type Completion } from "../structure/completion.js";
import { compileBitProgram, newBlock, runBlock, type BitProgram } from "./bitsim.js";
import { checkOracleSparse } from "./check.js";
import { drawIndex, drawPermuted, hash3, runVerifyRange, sampleBit, unskipped, type CompletionProgram, type RangeResult, type VerifyJob } from "./verifyKernel.js";

/** Options of {@link verifyOracle}. */
export interface VerifyOptions {
  /** `phase` or `flag`; default: `flag` when the circuit has a target register, else `phase`. */
  readonly kind?: "phase" | "flag";
  /** Check all 2^n assignments when n is at most this (default 26); sample above it. */
  readonly exhaustiveLimit?: number;
  /** Random assignments to check when sampling (default 4096 bit-parallel, 256 state-vector). */
  readonly samples?: number;
  /** Most satisfying assignments the solver looks for when sampling (default 64 bit-parallel, 16 state-vector). */
  readonly models?: number;
  /** Conflicts the solver may spend looking for them (default 1,000,000). */
  readonly conflictLimit?: number;
  /** Seed for samples, the solver's phases and measurement outcomes (default 1). */
  readonly seed?: number;
  /** Worker threads (default: the number of cores). */
  readonly threads?: number;
  /** Progress, from 0 to 1. */
  readonly onProgress?: (fraction: number) => void;
  /**
   * The oracle's search register and its completion rule (`Oracle.completion`). For a free
   * register the oracle must mark a register value exactly when some model extends it, that is
   * when its completion is a model; the check enumerates (or samples) register values. Default:
   * a full register (search qubit v-1 is variable v).
   */
  readonly completion?: Completion;
}

/** How the satisfying assignments of a sampled check were found: the CDCL solver (solve.ts). */
export interface ModelSearchReport {
  /** "sat": models found; "unsat": the solver proved there are none; "unknown": its budget ran out first. */
  readonly status: "sat" | "unsat" | "unknown";
  /** Distinct models the solver found and the check included (for a free register: distinct register values of them). */
  readonly found: number;
  /** True when they are all the formula has. */
  readonly all: boolean;
  /** Conflicts the solver spent. */
  readonly conflicts: number;
  /** Its conflict budget. */
  readonly conflictLimit: number;
}

/** What {@link verifyOracle} found. */
export interface VerifyResult {
  /**
   * True when every check passed and both kinds of input were checked: at least one satisfying
   * assignment (unless the formula is unsatisfiable) and at least one other (unless every
   * assignment satisfies the formula).
   */
  readonly verified: boolean;
  /** `exhaustive` (all 2^n assignments) or `sampled`. */
  readonly method: "exhaustive" | "sampled";
  /** Which simulator ran the circuit. */
  readonly simulator: "bit-parallel" | "state-vector";
  /** Assignments checked. */
  readonly assignments: number;
  /** Checked assignments that satisfy the formula (all models when exhaustive). */
  readonly models: number;
  /** Checked assignments that do not satisfy it. */
  readonly nonModels: number;
  /** Sampled checks: how the satisfying assignments were found; null when exhaustive. */
  readonly modelSearch: ModelSearchReport | null;
  /** Sampled checks: assignments made to falsify one clause each (so that unmarked inputs are checked). */
  readonly falsifying: number;
  /** Sampled checks: random assignments checked (0 when exhaustive). */
  readonly samples: number;
  /** The first failing assignment, or null. */
  readonly counterexample: Counterexample | null;
  /** `full` (the search register is every variable) or `free` (checked against the projection). */
  readonly register: "full" | "free";
  /** Why the circuit could not even be run against the formula (register sizes), or undefined. */
  readonly problem?: string;
  /** Why no mismatch was found and yet the circuit is not verified (a kind of input left unchecked), or undefined. */
  readonly unchecked?: string;
  /** Facts about the formula that explain the counts: no models, or no assignment that is not one. */
  readonly notes: readonly string[];
}

/** A failing assignment and what went wrong there. */
export interface Counterexample {
  /** Values of variables 1..n (for a free register: the completion of the failing register value). */
  readonly assignment: boolean[];
  /** The assignment as a DIMACS clause of literals, e.g. `-1 2 -3 0`. */
  readonly dimacs: string;
  /** A free register: the failing register value, search qubit by search qubit. */
  readonly registerValue?: boolean[];
  /** A free register: the failing value as DIMACS literals of the register's variables, e.g. `3 -7 0`. */
  readonly registerDimacs?: string;
  /** What the oracle should have done. */
  readonly expected: string;
  /** What the circuit did. */
  readonly actual: string;
}

/** The largest exhaustive limit (the kernel indexes words with 32-bit integers). */
export const MAX_EXHAUSTIVE_LIMIT = 36;
/** Default exhaustive limit: 2^26 assignments is a few seconds of bit-parallel work. */
export const DEFAULT_EXHAUSTIVE_LIMIT = 26;
/** The state-vector simulator checks all assignments up to this many variables only. */
const STATE_VECTOR_EXHAUSTIVE = 12;
/** Assignments made to falsify one clause each, per sampled check. */
const FALSIFYING = 32;
/** Bytes of simulator state per block (all threads together stay within a few of these). */
const BLOCK_BYTES = 64 << 20;

const dimacsOf = (a: boolean[]): string => `${a.map((on, v) => (on ? v + 1 : -(v + 1))).join(" ")}${a.length ? " " : ""}0`;

const NO_MODELS = "no models: the formula is unsatisfiable";
const NO_NON_MODELS = "no unmarked inputs: every assignment satisfies the formula";

/**
 * Verifies `circuit` as an oracle for `cnf`.
 *
 * @example
 * ```ts
 * const r = await verifyOracle(cnf, compileOracle(cnf).circuit);
 * if (!r.verified) console.log(r.counterexample?.dimacs ?? r.unchecked ?? r.problem);
 * ```
 */
export async function verifyOracle(cnf: Cnf, circuit: Circuit, opts: VerifyOptions = {}): Promise<VerifyResult> {
  const reg = (role: string) => circuit.registers.find((r) => r.role === role);
  const kind = opts.kind ?? (reg("target")?.size ? "flag" : "phase");
  const search = reg("search");
  const seed = opts.seed ?? 1;
  // Word indices are 32-bit in the kernel: 2^36 assignments is the most it can enumerate.
  const limit = Math.min(opts.exhaustiveLimit ?? DEFAULT_EXHAUSTIVE_LIMIT, MAX_EXHAUSTIVE_LIMIT);
  const completion = opts.completion !== undefined && !isFullCompletion(opts.completion) ? opts.completion : undefined;
  const n = completion?.register.length ?? cnf.variables;
  const registerKind = completion === undefined ? "full" : "free";
  const base = { verified: false, assignments: 0, models: 0, nonModels: 0, modelSearch: null, falsifying: 0, samples: 0, counterexample: null, notes: [], register: registerKind } as const;
  if (completion !== undefined && completion.variables !== cnf.variables) {
    return { ...base, method: "exhaustive", simulator: "bit-parallel", problem: `the register's completion is for a formula of ${completion.variables} variables but this one declares ${cnf.variables}` };
  }
  if ((search?.size ?? 0) !== n) {
    const what = completion === undefined ? `the formula declares ${n} variables` : `the free register holds ${n} variables`;
    return { ...base, method: "exhaustive", simulator: "bit-parallel", problem: `the search register ${search?.name ?? SEARCH_REGISTER} has ${search?.size ?? 0} qubits but ${what}` };
  }
  if (kind === "flag" && reg("target")?.size !== 1) {
    return { ...base, method: "exhaustive", simulator: "bit-parallel", problem: "a flag oracle needs a target register of one qubit" };
  }
  const program = compileBitProgram(circuit);
  const stateVector = "unsupported" in program;
  let exhaustive = n <= (stateVector ? Math.min(limit, STATE_VECTOR_EXHAUSTIVE) : limit);
  let inputs = exhaustive ? null : sampledInputs(cnf, opts, seed, stateVector, completion);
  const covering: string[] = [];
  if (inputs !== null && inputs.covers) {
    // A sample of half the assignments or more: checking them all costs at most twice as much,
    // and a count of checked assignments is then a count of distinct ones.
    covering.push(`the sample asked for (${inputs.samples} random and ${inputs.explicit.length} chosen assignments) is at least half of the ${2 ** n} there are: every assignment was checked instead`);
    exhaustive = true;
    inputs = null;
  }
  const run = stateVector ? runStateVector(cnf, circuit, kind, inputs, opts, seed, completion) : await runBitParallel(cnf, circuit, program, kind, inputs, opts, seed, completion);
  const r = verdict(run, inputs, completion !== undefined);
  return { ...r, notes: [...covering, ...r.notes], register: registerKind };
}

/** What one simulator run found, before the verdict. */
interface Run {
  readonly simulator: "bit-parallel" | "state-vector";
  readonly assignments: number;
  readonly models: number;
  readonly counterexample: Counterexample | null;
}

/**
 * The assignments of a sampled check: random ones drawn by the kernel (distinct, and distinct from
 * the others, up to DISTINCT_DRAWS_UP_TO variables), then the chosen ones: solver models and
 * clause-falsifying ones, each once.
 */
interface SampledInputs {
  /** Random assignments checked (drawn by the kernel, before the chosen ones). */
  readonly samples: number;
  /** Up to DISTINCT_DRAWS_UP_TO variables: the sorted draw indices to skip (see randomPart); else null (hashed draws). */
  readonly distinct: Float64Array | null;
  readonly explicit: Uint8Array[];
  /** The sample would hold half of all assignments or more: check them all instead. */
  readonly covers: boolean;
  readonly search: ModelSearchReport;
  readonly falsifying: number;
  /** False when no assignment falsifies the formula (every clause is a tautology). */
  readonly hasNonModels: boolean;
}

function sampledInputs(cnf: Cnf, opts: VerifyOptions, seed: number, stateVector: boolean, completion: Completion | undefined): SampledInputs {
  const conflictLimit = opts.conflictLimit ?? DEFAULT_CONFLICT_LIMIT;
  const found = findModels(cnf, opts.models ?? (stateVector ? 16 : 64), { seed, conflictLimit });
  const search: ModelSearchReport = { status: found.status, found: found.models.length, all: found.all, conflicts: found.conflicts, conflictLimit };
  if (completion !== undefined) {
    // A free register: the models' register values (marked), and each with one register bit
    // flipped (mostly unmarked: just outside the projection).
    const reg = completion.register;
    // Models that differ only outside the register (a variable in no open clause) give one
    // register value: counted once, here and in the report.
    const projected = distinctAssignments(found.models.map((m) => Uint8Array.from(reg, (v) => m[v - 1]!)));
    const flipped: Uint8Array[] = [];
    // Flip j: value j mod p, bit floor(j / p) mod r (p values found, r register bits), so that
    // every (value, bit) pair comes up when there are at most FALSIFYING of them (value j mod p
    // with bit j mod r left half the pairs out when p and r share a factor).
    const p = projected.length;
    for (let j = 0; j < FALSIFYING && reg.length > 0; j++) {
      const a = p > 0 ? projected[j % p]!.slice() : Uint8Array.from(reg, (_, i) => hash3(seed, -1 - j, i) & 1);
      a[Math.floor(j / Math.max(1, p)) % reg.length]! ^= 1;
      flipped.push(a);
    }
    const chosen = distinctAssignments([...projected, ...flipped]);
    return { ...randomPart(reg.length, chosen, opts.samples ?? (stateVector ? 256 : 4096), seed), search: { ...search, found: projected.length }, falsifying: chosen.length - projected.length, hasNonModels: true };
  }
  const { clauses, hasNonModels } = falsifiable(cnf);
  // Each assignment falsifies one clause and, where a model was found, agrees with it elsewhere:
  // an input just outside the marked set, where an oracle that mishandles one clause goes wrong.
  const falsifying: Uint8Array[] = [];
  const count = Math.min(FALSIFYING, clauses.length);
  for (let j = 0; j < count; j++) {
    const i = clauses[Math.floor((j * clauses.length) / count)]!;
    const a = found.models.length > 0 ? found.models[j % found.models.length]!.slice() : Uint8Array.from({ length: cnf.variables }, (_, v) => hash3(seed, -1 - j, v) & 1);
    for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
      const l = cnf.lits[k]!;
      a[Math.abs(l) - 1] = l > 0 ? 0 : 1;
    }
    falsifying.push(a);
  }
  // Falsifying assignments made from different clauses and models may coincide (a model is never
  // one of them): counted once.
  const chosen = distinctAssignments([...found.models, ...falsifying]);
  return {
    ...randomPart(cnf.variables, chosen, opts.samples ?? (stateVector ? 256 : 4096), seed),
    search,
    falsifying: chosen.length - distinctAssignments(found.models).length,
    hasNonModels,
  };
}

/**
 * Up to this many variables the kernel's random assignments are distinct, and distinct from the
 * chosen ones (a keyed bijection: see randomPart); above it they are hashed, and two of K draws
 * coincide with probability below K^2 / 2^(n+1) (below 2^-17 for the default 4096).
 */
const DISTINCT_DRAWS_UP_TO = 40;

/** The chosen assignments, each once (first occurrence kept). */
function distinctAssignments(list: Uint8Array[]): Uint8Array[] {
  const seen = new Map<number, Uint8Array[]>();
  const out: Uint8Array[] = [];
  for (const a of list) {
    let h = 0x811c9dc5;
    for (let v = 0; v < a.length; v++) h = Math.imul(h ^ a[v]!, 0x01000193);
    const bucket = seen.get(h);
    if (bucket?.some((b) => b.length === a.length && b.every((x, v) => x === a[v]))) continue;
    if (bucket) bucket.push(a);
    else seen.set(h, [a]);
    out.push(a);
  }
  return out;
}

/**
 * The random part of a sample of `samples` over n variables, beside the chosen assignments
 * (exported for the tests). Up to DISTINCT_DRAWS_UP_TO variables the kernel draws them through a
 * keyed bijection (drawPermuted), skipping the indices whose draw is a chosen assignment: all
 * distinct, in memory for the chosen ones only.
 * @internal
 */
export function randomPart(n: number, chosen: Uint8Array[], samples: number, seed: number): Pick<SampledInputs, "samples" | "distinct" | "explicit" | "covers"> {
  if (n > DISTINCT_DRAWS_UP_TO) return { samples, distinct: null, explicit: chosen, covers: false };
  if (n <= MAX_EXHAUSTIVE_LIMIT && 2 * (samples + chosen.length) >= 2 ** n) return { samples, distinct: null, explicit: chosen, covers: true };
  const valueOf = (a: Uint8Array): number => {
    let x = 0;
    for (let v = n - 1; v >= 0; v--) x = x * 2 + a[v]!;
    return x;
  };
  const skip = Float64Array.from(chosen, (a) => drawIndex(seed, n, valueOf(a))).sort();
  return { samples, distinct: skip, explicit: chosen, covers: false };
}

/** Clauses that some assignment falsifies (those without a literal and its negation). */
function falsifiable(cnf: Cnf): { clauses: number[]; hasNonModels: boolean } {
  const clauses: number[] = [];
  const mark = new Int32Array(cnf.variables + 1);
  const m = cnf.clauseStart.length - 1;
  for (let i = 0; i < m; i++) {
    let tautology = false;
    for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
      const l = cnf.lits[k]!;
      const v = Math.abs(l);
      const want = l > 0 ? i + 1 : -(i + 1);
      if (mark[v] === -want) tautology = true;
      else mark[v] = want;
    }
    if (!tautology) clauses.push(i);
  }
  return { clauses, hasNonModels: clauses.length > 0 };
}

/**
 * Verified only when there was no mismatch and both kinds of input were checked, or the formula
 * is shown to have none of one kind: checking only unmarked inputs proves nothing about marking.
 */
function verdict(run: Run, inputs: SampledInputs | null, free: boolean): Omit<VerifyResult, "register"> {
  const nonModels = run.assignments - run.models;
  const notes: string[] = [];
  let unchecked: string | undefined;
  const common = { simulator: run.simulator, assignments: run.assignments, models: run.models, nonModels, counterexample: run.counterexample };
  if (inputs === null) {
    if (run.models === 0) notes.push(NO_MODELS);
    if (nonModels === 0) notes.push(free ? "no unmarked inputs: every register value completes to a model" : NO_NON_MODELS);
    return { ...common, verified: run.counterexample === null, method: "exhaustive", modelSearch: null, falsifying: 0, samples: 0, notes };
  }
  const s = inputs.search;
  if (s.status === "unsat") notes.push(NO_MODELS);
  if (!inputs.hasNonModels) notes.push(`${NO_NON_MODELS} (every clause holds a literal and its negation)`);
  if (run.models === 0 && s.status !== "unsat") {
    unchecked = s.status === "unknown"
      ? `no satisfying assignment was checked: the CDCL solver spent its budget of ${s.conflictLimit} ${s.conflictLimit === 1 ? "conflict" : "conflicts"} without finding one or proving that there is none`
      : "no satisfying assignment was checked";
  } else if (nonModels === 0 && inputs.hasNonModels) {
    unchecked = free ? "no register value outside the formula's projection was checked" : "no assignment that falsifies the formula was checked";
  }
  return {
    ...common,
    verified: run.counterexample === null && unchecked === undefined,
    method: "sampled",
    modelSearch: s,
    falsifying: inputs.falsifying,
    samples: inputs.samples,
    notes,
    ...(unchecked === undefined ? {} : { unchecked }),
  };
}

async function runBitParallel(
  cnf: Cnf, circuit: Circuit, program: BitProgram, kind: "phase" | "flag", inputs: SampledInputs | null, opts: VerifyOptions, seed: number, completion: Completion | undefined,
): Promise<Run> {
  const n = completion?.register.length ?? cnf.variables;
  const completed = completion === undefined ? undefined : completionProgram(cnf, completion);
  const reg = (role: string) => circuit.registers.find((r) => r.role === role);
  const models = inputs === null ? new Uint8Array(0) : flatten(inputs.explicit, n);
  const modelCount = inputs === null ? 0 : inputs.explicit.length;
  const samples = inputs === null ? 0 : inputs.samples;
  const totalWords = inputs === null ? (n >= 5 ? 2 ** (n - 5) : 1) : Math.ceil((samples + modelCount) / 32);
  const work = reg("work");
  // Words per block: 64, or fewer when a block of that many words over every qubit would be large.
  const perWord = 4 * (program.qubits + program.clbits + (completed?.slots ?? 0));
  const blockWords = Math.max(1, Math.min(64, totalWords, Math.floor(BLOCK_BYTES / Math.max(1, perWord))));
  const job: VerifyJob = {
    program, variables: n, lits: cnf.lits, clauseStart: cnf.clauseStart, kind,
    target: kind === "flag" ? reg("target")!.start : -1,
    workStart: work?.start ?? 0, workEnd: (work?.start ?? 0) + (work?.size ?? 0),
    seed, mode: inputs === null ? "exhaustive" : "sampled",
    blockWords, fromWord: 0, toWord: totalWords, samples, models, modelCount,
    ...(inputs?.distinct ? { distinct: { skip: inputs.distinct } } : {}),
    ...(completed === undefined ? {} : { completion: completed }),
  };
  const result = await runJob(job, totalWords, opts);
  return {
    simulator: "bit-parallel",
    assignments: result.checked,
    models: result.models,
    counterexample: result.firstBad < 0 ? null : describe(job, circuit, result.firstBad, cnf, completion),
  };
}

function flatten(ms: Uint8Array[], n: number): Uint8Array {
  const out = new Uint8Array(ms.length * n);
  ms.forEach((m, i) => out.set(m, i * n));
  return out;
}

/** Runs the job on this thread, or split across workers when it is large. */
async function runJob(job: VerifyJob, totalWords: number, opts: VerifyOptions): Promise<RangeResult> {
  const work = totalWords * job.program.ops;
  const threads = Math.max(1, Math.min(opts.threads ?? availableParallelism(), Math.floor(totalWords / job.blockWords)));
  let done = 0;
  const progress = (words: number): void => {
    done += words;
    opts.onProgress?.(done / totalWords);
  };
  if (threads === 1 || work < 1 << 24) return runVerifyRange(job, progress);
  const url = new URL("./verifyWorker.js", import.meta.url);
  const parts = await Promise.all(
    Array.from({ length: threads }, (_, k) => {
      // Contiguous ranges, each a whole number of blocks.
      const blocks = Math.ceil(totalWords / job.blockWords);
      const from = Math.floor((blocks * k) / threads) * job.blockWords;
      const to = Math.min(totalWords, Math.floor((blocks * (k + 1)) / threads) * job.blockWords);
      return new Promise<RangeResult>((resolve, reject) => {
        const w = new Worker(url, { workerData: { ...job, fromWord: from, toWord: to } });
        w.on("message", (msg: { words: number; result?: RangeResult }) => {
          progress(msg.words);
          if (msg.result) resolve(msg.result);
        });
        w.on("error", reject);
        w.on("exit", (code) => {
          if (code !== 0) reject(new Error(`verification worker exited with code ${code}`));
        });
      });
    }),
  );
  const first = parts.map((p) => p.firstBad).filter((x) => x >= 0);
  return {
    checked: parts.reduce((a, p) => a + p.checked, 0),
    bad: parts.reduce((a, p) => a + p.bad, 0),
    firstBad: first.length ? Math.min(...first) : -1,
    models: parts.reduce((a, p) => a + p.models, 0),
  };
}

/** Re-runs the failing lane alone and words what went wrong. */
function describe(job: VerifyJob, c: Circuit, lane: number, cnf: Cnf, completion: Completion | undefined): Counterexample {
  const n = job.variables;
  const assignment = Array.from({ length: n }, (_, v) =>
    job.mode === "exhaustive" ? Math.floor(lane / 2 ** v) % 2 === 1 : sampleBit(job, lane, v) === 1,
  );
  const { f, shown } = expectedValue(cnf, completion, assignment);
  const name = (q: number): string => {
    const r = c.registers.find((x) => q >= x.start && q < x.start + x.size)!;
    return `${r.name}[${q - r.start}]`;
  };
  const expected = expectation(job.kind, f);
  const word = Math.floor(lane / 32);
  const bit = lane % 32;
  const problems: string[] = [];
  for (const b of job.kind === "flag" || job.program.measurements > 0 ? [0, 1] : [0]) {
    const block = newBlock(job.program, 1);
    assignment.forEach((on, v) => (block.state[v] = on ? -1 : 0));
    if (job.target >= 0) block.state[job.target] = b ? -1 : 0;
    runBlock(job.program, block, (m) => hash3(job.seed, m, word) ^ (b ? -1 : 0));
    const at = (x: number): number => (x >>> bit) & 1;
    const found: string[] = [];
    if (at(block.fault[0]!)) found.push(`the temporary AND at gate ${block.firstFaultGate} found its target in the wrong state`);
    for (let v = 0; v < n; v++) if (at(block.state[v]!) !== (assignment[v] ? 1 : 0)) found.push(`${name(v)} changed`);
    for (let q = job.workStart; q < job.workEnd; q++) if (at(block.state[q]!)) found.push(`${name(q)} left at |1>`);
    if (job.kind === "phase") {
      if (at(block.sign[0]!) !== (f ? 1 : 0)) found.push(`phase ${at(block.sign[0]!) ? "-1" : "+1"}`);
    } else {
      if (at(block.sign[0]!)) found.push("a stray phase of -1");
      if (at(block.state[job.target]!) !== (b ^ (f ? 1 : 0))) found.push(`target ${at(block.state[job.target]!) ? "1" : "0"} from ${b}`);
    }
    if (found.length > 0) problems.push(`${job.program.measurements > 0 ? `with measurement outcomes pattern ${b}: ` : ""}${found.join(", ")}`);
  }
  return { ...shown, expected, actual: problems.join("; ") || "a mismatch" };
}

/**
 * The formula's value for a search-register value and how a counterexample shows it: the
 * assignment itself (full register), or its completion with the register value beside it.
 */
function expectedValue(cnf: Cnf, completion: Completion | undefined, value: boolean[]): { f: boolean; shown: Omit<Counterexample, "expected" | "actual"> } {
  if (completion === undefined) return { f: evaluate(cnf, value), shown: { assignment: value, dimacs: dimacsOf(value) } };
  const full = Array.from(completeAssignment(completion, value), (b) => b === 1);
  const reg = completion.register;
  const registerDimacs = `${value.map((on, i) => (on ? reg[i]! : -reg[i]!)).join(" ")}${value.length ? " " : ""}0`;
  return { f: evaluate(cnf, full), shown: { assignment: full, dimacs: dimacsOf(full), registerValue: value, registerDimacs } };
}

const KIND_CODE = { equiv: 0, not: 1, and: 2, or: 3, xor: 4, xnor: 5 } as const;

/** The completion rule and the formula over compact slots, for the bit-parallel kernel. */
function completionProgram(cnf: Cnf, c: Completion): CompletionProgram {
  const slot = new Map<number, number>();
  const at = (v: number): number => {
    let s = slot.get(v);
    if (s === undefined) slot.set(v, (s = slot.size));
    return s;
  };
  const operand = (l: number): number => (at(Math.abs(l)) << 1) | (l < 0 ? 1 : 0);
  const regSlot = Int32Array.from(c.register, at);
  const fixedSlot = Int32Array.from(c.fixed, (l) => at(Math.abs(l)));
  const fixedValue = Uint8Array.from(c.fixed, (l) => (l > 0 ? 1 : 0));
  const defIn: number[] = [];
  const defInStart = [0];
  for (const d of c.definitions) {
    for (const l of d.inputs) defIn.push(operand(l));
    defInStart.push(defIn.length);
  }
  const defSlot = Int32Array.from(c.definitions, (d) => at(d.variable));
  const lits = Int32Array.from(cnf.lits, operand);
  return {
    slots: slot.size, regSlot, fixedSlot, fixedValue, defSlot, defKind: Uint8Array.from(c.definitions, (d) => KIND_CODE[d.kind]),
    defInStart: Uint32Array.from(defInStart), defIn: Int32Array.from(defIn), lits,
  };
}

/** Circuits with S, T, or other non-classical gates: the exact state-vector simulator. */
function runStateVector(cnf: Cnf, circuit: Circuit, kind: "phase" | "flag", inputs: SampledInputs | null, opts: VerifyOptions, seed: number, completion: Completion | undefined): Run {
  const n = completion?.register.length ?? cnf.variables;
  const value = (a: boolean[]): boolean => expectedValue(cnf, completion, a).f;
  const list: number[] = [];
  const assignments: boolean[][] = [];
  if (inputs === null) for (let x = 0; x < 2 ** n; x++) list.push(x);
  else {
    for (const a of inputs.explicit) assignments.push(Array.from(a, (b) => b === 1));
    for (let s = 0; s < inputs.samples; s++) {
      const skip = inputs.distinct;
      if (skip === null) assignments.push(Array.from({ length: n }, (_, v) => (hash3(seed, s, v) & 1) === 1));
      else {
        const x = drawPermuted(seed, n, unskipped(skip, s));
        assignments.push(Array.from({ length: n }, (_, v) => Math.floor(x / 2 ** v) % 2 === 1));
      }
    }
  }
  const total = inputs === null ? list.length : assignments.length;
  let models = 0;
  for (let i = 0; i < total; i++) {
    const a = inputs === null ? Array.from({ length: n }, (_, v) => Math.floor(list[i]! / 2 ** v) % 2 === 1) : assignments[i]!;
    if (value(a)) models++;
  }
  // A second seed draws other measurement outcomes; without measurements or resets the run is
  // deterministic and a second one would repeat the first.
  let draws = false;
  for (let g = 0; g < circuit.gates && !draws; g++) draws = circuit.kind[g] === K.measure || circuit.kind[g] === K.reset;
  const seeds = draws ? [seed, seed + 1] : [seed];
  const register = completion === undefined ? undefined : { size: n, value };
  for (const s of seeds) {
    // Progress per assignment: a circuit without measurements has one seed, and its run may take minutes.
    const onChecked = opts.onProgress && ((done: number): void => opts.onProgress!((s - seed + done / Math.max(1, total)) / seeds.length));
    const bad = checkOracleSparse(circuit, cnf, { kind, seed: s, assignments: list, explicit: inputs === null ? undefined : assignments, register, onChecked });
    opts.onProgress?.((s - seed + 1) / seeds.length);
    if (bad !== null) {
      const { f, shown } = expectedValue(cnf, completion, bad.assignment);
      return {
        simulator: "state-vector", assignments: total, models,
        counterexample: { ...shown, expected: expectation(kind, f), actual: bad.message },
      };
    }
  }
  return { simulator: "state-vector", assignments: total, models, counterexample: null };
}

/** What the oracle should do on an assignment with formula value f. */
function expectation(kind: "phase" | "flag", f: boolean): string {
  return kind === "phase"
    ? `phase ${f ? "-1" : "+1"} (the formula is ${f ? "" : "not "}satisfied), every work qubit back to |0>`
    : `target flipped ${f ? "" : "not "}(the formula is ${f ? "" : "not "}satisfied), every work qubit back to |0>`;
}

export type { BitProgram };
