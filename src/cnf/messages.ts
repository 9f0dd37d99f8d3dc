/**
 * Every diagnostic the DIMACS readers can produce, in one place, so that the byte scanner and the
 * ANTLR reader give the same code, message and hint for the same input (the differential test
 * compares them).
 */
import { place, type Diagnostic, type Finding } from "../diag/diagnostic.js";

/** Largest count or variable index accepted: DIMACS readers commonly store them in 32-bit ints. */
export const MAX_INDEX = 2147483647;

/** Where in the grammar a token was met; decides what was expected. */
export const enum Phase {
  BeforeHeader = 0,
  Format = 1,
  Variables = 2,
  Clauses = 3,
  HeaderEnd = 4,
  Body = 5,
}

/** What stood at the offending place. */
export type Found =
  | { readonly kind: "eof" }
  | { readonly kind: "eol" }
  | { readonly kind: "token"; readonly bytes: Uint8Array };

const HEADER_FORM = "'p cnf VARIABLES CLAUSES'";

/** Prints a token for a message: short, with non-printable bytes escaped. */
export function showToken(bytes: Uint8Array): string {
  let s = "";
  const n = Math.min(bytes.length, 24);
  for (let i = 0; i < n; i++) {
    const b = bytes[i]!;
    s += b >= 0x20 && b < 0x7f && b !== 0x27 ? String.fromCharCode(b) : `\\x${b.toString(16).padStart(2, "0")}`;
  }
  return `'${s}${bytes.length > n ? "..." : ""}'`;
}

function describe(found: Found): string {
  switch (found.kind) {
    case "eof":
      return "the end of the input";
    case "eol":
      return "the end of the line";
    case "token":
      return showToken(found.bytes);
  }
}

/** Where the token's first non-ASCII byte stands in it (-1: none). */
function nonAscii(found: Found): number {
  if (found.kind !== "token") return -1;
  return found.bytes.findIndex((b) => b >= 0x80);
}

const err = (code: string, offset: number, message: string, hint: string): Finding => ({
  code,
  severity: "error",
  message,
  offset,
  hint,
});

function binaryInput(offset: number, byte: number): Finding {
  return err(
    "non-ascii-input",
    offset,
    `expected plain ASCII DIMACS text but found the byte 0x${byte.toString(16)}`,
    "the input looks binary or non-ASCII (a compressed file?); decompress or convert it to ASCII text",
  );
}

/** A token (or line end, or end of input) that the grammar does not allow where it stands. */
export function unexpected(phase: Phase, offset: number, found: Found): Finding {
  // The byte named is the one at the place given (columns count bytes), not the token's start.
  const at = nonAscii(found);
  if (at >= 0) return binaryInput(offset + at, (found as { bytes: Uint8Array }).bytes[at]!);
  const what = describe(found);
  switch (phase) {
    case Phase.BeforeHeader:
      if (found.kind === "eof") {
        return err("missing-header", offset, `expected the header ${HEADER_FORM} but found ${what}`,
          "a DIMACS CNF file needs a header line such as 'p cnf 3 2' before its clauses");
      }
      return err("missing-header", offset, `expected the header ${HEADER_FORM} before any clause but found ${what}`,
        "put the header line 'p cnf VARIABLES CLAUSES' before the first clause (comment lines start with 'c')");
    case Phase.Format:
      if (found.kind !== "token") {
        return err("missing-format", offset, `expected the format 'cnf' after 'p' but found ${what}`,
          `write the header as ${HEADER_FORM}`);
      }
      return err("unsupported-format", offset, `expected the format 'cnf' but found ${what}`,
        "clausegate reads CNF only: the header must be 'p cnf VARIABLES CLAUSES'");
    case Phase.Variables:
    case Phase.Clauses: {
      const name = phase === Phase.Variables ? "VARIABLES" : "CLAUSES";
      if (found.kind !== "token") {
        return err("missing-count", offset, `expected the ${name} count in the header but found ${what}`,
          `write the header as ${HEADER_FORM}, both counts on the same line`);
      }
      if (found.bytes[0] === 0x2d /* - */) {
        return err("negative-count", offset, `expected a non-negative ${name} count but found ${what}`,
          `counts in ${HEADER_FORM} are whole numbers 0..${MAX_INDEX}`);
      }
      return err("bad-count", offset, `expected the ${name} count as a decimal number but found ${what}`,
        `counts in ${HEADER_FORM} are whole numbers 0..${MAX_INDEX}`);
    }
    case Phase.HeaderEnd:
      return err("header-trailing", offset, `expected the end of the header line but found ${what}`,
        `the header holds exactly ${HEADER_FORM}; start the clauses on the next line`);
    case Phase.Body:
      if (found.kind === "token" && found.bytes.length === 1 && found.bytes[0] === 0x70 /* p */) {
        return err("second-header", offset, "expected a literal or 0 but found a second header 'p'",
          "a file holds exactly one header line; remove this one or merge the files properly");
      }
      return err("bad-literal", offset, `expected a literal (a nonzero decimal integer) or 0 but found ${what}`,
        "literals are integers like 3 or -3 separated by whitespace; each clause ends with 0; comment lines start with 'c'");
  }
}

export function countTooLarge(phase: Phase, offset: number, bytes: Uint8Array): Finding {
  const name = phase === Phase.Variables ? "VARIABLES" : "CLAUSES";
  return err("count-out-of-range", offset, `expected a ${name} count of at most ${MAX_INDEX} but found ${showToken(bytes)}`,
    `counts above ${MAX_INDEX} are not supported`);
}

export function negativeZero(offset: number): Finding {
  return err("negative-zero", offset, "expected a literal or the terminator 0 but found '-0'",
    "write 0 to end a clause; a literal is a nonzero integer");
}

export function literalTooLarge(offset: number, bytes: Uint8Array): Finding {
  return err("literal-out-of-range", offset, `expected a literal of magnitude at most ${MAX_INDEX} but found ${showToken(bytes)}`,
    `variables are numbered 1..${MAX_INDEX} at most`);
}

export function variableOutOfRange(offset: number, variable: number, declared: number): Finding {
  return err("variable-out-of-range", offset,
    `expected a variable in 1..${declared} (the header declares ${declared}) but found variable ${variable}`,
    `declare at least ${variable} variables in the header: 'p cnf ${variable} ...'`);
}

export function tooManyClauses(offset: number, declared: number): Finding {
  return err("too-many-clauses", offset,
    `expected ${declared} clause${declared === 1 ? "" : "s"} as the header declares but found clause ${declared + 1}`,
    `declare the true number of clauses in the header, or remove the extra ones`);
}

export function tooFewClauses(offset: number, declared: number, found: number): Finding {
  return err("too-few-clauses", offset,
    `expected ${declared} clause${declared === 1 ? "" : "s"} as the header declares but found ${found}`,
    `set the header's CLAUSES count to ${found}, or add the missing clauses`);
}

export function missingTerminator(offset: number): Finding {
  return {
    code: "missing-terminator",
    severity: "warning",
    message: "the last clause is not terminated by 0; it was accepted as a clause",
    offset,
    hint: "end every clause with 0",
  };
}

/**
 * A lone `0` line after the declared clauses, at the end of the input: an end marker (SATLIB's
 * pret files end so), not an extra empty clause (grammar rule S5).
 */
export function trailingZeroEndMarker(offset: number, declared: number): Finding {
  return {
    code: "trailing-zero-end-marker",
    severity: "warning",
    message: `the lone 0 after the ${declared} declared clause${declared === 1 ? "" : "s"} was read as an end marker, not as an empty clause`,
    offset,
    hint: "remove the line, or raise the header's CLAUSES count if an empty clause was meant",
  };
}

export function emptyInput(): Finding {
  return err("empty-input", 0, "expected a DIMACS CNF file but the input is empty",
    "give a file that starts with a header line such as 'p cnf 3 2'");
}

/** A NUL byte at `offset`: the input is binary. */
export function nulByte(offset: number): Finding {
  return err("nul-byte", offset, "expected DIMACS text but found a NUL byte",
    "the input looks binary; give a plain-text DIMACS CNF file");
}

/**
 * Checks the encoding before any token is read. A UTF-16 file is rejected at once, and so is a
 * NUL byte anywhere (the first one is reported, whatever else is wrong), so that both readers
 * agree. Returns where the text starts (after a UTF-8 byte-order mark) or the finding that
 * rejects it. With `findNul` false the caller promises to look for NUL bytes itself (the byte
 * scanner does, in the same pass as the rest).
 */
export function checkEncoding(bytes: Uint8Array, findNul = true): { start: number } | { error: Finding } {
  if (bytes.length === 0) return { error: emptyInput() };
  const b0 = bytes[0]!;
  const b1 = bytes.length > 1 ? bytes[1]! : -1;
  const utf16 = (): Finding =>
    err("utf16-input", 0, "expected ASCII DIMACS text but the input is UTF-16 encoded",
      "convert the file to ASCII or UTF-8, e.g. iconv -f UTF-16 -t ASCII in.cnf > out.cnf");
  if ((b0 === 0xff && b1 === 0xfe) || (b0 === 0xfe && b1 === 0xff)) return { error: utf16() };
  // UTF-16 without a byte-order mark: ASCII text with every other byte zero.
  if ((b0 === 0 && b1 > 0 && b1 < 0x80) || (b1 === 0 && b0 > 0 && b0 < 0x80)) return { error: utf16() };
  if (findNul) {
    const nul = bytes.indexOf(0);
    if (nul >= 0) return { error: nulByte(nul) };
  }
  const bom = b0 === 0xef && b1 === 0xbb && bytes[2] === 0xbf;
  return { start: bom ? 3 : 0 };
}

/** Errors a bare CR on the error's own line most likely causes (the header is line-structured). */
const CR_CAUSED = new Set(["header-trailing", "missing-header", "missing-count", "bad-count", "missing-format", "unsupported-format"]);

/**
 * Places a reader's error, with a word about bare carriage returns (a CR not followed by LF:
 * classic Mac line ends, which DIMACS readers do not take as line ends) where one stands before
 * it: on the error's own line of the header it is the likely cause and its hint replaces the
 * error's; elsewhere it is added to the hint (a comment line holding one swallows what follows
 * it, the header or clauses among them).
 */
export function placeError(bytes: Uint8Array, f: Finding, origin = 0): Diagnostic {
  const d = place(bytes, f, origin);
  const end = Math.min(f.offset, bytes.length);
  // The first bare CR on the error's line, or on an earlier comment or header line (a CR between
  // the tokens of a clause is only a blank there).
  let cr = -1;
  let runsOn = "";
  let lineStart = origin;
  // The error's line starts here (its column counts from there): one pass, linear in the offset.
  const errorLine = f.offset - d.column + 1;
  for (let i = origin; i < end && cr < 0; i++) {
    if (bytes[i] === 10) lineStart = i + 1;
    else if (bytes[i] === 13 && bytes[i + 1] !== 10) {
      let k = lineStart;
      while (k < i && (bytes[k] === 32 || bytes[k] === 9)) k++;
      const sameLine = i >= errorLine;
      if (sameLine || bytes[k] === 99 /* c */ || bytes[k] === 112 /* p */) {
        cr = i;
        runsOn = bytes[k] === 99 ? "the comment" : "the header";
      }
    }
  }
  if (cr < 0) return d;
  const at = place(bytes, { ...f, offset: cr }, origin);
  const convert = "lines of a DIMACS file end with LF or CRLF; convert CR line ends, e.g. tr '\\r' '\\n' < OLD.cnf > NEW.cnf";
  if (at.line === d.line && CR_CAUSED.has(f.code)) return { ...d, hint: `the line holds a bare carriage return (CR) at column ${at.column}: ${convert}` };
  const where = at.line === d.line ? `this line holds a bare carriage return (CR) at column ${at.column}, which is not a line end` : `line ${at.line} holds a bare carriage return (CR) at column ${at.column}, which is not a line end (${runsOn} runs on past it)`;
  return { ...d, hint: `${d.hint === undefined ? "" : `${d.hint}; `}${where}: ${convert}` };
}

/**
 * The first comment line (before `end`) that holds a bare carriage return with text after it: a
 * CR is not a line end, so that text (a header, clauses) was read as part of the comment. A
 * warning (the input is valid DIMACS), or null. One scan with the native search for CR bytes.
 */
export function crInComment(bytes: Uint8Array, origin: number, end: number): Finding | null {
  // Line starts are found going forward (each byte read once): a file of bare CRs alone is one
  // long line, and walking back from every CR would be quadratic.
  let lineStart = origin;
  let scanned = origin;
  for (let i = bytes.indexOf(13, origin); i >= 0 && i < end; i = bytes.indexOf(13, i + 1)) {
    if (bytes[i + 1] === 10) continue;
    let k = i + 1;
    while (k < end && (bytes[k] === 32 || bytes[k] === 9 || bytes[k] === 13)) k++;
    if (k >= end || bytes[k] === 10) continue;
    for (; scanned < i; scanned++) if (bytes[scanned] === 10) lineStart = scanned + 1;
    let start = lineStart;
    while (start < i && (bytes[start] === 32 || bytes[start] === 9)) start++;
    if (bytes[start] !== 99 /* c */) continue;
    return {
      code: "cr-in-comment",
      severity: "warning",
      message: "a comment line holds a bare carriage return (CR), which is not a line end: the text after it was read as part of the comment",
      offset: k,
      hint: "lines of a DIMACS file end with LF or CRLF; convert CR line ends, e.g. tr '\\r' '\\n' < OLD.cnf > NEW.cnf, and check that the formula is the one meant",
    };
  }
  return null;
}
