/**
 * Scratch arrays for passes, kept between calls. A fresh array of a hundred megabytes costs far
 * more in page faults than the pass that fills it; a kept one is already mapped. Each caller
 * names its arrays so that two live at once never alias. Contents are undefined: fill before use.
 * Never return a scratch array (or a view of one) as part of a result.
 */
import { releaseSpares } from "./circuit.js";

const kept = new Map<string, Int32Array>();

export function scratchInt32(name: string, size: number): Int32Array {
  let a = kept.get(name);
  if (a === undefined || a.length < size) {
    a = new Int32Array(Math.max(size, Math.ceil((a?.length ?? 0) * 1.5)));
    kept.set(name, a);
  }
  return a.subarray(0, size);
}

let pipelines = 0;

/**
 * Runs a pipeline that may keep scratch arrays and recycled circuit buffers between its stages;
 * when the outermost one returns, they are released, so a library user's process does not keep
 * hundreds of megabytes alive after a large compile.
 */
export function withBuffers<T>(run: () => T): T {
  pipelines++;
  try {
    return run();
  } finally {
    if (--pipelines === 0) {
      kept.clear();
      releaseSpares();
    }
  }
}
