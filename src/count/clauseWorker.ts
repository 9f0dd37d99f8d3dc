/** Worker entry for parallel model counting: counts the blocks it is sent, reporting each. */
import { parentPort, workerData } from "node:worker_threads";
import { countBlocks, newScratch, type CountPlan } from "./clauseKernel.js";

/** Chunks of `chunk` blocks starting at `first`, then every `stride` blocks, below `blocks`. */
interface Job {
  plan: CountPlan;
  first: number;
  chunk: number;
  stride: number;
  blocks: number;
}

const { plan, first, chunk, stride, blocks } = workerData as Job;
const scratch = newScratch(plan);
let total = 0;
for (let b = first; b < blocks; b += stride) {
  const e = Math.min(blocks, b + chunk);
  total += countBlocks(plan, b, e, scratch);
  parentPort!.postMessage({ done: e - b });
}
parentPort!.postMessage({ total });
