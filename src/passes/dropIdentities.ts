/**
 * drop-identities: removes gates that do nothing: a global phase of 0, unconditioned global
 * phases merged into one, and multi-controlled gates whose controls can never all fire (a qubit
 * wanted both on |0> and |1>).
 */
import { emptyLike, operands, qubitOf, type Circuit } from "../ir/circuit.js";
import { GATE_KINDS, K } from "../ir/kinds.js";

export function dropIdentities(c: Circuit): Circuit {
  let phase = 0;
  let phases = 0;
  for (let g = 0; g < c.gates; g++) {
    if (c.kind[g] === K.gphase && c.cond[g]! < 0) {
      phase = (phase + operands(c, g)[0]!) % 8;
      phases++;
    }
  }
  if (phases === 0 && !hasNeverFiring(c)) return c;
  const out = emptyLike(c);
  // A global phase commutes with everything: one gate, first, stands for all of them.
  if (phase !== 0) out.add(K.gphase, phase);
  for (let g = 0; g < c.gates; g++) {
    const name = GATE_KINDS[c.kind[g]!]!;
    if (name === "gphase" && c.cond[g]! < 0) continue;
    if (name === "gphase" && operands(c, g)[0] === 0) continue;
    if ((name === "mcx" || name === "mcz") && neverFires(operands(c, g), name === "mcx" ? 1 : 0)) continue;
    out.copy(c, g);
  }
  return out.finish();
}

function hasNeverFiring(c: Circuit): boolean {
  for (let g = 0; g < c.gates; g++) {
    const k = c.kind[g]!;
    if ((k === K.mcx || k === K.mcz) && neverFires(operands(c, g), k === K.mcx ? 1 : 0)) return true;
  }
  return false;
}

function neverFires(ops: Int32Array, targets: number): boolean {
  const seen = new Map<number, number>();
  for (let i = 0; i < ops.length - targets; i++) {
    const q = qubitOf(ops[i]!);
    const prev = seen.get(q);
    if (prev !== undefined && prev !== ops[i]) return true;
    seen.set(q, ops[i]!);
  }
  return false;
}
