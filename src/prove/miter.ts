/**
 * The miter: one literal of the graph that is true exactly for the inputs (assignment, target
 * value, measurement outcomes) on which the circuit is not the oracle of the formula. Built in
 * the same hashed graph as the circuit's wires, so that the formula side (clause = OR of
 * literals, f = AND of clauses) merges with the circuit's identical sub-functions.
 */
import type { Cnf } from "../cnf/cnf.js";
import { FALSE, TRUE, type Graph } from "./graph.js";
import type { SymbolicState } from "./symbolic.js";

/**
 * The formula f as a literal: AND over clauses of NOT(AND of the clause's violated literals).
 * `violatedNodes` receives, in clause order, the node of each clause's "violated" function.
 */
export function formulaLiteral(g: Graph, cnf: Cnf, vars: Int32Array, violatedNodes?: number[]): number {
  const m = cnf.clauseStart.length - 1;
  const ok = new Int32Array(m);
  const violated: number[] = [];
  for (let i = 0; i < m; i++) {
    violated.length = 0;
    for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) {
      const l = cnf.lits[k]!;
      // +v is violated when x_v = 0, -v when x_v = 1.
      violated.push(l > 0 ? vars[l - 1]! ^ 1 : vars[-l - 1]!);
    }
    const v = g.and(violated);
    if (violatedNodes !== undefined && v > 1) violatedNodes.push(v >>> 1);
    ok[i] = v ^ 1;
  }
  return g.and(ok);
}

/**
 * The miter literal (FALSE when proved structurally): some search wire changed, or the target is not b XOR f, or some work wire is
 * not 0, or a temporary-AND precondition fails, or the phase is not 4 f (phase oracle) / 0 (flag
 * oracle), for some input.
 */
export function buildMiter(s: SymbolicState, f: number, kind: "phase" | "flag", targetQubit: number, firstWork: number): number {
  const g = s.graph;
  const bad: number[] = [];
  const n = s.vars.length;
  for (let v = 0; v < n; v++) bad.push(g.xor(s.wires[v]!, s.vars[v]!));
  if (targetQubit >= 0) bad.push(g.xor(g.xor(s.wires[targetQubit]!, s.target), kind === "flag" ? f : FALSE));
  for (let q = firstWork; q < s.wires.length; q++) bad.push(s.wires[q]!);
  for (const o of s.obligations) bad.push(o);
  bad.push(phaseMismatch(g, s, kind === "phase" ? f : FALSE));
  return g.or(bad);
}

/** True where the phase (a Z8 polynomial) differs from 4 x expected. */
function phaseMismatch(g: Graph, s: SymbolicState, expected: number): number {
  let allFour = s.phaseConstant % 4 === 0;
  for (const k of s.phase.values()) if (k !== 4) allFour = false;
  if (allFour) {
    // Only signs: the phase is the parity of its monomials.
    let parity = s.phaseConstant === 4 ? TRUE : FALSE;
    for (const m of s.phase.keys()) parity = g.xor(parity, m << 1);
    return g.xor(parity, expected);
  }
  // A 3-bit ripple-carry sum mod 8 of k_j x m_j.
  const c = s.phaseConstant;
  let s0 = c & 1 ? TRUE : FALSE;
  let s1 = c & 2 ? TRUE : FALSE;
  let s2 = c & 4 ? TRUE : FALSE;
  for (const [m, k] of s.phase) {
    const v = m << 1;
    const a0 = k & 1 ? v : FALSE;
    const a1 = k & 2 ? v : FALSE;
    const a2 = k & 4 ? v : FALSE;
    const c0 = g.and2(s0, a0);
    s0 = g.xor(s0, a0);
    const t = g.xor(s1, a1);
    const c1 = g.or([g.and2(s1, a1), g.and2(c0, t)]);
    s1 = g.xor(t, c0);
    s2 = g.xor(g.xor(s2, a2), c1);
  }
  return g.or([s0, s1, g.xor(s2, expected)]);
}
