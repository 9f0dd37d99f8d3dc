/** Shared helpers of the optimizer passes: roles, commutation, inverse pairs. */
import { GATE_KINDS, INVERSE, roleOf, type Role } from "../ir/kinds.js";
import { operands, qubitOf, type Circuit } from "../ir/circuit.js";

/** Number of qubit operands of gate g. */
export function qubitCount(c: Circuit, g: number): number {
  const name = GATE_KINDS[c.kind[g]!]!;
  if (name === "gphase") return 0;
  if (name === "measure") return 1;
  return c.opStart[g + 1]! - c.opStart[g]!;
}

/** The role of gate g on qubit q, or null if it does not touch q. Conditioned gates are "other". */
export function roleOn(c: Circuit, g: number, q: number): Role | null {
  const n = qubitCount(c, g);
  const start = c.opStart[g]!;
  for (let i = 0; i < n; i++) {
    if (qubitOf(c.ops[start + i]!) === q) return c.cond[g]! >= 0 ? "other" : roleOf(GATE_KINDS[c.kind[g]!]!, i, n);
  }
  return null;
}

/** True when gates g and h commute by the role rule (see kinds.ts roleOf). */
export function commute(c: Circuit, g: number, h: number): boolean {
  const n = qubitCount(c, g);
  const start = c.opStart[g]!;
  for (let i = 0; i < n; i++) {
    const q = qubitOf(c.ops[start + i]!);
    const rh = roleOn(c, h, q);
    if (rh === null) continue;
    const rg = roleOn(c, g, q)!;
    if (rg === "other" || rg !== rh) return false;
  }
  return true;
}

/** True when gate h undoes gate g exactly (same operands, inverse kinds, no conditions). */
export function inversePair(c: Circuit, g: number, h: number): boolean {
  if (c.cond[g]! >= 0 || c.cond[h]! >= 0) return false;
  const inv = INVERSE[GATE_KINDS[c.kind[g]!]!];
  if (inv === null || GATE_KINDS[c.kind[h]!] !== inv) return false;
  // and/unand are inverses only as a pair of logical operations; gphase angles must negate.
  const a = operands(c, g);
  const b = operands(c, h);
  if (a.length !== b.length) return false;
  if (GATE_KINDS[c.kind[g]!] === "gphase") return (a[0]! + b[0]!) % 8 === 0;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}
