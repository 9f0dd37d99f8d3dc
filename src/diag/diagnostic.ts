/**
 * Diagnostics are data: the library returns them and never prints or exits; only the CLI does.
 * Positions are byte offsets; line and column are computed once, when the diagnostic is made.
 */

/** How serious a diagnostic is: an error rejects the input, a warning does not. */
export type Severity = "error" | "warning";

/** One finding about an input, with its place and a hint saying what to do. */
export interface Diagnostic {
  /** Stable kebab-case identifier, e.g. `variable-out-of-range`. */
  readonly code: string;
  /** An error rejects the input; a warning does not. */
  readonly severity: Severity;
  /** What was expected and what was found. */
  readonly message: string;
  /** Byte offset into the input. */
  readonly offset: number;
  /** 1-based line. */
  readonly line: number;
  /** 1-based column, counted in bytes (a tab counts one). */
  readonly column: number;
  /** One line saying how to fix the input. */
  readonly hint?: string;
}

/** A diagnostic before it has been placed in its source. */
export interface Finding {
  readonly code: string;
  readonly severity: Severity;
  readonly message: string;
  readonly offset: number;
  readonly hint?: string;
}

/**
 * Turns a byte offset into a 1-based line and column. `origin` is where line 1 starts (after a
 * byte-order mark). Linear in the offset: only called when a diagnostic is made.
 */
export function locate(bytes: Uint8Array, offset: number, origin = 0): { line: number; column: number } {
  let line = 1;
  let lineStart = origin;
  const end = Math.min(offset, bytes.length);
  for (let i = origin; i < end; i++) {
    if (bytes[i] === 10 /* \n */) {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: Math.max(offset, origin) - lineStart + 1 };
}

/** Places a finding in its source. */
export function place(bytes: Uint8Array, f: Finding, origin = 0): Diagnostic {
  const { line, column } = locate(bytes, f.offset, origin);
  return { ...f, line, column };
}

/**
 * The one-line form used by the CLI: `FILE:LINE:COL: error: MESSAGE; hint: HINT`.
 */
export function formatDiagnostic(d: Diagnostic, file: string): string {
  const hint = d.hint === undefined ? "" : `; hint: ${d.hint}`;
  return `${file}:${d.line}:${d.column}: ${d.severity}: ${d.message}${hint}`;
}
