/**
 * Cancelling adjacent pairs of one self-inverse gate (H H, X X, a CNOT twice, ...) before the
 * symbolic run: an exact rewrite, so whatever the run shows of the result holds of the circuit.
 * The run needs it where such a pair hides a gate it does read: H H before a measurement opens a
 * path variable that no gadget closes, while the measurement alone is a measurement of the wire
 * (a duplicated Hadamard is a dropped one).
 */
import type { Circuit } from "../ir/circuit.js";
import { K } from "../ir/kinds.js";

const SELF_INVERSE = new Set<number>([K.x, K.y, K.z, K.h, K.cx, K.cz, K.ccx, K.mcx, K.mcz]);

/** The circuit without its cancelling pairs, and each kept gate's index in `c`; null when none cancel. */
export function cancelPairs(c: Circuit): { circuit: Circuit; origin: Int32Array } | null {
  // A stack of kept gates: a gate equal to the top (same kind, operands and condition) pops it,
  // so nested pairs (H X X H) cancel too.
  const kept: number[] = [];
  const same = (a: number, b: number): boolean => {
    if (c.kind[a] !== c.kind[b] || c.cond[a] !== c.cond[b]) return false;
    const sa = c.opStart[a]!;
    const sb = c.opStart[b]!;
    const len = c.opStart[a + 1]! - sa;
    if (c.opStart[b + 1]! - sb !== len) return false;
    for (let i = 0; i < len; i++) if (c.ops[sa + i] !== c.ops[sb + i]) return false;
    return true;
  };
  for (let g = 0; g < c.gates; g++) {
    const top = kept.length > 0 ? kept[kept.length - 1]! : -1;
    if (top >= 0 && SELF_INVERSE.has(c.kind[g]!) && same(top, g)) kept.pop();
    else kept.push(g);
  }
  if (kept.length === c.gates) return null;
  const kind = new Uint8Array(kept.length);
  const cond = new Int32Array(kept.length);
  const opStart = new Uint32Array(kept.length + 1);
  let size = 0;
  for (const g of kept) size += c.opStart[g + 1]! - c.opStart[g]!;
  const ops = new Int32Array(size);
  let at = 0;
  kept.forEach((g, i) => {
    kind[i] = c.kind[g]!;
    cond[i] = c.cond[g]!;
    opStart[i] = at;
    ops.set(c.ops.subarray(c.opStart[g]!, c.opStart[g + 1]!), at);
    at += c.opStart[g + 1]! - c.opStart[g]!;
  });
  opStart[kept.length] = at;
  return { circuit: { ...c, gates: kept.length, kind, cond, opStart, ops }, origin: Int32Array.from(kept) };
}
