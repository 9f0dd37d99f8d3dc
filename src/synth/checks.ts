/**
 * Checks: the units an oracle conjoins. The constructions of blocked.ts never look inside a
 * check; they ask it to compute, into fresh work qubits, a bit that fires when the check is
 * violated, and later to erase that bit again. A clause is a check (its violated bit is the AND of
 * its literals' negations); any other unit whose violated bit can be computed from qubits that
 * stay put while it lives (a recovered gate definition checked against a register of outputs, a
 * parity) can be one too, so a construction that conjoins checks composes with other front ends.
 *
 * Where a check reads a variable is a "holder": the variable's own qubit, or a CNOT copy of it
 * (fan-out, see blocked.ts), so that checks sharing a variable need not wait for each other.
 */
import { K, type CircuitBuilder } from "../ir/circuit.js";
import { violatedBy, type Op } from "./common.js";
import type { SimplifiedCnf } from "./simplify.js";

/** Maps a literal occurrence (its index among all occurrences) and its control to the control to use. */
export type Holder = (occurrence: number, control: number) => number;

/** A list of checks over the search register. */
export interface Checks {
  /** How many checks. */
  readonly count: number;
  /** Qubits a check reads (with repetition), in order: the occurrences a {@link Holder} maps. */
  occurrences(i: number): { readonly start: number; readonly controls: ArrayLike<number> };
  /**
   * Emits into `b`, and records in `out`, the logical operations that compute check i's violated
   * bit into fresh work qubits, reading its inputs through `holder`; returns the encoded control
   * that fires when the check is violated (a check of one input returns that input and emits
   * nothing). Emitting the recorded operations undone (emitInverse) erases all they computed, as
   * long as the inputs are unchanged.
   */
  compute(b: CircuitBuilder, i: number, out: Op[], holder: Holder | null): number;
}

/** The clauses of a simplified formula as checks: one AND of the violated-literal controls each. */
export function clauseChecks(f: SimplifiedCnf): Checks {
  const m = f.unsat ? 0 : f.clauseStart.length - 1;
  return {
    count: m,
    occurrences(i) {
      const s = f.clauseStart[i]!;
      const e = f.clauseStart[i + 1]!;
      const controls = new Int32Array(e - s);
      for (let k = s; k < e; k++) controls[k - s] = violatedBy(f.lits[k]!);
      return { start: s, controls };
    },
    compute(b, i, out, holder) {
      const s = f.clauseStart[i]!;
      const e = f.clauseStart[i + 1]!;
      const via = (k: number): number => (holder === null ? violatedBy(f.lits[k]!) : holder(k, violatedBy(f.lits[k]!)));
      if (e - s === 1) return via(s);
      // One multi-input AND: the lowering makes it a balanced tree of 2-input ANDs and keeps the
      // tree's inner qubits until the AND is undone, so undoing it needs nothing recomputed.
      const ops: number[] = [];
      for (let k = s; k < e; k++) ops.push(via(k));
      const w = b.newWork();
      ops.push(w << 1);
      const op: Op = [K.and, ops];
      out.push(op);
      b.addN(op[0], op[1]);
      return w << 1;
    },
  };
}
