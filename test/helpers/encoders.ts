/**
 * Formula encoders: Tseitin-encoded circuits (gates, adders, multipliers), XOR systems, one-hot
 * groups, and random encoded circuits for property tests. Plain clause arrays and no imports, so
 * that an examples/ generator can reuse this file as it is.
 *
 * Tseitin encoding (G. S. Tseitin 1968): a fresh variable per gate output and the clauses of
 * y <-> f(inputs); AND: (~y | li) for every input and (y | ~l1 | ... | ~lk); OR dually; XOR of k
 * inputs: the 2^k clauses over y and the inputs that forbid each assignment of the wrong parity.
 */

/** A formula as plain data: DIMACS literals per clause. */
export interface Encoded {
  readonly variables: number;
  readonly clauses: number[][];
  /** The circuit's primary inputs (DIMACS variables), when the formula encodes a circuit. */
  readonly inputs: number[];
}

/** Builds a formula gate by gate. Literals are DIMACS: +v or -v. */
export class CircuitEncoder {
  variables = 0;
  readonly clauses: number[][] = [];
  readonly inputs: number[] = [];

  /** A fresh variable. */
  fresh(): number {
    return ++this.variables;
  }

  /** A fresh primary input. */
  input(): number {
    const v = this.fresh();
    this.inputs.push(v);
    return v;
  }

  /** n fresh primary inputs, least significant first. */
  inputWord(n: number): number[] {
    return Array.from({ length: n }, () => this.input());
  }

  /** y <-> l1 AND ... AND lk (k >= 1; one input is encoded as an equivalence). */
  and(ls: readonly number[]): number {
    const y = this.fresh();
    for (const l of ls) this.clauses.push([-y, l]);
    this.clauses.push([y, ...ls.map((l) => -l)]);
    return y;
  }

  /** y <-> l1 OR ... OR lk. */
  or(ls: readonly number[]): number {
    const y = this.fresh();
    for (const l of ls) this.clauses.push([y, -l]);
    this.clauses.push([-y, ...ls]);
    return y;
  }

  /** y <-> l1 XOR ... XOR lk (literals may be negated). */
  xor(ls: readonly number[]): number {
    const y = this.fresh();
    this.parity([y, ...ls], 0);
    return y;
  }

  /** y <-> NOT (l1 XOR ... XOR lk). */
  xnor(ls: readonly number[]): number {
    const y = this.fresh();
    this.parity([y, ...ls], 1);
    return y;
  }

  /** y <-> NOT l. */
  not(l: number): number {
    const y = this.fresh();
    this.clauses.push([y, l], [-y, -l]);
    return y;
  }

  /** y <-> l (a buffer). */
  buffer(l: number): number {
    const y = this.fresh();
    this.clauses.push([-y, l], [y, -l]);
    return y;
  }

  /**
   * The XOR of the literals equals `value`: the 2^(k-1) clauses forbidding each assignment of
   * the other parity. A negated literal flips the parity.
   */
  parity(ls: readonly number[], value: 0 | 1): void {
    const k = ls.length;
    for (let a = 0; a < 2 ** k; a++) {
      // Assignment a gives literal i the value bit i of a; forbid it when its XOR != value.
      let x = 0;
      for (let i = 0; i < k; i++) x ^= (a >> i) & 1;
      if (x === value) continue;
      this.clauses.push(ls.map((l, i) => ((a >> i) & 1 ? -l : l)));
    }
  }

  /** At most one of the variables is true: pairwise clauses. */
  atMostOne(vs: readonly number[]): void {
    for (let i = 0; i < vs.length; i++) for (let j = i + 1; j < vs.length; j++) this.clauses.push([-vs[i]!, -vs[j]!]);
  }

  /** Exactly one of the variables is true: one at-least-one clause plus the pairwise clauses. */
  exactlyOne(vs: readonly number[]): void {
    this.clauses.push([...vs]);
    this.atMostOne(vs);
  }

  /** Forces a literal true (unit clause). */
  force(l: number): void {
    this.clauses.push([l]);
  }

  /** Forces word bits to the binary digits of `value` (least significant first). */
  forceWord(bits: readonly (number | null)[], value: bigint): void {
    bits.forEach((b, i) => {
      const one = ((value >> BigInt(i)) & 1n) === 1n;
      if (b === null) {
        if (one) this.clauses.push([]); // a constant 0 bit cannot be 1
      } else this.force(one ? b : -b);
    });
    if (value >> BigInt(bits.length) !== 0n) this.clauses.push([]);
  }

  /** sum, carry of a + b. */
  halfAdder(a: number, b: number): [number, number] {
    return [this.xor([a, b]), this.and([a, b])];
  }

  /** sum, carry of a + b + c: t = a ^ b, sum = t ^ c, carry = (a & b) | (t & c). */
  fullAdder(a: number, b: number, c: number): [number, number] {
    const t = this.xor([a, b]);
    const sum = this.xor([t, c]);
    const carry = this.or([this.and([a, b]), this.and([t, c])]);
    return [sum, carry];
  }

  /** Ripple-carry sum of two words of equal width: width + 1 bits. */
  add(a: readonly number[], b: readonly number[]): number[] {
    const out: number[] = [];
    let carry: number | null = null;
    for (let i = 0; i < a.length; i++) {
      const [s, c]: [number, number] = carry === null ? this.halfAdder(a[i]!, b[i]!) : this.fullAdder(a[i]!, b[i]!, carry);
      out.push(s);
      carry = c;
    }
    out.push(carry!);
    return out;
  }

  /**
   * Array multiplier: partial products a_i AND b_j, summed column by column with full and half
   * adders (carry-save, then the carries ripple up). Returns the a.length + b.length product
   * bits; a column that holds no bit is null (constant 0).
   */
  multiply(a: readonly number[], b: readonly number[]): (number | null)[] {
    const width = a.length + b.length;
    const columns: number[][] = Array.from({ length: width }, () => []);
    for (let i = 0; i < a.length; i++) for (let j = 0; j < b.length; j++) columns[i + j]!.push(this.and([a[i]!, b[j]!]));
    const out: (number | null)[] = [];
    for (let w = 0; w < width; w++) {
      const col = columns[w]!;
      while (col.length > 1) {
        if (col.length >= 3) {
          const [s, c] = this.fullAdder(col.shift()!, col.shift()!, col.shift()!);
          col.push(s);
          if (w + 1 < width) columns[w + 1]!.push(c);
        } else {
          const [s, c] = this.halfAdder(col.shift()!, col.shift()!);
          col.push(s);
          if (w + 1 < width) columns[w + 1]!.push(c);
        }
      }
      out.push(col.length === 1 ? col[0]! : null);
    }
    return out;
  }

  encoded(): Encoded {
    return { variables: this.variables, clauses: this.clauses.map((c) => [...c]), inputs: [...this.inputs] };
  }
}

/**
 * a x b = product with a of `aBits` bits and b of `bBits` bits (Tseitin-encoded array
 * multiplier, product bits forced by unit clauses). Its models are the ordered pairs (a, b)
 * within the widths whose product is `product`.
 */
export function multiplier(aBits: number, bBits: number, product: bigint): Encoded {
  const e = new CircuitEncoder();
  const a = e.inputWord(aBits);
  const b = e.inputWord(bBits);
  e.forceWord(e.multiply(a, b), product);
  return e.encoded();
}

/** a + b = sum with a and b of `bits` bits (ripple-carry adder, bits + 1 sum bits forced). */
export function adder(bits: number, sum: bigint): Encoded {
  const e = new CircuitEncoder();
  const a = e.inputWord(bits);
  const b = e.inputWord(bits);
  e.forceWord(e.add(a, b), sum);
  return e.encoded();
}

/** A small deterministic generator (mulberry32) so that encoders need no imports. */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** One row of an XOR system: the XOR of `variables` equals `parity`. */
export interface XorRow {
  readonly variables: number[];
  readonly parity: 0 | 1;
}

/** `rows` random XOR constraints of `width` distinct variables each over n variables. */
export function randomXorRows(n: number, rows: number, width: number, seed: number): XorRow[] {
  const r = mulberry32(seed);
  return Array.from({ length: rows }, () => {
    const vs: number[] = [];
    while (vs.length < width) {
      const v = 1 + Math.floor(r() * n);
      if (!vs.includes(v)) vs.push(v);
    }
    return { variables: vs, parity: r() < 0.5 ? 0 : 1 };
  });
}

/** An XOR system as CNF: each row as its 2^(k-1) clauses. */
export function xorSystem(n: number, rows: readonly XorRow[]): Encoded {
  const e = new CircuitEncoder();
  e.variables = n;
  for (const row of rows) e.parity(row.variables, row.parity);
  return e.encoded();
}

/** Options of {@link randomCircuit}. */
export interface RandomCircuitOptions {
  /** Primary inputs (default 2..5). */
  readonly inputs?: number;
  /** Gates (default 1..8). */
  readonly gates?: number;
  /** Widest AND / OR / XOR gate (default 4). */
  readonly maxWidth?: number;
  /** Force the last gate's output with a unit clause (default true). */
  readonly forceOutput?: boolean;
  /** Random extra clauses of width 1..3 over all variables (default 0). */
  readonly extraClauses?: number;
  /** Exactly-one groups over fresh variables of this many members (0: none). */
  readonly oneHot?: number;
  /** Parity constraints over random existing variables (default 0). */
  readonly parities?: number;
  /** Renumber variables, shuffle clauses and literals (default true). */
  readonly shuffle?: boolean;
}

/**
 * A random Tseitin-encoded circuit: AND / OR (inputs possibly negated), XOR / XNOR, NOT and
 * buffer gates over the primary inputs and earlier outputs, the last output forced, optional
 * extra clauses, one-hot groups and parity constraints; variables renumbered and clauses and
 * literals shuffled so that nothing can rely on the encoder's order.
 */
export function randomCircuit(seed: number, options: RandomCircuitOptions = {}): Encoded & { gates: number } {
  const r = mulberry32(seed);
  const int = (lo: number, hi: number): number => lo + Math.floor(r() * (hi - lo + 1));
  const e = new CircuitEncoder();
  const signals = e.inputWord(options.inputs ?? int(2, 5));
  const gates = options.gates ?? int(1, 8);
  const maxWidth = options.maxWidth ?? 4;
  const pick = (k: number): number[] => {
    const pool = [...signals];
    const out: number[] = [];
    while (out.length < k && pool.length > 0) out.push(pool.splice(Math.floor(r() * pool.length), 1)[0]!);
    return out;
  };
  const sign = (v: number): number => (r() < 0.5 ? -v : v);
  for (let g = 0; g < gates; g++) {
    const kind = int(0, 5);
    const width = Math.min(signals.length, int(2, Math.max(2, maxWidth)));
    let y: number;
    if (kind === 0) y = e.and(pick(width).map(sign));
    else if (kind === 1) y = e.or(pick(width).map(sign));
    else if (kind === 2) y = e.xor(pick(width));
    else if (kind === 3) y = e.xnor(pick(width));
    else if (kind === 4) y = e.not(pick(1)[0]!);
    else y = e.buffer(pick(1)[0]!);
    signals.push(y);
  }
  if (options.forceOutput ?? true) e.force(sign(signals[signals.length - 1]!));
  if (options.oneHot) {
    const vs = Array.from({ length: options.oneHot }, () => e.fresh());
    e.exactlyOne(vs);
  }
  for (let p = 0; p < (options.parities ?? 0); p++) {
    const vs: number[] = [];
    const k = int(2, 4);
    while (vs.length < Math.min(k, e.variables)) {
      const v = int(1, e.variables);
      if (!vs.includes(v)) vs.push(v);
    }
    e.parity(vs, r() < 0.5 ? 0 : 1);
  }
  for (let c = 0; c < (options.extraClauses ?? 0); c++) {
    const k = int(1, 3);
    const vs: number[] = [];
    while (vs.length < Math.min(k, e.variables)) {
      const v = int(1, e.variables);
      if (!vs.includes(v)) vs.push(v);
    }
    e.clauses.push(vs.map(sign));
  }
  const enc = e.encoded();
  if (!(options.shuffle ?? true)) return { ...enc, gates };
  return { ...shuffled(enc, r), gates };
}

/** The same formula with variables renumbered at random and clauses and literals shuffled. */
export function shuffled(f: Encoded, r: () => number): Encoded {
  const perm = Array.from({ length: f.variables }, (_, i) => i + 1);
  for (let i = perm.length - 1; i > 0; i--) {
    const j = Math.floor(r() * (i + 1));
    [perm[i], perm[j]] = [perm[j]!, perm[i]!];
  }
  const map = (l: number): number => (l > 0 ? perm[l - 1]! : -perm[-l - 1]!);
  const clauses = f.clauses.map((c) => {
    const d = c.map(map);
    for (let i = d.length - 1; i > 0; i--) {
      const j = Math.floor(r() * (i + 1));
      [d[i], d[j]] = [d[j]!, d[i]!];
    }
    return d;
  });
  for (let i = clauses.length - 1; i > 0; i--) {
    const j = Math.floor(r() * (i + 1));
    [clauses[i], clauses[j]] = [clauses[j]!, clauses[i]!];
  }
  return { variables: f.variables, clauses, inputs: f.inputs.map(map) };
}

/** The formula as DIMACS CNF text. */
export function dimacs(f: Encoded, comment?: string): string {
  const head = comment ? comment.split("\n").map((l) => `c ${l}\n`).join("") : "";
  return `${head}p cnf ${f.variables} ${f.clauses.length}\n${f.clauses.map((c) => `${c.join(" ")} 0\n`).join("")}`;
}
