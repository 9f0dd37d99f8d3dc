/** CLI plumbing: loading inputs, printing diagnostics, atomic writes, progress bars, exit codes. */
import { randomBytes } from "node:crypto";
import { closeSync, openSync, renameSync, rmSync, writeSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import { Bar, Presets } from "cli-progress";
import { formatDiagnostic, readDimacsFile, type Cnf, type Diagnostic } from "../index.js";

/** Exit codes: 0 success, 1 a check failed, 2 bad input or usage, 3 unsatisfiable (plan). */
export const EXIT_BAD_INPUT = 2;

/** An error meant for the user: printed as one line, no stack trace. */
export class UserError extends Error {
  constructor(message: string, readonly exitCode = EXIT_BAD_INPUT) {
    super(message);
  }
}

/** How an input is named in messages. */
export function displayName(path: string): string {
  return path === "-" ? "<stdin>" : path;
}

/** Most variables a circuit-making command accepts (the search register is one qubit per variable). */
export const MAX_CIRCUIT_VARIABLES = 1_000_000;

/** Refuses formulas whose search register would be too large to build. */
export function checkCircuitSize(cnf: Cnf, file: string, command: string): void {
  if (cnf.variables > MAX_CIRCUIT_VARIABLES) {
    throw new UserError(`${displayName(file)}: error: the header declares ${cnf.variables} variables; clausegate ${command} builds search registers of at most ${MAX_CIRCUIT_VARIABLES} qubits; hint: declare only the variables the formula uses`);
  }
}

/** Loads and reads a DIMACS file ("-": standard input); prints warnings; throws UserError on the first error. */
export async function loadCnf(path: string): Promise<Cnf> {
  const { cnf, diagnostics } = await readDimacsFile(path);
  printDiagnostics(diagnostics, displayName(path));
  if (cnf === undefined) throw new UserError("", EXIT_BAD_INPUT);
  return cnf;
}

export function printDiagnostics(ds: readonly Diagnostic[], file: string): void {
  for (const d of ds) process.stderr.write(`${formatDiagnostic(d, file)}\n`);
}

/** A short reason for a failed write. */
function ioReason(e: unknown): string {
  const code = (e as { code?: string }).code;
  if (code === "ENOENT") return "no such folder";
  if (code === "EISDIR") return "it is a directory";
  if (code === "EACCES") return "permission denied";
  return code ?? String(e);
}

/**
 * Writes a file atomically: chunks go to a temporary file beside it, which is renamed over it
 * at the end, so a failure never leaves a partial output.
 */
export function writeAtomic(path: string, produce: (write: (chunk: string) => void) => void): void {
  const tmp = join(dirname(path), `.${basename(path)}.${randomBytes(4).toString("hex")}.tmp`);
  let fd = -1;
  try {
    fd = openSync(tmp, "w");
    const f = fd;
    produce((chunk) => {
      writeSync(f, chunk);
    });
    closeSync(fd);
    fd = -1;
    renameSync(tmp, path);
  } catch (e) {
    if (fd >= 0) closeSync(fd);
    rmSync(tmp, { force: true });
    if (e instanceof UserError) throw e;
    if ((e as { code?: string }).code === undefined) throw e;
    throw new UserError(`${path}: error: cannot write the output (${ioReason(e)}); check that the folder exists and is writable`);
  }
}

/** Writes to standard output in order (synchronous for files and pipes on Linux, so nothing piles up). */
export function writeStdout(chunk: string): void {
  process.stdout.write(chunk);
}

/**
 * A progress reporter that shows a bar on a TTY only, and only once the work has run for a
 * second (short runs stay quiet).
 */
export function progress(label: string): { update: (fraction: number) => void; stop: () => void } {
  if (!process.stderr.isTTY) return { update: () => {}, stop: () => {} };
  const started = Date.now();
  let bar: Bar | undefined;
  return {
    update(fraction) {
      if (bar === undefined && Date.now() - started < 1000) return;
      if (bar === undefined) {
        bar = new Bar({ format: `${label} [{bar}] {percentage}% | {eta_formatted} left`, stream: process.stderr }, Presets.shades_classic);
        bar.start(1000, 0);
      }
      bar.update(Math.round(fraction * 1000));
    },
    stop() {
      bar?.stop();
    },
  };
}
