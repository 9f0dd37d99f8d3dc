/**
 * A small JSON reader over bytes that keeps the byte offset of every value, so that a circuit
 * file's diagnostics point at the offending value with byte-correct line and column
 * (`JSON.parse` gives neither, and string indices drift from byte offsets after non-ASCII text).
 * RFC 8259 syntax; the input must already be valid UTF-8 (see {@link firstInvalidUtf8}).
 */

/** A parsed value with its byte range `[at, end)` in the input. */
export type JsonNode =
  | { readonly kind: "object"; readonly at: number; readonly end: number; readonly entries: readonly JsonEntry[] }
  | { readonly kind: "array"; readonly at: number; readonly end: number; readonly items: readonly JsonNode[] }
  | { readonly kind: "string"; readonly at: number; readonly end: number; readonly value: string }
  | { readonly kind: "number"; readonly at: number; readonly end: number; readonly value: number; readonly text: string }
  | { readonly kind: "true" | "false" | "null"; readonly at: number; readonly end: number };

/** One member of an object: its key (with the key's offset) and value. */
export interface JsonEntry {
  readonly key: string;
  readonly keyAt: number;
  readonly value: JsonNode;
}

/** A syntax error at a byte offset. */
export class JsonSyntaxError {
  constructor(readonly offset: number, readonly message: string) {}
}

/** Deeper nesting than this is refused (a circuit file nests three levels). */
const MAX_DEPTH = 64;
const utf8 = new TextDecoder("utf-8");

/** The byte at `pos` as a message shows it. */
export function shownByte(bytes: Uint8Array, pos: number): string {
  if (pos >= bytes.length) return "the end of the input";
  const b = bytes[pos]!;
  if (b >= 0x21 && b < 0x7f) return `'${String.fromCharCode(b)}'`;
  if (b >= 0x80) return `'${utf8.decode(bytes.subarray(pos, pos + utf8Length(b)))}'`;
  return `byte 0x${b.toString(16).padStart(2, "0")}`;
}

/** A value as a message shows it: its text for scalars (shortened), its kind otherwise. */
export function shownValue(node: JsonNode | undefined): string {
  if (node === undefined) return "nothing";
  switch (node.kind) {
    case "object": return "an object";
    case "array": return "a list";
    case "string": {
      const s = JSON.stringify(node.value);
      return s.length > 40 ? `${s.slice(0, 36)}..."` : s;
    }
    case "number": return node.text.length > 40 ? `${node.text.slice(0, 37)}...` : node.text;
    default: return node.kind;
  }
}

const utf8Length = (b: number): number => (b >= 0xf0 ? 4 : b >= 0xe0 ? 3 : b >= 0xc0 ? 2 : 1);

/**
 * The offset of the first byte that is not part of well-formed UTF-8 (Unicode 15, table 3-7: no
 * overlong forms, no surrogates, nothing above U+10FFFF), or -1.
 */
export function firstInvalidUtf8(bytes: Uint8Array, from = 0): number {
  const n = bytes.length;
  let i = from;
  while (i < n) {
    const b = bytes[i]!;
    if (b < 0x80) {
      i++;
      continue;
    }
    let need: number;
    let lo = 0x80;
    let hi = 0xbf;
    if (b >= 0xc2 && b <= 0xdf) need = 1;
    else if (b >= 0xe0 && b <= 0xef) {
      need = 2;
      if (b === 0xe0) lo = 0xa0;
      if (b === 0xed) hi = 0x9f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      need = 3;
      if (b === 0xf0) lo = 0x90;
      if (b === 0xf4) hi = 0x8f;
    } else return i;
    for (let k = 1; k <= need; k++) {
      const c = bytes[i + k];
      if (c === undefined || c < (k === 1 ? lo : 0x80) || c > (k === 1 ? hi : 0xbf)) return i;
    }
    i += need + 1;
  }
  return -1;
}

/** A cursor over the bytes of a JSON text. */
export class JsonScanner {
  constructor(readonly bytes: Uint8Array, public pos = 0) {}

  /** Skips whitespace (space, tab, line feed, carriage return). */
  ws(): void {
    const bytes = this.bytes;
    let p = this.pos;
    for (;;) {
      const b = bytes[p];
      if (b === 0x20 || b === 0x0a || b === 0x0d || b === 0x09) p++;
      else break;
    }
    this.pos = p;
  }

  /** The next byte after whitespace (-1 at the end). */
  peek(): number {
    this.ws();
    return this.pos < this.bytes.length ? this.bytes[this.pos]! : -1;
  }

  /** Fails unless only whitespace is left. */
  end(): void {
    if (this.peek() !== -1) throw new JsonSyntaxError(this.pos, `expected the end of the input after the JSON value but found ${shownByte(this.bytes, this.pos)}`);
  }

  private fail(what: string): never {
    throw new JsonSyntaxError(this.pos, `expected ${what} but found ${shownByte(this.bytes, this.pos)}`);
  }

  private expect(byte: number, what: string): void {
    if (this.peek() !== byte) this.fail(what);
    this.pos++;
  }

  /** Reads one value. */
  value(depth = 0): JsonNode {
    const b = this.peek();
    const at = this.pos;
    if (b === 0x7b /* { */) {
      const entries: JsonEntry[] = [];
      this.members((key, keyAt) => entries.push({ key, keyAt, value: this.value(depth + 1) }), depth);
      return { kind: "object", at, end: this.pos, entries };
    }
    if (b === 0x5b /* [ */) {
      const items: JsonNode[] = [];
      this.items(() => items.push(this.value(depth + 1)), depth);
      return { kind: "array", at, end: this.pos, items };
    }
    if (b === 0x22 /* " */) {
      const value = this.string();
      return { kind: "string", at, end: this.pos, value };
    }
    if (b === 0x2d /* - */ || (b >= 0x30 && b <= 0x39)) {
      const text = this.number();
      return { kind: "number", at, end: this.pos, value: Number(text), text };
    }
    for (const word of ["true", "false", "null"] as const) {
      if (this.word(word)) return { kind: word, at, end: this.pos };
    }
    return this.fail("a JSON value");
  }

  /** Checks one value's syntax without building it. */
  skip(depth = 0): void {
    const b = this.peek();
    if (b === 0x7b) this.members(() => this.skip(depth + 1), depth);
    else if (b === 0x5b) this.items(() => this.skip(depth + 1), depth);
    else if (b === 0x22) this.string(false);
    else if (b === 0x2d || (b >= 0x30 && b <= 0x39)) this.number();
    else if (!this.word("true") && !this.word("false") && !this.word("null")) this.fail("a JSON value");
  }

  /**
   * Reads an object, calling `member(key, keyAt)` with the cursor at each value; the callback
   * must consume the value (with {@link value} or {@link skip}).
   */
  members(member: (key: string, keyAt: number) => void, depth = 0): void {
    if (depth >= MAX_DEPTH) throw new JsonSyntaxError(this.pos, `expected at most ${MAX_DEPTH} levels of nesting but found more`);
    this.expect(0x7b, "'{'");
    if (this.peek() === 0x7d) {
      this.pos++;
      return;
    }
    for (;;) {
      if (this.peek() !== 0x22) this.fail("a key in double quotes");
      const keyAt = this.pos;
      const key = this.string();
      this.expect(0x3a, "':' after the key");
      member(key, keyAt);
      const b = this.peek();
      this.pos++;
      if (b === 0x7d) return;
      if (b !== 0x2c) {
        this.pos--;
        this.fail("',' or '}'");
      }
    }
  }

  /** Reads an array, calling `item()` with the cursor at each element (which it must consume). */
  items(item: (index: number) => void, depth = 0): void {
    if (depth >= MAX_DEPTH) throw new JsonSyntaxError(this.pos, `expected at most ${MAX_DEPTH} levels of nesting but found more`);
    this.expect(0x5b, "'['");
    if (this.peek() === 0x5d) {
      this.pos++;
      return;
    }
    for (let i = 0; ; i++) {
      item(i);
      const b = this.peek();
      this.pos++;
      if (b === 0x5d) return;
      if (b !== 0x2c) {
        this.pos--;
        this.fail("',' or ']'");
      }
    }
  }

  private word(w: string): boolean {
    for (let i = 0; i < w.length; i++) if (this.bytes[this.pos + i] !== w.charCodeAt(i)) return false;
    this.pos += w.length;
    return true;
  }

  /** Reads a string (the cursor at its opening quote); decodes it unless `decode` is false. */
  string(decode = true): string {
    const bytes = this.bytes;
    const start = this.pos;
    let p = start + 1;
    let escaped = false;
    let ascii = true;
    for (;;) {
      const b = bytes[p];
      if (b === undefined) {
        this.pos = start;
        throw new JsonSyntaxError(start, "expected a closing '\"' for this string but found the end of the input");
      }
      if (b === 0x22) break;
      if (b < 0x20) {
        this.pos = p;
        this.fail("a character or escape in the string (control characters must be escaped)");
      }
      if (b >= 0x80) ascii = false;
      if (b === 0x5c) {
        escaped = true;
        const e = bytes[p + 1];
        if (e === 0x75 /* u */) {
          for (let k = 2; k < 6; k++) {
            const h = bytes[p + k];
            const hex = h !== undefined && ((h >= 0x30 && h <= 0x39) || (h >= 0x41 && h <= 0x46) || (h >= 0x61 && h <= 0x66));
            if (!hex) {
              this.pos = p + k;
              this.fail("4 hexadecimal digits after '\\u'");
            }
          }
          p += 6;
          continue;
        }
        if (e === undefined || !'"\\/bfnrt'.includes(String.fromCharCode(e))) {
          this.pos = p + 1;
          this.fail("an escape (one of \\\" \\\\ \\/ \\b \\f \\n \\r \\t \\uXXXX)");
        }
        p += 2;
        continue;
      }
      p++;
    }
    this.pos = p + 1;
    if (!decode) return "";
    if (!escaped && ascii && p - start <= 17) return this.short(start + 1, p);
    const raw = utf8.decode(bytes.subarray(start, p + 1));
    return escaped ? (JSON.parse(raw) as string) : raw.slice(1, -1);
  }

  /**
   * A short ASCII string from bytes [from, to): keys and gate names repeat on every line of a
   * circuit file, so they are kept and handed out again instead of being built per gate.
   */
  private short(from: number, to: number): string {
    const bytes = this.bytes;
    let h = 0x811c9dc5;
    for (let i = from; i < to; i++) h = Math.imul(h ^ bytes[i]!, 16777619);
    const hit = this.interned.get(h);
    if (hit !== undefined && hit.length === to - from) {
      let same = true;
      for (let i = 0; i < hit.length && same; i++) same = hit.charCodeAt(i) === bytes[from + i];
      if (same) return hit;
    }
    let s = "";
    for (let i = from; i < to; i++) s += String.fromCharCode(bytes[i]!);
    if (this.interned.size < 4096) this.interned.set(h, s);
    return s;
  }

  private readonly interned = new Map<number, string>();

  /**
   * Reads a number's value; whole numbers of up to 15 digits without a fraction or exponent
   * (every number a circuit file holds) are computed without building their text.
   */
  numberValue(): number {
    const bytes = this.bytes;
    const start = this.pos;
    let p = start;
    const negative = bytes[p] === 0x2d;
    if (negative) p++;
    let v = 0;
    const first = p;
    if (bytes[p] === 0x30) p++;
    else while (p - first < 15 && bytes[p]! >= 0x30 && bytes[p]! <= 0x39) v = v * 10 + bytes[p++]! - 0x30;
    const next = bytes[p];
    if (p > first && !(next !== undefined && ((next >= 0x30 && next <= 0x39) || next === 0x2e || next === 0x65 || next === 0x45))) {
      this.pos = p;
      return negative ? -v : v;
    }
    this.pos = start;
    return Number(this.number());
  }

  /** The source text of bytes [from, to) (ASCII: numbers, for messages). */
  text(from: number, to: number): string {
    let s = "";
    for (let i = from; i < to; i++) s += String.fromCharCode(this.bytes[i]!);
    return s;
  }

  /** Reads a number's text (RFC 8259 grammar: -?(0|[1-9][0-9]*)(.[0-9]+)?([eE][+-]?[0-9]+)?). */
  number(): string {
    const bytes = this.bytes;
    const start = this.pos;
    let p = start;
    const digit = (i: number): boolean => bytes[i] !== undefined && bytes[i]! >= 0x30 && bytes[i]! <= 0x39;
    const need = (what: string): never => {
      this.pos = p;
      return this.fail(what);
    };
    if (bytes[p] === 0x2d) p++;
    if (bytes[p] === 0x30) p++;
    else if (digit(p)) while (digit(p)) p++;
    else need("a digit");
    if (bytes[p] === 0x2e) {
      p++;
      if (!digit(p)) need("a digit after '.'");
      while (digit(p)) p++;
    }
    if (bytes[p] === 0x65 || bytes[p] === 0x45) {
      p++;
      if (bytes[p] === 0x2b || bytes[p] === 0x2d) p++;
      if (!digit(p)) need("a digit in the exponent");
      while (digit(p)) p++;
    }
    this.pos = p;
    let s = "";
    for (let i = start; i < p; i++) s += String.fromCharCode(bytes[i]!);
    return s;
  }
}
