/**
 * The `lean` strategy: few qubits. For each clause, compute its violated bit, add it into a
 * w-bit counter (w = ceil(log2(m + 1))) with a controlled incrementer built from temporary ANDs,
 * and uncompute the clause; mark the assignments whose counter is zero (no clause violated);
 * then run everything backwards to clear the counter. With measured uncomputation:
 * n + 2w + k - 2 qubits and 8m(k + w - 2) + 4w - 8 T for a k-CNF.
 */
import { K, pos, type Circuit, type CircuitBuilder } from "../ir/circuit.js";
import { clauseBit, emitInverse, mark, newOracle, trivial, type OracleKind, type Op } from "./common.js";
import type { SimplifiedCnf } from "./simplify.js";

export function synthesizeLean(f: SimplifiedCnf, kind: OracleKind): Circuit {
  const m = f.clauseStart.length - 1;
  const { b, target } = newOracle(f, kind, 8 * m + 8);
  if (trivial(b, f, kind, target)) return b.finish();
  const w = Math.ceil(Math.log2(m + 1));
  const counter = Array.from({ length: w }, () => b.newWork());
  const forward: Op[] = [];
  // Every clause gets fresh work qubits, each used for one compute-uncompute span, so that the
  // work-qubit reuse after lowering (an interval colouring) can fold them onto few wires.
  for (let i = 0; i < m; i++) {
    const clause: Op[] = [];
    const bit = clauseBit(b, f, i, clause);
    const carries = Array.from({ length: w - 1 }, () => b.newWork());
    forward.push(...clause);
    increment(counter, carries, bit, forward);
    for (let j = clause.length - 1; j >= 0; j--) forward.push([K.unand, clause[j]![1]]);
  }
  for (const [k, o] of forward) b.addN(k, o);
  mark(b, kind, counter.map((q) => pos(q) | 1), target); // fires when the counter is 0
  emitInverse(b, renameWork(b, forward, new Set(counter)));
  return b.finish();
}

/** The same operations with every work qubit outside `keep` renamed to a fresh one. */
function renameWork(b: CircuitBuilder, ops: readonly Op[], keep: ReadonlySet<number>): Op[] {
  const base = b.search + b.target;
  const fresh = new Map<number, number>();
  const rename = (op: number): number => {
    const q = op >>> 1;
    if (q < base || keep.has(q)) return op;
    let r = fresh.get(q);
    if (r === undefined) fresh.set(q, (r = b.newWork()));
    return (r << 1) | (op & 1);
  };
  return ops.map(([k, o]) => [k, o.map(rename)] as const);
}

/**
 * Adds the encoded control `bit` into the counter (least significant qubit first). Carry i is
 * bit AND q0 AND ... AND qi, computed with temporary ANDs; the counter flips from the top down,
 * each carry uncomputed right after the flip it drives (its inputs are still unchanged then).
 */
function increment(counter: readonly number[], carries: readonly number[], bit: number, out: Op[]): void {
  const w = counter.length;
  let prev = bit;
  for (let i = 0; i + 1 < w; i++) {
    const c = carries[i]!;
    out.push([K.and, [prev, pos(counter[i]!), pos(c)]]);
    prev = pos(c);
  }
  for (let i = w - 1; i >= 1; i--) {
    const carry = carries[i - 1]!;
    out.push([K.mcx, [pos(carry), pos(counter[i]!)]]);
    const input = i - 1 === 0 ? bit : pos(carries[i - 2]!);
    out.push([K.unand, [input, pos(counter[i - 1]!), pos(carry)]]);
  }
  out.push([K.mcx, [bit, pos(counter[0]!)]]);
}
