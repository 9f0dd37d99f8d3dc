/** The worker thread of split.ts: counts its share of the cost tables' runs and posts the results. */
import { parentPort } from "node:worker_threads";
import { TableCounter } from "./index.js";
import type { EngineResult } from "./engine.js";
import type { SplitJob } from "./split.js";
import { collectBetweenRuns } from "../util/collect.js";

// The job comes by message: the thread may be started before the plans are made.
parentPort!.once("message", (job: SplitJob) => {
  try {
    work(job);
  } catch (e) {
    parentPort!.postMessage({ error: e instanceof Error ? e.message : String(e) });
  }
});

function work(job: SplitJob): void {
  const done = new Float64Array(job.progress);
  const counters = new Map<number, TableCounter>();
  const results: EngineResult[] = [];
  let finished = 0;
  for (const [t, i] of job.runs) {
    let c = counters.get(t);
    if (c === undefined) {
      const spec = job.tables[t]!;
      c = new TableCounter(null, job.kind, spec, spec.textbook ?? true, job.plans[t]!);
      counters.set(t, c);
    }
    const r = c.runs()[i]!;
    results.push(c.count(r, (f) => (done[0] = finished + Math.min(1, Math.max(0, f)) * r.weight)));
    finished += r.weight;
    done[0] = finished;
    collectBetweenRuns(r.bytes);
  }
  parentPort!.postMessage({ results });
}
