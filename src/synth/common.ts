/** Pieces shared by the synthesis strategies. */
import { CircuitBuilder, K, pos } from "../ir/circuit.js";
import type { SimplifiedCnf } from "./simplify.js";

/** Which oracle: a phase flip on satisfying assignments, or a target bit flipped by f(x). */
export type OracleKind = "phase" | "flag";

/** A logical operation recorded so it can be replayed inverted (the mirror half). */
export type Op = readonly [kind: number, ops: readonly number[]];

/**
 * The control that fires when literal `l` is false (the clause is then not helped by it): for
 * +v it fires on x[v-1] = 0, for -v on 1.
 */
export function violatedBy(l: number): number {
  return l > 0 ? (((l - 1) << 1) | 1) : ((-l - 1) << 1);
}

/**
 * Computes the "clause violated" bit of clause i: the literal's own qubit for a unit clause,
 * else a multi-input AND into a fresh work qubit. Returns the encoded control that fires when
 * the clause is violated, and records the operations in `out`. `into` names the work qubit to
 * use (a strategy that computes one clause at a time reuses one).
 */
export function clauseBit(b: CircuitBuilder, f: SimplifiedCnf, i: number, out: Op[], into?: number): number {
  const s = f.clauseStart[i]!;
  const e = f.clauseStart[i + 1]!;
  if (e - s === 1) return violatedBy(f.lits[s]!);
  const w = into ?? b.newWork();
  const ops: number[] = [];
  for (let k = s; k < e; k++) ops.push(violatedBy(f.lits[k]!));
  ops.push(pos(w));
  out.push([K.and, ops]);
  return pos(w);
}

/** Emits recorded operations. */
export function emit(b: CircuitBuilder, ops: readonly Op[]): void {
  for (const [k, o] of ops) b.addN(k, o);
}

/** Emits the inverses of recorded operations in reverse order (and <-> unand; the rest are self-inverse). */
export function emitInverse(b: CircuitBuilder, ops: readonly Op[]): void {
  for (let i = ops.length - 1; i >= 0; i--) {
    const [k, o] = ops[i]!;
    b.addN(k === K.and ? K.unand : k === K.unand ? K.and : k, o);
  }
}

/**
 * Marks the assignments where every encoded control in `ok` fires: a phase flip (multi-controlled
 * Z) or a flip of the target qubit (multi-controlled X).
 */
export function mark(b: CircuitBuilder, kind: OracleKind, ok: readonly number[], target: number): void {
  if (kind === "phase") b.addN(K.mcz, ok);
  else b.addN(K.mcx, [...ok, pos(target)]);
}

/** The layout of an oracle: n search qubits, a target for the flag kind. */
export function newOracle(f: SimplifiedCnf, kind: OracleKind, expectedGates: number): { b: CircuitBuilder; target: number } {
  const b = new CircuitBuilder({ search: f.variables, target: kind === "flag" ? 1 : 0 }, expectedGates);
  return { b, target: f.variables };
}

/**
 * The two trivial cases: no clause (f = 1: a phase of -1 everywhere, or a flipped target) and an
 * empty clause (f = 0: the identity). Returns true when handled.
 */
export function trivial(b: CircuitBuilder, f: SimplifiedCnf, kind: OracleKind, target: number): boolean {
  if (f.unsat) return true;
  if (f.clauseStart.length > 1) return false;
  if (kind === "phase") b.add(K.gphase, 4);
  else b.add(K.x, pos(target));
  return true;
}
