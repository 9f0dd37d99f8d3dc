/**
 * A reversible, bit-parallel simulator: every 32-bit word holds 32 assignments (one per bit,
 * "lane"), and a block of W words per qubit is pushed through each gate at once. It runs the
 * classical part of the IR exactly -- X, CX, CCX, multi-controlled X and Z with polarities, Z and
 * CZ, a global phase of -1, and temporary ANDs as logical operations (the AND target must be 0,
 * the uncompute target must hold the AND) -- tracking per lane every qubit's bit and the sign of
 * the amplitude. Gidney's measured uncomputation is exact here too: an H immediately followed by
 * a measurement of the same qubit is an X-basis measurement; with the outcome c fixed for the
 * lane it multiplies the amplitude by (-1)^(c t) and leaves t = c, and a later reset clears it.
 * Gates outside this set (S, T, Y, an H not followed by its measurement) need the state-vector
 * simulator (sparse.ts).
 */
import { GATE_KINDS } from "../ir/kinds.js";
import { negated, operands, qubitOf, type Circuit } from "../ir/circuit.js";

/** Opcodes of the compiled program. */
const FLIP = 0; // target ^= AND(controls)
const PHASE = 1; // sign ^= AND(controls)
const AND = 2; // check target == 0, then target = AND(controls)
const UNAND = 3; // check target == AND(controls), then target = 0
const XMEAS = 4; // X-basis measurement of qubit t into clbit: sign ^= c & t; t = c
const RESET = 5; // t = 0
const NEG = 6; // sign ^= all lanes (global phase -1)

/**
 * A circuit compiled for the bit-parallel kernel: `code` holds, per operation, the opcode, the
 * source gate index, the number of controls, then (slot, xorMask) per control, then the target
 * slot (or clbit slot for XMEAS). Slots 0..qubits-1 are qubits, qubits.. are classical bits.
 */
export interface BitProgram {
  readonly code: Int32Array;
  readonly ops: number;
  readonly qubits: number;
  readonly clbits: number;
  readonly measurements: number;
}

/** Compiles a circuit for the bit-parallel kernel, or says why it cannot be. */
export function compileBitProgram(c: Circuit): BitProgram | { unsupported: string } {
  const out: number[] = [];
  let count = 0;
  let measurements = 0;
  const xMeasured = new Uint8Array(c.qubits); // 1 after an X-basis measurement, until reset
  const slotOfBit = (b: number): number => c.qubits + b;
  const push = (op: number, g: number, ctrls: [number, number][], target: number): void => {
    out.push(op, g, ctrls.length);
    for (const [s, m] of ctrls) out.push(s, m);
    out.push(target);
    count++;
  };
  for (let g = 0; g < c.gates; g++) {
    const kind = GATE_KINDS[c.kind[g]!]!;
    const ops = operands(c, g);
    const cond = c.cond[g]!;
    const extra: [number, number][] = cond >= 0 ? [[slotOfBit(cond), 0]] : [];
    const ctl = (op: number): [number, number] => [qubitOf(op), negated(op) ? -1 : 0];
    for (let i = 0; i < (kind === "gphase" ? 0 : kind === "measure" ? 1 : ops.length); i++) {
      const q = qubitOf(ops[i]!);
      if (xMeasured[q] && kind !== "reset") return { unsupported: `gate ${g} (${kind}) uses qubit ${q} between its measurement and its reset` };
    }
    switch (kind) {
      case "x": case "cx": case "ccx": case "mcx":
        push(FLIP, g, [...Array.from(ops.subarray(0, -1), ctl), ...extra], qubitOf(ops[ops.length - 1]!));
        break;
      case "z": case "cz": case "mcz":
        push(PHASE, g, [...Array.from(ops, ctl), ...extra], -1);
        break;
      case "and": case "unand":
        if (cond >= 0) return { unsupported: `gate ${g}: a conditioned temporary AND` };
        push(kind === "and" ? AND : UNAND, g, Array.from(ops.subarray(0, -1), ctl), qubitOf(ops[ops.length - 1]!));
        break;
      case "gphase":
        if (ops[0]! % 8 === 0) break;
        if (ops[0]! % 8 !== 4) return { unsupported: `gate ${g}: a global phase other than 0 or pi` };
        push(NEG, g, extra, -1);
        break;
      case "h": {
        const q = qubitOf(ops[0]!);
        const next = g + 1 < c.gates ? g + 1 : -1;
        if (cond >= 0 || next < 0 || GATE_KINDS[c.kind[next]!] !== "measure" || qubitOf(operands(c, next)[0]!) !== q || c.cond[next]! >= 0) {
          return { unsupported: `gate ${g}: an H that is not an X-basis measurement (H then measure)` };
        }
        push(XMEAS, g, [[q, 0]], slotOfBit(operands(c, next)[1]!));
        xMeasured[q] = 1;
        measurements++;
        g++; // the measurement was taken with the H
        break;
      }
      case "measure":
        return { unsupported: `gate ${g}: a measurement in the computational basis` };
      case "reset": {
        const q = qubitOf(ops[0]!);
        if (!xMeasured[q] || cond >= 0) return { unsupported: `gate ${g}: a reset that does not follow an X-basis measurement` };
        xMeasured[q] = 0;
        push(RESET, g, [], q);
        break;
      }
      case "y": case "s": case "sdg": case "t": case "tdg":
        return { unsupported: `gate ${g}: ${kind} is not a classical gate` };
      default: {
        const never: never = kind;
        return { unsupported: String(never) };
      }
    }
  }
  return { code: Int32Array.from(out), ops: count, qubits: c.qubits, clbits: c.clbits, measurements };
}

/** Per-block state of the kernel: slots x W words, the sign words and fault words. */
export interface BitBlock {
  readonly words: number;
  readonly state: Int32Array;
  readonly sign: Int32Array;
  /** Lanes where an AND found its target dirty or an uncompute found it not holding the AND. */
  readonly fault: Int32Array;
  /** Gate index of the first operation that faulted in this block, or -1. */
  firstFaultGate: number;
}

export function newBlock(p: BitProgram, words: number): BitBlock {
  return {
    words,
    state: new Int32Array((p.qubits + p.clbits) * words),
    sign: new Int32Array(words),
    fault: new Int32Array(words),
    firstFaultGate: -1,
  };
}

/**
 * Runs the program on a block whose search-qubit words are already set (all other slots 0).
 * `outcome(m, w)` gives the 32 forced outcomes of measurement m in word w.
 */
export function runBlock(p: BitProgram, b: BitBlock, outcome: (m: number, w: number) => number): void {
  const { code } = p;
  const W = b.words;
  const { state, sign, fault } = b;
  const fired = new Int32Array(W);
  let pc = 0;
  let m = 0;
  for (let op = 0; op < p.ops; op++) {
    const opcode = code[pc]!;
    const gate = code[pc + 1]!;
    const n = code[pc + 2]!;
    const ctl = pc + 3;
    const target = code[ctl + 2 * n]!;
    pc = ctl + 2 * n + 1;
    const tBase = target * W;
    switch (opcode) {
      case FLIP:
        if (n === 2) {
          const a = code[ctl]! * W;
          const ma = code[ctl + 1]!;
          const c = code[ctl + 2]! * W;
          const mc = code[ctl + 3]!;
          for (let w = 0; w < W; w++) state[tBase + w]! ^= (state[a + w]! ^ ma) & (state[c + w]! ^ mc);
        } else {
          fireBlock(code, ctl, n, state, W, fired);
          for (let w = 0; w < W; w++) state[tBase + w]! ^= fired[w]!;
        }
        break;
      case PHASE:
        fireBlock(code, ctl, n, state, W, fired);
        for (let w = 0; w < W; w++) sign[w]! ^= fired[w]!;
        break;
      case AND:
      case UNAND: {
        let any = 0;
        if (n === 2 || n === 3) {
          // The common cases (clauses of 2 or 3 literals, lowered ANDs), fused into one pass.
          const a = code[ctl]! * W;
          const ma = code[ctl + 1]!;
          const c = code[ctl + 2]! * W;
          const mc = code[ctl + 3]!;
          const d = n === 3 ? code[ctl + 4]! * W : a;
          const md = n === 3 ? code[ctl + 5]! : ma;
          const and = opcode === AND;
          for (let w = 0; w < W; w++) {
            const v = (state[a + w]! ^ ma) & (state[c + w]! ^ mc) & (state[d + w]! ^ md);
            const t = state[tBase + w]!;
            const bad = and ? t : t ^ v;
            fault[w]! |= bad;
            any |= bad;
            state[tBase + w] = and ? v : 0;
          }
        } else {
          fireBlock(code, ctl, n, state, W, fired);
          for (let w = 0; w < W; w++) {
            const v = fired[w]!;
            const t = state[tBase + w]!;
            const bad = opcode === AND ? t : t ^ v;
            fault[w]! |= bad;
            any |= bad;
            state[tBase + w] = opcode === AND ? v : 0;
          }
        }
        if (any !== 0 && b.firstFaultGate < 0) b.firstFaultGate = gate;
        break;
      }
      case XMEAS: {
        const q = code[ctl]!;
        for (let w = 0; w < W; w++) {
          const c = outcome(m, w);
          sign[w]! ^= c & state[q * W + w]!;
          state[q * W + w] = c;
          state[tBase + w] = c;
        }
        m++;
        break;
      }
      case RESET:
        state.fill(0, tBase, tBase + W);
        break;
      case NEG:
        fireBlock(code, ctl, n, state, W, fired);
        for (let w = 0; w < W; w++) sign[w]! ^= fired[w]!;
        break;
    }
  }
}

/**
 * The control words of a whole block into `out` (one pass per control, so the loops stay
 * simple enough for the compiler to keep in registers).
 */
export function fireBlock(code: Int32Array, ctl: number, n: number, state: Int32Array, W: number, out: Int32Array): void {
  if (n === 0) {
    out.fill(-1, 0, W);
    return;
  }
  const base0 = code[ctl]! * W;
  const mask0 = code[ctl + 1]!;
  for (let w = 0; w < W; w++) out[w] = state[base0 + w]! ^ mask0;
  for (let i = 1; i < n; i++) {
    const base = code[ctl + 2 * i]! * W;
    const mask = code[ctl + 2 * i + 1]!;
    for (let w = 0; w < W; w++) out[w]! &= state[base + w]! ^ mask;
  }
}

/** The result of {@link simulateClassical}. */
export interface ClassicalRun {
  /** Every qubit's value at the end (qubit order). */
  readonly qubits: boolean[];
  /** The sign of the amplitude: 1 or -1. */
  readonly phase: 1 | -1;
  /** Classical bits at the end. */
  readonly clbits: boolean[];
  /** Index of the first temporary AND that found its target in the wrong state, or -1. */
  readonly faultGate: number;
}

/**
 * Runs a classical circuit (X, CX, CCX, multi-controlled X/Z with polarities, Z, CZ, a global
 * phase of -1, temporary ANDs, X-basis measurement and reset) on one basis input, with the
 * given measurement outcomes (default all 0). Returns null and a reason for other gates.
 *
 * @example
 * ```ts
 * const r = simulateClassical(compileOracle(cnf, { basis: "toffoli" }).circuit, [true, false, true]);
 * ```
 */
export function simulateClassical(
  c: Circuit,
  input: readonly boolean[],
  outcomes: readonly boolean[] = [],
): ClassicalRun | {
  /** Why the circuit is not classical (the first gate the kernel cannot run). */
  unsupported: string;
} {
  const p = compileBitProgram(c);
  if ("unsupported" in p) return p;
  const b = newBlock(p, 1);
  input.forEach((on, q) => (b.state[q] = on ? 1 : 0));
  runBlock(p, b, (m) => (outcomes[m] ? 1 : 0));
  return {
    qubits: Array.from({ length: c.qubits }, (_, q) => (b.state[q]! & 1) === 1),
    phase: b.sign[0]! & 1 ? -1 : 1,
    clbits: Array.from({ length: c.clbits }, (_, k) => (b.state[c.qubits + k]! & 1) === 1),
    faultGate: b.fault[0]! & 1 ? b.firstFaultGate : -1,
  };
}
