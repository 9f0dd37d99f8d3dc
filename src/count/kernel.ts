/**
 * Counting over the free variables of a recovered structure, 32 assignments per 32-bit word:
 * the enumerated free variables take their values from lane patterns and word / block bits,
 * every needed definition is computed word-wise (AND, OR, XOR of input words), then parity
 * constraints, groups and remaining clauses are checked word-wise. Shared by the main thread and
 * the counting workers; plain typed arrays in, numbers out.
 *
 * Value slots: 0..enumerated-1 are the enumerated free variables (0..4 the lanes of a word, the
 * next `inner` the bits of the word index inside a block, the rest the block number), then the
 * constant slots (free variables fixed by unit clauses), then one slot per needed definition in
 * topological order. Operands are (slot << 1) | negated.
 */

/** Definition kinds, as in structure/recover.ts. */
export const K_EQUIV = 0;
export const K_NOT = 1;
export const K_AND = 2;
export const K_OR = 3;
export const K_XOR = 4;
export const K_XNOR = 5;

/** A structured count, ready for the kernel. */
export interface StructuredPlan {
  /** Enumerated free variables: the count covers 2^enumerated assignments. */
  readonly enumerated: number;
  /** Value words of the constant slots (0 or -1), which follow the enumerated slots. */
  readonly constWords: Int32Array;
  readonly defKind: Uint8Array;
  readonly defInStart: Uint32Array;
  readonly defIn: Int32Array;
  readonly parStart: Uint32Array;
  readonly parSlots: Int32Array;
  readonly parValue: Uint8Array;
  readonly grpStart: Uint32Array;
  readonly grpSlots: Int32Array;
  readonly grpExactlyOne: Uint8Array;
  readonly clauseStart: Uint32Array;
  readonly clauseLits: Int32Array;
  /** Word-index bits inside one block. */
  readonly inner: number;
}

/** Word-index bits per block: 2^14 words = 2^19 assignments per block. */
export const STRUCTURED_INNER_BITS = 14;

const LANE = [0xaaaaaaaa | 0, 0xcccccccc | 0, 0xf0f0f0f0 | 0, 0xff00ff00 | 0, 0xffff0000 | 0];

/** Number of blocks of the enumeration (the unit of parallel work and progress). */
export function structuredBlocks(plan: StructuredPlan): number {
  return plan.enumerated <= 5 ? 1 : 2 ** (plan.enumerated - 5 - plan.inner);
}

function popcount(x: number): number {
  x -= (x >>> 1) & 0x55555555;
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  x = (x + (x >>> 4)) & 0x0f0f0f0f;
  return Math.imul(x, 0x01010101) >>> 24;
}

/** Counts the satisfying assignments of the enumerated variables in blocks [from, to). */
export function countStructuredBlocks(plan: StructuredPlan, from: number, to: number): number {
  const F = plan.enumerated;
  const C = plan.constWords.length;
  const D = plan.defKind.length;
  const { defKind, defInStart, defIn, parStart, parSlots, parValue, grpStart, grpSlots, grpExactlyOne, clauseStart, clauseLits } = plan;
  const val = new Int32Array(F + C + D);
  for (let k = 0; k < Math.min(5, F); k++) val[k] = LANE[k]!;
  val.set(plan.constWords, F);
  const lanes = F >= 5 ? -1 : (2 ** (2 ** F) - 1) | 0;
  const inner = plan.inner;
  const words = F <= 5 ? 1 : 2 ** inner;
  const top = 5 + inner;
  const P = parValue.length;
  const Gn = grpExactlyOne.length;
  const M = clauseStart.length - 1;
  const base = F + C;
  let total = 0;
  for (let b = from; b < to; b++) {
    for (let j = top; j < F; j++) val[j] = -(Math.floor(b / 2 ** (j - top)) & 1);
    for (let w = 0; w < words; w++) {
      for (let j = 5; j < top && j < F; j++) val[j] = -((w >>> (j - 5)) & 1);
      for (let d = 0; d < D; d++) {
        const s = defInStart[d]!;
        const e = defInStart[d + 1]!;
        const kind = defKind[d]!;
        let x: number;
        if (kind === K_AND) {
          x = -1;
          for (let k = s; k < e; k++) {
            const c = defIn[k]!;
            x &= val[c >>> 1]! ^ -(c & 1);
          }
        } else if (kind === K_OR) {
          x = 0;
          for (let k = s; k < e; k++) {
            const c = defIn[k]!;
            x |= val[c >>> 1]! ^ -(c & 1);
          }
        } else {
          // equiv, not, xor, xnor: XOR of the inputs, negated for not and xnor.
          x = kind === K_NOT || kind === K_XNOR ? -1 : 0;
          for (let k = s; k < e; k++) {
            const c = defIn[k]!;
            x ^= val[c >>> 1]! ^ -(c & 1);
          }
        }
        val[base + d] = x;
      }
      let acc = lanes;
      for (let i = 0; i < M && acc !== 0; i++) {
        let m = 0;
        for (let k = clauseStart[i]!, e = clauseStart[i + 1]!; k < e; k++) {
          const c = clauseLits[k]!;
          m |= val[c >>> 1]! ^ -(c & 1);
        }
        acc &= m;
      }
      for (let p = 0; p < P && acc !== 0; p++) {
        let x = 0;
        for (let k = parStart[p]!, e = parStart[p + 1]!; k < e; k++) x ^= val[parSlots[k]!]!;
        acc &= parValue[p] ? x : ~x;
      }
      for (let g = 0; g < Gn && acc !== 0; g++) {
        let one = 0;
        let two = 0;
        for (let k = grpStart[g]!, e = grpStart[g + 1]!; k < e; k++) {
          const v = val[grpSlots[k]!]!;
          two |= one & v;
          one |= v;
        }
        acc &= grpExactlyOne[g] ? one & ~two : ~two;
      }
      total += popcount(acc);
    }
  }
  return total;
}
