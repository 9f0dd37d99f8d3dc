/**
 * Exact model counting by exhaustive, bit-parallel enumeration. Shared by the main thread and the
 * counting workers; plain data in, plain numbers out.
 *
 * Layout of the enumeration over the u used variables (renumbered 0..u-1):
 *   - variables 0..4 are the 32 lanes of a word (one assignment per bit);
 *   - the next `inner` variables are the bits of the word index inside a block;
 *   - the rest select the block. Before a block's words are enumerated, its clauses are simplified
 *     under the block's fixed variables: satisfied clauses vanish, false literals are dropped, and
 *     a clause left empty rules out the whole block. Counting stays exact: every assignment is
 *     either enumerated or in a block shown to hold no model.
 */

/** The formula prepared for counting: clean clauses over renumbered variables. */
export interface CountPlan {
  /** Variables that occur in some clause (the enumeration covers 2^used assignments). */
  readonly used: number;
  /** Declared variables that occur in no clause: each doubles the count. */
  readonly free: number;
  /** True when some clause is empty: the count is 0. */
  readonly unsat: boolean;
  /** Literals as (index << 1) | negated, clause by clause. */
  readonly lits: Int32Array;
  readonly clauseStart: Uint32Array;
  /** Word-index bits inside one block; blocks = 2^(used - 5 - inner) when used > 5. */
  readonly inner: number;
}

/** Word-index bits per block: 2^16 words = 2^21 assignments, a few milliseconds of work. */
const INNER_BITS = 16;

/** Lane patterns: bit j of LANE[v] is bit v of j. */
const LANE = [0xaaaaaaaa | 0, 0xcccccccc | 0, 0xf0f0f0f0 | 0, 0xff00ff00 | 0, 0xffff0000 | 0];

/** Drops duplicate literals and tautologies, renumbers used variables (rarest first). */
export function planCount(variables: number, lits: Int32Array, clauseStart: Uint32Array): CountPlan {
  const occurrences = new Map<number, number>();
  for (const l of lits) {
    const v = l < 0 ? -l : l;
    occurrences.set(v, (occurrences.get(v) ?? 0) + 1);
  }
  // Frequent variables go to the block bits, where fixing them simplifies the most clauses.
  const order = [...occurrences.keys()].sort((a, b) => occurrences.get(a)! - occurrences.get(b)! || a - b);
  const index = new Map<number, number>(order.map((v, i) => [v, i]));
  const outLits: number[] = [];
  const starts: number[] = [0];
  let unsat = false;
  const m = clauseStart.length - 1;
  for (let i = 0; i < m; i++) {
    const seen = new Map<number, number>();
    let tautology = false;
    for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) {
      const l = lits[k]!;
      const idx = index.get(l < 0 ? -l : l)!;
      const neg = l < 0 ? 1 : 0;
      const prev = seen.get(idx);
      if (prev === undefined) seen.set(idx, neg);
      else if (prev !== neg) tautology = true;
    }
    if (tautology) continue;
    if (seen.size === 0) unsat = true;
    for (const [idx, neg] of seen) outLits.push((idx << 1) | neg);
    starts.push(outLits.length);
  }
  const used = order.length;
  return {
    used,
    free: variables - used,
    unsat,
    lits: Int32Array.from(outLits),
    clauseStart: Uint32Array.from(starts),
    inner: Math.max(0, Math.min(used - 5, INNER_BITS)),
  };
}

/** Number of blocks the enumeration is cut into (the unit of parallel work and progress). */
export function blockCount(plan: CountPlan): number {
  return plan.used <= 5 ? 1 : 2 ** (plan.used - 5 - plan.inner);
}

function popcount(x: number): number {
  x -= (x >>> 1) & 0x55555555;
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  x = (x + (x >>> 4)) & 0x0f0f0f0f;
  return Math.imul(x, 0x01010101) >>> 24;
}

/** Scratch space for one block's simplified clauses, reused across blocks. */
export interface Scratch {
  shift: Int32Array; // word-index bit of the literal's variable, or -1 for a lane variable
  xor: Int32Array; // lane literal: its full lane mask; word literal: -1 when negated, else 0
  starts: Int32Array;
}

export function newScratch(plan: CountPlan): Scratch {
  const n = plan.lits.length;
  return { shift: new Int32Array(n), xor: new Int32Array(n), starts: new Int32Array(plan.clauseStart.length) };
}

/**
 * Simplifies the clauses under block `b`; returns the number of clauses left, or -1 when some
 * clause is false throughout the block.
 */
function simplify(plan: CountPlan, b: number, s: Scratch): number {
  const { lits, clauseStart } = plan;
  const top = 5 + plan.inner; // first block variable
  let nl = 0;
  let nc = 0;
  s.starts[0] = 0;
  for (let i = 0; i + 1 < clauseStart.length; i++) {
    let sat = false;
    const mark = nl;
    for (let k = clauseStart[i]!; k < clauseStart[i + 1]!; k++) {
      const code = lits[k]!;
      const idx = code >>> 1;
      const neg = code & 1;
      if (idx >= top) {
        if ((((b / 2 ** (idx - top)) & 1) ^ neg) === 1) {
          sat = true;
          break;
        }
      } else if (idx < 5) {
        s.shift[nl] = -1;
        s.xor[nl++] = neg ? ~LANE[idx]! : LANE[idx]!;
      } else {
        s.shift[nl] = idx - 5;
        s.xor[nl++] = -neg;
      }
    }
    if (sat) {
      nl = mark;
      continue;
    }
    if (nl === mark) return -1;
    s.starts[++nc] = nl;
  }
  return nc;
}

/** Counts the models among the assignments of blocks [from, to), over the used variables only. */
export function countBlocks(plan: CountPlan, from: number, to: number, scratch = newScratch(plan)): number {
  if (plan.unsat) return 0;
  const lanes = plan.used >= 5 ? -1 : (2 ** (2 ** plan.used) - 1) | 0;
  const words = 2 ** plan.inner;
  const { shift, xor, starts } = scratch;
  let total = 0;
  for (let b = from; b < to; b++) {
    const nc = simplify(plan, b, scratch);
    if (nc < 0) continue;
    for (let w = 0; w < words; w++) {
      let acc = lanes;
      for (let c = 0; c < nc && acc !== 0; c++) {
        let m = 0;
        for (let k = starts[c]!, e = starts[c + 1]!; k < e; k++) {
          const sh = shift[k]!;
          m |= sh < 0 ? xor[k]! : -((w >>> sh) & 1) ^ xor[k]!;
        }
        acc &= m;
      }
      total += popcount(acc);
    }
  }
  return total;
}
