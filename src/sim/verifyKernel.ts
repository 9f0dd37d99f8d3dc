/**
 * The checking loop of `verify` over a range of blocks, shared by the main thread and the
 * verification workers: plain data in, counts and the first failing lane out.
 */
import { newBlock, runBlock, type BitBlock, type BitProgram } from "./bitsim.js";

/** Lane patterns: bit j of LANE[v] is bit v of j. */
const LANE = [0xaaaaaaaa | 0, 0xcccccccc | 0, 0xf0f0f0f0 | 0, 0xff00ff00 | 0, 0xffff0000 | 0];

/**
 * How a free register's value completes to an assignment (structure/completion.ts's rule) and the
 * formula over that assignment, over compact slots (one per variable the rule or a clause names):
 * plain typed arrays, so that workers receive them.
 */
export interface CompletionProgram {
  /** Compact variables. */
  readonly slots: number;
  /** Slot of the variable each search qubit holds. */
  readonly regSlot: Int32Array;
  /** Slots fixed by unit propagation, and their values. */
  readonly fixedSlot: Int32Array;
  readonly fixedValue: Uint8Array;
  /** Definitions in order: slot, kind (0 equiv, 1 not, 2 and, 3 or, 4 xor, 5 xnor), inputs as (slot << 1) | negated. */
  readonly defSlot: Int32Array;
  readonly defKind: Uint8Array;
  readonly defInStart: Uint32Array;
  readonly defIn: Int32Array;
  /** The formula's literals as (slot << 1) | negated (clauses as in the job's clauseStart). */
  readonly lits: Int32Array;
}

/** Everything a range of checks needs (structured-clone friendly for workers). */
export interface VerifyJob {
  readonly program: BitProgram;
  /** Search qubits (the formula's variables, or a free register's size). */
  readonly variables: number;
  readonly lits: Int32Array;
  readonly clauseStart: Uint32Array;
  readonly kind: "phase" | "flag";
  /** Qubit of the flag oracle's target, or -1. */
  readonly target: number;
  /** Work qubits are [workStart, workEnd). */
  readonly workStart: number;
  readonly workEnd: number;
  readonly seed: number;
  readonly mode: "exhaustive" | "sampled";
  /** Words per block. */
  readonly blockWords: number;
  /** Exhaustive: global word range; sampled: lane-word range over samples then models. */
  readonly fromWord: number;
  readonly toWord: number;
  /** Sampled: number of random assignments, then `models` (n bits each, flattened). */
  readonly samples: number;
  /**
   * The random assignments are distinct (up to 40 variables): sample s is drawPermuted of the
   * s-th index not in `skip` (sorted indices whose value is one of the models).
   */
  readonly distinct?: { readonly skip: Float64Array };
  readonly models: Uint8Array;
  readonly modelCount: number;
  /** A free register: the expected marking is the formula on the completed assignment. */
  readonly completion?: CompletionProgram;
}

export interface RangeResult {
  /** Assignments checked (each with every target value and outcome pattern). */
  checked: number;
  /** Assignments that failed. */
  bad: number;
  /** The lowest failing lane index (an assignment for exhaustive, a sample index for sampled), or -1. */
  firstBad: number;
  /** Checked assignments that satisfy the formula. */
  models: number;
}

/** A 32-bit hash of three integers (for reproducible outcomes and samples). */
export function hash3(a: number, b: number, c: number): number {
  let h = Math.imul(a ^ 0x9e3779b9, 0x85ebca6b) ^ Math.imul(b + 0x7f4a7c15, 0xc2b2ae35) ^ Math.imul(c + 0x165667b1, 0x27d4eb2f);
  h ^= h >>> 15;
  h = Math.imul(h, 0x2c1b3c6d);
  h ^= h >>> 12;
  h = Math.imul(h, 0x297a2d39);
  return (h ^ (h >>> 15)) | 0;
}

/**
 * A keyed bijection of [0, 2^n) for n <= 40: a four-round Feistel network on two halves of
 * ceil(n/2) bits, walked again while the value is 2^n or more (cycle-walking, Black & Rogaway
 * 2002, from memory). Draws distinct random assignments without storing them.
 */
export function drawPermuted(seed: number, n: number, index: number): number {
  if (n === 0) return 0;
  const h = (n + 1) >>> 1;
  const half = 2 ** h;
  const mask = half - 1;
  const space = 2 ** n;
  let x = index;
  do {
    let l = Math.floor(x / half);
    let r = x % half;
    for (let round = 0; round < 4; round++) {
      const t = l ^ (hash3(seed, 0x5f3759 + round, r) & mask);
      l = r;
      r = t;
    }
    x = l * half + r;
  } while (x >= space);
  return x;
}

/** The inverse of {@link drawPermuted}: the index whose draw is x. */
export function drawIndex(seed: number, n: number, x: number): number {
  if (n === 0) return 0;
  const h = (n + 1) >>> 1;
  const half = 2 ** h;
  const mask = half - 1;
  const space = 2 ** n;
  let y = x;
  do {
    let l = Math.floor(y / half);
    let r = y % half;
    for (let round = 3; round >= 0; round--) {
      const t = r ^ (hash3(seed, 0x5f3759 + round, l) & mask);
      r = l;
      l = t;
    }
    y = l * half + r;
  } while (y >= space);
  return y;
}

/** The s-th index that is not in the sorted list `skip`. */
export function unskipped(skip: Float64Array, s: number): number {
  let idx = s;
  // idx = s + (entries <= idx): a few rounds, each a binary search.
  for (;;) {
    let lo = 0;
    let hi = skip.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (skip[mid]! <= idx) lo = mid + 1;
      else hi = mid;
    }
    if (s + lo === idx) return idx;
    idx = s + lo;
  }
}

/** The value of random lane s < job.samples of a distinct sample. */
function drawnValue(job: VerifyJob, s: number): number {
  return drawPermuted(job.seed, job.variables, unskipped(job.distinct!.skip, s));
}

/** Variable v (0-based) of sampled lane s. */
export function sampleBit(job: VerifyJob, s: number, v: number): number {
  if (s < job.samples) return job.distinct !== undefined ? Math.floor(drawnValue(job, s) / 2 ** v) % 2 : hash3(job.seed, s, v) & 1;
  const k = s - job.samples;
  return job.models[k * job.variables + v]!;
}

/** Lanes of the last word that hold real assignments. */
function validLanes(job: VerifyJob, word: number): number {
  if (job.mode === "exhaustive") return job.variables >= 5 ? -1 : ((2 ** (2 ** job.variables)) - 1) | 0;
  const total = job.samples + job.modelCount;
  const first = word * 32;
  if (first + 32 <= total) return -1;
  return total <= first ? 0 : ((2 ** (total - first)) - 1) | 0;
}

function fillSearch(job: VerifyJob, b: BitBlock, word0: number): void {
  const W = b.words;
  const n = job.variables;
  if (job.mode === "sampled" && job.distinct !== undefined) {
    // One draw per lane, spread over the variables (n <= 40: two 32-bit halves).
    b.state.fill(0, 0, n * W);
    for (let w = 0; w < W; w++) {
      for (let lane = 0; lane < 32; lane++) {
        const s = (word0 + w) * 32 + lane;
        if (s >= job.samples) {
          for (let v = 0; v < n; v++) b.state[v * W + w]! |= sampleBit(job, s, v) << lane;
          continue;
        }
        const x = drawnValue(job, s);
        const lo = x % 4294967296;
        const hi = Math.floor(x / 4294967296);
        for (let v = 0; v < n; v++) b.state[v * W + w]! |= (v < 32 ? (lo >>> v) & 1 : (hi >>> (v - 32)) & 1) << lane;
      }
    }
    return;
  }
  for (let v = 0; v < n; v++) {
    for (let w = 0; w < W; w++) {
      const g = word0 + w;
      let x = 0;
      if (job.mode === "exhaustive") x = v < 5 ? LANE[v]! : -((g >>> (v - 5)) & 1);
      else for (let lane = 0; lane < 32; lane++) x |= sampleBit(job, g * 32 + lane, v) << lane;
      b.state[v * W + w] = x;
    }
  }
}

/** Checks blocks of the job's range; `onBlock(words)` reports progress. */
export function runVerifyRange(job: VerifyJob, onBlock?: (words: number) => void): RangeResult {
  const { program, variables: n, lits, clauseStart } = job;
  const W = job.blockWords;
  const b = newBlock(program, W);
  const init = new Int32Array(n * W);
  const f = new Int32Array(W);
  const completion = job.completion;
  const slots = completion === undefined ? new Int32Array(0) : new Int32Array(completion.slots);
  const badLanes = new Int32Array(W);
  const result: RangeResult = { checked: 0, bad: 0, firstBad: -1, models: 0 };
  const passes = job.kind === "flag" || program.measurements > 0 ? 2 : 1;
  for (let word0 = job.fromWord; word0 < job.toWord; word0 += W) {
    const words = Math.min(W, job.toWord - word0);
    badLanes.fill(0);
    for (let pass = 0; pass < passes; pass++) {
      b.state.fill(0);
      b.sign.fill(0);
      b.fault.fill(0);
      fillSearch(job, b, word0);
      if (pass === 0) {
        init.set(b.state.subarray(0, n * W));
        for (let w = 0; w < W; w++) f[w] = completion === undefined ? formulaWord(lits, clauseStart, b.state, W, w) : completedWord(completion, clauseStart, b.state, W, w, slots);
      }
      const flagIn = pass === 1 ? -1 : 0;
      if (job.target >= 0) b.state.fill(flagIn, job.target * W, job.target * W + W);
      const flipOutcomes = pass === 1 ? -1 : 0;
      runBlock(program, b, (m, w) => hash3(job.seed, m, word0 + w) ^ flipOutcomes);
      // Block-wise loops (one register at a time) keep memory access sequential.
      for (let w = 0; w < words; w++) badLanes[w]! |= b.fault[w]!;
      for (let v = 0; v < n; v++) for (let w = 0; w < words; w++) badLanes[w]! |= b.state[v * W + w]! ^ init[v * W + w]!;
      for (let q = job.workStart; q < job.workEnd; q++) for (let w = 0; w < words; w++) badLanes[w]! |= b.state[q * W + w]!;
      for (let w = 0; w < words; w++) {
        if (job.kind === "phase") badLanes[w]! |= b.sign[w]! ^ f[w]!;
        else badLanes[w]! |= b.sign[w]! | (b.state[job.target * W + w]! ^ flagIn ^ f[w]!);
      }
    }
    for (let w = 0; w < words; w++) {
      const valid = validLanes(job, word0 + w);
      const bad = badLanes[w]! & valid;
      result.checked += popcount(valid);
      result.models += popcount(f[w]! & valid);
      if (bad !== 0) {
        result.bad += popcount(bad);
        const lane = 31 - Math.clz32(bad & -bad);
        const index = (word0 + w) * 32 + lane;
        if (result.firstBad < 0 || index < result.firstBad) result.firstBad = index;
      }
    }
    onBlock?.(words);
  }
  return result;
}

/** The formula's value on the 32 lanes of word w. */
function formulaWord(lits: Int32Array, clauseStart: Uint32Array, state: Int32Array, W: number, w: number): number {
  let acc = -1;
  for (let i = 0; i + 1 < clauseStart.length && acc !== 0; i++) {
    let c = 0;
    for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) {
      const l = lits[k]!;
      c |= l > 0 ? state[(l - 1) * W + w]! : ~state[(-l - 1) * W + w]!;
    }
    acc &= c;
  }
  return acc;
}

/** The formula's value on the 32 lanes of word w, on the completion of the register's values. */
function completedWord(c: CompletionProgram, clauseStart: Uint32Array, state: Int32Array, W: number, w: number, v: Int32Array): number {
  v.fill(0);
  for (let i = 0; i < c.regSlot.length; i++) v[c.regSlot[i]!] = state[i * W + w]!;
  for (let i = 0; i < c.fixedSlot.length; i++) v[c.fixedSlot[i]!] = c.fixedValue[i] ? -1 : 0;
  const input = (k: number): number => {
    const o = c.defIn[k]!;
    return o & 1 ? ~v[o >>> 1]! : v[o >>> 1]!;
  };
  for (let d = 0; d < c.defSlot.length; d++) {
    const s = c.defInStart[d]!;
    const e = c.defInStart[d + 1]!;
    const kind = c.defKind[d]!;
    let r: number;
    if (kind <= 1) r = kind === 0 ? input(s) : ~input(s);
    else if (kind === 2) {
      r = -1;
      for (let k = s; k < e; k++) r &= input(k);
    } else if (kind === 3) {
      r = 0;
      for (let k = s; k < e; k++) r |= input(k);
    } else {
      r = kind === 5 ? -1 : 0;
      for (let k = s; k < e; k++) r ^= input(k);
    }
    v[c.defSlot[d]!] = r;
  }
  let acc = -1;
  for (let i = 0; i + 1 < clauseStart.length && acc !== 0; i++) {
    let x = 0;
    for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) {
      const o = c.lits[k]!;
      x |= o & 1 ? ~v[o >>> 1]! : v[o >>> 1]!;
    }
    acc &= x;
  }
  return acc;
}

function popcount(x: number): number {
  x -= (x >>> 1) & 0x55555555;
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  x = (x + (x >>> 4)) & 0x0f0f0f0f;
  return Math.imul(x, 0x01010101) >>> 24;
}
