/**
 * The `wide` strategy: every clause's violated bit is computed and kept, one multi-controlled
 * gate marks "no clause violated", then everything is uncomputed. Lowered with temporary
 * logical-ANDs (Gidney 2018) this costs 4(L - 2) T and n + L - 2 qubits for a phase oracle with
 * measured uncomputation (L = literals after simplification).
 *
 * Writes straight into the circuit builder (no per-clause lists): this runs once per clause of
 * formulas with millions of them.
 */
import { K, pos, type Circuit, type CircuitBuilder } from "../ir/circuit.js";
import { mark, newOracle, trivial, violatedBy, type OracleKind } from "./common.js";
import type { SimplifiedCnf } from "./simplify.js";

export function synthesizeWide(f: SimplifiedCnf, kind: OracleKind): Circuit {
  const m = f.clauseStart.length - 1;
  const { b, target } = newOracle(f, kind, 2 * m + 2);
  if (trivial(b, f, kind, target)) return b.finish();
  let width = 0;
  for (let i = 0; i < m; i++) width = Math.max(width, f.clauseStart[i + 1]! - f.clauseStart[i]!);
  const ops = new Int32Array(width + 1);
  const clauseQubit = new Int32Array(m).fill(-1);
  const ok: number[] = [];
  for (let i = 0; i < m; i++) {
    const s = f.clauseStart[i]!;
    const e = f.clauseStart[i + 1]!;
    if (e - s === 1) {
      ok.push(violatedBy(f.lits[s]!) ^ 1); // fires when the unit clause is satisfied
      continue;
    }
    clauseQubit[i] = b.newWork();
    and(b, f, i, ops, K.and, clauseQubit[i]!);
    ok.push(pos(clauseQubit[i]!) | 1); // fires when the clause is not violated
  }
  mark(b, kind, ok, target);
  for (let i = m - 1; i >= 0; i--) if (clauseQubit[i]! >= 0) and(b, f, i, ops, K.unand, clauseQubit[i]!);
  return b.finish();
}

/** The AND (or its uncompute) of clause i's violated-literal controls into qubit t. */
function and(b: CircuitBuilder, f: SimplifiedCnf, i: number, ops: Int32Array, kind: number, t: number): void {
  const s = f.clauseStart[i]!;
  const n = f.clauseStart[i + 1]! - s;
  for (let k = 0; k < n; k++) ops[k] = violatedBy(f.lits[s + k]!);
  ops[n] = pos(t);
  b.addN(kind, ops.subarray(0, n + 1));
}
