/**
 * Cost tables with their counting runs shared between two threads: the table of a million
 * clauses is ten runs of 3 to 8 s each, independent of one another, so a second core shortens the
 * wait (a million clauses: 55 s to 38 s; the memory-heavy runs still go one after another). The
 * figures are those of costTable, run for run (a test holds them equal).
 */
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import type { Cnf } from "../cnf/cnf.js";
import type { EngineResult } from "./engine.js";
import { sharingPlans, type OracleKind, type OraclePlan } from "../synth/index.js";
import { Progress, TableCounter, type CostOptions, type CostRow } from "./index.js";
import { collectBetweenRuns } from "../util/collect.js";

/** One table of {@link costTables}. */
export interface TableSpec extends Pick<CostOptions, "register" | "structure"> {
  /** Count the textbook reference too (default true). */
  readonly textbook?: boolean;
}

/** What the worker thread is given (splitWorker.ts). */
export interface SplitJob {
  /**
   * Each table's plan, made on the main thread (structured clone keeps the plans with and
   * without structure sharing their simplified clauses). Planning again in the worker took CPU
   * and memory of its own: measured, the two tables' counters of a million random clauses took
   * 2.3 s of CPU to plan and set up, 0.1 s from copied plans (SATLIB bw_large.c: 0.9 s, 0.1 s).
   */
  readonly plans: readonly OraclePlan[];
  readonly kind: OracleKind;
  readonly tables: readonly TableSpec[];
  /** Its runs: table and index into that table's runs(). */
  readonly runs: readonly (readonly [table: number, run: number])[];
  /** Its progress: instances-weight done so far, written by the worker as it goes. */
  readonly progress: SharedArrayBuffer;
}

/** Roughly what planning leaves to collect per literal (see costTables). */
const PLAN_BYTES_PER_LITERAL = 16;
/** Literals from which the worker thread is started before planning (some 0.3 s of its start then overlap it). */
const EARLY_LITERALS = 300_000;
/** Below this many estimated CPU seconds a table is counted on one thread (a thread costs a start and a copy of the plans). */
const SPLIT_FROM_SECONDS = 3;
/**
 * A run estimated to hold more than this stays on the main thread (see costTables), so that two
 * such runs never overlap. Below it two runs may: a million random 3-SAT clauses' wide and
 * textbook runs (165-210 MB each with their id tables and AND records) are shared. Measured
 * (quiet machine, same table): sharing them 14.3-14.7 s and 663-667 MB; keeping them here one
 * after another 16.7-17.5 s and 562-600 MB. Two sweeps at once slow each other by a fifth or so
 * (the work is memory-bound), so sharing saves less than the estimates say.
 */
const HEAVY_BYTES = 256 << 20;

/**
 * The cost tables of one formula (see costTable), with their runs shared between this thread and
 * one worker thread when the machine has two cores or more and the work is worth it. Runs go, the
 * longest first, to whichever thread has less estimated work. `threads: 1` counts everything here;
 * `splitFrom` is the estimated CPU seconds from which to split (default 3); `heavyBytes` the
 * estimated memory above which a run stays on this thread (default 256 MB); `worker` the worker
 * module (default splitWorker.js beside this one; a thread that cannot run leaves its runs here);
 * `earlyFrom` the literals from which the thread is started before planning (default 300,000).
 */
export async function costTables(cnf: Cnf, kind: OracleKind, tables: readonly TableSpec[], options: { readonly onProgress?: (fraction: number) => void; readonly threads?: number; readonly splitFrom?: number; readonly heavyBytes?: number; readonly worker?: URL; readonly earlyFrom?: number } = {}): Promise<CostRow[][]> {
  const threads = Math.min(2, options.threads ?? availableParallelism());
  // A formula this large is split for sure: the thread starts (loads its modules) while this one
  // plans, and gets its job when the plans are made.
  const url = options.worker ?? new URL("./splitWorker.js", import.meta.url);
  let early = threads >= 2 && cnf.lits.length >= (options.earlyFrom ?? EARLY_LITERALS) ? spawnWorker(url) : null;
  let counters: TableCounter[];
  try {
    counters = sharingPlans(() => tables.map((t) => new TableCounter(cnf, kind, t, t.textbook ?? true)));
  } catch (e) {
    void early?.thread.terminate();
    throw e;
  }
  // Planning (simplification, structure recovery) leaves its tables behind: collected before the
  // runs start, they do not add to what the runs hold (a million clauses: some 50 MB).
  collectBetweenRuns(PLAN_BYTES_PER_LITERAL * cnf.lits.length);
  const runs = counters.map((c) => c.runs());
  const all = runs.flatMap((rs, t) => rs.map((r, i) => ({ t, i, r })));
  const total = all.reduce((s, x) => s + x.r.weight, 0);
  const progress = new Progress(total, options.onProgress);
  const results: EngineResult[][] = runs.map((rs) => new Array<EngineResult>(rs.length));
  const seconds = all.reduce((s, x) => s + x.r.seconds, 0);
  const mine: typeof all = [];
  const theirs: typeof all = [];
  if (threads < 2 || seconds < (options.splitFrom ?? SPLIT_FROM_SECONDS)) mine.push(...all);
  else {
    // The runs that hold much memory (the wide and textbook oracles of a few million clauses, a
    // structured lean run keeping every instance) stay on this thread, one at a time: two engine
    // runs at once took a million clauses from 0.6 to 1 GB (session 7; the sweep's runs are lighter). The others go longest first to the
    // less loaded thread (Graham's LPT rule, 1969, from memory).
    const heavy = (x: (typeof all)[number]): boolean => x.r.bytes > (options.heavyBytes ?? HEAVY_BYTES);
    let a = 0;
    let b = 0;
    for (const x of all) {
      if (!heavy(x)) continue;
      mine.push(x);
      a += x.r.seconds;
    }
    for (const x of all.filter((y) => !heavy(y)).sort((p, q) => q.r.seconds - p.r.seconds)) {
      if (a <= b) {
        mine.push(x);
        a += x.r.seconds;
      } else {
        theirs.push(x);
        b += x.r.seconds;
      }
    }
    // In table order within each thread: a table lets go of one strategy's streams before the next.
    const order = (p: (typeof all)[number], q: (typeof all)[number]): number => p.t - q.t || p.i - q.i;
    mine.sort(order);
    theirs.sort(order);
  }
  const shared = new SharedArrayBuffer(8);
  const theirDone = new Float64Array(shared);
  const theirWeight = theirs.reduce((s, x) => s + x.r.weight, 0);
  let myDone = 0;
  let current = 0;
  const report = (): void => progress.emit((myDone + current + Math.min(theirDone[0]!, theirWeight)) / total);
  if (theirs.length === 0 && early !== null) {
    void early.thread.terminate();
    early = null;
  }
  const worker = theirs.length === 0 ? null : early ?? spawnWorker(url);
  try {
    // Within the try: a thread left waiting for its job would keep the process alive.
    worker?.thread.postMessage({ plans: counters.map((c) => c.oraclePlan), kind, tables, runs: theirs.map((x) => [x.t, x.i] as const), progress: shared } satisfies SplitJob);
    for (const x of mine) {
      results[x.t]![x.i] = counters[x.t]!.count(x.r, options.onProgress && ((f) => {
        current = Math.min(1, Math.max(0, f)) * x.r.weight;
        report();
      }));
      current = 0;
      myDone += x.r.weight;
      collectBetweenRuns(x.r.bytes);
      report();
    }
    if (worker !== null) {
      const timer = options.onProgress ? setInterval(report, 200) : null;
      try {
        const got = await worker.result;
        theirs.forEach((x, j) => (results[x.t]![x.i] = got[j]!));
      } catch {
        // The thread could not run (no worker file next to this one, a thread out of memory):
        // its runs are counted here instead; an error of the counting itself comes back here too.
        for (const x of theirs) {
          results[x.t]![x.i] = counters[x.t]!.count(x.r);
          myDone += x.r.weight;
        }
      } finally {
        if (timer !== null) clearInterval(timer);
      }
    }
  } finally {
    if (worker !== null) void worker.thread.terminate();
  }
  progress.emit(1);
  return counters.map((c, t) => c.rows(results[t]!));
}

/** The worker's message: its runs' results, or why it failed. */
type WorkerReply = { readonly results: EngineResult[] } | { readonly error: string };

/** Starts the worker thread; it counts when it is sent its job (a SplitJob message). */
function spawnWorker(url: URL): { thread: Worker; result: Promise<EngineResult[]> } {
  const thread = new Worker(url);
  const result = new Promise<EngineResult[]>((resolve, reject) => {
    thread.once("message", (m: WorkerReply) => ("error" in m ? reject(new Error(m.error)) : resolve(m.results)));
    thread.once("error", reject);
    thread.once("exit", (code) => reject(new Error(`the counting thread stopped (exit code ${code}) before it gave its results`)));
  });
  // An unhandled rejection must not outlive a failure on this thread's side.
  result.catch(() => undefined);
  return { thread, result };
}
