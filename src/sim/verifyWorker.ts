/** Worker entry for parallel verification: checks its range of blocks, reporting progress. */
import { parentPort, workerData } from "node:worker_threads";
import { runVerifyRange, type VerifyJob } from "./verifyKernel.js";

const job = workerData as VerifyJob;
let pending = 0;
const result = runVerifyRange(job, (words) => {
  pending += words;
  if (pending >= 1024) {
    parentPort!.postMessage({ words: pending });
    pending = 0;
  }
});
parentPort!.postMessage({ words: pending, result });
