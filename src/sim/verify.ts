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
import { findModels } from "../cnf/findModels.js";
import type { Circuit } from "../ir/circuit.js";
import { compileBitProgram, newBlock, runBlock, type BitProgram } from "./bitsim.js";
import { checkOracleSparse } from "./check.js";
import { hash3, runVerifyRange, sampleBit, type RangeResult, type VerifyJob } from "./verifyKernel.js";

/** Options of {@link verifyOracle}. */
export interface VerifyOptions {
  /** `phase` or `flag`; default: `flag` when the circuit has a target register, else `phase`. */
  readonly kind?: "phase" | "flag";
  /** Check all 2^n assignments when n is at most this (default 26); sample above it. */
  readonly exhaustiveLimit?: number;
  /** Random assignments to check when sampling (default 4096 bit-parallel, 256 state-vector). */
  readonly samples?: number;
  /** Seed for samples and measurement outcomes (default 1). */
  readonly seed?: number;
  /** Worker threads (default: the number of cores). */
  readonly threads?: number;
  /** Progress, from 0 to 1. */
  readonly onProgress?: (fraction: number) => void;
}

/** What {@link verifyOracle} found. */
export interface VerifyResult {
  /** True when every check passed. */
  readonly verified: boolean;
  /** `exhaustive` (all 2^n assignments) or `sampled`. */
  readonly method: "exhaustive" | "sampled";
  /** Which simulator ran the circuit. */
  readonly simulator: "bit-parallel" | "state-vector";
  /** Assignments checked. */
  readonly assignments: number;
  /** Checked assignments that satisfy the formula (all models when exhaustive). */
  readonly models: number;
  /** The first failing assignment, or null. */
  readonly counterexample: Counterexample | null;
  /** Why the circuit could not even be run against the formula (register sizes), or undefined. */
  readonly problem?: string;
}

/** A failing assignment and what went wrong there. */
export interface Counterexample {
  /** Values of variables 1..n. */
  readonly assignment: boolean[];
  /** The assignment as a DIMACS clause of literals, e.g. `-1 2 -3 0`. */
  readonly dimacs: string;
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

const dimacsOf = (a: boolean[]): string => `${a.map((on, v) => (on ? v + 1 : -(v + 1))).join(" ")}${a.length ? " " : ""}0`;

/**
 * Verifies `circuit` as an oracle for `cnf`.
 *
 * @example
 * ```ts
 * const r = await verifyOracle(cnf, compileOracle(cnf).circuit);
 * if (!r.verified) console.log(r.counterexample?.dimacs);
 * ```
 */
export async function verifyOracle(cnf: Cnf, circuit: Circuit, opts: VerifyOptions = {}): Promise<VerifyResult> {
  const reg = (role: string) => circuit.registers.find((r) => r.role === role);
  const kind = opts.kind ?? (reg("target")?.size ? "flag" : "phase");
  const search = reg("search")?.size ?? 0;
  const seed = opts.seed ?? 1;
  // Word indices are 32-bit in the kernel: 2^36 assignments is the most it can enumerate.
  const limit = Math.min(opts.exhaustiveLimit ?? DEFAULT_EXHAUSTIVE_LIMIT, MAX_EXHAUSTIVE_LIMIT);
  const n = cnf.variables;
  const base = { verified: false, assignments: 0, models: 0, counterexample: null } as const;
  if (search !== n) {
    return { ...base, method: "exhaustive", simulator: "bit-parallel", problem: `the search register x has ${search} qubits but the formula declares ${n} variables` };
  }
  if (kind === "flag" && reg("target")?.size !== 1) {
    return { ...base, method: "exhaustive", simulator: "bit-parallel", problem: "a flag oracle needs a target register of one qubit" };
  }
  const program = compileBitProgram(circuit);
  if ("unsupported" in program) return stateVector(cnf, circuit, kind, limit, opts, seed);
  const exhaustive = n <= limit;
  const models = exhaustive ? new Uint8Array(0) : flatten(findModels(cnf, 256, seed), n);
  const modelCount = exhaustive ? 0 : models.length / Math.max(1, n);
  const samples = exhaustive ? 0 : (opts.samples ?? 4096);
  const totalWords = exhaustive ? (n >= 5 ? 2 ** (n - 5) : 1) : Math.ceil((samples + modelCount) / 32);
  const work = reg("work");
  const job: VerifyJob = {
    program, variables: n, lits: cnf.lits, clauseStart: cnf.clauseStart, kind,
    target: kind === "flag" ? reg("target")!.start : -1,
    workStart: work?.start ?? 0, workEnd: (work?.start ?? 0) + (work?.size ?? 0),
    seed, mode: exhaustive ? "exhaustive" : "sampled",
    blockWords: Math.min(64, totalWords), fromWord: 0, toWord: totalWords, samples, models, modelCount,
  };
  const result = await runJob(job, totalWords, opts);
  const counterexample = result.firstBad < 0 ? null : describe(job, circuit, result.firstBad);
  return {
    verified: result.bad === 0,
    method: job.mode,
    simulator: "bit-parallel",
    assignments: result.checked,
    models: result.models,
    counterexample,
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
function describe(job: VerifyJob, c: Circuit, lane: number): Counterexample {
  const n = job.variables;
  const assignment = Array.from({ length: n }, (_, v) =>
    job.mode === "exhaustive" ? Math.floor(lane / 2 ** v) % 2 === 1 : sampleBit(job, lane, v) === 1,
  );
  const f = evaluate({ variables: n, lits: job.lits, clauseStart: job.clauseStart }, assignment);
  const name = (q: number): string => {
    const r = c.registers.find((x) => q >= x.start && q < x.start + x.size)!;
    return `${r.name}[${q - r.start}]`;
  };
  const expected = job.kind === "phase"
    ? `phase ${f ? "-1" : "+1"} (the formula is ${f ? "" : "not "}satisfied), every work qubit back to |0>`
    : `target flipped ${f ? "" : "not "}(the formula is ${f ? "" : "not "}satisfied), every work qubit back to |0>`;
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
  return { assignment, dimacs: dimacsOf(assignment), expected, actual: problems.join("; ") || "a mismatch" };
}

/** Circuits with S, T, or other non-classical gates: the exact state-vector simulator. */
function stateVector(cnf: Cnf, circuit: Circuit, kind: "phase" | "flag", limit: number, opts: VerifyOptions, seed: number): VerifyResult {
  const n = cnf.variables;
  const exhaustive = n <= Math.min(limit, STATE_VECTOR_EXHAUSTIVE);
  const list: number[] = [];
  const assignments: boolean[][] = [];
  if (exhaustive) for (let x = 0; x < 2 ** n; x++) list.push(x);
  const samples = exhaustive ? [] : [...findModels(cnf, 32, seed).map((m) => Array.from(m, (b) => b === 1))];
  if (!exhaustive) {
    const k = opts.samples ?? 256;
    for (let s = 0; s < k; s++) samples.push(Array.from({ length: n }, (_, v) => (hash3(seed, s, v) & 1) === 1));
    assignments.push(...samples);
  }
  const total = exhaustive ? list.length : assignments.length;
  let models = 0;
  for (let i = 0; i < total; i++) {
    const a = exhaustive ? Array.from({ length: n }, (_, v) => Math.floor(list[i]! / 2 ** v) % 2 === 1) : assignments[i]!;
    if (evaluate(cnf, a)) models++;
  }
  const seeds = [seed, seed + 1];
  for (const s of seeds) {
    const bad = checkOracleSparse(circuit, cnf, { kind, seed: s, assignments: exhaustive ? list : [], explicit: exhaustive ? undefined : assignments });
    opts.onProgress?.((s - seed + 1) / seeds.length);
    if (bad !== null) {
      const f = evaluate(cnf, bad.assignment);
      return {
        verified: false, method: exhaustive ? "exhaustive" : "sampled", simulator: "state-vector", assignments: total, models,
        counterexample: {
          assignment: bad.assignment, dimacs: dimacsOf(bad.assignment),
          expected: kind === "phase" ? `phase ${f ? "-1" : "+1"} (the formula is ${f ? "" : "not "}satisfied), every work qubit back to |0>` : `target flipped ${f ? "" : "not "}(the formula is ${f ? "" : "not "}satisfied), every work qubit back to |0>`,
          actual: bad.message,
        },
      };
    }
  }
  return { verified: true, method: exhaustive ? "exhaustive" : "sampled", simulator: "state-vector", assignments: total, models, counterexample: null };
}

export type { BitProgram };
