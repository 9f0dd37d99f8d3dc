/**
 * A hash table from short integer sequences to integers (open addressing, keys copied into one
 * growing pool). The block counter (blocks.ts) looks a key up per block of a circuit, millions of
 * times: no string or object is made per lookup.
 */
export class KeyTable {
  private pool = new Int32Array(1 << 12);
  private used = 0;
  private start = new Int32Array(256);
  private len = new Int32Array(256);
  private val = new Int32Array(256);
  private hashOf = new Int32Array(256);
  private count = 0;
  /** Slot -> entry + 1 (0: empty). */
  private slots = new Int32Array(512);

  /** Entries stored. */
  get size(): number {
    return this.count;
  }

  /** The value stored for key[0..n), or -1. */
  get(key: Int32Array, n: number): number {
    const h = hash(key, n);
    const mask = this.slots.length - 1;
    for (let s = h & mask; ; s = (s + 1) & mask) {
      const e = this.slots[s]! - 1;
      if (e < 0) return -1;
      if (this.hashOf[e] === h && this.len[e] === n && this.equal(e, key, n)) return this.val[e]!;
    }
  }

  /** Stores value for key[0..n) (replacing an earlier value). */
  set(key: Int32Array, n: number, value: number): void {
    const h = hash(key, n);
    const mask = this.slots.length - 1;
    for (let s = h & mask; ; s = (s + 1) & mask) {
      const e = this.slots[s]! - 1;
      if (e < 0) break;
      if (this.hashOf[e] === h && this.len[e] === n && this.equal(e, key, n)) {
        this.val[e] = value;
        return;
      }
    }
    if (this.count === this.start.length) this.growEntries();
    if (this.used + n > this.pool.length) {
      const p = new Int32Array(Math.max(this.used + n, this.pool.length * 2));
      p.set(this.pool.subarray(0, this.used));
      this.pool = p;
    }
    const e = this.count++;
    this.pool.set(key.subarray(0, n), this.used);
    this.start[e] = this.used;
    this.len[e] = n;
    this.val[e] = value;
    this.hashOf[e] = h;
    this.used += n;
    if (this.count * 2 > this.slots.length) this.rehash();
    else this.place(e);
  }

  private equal(e: number, key: Int32Array, n: number): boolean {
    const s = this.start[e]!;
    for (let i = 0; i < n; i++) if (this.pool[s + i] !== key[i]) return false;
    return true;
  }

  private place(e: number): void {
    const mask = this.slots.length - 1;
    let s = this.hashOf[e]! & mask;
    while (this.slots[s] !== 0) s = (s + 1) & mask;
    this.slots[s] = e + 1;
  }

  private growEntries(): void {
    const n = this.start.length * 2;
    const grow = (a: Int32Array<ArrayBuffer>): Int32Array<ArrayBuffer> => {
      const b = new Int32Array(n);
      b.set(a);
      return b;
    };
    this.start = grow(this.start);
    this.len = grow(this.len);
    this.val = grow(this.val);
    this.hashOf = grow(this.hashOf);
  }

  private rehash(): void {
    this.slots = new Int32Array(this.slots.length * 2);
    for (let e = 0; e < this.count; e++) this.place(e);
  }
}

/** An interning table: equal sequences get the same id, 0, 1, 2, ... in order of first sight; the sequences are kept (once). */
export class Interner {
  private readonly kept: Int32Array[] = [];
  private readonly hashes: number[] = [];
  /** Slot -> id + 1 (0: empty). */
  private slots = new Int32Array(256);
  /** Numbers kept in all (the sequences' total length). */
  ints = 0;

  /** The id of key[0..n). */
  id(key: Int32Array, n = key.length): number {
    const h = hash(key, n);
    const mask = this.slots.length - 1;
    for (let s = h & mask; ; s = (s + 1) & mask) {
      const e = this.slots[s]! - 1;
      if (e < 0) break;
      if (this.hashes[e] !== h) continue;
      const k = this.kept[e]!;
      if (k.length !== n) continue;
      let same = true;
      for (let i = 0; i < n; i++) {
        if (k[i] !== key[i]) {
          same = false;
          break;
        }
      }
      if (same) return e;
    }
    const id = this.kept.length;
    this.kept.push(key.slice(0, n));
    this.ints += n;
    this.hashes.push(h);
    if (this.kept.length * 2 > this.slots.length) {
      this.slots = new Int32Array(this.slots.length * 2);
      const m = this.slots.length - 1;
      for (let e = 0; e < this.kept.length; e++) {
        let s = this.hashes[e]! & m;
        while (this.slots[s] !== 0) s = (s + 1) & m;
        this.slots[s] = e + 1;
      }
    } else {
      let s = h & mask;
      while (this.slots[s] !== 0) s = (s + 1) & mask;
      this.slots[s] = id + 1;
    }
    return id;
  }

  /** The sequence of an id. */
  get(id: number): Int32Array {
    return this.kept[id]!;
  }

  /** Ids given so far. */
  get size(): number {
    return this.kept.length;
  }
}

function hash(key: Int32Array, n: number): number {
  let h = 0x811c9dc5 ^ n;
  for (let i = 0; i < n; i++) {
    h = Math.imul(h ^ key[i]!, 0x01000193);
    h ^= h >>> 15;
  }
  h = Math.imul(h ^ (h >>> 13), 0x5bd1e995);
  return (h ^ (h >>> 16)) & 0x7fffffff;
}
