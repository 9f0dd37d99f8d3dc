/**
 * Counting a purely linear structure (only XOR-like definitions, parity constraints and unit
 * clauses) by Gaussian elimination over GF(2): the models of a consistent system of linear
 * equations in u unknowns number 2^(u - rank), and an inconsistent one has none. Polynomial where
 * enumeration is exponential (the dubois family of SATLIB is such a system).
 */
import { K_NOT, K_XNOR, K_XOR, K_EQUIV, type StructuredPlan } from "./kernel.js";

/** Most unknowns solved by elimination (the dense bit matrix is unknowns^2 / 8 bytes). */
export const MAX_LINEAR_UNKNOWNS = 4096;

/** True when every part of the plan is linear over GF(2). */
export function isLinear(plan: StructuredPlan): boolean {
  if (plan.grpExactlyOne.length > 0) return false;
  for (const k of plan.defKind) if (k !== K_EQUIV && k !== K_NOT && k !== K_XOR && k !== K_XNOR) return false;
  for (let i = 0; i + 1 < plan.clauseStart.length; i++) if (plan.clauseStart[i + 1]! - plan.clauseStart[i]! !== 1) return false;
  return true;
}

/**
 * Models of a linear plan over its enumerated variables (the same number the kernel would
 * count), or undefined when it has too many unknowns. Unknowns: the enumerated variables and the
 * definitions; constants are folded into the right-hand sides.
 */
export function countLinear(plan: StructuredPlan): bigint | undefined {
  const F = plan.enumerated;
  const C = plan.constWords.length;
  const D = plan.defKind.length;
  const unknowns = F + D;
  if (unknowns > MAX_LINEAR_UNKNOWNS) return undefined;
  // Column of a slot (-1 for constants); constant value of a constant slot.
  const column = (slot: number): number => (slot < F ? slot : slot < F + C ? -1 : slot - C);
  const constant = (slot: number): number => (plan.constWords[slot - F] === 0 ? 0 : 1);
  const words = (unknowns >>> 5) + 1;
  const rows: Uint32Array[] = [];
  const rhs: number[] = [];
  const row = (): Uint32Array => new Uint32Array(words);
  const add = (r: Uint32Array, slot: number, value: { v: number }): void => {
    const c = column(slot);
    if (c < 0) value.v ^= constant(slot);
    else r[c >>> 5]! ^= 1 << (c & 31);
  };
  for (let d = 0; d < D; d++) {
    // y XOR inputs (negations folded in) = 1 for not / xnor, else 0.
    const r = row();
    const value = { v: plan.defKind[d] === K_NOT || plan.defKind[d] === K_XNOR ? 1 : 0 };
    add(r, F + C + d, value);
    for (let k = plan.defInStart[d]!; k < plan.defInStart[d + 1]!; k++) {
      const code = plan.defIn[k]!;
      value.v ^= code & 1;
      add(r, code >>> 1, value);
    }
    rows.push(r);
    rhs.push(value.v);
  }
  for (let p = 0; p + 1 < plan.parStart.length; p++) {
    const r = row();
    const value = { v: plan.parValue[p]! };
    for (let k = plan.parStart[p]!; k < plan.parStart[p + 1]!; k++) add(r, plan.parSlots[k]!, value);
    rows.push(r);
    rhs.push(value.v);
  }
  for (let i = 0; i + 1 < plan.clauseStart.length; i++) {
    // A unit clause: the literal is true, so its variable equals 1 (or 0 when negated).
    const code = plan.clauseLits[plan.clauseStart[i]!]!;
    const r = row();
    const value = { v: (code & 1) ^ 1 };
    add(r, code >>> 1, value);
    rows.push(r);
    rhs.push(value.v);
  }
  let rank = 0;
  for (let c = 0; c < unknowns && rank < rows.length; c++) {
    const w = c >>> 5;
    const bit = 1 << (c & 31);
    let p = rank;
    while (p < rows.length && (rows[p]![w]! & bit) === 0) p++;
    if (p === rows.length) continue;
    [rows[rank], rows[p]] = [rows[p]!, rows[rank]!];
    [rhs[rank], rhs[p]] = [rhs[p]!, rhs[rank]!];
    const pivot = rows[rank]!;
    for (let i = 0; i < rows.length; i++) {
      if (i === rank || (rows[i]![w]! & bit) === 0) continue;
      const r = rows[i]!;
      for (let k = w; k < words; k++) r[k]! ^= pivot[k]!;
      rhs[i]! ^= rhs[rank]!;
    }
    rank++;
  }
  // A row with no unknown left but a right-hand side of 1 says 0 = 1.
  for (let i = rank; i < rows.length; i++) if (rhs[i] === 1) return 0n;
  return 2n ** BigInt(unknowns - rank);
}
