/**
 * The `wide` strategy: every clause's violated bit is computed and kept, one multi-controlled
 * gate marks "no clause violated", then everything is uncomputed. Lowered with temporary
 * logical-ANDs (Gidney 2018) this costs 4(L - 2) T and n + L - 2 qubits for a phase oracle with
 * measured uncomputation (L = literals after simplification).
 */
import type { Circuit } from "../ir/circuit.js";
import { clauseBit, emit, emitInverse, mark, newOracle, trivial, type OracleKind, type Op } from "./common.js";
import type { SimplifiedCnf } from "./simplify.js";

export function synthesizeWide(f: SimplifiedCnf, kind: OracleKind): Circuit {
  const m = f.clauseStart.length - 1;
  const { b, target } = newOracle(f, kind, 2 * m + 2);
  if (trivial(b, f, kind, target)) return b.finish();
  const compute: Op[] = [];
  const ok: number[] = [];
  for (let i = 0; i < m; i++) ok.push(clauseBit(b, f, i, compute) ^ 1); // fires when satisfied
  emit(b, compute);
  mark(b, kind, ok, target);
  emitInverse(b, compute);
  return b.finish();
}
