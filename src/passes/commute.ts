/** Shared helpers of the optimizer passes: roles, commutation, inverse pairs (numeric tables: they run per gate). */
import { INVERSE_KIND, K, ROLE_BODY, ROLE_LAST, ROLE_OTHER } from "../ir/kinds.js";
import { qubitOf, type Circuit } from "../ir/circuit.js";

/** Number of qubit operands of gate g. */
export function qubitCount(c: Circuit, g: number): number {
  const k = c.kind[g]!;
  if (k === K.gphase) return 0;
  if (k === K.measure) return 1;
  return c.opStart[g + 1]! - c.opStart[g]!;
}

/** The role code (ROLE_Z, ROLE_X, ROLE_OTHER) of gate g on qubit q, or -1 if it does not touch q. */
export function roleCodeOn(c: Circuit, g: number, q: number): number {
  const n = qubitCount(c, g);
  const start = c.opStart[g]!;
  for (let i = 0; i < n; i++) {
    if (qubitOf(c.ops[start + i]!) === q) {
      if (c.cond[g]! >= 0) return ROLE_OTHER;
      const k = c.kind[g]!;
      return i === n - 1 ? ROLE_LAST[k]! : ROLE_BODY[k]!;
    }
  }
  return -1;
}

/** True when gates g and h commute by the role rule (see kinds.ts roleOf). */
export function commute(c: Circuit, g: number, h: number): boolean {
  const n = qubitCount(c, g);
  const start = c.opStart[g]!;
  for (let i = 0; i < n; i++) {
    const q = qubitOf(c.ops[start + i]!);
    const rh = roleCodeOn(c, h, q);
    if (rh < 0) continue;
    const rg = roleCodeOn(c, g, q);
    if (rg === ROLE_OTHER || rg !== rh) return false;
  }
  return true;
}

/** True when gate h undoes gate g exactly (same operands, inverse kinds, no conditions). */
export function inversePair(c: Circuit, g: number, h: number): boolean {
  if (c.cond[g]! >= 0 || c.cond[h]! >= 0) return false;
  const kg = c.kind[g]!;
  if (INVERSE_KIND[kg] !== c.kind[h]) return false;
  const a = c.opStart[g]!;
  const b = c.opStart[h]!;
  const n = c.opStart[g + 1]! - a;
  if (c.opStart[h + 1]! - b !== n) return false;
  if (kg === K.gphase) return (c.ops[a]! + c.ops[b]!) % 8 === 0;
  for (let i = 0; i < n; i++) if (c.ops[a + i] !== c.ops[b + i]) return false;
  return true;
}
