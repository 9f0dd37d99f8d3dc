/**
 * The engine's driver, shared by the cost table (index.ts) and the front (front.ts): one run
 * over a stream, again with more kept when it fell short.
 */
import type { Uncompute } from "../passes/lower.js";
import { CountingEngine, type EngineResult, type WireMemory } from "./engine.js";
import { LoweringStream, VirtualIds } from "./lowering.js";
import { sweepCount } from "./sweep.js";

/** Built instead of counted when the engine cannot be exact and the circuit has at most this many template instances. */
export const BUILD_LIMIT = 400_000;
/** The engine's default window of recent instances. */
export const DEFAULT_LAG = 1 << 16;
/** Memory for the copies kept per wire on a second run. */
export const HISTORY_BYTES = 256 << 20;

/**
 * Runs the engine over a stream; when it kept too few instances (a walk along a seldom used wire,
 * or a cancellation across a long stretch), runs it again keeping more, and at last everything,
 * where nothing can fall short: a shortfall never reaches a result.
 */
export function run(base: number, optimize: boolean, levels: boolean, mode: { basis: "toffoli" | "clifford+t"; uncompute: Uncompute; toffoliAnds: boolean }, emit: (low: LoweringStream, ids: VirtualIds) => void, sizing: { lag: number; history: number; wires: number; ids: number; wireMemory?: WireMemory; records?: number; farReach?: boolean; ring?: number; eagerLag?: boolean; keepFreed?: number }): EngineResult {
  let { lag, history } = sizing;
  let wires = sizing.wires;
  // Instances expected when everything is kept (the ring sized once; it grows if there are more).
  let ring = sizing.ring ?? 0;
  // Counting Toffolis (a toffoli-basis run) the circuit has few phase gates, if any: first try
  // without the second cancel-inverses, which the pipeline then skips.
  let second = levels;
  for (let attempt = 0; ; attempt++) {
    const engine = new CountingEngine({ base, optimize, levels, lag, history, wires, second, ids: sizing.ids, deferTrails: true, ...(ring > 0 ? { ring } : {}), ...(sizing.eagerLag ? { eagerLag: true } : {}), ...(sizing.keepFreed ? { keepFreed: sizing.keepFreed } : {}), ...(sizing.wireMemory ? { wireMemory: sizing.wireMemory } : {}) });
    const ids = new VirtualIds(base);
    const low = new LoweringStream(engine, ids, mode, sizing.ids, sizing.records ?? 1024, sizing.wireMemory);
    emit(low, ids);
    low.finish();
    const r = engine.finish();
    if (r.secondNeeded) {
      second = true;
      attempt--;
      continue;
    }
    if (!r.historyShort && !r.lagShort) return r;
    wires = r.qubits;
    // Keep more; the last resort keeps every instance (memory grows with the circuit), so that
    // nothing can fall short.
    // A window 16 times longer whose ring (twice the window) would hold the whole circuit: keep
    // everything instead, in a ring sized to it.
    if (attempt === 0 && !(r.lagShort && sizing.farReach) && !(r.lagShort && 32 * lag >= r.instances)) {
      if (r.historyShort) history = Math.max(1, Math.min(16 * history, Math.floor(HISTORY_BYTES / 40 / r.qubits)));
      if (r.lagShort) lag *= 16;
    } else {
      lag = Infinity;
      // Every instance kept: the ring sized once to the count just made (no doubling copies).
      ring = r.instances + 64;
    }
  }
}


/**
 * The sweep (sweep.ts) first where it may cover the stream (`sweep`: a wide or textbook oracle;
 * the optimizer on), the engine where it gives up or is not asked.
 */
export function runSwept(sweep: boolean, base: number, optimize: boolean, levels: boolean, mode: { basis: "toffoli" | "clifford+t"; uncompute: Uncompute; toffoliAnds: boolean }, emit: (low: LoweringStream, ids: VirtualIds) => void, sizing: { lag: number; history: number; wires: number; ids: number; wireMemory?: WireMemory; records?: number; farReach?: boolean; ring?: number; eagerLag?: boolean; keepFreed?: number }): EngineResult {
  if (sweep && optimize) {
    const r = sweepCount({ base, levels, wires: sizing.wires, ids: sizing.ids, ...(sizing.wireMemory ? { wireMemory: sizing.wireMemory } : {}), ...(sizing.keepFreed ? { keepFreed: sizing.keepFreed } : {}) }, (sink) => {
      const ids = new VirtualIds(base);
      const low = new LoweringStream(sink, ids, mode, sizing.ids, sizing.records ?? 1024, sizing.wireMemory);
      emit(low, ids);
      low.finish();
    });
    if (r !== null) return r;
  }
  return run(base, optimize, levels, mode, emit, sizing);
}
