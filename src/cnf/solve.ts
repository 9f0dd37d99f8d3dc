/**
 * A complete SAT solver: conflict-driven clause learning (CDCL). Sampled verification needs
 * satisfying assignments of formulas whose models are too rare for random sampling or local
 * search to reach (SATLIB's aim, ais, logistics and blocksworld families have one or a handful),
 * and a proof of unsatisfiability when there are none. The methods, each as published:
 *
 * - conflict analysis to the first unique implication point and clause learning with
 *   non-chronological backjumping (Marques-Silva & Sakallah 1999, GRASP);
 * - two watched literals per clause and the VSIDS decision heuristic (Moskewicz, Madigan, Zhao,
 *   Zhang & Malik 2001, Chaff), with blocker literals in the watch lists (Sorensson & Een 2009);
 * - learnt-clause minimization by self-subsumption against reasons (Sorensson & Biere 2009);
 * - phase saving (Pipatsrisawat & Darwiche 2007);
 * - restarts on the Luby sequence (Luby, Sinclair & Zuckerman 1993);
 * - learnt-clause deletion ranked by literal block distance (Audemard & Simon 2009, Glucose);
 * - circular search for a new watch (Gent 2013, "Optimal implementation of watched literals").
 *
 * Everything lives in typed arrays: clauses in one arena of 32-bit words, watch lists as flat
 * (clause, blocker) pairs per literal. Literals are `2 * (v - 1) + sign` for DIMACS variable v
 * (sign 1 for negative), so `l ^ 1` is the complement.
 */
import type { Cnf } from "./cnf.js";
import { seededRandom } from "../util/random.js";

/** The outcome of {@link CdclSolver.solve}. */
export type SolveStatus = "sat" | "unsat" | "unknown";

/**
 * Clause header words: size, flags (bit 0 learnt, bit 1 deleted, bits 2.. literal block distance),
 * and where the last search for a new watch stopped (see propagate).
 */
const HEADER = 3;
const LEARNT = 1;
const DELETED = 2;
/** The watch list of a literal that watches nothing yet (shared, never written). */
const NO_WATCHES = new Int32Array(0);

/** Luby sequence term i (1-based): 1 1 2 1 1 2 4 1 1 2 1 1 2 4 8 ... */
function luby(i: number): number {
  let k = 1;
  while ((1 << k) - 1 < i) k++;
  while (i !== (1 << k) - 1) {
    i -= (1 << (k - 1)) - 1;
    k = 1;
    while ((1 << k) - 1 < i) k++;
  }
  return 1 << (k - 1);
}

/**
 * An incremental CDCL solver over variables 1..n: add clauses, solve under a conflict budget,
 * read the model, block it and solve again.
 */
export class CdclSolver {
  readonly variables: number;
  /** Conflicts met so far, over every call of {@link solve}. */
  conflicts = 0;
  /** Decisions made so far. */
  decisions = 0;
  /** False once the clauses are known to be unsatisfiable. */
  private ok = true;

  // Clause arena.
  private mem = new Int32Array(1 << 16);
  private memTop = 0;
  private wasted = 0;
  private learnts: number[] = [];

  // Per literal.
  private readonly litVal: Int8Array; // 1 true, -1 false, 0 unassigned
  private watches: Int32Array[];
  private readonly watchLen: Int32Array;

  // Per variable.
  private readonly level: Int32Array;
  private readonly reason: Int32Array; // clause ref, or -1
  private readonly phase: Uint8Array; // saved sign to decide with (1 = negative)
  private readonly activity: Float64Array;
  private readonly seen: Uint8Array;
  private varInc = 1;

  // Decision heap (max-heap on activity).
  private readonly heap: Int32Array;
  private heapSize = 0;
  private readonly heapPos: Int32Array; // -1 when not in the heap

  // Trail.
  private readonly trail: Int32Array;
  private trailLen = 0;
  private qhead = 0;
  private trailLim: number[] = [];

  private levelStamp: Int32Array;
  private stamp = 0;
  private readonly litStamp: Int32Array;
  private clauseStamp = 0;

  /** `seed` picks the initial phase of every variable (different seeds lead to different models). */
  constructor(variables: number, seed = 1) {
    this.variables = variables;
    const lits = 2 * variables;
    this.litVal = new Int8Array(lits);
    // Watch lists are allocated when first used: most literals of a large formula watch little.
    this.watches = new Array<Int32Array>(lits).fill(NO_WATCHES);
    this.litStamp = new Int32Array(lits);
    this.watchLen = new Int32Array(lits);
    this.level = new Int32Array(variables);
    this.reason = new Int32Array(variables).fill(-1);
    this.phase = new Uint8Array(variables);
    const random = seededRandom(seed);
    for (let v = 0; v < variables; v++) this.phase[v] = random() < 0.5 ? 1 : 0;
    this.activity = new Float64Array(variables);
    this.seen = new Uint8Array(variables);
    this.heap = new Int32Array(variables);
    this.heapPos = new Int32Array(variables).fill(-1);
    for (let v = 0; v < variables; v++) this.heapInsert(v);
    this.trail = new Int32Array(variables);
    this.levelStamp = new Int32Array(variables + 1);
  }

  /** Adds the clauses of a formula (DIMACS literals). False when they are unsatisfiable already. */
  addCnf(cnf: Cnf): boolean {
    const { lits, clauseStart } = cnf;
    for (let i = 0; i + 1 < clauseStart.length && this.ok; i++) this.addClause(lits.subarray(clauseStart[i]!, clauseStart[i + 1]!));
    return this.ok;
  }

  /**
   * Adds a clause of DIMACS literals (at decision level 0; the solver backtracks there between
   * calls of {@link solve}). Repeated literals are merged, tautologies dropped. Returns false
   * when the clauses have become unsatisfiable.
   */
  addClause(dimacs: ArrayLike<number>): boolean {
    if (!this.ok) return false;
    this.cancelUntil(0);
    const c: number[] = [];
    // Literals already in c carry this clause's stamp (one pass, even for a clause of 100,000 literals).
    const s = ++this.clauseStamp;
    for (let i = 0; i < dimacs.length; i++) {
      const d = dimacs[i]!;
      const l = d > 0 ? 2 * (d - 1) : 2 * (-d - 1) + 1;
      const val = this.litVal[l]!;
      if (val === 1) return true; // satisfied at level 0
      if (val === -1) continue; // false at level 0
      if (this.litStamp[l ^ 1] === s) return true; // tautology
      if (this.litStamp[l] !== s) {
        this.litStamp[l] = s;
        c.push(l);
      }
    }
    if (c.length === 0) return (this.ok = false);
    if (c.length === 1) {
      this.enqueue(c[0]!, -1);
      if (this.propagate() >= 0) this.ok = false;
      return this.ok;
    }
    this.attach(this.store(c, 0));
    return true;
  }

  /**
   * Searches for a model, spending at most `conflictBudget` more conflicts, and stopping at the
   * `deadline` (a performance.now() time, looked at every 256 conflicts) when one is given.
   * "unknown" when either runs out; the solver can be called again to go on.
   */
  solve(conflictBudget = Infinity, deadline = Infinity): SolveStatus {
    if (!this.ok) return "unsat";
    const stop = this.conflicts + conflictBudget;
    this.deadline = deadline;
    this.timedOut = false;
    this.nextClock = deadline === Infinity ? Infinity : this.conflicts + 256;
    let restart = 0;
    let nextReduce = this.conflicts + 2000;
    let reduceStep = 2000;
    for (;;) {
      const limit = 100 * luby(++restart);
      const status = this.search(limit, stop);
      if (status !== "unknown") return status;
      this.cancelUntil(0);
      if (this.conflicts >= stop || this.timedOut) return "unknown";
      if (this.conflicts >= nextReduce) {
        this.reduceLearnts();
        reduceStep += 300;
        nextReduce = this.conflicts + reduceStep;
      }
    }
  }
  private deadline = Infinity;
  /** Conflicts at which the clock is next looked at. */
  private nextClock = Infinity;
  /** The last solve stopped at its deadline. */
  timedOut = false;

  /** The model found by the last successful {@link solve}: 0/1 per variable (index v - 1). */
  model(): Uint8Array {
    const m = new Uint8Array(this.variables);
    for (let v = 0; v < this.variables; v++) m[v] = this.litVal[2 * v] === 1 ? 1 : 0;
    return m;
  }

  /**
   * Excludes the current model: adds the clause that negates its decisions (the rest of the
   * model follows from them by propagation, so exactly this model is excluded). Returns false
   * when no other model can exist.
   */
  blockModel(): boolean {
    const block: number[] = [];
    for (let i = 1; i <= this.trailLim.length; i++) {
      const l = this.trail[this.trailLim[i - 1]!]!;
      block.push((l & 1) === 1 ? (l >> 1) + 1 : -((l >> 1) + 1));
    }
    this.cancelUntil(0);
    return this.addClause(block);
  }

  // ---- search ------------------------------------------------------------------------------

  private search(restartLimit: number, stop: number): SolveStatus {
    let conflictsHere = 0;
    const learnt: number[] = [];
    for (;;) {
      const confl = this.propagate();
      if (confl >= 0) {
        this.conflicts++;
        conflictsHere++;
        if (this.trailLim.length === 0) {
          this.ok = false;
          return "unsat";
        }
        const back = this.analyze(confl, learnt);
        this.cancelUntil(back);
        if (learnt.length === 1) this.enqueue(learnt[0]!, -1);
        else {
          const cref = this.store(learnt, this.lbd(learnt));
          this.attach(cref);
          this.learnts.push(cref);
          this.enqueue(learnt[0]!, cref);
        }
        this.varInc /= 0.95;
        continue;
      }
      if (conflictsHere >= restartLimit || this.conflicts >= stop) return "unknown";
      if (this.conflicts >= this.nextClock) {
        this.nextClock = this.conflicts + 256;
        if (performance.now() >= this.deadline) {
          this.timedOut = true;
          return "unknown";
        }
      }
      const next = this.pickBranch();
      if (next < 0) return "sat";
      this.decisions++;
      this.trailLim.push(this.trailLen);
      this.enqueue(next, -1);
    }
  }

  private pickBranch(): number {
    while (this.heapSize > 0) {
      const v = this.heapPop();
      if (this.litVal[2 * v] === 0) return 2 * v + this.phase[v]!;
    }
    return -1;
  }

  private enqueue(l: number, reason: number): void {
    const v = l >> 1;
    this.litVal[l] = 1;
    this.litVal[l ^ 1] = -1;
    this.level[v] = this.trailLim.length;
    this.reason[v] = reason;
    this.trail[this.trailLen++] = l;
  }

  private cancelUntil(lvl: number): void {
    if (this.trailLim.length <= lvl) return;
    const keep = this.trailLim[lvl]!;
    for (let i = this.trailLen - 1; i >= keep; i--) {
      const l = this.trail[i]!;
      const v = l >> 1;
      this.litVal[l] = 0;
      this.litVal[l ^ 1] = 0;
      this.reason[v] = -1;
      this.phase[v] = l & 1;
      if (this.heapPos[v]! < 0) this.heapInsert(v);
    }
    this.trailLen = keep;
    this.qhead = keep;
    this.trailLim.length = lvl;
  }

  /** Unit propagation over the watch lists; returns a conflicting clause or -1. */
  private propagate(): number {
    const mem = this.mem;
    const litVal = this.litVal;
    while (this.qhead < this.trailLen) {
      const falseLit = this.trail[this.qhead++]! ^ 1;
      const ws = this.watches[falseLit]!;
      const len = this.watchLen[falseLit]!;
      let i = 0;
      let j = 0;
      while (i < len) {
        const cref = ws[i]!;
        const blocker = ws[i + 1]!;
        i += 2;
        if (litVal[blocker] === 1) {
          ws[j++] = cref;
          ws[j++] = blocker;
          continue;
        }
        if ((mem[cref + 1]! & DELETED) !== 0) continue; // drop the watch of a deleted clause
        const base = cref + HEADER;
        if (mem[base] === falseLit) {
          mem[base] = mem[base + 1]!;
          mem[base + 1] = falseLit;
        }
        const first = mem[base]!;
        if (first !== blocker && litVal[first] === 1) {
          ws[j++] = cref;
          ws[j++] = first;
          continue;
        }
        // Look for a new watch circularly from where the last search stopped (Gent 2013): starting
        // at position 2 every time made a clause of k literals cost O(k^2) as its literals fell.
        const size = mem[cref]!;
        let moved = false;
        let k = mem[cref + 2]!;
        for (let left = size - 2; left > 0; left--) {
          const l = mem[base + k]!;
          if (litVal[l] !== -1) {
            mem[base + 1] = l;
            mem[base + k] = falseLit;
            mem[cref + 2] = k;
            this.watch(l, cref, first);
            moved = true;
            break;
          }
          if (++k === size) k = 2;
        }
        if (moved) continue;
        ws[j++] = cref;
        ws[j++] = first;
        if (litVal[first] === -1) {
          while (i < len) ws[j++] = ws[i++]!;
          this.watchLen[falseLit] = j;
          this.qhead = this.trailLen;
          return cref;
        }
        this.enqueue(first, cref);
      }
      this.watchLen[falseLit] = j;
    }
    return -1;
  }

  /**
   * First-UIP conflict analysis: fills `out` with the learnt clause (the asserting literal
   * first, a literal of the backjump level second) and returns the level to backjump to.
   */
  private analyze(confl: number, out: number[]): number {
    const mem = this.mem;
    const seen = this.seen;
    const current = this.trailLim.length;
    out.length = 0;
    out.push(-1);
    let pathCount = 0;
    let p = -1;
    let index = this.trailLen - 1;
    for (;;) {
      const size = mem[confl]!;
      const base = confl + HEADER;
      for (let k = p < 0 ? 0 : 1; k < size; k++) {
        const q = mem[base + k]!;
        const v = q >> 1;
        if (seen[v] === 0 && this.level[v]! > 0) {
          this.bump(v);
          seen[v] = 1;
          if (this.level[v]! >= current) pathCount++;
          else out.push(q);
        }
      }
      while (seen[this.trail[index]! >> 1] === 0) index--;
      p = this.trail[index--]!;
      confl = this.reason[p >> 1]!;
      seen[p >> 1] = 0;
      if (--pathCount === 0) break;
    }
    out[0] = p ^ 1;
    // Minimization: drop a literal whose reason's other literals are all in the clause (or at level 0).
    const all = out.slice();
    let kept = 1;
    for (let i = 1; i < out.length; i++) {
      const q = out[i]!;
      const r = this.reason[q >> 1]!;
      let redundant = r >= 0;
      if (redundant) {
        const size = mem[r]!;
        for (let k = 1; k < size; k++) {
          const v = mem[r + HEADER + k]! >> 1;
          if (seen[v] === 0 && this.level[v]! > 0) {
            redundant = false;
            break;
          }
        }
      }
      if (!redundant) out[kept++] = q;
    }
    out.length = kept;
    for (const q of all) seen[q >> 1] = 0;
    // Backjump to the highest level below the current one, with that literal second.
    if (out.length === 1) return 0;
    let best = 1;
    for (let i = 2; i < out.length; i++) if (this.level[out[i]! >> 1]! > this.level[out[best]! >> 1]!) best = i;
    const t = out[1]!;
    out[1] = out[best]!;
    out[best] = t;
    return this.level[out[1]! >> 1]!;
  }

  /** Literal block distance: the number of distinct decision levels in the clause. */
  private lbd(c: readonly number[]): number {
    const s = ++this.stamp;
    let n = 0;
    for (const l of c) {
      const lv = this.level[l >> 1]!;
      if (this.levelStamp[lv] !== s) {
        this.levelStamp[lv] = s;
        n++;
      }
    }
    return n;
  }

  // ---- clause storage -----------------------------------------------------------------------

  private store(c: readonly number[], lbd: number): number {
    const need = HEADER + c.length;
    if (this.memTop + need > this.mem.length) {
      const bigger = new Int32Array(Math.max(this.mem.length * 2, this.memTop + need));
      bigger.set(this.mem.subarray(0, this.memTop));
      this.mem = bigger;
    }
    const cref = this.memTop;
    this.mem[cref] = c.length;
    this.mem[cref + 1] = lbd > 0 ? LEARNT | (lbd << 2) : 0;
    this.mem[cref + 2] = 2;
    for (let i = 0; i < c.length; i++) this.mem[cref + HEADER + i] = c[i]!;
    this.memTop += need;
    return cref;
  }

  private attach(cref: number): void {
    const a = this.mem[cref + HEADER]!;
    const b = this.mem[cref + HEADER + 1]!;
    this.watch(a, cref, b);
    this.watch(b, cref, a);
  }

  private watch(l: number, cref: number, blocker: number): void {
    let ws = this.watches[l]!;
    const n = this.watchLen[l]!;
    if (n + 2 > ws.length) {
      const bigger = new Int32Array(Math.max(4, ws.length * 2));
      bigger.set(ws);
      this.watches[l] = ws = bigger;
    }
    ws[n] = cref;
    ws[n + 1] = blocker;
    this.watchLen[l] = n + 2;
  }

  /**
   * Deletes the worse half of the learnt clauses (by literal block distance, then size), keeping
   * those with distance 2 or less (Audemard & Simon 2009). Runs at level 0, where no learnt
   * clause is the reason of an assignment that conflict analysis reads.
   */
  private reduceLearnts(): void {
    const mem = this.mem;
    const rank = (c: number): number => (mem[c + 1]! >> 2) * 1e6 + mem[c]!;
    this.learnts.sort((a, b) => rank(a) - rank(b));
    const keep = this.learnts.length >> 1;
    const next: number[] = [];
    for (let i = 0; i < this.learnts.length; i++) {
      const c = this.learnts[i]!;
      if (i < keep || mem[c + 1]! >> 2 <= 2) next.push(c);
      else {
        mem[c + 1]! |= DELETED;
        this.wasted += HEADER + mem[c]!;
      }
    }
    this.learnts = next;
    for (let v = 0; v < this.variables; v++) this.reason[v] = -1; // level 0: reasons are never read
    if (this.wasted * 2 > this.memTop) this.compact();
  }

  /** Moves the live clauses to a fresh arena and rebuilds every watch list. */
  private compact(): void {
    const old = this.mem;
    const fresh = new Int32Array(Math.max(1 << 16, this.memTop - this.wasted + 1024));
    let top = 0;
    const moved = new Map<number, number>();
    for (let c = 0; c < this.memTop; c += HEADER + old[c]!) {
      if ((old[c + 1]! & DELETED) !== 0) continue;
      const size = old[c]!;
      fresh.set(old.subarray(c, c + HEADER + size), top);
      moved.set(c, top);
      top += HEADER + size;
    }
    this.mem = fresh;
    this.memTop = top;
    this.wasted = 0;
    this.learnts = this.learnts.map((c) => moved.get(c)!);
    this.watchLen.fill(0);
    for (let c = 0; c < top; c += HEADER + fresh[c]!) this.attach(c);
  }

  // ---- VSIDS ---------------------------------------------------------------------------------

  private bump(v: number): void {
    if ((this.activity[v]! += this.varInc) > 1e100) {
      for (let u = 0; u < this.variables; u++) this.activity[u]! *= 1e-100;
      this.varInc *= 1e-100;
    }
    const p = this.heapPos[v]!;
    if (p >= 0) this.siftUp(p);
  }

  private heapInsert(v: number): void {
    this.heap[this.heapSize] = v;
    this.heapPos[v] = this.heapSize;
    this.siftUp(this.heapSize++);
  }

  private heapPop(): number {
    const top = this.heap[0]!;
    const last = this.heap[--this.heapSize]!;
    this.heapPos[top] = -1;
    if (this.heapSize > 0) {
      this.heap[0] = last;
      this.heapPos[last] = 0;
      this.siftDown(0);
    }
    return top;
  }

  private siftUp(i: number): void {
    const heap = this.heap;
    const v = heap[i]!;
    const a = this.activity[v]!;
    while (i > 0) {
      const parent = (i - 1) >> 1;
      const u = heap[parent]!;
      if (this.activity[u]! >= a) break;
      heap[i] = u;
      this.heapPos[u] = i;
      i = parent;
    }
    heap[i] = v;
    this.heapPos[v] = i;
  }

  private siftDown(i: number): void {
    const heap = this.heap;
    const v = heap[i]!;
    const a = this.activity[v]!;
    for (;;) {
      let child = 2 * i + 1;
      if (child >= this.heapSize) break;
      if (child + 1 < this.heapSize && this.activity[heap[child + 1]!]! > this.activity[heap[child]!]!) child++;
      const u = heap[child]!;
      if (this.activity[u]! <= a) break;
      heap[i] = u;
      this.heapPos[u] = i;
      i = child;
    }
    heap[i] = v;
    this.heapPos[v] = i;
  }
}
