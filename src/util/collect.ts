/** Garbage collection between large counting runs (cost tables). */

/** Estimated bytes of a run (TableRun.bytes) from which it is followed by a collection. */
const COLLECT_FROM_BYTES = 64 << 20;

/**
 * Collects garbage between runs where the host exposes it (the command does, cli/exposeGc.ts): a run drops
 * tens of MB of typed arrays, and V8 left them, and the allocator their pages, until much later:
 * a million clauses on one thread peaked at 466-477 MB without, 398-420 MB with.
 */
export function collectBetweenRuns(bytes: number): void {
  // A small run leaves little to collect, and a full collection costs 5-15 ms and slows what follows.
  if (bytes < COLLECT_FROM_BYTES) return;
  const gc = (globalThis as { gc?: unknown }).gc;
  if (typeof gc === "function") (gc as () => void)();
}
