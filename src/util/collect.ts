/** Garbage collection between large counting runs (cost tables, search costs). */

/**
 * Collects garbage between runs where the host exposes it (the command does, bin.ts): a run drops
 * tens of MB of typed arrays, and V8 left them, and the allocator their pages, until much later:
 * a million clauses on one thread peaked at 466-477 MB without, 398-420 MB with.
 */
export function collectBetweenRuns(): void {
  const gc = (globalThis as { gc?: unknown }).gc;
  if (typeof gc === "function") (gc as () => void)();
}
