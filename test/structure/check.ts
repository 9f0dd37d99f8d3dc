/** Checks of a recovered structure against its formula, shared by the structure tests. */
import { expect } from "vitest";
import { evaluate, extendAssignment, satisfiesStructure, type Cnf, type Structure } from "../helpers/lib.js";

/** A clause as a canonical key: literals sorted by variable, repeats dropped; null if a tautology. */
export function clauseKey(c: readonly number[]): string | null {
  const s = [...new Set(c)].sort((a, b) => Math.abs(a) - Math.abs(b) || a - b);
  for (let i = 1; i < s.length; i++) if (s[i] === -s[i - 1]!) return null;
  return s.join(" ");
}

/** The clauses of "XOR of ls = value" (as an encoder writes them). */
export function parityClauses(ls: readonly number[], value: number): number[][] {
  const out: number[][] = [];
  for (let a = 0; a < 2 ** ls.length; a++) {
    let x = 0;
    for (let i = 0; i < ls.length; i++) x ^= (a >> i) & 1;
    if (x !== value) out.push(ls.map((l, i) => ((a >> i) & 1 ? -l : l)));
  }
  return out;
}

/** The clauses each part of the structure stands for, rebuilt from the structure alone. */
export function rebuiltClauses(s: Structure): number[][] {
  const out: number[][] = [];
  for (const d of s.definitions) {
    const y = d.variable;
    if (d.kind === "and") {
      for (const l of d.inputs) out.push([-y, l]);
      out.push([y, ...d.inputs.map((l) => -l)]);
    } else if (d.kind === "or") {
      for (const l of d.inputs) out.push([y, -l]);
      out.push([-y, ...d.inputs]);
    } else {
      const value = d.kind === "not" || d.kind === "xnor" ? 1 : 0;
      out.push(...parityClauses([y, ...d.inputs], value));
    }
  }
  for (const p of s.parities) out.push(...parityClauses(p.variables, p.parity));
  for (const g of s.groups) {
    if (g.exactlyOne) out.push([...g.variables]);
    for (let i = 0; i < g.variables.length; i++) for (let j = i + 1; j < g.variables.length; j++) out.push([-g.variables[i]!, -g.variables[j]!]);
  }
  const { lits, clauseStart } = s.remaining;
  for (let i = 0; i + 1 < clauseStart.length; i++) out.push(Array.from(lits.subarray(clauseStart[i]!, clauseStart[i + 1]!)));
  return out;
}

/**
 * The structural checks that need no enumeration: every clause of the cleaned formula is consumed
 * exactly once (the rebuilt clauses are the formula's distinct non-tautological clauses, each
 * once), every variable is defined at most once, definitions are in topological order, and the
 * free and defined variables split the occurring ones.
 */
export function checkShape(cnf: Cnf, s: Structure): void {
  const want = new Set<string>();
  for (let i = 0; i + 1 < cnf.clauseStart.length; i++) {
    const k = clauseKey(Array.from(cnf.lits.subarray(cnf.clauseStart[i]!, cnf.clauseStart[i + 1]!)));
    if (k !== null) want.add(k);
  }
  const got = rebuiltClauses(s).map((c) => clauseKey(c));
  expect(got.every((k) => k !== null)).toBe(true);
  expect(new Set(got).size).toBe(got.length); // no clause consumed twice
  expect([...got].sort()).toEqual([...want].sort());
  expect(s.report.cleanedClauses).toBe(want.size);
  const definedAt = new Map<number, number>();
  s.definitions.forEach((d, i) => {
    expect(definedAt.has(d.variable)).toBe(false);
    definedAt.set(d.variable, i);
  });
  const free = new Set(s.free);
  expect(free.size).toBe(s.free.length);
  for (const d of s.definitions) {
    expect(free.has(d.variable)).toBe(false);
    for (const l of d.inputs) {
      const v = Math.abs(l);
      // Topological: every input is free or defined earlier.
      expect(free.has(v) || (definedAt.get(v) ?? Infinity) < definedAt.get(d.variable)!).toBe(true);
    }
    if (d.kind === "equiv" || d.kind === "not") expect(d.inputs.length).toBe(1);
    if (d.kind !== "and" && d.kind !== "or") expect(d.inputs.every((l) => l > 0)).toBe(true);
  }
  const occurring = new Set<number>();
  for (const k of want) for (const l of k.split(" ")) if (l !== "") occurring.add(Math.abs(Number(l)));
  expect(free.size + definedAt.size).toBe(occurring.size);
  expect(s.unused).toBe(cnf.variables - occurring.size);
  for (const v of [...free, ...definedAt.keys()]) expect(occurring.has(v)).toBe(true);
}

/**
 * The invariant, by enumerating every assignment x of all variables (n up to about 16): x is a
 * model of the formula exactly when x is the completion of its own free part (the definitions
 * hold) and the parities, groups and remaining clauses hold. So models and free assignments that
 * pass the checks correspond one to one. Returns the model count.
 */
export function checkEquivalence(cnf: Cnf, s: Structure): number {
  const n = cnf.variables;
  let models = 0;
  let passing = 0;
  const a = new Uint8Array(n);
  for (let x = 0; x < 2 ** n; x++) {
    for (let v = 0; v < n; v++) a[v] = (x >> v) & 1;
    const model = evaluate(cnf, a);
    const full = extendAssignment(s, a);
    const complete = full.every((b, i) => b === a[i]);
    const ok = complete && satisfiesStructure(s, full);
    if (model !== ok) throw new Error(`assignment ${Array.from(a).join("")}: formula ${model}, structure ${ok}`);
    if (model) models++;
    if (complete && satisfiesStructure(s, full)) passing++;
  }
  expect(passing).toBe(models);
  return models;
}
