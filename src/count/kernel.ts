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

/**
 * Word-index bits per block: 2^8 words = 2^13 assignments per block, so that many variables
 * are block variables, whose values the per-block simplification uses.
 */
export const STRUCTURED_INNER_BITS = 8;

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

/** Scratch space of the kernel, reused across blocks (and chunks, on one thread). */
export interface StructuredScratch {
  val: Int32Array;
  known: Uint8Array;
  activeDefs: Int32Array;
  activeClauses: Int32Array;
  activeParities: Int32Array;
  activeGroups: Int32Array;
}

export function newStructuredScratch(plan: StructuredPlan): StructuredScratch {
  const slots = plan.enumerated + plan.constWords.length + plan.defKind.length;
  return {
    val: new Int32Array(slots),
    known: new Uint8Array(slots),
    activeDefs: new Int32Array(plan.defKind.length),
    activeClauses: new Int32Array(plan.clauseStart.length),
    activeParities: new Int32Array(plan.parValue.length),
    activeGroups: new Int32Array(plan.grpExactlyOne.length),
  };
}

/**
 * Counts the satisfying assignments of the enumerated variables in blocks [from, to).
 *
 * Each block first evaluates everything its fixed (block and constant) variables decide, in
 * three-valued logic: a definition with a known-false AND input or a known-true OR input, or with
 * all inputs known, is a constant word for the whole block; a clause with a known-true literal or
 * a parity or group with all members known drops out; a clause with only known-false literals, a
 * wrong known parity or a group with two known-true members rules out the block. The words of
 * the block then evaluate only what is left. Exact: a dropped part holds for every assignment of
 * the block, and a ruled-out block holds no model.
 */
export function countStructuredBlocks(plan: StructuredPlan, from: number, to: number, scratch = newStructuredScratch(plan)): number {
  const F = plan.enumerated;
  const C = plan.constWords.length;
  const D = plan.defKind.length;
  const { defKind, defInStart, defIn, parStart, parSlots, parValue, grpStart, grpSlots, grpExactlyOne, clauseStart, clauseLits } = plan;
  const { val, known, activeDefs, activeClauses, activeParities, activeGroups } = scratch;
  known.fill(0);
  for (let k = 0; k < Math.min(5, F); k++) val[k] = LANE[k]!;
  for (let k = 0; k < C; k++) {
    val[F + k] = plan.constWords[k]!;
    known[F + k] = 1;
  }
  const lanes = F >= 5 ? -1 : (2 ** (2 ** F) - 1) | 0;
  const inner = plan.inner;
  const words = F <= 5 ? 1 : 2 ** inner;
  const top = Math.min(F, 5 + inner);
  const P = parValue.length;
  const Gn = grpExactlyOne.length;
  const M = clauseStart.length - 1;
  const base = F + C;
  let total = 0;
  blocks: for (let b = from; b < to; b++) {
    for (let j = top; j < F; j++) {
      val[j] = -(Math.floor(b / 2 ** (j - top)) & 1);
      known[j] = 1;
    }
    // Definitions, three-valued under the block's fixed variables.
    let nd = 0;
    for (let d = 0; d < D; d++) {
      const s = defInStart[d]!;
      const e = defInStart[d + 1]!;
      const kind = defKind[d]!;
      let all = 1;
      let x: number;
      if (kind === K_AND || kind === K_OR) {
        // AND: a known 0 input decides; OR: a known 1 input decides.
        const decide = kind === K_AND ? 0 : -1;
        x = ~decide;
        for (let k = s; k < e; k++) {
          const c = defIn[k]!;
          const slot = c >>> 1;
          if (!known[slot]) {
            all = 0;
            continue;
          }
          if ((val[slot]! ^ -(c & 1)) === decide) {
            x = decide;
            all = 2;
            break;
          }
        }
      } else {
        x = kind === K_NOT || kind === K_XNOR ? -1 : 0;
        for (let k = s; k < e && all; k++) {
          const c = defIn[k]!;
          if (known[c >>> 1]) x ^= val[c >>> 1]! ^ -(c & 1);
          else all = 0;
        }
      }
      if (all) {
        val[base + d] = x;
        known[base + d] = 1;
      } else {
        known[base + d] = 0;
        activeDefs[nd++] = d;
      }
    }
    let nc = 0;
    for (let i = 0; i < M; i++) {
      let open = 0;
      let sat = false;
      for (let k = clauseStart[i]!, e = clauseStart[i + 1]!; k < e; k++) {
        const c = clauseLits[k]!;
        if (!known[c >>> 1]) open++;
        else if ((val[c >>> 1]! ^ -(c & 1)) !== 0) {
          sat = true;
          break;
        }
      }
      if (sat) continue;
      if (open === 0) continue blocks;
      activeClauses[nc++] = i;
    }
    let np = 0;
    for (let p = 0; p < P; p++) {
      let x = 0;
      let all = true;
      for (let k = parStart[p]!, e = parStart[p + 1]!; k < e; k++) {
        if (known[parSlots[k]!]) x ^= val[parSlots[k]!]!;
        else all = false;
      }
      if (!all) activeParities[np++] = p;
      else if ((x !== 0 ? 1 : 0) !== parValue[p]) continue blocks;
    }
    let ng = 0;
    for (let g = 0; g < Gn; g++) {
      let ones = 0;
      let open = 0;
      for (let k = grpStart[g]!, e = grpStart[g + 1]!; k < e; k++) {
        const slot = grpSlots[k]!;
        if (!known[slot]) open++;
        else if (val[slot] !== 0) ones++;
      }
      if (ones > 1 || (grpExactlyOne[g] && ones === 0 && open === 0)) continue blocks;
      if (open > 0) activeGroups[ng++] = g;
    }
    for (let w = 0; w < words; w++) {
      for (let j = 5; j < top; j++) val[j] = -((w >>> (j - 5)) & 1);
      for (let a = 0; a < nd; a++) {
        const d = activeDefs[a]!;
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
      for (let a = 0; a < nc && acc !== 0; a++) {
        const i = activeClauses[a]!;
        let m = 0;
        for (let k = clauseStart[i]!, e = clauseStart[i + 1]!; k < e; k++) {
          const c = clauseLits[k]!;
          m |= val[c >>> 1]! ^ -(c & 1);
        }
        acc &= m;
      }
      for (let a = 0; a < np && acc !== 0; a++) {
        const p = activeParities[a]!;
        let x = 0;
        for (let k = parStart[p]!, e = parStart[p + 1]!; k < e; k++) x ^= val[parSlots[k]!]!;
        acc &= parValue[p] ? x : ~x;
      }
      for (let a = 0; a < ng && acc !== 0; a++) {
        const g = activeGroups[a]!;
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
