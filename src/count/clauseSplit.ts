/**
 * Counting formulas with more variables than plain enumeration can take: branch on a variable,
 * propagate unit clauses, and hand each residual formula that is small enough to the
 * bit-parallel enumerator (clauseKernel.ts). Exact: the two branches of a split partition the
 * assignments, propagation only removes assignments that falsify a clause, and a variable that
 * occurs in no open clause doubles the count. Structured formulas (one-hot encodings, n-queens)
 * collapse quickly under propagation; random formulas are better served by enumeration alone.
 */
import { countBlocks, type CountPlan } from "./clauseKernel.js";

/** Residual formulas with at most this many open variables are enumerated. */
const LEAF_VARIABLES = 22;

/** Counts the models of `plan` over its used variables by splitting; returns a bigint. */
export function countBySplitting(plan: CountPlan, onProgress?: (fraction: number) => void): bigint {
  const n = plan.used;
  const { lits, clauseStart } = plan;
  const m = clauseStart.length - 1;
  const value = new Int8Array(n).fill(-1);
  const trail: number[] = [];
  const occ = new Int32Array(n);
  const mark = new Int32Array(n);
  let stamp = 0;

  /** Propagates units; returns false on a conflict. Assignments go on the trail. */
  function propagate(): boolean {
    for (let changed = true; changed; ) {
      changed = false;
      for (let i = 0; i < m; i++) {
        let open = -1;
        let openCount = 0;
        let sat = false;
        for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) {
          const code = lits[k]!;
          const x = value[code >>> 1]!;
          if (x < 0) {
            openCount++;
            open = code;
          } else if ((x ^ (code & 1)) === 1) {
            sat = true;
            break;
          }
        }
        if (sat) continue;
        if (openCount === 0) return false;
        if (openCount === 1) {
          value[open >>> 1] = (open & 1) ^ 1;
          trail.push(open >>> 1);
          changed = true;
        }
      }
    }
    return true;
  }

  function undo(to: number): void {
    while (trail.length > to) value[trail.pop()!] = -1;
  }

  /** Builds the residual formula over the open variables of the open clauses. */
  function residual(): { plan: CountPlan; open: number } {
    stamp++;
    const index: number[] = [];
    const outLits: number[] = [];
    const starts: number[] = [0];
    for (let i = 0; i < m; i++) {
      let sat = false;
      const from = outLits.length;
      for (let k = clauseStart[i]!; k < clauseStart[i + 1]! && !sat; k++) {
        const code = lits[k]!;
        const x = value[code >>> 1]!;
        if (x >= 0) {
          sat = (x ^ (code & 1)) === 1;
          continue;
        }
        const v = code >>> 1;
        if (mark[v] !== stamp) {
          mark[v] = stamp;
          occ[v] = index.length;
          index.push(v);
        }
        outLits.push((occ[v]! << 1) | (code & 1));
      }
      if (sat) outLits.length = from;
      else starts.push(outLits.length);
    }
    const used = index.length;
    const sub: CountPlan = {
      used,
      free: 0,
      unsat: false,
      lits: Int32Array.from(outLits),
      clauseStart: Uint32Array.from(starts),
      inner: Math.max(0, Math.min(used - 5, 16)),
    };
    return { plan: sub, open: used };
  }

  /** Picks the open variable with most occurrences in open clauses, weighting short clauses. */
  function pick(): number {
    occ.fill(0);
    for (let i = 0; i < m; i++) {
      let sat = false;
      let width = 0;
      for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) {
        const code = lits[k]!;
        const x = value[code >>> 1]!;
        if (x < 0) width++;
        else if ((x ^ (code & 1)) === 1) sat = true;
      }
      if (sat) continue;
      const w = width <= 2 ? 4 : 1;
      for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) {
        const v = lits[k]! >>> 1;
        if (value[v]! < 0) occ[v]! += w;
      }
    }
    let best = -1;
    for (let v = 0; v < n; v++) if (value[v]! < 0 && (best < 0 || occ[v]! > occ[best]!)) best = v;
    return best;
  }

  let progress = 0;
  /** Models over all n variables below the current partial assignment. */
  function count(weight: number): bigint {
    const mark0 = trail.length;
    if (!propagate()) {
      undo(mark0);
      progress += weight;
      onProgress?.(progress);
      return 0n;
    }
    let assigned = 0;
    for (let v = 0; v < n; v++) if (value[v]! >= 0) assigned++;
    const { plan: sub, open } = residual();
    let result: bigint;
    if (open <= LEAF_VARIABLES) {
      const blocks = sub.used <= 5 ? 1 : 2 ** (sub.used - 5 - sub.inner);
      result = BigInt(countBlocks(sub, 0, blocks)) << BigInt(n - assigned - open);
      progress += weight;
      onProgress?.(progress);
    } else {
      const v = pick();
      const before = trail.length;
      result = 0n;
      for (const b of [0, 1]) {
        value[v] = b;
        trail.push(v);
        result += count(weight / 2);
        undo(before);
      }
    }
    undo(mark0);
    return result;
  }

  return count(1);
}
