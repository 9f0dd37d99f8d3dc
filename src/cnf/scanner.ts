/**
 * The fast DIMACS CNF reader: one pass over the bytes that validates and writes literals straight
 * into an Int32Array, with no token list and no per-literal objects. Its behaviour is defined by
 * grammar/DimacsLexer.g4 and grammar/DimacsParser.g4; test/cnf/differential.test.ts holds it to
 * the ANTLR reader generated from them (same clauses, same diagnostics).
 */
import { locate, place, type Diagnostic, type Finding } from "../diag/diagnostic.js";
import type { Cnf } from "./cnf.js";
import {
  MAX_INDEX, Phase, checkEncoding, countTooLarge, literalTooLarge, missingTerminator, negativeZero, nulByte,
  crInComment, placeError, tooFewClauses, tooManyClauses, trailingZeroEndMarker, unexpected, variableOutOfRange, type Found,
} from "./messages.js";

/** What a reader returns: the formula when the input is accepted, and every diagnostic. */
export interface ReadResult {
  /** The formula, or undefined when an error rejected the input. */
  readonly cnf: Cnf | undefined;
  /** Errors (at most one: reading stops at the first) and warnings, in input order. */
  readonly diagnostics: readonly Diagnostic[];
}

// Whitespace separates tokens: space, tab, CR, LF.
const isSpace = (c: number): boolean => c === 32 || c === 10 || c === 13 || c === 9;

/** Thrown inside the scanner to unwind to readDimacs; never escapes it. */
class Stop {
  constructor(readonly finding: Finding) {}
}

function tokenEnd(b: Uint8Array, i: number): number {
  const n = b.length;
  while (i < n && !isSpace(b[i]!)) i++;
  return i;
}

function found(b: Uint8Array, s: number): Found {
  if (s >= b.length) return { kind: "eof" };
  if (b[s] === 10 /* \n */ || (b[s] === 13 /* \r */ && b[s + 1] === 10)) return { kind: "eol" };
  return { kind: "token", bytes: b.subarray(s, tokenEnd(b, s)) };
}

/** Skips header-line blanks: spaces, tabs and a CR that does not end the line. */
function skipHeaderBlanks(b: Uint8Array, i: number): number {
  for (;;) {
    const c = b[i];
    if (c === 32 || c === 9 || (c === 13 && b[i + 1] !== 10)) i++;
    else return i;
  }
}

/** Reads one header count at `i`; returns its value and the index after it. */
function headerCount(b: Uint8Array, i: number, phase: Phase): [number, number] {
  const s = skipHeaderBlanks(b, i);
  const e = s < b.length && b[s] !== 10 && b[s] !== 13 ? tokenEnd(b, s) : s;
  let v = 0;
  for (let k = s; k < e; k++) {
    const d = b[k]! - 48;
    if (d < 0 || d > 9) throw new Stop(unexpected(phase, s, found(b, s)));
    v = v * 10 + d;
  }
  if (e === s) throw new Stop(unexpected(phase, s, found(b, s)));
  if (v > MAX_INDEX) throw new Stop(countTooLarge(phase, s, b.subarray(s, e)));
  return [v, e];
}

/** Parses the header starting at the 'p' at `i`; returns [variables, clauses, index after the line]. */
function header(b: Uint8Array, i: number): [number, number, number] {
  let s = skipHeaderBlanks(b, i + 1);
  const f = found(b, s);
  const isCnf = f.kind === "token" && f.bytes.length === 3 && f.bytes[0] === 99 && f.bytes[1] === 110 && f.bytes[2] === 102;
  if (!isCnf) throw new Stop(unexpected(Phase.Format, s, f));
  const [vars, a] = headerCount(b, s + 3, Phase.Variables);
  const [clauses, e] = headerCount(b, a, Phase.Clauses);
  s = skipHeaderBlanks(b, e);
  if (s >= b.length) return [vars, clauses, s];
  if (b[s] === 10) return [vars, clauses, s + 1];
  if (b[s] === 13 && b[s + 1] === 10) return [vars, clauses, s + 2];
  throw new Stop(unexpected(Phase.HeaderEnd, s, found(b, s)));
}

/** Skips a comment from `i` to its line feed; a NUL inside rejects the input. */
function skipComment(b: Uint8Array, i: number): number {
  let e = b.indexOf(10, i);
  if (e < 0) e = b.length;
  if (b.subarray(i, e).indexOf(0) >= 0) throw new Stop(nulByte(i));
  return e;
}

/** Skips whitespace and comment lines before the header; returns the index of the first other byte. */
function skipToHeader(b: Uint8Array, i: number): number {
  const n = b.length;
  while (i < n) {
    const c = b[i]!;
    if (isSpace(c)) i++;
    else if (c === 99 /* c */) i = skipComment(b, i);
    else return i;
  }
  return i;
}

/** Counters shared by the fast and careful paths of the body scan. */
interface BodyState {
  nl: number; // literals written
  nc: number; // clauses complete
  end: number; // where the input ends for the count check: '%' or end of file
  zeroEnd: number; // offset of a lone '0' line read as an end marker (rule S5), or -1
}

/**
 * The hot loop: literals and terminators separated by whitespace, nothing else. Returns the index
 * of the first token it does not take (a comment, '%', anything odd or wrong), or `limit`.
 * Requires b[limit - 1] to be whitespace, so digit runs end without a bounds check.
 */
function fastBody(
  b: Uint8Array, i: number, limit: number, lits: Int32Array, starts: Uint32Array, vars: number, declared: number, st: BodyState,
): number {
  let nl = st.nl;
  let nc = st.nc;
  while (i < limit) {
    let c = b[i]!;
    if (c <= 32) {
      if (c === 32 || c === 10 || c === 13 || c === 9) {
        i++;
        continue;
      }
      break;
    }
    const s = i;
    const neg = c === 45; /* - */
    if (neg) c = b[++i]!;
    // Unsigned compare: one branch for "not a digit" (bytes below '0' wrap to large values).
    c = (c - 48) >>> 0;
    if (c > 9) {
      i = s;
      break;
    }
    let v = c;
    while ((c = (b[++i]! - 48) >>> 0) <= 9) v = v * 10 + c;
    c = b[i]!;
    if ((c !== 32 && c !== 10 && c !== 13 && c !== 9) || (neg && v === 0) || v > vars || nc === declared) {
      i = s; // the careful path decides (and may still accept)
      break;
    }
    if (v === 0) starts[++nc] = nl;
    else lits[nl++] = neg ? -v : v;
  }
  st.nl = nl;
  st.nc = nc;
  return i;
}

/**
 * Whether the '0' token at [s, i) is an end marker (rule S5): first on its line (only blanks
 * before it since the last line feed) and followed by nothing but whitespace and comments up to
 * the end of the input or a '%' end marker. Returns where the input ends (its length, or the '%'),
 * or -1. Called at most once per input, so scanning back and ahead costs nothing.
 */
function zeroEndMarker(b: Uint8Array, s: number, i: number): number {
  let k = s - 1;
  while (k >= 0 && (b[k] === 32 || b[k] === 9 || b[k] === 13)) k--;
  if (k >= 0 && b[k] !== 10) return -1;
  const n = b.length;
  for (;;) {
    while (i < n && isSpace(b[i]!)) i++;
    if (i >= n) return n;
    if (b[i] === 99 /* c */) i = skipComment(b, i);
    else if (b[i] === 37 /* % */ && (i + 1 >= n || isSpace(b[i + 1]!))) return i;
    else return -1;
  }
}

/**
 * The careful path: whitespace, then one token at `i`, with every check and diagnostic. Returns
 * the index after it, or the input length at the end marker.
 */
function oneToken(
  b: Uint8Array, i: number, lits: Int32Array, starts: Uint32Array, vars: number, declared: number, st: BodyState,
): number {
  const n = b.length;
  while (i < n && isSpace(b[i]!)) i++;
  if (i >= n) return n;
  const s = i;
  let c = b[i]!;
  const neg = c === 45; /* - */
  if (neg) i++;
  let v = 0;
  const ds = i;
  while (i < n && (c = (b[i]! - 48) >>> 0) <= 9) {
    v = v * 10 + c;
    i++;
  }
  if (i === ds || (i < n && !isSpace(b[i]!))) {
    // Not a number: a comment, the end marker, or an error.
    c = b[s]!;
    if (c === 99 /* c */) return skipComment(b, s);
    if (c === 37 /* % */ && (s + 1 >= n || isSpace(b[s + 1]!))) {
      st.end = s;
      return n;
    }
    throw new Stop(unexpected(Phase.Body, s, found(b, s)));
  }
  if (v === 0) {
    if (neg) throw new Stop(negativeZero(s));
    if (st.nc === declared) {
      // Rule S5: a '0' alone on its line with only comments and whitespace after it (up to the end
      // or '%') ends the input; anything else after it makes it the extra clause it looks like.
      const e = zeroEndMarker(b, s, i);
      if (e < 0) throw new Stop(tooManyClauses(s, declared));
      st.zeroEnd = s;
      if (e < n) st.end = e;
      return n;
    }
    starts[++st.nc] = st.nl;
    return i;
  }
  if (v > vars) {
    if (v > MAX_INDEX) throw new Stop(literalTooLarge(s, b.subarray(s, i)));
    throw new Stop(variableOutOfRange(s, v, vars));
  }
  if (st.nc === declared && st.nl === starts[st.nc]) throw new Stop(tooManyClauses(s, declared));
  lits[st.nl++] = neg ? -v : v;
  return i;
}

/**
 * Reads DIMACS CNF from bytes (ASCII; a UTF-8 byte-order mark is skipped). Stops at the first
 * error. Never throws for bad input.
 *
 * @example
 * ```ts
 * const { cnf, diagnostics } = scanDimacs(new TextEncoder().encode("p cnf 2 1\n1 -2 0\n"));
 * ```
 */
export function scanDimacs(b: Uint8Array): ReadResult {
  const enc = checkEncoding(b, false);
  if ("error" in enc) return { cnf: undefined, diagnostics: [place(b, enc.error)] };
  const origin = enc.start;
  const warnings: Diagnostic[] = [];
  try {
    const cnf = scanFrom(b, origin, warnings);
    return { cnf, diagnostics: warnings };
  } catch (e) {
    if (!(e instanceof Stop)) throw e;
    // A NUL byte anywhere outranks every other error (see checkEncoding); the scan met none in
    // what it read, so look for one only now that the input is rejected anyway.
    const nul = b.indexOf(0);
    if (nul >= 0) return { cnf: undefined, diagnostics: [place(b, nulByte(nul))] };
    return { cnf: undefined, diagnostics: [...warnings, placeError(b, e.finding, origin)] };
  }
}

/** Where an accepted input's header counts stand (1-based line; byte columns, as diagnostics give them). */
export interface HeaderPlace {
  readonly line: number;
  /** Column of the VARIABLES count. */
  readonly variables: number;
}

/**
 * Where the header's counts stand in an input the scanner accepts (undefined for one it
 * rejects), for messages about the formula's size that point at the header.
 */
export function headerPlace(b: Uint8Array): HeaderPlace | undefined {
  const enc = checkEncoding(b, false);
  if ("error" in enc) return undefined;
  const origin = enc.start;
  try {
    const p = skipToHeader(b, origin);
    if (b[p] !== 112 /* p */) return undefined;
    const v = skipHeaderBlanks(b, skipHeaderBlanks(b, p + 1) + 3);
    const at = locate(b, v, origin);
    return { line: at.line, variables: at.column };
  } catch (e) {
    if (e instanceof Stop) return undefined;
    throw e;
  }
}

function scanFrom(b: Uint8Array, origin: number, warnings: Diagnostic[]): Cnf {
  const n = b.length;
  let i = skipToHeader(b, origin);
  if (i >= n || b[i] !== 112 /* p */ || (i + 1 < n && !isSpace(b[i + 1]!))) {
    throw new Stop(unexpected(Phase.BeforeHeader, i, found(b, i)));
  }
  const [vars, declared, bodyStart] = header(b, i);
  i = bodyStart;

  // Every literal and every clause takes at least two bytes ("1 ", "0 "), so these bounds are
  // never exceeded and the hot loop needs no capacity checks.
  const litCap = ((n - i) >> 1) + 1;
  const clauseCap = Math.min(declared, ((n - i) >> 1) + 1);
  const lits = new Int32Array(litCap);
  const starts = new Uint32Array(clauseCap + 1);
  const st: BodyState = { nl: 0, nc: 0, end: n, zeroEnd: -1 };
  // The fast loop needs a whitespace byte before its limit (a sentinel that ends every number);
  // the last token, when the file does not end in whitespace, goes to the careful path.
  let limit = n;
  while (limit > i && !isSpace(b[limit - 1]!)) limit--;
  while (i < n) {
    i = fastBody(b, i, limit, lits, starts, vars, declared, st);
    if (i < n) i = oneToken(b, i, lits, starts, vars, declared, st);
  }
  const { nl, end } = st;
  let { nc } = st;
  // What follows the end marker is never read, but a NUL byte there still makes the input binary.
  if (end < n && b.indexOf(0, end) >= 0) throw new Stop(nulByte(end));
  const cr = crInComment(b, origin, end);
  if (cr !== null) warnings.push(place(b, cr, origin));
  if (st.zeroEnd >= 0) warnings.push(place(b, trailingZeroEndMarker(st.zeroEnd, declared), origin));
  if (nl > starts[nc]!) {
    warnings.push(place(b, missingTerminator(end), origin));
    starts[++nc] = nl;
  }
  if (nc < declared) throw new Stop(tooFewClauses(end, declared, nc));
  // Views, not copies: pages past `nl` were never touched, so they cost no memory, and a copy
  // of a large array costs more than the scan itself.
  return { variables: vars, lits: lits.subarray(0, nl), clauseStart: starts.subarray(0, nc + 1) };
}
