/**
 * The textbook construction, kept as a cost reference: one clause bit per clause holding the
 * clause's value (OR of its literals, by De Morgan: X, then a multi-controlled X with negated
 * controls), one multi-controlled gate over the clause bits, and the clause bits recomputed to
 * clear them. Multi-controlled gates become V-chains of Toffolis over clean work qubits (Nielsen
 * & Chuang 2010, sec. 4.3): 2k - 3 Toffolis for k >= 3 controls, each 7 T.
 */
import { K, pos, type Circuit } from "../ir/circuit.js";
import { mark, newOracle, trivial, violatedBy, type OracleKind, type Op } from "./common.js";
import type { SimplifiedCnf } from "./simplify.js";

export function synthesizeReference(f: SimplifiedCnf, kind: OracleKind): Circuit {
  const m = f.clauseStart.length - 1;
  const { b, target } = newOracle(f, kind, 4 * m + 2);
  if (trivial(b, f, kind, target)) return b.finish();
  const compute: Op[] = [];
  const ok: number[] = [];
  for (let i = 0; i < m; i++) {
    const c = b.newWork();
    const ops: number[] = [];
    for (let k = f.clauseStart[i]!; k < f.clauseStart[i + 1]!; k++) ops.push(violatedBy(f.lits[k]!));
    // c = NOT(all literals false) = OR of the literals.
    compute.push([K.mcx, [...ops, pos(c)]], [K.x, [pos(c)]]);
    ok.push(pos(c));
  }
  for (const [k, o] of compute) b.addN(k, o);
  mark(b, kind, ok, target);
  for (let i = compute.length - 1; i >= 0; i--) b.addN(compute[i]![0], compute[i]![1]);
  return b.finish();
}
