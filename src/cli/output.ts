/**
 * Output files as one transaction per command run.
 *
 * A command writes each output to a short-named temporary file beside its destination; nothing
 * reaches the destination until the command has finished successfully and pending signals have
 * been handled (`commitOutputs`). On an error, or on SIGINT/SIGTERM/SIGHUP, every temporary file
 * is removed (`discardOutputs`) and the signal is raised again, so the caller sees the
 * conventional status (128 + signal number in a shell).
 *
 * Destinations are checked before any byte is written: `-` is standard output; an existing path
 * must be a regular file (a symbolic link is written through to the regular file it names);
 * devices, FIFOs, sockets and folders are refused rather than replaced; no destination may be an
 * input of the run, and no two outputs of the run may be the same file.
 */
import { randomBytes } from "node:crypto";
import {
  chmodSync, chownSync, closeSync, existsSync, fstatSync, lstatSync, openSync, realpathSync, renameSync, rmSync, statSync, writeSync,
  type Stats,
} from "node:fs";
import { basename, dirname, join, resolve } from "node:path";

/** Thrown for a destination that cannot or must not be written; the CLI prints it as one line, exit 2. */
export class OutputError extends Error {}

interface Pending {
  readonly tmp: string;
  readonly dest: string;
}

const pending: Pending[] = [];
/** Files read by this run (device:inode), and destinations claimed so far (by resolved path). */
const inputs = new Map<string, string>();
const claimed = new Map<string, string>();
/** Standard-output text held back until the run succeeds (small reports, not streamed circuits). */
let heldStdout: string[] = [];

const fileId = (s: Stats): string => `${s.dev}:${s.ino}`;

/** Records a file the run reads, so that no output may replace it. */
export function noteInput(path: string): void {
  try {
    // Standard input redirected from a file (oracle - -o f.cnf < f.cnf) is that file.
    if (path === "-") {
      const s = fstatSync(0);
      if (s.isFile()) inputs.set(fileId(s), "on standard input");
      return;
    }
    inputs.set(fileId(statSync(path)), path);
  } catch {
    // An input that cannot be stat'ed is reported by the reader.
  }
}

function kindOf(s: Stats): string {
  if (s.isDirectory()) return "a folder";
  if (s.isCharacterDevice()) return "a character device";
  if (s.isBlockDevice()) return "a block device";
  if (s.isFIFO()) return "a FIFO";
  if (s.isSocket()) return "a socket";
  return "not a regular file";
}

/**
 * Where the bytes for `path` really go: the path itself, or for a symbolic link the regular
 * file it names. Refuses what is not (or would not be) a regular file, an input, or a
 * destination already claimed by this run.
 */
function destination(path: string, what: string): { dest: string; existing: Stats | undefined } {
  if (path === "") throw new OutputError(`clausegate: error: the path given for ${what} is empty; hint: name a file, or - for standard output`);
  // resolve() would drop a trailing slash or dot: "out.qasm/" names a folder, not the file.
  if (/\/$|(^|\/)\.{1,2}$/.test(path)) throw new OutputError(`${path}: error: ${what} needs a file name, and this path names a folder; hint: name a file, e.g. ${join(path, "out")}`);
  let dest = resolve(path);
  let existing: Stats | undefined;
  try {
    const l = lstatSync(dest);
    if (l.isSymbolicLink()) {
      try {
        existing = statSync(dest);
      } catch (e) {
        const loop = (e as { code?: string }).code === "ELOOP";
        throw new OutputError(`${path}: error: ${what} would go through ${loop ? "a loop of symbolic links" : "a symbolic link to nothing"}; hint: remove the link or name a regular file`);
      }
      if (existing.isFile()) dest = realpathSync(dest);
    } else existing = l;
  } catch (e) {
    if (e instanceof OutputError) throw e;
    // A name too long, a path through a regular file, a folder not readable: nothing can be
    // written there; said in one line, as for the write itself.
    if ((e as { code?: string }).code !== "ENOENT") throw new OutputError(`${path}: error: cannot write ${what} (${reason(e)}); hint: name a writable file`);
    // No such file: its folder must exist (said now, not after the work that makes the output).
    try {
      if (!statSync(dirname(dest)).isDirectory()) throw Object.assign(new Error("ENOTDIR"), { code: "ENOTDIR" });
    } catch (f) {
      throw new OutputError(`${path}: error: cannot write ${what} (${reason(f, dest)}); hint: check that the folder exists, is writable and has space`);
    }
  }
  if (existing !== undefined && !existing.isFile()) {
    throw new OutputError(`${path}: error: refusing to replace ${kindOf(existing)} with ${what}; hint: name a regular file${existing.isDirectory() ? " inside it" : ", or - for standard output"}`);
  }
  if (existing !== undefined) {
    const input = inputs.get(fileId(existing));
    if (input !== undefined) throw new OutputError(`${path}: error: ${what} would replace the input ${input}; hint: write it to another file`);
  }
  // The same file may be named through a symbolic link to a folder or a hard link: compare the
  // real folder and name (and, for a file that exists, its device and inode).
  let key = dest;
  try {
    key = join(realpathSync(dirname(dest)), basename(dest));
  } catch {
    // A missing folder is reported when the temporary file cannot be made.
  }
  const keys = existing !== undefined ? [key, fileId(existing)] : [key];
  for (const k of keys) {
    const other = claimed.get(k);
    // The same output claimed again (checked when the arguments were read, then written) is no clash.
    if (other !== undefined && other !== what) throw new OutputError(`${path}: error: ${what} and ${other} name the same file; hint: give them different paths`);
  }
  for (const k of keys) claimed.set(k, what);
  return { dest, existing };
}

/**
 * A short human reason for a file-system error. ENOENT is "no such folder" only when the
 * destination's folder is missing (`dest`); elsewhere (a file system that makes no files there,
 * such as /proc) it is the errno's own meaning.
 */
function reason(e: unknown, dest?: string): string {
  const code = (e as { code?: string }).code;
  switch (code) {
    case "ENOENT": return dest === undefined || !existsSync(dirname(dest)) ? "no such folder" : errnoMeaning(e);
    case "EISDIR": return "it is a folder";
    case "EACCES": case "EPERM": return "permission denied";
    case "ENOSPC": return "no space left on the device";
    case "EDQUOT": return "disk quota exceeded";
    case "EROFS": return "read-only file system";
    case "ENAMETOOLONG": return "the name is too long";
    case "ENOTDIR": return "a part of the path is not a folder";
    default: return errnoMeaning(e);
  }
}

/** The errno's meaning as Node words it ("no such file or directory"), with its code. */
function errnoMeaning(e: unknown): string {
  const code = (e as { code?: string }).code;
  const m = /^[A-Z0-9_]+: ([^,]+)/.exec((e as { message?: string }).message ?? "");
  if (code === undefined) return String(e);
  return m === null ? code : `${m[1]} (${code})`;
}

/** Is this error a file-system failure (to be reported in one line), rather than a bug? */
export function isIoError(e: unknown): boolean {
  return typeof (e as { code?: unknown }).code === "string" && (e as { syscall?: unknown }).syscall !== undefined;
}

/**
 * Writes one output. `path` "-" streams to standard output at once; any other path is written
 * to a temporary file that {@link commitOutputs} renames into place. `what` names the output
 * in messages (e.g. "the circuit", "the report").
 */
export function writeOutput(path: string, what: string, produce: (write: (chunk: string) => void) => void, stream = false): void {
  if (path === "-" || standardStream(path, what) === 1) {
    destinationStdout(what);
    // A circuit may be hundreds of MB: streamed. Anything else waits for the run to succeed, so
    // that a later output's failure prints nothing before its error line.
    if (stream) produce(writeStdout);
    else {
      const parts: string[] = [];
      produce((chunk) => parts.push(chunk));
      printLater(parts.join(""));
    }
    return;
  }
  const { dest, existing } = destination(path, what);
  // Short temporary names: the destination's own name may already be 255 bytes long.
  const tmp = join(dirname(dest), `.cg${process.pid.toString(36)}${randomBytes(3).toString("hex")}.tmp`);
  let fd = -1;
  // Before the file exists: a signal from here on is deferred to the handler, which removes it.
  cleanUpOnSignals();
  try {
    fd = openSync(tmp, "wx", existing ? existing.mode & 0o7777 : 0o666);
    pending.push({ tmp, dest });
    const f = fd;
    produce((chunk) => {
      writeSync(f, chunk);
    });
    if (existing) keepOwnership(f, existing);
    closeSync(fd);
    fd = -1;
  } catch (e) {
    if (fd >= 0) closeSync(fd);
    if (!isIoError(e)) throw e;
    throw new OutputError(`${path}: error: cannot write ${what} (${reason(e, dest)}); hint: check that the folder exists, is writable and has space`);
  }
}

/** A replaced file keeps its mode (and, when we may set it, its owner). */
function keepOwnership(fd: number, was: Stats): void {
  const now = fstatSync(fd);
  if ((now.mode & 0o7777) !== (was.mode & 0o7777)) chmodSync(`/proc/self/fd/${fd}`, was.mode & 0o7777);
  if ((now.uid !== was.uid || now.gid !== was.gid) && process.getuid?.() === 0) {
    try {
      chownSync(`/proc/self/fd/${fd}`, was.uid, was.gid);
    } catch {
      // Not every file system lets even root give files away; the mode is what matters.
    }
  }
}

let stdoutClaim: string | undefined;
function destinationStdout(what: string): void {
  if (stdoutClaim !== undefined && stdoutClaim !== what) {
    throw new OutputError(`clausegate: error: ${what} and ${stdoutClaim} both go to standard output; hint: write one of them to a file`);
  }
  stdoutClaim = what;
}

/**
 * Claims an output's destination right after the arguments are read, before any input is read or
 * any work done: standard output for `what` when `path` is "-" (text a command prints passes "-"),
 * else the file, checked as writing it will check it (an empty path, a missing folder, a folder,
 * device or input in its place, another output of the run on the same file). A command claims
 * every output before it writes any of them: a clash found only at the second output would come
 * after the first had already reached standard output, or after minutes of compiling.
 */
export function claimOutput(what: string, path: string | undefined): void {
  if (path === "-" || (path !== undefined && standardStream(path, what) === 1)) destinationStdout(what);
  else if (path !== undefined) destination(path, what);
}

/**
 * 1 when `path` is the file standard output already writes (/dev/stdout, /proc/self/fd/1, or the
 * file it is redirected to): written through it, as `-`, never replaced (a rename over it would
 * drop what the shell appended and what else the run prints). Standard error's file is refused.
 */
function standardStream(path: string, what: string): 1 | undefined {
  if (path === "") return undefined;
  let id: string;
  try {
    id = fileId(statSync(path));
  } catch {
    return undefined;
  }
  const idOf = (fd: number): string | undefined => {
    try {
      return fileId(fstatSync(fd));
    } catch {
      return undefined;
    }
  };
  if (id === idOf(1)) return 1;
  if (id === idOf(2)) throw new OutputError(`${path}: error: ${what} would go to standard error's file; hint: write it to standard output with -o - or name another file`);
  return undefined;
}

/** Writes to standard output now (streamed output; synchronous for files and pipes on Linux). */
export function writeStdout(chunk: string): void {
  streamed = true;
  process.stdout.write(chunk);
}

/** Standard-output text that appears only if the run succeeds (so an error prints nothing before it). */
export function printLater(text: string): void {
  heldStdout.push(text);
}

/**
 * Lets pending signal handlers run: a long synchronous stage defers them, and libuv hands a
 * signal to JavaScript only on a later turn of the event loop (one immediate is not enough).
 */
export async function checkpoint(): Promise<void> {
  await new Promise((done) => setTimeout(done, 1));
  await new Promise((done) => setImmediate(done));
  await new Promise((done) => setImmediate(done));
}

/** Output streamed to standard output this run (writeStdout). */
let streamed = false;

/**
 * Prints held-back output, lets a failure of standard output reach its error handler (start.ts:
 * it ends the run, and no file is moved), then moves every temporary file onto its destination.
 */
export async function commitOutputs(): Promise<void> {
  const text = heldStdout.join("");
  heldStdout = [];
  if (text !== "") process.stdout.write(text);
  // Writes to files and pipes are synchronous on Linux; their errors are emitted on the next
  // ticks, before these turns of the event loop end (a stub that never calls back is no wait).
  if (text !== "" || streamed) {
    await new Promise((done) => setImmediate(done));
    await new Promise((done) => setImmediate(done));
  }
  movePending();
}

/** Whether `path` names the file standard output writes (so that it is written as `-`). */
export function isStandardOutput(path: string): boolean {
  if (path === "-") return true;
  try {
    return standardStream(path, "the output") === 1;
  } catch {
    return false;
  }
}

function movePending(): void {
  try {
    for (const p of pending) renameSync(p.tmp, p.dest);
  } catch (e) {
    discardOutputs();
    throw new OutputError(`clausegate: error: cannot move the output into place (${reason(e)}); hint: check the folder's permissions`);
  }
  pending.length = 0;
}

/**
 * Standard output's reader went away (clausegate oracle f.cnf --report r.json | head): not an
 * error. The files written so far are whole (each is written in one synchronous stage) and are
 * moved into place, as a run whose output was read to the end would have.
 */
export function settleOnClosedReader(): void {
  try {
    movePending();
  } catch {
    discardOutputs();
  }
}

/** Removes every temporary file of the run and forgets held-back output. */
export function discardOutputs(): void {
  for (const p of pending) rmSync(p.tmp, { force: true });
  pending.length = 0;
  heldStdout = [];
}

const SIGNALS = ["SIGINT", "SIGTERM", "SIGHUP"] as const;

/** The handlers installed, so that only they are removed. */
const handlers = new Map<NodeJS.Signals, () => void>();
const removeHandlers = (): void => {
  for (const [s, h] of handlers) process.removeListener(s, h);
  handlers.clear();
};

/**
 * On SIGINT, SIGTERM or SIGHUP: remove the temporary files, then die of the same signal
 * (the conventional status for the caller). Installed when the first temporary file is about to
 * be made, not before: a JavaScript handler runs only between turns of the event loop, so while
 * one is installed an interrupt waits for the synchronous stage to end (seconds of compiling or
 * proving); before any file exists, the default action ends the process at once.
 */
export function cleanUpOnSignals(): void {
  if (handlers.size > 0) return;
  for (const sig of SIGNALS) {
    const h = (): void => {
      discardOutputs();
      removeHandlers();
      process.kill(process.pid, sig);
    };
    handlers.set(sig, h);
    process.once(sig, h);
  }
}

/** Forgets the run's state (for in-process callers that run several commands). */
export function resetOutputs(): void {
  discardOutputs();
  inputs.clear();
  claimed.clear();
  stdoutClaim = undefined;
  streamed = false;
  removeHandlers();
}
