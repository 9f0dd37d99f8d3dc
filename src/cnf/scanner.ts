/**
 * The fast DIMACS CNF reader: one pass over the bytes that validates and writes literals straight
 * into an Int32Array, with no token list and no per-literal objects. Its behaviour is defined by
 * grammar/DimacsLexer.g4 and grammar/DimacsParser.g4; test/cnf/differential.test.ts holds it to
 * the ANTLR reader generated from them (same clauses, same diagnostics).
 */
import { place, type Diagnostic, type Finding } from "../diag/diagnostic.js";
import type { Cnf } from "./cnf.js";
import {
  MAX_INDEX, Phase, checkEncoding, countTooLarge, literalTooLarge, missingTerminator, negativeZero,
  tooFewClauses, tooManyClauses, unexpected, variableOutOfRange, type Found,
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

/** Skips whitespace and comment lines before the header; returns the index of the first other byte. */
function skipToHeader(b: Uint8Array, i: number): number {
  const n = b.length;
  while (i < n) {
    const c = b[i]!;
    if (isSpace(c)) i++;
    else if (c === 99 /* c */) {
      const nl = b.indexOf(10, i);
      i = nl < 0 ? n : nl;
    } else return i;
  }
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
  const enc = checkEncoding(b);
  if ("error" in enc) return { cnf: undefined, diagnostics: [place(b, enc.error)] };
  const origin = enc.start;
  const warnings: Diagnostic[] = [];
  try {
    const cnf = scanFrom(b, origin, warnings);
    return { cnf, diagnostics: warnings };
  } catch (e) {
    if (!(e instanceof Stop)) throw e;
    return { cnf: undefined, diagnostics: [...warnings, place(b, e.finding, origin)] };
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
  let nl = 0; // literals written
  let nc = 0; // clauses complete
  let end = n; // where the input ends for the count check: '%' or end of file

  scan: while (i < n) {
    let c = b[i]!;
    if (isSpace(c)) {
      i++;
      continue;
    }
    const s = i;
    const neg = c === 45; /* - */
    if (neg) i++;
    let v = 0;
    const ds = i;
    while (i < n) {
      c = b[i]! - 48;
      if (c < 0 || c > 9) break;
      v = v * 10 + c;
      i++;
    }
    if (i === ds || (i < n && !isSpace(b[i]!))) {
      // Not a number: a comment, the end marker, or an error.
      i = s;
      c = b[s]!;
      if (c === 99 /* c */) {
        const nlAt = b.indexOf(10, s);
        i = nlAt < 0 ? n : nlAt;
        continue;
      }
      const single = s + 1 >= n || isSpace(b[s + 1]!);
      if (c === 37 /* % */ && single) {
        end = s;
        break scan;
      }
      throw new Stop(unexpected(Phase.Body, s, found(b, s)));
    }
    if (v === 0) {
      if (neg) throw new Stop(negativeZero(s));
      if (nc === declared) throw new Stop(tooManyClauses(s, declared));
      starts[++nc] = nl;
      continue;
    }
    if (v > MAX_INDEX) throw new Stop(literalTooLarge(s, b.subarray(s, i)));
    if (v > vars) throw new Stop(variableOutOfRange(s, v, vars));
    if (nl === starts[nc] && nc === declared) throw new Stop(tooManyClauses(s, declared));
    lits[nl++] = neg ? -v : v;
  }
  if (nl > starts[nc]!) {
    warnings.push(place(b, missingTerminator(end), origin));
    starts[++nc] = nl;
  }
  if (nc < declared) throw new Stop(tooFewClauses(end, declared, nc));
  return { variables: vars, lits: lits.slice(0, nl), clauseStart: starts.slice(0, nc + 1) };
}
