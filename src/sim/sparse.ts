/**
 * An exact sparse state-vector simulator: the state is a list of (basis state, amplitude) terms,
 * so work qubits cost nothing while they hold |0>. Runs every gate kind of the IR, including
 * H, S, T, measurement (a seeded outcome drawn with its Born probability), reset and
 * classically conditioned gates, and the logical temporary ANDs (which check that their target
 * is clean, or holds the AND, in every term).
 *
 * The terms live in flat typed arrays (one row of 32-qubit words per term, amplitudes beside),
 * and a Hadamard merges the terms that differ only in its qubit through an open-addressing hash
 * of the rows. The Clifford+T carry chains keep up to 16 Hadamards open at once (65,536 terms in
 * the blocks-6 oracles), and with one object, bit array and string key per term the run that
 * confirms a counterexample took minutes, most of it in the collector; gates on qubits that hold
 * one value in every term act on a shared mask and phase instead of on each term.
 */
import { GATE_KINDS, PHASE_EIGHTHS } from "../ir/kinds.js";
import { negated, operands, qubitOf, type Circuit } from "../ir/circuit.js";
export { seededRandom } from "../util/random.js";

/** One basis state with its amplitude. Bits of qubit q: word q >>> 5, bit q & 31. */
export interface Term {
  /** The basis state, 32 qubits per word. */
  bits: Int32Array;
  /** Real part of the amplitude. */
  re: number;
  /** Imaginary part of the amplitude. */
  im: number;
}

/** The result of a run. */
export interface SparseRun {
  /** The final state's nonzero terms. */
  terms: Term[];
  /** Classical bits after the run (0/1). */
  clbits: Uint8Array;
  /**
   * Amplitude of this outcome branch before renormalization: the product of the square roots of
   * the chosen outcomes' probabilities (1 without measurements).
   */
  scale: number;
}

/** Thrown when a logical AND finds its target dirty: a bug in the circuit, reported with place. */
export class CircuitFault extends Error {
  constructor(
    /** Index of the offending gate. */
    readonly gate: number,
    message: string,
  ) {
    super(`gate ${gate}: ${message}`);
  }
}

const R = Math.SQRT1_2;
/** cos and sin of pi k / 4 for k = 0..7. */
const COS = new Float64Array([1, R, 0, -R, -1, -R, 0, R]);
const SIN = new Float64Array([0, R, 1, R, 0, -R, -1, -R]);

/** A basis state with the given qubits set. */
export function basisTerm(qubits: number, ones: readonly number[]): Term {
  const bits = new Int32Array(Math.max(1, Math.ceil(qubits / 32)));
  for (const q of ones) bits[q >>> 5]! ^= 1 << (q & 31);
  return { bits, re: 1, im: 0 };
}

/** How measurements behave in {@link runSparse}. */
export interface SparseOptions {
  /**
   * Outcomes to force, in order (measurements and resets); when the list runs out, outcomes are
   * drawn. A forced outcome of probability 0 throws a {@link CircuitFault}: the outcome depends on
   * the input, so the circuit would decohere a superposition of inputs.
   */
  readonly forced?: readonly number[];
  /** Receives every outcome, in order. */
  readonly record?: number[];
}

/**
 * The terms, row i at words [i W, (i + 1) W), plus what every term shares: an XOR mask over the
 * stored bits (an X acts on all terms at once) and a global phase. `uniform[q]` is 1 when qubit q
 * has one value in every term (checked after each Hadamard and measurement, cleared by a gate that
 * may make it differ): a gate whose qubits are all uniform acts on the shared part alone, so the
 * thousands of terms a Clifford+T carry chain holds open cost nothing to the gates elsewhere.
 * A Hadamard writes its result into the spare arrays and swaps, so a run allocates only when the
 * term count reaches a new high.
 */
class State {
  n = 0;
  bits: Int32Array;
  re: Float64Array;
  im: Float64Array;
  /** Actual bits of term i: bits[i W + w] ^ mask[w]. */
  readonly mask: Int32Array;
  /** The global phase, in units of pi/4. */
  phase = 0;
  readonly uniform: Uint8Array;
  private spareBits: Int32Array;
  private spareRe: Float64Array;
  private spareIm: Float64Array;
  /** Hash slots (group index + 1, 0 empty), each group's first term, each group's two amplitudes. */
  private slots = new Int32Array(16);
  private group = new Int32Array(16);
  private pair = new Float64Array(64);

  constructor(readonly words: number, capacity: number) {
    this.bits = new Int32Array(capacity * words);
    this.re = new Float64Array(capacity);
    this.im = new Float64Array(capacity);
    this.spareBits = new Int32Array(capacity * words);
    this.spareRe = new Float64Array(capacity);
    this.spareIm = new Float64Array(capacity);
    this.mask = new Int32Array(words);
    this.uniform = new Uint8Array(words * 32);
  }

  push(bits: Int32Array, re: number, im: number): void {
    this.reserve(this.n + 1);
    const W = this.words;
    for (let w = 0; w < W; w++) this.bits[this.n * W + w] = bits[w] ?? 0;
    this.re[this.n] = re;
    this.im[this.n] = im;
    this.n++;
  }

  /** Room for `count` terms in both sets (contents of the live set kept). */
  reserve(count: number): void {
    if (count <= this.re.length) return;
    let cap = this.re.length * 2;
    while (cap < count) cap *= 2;
    const W = this.words;
    const bits = new Int32Array(cap * W);
    bits.set(this.bits.subarray(0, this.n * W));
    const re = new Float64Array(cap);
    re.set(this.re.subarray(0, this.n));
    const im = new Float64Array(cap);
    im.set(this.im.subarray(0, this.n));
    this.bits = bits;
    this.re = re;
    this.im = im;
    this.spareBits = new Int32Array(cap * W);
    this.spareRe = new Float64Array(cap);
    this.spareIm = new Float64Array(cap);
  }

  /** True once no two terms share a basis state (a merging Hadamard makes it so). */
  distinct = false;
  /** Words holding a qubit that is not uniform, `active` of them (set by {@link activeWords}). */
  private words_ = new Int32Array(0);
  private active = 0;

  /** Lists the words with a qubit that is not uniform: the others are the same in every term. */
  private activeWords(): void {
    const W = this.words;
    if (this.words_.length < W) this.words_ = new Int32Array(W);
    this.active = 0;
    for (let w = 0; w < W; w++) {
      for (let b = 0; b < 32; b++) {
        if (this.uniform[w * 32 + b] === 0) {
          this.words_[this.active++] = w;
          break;
        }
      }
    }
  }

  /**
   * Sets `uniform` exactly: a qubit is uniform when no term's bit differs from the first's.
   * Merging and dropping terms never make a uniform qubit differ, so only the active words
   * (all of them when `all`) are read.
   */
  rescan(all = false): void {
    const W = this.words;
    const bits = this.bits;
    if (!all) this.activeWords();
    const count = all ? W : this.active;
    for (let j = 0; j < count; j++) {
      const w = all ? j : this.words_[j]!;
      let diff = 0;
      const first = bits[w]!;
      for (let i = 1; i < this.n && diff !== -1; i++) diff |= bits[i * W + w]! ^ first;
      for (let b = 0; b < 32; b++) this.uniform[w * 32 + b] = (diff >>> b) & 1 ? 0 : 1;
    }
  }

  /**
   * H on qubit q: the terms that differ only in q form one group with amplitudes a0 (q = 0) and
   * a1 (q = 1); the group becomes (a0 + a1)/sqrt 2 on q = 0 and (a0 - a1)/sqrt 2 on q = 1, and a
   * term whose amplitude cancels (squared modulus at most 1e-24) is dropped. Where q has one
   * value in every term and the terms are distinct, every group is one term: each splits in two
   * without a look-up (the Hadamard that opens a gadget).
   */
  hadamard(q: number): void {
    const W = this.words;
    const n = this.n;
    const w0 = q >>> 5;
    const m = 1 << (q & 31);
    const flipped = (this.mask[w0]! & m) !== 0;
    if (this.distinct && this.uniform[q] === 1) {
      this.reserve(2 * n);
      const src = this.bits, outBits = this.spareBits, outRe = this.spareRe, outIm = this.spareIm;
      let k = 0;
      for (let i = 0; i < n; i++) {
        const one = ((src[i * W + w0]! & m) !== 0) !== flipped;
        for (let side = 0; side < 2; side++) {
          const sign = side === 1 && one ? -R : R;
          const re = this.re[i]! * sign, im = this.im[i]! * sign;
          if (re * re + im * im <= 1e-24) continue;
          const row = k * W;
          for (let w = 0; w < W; w++) outBits[row + w] = src[i * W + w]!;
          outBits[row + w0] = (side === 1) !== flipped ? outBits[row + w0]! | m : outBits[row + w0]! & ~m;
          outRe[k] = re;
          outIm[k] = im;
          k++;
        }
      }
      this.swap(k);
      this.uniform[q] = 0;
      return;
    }
    // Only the active words can tell two groups apart (q's word is active now).
    this.uniform[q] = 0;
    this.activeWords();
    const words = this.words_;
    const active = this.active;
    let size = 16;
    while (size < 2 * n) size *= 2;
    if (this.slots.length < size) this.slots = new Int32Array(size);
    const slots = this.slots;
    slots.fill(0, 0, size);
    if (this.group.length < n) {
      this.group = new Int32Array(2 * n);
      this.pair = new Float64Array(8 * n);
    }
    const group = this.group;
    const pair = this.pair;
    const bits = this.bits;
    let groups = 0;
    const mask = size - 1;
    for (let i = 0; i < n; i++) {
      const row = i * W;
      let h = 0x811c9dc5;
      for (let j = 0; j < active; j++) {
        const w = words[j]!;
        h = Math.imul(h ^ (w === w0 ? bits[row + w]! & ~m : bits[row + w]!), 0x01000193);
        h ^= h >>> 15;
      }
      // A product carries low bits up, never down: without this (MurmurHash3's finalizer), rows
      // that differ only in a word's high bits share their low bits, and the slot, and the
      // probing is quadratic (109 s for one run at 200 variables).
      h ^= h >>> 16;
      h = Math.imul(h, 0x85ebca6b);
      h ^= h >>> 13;
      h = Math.imul(h, 0xc2b2ae35);
      h ^= h >>> 16;
      let s = h & mask;
      let g = -1;
      for (;;) {
        const e = slots[s]!;
        if (e === 0) break;
        const rep = group[e - 1]! * W;
        let same = true;
        for (let j = 0; j < active; j++) {
          const w = words[j]!;
          const d = bits[rep + w]! ^ bits[row + w]!;
          if ((w === w0 ? d & ~m : d) !== 0) {
            same = false;
            break;
          }
        }
        if (same) {
          g = e - 1;
          break;
        }
        s = (s + 1) & mask;
      }
      if (g < 0) {
        g = groups++;
        group[g] = i;
        slots[s] = g + 1;
        pair[4 * g] = pair[4 * g + 1] = pair[4 * g + 2] = pair[4 * g + 3] = 0;
      }
      const at = 4 * g + (((bits[row + w0]! & m) !== 0) !== flipped ? 2 : 0);
      pair[at] = pair[at]! + this.re[i]!;
      pair[at + 1] = pair[at + 1]! + this.im[i]!;
    }
    this.reserve(2 * groups);
    const outBits = this.spareBits;
    const outRe = this.spareRe;
    const outIm = this.spareIm;
    const src = this.bits;
    let k = 0;
    for (let g = 0; g < groups; g++) {
      const rep = group[g]! * W;
      const r0 = pair[4 * g]!, i0 = pair[4 * g + 1]!, r1 = pair[4 * g + 2]!, i1 = pair[4 * g + 3]!;
      for (let side = 0; side < 2; side++) {
        const re = side === 0 ? (r0 + r1) * R : (r0 - r1) * R;
        const im = side === 0 ? (i0 + i1) * R : (i0 - i1) * R;
        if (re * re + im * im <= 1e-24) continue;
        const row = k * W;
        for (let w = 0; w < W; w++) outBits[row + w] = src[rep + w]!;
        // The stored bit is the actual one XOR the mask.
        outBits[row + w0] = (side === 1) !== flipped ? outBits[row + w0]! | m : outBits[row + w0]! & ~m;
        outRe[k] = re;
        outIm[k] = im;
        k++;
      }
    }
    this.swap(k);
    this.distinct = true;
    this.rescan();
  }

  /** The spare arrays, holding `k` new terms, become the live ones. */
  private swap(k: number): void {
    const bits = this.spareBits, re = this.spareRe, im = this.spareIm;
    this.spareBits = this.bits;
    this.spareRe = this.re;
    this.spareIm = this.im;
    this.bits = bits;
    this.re = re;
    this.im = im;
    this.n = k;
  }

  /** Keeps the terms with qubit q = outcome, in order, amplitudes divided by `norm`. */
  keep(q: number, outcome: number, norm: number): void {
    const W = this.words;
    const w0 = q >>> 5;
    const sh = q & 31;
    const want = outcome ^ ((this.mask[w0]! >>> sh) & 1);
    let k = 0;
    for (let i = 0; i < this.n; i++) {
      if (((this.bits[i * W + w0]! >>> sh) & 1) !== want) continue;
      if (k !== i) this.bits.copyWithin(k * W, i * W, i * W + W);
      this.re[k] = this.re[i]! / norm;
      this.im[k] = this.im[i]! / norm;
      k++;
    }
    this.n = k;
    this.rescan();
  }

  terms(): Term[] {
    const W = this.words;
    const c = COS[this.phase & 7]!, s = SIN[this.phase & 7]!;
    const out: Term[] = [];
    for (let i = 0; i < this.n; i++) {
      const bits = this.bits.slice(i * W, i * W + W);
      for (let w = 0; w < W; w++) bits[w]! ^= this.mask[w]!;
      const re = this.re[i]!, im = this.im[i]!;
      out.push({ bits, re: re * c - im * s, im: re * s + im * c });
    }
    return out;
  }
}

/** Runs `c` on the given initial terms; `random` draws measurement outcomes. */
export function runSparse(c: Circuit, initial: Term[], random: () => number, opts: SparseOptions = {}): SparseRun {
  let measured = 0;
  const outcomeFor = (g: number, p1: number, total: number): number => {
    const i = measured++;
    let outcome: number;
    if (opts.forced !== undefined && i < opts.forced.length) {
      outcome = opts.forced[i]!;
      const p = outcome ? p1 : total - p1;
      if (p < 1e-12 * total) throw new CircuitFault(g, `measurement ${i} cannot give outcome ${outcome} here although it did for another input: its outcome depends on the input, so the circuit is not an oracle`);
    } else outcome = random() * total < p1 ? 1 : 0;
    opts.record?.push(outcome);
    return outcome;
  };
  const W = Math.max(1, Math.ceil(c.qubits / 32), ...initial.map((t) => t.bits.length));
  const st = new State(W, Math.max(16, initial.length));
  for (const t of initial) st.push(t.bits, t.re, t.im);
  st.rescan(true);
  st.distinct = initial.length <= 1;
  const mask = st.mask;
  const uniform = st.uniform;
  let scale = 1;
  const clbits = new Uint8Array(c.clbits);
  // Per gate: the controls' words, masks and wanted stored values (polarity and mask folded in).
  let ctlWord = new Int32Array(8);
  let ctlMask = new Int32Array(8);
  let ctlWant = new Int32Array(8);
  /** Loads the first `count` operands of `ops` as controls; true when all are uniform. */
  const controls = (ops: Int32Array, count: number): boolean => {
    if (ctlWord.length < count) {
      ctlWord = new Int32Array(2 * count);
      ctlMask = new Int32Array(2 * count);
      ctlWant = new Int32Array(2 * count);
    }
    let all = true;
    for (let i = 0; i < count; i++) {
      const q = qubitOf(ops[i]!);
      const w = q >>> 5, m = 1 << (q & 31);
      ctlWord[i] = w;
      ctlMask[i] = m;
      ctlWant[i] = (negated(ops[i]!) ? 0 : m) ^ (mask[w]! & m);
      if (uniform[q] === 0) all = false;
    }
    return all;
  };
  const fire = (row: number, count: number): boolean => {
    const bits = st.bits;
    for (let j = 0; j < count; j++) if ((bits[row + ctlWord[j]!]! & ctlMask[j]!) !== ctlWant[j]) return false;
    return true;
  };
  /** Multiplies by e^(i pi k / 4) every term where the first `count` operands fire. */
  const rotateWhere = (ops: Int32Array, count: number, k: number): void => {
    if (controls(ops, count)) {
      if (st.n > 0 && fire(0, count)) st.phase += k;
      return;
    }
    const c8 = COS[k & 7]!, s8 = SIN[k & 7]!;
    const re = st.re, im = st.im, bits = st.bits;
    const n = st.n;
    if (count === 1) {
      const cw = ctlWord[0]!, cm = ctlMask[0]!, want = ctlWant[0]!;
      for (let i = 0; i < n; i++) {
        if ((bits[i * W + cw]! & cm) !== want) continue;
        const r = re[i]!;
        re[i] = r * c8 - im[i]! * s8;
        im[i] = r * s8 + im[i]! * c8;
      }
      return;
    }
    for (let i = 0; i < n; i++) {
      if (!fire(i * W, count)) continue;
      const r = re[i]!;
      re[i] = r * c8 - im[i]! * s8;
      im[i] = r * s8 + im[i]! * c8;
    }
  };
  /** Flips qubit t in every term where the first `count` operands fire. */
  const flipWhere = (ops: Int32Array, count: number, t: number): void => {
    const tw = t >>> 5, tm = 1 << (t & 31);
    if (controls(ops, count)) {
      if (st.n > 0 && fire(0, count)) mask[tw]! ^= tm;
      return;
    }
    uniform[t] = 0;
    const bits = st.bits;
    const n = st.n;
    // The CNOTs of the Clifford+T gadgets are most of the work: one control without the loop.
    if (count === 1) {
      const cw = ctlWord[0]!, cm = ctlMask[0]!, want = ctlWant[0]!;
      for (let row = 0; row < n * W; row += W) if ((bits[row + cw]! & cm) === want) bits[row + tw]! ^= tm;
      return;
    }
    for (let i = 0; i < n; i++) if (fire(i * W, count)) bits[i * W + tw]! ^= tm;
  };
  for (let g = 0; g < c.gates; g++) {
    const cond = c.cond[g]!;
    if (cond >= 0 && clbits[cond] !== 1) continue;
    const ops = operands(c, g);
    const name = GATE_KINDS[c.kind[g]!]!;
    const q0 = qubitOf(ops[0] ?? 0);
    switch (name) {
      case "x": mask[q0 >>> 5]! ^= 1 << (q0 & 31); break;
      case "y": {
        // Y = i X Z: the phase -i where the qubit is 1, i where it is 0, then the flip.
        rotateWhere(ops, 1, 4);
        st.phase += 2;
        mask[q0 >>> 5]! ^= 1 << (q0 & 31);
        break;
      }
      case "z": case "s": case "sdg": case "t": case "tdg": rotateWhere(ops, 1, PHASE_EIGHTHS[name]!); break;
      case "gphase": st.phase += ops[0]!; break;
      case "cx": flipWhere(ops, 1, qubitOf(ops[1]!)); break;
      case "cz": rotateWhere(ops, 2, 4); break;
      case "ccx": flipWhere(ops, 2, qubitOf(ops[2]!)); break;
      case "mcx": flipWhere(ops, ops.length - 1, qubitOf(ops[ops.length - 1]!)); break;
      case "mcz": rotateWhere(ops, ops.length, 4); break;
      case "and":
      case "unand": {
        const tq = qubitOf(ops[ops.length - 1]!);
        const count = ops.length - 1;
        const all = controls(ops, count) && uniform[tq] === 1;
        const tw = tq >>> 5, tm = 1 << (tq & 31);
        const tmask = mask[tw]! & tm;
        let flips = 0;
        for (let i = 0; i < (all ? Math.min(1, st.n) : st.n); i++) {
          const v = fire(i * W, count);
          const set = ((st.bits[i * W + tw]! ^ tmask) & tm) !== 0;
          if (name === "and" ? set : set !== v) {
            throw new CircuitFault(g, name === "and"
              ? `temporary AND into qubit ${tq}, which is not |0>`
              : `uncompute of the AND in qubit ${tq}, which does not hold the AND of its inputs`);
          }
          if (v) {
            if (all) flips++;
            else st.bits[i * W + tw]! ^= tm;
          }
        }
        if (flips > 0) mask[tw]! ^= tm;
        if (!all) uniform[tq] = 0;
        break;
      }
      case "h": st.hadamard(q0); break;
      case "measure": case "reset": {
        let p1 = 0;
        let total = 0;
        const w = q0 >>> 5, m = 1 << (q0 & 31);
        for (let i = 0; i < st.n; i++) {
          const p = st.re[i]! * st.re[i]! + st.im[i]! * st.im[i]!;
          total += p;
          if (((st.bits[i * W + w]! ^ mask[w]!) & m) !== 0) p1 += p;
        }
        const outcome = outcomeFor(g, p1, total);
        const p = (outcome ? p1 : total - p1) / total;
        st.keep(q0, outcome, Math.sqrt(p));
        scale *= Math.sqrt(p);
        if (name === "measure") clbits[ops[1]!] = outcome;
        else if (outcome) mask[w]! ^= m;
        break;
      }
      default: {
        const never: never = name;
        throw new Error(`unknown gate ${String(never)}`);
      }
    }
  }
  return { terms: st.terms(), clbits, scale };
}
