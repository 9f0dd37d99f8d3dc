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
  const enumerated: number[] = [];
  for (let x = 0; x < s.free.length; x++) if (needed[x] && unit[x] === 0) enumerated.push(x);
  const F = enumerated.length;
  // The kernel's block variables (the highest slots) are fixed per block, where they decide
  // constraints early: give them the variables of the constraints that depend on fewest.
  enumeratedOrder(s, at, enumerated, needed).forEach((x, i) => (slot[x] = i));
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

/**
 * The enumerated variables in slot order: the variables of the constraints with the smallest
 * supports (free variables they depend on, through definitions) go last, to the block slots.
 * Kept in plain variable order above 52 variables, where supports stop fitting a double's bits
 * (such counts are refused anyway).
 */
function enumeratedOrder(s: Structure, at: (v: number) => number, enumerated: number[], needed: Uint8Array): number[] {
  const F = enumerated.length;
  if (F > 52 || F <= 5) return enumerated;
  const bit = new Float64Array(needed.length);
  enumerated.forEach((x, i) => (bit[x] = 2 ** i));
  const or = (a: number, b: number): number => {
    // Bitwise OR of two non-negative integers below 2^52, as doubles.
    const hi = Math.floor(a / 2 ** 26) | Math.floor(b / 2 ** 26);
    return hi * 2 ** 26 + ((a % 2 ** 26) | (b % 2 ** 26));
  };
  const support = new Float64Array(needed.length);
  for (let x = 0; x < s.free.length; x++) support[x] = bit[x]!;
  s.definitions.forEach((d, i) => {
    const y = s.free.length + i;
    if (!needed[y]) return;
    let m = 0;
    for (const l of d.inputs) m = or(m, support[at(Math.abs(l))]!);
    support[y] = m;
  });
  const constraints: number[] = [];
  const { lits, clauseStart } = s.remaining;
  for (let i = 0; i + 1 < clauseStart.length; i++) {
    let m = 0;
    for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) m = or(m, support[at(Math.abs(lits[k]!))]!);
    constraints.push(m);
  }
  for (const p of s.parities) constraints.push(p.variables.reduce((m, v) => or(m, support[at(v)]!), 0));
  for (const g of s.groups) constraints.push(g.variables.reduce((m, v) => or(m, support[at(v)]!), 0));
  const size = (m: number): number => {
    let n = 0;
    for (let i = 0; i < F; i++) if (Math.floor(m / 2 ** i) % 2 === 1) n++;
    return n;
  };
  const order = constraints.map((m, i) => ({ m, n: size(m), i })).filter((c) => c.n > 0).sort((a, b) => a.n - b.n || a.i - b.i);
  const picked: number[] = [];
  const taken = new Uint8Array(F);
  for (const c of order) {
    for (let i = 0; i < F; i++) {
      if (!taken[i] && Math.floor(c.m / 2 ** i) % 2 === 1) {
        taken[i] = 1;
        picked.push(i);
      }
    }
  }
  for (let i = 0; i < F; i++) if (!taken[i]) picked.push(i);
  // picked[0] takes the highest slot.
  return picked.reverse().map((i) => enumerated[i]!);
}
