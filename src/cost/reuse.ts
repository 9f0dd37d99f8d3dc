/**
 * Work-qubit reuse (passes/reuseWork.ts) over the virtual ids of a stream: a work qubit takes a
 * wire at its first gate (the wire freed last, else a new one) and frees it after its last gate.
 * Shared by the counting engine (engine.ts) and the sweep (sweep.ts).
 */
/**
 * Per-id and per-wire tables handed from one counting run to the next on a thread (the runs of a
 * cost table, one after another): each is sized once for the largest run and taken again by the
 * next, instead of grown by half at a time and dropped per run. A million clauses' runs made and
 * dropped some 500 MB of such tables, and the allocator kept much of it: peak memory, not use.
 */
export type HeldTables = Map<string, Int32Array<ArrayBuffer> | Uint8Array<ArrayBuffer>>;

/** A table of at least n numbers: the one held under `key` if it is that large, else a new one, held from now on. Not filled. */
export function heldInt32(held: HeldTables | null, key: string, n: number): Int32Array<ArrayBuffer> {
  const h = held?.get(key);
  if (h instanceof Int32Array && h.length >= n) return h;
  const a = new Int32Array(n);
  held?.set(key, a);
  return a;
}

/** As heldInt32, bytes. */
export function heldUint8(held: HeldTables | null, key: string, n: number): Uint8Array<ArrayBuffer> {
  const h = held?.get(key);
  if (h instanceof Uint8Array && h.length >= n) return h;
  const a = new Uint8Array(n);
  held?.set(key, a);
  return a;
}

/** a grown to n numbers (a held table grown is held instead of the old one). */
export function grownInt32(held: HeldTables | null, key: string, a: Int32Array<ArrayBuffer>, n: number, fill: number): Int32Array<ArrayBuffer> {
  const g = heldInt32(null, key, n);
  g.set(a);
  if (fill !== 0) g.fill(fill, a.length);
  if (held?.get(key) === a) held.set(key, g);
  return g;
}

export class WireReuse {
  private wireOf: Int32Array<ArrayBuffer>;
  /** Wires given back, a stack (reuse takes the last one given back). */
  private free: Int32Array<ArrayBuffer>;
  /** The instance at which each wire of `free` was freed. */
  private at: Int32Array<ArrayBuffer>;
  private top = 0;
  /** Work wires made so far: wires base .. base + workWires - 1. */
  workWires = 0;

  /**
   * `base`: ids below it are wires themselves; `ids`: ids expected (sizes the tables once);
   * `held`: tables kept between runs (see HeldTables).
   */
  constructor(private base: number, ids: number, private readonly held: HeldTables | null = null) {
    this.wireOf = heldInt32(held, "reuse.wireOf", Math.max(1024, ids));
    this.wireOf.fill(-1);
    const work = Math.max(256, ids - base);
    this.free = heldInt32(held, "reuse.free", work);
    this.at = heldInt32(held, "reuse.at", work);
  }

  /** The wire of id v (taken now if v has none). */
  wireFor(v: number): number {
    if (v < this.base) return v;
    if (v >= this.wireOf.length) this.wireOf = grownInt32(this.held, "reuse.wireOf", this.wireOf, Math.max(v + 1, Math.ceil(this.wireOf.length * 1.5)), -1);
    let w = this.wireOf[v]!;
    if (w < 0) {
      w = this.top > 0 ? this.free[--this.top]! : this.base + this.workWires++;
      this.wireOf[v] = w;
    }
    return w;
  }

  /** Frees the wire of id v after instance `id`. */
  release(v: number, id: number): void {
    if (this.top === this.free.length) {
      this.free = grownInt32(this.held, "reuse.free", this.free, this.free.length * 2, 0);
      this.at = grownInt32(this.held, "reuse.at", this.at, this.at.length * 2, 0);
    }
    this.at[this.top] = id;
    this.free[this.top++] = this.wireOf[v]!;
    this.wireOf[v] = -1;
  }

  /** The instances at which the last `keep` wires still free were freed, oldest first. */
  freedAt(keep: number): Int32Array {
    return this.at.slice(Math.max(0, this.top - keep), this.top);
  }

  /** A new replay over `base` fixed wires: no work wire made, none free (see engine.resetReplay). */
  reset(base: number): void {
    this.base = base;
    this.top = 0;
    this.workWires = 0;
  }
}
