/** Counting blocks on worker threads, shared by the clause-level and the structured counter. */
import { Worker } from "node:worker_threads";

/**
 * Runs `threads` workers of the script at `url` over `blocks` blocks of `plan` and sums their
 * counts. Interleaved chunks balance the load: pruned blocks cluster, so contiguous halves would not.
 */
export function countInWorkers(url: URL, plan: unknown, blocks: number, threads: number, onProgress?: (f: number) => void): Promise<number> {
  let done = 0;
  const chunk = Math.max(1, Math.floor(blocks / (64 * threads)));
  const jobs = Array.from({ length: threads }, (_, k) => {
    const job = { plan, first: k * chunk, chunk, stride: threads * chunk, blocks };
    return new Promise<number>((resolve, reject) => {
      const w = new Worker(url, { workerData: job });
      w.on("message", (msg: { done?: number; total?: number }) => {
        if (msg.done !== undefined) {
          done += msg.done;
          onProgress?.(done / blocks);
        }
        if (msg.total !== undefined) resolve(msg.total);
      });
      w.on("error", reject);
      w.on("exit", (code) => {
        if (code !== 0) reject(new Error(`counting worker exited with code ${code}`));
      });
    });
  });
  return Promise.all(jobs).then((parts) => parts.reduce((a, b) => a + b, 0));
}
