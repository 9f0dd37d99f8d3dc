/** Reading input bytes from a file path, a string, a Buffer or standard input ("-"). */
import { fstatSync } from "node:fs";
import { open, type FileHandle } from "node:fs/promises";
import type { HeaderPlace, ReadResult } from "./scanner.js";
import { headerPlace, scanDimacs } from "./scanner.js";

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
  if (code === "EISDIR") return "it is a folder";
  if (code === "EACCES") return "permission denied";
  return code ?? String(e);
}

/** An EISDIR error, as the file system gives it for reading a folder. */
function folderError(path: string): NodeJS.ErrnoException {
  return Object.assign(new Error(`EISDIR: illegal operation on a directory, read '${path}'`), { code: "EISDIR", errno: -21, syscall: "read" });
}

/** Bytes read at a time from an input that is not a regular file. */
const CHUNK = 1 << 16;

/**
 * Reads an input that is not a regular file (a device, a FIFO) in chunks, and stops after the
 * first chunk that holds a NUL byte: such an input is binary, which the readers report at the
 * NUL's offset, and it may never end (/dev/zero, /dev/urandom).
 */
async function readUntilNul(handle: FileHandle): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for (;;) {
    const buf = Buffer.allocUnsafe(CHUNK);
    const { bytesRead } = await handle.read(buf, 0, CHUNK, null);
    if (bytesRead === 0) break;
    const chunk = buf.subarray(0, bytesRead);
    chunks.push(chunk);
    if (chunk.includes(0)) break;
  }
  return Buffer.concat(chunks);
}

/**
 * Reads standard input, up to the end or to the first chunk that holds a NUL byte (see
 * readUntilNul). A folder given as standard input is refused as EISDIR.
 */
export async function readStdin(): Promise<Buffer> {
  let isFolder = false;
  try {
    isFolder = fstatSync(0).isDirectory();
  } catch {
    // No descriptor 0 to ask: the stream reports what it finds.
  }
  if (isFolder) throw folderError("<stdin>");
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) {
    chunks.push(chunk as Buffer);
    if ((chunk as Buffer).includes(0)) break;
  }
  return Buffer.concat(chunks);
}

/**
 * Loads the bytes of a file, or of standard input when `path` is "-". A regular file is read
 * whole at once; anything else in chunks, stopping at the first chunk that holds a NUL byte
 * (see readUntilNul). Rejects with the I/O error (the caller words it for its user).
 */
export async function loadBytes(path: string): Promise<Buffer> {
  if (path === "-") return readStdin();
  const handle = await open(path, "r");
  try {
    const s = await handle.stat();
    if (s.isDirectory()) throw folderError(path);
    return s.isFile() ? await handle.readFile() : await readUntilNul(handle);
  } finally {
    await handle.close();
  }
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
  const { cnf, diagnostics } = await readDimacsSource(path);
  return { cnf, diagnostics };
}

/** readDimacsFile, and for an accepted input where its header's counts stand (for the CLI's messages). */
export async function readDimacsSource(path: string): Promise<ReadResult & { readonly header?: HeaderPlace }> {
  let bytes: Buffer;
  try {
    bytes = await loadBytes(path);
  } catch (e) {
    return {
      cnf: undefined,
      diagnostics: [{ code: "io-error", severity: "error", message: `cannot read the input (${ioReason(e)})`, offset: 0, line: 1, column: 1, hint: (e as { code?: string }).code === "EISDIR" ? "give a DIMACS CNF file, not a folder" : "check the path and permissions" }],
    };
  }
  const read = scanDimacs(bytes);
  if (read.cnf === undefined) return read;
  const header = headerPlace(bytes);
  return header === undefined ? read : { ...read, header };
}
