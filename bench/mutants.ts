/**
 * The mutations of issue 11 (flipped control polarity, dropped or duplicated gate, stray Z or T,
 * wrong target), applied to compiled oracles: shared by the prover's tests (test/helpers/prove.ts
 * re-exports them) and the `mutants` mode of the prover's bench (bench/prove.ts).
 */
import { CircuitBuilder, type Circuit } from "../src/ir/circuit.js";
import { K } from "../src/ir/kinds.js";

/** A copy of c where `change(b, g)` may add gates before gate g (and return true to drop gate g). */
export function edit(c: Circuit, change: (b: CircuitBuilder, g: number) => boolean): Circuit {
  const reg = (role: string): number => c.registers.find((r) => r.role === role)?.size ?? 0;
  const b = new CircuitBuilder({ search: reg("search"), target: reg("target"), work: reg("work"), clbits: c.clbits });
  for (let g = 0; g <= c.gates; g++) {
    if (change(b, g)) continue;
    if (g < c.gates) b.copy(c, g);
  }
  return b.finish();
}

/** The mutations of the issue: flipped control polarity, dropped or duplicated gate, stray Z or T, wrong target. */
export type Mutation = "polarity" | "drop" | "duplicate" | "stray-z" | "stray-t" | "target";
export const MUTATIONS: readonly Mutation[] = ["polarity", "drop", "duplicate", "stray-z", "stray-t", "target"];

/** Applies mutation `m` at a place chosen by `pick` (any natural number); null when the circuit has no such place. */
export function mutate(c: Circuit, m: Mutation, pick: number): Circuit | null {
  const gates = Array.from({ length: c.gates }, (_, g) => g);
  const width = (g: number): number => c.opStart[g + 1]! - c.opStart[g]!;
  switch (m) {
    case "polarity": {
      // A control of a gate with polarity (mcx, mcz, and, unand) or, in bases without polarity,
      // the X that makes a control fire on |0> dropped (the same effect).
      const withPolarity = gates.filter((g) => (c.kind[g] === K.mcx || c.kind[g] === K.and || c.kind[g] === K.unand) ? width(g) > 1 : c.kind[g] === K.mcz);
      if (withPolarity.length > 0) {
        const g = withPolarity[pick % withPolarity.length]!;
        const controls = c.kind[g] === K.mcz ? width(g) : width(g) - 1;
        const ops = c.ops.slice();
        ops[c.opStart[g]! + (Math.floor(pick / withPolarity.length) % controls)]! ^= 1;
        return { ...c, ops };
      }
      const xs = gates.filter((g) => c.kind[g] === K.x && c.cond[g]! < 0);
      if (xs.length === 0) return null;
      const drop = xs[pick % xs.length]!;
      return edit(c, (_b, g) => g === drop);
    }
    case "drop": {
      const at = pick % c.gates;
      return edit(c, (_b, g) => g === at);
    }
    case "duplicate": {
      const at = pick % c.gates;
      return edit(c, (b, g) => {
        if (g === at) b.copy(c, g);
        return false;
      });
    }
    case "stray-z": case "stray-t": {
      const at = pick % (c.gates + 1);
      const q = Math.floor(pick / (c.gates + 1)) % c.qubits;
      return edit(c, (b, g) => {
        if (g === at) b.add(m === "stray-z" ? K.z : K.t, q << 1);
        return false;
      });
    }
    case "target": {
      const targeted = gates.filter((g) => (c.kind[g] === K.cx || c.kind[g] === K.ccx || c.kind[g] === K.mcx) && c.cond[g]! < 0);
      if (targeted.length === 0) return null;
      const g = targeted[pick % targeted.length]!;
      const used = new Set(Array.from(c.ops.subarray(c.opStart[g]!, c.opStart[g + 1]!), (o) => o >>> 1));
      const free = Array.from({ length: c.qubits }, (_, q) => q).filter((q) => !used.has(q));
      const ops = c.ops.slice();
      const last = c.opStart[g + 1]! - 1;
      ops[last] = (free[Math.floor(pick / targeted.length) % free.length]! << 1) | (ops[last]! & 1);
      return { ...c, ops };
    }
  }
}
