/** CLI plumbing: loading inputs, printing diagnostics, atomic writes, progress bars, exit codes. */
import { Bar, Presets } from "cli-progress";
import { formatDiagnostic, readDimacsSource, type Cnf, type Diagnostic } from "../internal.js";
import { noteInput, writeOutput, writeStdout } from "./output.js";

/** Exit codes: 0 success, 1 a check failed, 2 bad input or usage, 3 unsatisfiable (plan). */
export const EXIT_BAD_INPUT = 2;
/** Exit code of `plan`, `search`, `draw --search` and `forecast` when the formula has no solution. */
export const EXIT_UNSATISFIABLE = 3;

/** An error meant for the user: printed as one line, no stack trace. */
export class UserError extends Error {
  constructor(message: string, readonly exitCode = EXIT_BAD_INPUT) {
    super(message);
  }
}

const CONTROL_NAMES: Record<string, string> = { "\n": "\\n", "\r": "\\r", "\t": "\\t" };

/**
 * A message as one line: control characters (a file name or an option value may hold a line
 * feed) are shown escaped, so that an error stays one line on standard error.
 */
export function oneLine(message: string): string {
  return message.replace(/[\x00-\x1f\x7f]/g, (c) => CONTROL_NAMES[c] ?? `\\x${c.charCodeAt(0).toString(16).padStart(2, "0")}`);
}

/** "1 clause", "2 clauses". */
export function plural(n: number | bigint, word: string, many = `${word}s`): string {
  return `${n} ${n === 1 || n === 1n ? word : many}`;
}

/** How an input is named in messages. */
export function displayName(path: string): string {
  return path === "-" ? "<stdin>" : path;
}

/** Where the header's counts stand in each input loaded this run (by path as given). */
const headers = new Map<string, { readonly line: number; readonly variables: number }>();

/**
 * Where a message about the header's VARIABLES count points: FILE:LINE:COLUMN of that count, or
 * the file alone when its header was not seen.
 */
export function headerWhere(file: string): string {
  const h = headers.get(file);
  return h === undefined ? displayName(file) : `${displayName(file)}:${h.line}:${h.variables}`;
}

/** Most variables a circuit-making command accepts (the search register is one qubit per variable). */
export const MAX_CIRCUIT_VARIABLES = 1_000_000;

/**
 * Refuses formulas whose search register would be too large to build: with a full register
 * (one qubit per declared variable), more than MAX_CIRCUIT_VARIABLES declared variables. A free
 * register holds only the free variables: its size is checked once known (checkFreeRegister).
 */
export function checkCircuitSize(cnf: Cnf, file: string, command: string, register: "full" | "free" = "full"): void {
  if (register === "full" && cnf.variables > MAX_CIRCUIT_VARIABLES) {
    throw new UserError(`${headerWhere(file)}: error: the header declares ${cnf.variables} variables; clausegate ${command} builds search registers of at most ${MAX_CIRCUIT_VARIABLES} qubits (one per declared variable with --register full); hint: declare only the variables the formula uses, or use --register free`);
  }
}

/** Refuses a free search register of more than MAX_CIRCUIT_VARIABLES qubits (see checkCircuitSize). */
export function checkFreeRegister(qubits: number, file: string, command: string): void {
  if (qubits > MAX_CIRCUIT_VARIABLES) {
    throw new UserError(`${displayName(file)}: error: the free search register has ${qubits} qubits; clausegate ${command} builds search registers of at most ${MAX_CIRCUIT_VARIABLES} qubits; hint: clausegate plan gives the numbers of the search`);
  }
}

/**
 * Refuses, for a check (verify, oracle --verify or --prove), more than MAX_CIRCUIT_VARIABLES
 * declared variables whatever the register: a counterexample is an assignment of every declared
 * variable (a free register's value completed to one).
 */
export function checkCheckSize(cnf: Cnf, file: string, command: string): void {
  if (cnf.variables > MAX_CIRCUIT_VARIABLES) {
    const leaveOut = command.startsWith("oracle ") ? `, or leave out ${command.slice(7)}` : "";
    throw new UserError(`${headerWhere(file)}: error: the header declares ${cnf.variables} variables; clausegate ${command} checks formulas of at most ${MAX_CIRCUIT_VARIABLES} declared variables, with --register free too (a counterexample is an assignment of every declared variable); hint: declare only the variables the formula uses${leaveOut}`);
  }
}

/** Loads and reads a DIMACS file ("-": standard input); prints warnings; throws UserError on the first error. */
export async function loadCnf(path: string): Promise<Cnf> {
  noteInput(path);
  const { cnf, diagnostics, header } = await readDimacsSource(path);
  printDiagnostics(diagnostics, displayName(path));
  if (cnf === undefined) throw new UserError("", EXIT_BAD_INPUT);
  if (header !== undefined) headers.set(path, header);
  return cnf;
}

export function printDiagnostics(ds: readonly Diagnostic[], file: string): void {
  for (const d of ds) process.stderr.write(`${oneLine(formatDiagnostic(d, file))}\n`);
}

/**
 * Writes an output through the run's output transaction (see output.ts): checked destination,
 * temporary file, renamed into place only when the command succeeds. `-` is standard output:
 * `stream` text goes there at once (a circuit), other text when the command succeeds.
 */
export function writeAtomic(path: string, produce: (write: (chunk: string) => void) => void, what = "the output", stream = false): void {
  writeOutput(path, what, produce, stream);
}

/** Writes to standard output in order (output.ts's: the commit then knows something was streamed). */
export { writeStdout };

/** "12 s", "3 min 5 s", "1 h 2 min": a remaining time for the progress bar. */
export function etaText(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return "estimating";
  const s = Math.round(seconds);
  if (s < 60) return `${s} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${s % 60} s`;
  return `${Math.floor(s / 3600)} h ${Math.floor((s % 3600) / 60)} min`;
}

/** Runs `work` with a progress bar (see progress) that never goes back, stopped however the work ends. */
export function withProgress<T>(label: string, work: (onProgress: (fraction: number) => void) => T): T {
  const bar = progress(label);
  let high = 0;
  try {
    return work((f) => {
      if (f < high) return;
      high = f;
      bar.update(f);
    });
  } finally {
    bar.stop();
  }
}

/**
 * A progress reporter that shows a bar on a TTY only, and only once the work has run for a
 * second (short runs stay quiet). The time left is our own estimate (elapsed / done x left),
 * shown as "estimating" until 2% is done rather than the bar library's non-finite figure.
 */
export function progress(label: string): { update: (fraction: number) => void; stop: () => void } {
  if (!process.stderr.isTTY) return { update: () => {}, stop: () => {} };
  const started = Date.now();
  let bar: Bar | undefined;
  return {
    update(fraction) {
      const elapsed = (Date.now() - started) / 1000;
      if (bar === undefined && elapsed < 1) return;
      const left = fraction >= 0.02 ? etaText((elapsed / fraction) * (1 - fraction)) : "estimating";
      if (bar === undefined) {
        // linewrap null: the terminal's line wrapping is left alone. An interrupt before any output
        // file exists ends the process at once (no handler, see output.ts), so a bar that turned
        // wrapping off could never turn it on again.
        bar = new Bar({ format: `${label} [{bar}] {percentage}% | {left} left`, stream: process.stderr, etaBuffer: 1, linewrap: null, hideCursor: false }, Presets.shades_classic);
        bar.start(1000, Math.round(Math.min(1, Math.max(0, fraction)) * 1000), { left });
      }
      bar.update(Math.round(Math.min(1, Math.max(0, fraction)) * 1000), { left });
    },
    stop() {
      bar?.stop();
    },
  };
}
