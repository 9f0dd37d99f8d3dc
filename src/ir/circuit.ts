/**
 * The circuit IR: plain struct-of-arrays data. Gate g has kind `kind[g]`, operands
 * `ops[opStart[g] .. opStart[g+1])` (encoding in kinds.ts) and condition `cond[g]` (a classical
 * bit that must be 1 for the gate to act, or -1).
 */
import { encodeQubit, GATE_KINDS, K, type GateKind } from "./kinds.js";

/** What a register is for. */
export type RegisterRole = "search" | "work" | "target";

/** A named, contiguous range of qubits. */
export interface Register {
  /** Name in emitted programs: `x`, `work` or `target`. */
  readonly name: string;
  /** What the register is for. */
  readonly role: RegisterRole;
  /** First qubit index. */
  readonly start: number;
  /** Number of qubits. */
  readonly size: number;
}

/** A quantum circuit over numbered qubits and classical bits. */
export interface Circuit {
  /** Number of qubits (all registers together). */
  readonly qubits: number;
  /** Number of classical bits (measurement outcomes). */
  readonly clbits: number;
  /** Registers in qubit order: `x` (search), `target` (flag oracles only), `work`. */
  readonly registers: readonly Register[];
  /** Number of gates. */
  readonly gates: number;
  /** Kind of each gate, an index into {@link GATE_KINDS}. */
  readonly kind: Uint8Array;
  /** Gate g's operands are `ops[opStart[g] .. opStart[g + 1])`. */
  readonly opStart: Uint32Array;
  /** Operands of all gates; qubit operands are encoded `(qubit << 1) | negated`. */
  readonly ops: Int32Array;
  /** The classical bit each gate is conditioned on (it acts only when that bit is 1), or -1. */
  readonly cond: Int32Array;
}

export const qubitOf = (op: number): number => op >>> 1;
export const negated = (op: number): boolean => (op & 1) === 1;
export const pos = (q: number): number => encodeQubit(q);
export const neg = (q: number): number => encodeQubit(q, true);
/** An encoded control that fires when qubit q equals `value`. */
export const onValue = (q: number, value: 0 | 1): number => (q << 1) | (value ^ 1);

export function kindName(c: Circuit, g: number): GateKind {
  return GATE_KINDS[c.kind[g]!]!;
}

/** The operands of gate g (a view, not a copy). */
export function operands(c: Circuit, g: number): Int32Array {
  return c.ops.subarray(c.opStart[g]!, c.opStart[g + 1]!);
}

/** Appends gates to growable typed arrays; `finish` returns the circuit. */
export class CircuitBuilder {
  private kinds: Uint8Array;
  private starts: Uint32Array;
  private opsBuf: Int32Array;
  private conds: Int32Array;
  private n = 0;
  private nOps = 0;
  /** Qubits so far: search, then target, then work (the work register grows at the end). */
  qubits: number;
  clbits: number;
  readonly search: number;
  readonly target: number;

  constructor(layout: Layout, expectedGates = 64) {
    this.search = layout.search;
    this.target = layout.target;
    this.qubits = layout.search + layout.target + (layout.work ?? 0);
    this.clbits = layout.clbits ?? 0;
    const cap = Math.max(16, expectedGates);
    const spare = takeSpare(cap);
    this.kinds = spare?.kinds ?? new Uint8Array(cap);
    this.starts = spare?.starts ?? new Uint32Array(cap + 1);
    this.conds = spare?.conds ?? new Int32Array(cap);
    this.opsBuf = spare?.ops ?? new Int32Array(cap * 3);
  }

  get length(): number {
    return this.n;
  }

  private room(ops: number): void {
    if (this.n + 1 >= this.kinds.length) {
      const cap = this.kinds.length * 2;
      this.kinds = grow(this.kinds, cap) as Uint8Array;
      this.conds = grow(this.conds, cap) as Int32Array;
      this.starts = grow(this.starts, cap + 1) as Uint32Array;
    }
    if (this.nOps + ops > this.opsBuf.length) this.opsBuf = grow(this.opsBuf, Math.max(this.opsBuf.length * 2, this.nOps + ops)) as Int32Array;
  }

  /** Appends a gate with up to three encoded operands. */
  add(kind: number, a = NaN, b = NaN, c = NaN, cond = -1): this {
    const k = (a === a ? 1 : 0) + (b === b ? 1 : 0) + (c === c ? 1 : 0);
    this.room(k);
    let p = this.nOps;
    if (a === a) this.opsBuf[p++] = a;
    if (b === b) this.opsBuf[p++] = b;
    if (c === c) this.opsBuf[p++] = c;
    return this.close(kind, p, cond);
  }

  /** Appends a gate with any number of encoded operands. */
  addN(kind: number, ops: ArrayLike<number>, cond = -1): this {
    this.room(ops.length);
    let p = this.nOps;
    for (let i = 0; i < ops.length; i++) this.opsBuf[p++] = ops[i]!;
    return this.close(kind, p, cond);
  }

  /** Copies gate g of circuit c (without making a view of its operands: this runs per gate in every pass). */
  copy(c: Circuit, g: number, ops: Int32Array = c.ops): this {
    const s = c.opStart[g]!;
    const e = c.opStart[g + 1]!;
    this.room(e - s);
    let p = this.nOps;
    for (let i = s; i < e; i++) this.opsBuf[p++] = ops[i]!;
    return this.close(c.kind[g]!, p, c.cond[g]!);
  }

  private close(kind: number, p: number, cond: number): this {
    this.kinds[this.n] = kind;
    this.conds[this.n] = cond;
    this.nOps = p;
    this.starts[++this.n] = p;
    return this;
  }

  /** A fresh classical bit. */
  newClbit(): number {
    return this.clbits++;
  }

  /** A fresh work qubit (in |0>). */
  newWork(): number {
    return this.qubits++;
  }

  finish(): Circuit {
    return {
      qubits: this.qubits,
      clbits: this.clbits,
      registers: registersOf(this.search, this.target, this.qubits),
      gates: this.n,
      kind: this.kinds.subarray(0, this.n),
      opStart: this.starts.subarray(0, this.n + 1),
      ops: this.opsBuf.subarray(0, this.nOps),
      cond: this.conds.subarray(0, this.n),
    };
  }
}

/**
 * Buffers of circuits that their owner has finished with, for the next builder to take. On large
 * circuits most of a pass's time went into the page faults of freshly allocated arrays; reusing
 * arrays that are already mapped avoids them. Only a pipeline that owns a circuit may recycle it.
 */
interface Spare {
  kinds: Uint8Array;
  starts: Uint32Array;
  conds: Int32Array;
  ops: Int32Array;
}
const spares: Spare[] = [];

/**
 * Hands a circuit's buffers to later builders. The circuit must not be used afterwards: its
 * arrays will be overwritten.
 */
export function recycleCircuit(c: Circuit): void {
  if (c.kind.byteOffset !== 0 || c.ops.byteOffset !== 0 || c.opStart.byteOffset !== 0 || c.cond.byteOffset !== 0) return;
  spares.push({
    kinds: new Uint8Array(c.kind.buffer),
    starts: new Uint32Array(c.opStart.buffer),
    conds: new Int32Array(c.cond.buffer),
    ops: new Int32Array(c.ops.buffer),
  });
  if (spares.length > 2) spares.shift();
}

/** Drops every spare buffer (the end of the outermost pipeline; see `withBuffers`). */
export function releaseSpares(): void {
  spares.length = 0;
}

function takeSpare(cap: number): Spare | undefined {
  const i = spares.findIndex((s) => s.kinds.length >= cap && s.starts.length >= cap + 1 && s.conds.length >= cap && s.ops.length >= cap * 3);
  return i < 0 ? undefined : spares.splice(i, 1)[0];
}

function grow<T extends Uint8Array | Uint32Array | Int32Array>(a: T, cap: number): T {
  const b = new (a.constructor as new (n: number) => T)(cap);
  b.set(a);
  return b;
}

/** Register sizes: search qubits first, then the target (0 or 1), then work qubits. */
export interface Layout {
  readonly search: number;
  readonly target: number;
  readonly work?: number;
  readonly clbits?: number;
}

/**
 * Name of the search register. Not `x`: `stdgates.inc` declares a gate `x`, and OpenQASM 3 has one
 * global scope in which a gate name may not be redeclared (specification, "Scoping of variables").
 */
export const SEARCH_REGISTER = "vars";

/** Name of the classical register of measurement outcomes (the only one a circuit file may declare). */
export const OUTCOME_REGISTER = "outcome";

export function registersOf(search: number, target: number, qubits: number): Register[] {
  const regs: Register[] = [{ name: SEARCH_REGISTER, role: "search", start: 0, size: search }];
  if (target > 0) regs.push({ name: "target", role: "target", start: search, size: target });
  regs.push({ name: "work", role: "work", start: search + target, size: qubits - search - target });
  return regs;
}

export function layoutOf(c: Circuit): Layout {
  const size = (role: RegisterRole): number => c.registers.find((r) => r.role === role)?.size ?? 0;
  return { search: size("search"), target: size("target"), work: size("work"), clbits: c.clbits };
}

/** A builder with the same registers and classical bits as `c`, and no gates. */
export function emptyLike(c: Circuit, expectedGates = c.gates): CircuitBuilder {
  return new CircuitBuilder(layoutOf(c), expectedGates);
}

export { K };

/**
 * `c` without the work qubits after the last one a gate touches and without the classical bits
 * after the last one a gate writes or reads. A circuit file may declare millions of idle qubits
 * at no cost to itself, while every checker keeps state per qubit (gigabytes for 2^26). Dropped
 * work qubits stay |0>, all that a check asks of them; no other index moves, work being the last
 * register. Returns `c` itself when nothing is idle at the end.
 */
export function withoutIdleTail(c: Circuit): Circuit {
  let lastQubit = -1;
  let lastClbit = -1;
  const measure = K["measure"];
  const gphase = K["gphase"];
  for (let g = 0; g < c.gates; g++) {
    if (c.cond[g]! > lastClbit) lastClbit = c.cond[g]!;
    const kind = c.kind[g]!;
    if (kind === gphase) continue;
    const start = c.opStart[g]!;
    const end = kind === measure ? start + 1 : c.opStart[g + 1]!;
    if (kind === measure && c.ops[start + 1]! > lastClbit) lastClbit = c.ops[start + 1]!;
    for (let i = start; i < end; i++) if (qubitOf(c.ops[i]!) > lastQubit) lastQubit = qubitOf(c.ops[i]!);
  }
  const work = c.registers.find((r) => r.role === "work");
  const keptQubits = work === undefined ? c.qubits : Math.max(work.start, lastQubit + 1);
  const keptClbits = lastClbit + 1;
  if (keptQubits === c.qubits && keptClbits === c.clbits) return c;
  const size = (role: RegisterRole): number => c.registers.find((r) => r.role === role)?.size ?? 0;
  const registers = keptQubits === c.qubits ? c.registers : registersOf(size("search"), size("target"), keptQubits);
  return { ...c, qubits: keptQubits, clbits: keptClbits, registers };
}
