/**
 * Turns a recovered structure into a structured count (kernel.ts): which free variables must be
 * enumerated, which are fixed by unit clauses, which only double the count, and which
 * definitions and constraints the kernel evaluates.
 */
import type { Structure } from "../structure/index.js";
import { K_AND, K_EQUIV, K_NOT, K_OR, K_XNOR, K_XOR, STRUCTURED_INNER_BITS, type StructuredPlan } from "./kernel.js";

/** A structured count before enumeration. */
export interface StructuredCount {
  readonly plan: StructuredPlan;
  /** The count is (models among the enumerated assignments) x 2^doubling. */
  readonly doubling: number;
  /** A contradiction was found while planning (say, a variable forced both ways): 0 models. */
  readonly zero: boolean;
  /** Operations per 32 assignments (literals read by the kernel), for time estimates. */
  readonly cost: number;
}

const KIND_CODES: Record<string, number> = { equiv: K_EQUIV, not: K_NOT, and: K_AND, or: K_OR, xor: K_XOR, xnor: K_XNOR };

/**
 * Plans the count of `s`'s models. Only the free variables that some constraint needs (directly
 * or through definitions) are enumerated; a free variable that nothing needs doubles the count
 * (every value extends uniquely), and so does every declared variable in no clause. A free
 * variable with a unit clause is fixed to the clause's value instead of enumerated.
 */
export function planStructuredCount(s: Structure): StructuredCount {
  const { lits, clauseStart } = s.remaining;
  const M = clauseStart.length - 1;
  const occurring = s.free.length + s.definitions.length;
  // Local numbering: free variables first (ascending), then defined ones in definition order.
  const local = new Map<number, number>();
  s.free.forEach((v, i) => local.set(v, i));
  s.definitions.forEach((d, i) => local.set(d.variable, s.free.length + i));
  const at = (v: number): number => local.get(v)!;
  const needed = new Uint8Array(occurring);
  for (const p of s.parities) for (const v of p.variables) needed[at(v)] = 1;
  for (const g of s.groups) for (const v of g.variables) needed[at(v)] = 1;
  for (let k = 0; k < lits.length; k++) needed[at(Math.abs(lits[k]!))] = 1;
  for (let d = s.definitions.length - 1; d >= 0; d--) {
    const def = s.definitions[d]!;
    if (needed[s.free.length + d]) for (const l of def.inputs) needed[at(Math.abs(l))] = 1;
  }
  // Unit clauses on free variables fix them.
  const unit = new Int8Array(s.free.length);
  let zero = s.unsat;
  for (let i = 0; i < M; i++) {
    if (clauseStart[i + 1]! - clauseStart[i]! !== 1) continue;
    const l = lits[clauseStart[i]!]!;
    const x = at(Math.abs(l));
    if (x >= s.free.length) continue;
    const sign = l > 0 ? 1 : -1;
    if (unit[x] === -sign) zero = true;
    unit[x] = sign;
  }
  // Slots: enumerated free variables, then fixed ones, then needed definitions.
  const slot = new Int32Array(occurring).fill(-1);
  let F = 0;
  for (let x = 0; x < s.free.length; x++) if (needed[x] && unit[x] === 0) slot[x] = F++;
  const constWords: number[] = [];
  for (let x = 0; x < s.free.length; x++) {
    if (needed[x] && unit[x] !== 0) {
      slot[x] = F + constWords.length;
      constWords.push(unit[x]! > 0 ? -1 : 0);
    }
  }
  let doubling = s.unused;
  for (let x = 0; x < s.free.length; x++) if (!needed[x]) doubling++;
  const defKind: number[] = [];
  const defInStart: number[] = [0];
  const defIn: number[] = [];
  const base = F + constWords.length;
  const operand = (l: number): number => (slot[at(Math.abs(l))]! << 1) | (l < 0 ? 1 : 0);
  s.definitions.forEach((def, d) => {
    if (!needed[s.free.length + d]) return;
    slot[s.free.length + d] = base + defKind.length;
    defKind.push(KIND_CODES[def.kind]!);
    for (const l of def.inputs) defIn.push(operand(l));
    defInStart.push(defIn.length);
  });
  // Remaining clauses under the fixed variables: satisfied ones go, false literals go; shortest
  // first, so that the kernel's early exit comes soon (forced outputs are unit clauses).
  const kept: number[][] = [];
  for (let i = 0; i < M && !zero; i++) {
    const c: number[] = [];
    let sat = false;
    for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) {
      const l = lits[k]!;
      const x = at(Math.abs(l));
      if (x < s.free.length && unit[x] !== 0) {
        if ((unit[x]! > 0) === l > 0) sat = true;
        continue;
      }
      c.push(operand(l));
    }
    if (sat) continue;
    if (c.length === 0) zero = true;
    kept.push(c);
  }
  kept.sort((a, b) => a.length - b.length);
  const clauseStartOut = new Uint32Array(kept.length + 1);
  const clauseLits = new Int32Array(kept.reduce((n, c) => n + c.length, 0));
  let n = 0;
  kept.forEach((c, i) => {
    clauseLits.set(c, n);
    n += c.length;
    clauseStartOut[i + 1] = n;
  });
  const parStart = [0];
  const parSlots: number[] = [];
  for (const p of s.parities) {
    for (const v of p.variables) parSlots.push(slot[at(v)]!);
    parStart.push(parSlots.length);
  }
  const grpStart = [0];
  const grpSlots: number[] = [];
  for (const g of s.groups) {
    for (const v of g.variables) grpSlots.push(slot[at(v)]!);
    grpStart.push(grpSlots.length);
  }
  const plan: StructuredPlan = {
    enumerated: F,
    constWords: Int32Array.from(constWords),
    defKind: Uint8Array.from(defKind),
    defInStart: Uint32Array.from(defInStart),
    defIn: Int32Array.from(defIn),
    parStart: Uint32Array.from(parStart),
    parSlots: Int32Array.from(parSlots),
    parValue: Uint8Array.from(s.parities.map((p) => p.parity)),
    grpStart: Uint32Array.from(grpStart),
    grpSlots: Int32Array.from(grpSlots),
    grpExactlyOne: Uint8Array.from(s.groups.map((g) => (g.exactlyOne ? 1 : 0))),
    clauseStart: clauseStartOut,
    clauseLits,
    inner: Math.max(0, Math.min(F - 5, STRUCTURED_INNER_BITS)),
  };
  const cost = defIn.length + clauseLits.length + parSlots.length + grpSlots.length + defKind.length + kept.length + 1;
  return { plan, doubling, zero, cost };
}
