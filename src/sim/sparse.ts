/**
 * An exact sparse state-vector simulator: the state is a list of (basis state, amplitude) terms,
 * so work qubits cost nothing while they hold |0>. Runs every gate kind of the IR, including
 * H, S, T, measurement (a seeded outcome drawn with its Born probability), reset and
 * classically conditioned gates, and the logical temporary ANDs (which check that their target
 * is clean, or holds the AND, in every term).
 */
import { GATE_KINDS } from "../ir/kinds.js";
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
/** e^(i pi k / 4) for k = 0..7. */
const OMEGA: readonly (readonly [number, number])[] = [
  [1, 0], [R, R], [0, 1], [-R, R], [-1, 0], [-R, -R], [0, -1], [R, -R],
];

const bit = (t: Term, q: number): number => (t.bits[q >>> 5]! >>> (q & 31)) & 1;
const flip = (t: Term, q: number): void => {
  t.bits[q >>> 5]! ^= 1 << (q & 31);
};
const fires = (t: Term, op: number): boolean => bit(t, qubitOf(op)) === (negated(op) ? 0 : 1);
function rotate(t: Term, k: number): void {
  const [c, s] = OMEGA[k & 7]!;
  const re = t.re * c - t.im * s;
  t.im = t.re * s + t.im * c;
  t.re = re;
}

/** A basis state: qubit q set when bit q of `value` is (q < 53 for a number; any q for bigint). */
export function basisTerm(qubits: number, ones: readonly number[]): Term {
  const bits = new Int32Array(Math.max(1, Math.ceil(qubits / 32)));
  const t: Term = { bits, re: 1, im: 0 };
  for (const q of ones) flip(t, q);
  return t;
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
  let scale = 1;
  let terms: Term[] = initial.map((t) => ({ bits: t.bits.slice(), re: t.re, im: t.im }));
  const clbits = new Uint8Array(c.clbits);
  for (let g = 0; g < c.gates; g++) {
    const cond = c.cond[g]!;
    if (cond >= 0 && clbits[cond] !== 1) continue;
    const ops = operands(c, g);
    const name = GATE_KINDS[c.kind[g]!]!;
    const q0 = qubitOf(ops[0] ?? 0);
    switch (name) {
      case "x": for (const t of terms) flip(t, q0); break;
      case "y": for (const t of terms) { rotate(t, bit(t, q0) ? 6 : 2); flip(t, q0); } break;
      case "z": for (const t of terms) if (bit(t, q0)) rotate(t, 4); break;
      case "s": for (const t of terms) if (bit(t, q0)) rotate(t, 2); break;
      case "sdg": for (const t of terms) if (bit(t, q0)) rotate(t, 6); break;
      case "t": for (const t of terms) if (bit(t, q0)) rotate(t, 1); break;
      case "tdg": for (const t of terms) if (bit(t, q0)) rotate(t, 7); break;
      case "gphase": for (const t of terms) rotate(t, ops[0]!); break;
      case "cx": for (const t of terms) if (bit(t, q0)) flip(t, qubitOf(ops[1]!)); break;
      case "cz": for (const t of terms) if (bit(t, q0) && bit(t, qubitOf(ops[1]!))) rotate(t, 4); break;
      case "ccx": for (const t of terms) if (bit(t, q0) && bit(t, qubitOf(ops[1]!))) flip(t, qubitOf(ops[2]!)); break;
      case "mcx": {
        const tq = qubitOf(ops[ops.length - 1]!);
        for (const t of terms) if (allFire(t, ops, ops.length - 1)) flip(t, tq);
        break;
      }
      case "mcz": for (const t of terms) if (allFire(t, ops, ops.length)) rotate(t, 4); break;
      case "and":
      case "unand": {
        const tq = qubitOf(ops[ops.length - 1]!);
        for (const t of terms) {
          const v = allFire(t, ops, ops.length - 1) ? 1 : 0;
          const want = name === "and" ? 0 : v;
          if (bit(t, tq) !== want) {
            throw new CircuitFault(g, name === "and"
              ? `temporary AND into qubit ${tq}, which is not |0>`
              : `uncompute of the AND in qubit ${tq}, which does not hold the AND of its inputs`);
          }
          if (v) flip(t, tq);
        }
        break;
      }
      case "h": terms = hadamard(terms, q0); break;
      case "measure": case "reset": {
        let p = 1;
        const outcome = measure(terms, q0, (p1, tot) => {
          const o = outcomeFor(g, p1, tot);
          p = (o ? p1 : tot - p1) / tot;
          return o;
        }, (kept) => (terms = kept));
        scale *= Math.sqrt(p);
        if (name === "measure") clbits[ops[1]!] = outcome;
        else if (outcome) for (const t of terms) flip(t, q0);
        break;
      }
      default: {
        const never: never = name;
        throw new Error(`unknown gate ${String(never)}`);
      }
    }
  }
  return { terms, clbits, scale };
}

function allFire(t: Term, ops: Int32Array, n: number): boolean {
  for (let i = 0; i < n; i++) if (!fires(t, ops[i]!)) return false;
  return true;
}

function hadamard(terms: Term[], q: number): Term[] {
  const out: Term[] = [];
  // Few terms is the common case (work qubits idle at |0>): merge by direct comparison then.
  const byKey = terms.length > 8 ? new Map<string, Term>() : null;
  const add = (bits: Int32Array, re: number, im: number): void => {
    if (byKey !== null) {
      const key = bits.join(",");
      const t = byKey.get(key);
      if (t) {
        t.re += re;
        t.im += im;
      } else {
        const n = { bits, re, im };
        byKey.set(key, n);
        out.push(n);
      }
      return;
    }
    for (const t of out) {
      if (sameBits(t.bits, bits)) {
        t.re += re;
        t.im += im;
        return;
      }
    }
    out.push({ bits, re, im });
  };
  const w = q >>> 5;
  const m = 1 << (q & 31);
  for (const t of terms) {
    const one = (t.bits[w]! & m) !== 0;
    const b0 = t.bits.slice();
    b0[w]! &= ~m;
    const b1 = b0.slice();
    b1[w]! |= m;
    add(b0, t.re * R, t.im * R);
    const sign = one ? -R : R;
    add(b1, t.re * sign, t.im * sign);
  }
  return out.filter((t) => t.re * t.re + t.im * t.im > 1e-24);
}

function sameBits(a: Int32Array, b: Int32Array): boolean {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** Measures qubit q: picks an outcome, keeps the matching terms, renormalizes if asked. */
function measure(terms: Term[], q: number, pick: (p1: number, total: number) => number, set: (kept: Term[]) => void): number {
  let p1 = 0;
  let total = 0;
  for (const t of terms) {
    const w = t.re * t.re + t.im * t.im;
    total += w;
    if (bit(t, q)) p1 += w;
  }
  const outcome = pick(p1, total);
  const kept = terms.filter((t) => bit(t, q) === outcome);
  const norm = Math.sqrt((outcome ? p1 : total - p1) / total);
  for (const t of kept) {
    t.re /= norm;
    t.im /= norm;
  }
  set(kept);
  return outcome;
}
