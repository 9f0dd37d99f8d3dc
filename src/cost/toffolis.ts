/**
 * The Toffoli count of the wide oracle over clauses (toffoli basis, optimizer on), tallied from
 * its logical operations: the cost table's toffoli-basis runs of the wide rows took some 3 s of
 * engine replay each at a million clauses, for one number the operations give directly.
 *
 * Why no Toffoli of that circuit is ever removed by the passes (so the count is the lowering's):
 * cancel-inverses removes a CCX only against an identical one (same target, same controls) with
 * nothing between them on their qubits that fails to commute with it. Every AND node of the wide
 * oracle (a clause's 2-input ANDs, the mark's tree) has a target of its own: work-qubit reuse
 * (reuseWork) renumbers work qubits, but the wide oracle frees none before the mark and takes
 * none after it, so no two nodes share a wire, and the only identical pairs are a node's compute
 * and its unitary uncompute. Between the two, the node's target is a control of the gate that consumes it: its
 * parent node's CCX, or the mark's last gate (CZ, Z, CX or CCX onto the flag), all of which act
 * diagonally on that qubit while the pair acts as X there: they do not commute. The consumer is
 * itself never removed: the mark's last gate has no identical partner, and a parent node's pair is
 * blocked the same way by its own consumer (induction from the mark down the trees). Lazy X gates
 * on the target between the pair do not change this. merge-phases meets at most one phase gate in
 * the toffoli basis (the mark's Z, when it has one control) and so changes nothing, and fold-x-polarity and
 * drop-identities leave CCX gates alone (engine.ts). test/cost/toffolis.test.ts holds the tally
 * equal to the built circuits on 300 random formulas of widths 1 to 20, and to the engine's replay
 * on two formulas with long clauses and shared prefixes.
 */
import type { OracleKind, SimplifiedCnf } from "../synth/index.js";
import type { Uncompute } from "../passes/lower.js";
import type { EngineResult } from "./engine.js";
import { wideOracle } from "./sources.js";
import { normalizeControls, VirtualIds, type LogicalSink } from "./lowering.js";

/**
 * Counts the CCX gates lowering.ts emits in the toffoli basis, operation by operation, without
 * lowering: a 2-input AND is one CCX and its uncompute one more (unitary) or none (measured,
 * Gidney 2018); an AND of n distinct controls is n - 1 of them (lower.ts's tree of 2-input ANDs);
 * a multi-controlled Z or X reduces its n controls to two by n - 2 ANDs, undone after it.
 */
class ToffoliTally implements LogicalSink {
  count = 0;
  operations = 0;
  /** CCX gates each live AND was computed with (by qubit id), for its uncompute. */
  private held = new Int32Array(1024);
  private readonly pair = new Int32Array(2);
  /** distinct's output (its contents are never read). */
  private scratch = new Int32Array(64);

  /** Distinct qubits among encoded controls, as lowering.ts normalizes them; -1 when the gate never fires. */
  private distinct(ops: ArrayLike<number>): number {
    if (ops.length > this.scratch.length) this.scratch = new Int32Array(Math.max(ops.length, 2 * this.scratch.length));
    return normalizeControls(ops, this.scratch);
  }

  constructor(private readonly unitary: boolean) {}

  and(ctrls: ArrayLike<number>, t: number): void {
    this.operations++;
    const n = this.distinct(ctrls);
    const c = n < 0 ? 0 : Math.max(0, n - 1);
    this.count += c;
    if (t >= this.held.length) {
      const h = new Int32Array(Math.max(t + 1, this.held.length * 2));
      h.set(this.held);
      this.held = h;
    }
    this.held[t] = c;
  }

  andPair(a: number, b: number, t: number): void {
    this.pair[0] = a;
    this.pair[1] = b;
    this.and(this.pair, t);
  }

  unand(t: number): void {
    this.operations++;
    if (this.unitary) this.count += this.held[t]!;
    this.held[t] = 0;
  }

  mcx(ctrls: ArrayLike<number>): void {
    this.operations++;
    const n = this.distinct(ctrls);
    // The tree down to two controls, the CCX onto the target, the tree undone.
    if (n >= 2) this.count += (n - 2) * (this.unitary ? 2 : 1) + 1;
  }

  mcx1(): void {
    this.operations++;
  }

  mcz(qs: ArrayLike<number>): void {
    this.operations++;
    const n = this.distinct(qs);
    // The tree down to two controls, a CZ (or a Z for one), the tree undone.
    if (n >= 3) this.count += (n - 2) * (this.unitary ? 2 : 1);
  }

  single(): void {
    this.operations++;
  }

  measure(): void {
    this.operations++;
  }

  gphase(): void {
    this.operations++;
  }
}

/**
 * The toffoli-basis Toffoli count of the wide oracle over `f` with the optimizer on, as an
 * engine result holding that count alone (`toffoliOnly`; its other figures are 0).
 */
export function wideToffolis(f: SimplifiedCnf, kind: OracleKind, uncompute: Uncompute): EngineResult {
  const tally = new ToffoliTally(uncompute === "unitary");
  const base = f.variables + (kind === "flag" ? 1 : 0);
  wideOracle(f, kind, tally, new VirtualIds(base), f.variables);
  return {
    qubits: 0, tCount: 0, tDepth: 0, cnotCount: 0, toffoliCount: tally.count, depth: 0, measurements: 0,
    instances: tally.operations, exact: true, upperBound: false, reason: null, historyShort: false, lagShort: false, secondNeeded: false, toffoliOnly: true,
  };
}
