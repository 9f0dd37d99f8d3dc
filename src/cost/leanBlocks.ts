/**
 * The lean oracle (synth/lean.ts, streamed by sources.ts's leanOracle) as blocks for the block
 * counter (blocks.ts): one block per clause of the forward part, one per clause of the inverted
 * part (the first of them with the mark before it: the mark is short, and the inverted part's
 * first clause cancels against the forward part's last across it), then one per search qubit the
 * lowering leaves flipped (its closing X).
 *
 * A block's template sequence depends only on the clause's width, on which of its literals need an
 * X first (the lowering places X gates lazily: a qubit stays flipped while successive gates want
 * it so), and on where the block stands (the mark's block, the last block frees the counter's
 * wires). Each such shape is recorded once, by running the very functions that stream the oracle
 * (leanForward, leanMark, leanBackward) through the lowering into a recorder.
 */
import type { OracleKind, SimplifiedCnf } from "../synth/index.js";
import { violatedBy } from "../synth/common.js";
import type { BlockSource, Shape } from "./blocks.js";
import { ShapeRecorder } from "./blocks.js";
import { LoweringStream, VirtualIds, type LoweringMode } from "./lowering.js";
import { leanBackward, leanCounterWidth, leanForward, leanMark } from "./sources.js";
import { T_X } from "./templates.js";

const FWD = 0;
const BWD = 1;
const BWD_LAST = 2;
const MARK_BWD = 3;
const MARK_BWD_LAST = 4;
const FIN = 5;

/** Widest clause the block counter takes (a block's X pattern is a number). */
export const LEAN_BLOCK_MAX_WIDTH = 40;

export class LeanBlocks implements BlockSource {
  readonly blocks: number;
  readonly base: number;
  readonly persistent: number;
  readonly occurrences: number;
  readonly maxK: number;
  private readonly f: SimplifiedCnf;
  private readonly m: number;
  private readonly L: number;
  private readonly n: number;
  private readonly flag: boolean;
  private readonly mode: LoweringMode;
  private readonly kind: OracleKind;
  private readonly flipped: Uint8Array;
  private readonly finVars: Int32Array;
  private readonly shapes: Shape[] = [];
  /** Clause of each literal position. */
  private readonly clauseOfPos: Int32Array;
  private readonly shapeIds = new Map<number, number>();

  constructor(f: SimplifiedCnf, kind: OracleKind, mode: LoweringMode) {
    this.f = f;
    this.kind = kind;
    this.mode = mode;
    this.m = f.clauseStart.length - 1;
    this.L = f.lits.length;
    this.n = f.variables;
    this.flag = kind === "flag";
    this.base = f.variables + (this.flag ? 1 : 0);
    this.persistent = leanCounterWidth(this.m);
    this.flipped = new Uint8Array(this.base);
    let maxK = 1;
    for (let i = 0; i < this.m; i++) maxK = Math.max(maxK, f.clauseStart[i + 1]! - f.clauseStart[i]!);
    this.maxK = maxK + 1;
    // The qubits left flipped at the end: those whose last use (in the inverted part, the clause of
    // lowest index holding them) wants them flipped; closed in qubit order, as lower.ts does.
    const lastWant = new Int8Array(this.n).fill(-1);
    for (let i = this.m - 1; i >= 0; i--) {
      for (let p = f.clauseStart[i]!; p < f.clauseStart[i + 1]!; p++) lastWant[Math.abs(f.lits[p]!) - 1] = violatedBy(f.lits[p]!) & 1;
    }
    this.clauseOfPos = new Int32Array(this.L);
    for (let i = 0; i < this.m; i++) this.clauseOfPos.fill(i, f.clauseStart[i]!, f.clauseStart[i + 1]!);
    const fin: number[] = [];
    for (let q = 0; q < this.n; q++) if (lastWant[q] === 1) fin.push(q);
    this.finVars = Int32Array.from(fin);
    this.blocks = 2 * this.m + fin.length;
    this.occurrences = 2 * this.L + 1 + fin.length;
  }

  /** Whether the block counter can take this formula. */
  static fits(f: SimplifiedCnf): boolean {
    const m = f.clauseStart.length - 1;
    if (f.unsat || m === 0) return false;
    for (let i = 0; i < m; i++) if (f.clauseStart[i + 1]! - f.clauseStart[i]! > LEAN_BLOCK_MAX_WIDTH) return false;
    return true;
  }

  shape(id: number): Shape {
    return this.shapes[id]!;
  }

  /** Clause of a block of the forward or inverted part (-1: a closing X). */
  private clauseOf(b: number): number {
    if (b < this.m) return b;
    if (b < 2 * this.m) return 2 * this.m - 1 - b;
    return -1;
  }

  next(b: number, vars: Int32Array): number {
    const m = this.m;
    if (b >= 2 * m) {
      const q = this.finVars[b - 2 * m]!;
      vars[0] = q;
      this.flipped[q] = 0;
      return this.shapeFor(FIN, 1, 0);
    }
    const c = this.clauseOf(b);
    const s = this.f.clauseStart[c]!;
    const k = this.f.clauseStart[c + 1]! - s;
    let x = 0;
    for (let p = 0; p < k; p++) {
      const op = violatedBy(this.f.lits[s + p]!);
      const q = op >>> 1;
      vars[p] = q;
      if (this.flipped[q] !== (op & 1)) x += 2 ** p;
      this.flipped[q] = op & 1;
    }
    let dir = FWD;
    if (b >= m) {
      const mark = b === m;
      const last = c === 0;
      dir = mark ? (last ? MARK_BWD_LAST : MARK_BWD) : last ? BWD_LAST : BWD;
      // The mark's block has the target qubit after the clause's (flag oracles).
      if (mark && this.flag) vars[k] = this.n;
    }
    return this.shapeFor(dir, k, x);
  }

  varsOf(b: number, vars: Int32Array): void {
    if (b >= 2 * this.m) {
      vars[0] = this.finVars[b - 2 * this.m]!;
      return;
    }
    const c = this.clauseOf(b);
    const s = this.f.clauseStart[c]!;
    for (let p = s; p < this.f.clauseStart[c + 1]!; p++) vars[p - s] = Math.abs(this.f.lits[p]!) - 1;
    if (b === this.m && this.flag) vars[this.f.clauseStart[c + 1]! - s] = this.n;
  }

  occurrence(b: number, q: number): number {
    if (b < this.m) return this.f.clauseStart[b]! + q;
    if (b < 2 * this.m) {
      const c = 2 * this.m - 1 - b;
      const s = this.f.clauseStart[c]!;
      return q < this.f.clauseStart[c + 1]! - s ? this.L + s + q : 2 * this.L;
    }
    return 2 * this.L + 1 + (b - 2 * this.m);
  }

  blockOf(o: number): number {
    if (o < this.L) return this.clauseOfPos[o]!;
    if (o < 2 * this.L) return 2 * this.m - 1 - this.clauseOfPos[o - this.L]!;
    if (o === 2 * this.L) return this.m;
    return 2 * this.m + (o - 2 * this.L - 1);
  }

  slotOf(o: number): number {
    if (o < this.L) return o - this.f.clauseStart[this.clauseOfPos[o]!]!;
    if (o < 2 * this.L) return o - this.L - this.f.clauseStart[this.clauseOfPos[o - this.L]!]!;
    if (o === 2 * this.L) {
      const c = this.m - 1;
      return this.f.clauseStart[c + 1]! - this.f.clauseStart[c]!;
    }
    return 0;
  }

  private shapeFor(dir: number, k: number, x: number): number {
    const key = (x * 64 + k) * 8 + dir;
    let id = this.shapeIds.get(key);
    if (id === undefined) {
      id = this.shapes.length;
      this.shapes.push(this.record(dir, k, x));
      this.shapeIds.set(key, id);
    }
    return id;
  }

  /** One block's instances, recorded from the stream's own functions with the qubits flipped as the block finds them. */
  private record(dir: number, k: number, x: number): Shape {
    const w = this.persistent;
    if (dir === FIN) {
      const rec = new ShapeRecorder(1, w);
      rec.put(T_X, 0, -1, -1, 0);
      return rec.finish();
    }
    // Qubit references: the clause's literals, then the target in the mark's block of a flag oracle.
    const target = (dir === MARK_BWD || dir === MARK_BWD_LAST) && this.flag ? k : -1;
    const kk = k + (target >= 0 ? 1 : 0);
    const rec = new ShapeRecorder(kk, w);
    const ids = new VirtualIds(kk + w);
    const low = new LoweringStream(rec, ids, this.mode, kk + w + 64);
    for (let p = 0; p < k; p++) low.setFlipped(p, Math.floor(x / 2 ** p) % 2 === 1);
    const counter = Int32Array.from({ length: w }, (_, j) => kk + j);
    const carries = new Int32Array(Math.max(0, w - 1));
    const lits = Int32Array.from({ length: k }, (_, p) => p << 1);
    if (dir === FWD) leanForward(lits, counter, carries, low, ids);
    else {
      if (dir === MARK_BWD || dir === MARK_BWD_LAST) leanMark(counter, this.kind, target, low);
      leanBackward(lits, counter, carries, dir === BWD_LAST || dir === MARK_BWD_LAST, low, ids);
    }
    return rec.finish();
  }
}
