/**
 * The lowering of `passes/lower.ts`, replayed one logical operation at a time and handed on as
 * template instances (see templates.ts) instead of gates: the same 2-input AND trees, the same
 * lazily placed X gates for control polarity, the same record-driven uncomputation, in the same
 * order. Nothing is stored but the state the lowering itself keeps (pending X flips, how each
 * live AND was lowered). A test replays every template back into gates and requires the very
 * circuit `lower` builds.
 *
 * Qubits are virtual ids: the search register and target keep their numbers; work qubits get ids
 * from a pool that are given back when their span ends, and the engine assigns wires to them as
 * work-qubit reuse does.
 */
import {
  T_AND, T_CCX, T_CX, T_CZ, T_ERASE_HEAD, T_ERASE_TAIL, T_GPHASE, T_MEASURE, T_TOF7, T_UNAND, T_X, T_Z,
} from "./templates.js";

/** Receives template instances. `dies`: a bit per slot whose qubit is never used again. */
export interface InstanceSink {
  put(template: number, a: number, b: number, c: number, dies: number): void;
}

/**
 * The logical operations of synthesis, as a stream. Controls are encoded `(qubit << 1) |
 * negated`; targets are plain qubit ids. `dies` says the qubit is never used again (its span ends).
 */
export interface LogicalSink {
  /** A temporary AND of the controls into the fresh qubit t. */
  and(ctrls: ArrayLike<number>, t: number): void;
  /** The AND of two controls into t (no list). */
  andPair(a: number, b: number, t: number): void;
  /**
   * Uncomputes the AND into t. `controlsDie` (a 2-input AND only): bit 0, its first control, bit
   * 1, its second, are never used again either.
   */
  unand(t: number, dies: boolean, controlsDie?: number): void;
  /** A multi-controlled X onto t. */
  mcx(ctrls: ArrayLike<number>, t: number, dies: boolean): void;
  /** A singly controlled X onto t (no list). */
  mcx1(ctrl: number, t: number, dies: boolean): void;
  /** A multi-controlled Z. */
  mcz(qs: ArrayLike<number>): void;
  /** An X (template T_X) or H (T_H) on q. */
  single(template: number, q: number, dies: boolean): void;
  /** A measurement of q into the next bit. */
  measure(q: number): void;
  /** A global phase of -1. */
  gphase(): void;
}

/** Virtual qubit ids above the fixed registers, recycled when a span ends. */
export class VirtualIds {
  /** Ids given back, a stack (typed: a wide oracle gives back millions). */
  private free = new Int32Array(256);
  private top = 0;
  /** The lowest id never handed out, or given back in order (see give). */
  next: number;

  constructor(readonly base: number) {
    this.next = base;
  }

  take(): number {
    return this.top > 0 ? this.free[--this.top]! : this.next++;
  }

  give(id: number): void {
    // An id just below the unused ones, given back while none waits, is the next one handed out
    // either way: it becomes unused again, and a wide oracle's uncomputation, which gives back its
    // millions of ids in the reverse order of their taking, needs no stack.
    if (this.top === 0 && id === this.next - 1) {
      this.next--;
      return;
    }
    if (this.top === this.free.length) {
      const f = new Int32Array(this.free.length * 2);
      f.set(this.free);
      this.free = f;
    }
    this.free[this.top++] = id;
  }
}

/**
 * A holder for the AND records' table, shared by the streams of one cost table (a wide oracle's
 * records hold every clause's AND until the mark: some 30 MB for a million clauses).
 */
export interface RecordMemory {
  records: Int32Array<ArrayBuffer> | null;
}

/** Which circuit the lowering produces. */
export interface LoweringMode {
  /** `toffoli` or `clifford+t`. */
  readonly basis: "toffoli" | "clifford+t";
  /** `unitary` or `measured` uncomputation. */
  readonly uncompute: "unitary" | "measured";
  /** ANDs as full Toffolis, always uncomputed unitarily (the textbook reference). */
  readonly toffoliAnds: boolean;
}

const pos = (q: number): number => q << 1;

export class LoweringStream implements LogicalSink {
  private flipped = new Uint8Array(1024);
  private recordAt = new Int32Array(1024).fill(-1);
  /** Records as in lower.ts: count, copied control, then count triples (a, b, w); used as a stack. */
  private records = new Int32Array(1024);
  private top = 0;
  private readonly cliffordT: boolean;
  private readonly measured: boolean;
  private readonly toffoliAnds: boolean;
  private readonly pair = new Int32Array(2);
  /** Scratch of one operation: its controls, then what tree() leaves of them. */
  private tb = new Int32Array(64);
  /** Scratch of one operation: its ANDs' triples (a, b, w), rn numbers. */
  private rb = new Int32Array(192);
  private rn = 0;

  /**
   * `qubits`: the ids expected (sizes the per-id tables once; they grow if need be); `records`:
   * the numbers the live AND records may take (a wide oracle keeps every clause's until the mark).
   */
  constructor(private readonly out: InstanceSink, readonly ids: VirtualIds, mode: LoweringMode, qubits = 1024, records = 1024, memory?: RecordMemory) {
    this.cliffordT = mode.basis === "clifford+t";
    this.measured = mode.uncompute === "measured";
    this.toffoliAnds = mode.toffoliAnds;
    this.room(qubits - 1);
    this.memory = memory ?? null;
    const held = this.memory?.records ?? null;
    if (held !== null && held.length >= records) this.records = held;
    else if (records > this.records.length) this.records = new Int32Array(records);
    if (this.memory !== null) this.memory.records = this.records;
  }
  private readonly memory: RecordMemory | null;

  private room(q: number): void {
    if (q < this.flipped.length) return;
    const n = Math.max(q + 1, Math.ceil(this.flipped.length * 1.5));
    const f = new Uint8Array(n);
    f.set(this.flipped);
    this.flipped = f;
    const r = new Int32Array(n).fill(-1);
    r.set(this.recordAt);
    this.recordAt = r;
  }

  /** Sets the pending flip of qubit q (to record one block of a stream in a given state; see blocks.ts). */
  setFlipped(q: number, flipped: boolean): void {
    this.room(q);
    this.flipped[q] = flipped ? 1 : 0;
  }

  // ---- logical operations ------------------------------------------------------------------

  /** A temporary AND of encoded controls into the fresh qubit t. */
  and(ctrls: ArrayLike<number>, t: number): void {
    this.room(t);
    const n = ctrls.length;
    if (n === 2 || n === 3) {
      // lower.ts's smallAnd: two or three controls on distinct qubits, no lists.
      const a = ctrls[0]!;
      const b = ctrls[1]!;
      const d = n === 3 ? ctrls[2]! : -1;
      if (a >>> 1 !== b >>> 1 && (n === 2 || (a >>> 1 !== d >>> 1 && b >>> 1 !== d >>> 1))) {
        if (n === 2) {
          this.and2(a, b, t);
          this.rememberOne(t, a, b, t, -1, -1, -1);
        } else {
          const w = this.ids.take();
          this.room(w);
          this.and2(a, b, w);
          this.and2(pos(w), d, t);
          this.rememberOne(t, a, b, w, pos(w), d, t);
        }
        return;
      }
    }
    const c = this.loadControls(ctrls);
    this.rn = 0;
    if (c < 0) {
      this.remember(t, -1);
      return;
    }
    if (c === 1) {
      const only = this.tb[0]!;
      this.copy(only, t, false);
      this.remember(t, only);
      return;
    }
    this.tree(c, 2);
    const a = this.tb[0]!;
    const b = this.tb[1]!;
    this.and2(a, b, t);
    this.pushTriple(a, b, t);
    this.remember(t, -1);
  }

  andPair(a: number, b: number, t: number): void {
    this.pair[0] = a;
    this.pair[1] = b;
    this.and(this.pair, t);
  }

  mcx1(ctrl: number, t: number, dies: boolean): void {
    // mcx with one control: plain target, then a CX from the control made plain.
    this.room(t);
    this.plain(t);
    const qa = this.control(ctrl);
    this.out.put(T_CX, qa, t, -1, dies ? 2 : 0);
  }

  /** Uncomputes the AND into t; `dies`: t is never used again. */
  unand(t: number, dies: boolean, controlsDie = 0): void {
    const at = this.recordAt[t]!;
    if (at < 0) throw new Error(`counting: uncompute of work qubit ${t} without its AND`);
    this.recordAt[t] = -1;
    const r = this.records;
    const count = r[at]!;
    const copied = r[at + 1]!;
    if (count > 0) {
      for (let i = count - 1; i >= 0; i--) {
        const w = r[at + 4 + 3 * i]!;
        this.unand2(r[at + 2 + 3 * i]!, r[at + 3 + 3 * i]!, w, (w === t ? (dies ? 4 : 0) | controlsDie : 4));
        if (w !== t) this.ids.give(w);
      }
    } else if (copied >= 0) this.copy(copied, t, dies);
    if (at + 2 + 3 * count === this.top) this.top = at;
  }

  /** A multi-controlled X (encoded controls) onto t; `dies`: t is never used again. */
  mcx(ctrls: ArrayLike<number>, t: number, dies: boolean): void {
    this.room(t);
    const c = this.loadControls(ctrls);
    if (c < 0) return;
    this.plain(t);
    if (c === 0) {
      this.out.put(T_X, t, -1, -1, dies ? 1 : 0);
      return;
    }
    if (c === 1) {
      const qa = this.control(this.tb[0]!);
      this.out.put(T_CX, qa, t, -1, dies ? 2 : 0);
      return;
    }
    this.rn = 0;
    if (this.cliffordT && this.measured && !this.toffoliAnds) {
      this.tree(c, 1);
      const qa = this.control(this.tb[0]!);
      this.out.put(T_CX, qa, t, -1, dies ? 2 : 0);
    } else {
      this.tree(c, 2);
      const qa = this.control(this.tb[0]!);
      const qb = this.control(this.tb[1]!);
      this.ccx(qa, qb, t, dies ? 4 : 0);
    }
    this.undoTree();
  }

  /** A multi-controlled Z over encoded qubits. */
  mcz(qs: ArrayLike<number>): void {
    const c = this.loadControls(qs);
    if (c < 0) return;
    if (c === 0) {
      this.out.put(T_GPHASE, -1, -1, -1, 0);
      return;
    }
    this.rn = 0;
    if (this.tree(c, 2) === 1) this.out.put(T_Z, this.control(this.tb[0]!), -1, -1, 0);
    else {
      const qa = this.control(this.tb[0]!);
      const qb = this.control(this.tb[1]!);
      this.out.put(T_CZ, qa, qb, -1, 0);
    }
    this.undoTree();
  }

  /** A plain one-qubit gate (template T_X or T_H) on q, after undoing a pending flip of q. */
  single(template: number, q: number, dies: boolean): void {
    this.room(q);
    this.plain(q);
    this.out.put(template, q, -1, -1, dies ? 1 : 0);
  }

  /** A measurement of q (into a fresh bit). */
  measure(q: number): void {
    this.room(q);
    this.plain(q);
    this.out.put(T_MEASURE, q, -1, -1, 0);
  }

  /** A global phase. */
  gphase(): void {
    this.out.put(T_GPHASE, -1, -1, -1, 0);
  }

  /** The end of the circuit: every qubit still flipped is restored (lower.ts does it in qubit order). */
  finish(): void {
    for (let q = 0; q < this.flipped.length; q++) if (this.flipped[q]) this.plain(q);
  }

  // ---- as in lower.ts --------------------------------------------------------------------

  /** A larger records table (the caller copies the live part); kept for the next stream when shared. */
  private biggerRecords(need: number): Int32Array<ArrayBuffer> {
    const r = new Int32Array(Math.max(need, Math.ceil(this.records.length * 1.5)));
    if (this.memory !== null) this.memory.records = r;
    return r;
  }

  /** remember() for one or two triples without a list (the second when d >= 0). */
  private rememberOne(t: number, a: number, b: number, c: number, d: number, e: number, f: number): void {
    const two = d >= 0 ? 1 : 0;
    const need = this.top + 5 + 3 * two;
    if (need > this.records.length) {
      const r = this.biggerRecords(need);
      r.set(this.records.subarray(0, this.top));
      this.records = r;
    }
    const r = this.records;
    const at = this.top;
    this.recordAt[t] = at;
    r[at] = 1 + two;
    r[at + 1] = -1;
    r[at + 2] = a;
    r[at + 3] = b;
    r[at + 4] = c;
    if (two) {
      r[at + 5] = d;
      r[at + 6] = e;
      r[at + 7] = f;
    }
    this.top = need;
  }

  /** Records the AND into t: the triples in the scratch (rn numbers), or the control it copied. */
  private remember(t: number, copied: number): void {
    const n = this.rn;
    const need = this.top + 2 + n;
    if (need > this.records.length) {
      const r = this.biggerRecords(need);
      r.set(this.records.subarray(0, this.top));
      this.records = r;
    }
    this.recordAt[t] = this.top;
    const r = this.records;
    r[this.top] = n / 3;
    r[this.top + 1] = copied;
    for (let i = 0; i < n; i++) r[this.top + 2 + i] = this.rb[i]!;
    this.top = need;
  }

  private control(op: number): number {
    const q = op >>> 1;
    const want = op & 1;
    this.room(q);
    if (this.flipped[q] !== want) {
      this.out.put(T_X, q, -1, -1, 0);
      this.flipped[q] = want;
    }
    return q;
  }

  private plain(q: number): void {
    if (this.flipped[q]) {
      this.out.put(T_X, q, -1, -1, 0);
      this.flipped[q] = 0;
    }
  }

  private copy(ctrl: number, t: number, dies: boolean): void {
    this.plain(t);
    const qc = this.control(ctrl & ~1);
    const neg = (ctrl & 1) === 1;
    this.out.put(T_CX, qc, t, -1, dies && !neg ? 2 : 0);
    if (neg) this.out.put(T_X, t, -1, -1, dies ? 1 : 0);
  }

  private and2(a: number, b: number, t: number): void {
    const qa = this.control(a);
    const qb = this.control(b);
    this.plain(t);
    if (!this.cliffordT || this.toffoliAnds) this.ccx(qa, qb, t, 0);
    else this.out.put(T_AND, qa, qb, t, 0);
  }

  /** `dies`: bits of a, b, t never used again (slots 0, 1, 2 of every uncompute template). */
  private unand2(a: number, b: number, t: number, dies: number): void {
    if (this.measured && !this.toffoliAnds) {
      this.plain(t);
      this.out.put(T_ERASE_HEAD, t, -1, -1, 0);
      const qa = this.control(a);
      const qb = this.control(b);
      this.out.put(T_ERASE_TAIL, qa, qb, t, dies);
      return;
    }
    const qa = this.control(a);
    const qb = this.control(b);
    this.plain(t);
    if (!this.cliffordT || this.toffoliAnds) this.ccx(qa, qb, t, dies);
    else this.out.put(T_UNAND, qa, qb, t, dies);
  }

  private ccx(a: number, b: number, t: number, dies: number): void {
    this.out.put(this.cliffordT ? T_TOF7 : T_CCX, a, b, t, dies);
  }

  /**
   * lower.ts's normalizeControls into the scratch `tb`: the number of distinct controls, or -1
   * when the gate never fires (a qubit wanted both on |0> and on |1>).
   */
  private loadControls(ops: ArrayLike<number>): number {
    const n = ops.length;
    if (n > this.tb.length) this.tb = new Int32Array(Math.max(n, 2 * this.tb.length));
    const out = this.tb;
    return normalizeControls(ops, out);
  }

  private pushTriple(a: number, b: number, w: number): void {
    if (this.rn + 3 > this.rb.length) {
      const r = new Int32Array(2 * this.rb.length);
      r.set(this.rb);
      this.rb = r;
    }
    this.rb[this.rn++] = a;
    this.rb[this.rn++] = b;
    this.rb[this.rn++] = w;
  }

  /**
   * lower.ts's tree over the n encoded controls in `tb`: reduced to r of them by 2-input ANDs
   * into fresh qubits, level by level, in place; returns how many are left (at the start of
   * `tb`). The ANDs' triples are added to the scratch `rb`.
   */
  private tree(n: number, r: number): number {
    const tb = this.tb;
    // Room for its n - r triples at once (growing by doubling held the old copies too: a mark over
    // a million clause bits takes 3 million numbers).
    if (this.rn + 3 * n > this.rb.length) {
      const rb = new Int32Array(this.rn + 3 * n);
      rb.set(this.rb.subarray(0, this.rn));
      this.rb = rb;
    }
    if (n === r + 1) {
      const a = tb[0]!;
      const b = tb[1]!;
      const w = this.ids.take();
      this.room(w);
      this.and2(a, b, w);
      this.pushTriple(a, b, w);
      tb[0] = pos(w);
      if (r === 1) return 1;
      tb[1] = tb[2]!;
      return 2;
    }
    while (n > r) {
      let excess = n - r;
      let j = 0;
      for (let i = 0; i < n; ) {
        if (excess > 0 && i + 1 < n) {
          const a = tb[i]!;
          const b = tb[i + 1]!;
          const w = this.ids.take();
          this.room(w);
          this.and2(a, b, w);
          this.pushTriple(a, b, w);
          tb[j++] = pos(w);
          excess--;
          i += 2;
        } else tb[j++] = tb[i++]!;
      }
      n = j;
    }
    return n;
  }

  /** Uncomputes the scratch's ANDs, last first. */
  private undoTree(): void {
    const rb = this.rb;
    for (let i = this.rn - 3; i >= 0; i -= 3) {
      this.unand2(rb[i]!, rb[i + 1]!, rb[i + 2]!, 4);
      this.ids.give(rb[i + 2]!);
    }
  }
}

/**
 * lower.ts's normalizeControls into `out` (at least as long as `ops`): a repeated control is
 * dropped; a qubit wanted both on |0> and on |1> means the gate never fires (-1). Order of first
 * occurrence is kept. Returns how many controls are left.
 */
export function normalizeControls(ops: ArrayLike<number>, out: Int32Array = new Int32Array(ops.length)): number {
  let k = 0;
  if (ops.length <= 16) {
    // Small gates (nearly all): a quadratic scan, as lower.ts does.
    next: for (let i = 0; i < ops.length; i++) {
      const op = ops[i]!;
      for (let j = 0; j < k; j++) {
        if (out[j]! >>> 1 !== op >>> 1) continue;
        if (out[j] !== op) return -1;
        continue next;
      }
      out[k++] = op;
    }
    return k;
  }
  // A large gate (the wide oracle's mark over a million clause bits): per qubit, the polarity
  // seen plus one (0: none), a byte each.
  let top = 0;
  for (let i = 0; i < ops.length; i++) top = Math.max(top, ops[i]! >>> 1);
  const seen = new Uint8Array(top + 1);
  for (let i = 0; i < ops.length; i++) {
    const op = ops[i]!;
    const prev = seen[op >>> 1]!;
    if (prev === 0) {
      seen[op >>> 1] = (op & 1) + 1;
      out[k++] = op;
    } else if (prev !== (op & 1) + 1) return -1;
  }
  return k;
}
