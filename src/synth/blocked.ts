/**
 * Blocked constructions: the oracles between `wide` (every clause bit held at once) and `lean`
 * (a counter), and `wide` with fan-out copies for a logarithmic T-depth.
 *
 * Checks (clauses, see checks.ts) are grouped into blocks, blocks into blocks of blocks, and so
 * on: `sizes[0]` checks per level-1 block, `sizes[1]` level-1 blocks per level-2 block, ... . A
 * block's bit holds "every check in the block is satisfied": its children are computed, their
 * conjunction is stored by a balanced tree of 2-input temporary ANDs, the tree's inner qubits
 * and then the children are erased again, so that only the block's bit stays. Erasing a child
 * whose own inputs are gone means computing them once more: recursive uncomputation in the
 * manner of Bennett 1989 ("Time/space trade-offs for reversible computation") and Knill 1995,
 * here on the tree of conjunctions rather than on a chain; the reversible pebbling game of
 * Meuli, Soeken, Roetteler, Bjorner & De Micheli 2019 explores the same trade-off with a solver.
 * With measured uncomputation (Gidney 2018) every erase costs no T gate, so holding one bit per
 * block instead of one per clause costs about one recomputation of each level, not more:
 * one level with blocks of about sqrt(m / k) clauses holds some 2 sqrt(k m) qubits beside the
 * search register at about twice the T-count of `wide`. (Zi, Li & Sun describe SAT oracles with
 * 2 sqrt(m) ancillas at up to eight times the size; the counter of lean.ts is the low end.)
 *
 * The top-level bits are conjoined by the mark (a multi-controlled Z, or X onto the target), and
 * then erased one by one. A top-level or inner block bit is erased, once its children and tree
 * are computed again, by a Toffoli from the two inputs of its last AND (the recomputed inputs
 * sit on fresh qubits, so the lowering's record of the AND cannot be used): 4 T with measured
 * uncomputation, 7 with unitary.
 *
 * Fan-out: the T gates of a temporary AND act on its inputs, so ANDs reading one variable run one
 * after another. With `fanout` u > 0, a variable read r times by the checks of a group (all
 * checks when there are no blocks, else one level-1 block) gets ceil(r / u) holders: itself and
 * CNOT copies (no T), each read by at most u checks. With u = 1 every clause AND and the tree
 * over the clause bits run in parallel: T-depth about 2 (ceil(log2 k) + ceil(log2 m)), against the
 * Toffoli-depth lower bound ceil(log2 k) of a k-input AND (Dutta et al. 2025).
 */
import { type Circuit, type CircuitBuilder, K, pos } from "../ir/circuit.js";
import { type Checks, clauseChecks, type Holder } from "./checks.js";
import { emitInverse, mark, newOracle, trivial, type OracleKind, type Op } from "./common.js";
import type { SimplifiedCnf } from "./simplify.js";

/** The shape of a blocked construction. */
export interface BlockPlan {
  /** Block sizes from the bottom level up (empty: no blocks, every check held until the mark). */
  readonly sizes: readonly number[];
  /** 0: no copies; u >= 1: each holder of a variable is read by at most u checks of a group. */
  readonly fanout: number;
  /**
   * Checks held as they are, like `wide`, beside the blocks (the first `held` checks; 0: none):
   * between the qubits of one level of blocks and those of wide, each held check trades its
   * share of one recomputation for one or two qubits.
   */
  readonly held?: number;
}

/** A computed node: the control that fires when all its checks hold, and how to erase it. */
interface Handle {
  readonly ok: number;
  /** A check's recorded operations (undone to erase it); null for a block (recomputed to erase it). */
  readonly ops: Op[] | null;
}

/** Synthesizes the blocked construction of `plan` over the clauses of `f` (or any checks). */
export function synthesizeBlocked(f: SimplifiedCnf, kind: OracleKind, plan: BlockPlan, checks: Checks = clauseChecks(f)): Circuit {
  const m = f.unsat ? 0 : f.clauseStart.length - 1;
  const levels = plan.sizes.length;
  const { b, target } = newOracle(f, kind, (f.lits.length + 2 * m) * (2 << Math.min(levels, 8)) + 16);
  if (trivial(b, f, kind, target)) return b.finish();
  conjoinChecks(b, kind, target, checks, plan);
  return b.finish();
}

/**
 * Emits, into a builder that already holds whatever the checks read (the search register, and
 * any register a front end computed first and will clear after), the mark of "every check
 * holds" by the blocked construction of `plan`, every work qubit it takes cleared again. With
 * no checks the mark is unconditional (a phase of -1, or the target flipped).
 */
export function conjoinChecks(b: CircuitBuilder, kind: OracleKind, target: number, checks: Checks, plan: BlockPlan): void {
  new Blocked(b, checks, plan).emit(kind, target);
}

class Blocked {
  /** span[l]: checks under one node of level l (span[0] = 1). */
  private readonly span: number[] = [1];

  constructor(private readonly b: CircuitBuilder, private readonly checks: Checks, private readonly plan: BlockPlan) {
    for (const s of plan.sizes) this.span.push(this.span[this.span.length - 1]! * Math.max(1, s));
  }

  emit(kind: OracleKind, target: number): void {
    const b = this.b;
    const m = this.checks.count;
    const top = this.plan.sizes.length;
    const held = top === 0 ? m : Math.min(m, this.plan.held ?? 0);
    // Held checks are nodes of level 0 at the top, the rest blocks of the top level.
    const nodes: [level: number, lo: number, hi: number][] = [];
    for (let i = 0; i < held; i++) nodes.push([0, i, i + 1]);
    if (held < m) for (const [lo, hi] of split(held, m, Math.ceil((m - held) / this.span[top]!))) nodes.push([top, lo, hi]);
    // The held checks are one group: their copies live from the first check to the last erase.
    const group = held > 0 && this.plan.fanout > 0 ? this.copies(0, held) : null;
    const holder = group?.holder ?? null;
    const handles = nodes.map(([level, lo, hi]) => this.compute(level, lo, hi, level === 0 ? holder : null));
    mark(b, kind, handles.map((h) => h.ok), target);
    for (let i = nodes.length - 1; i >= 0; i--) {
      const [level, lo, hi] = nodes[i]!;
      this.erase(level, lo, hi, handles[i]!, level === 0 ? holder : null);
    }
    group?.release();
  }

  /** Computes the node of `level` over checks [lo, hi). */
  private compute(level: number, lo: number, hi: number, holder: Holder | null): Handle {
    if (level === 0) {
      const ops: Op[] = [];
      const violated = this.checks.compute(this.b, lo, ops, holder);
      return { ok: violated ^ 1, ops };
    }
    const children = split(lo, hi, Math.ceil((hi - lo) / this.span[level - 1]!));
    if (children.length === 1) return this.compute(level - 1, lo, hi, holder);
    const group = level === 1 && this.plan.fanout > 0 ? this.copies(lo, hi) : null;
    const inner = group?.holder ?? holder;
    const kids = children.map(([l, h]) => this.compute(level - 1, l, h, inner));
    const root = this.b.newWork();
    const tree = this.tree(kids.map((k) => k.ok));
    this.b.add(K.and, tree.last[0], tree.last[1], pos(root));
    this.unwind(tree.record);
    for (let i = children.length - 1; i >= 0; i--) this.erase(level - 1, children[i]![0], children[i]![1], kids[i]!, inner);
    group?.release();
    return { ok: pos(root), ops: null };
  }

  /** Erases the node of `level` over checks [lo, hi) computed as `h`. */
  private erase(level: number, lo: number, hi: number, h: Handle, holder: Holder | null): void {
    if (level === 0) {
      emitInverse(this.b, h.ops!);
      return;
    }
    const children = split(lo, hi, Math.ceil((hi - lo) / this.span[level - 1]!));
    if (children.length === 1) {
      this.erase(level - 1, lo, hi, h, holder);
      return;
    }
    const group = level === 1 && this.plan.fanout > 0 ? this.copies(lo, hi) : null;
    const inner = group?.holder ?? holder;
    const kids = children.map(([l, hh]) => this.compute(level - 1, l, hh, inner));
    const tree = this.tree(kids.map((k) => k.ok));
    // The block bit's inputs are back, on fresh qubits: a Toffoli from them clears it.
    this.b.add(K.mcx, tree.last[0], tree.last[1], h.ok);
    this.unwind(tree.record);
    for (let i = children.length - 1; i >= 0; i--) this.erase(level - 1, children[i]![0], children[i]![1], kids[i]!, inner);
    group?.release();
  }

  /**
   * A balanced tree of 2-input ANDs over `items` (encoded controls) down to two; returns the two
   * and the ANDs made (a, b, w), in order.
   */
  private tree(items: number[]): { last: [number, number]; record: number[] } {
    const record: number[] = [];
    while (items.length > 2) {
      const next: number[] = [];
      for (let i = 0; i + 1 < items.length; i += 2) {
        const w = this.b.newWork();
        this.b.add(K.and, items[i]!, items[i + 1]!, pos(w));
        record.push(items[i]!, items[i + 1]!, w);
        next.push(pos(w));
      }
      if (items.length % 2 === 1) next.push(items[items.length - 1]!);
      items = next;
    }
    return { last: [items[0]!, items[1]!], record };
  }

  /** Erases a tree's ANDs, the last made first (each AND's inputs are still there). */
  private unwind(record: number[]): void {
    for (let i = record.length - 3; i >= 0; i -= 3) this.b.add(K.unand, record[i]!, record[i + 1]!, pos(record[i + 2]!));
  }

  /**
   * Fan-out copies for the checks [lo, hi): each variable read r times gets ceil(r / u) holders,
   * itself and CNOT copies, dealt to its readings in turn. `release` clears the copies.
   */
  private copies(lo: number, hi: number): { holder: Holder; release: () => void } {
    const u = this.plan.fanout;
    const b = this.b;
    const reads = new Map<number, number>();
    for (let i = lo; i < hi; i++) {
      const { controls } = this.checks.occurrences(i);
      for (let j = 0; j < controls.length; j++) {
        const q = controls[j]! >>> 1;
        reads.set(q, (reads.get(q) ?? 0) + 1);
      }
    }
    const holders = new Map<number, number[]>();
    const made: [number, number][] = [];
    for (const [q, r] of reads) {
      const list = [q];
      for (let c = 1; c < Math.ceil(r / u); c++) {
        const w = b.newWork();
        b.add(K.mcx, pos(q), pos(w));
        made.push([q, w]);
        list.push(w);
      }
      holders.set(q, list);
    }
    // Which holder each reading gets: the k-th reading of a variable its (k mod holders)-th holder.
    const assigned = new Map<number, number>();
    const seen = new Map<number, number>();
    for (let i = lo; i < hi; i++) {
      const { start, controls } = this.checks.occurrences(i);
      for (let j = 0; j < controls.length; j++) {
        const q = controls[j]! >>> 1;
        const k = seen.get(q) ?? 0;
        seen.set(q, k + 1);
        const list = holders.get(q)!;
        assigned.set(start + j, list[k % list.length]!);
      }
    }
    return {
      holder: (occurrence, control) => ((assigned.get(occurrence) ?? control >>> 1) << 1) | (control & 1),
      release: () => {
        for (let i = made.length - 1; i >= 0; i--) b.add(K.mcx, pos(made[i]![0]), pos(made[i]![1]));
      },
    };
  }
}

/** [lo, hi) cut into `parts` consecutive ranges whose lengths differ by at most one. */
function split(lo: number, hi: number, parts: number): [number, number][] {
  const n = hi - lo;
  const out: [number, number][] = [];
  for (let p = 0; p < parts; p++) out.push([lo + Math.floor((p * n) / parts), lo + Math.floor(((p + 1) * n) / parts)]);
  return out;
}
