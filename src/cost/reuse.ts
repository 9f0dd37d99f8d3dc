/**
 * Work-qubit reuse (passes/reuseWork.ts) over the virtual ids of a stream: a work qubit takes a
 * wire at its first gate (the wire freed last, else a new one) and frees it after its last gate.
 * Shared by the counting engine (engine.ts) and the sweep (sweep.ts).
 */
export class WireReuse {
  private wireOf: Int32Array;
  /** Wires given back, a stack (reuse takes the last one given back). */
  private free = new Int32Array(256);
  /** The instance at which each wire of `free` was freed (kept only when `timed`). */
  private at = new Int32Array(256);
  private top = 0;
  /** Work wires made so far: wires base .. base + workWires - 1. */
  workWires = 0;
  /**
   * Wires base + fresh .. base + workWires - 1 are free too, below everything in `free`, the
   * lowest on top: a wire given back while `free` is empty and just below them joins them instead
   * of the stack (not when timed). Reuse takes the same wires in the same order, but a wide
   * oracle's uncomputation, which gives back its millions of wires in the reverse order of their
   * making, needs no stack (12 MB for a million clauses, held twice while it grew).
   */
  private fresh = 0;

  /**
   * `base`: ids below it are wires themselves; `ids`: ids expected (sizes the table once);
   * `timed`: keep when each free wire was freed, for freedAt (a wide oracle's uncomputation frees
   * millions of wires: 4 bytes each that only searchCosts' runs read).
   */
  constructor(private base: number, ids: number, private readonly timed = true) {
    this.wireOf = new Int32Array(Math.max(1024, ids)).fill(-1);
    if (!timed) this.at = new Int32Array(0);
  }

  /** The wire of id v (taken now if v has none). */
  wireFor(v: number): number {
    if (v < this.base) return v;
    if (v >= this.wireOf.length) {
      const w = new Int32Array(Math.max(v + 1, Math.ceil(this.wireOf.length * 1.5))).fill(-1);
      w.set(this.wireOf);
      this.wireOf = w;
    }
    let w = this.wireOf[v]!;
    if (w < 0) {
      if (this.top > 0) w = this.free[--this.top]!;
      else {
        w = this.base + this.fresh++;
        if (this.fresh > this.workWires) this.workWires = this.fresh;
      }
      this.wireOf[v] = w;
    }
    return w;
  }

  /** Frees the wire of id v after instance `id`. */
  release(v: number, id: number): void {
    const w = this.wireOf[v]!;
    this.wireOf[v] = -1;
    if (this.top === 0 && !this.timed && w === this.base + this.fresh - 1) {
      this.fresh--;
      return;
    }
    if (this.top === this.free.length) {
      const f = new Int32Array(this.free.length * 2);
      f.set(this.free);
      this.free = f;
      if (this.timed) {
        const g = new Int32Array(this.at.length * 2);
        g.set(this.at);
        this.at = g;
      }
    }
    if (this.timed) this.at[this.top] = id;
    this.free[this.top++] = w;
  }

  /** The instances at which the last `keep` wires still free were freed, oldest first. */
  freedAt(keep: number): Int32Array {
    if (!this.timed) throw new Error("freedAt needs a WireReuse made timed");
    return this.at.slice(Math.max(0, this.top - keep), this.top);
  }

  /** A new replay over `base` fixed wires: no work wire made, none free (see engine.resetReplay). */
  reset(base: number): void {
    this.base = base;
    this.top = 0;
    this.workWires = 0;
    this.fresh = 0;
  }
}
