/** Reading input bytes from a file path, a string, a Buffer or standard input ("-"). */
import { readFile } from "node:fs/promises";
import type { ReadResult } from "./scanner.js";
import { scanDimacs } from "./scanner.js";

/** Any input a reader accepts: bytes, or text (encoded as UTF-8). */
export type DimacsInput = Uint8Array | string;

/** The bytes of an input. */
export function bytesOf(input: DimacsInput): Uint8Array {
  return typeof input === "string" ? Buffer.from(input, "utf8") : input;
}

/**
 * Reads DIMACS CNF text with the fast scanner.
 *
 * @example
 * ```ts
 * const { cnf, diagnostics } = readDimacs("p cnf 2 1\n1 -2 0\n");
 * ```
 */
export function readDimacs(input: DimacsInput): ReadResult {
  return scanDimacs(bytesOf(input));
}

/** A short human reason for an I/O error. */
function ioReason(e: unknown): string {
  const code = (e as { code?: string }).code;
  if (code === "ENOENT") return "no such file";
  if (code === "EISDIR") return "it is a directory";
  if (code === "EACCES") return "permission denied";
  return code ?? String(e);
}

/** Reads all of standard input. */
export async function readStdin(): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks);
}

/**
 * Loads the bytes of a file, or of standard input when `path` is "-". Rejects with the I/O error
 * (the caller words it for its user).
 */
export async function loadBytes(path: string): Promise<Buffer> {
  return path === "-" ? readStdin() : readFile(path);
}

/**
 * Reads a DIMACS file, or standard input when `path` is "-", with the fast scanner. An I/O
 * failure is a diagnostic (code `io-error`, at 1:1), like any other reason the input is unusable.
 *
 * @example
 * ```ts
 * const { cnf, diagnostics } = await readDimacsFile("examples/launch-rota.cnf");
 * ```
 */
export async function readDimacsFile(path: string): Promise<ReadResult> {
  let bytes: Buffer;
  try {
    bytes = await loadBytes(path);
  } catch (e) {
    return {
      cnf: undefined,
      diagnostics: [{ code: "io-error", severity: "error", message: `cannot read the input (${ioReason(e)})`, offset: 0, line: 1, column: 1, hint: "check the path and permissions" }],
    };
  }
  return scanDimacs(bytes);
}
