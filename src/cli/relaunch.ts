/**
 * The command over a large input runs in a child process whose C allocator returns freed memory.
 *
 * Why: glibc's malloc serves a block of 128 KB or more by a mapping of its own, returned to the
 * system when freed, but each such free raises that threshold to the block's size (up to 32 MB).
 * From then on blocks of that size come from the heap, where freed memory stays with the process.
 * A command whose runs allocate and free tables of many MB (`cost` of a million clauses, two V8
 * heaps and every run's tables) ends up holding some 100 MB it no longer uses. The threshold
 * given as an environment variable (`MALLOC_MMAP_THRESHOLD_`, read once, at process start) stays
 * fixed. Measured (2-core machine, the same figures): `cost` of the random 3-SAT million on two
 * threads 513-520 MB -> 396-408 MB at the same time (thresholds of 64 KB to 1 MB alike);
 * SATLIB `bw_large.d` 278 -> 217 MB. A command over small inputs is not started twice (some 60 ms).
 */
import { spawn } from "node:child_process";
import { fstatSync, statSync } from "node:fs";
import { constants } from "node:os";

/** The variable glibc reads. */
const THRESHOLD_VARIABLE = "MALLOC_MMAP_THRESHOLD_";
/** Its value: 1 MB (fewer mappings than 128 KB, the same peak). */
const THRESHOLD_BYTES = "1048576";
/** An input from this size on is worth the second start. */
export const RELAUNCH_FROM_BYTES = 256 << 10;

/** Signals passed on to the child (it cleans up its temporary files and dies of them). */
const FORWARDED = ["SIGINT", "SIGTERM", "SIGHUP"] as const;

/**
 * Whether the command should run in a child with the threshold set: on Linux with glibc, when the
 * variable is not set already (the child has it: no loop), and when an argument names a regular
 * file of RELAUNCH_FROM_BYTES or more (an option's value too: that only costs a start).
 */
export function shouldRelaunch(args: readonly string[], env: NodeJS.ProcessEnv = process.env, platform: string = process.platform): boolean {
  if (platform !== "linux" || env[THRESHOLD_VARIABLE] !== undefined) return false;
  if (!args.some(isLargeFile)) return false;
  const header = (process.report?.getReport() as { header?: { glibcVersionRuntime?: string } } | undefined)?.header;
  return header?.glibcVersionRuntime !== undefined;
}

function isLargeFile(arg: string): boolean {
  // `-` is standard input (a file redirected there counts); `--circuit=FILE` names its file after `=`.
  const path = arg === "-" ? "-" : arg.startsWith("--") && arg.includes("=") ? arg.slice(arg.indexOf("=") + 1) : arg;
  if (path === "" || (path.startsWith("-") && path !== "-")) return false;
  try {
    const s = path === "-" ? fstatSync(0) : statSync(path, { throwIfNoEntry: false });
    return s !== undefined && s.isFile() && s.size >= RELAUNCH_FROM_BYTES;
  } catch {
    return false;
  }
}

/** Set in the child's environment (and removed there at once): it is the command relaunched. */
export const RELAUNCHED_VARIABLE = "CLAUSEGATE_RELAUNCHED";

/**
 * Runs the command in a child process with the threshold set, when shouldRelaunch says so, and
 * ends this process as the child ended (its exit code, or the same signal); `runHere` otherwise,
 * or when the child cannot be started. Standard streams are the child's own (inherited).
 */
export function runCommand(runHere: () => void, argv: readonly string[] = process.argv): void {
  if (!shouldRelaunch(argv.slice(2))) {
    runHere();
    return;
  }
  // The channel tells the child when this process is gone (killed outright): it then stops
  // and writes nothing, as this process would have (start.ts).
  const child = spawn(process.execPath, [...process.execArgv, ...argv.slice(1)], {
    stdio: ["inherit", "inherit", "inherit", "ipc"],
    env: { ...process.env, [THRESHOLD_VARIABLE]: THRESHOLD_BYTES, [RELAUNCHED_VARIABLE]: "1" },
  });
  const forward = new Map<NodeJS.Signals, () => void>();
  for (const sig of FORWARDED) {
    const h = (): void => {
      child.kill(sig);
    };
    forward.set(sig, h);
    process.on(sig, h);
  }
  const stopForwarding = (): void => {
    for (const [sig, h] of forward) process.removeListener(sig, h);
  };
  let started = false;
  child.once("spawn", () => (started = true));
  child.once("error", () => {
    // Not started (no process to spare): the command runs here, as it would have.
    if (started) return;
    stopForwarding();
    runHere();
  });
  child.once("exit", (code, signal) => {
    stopForwarding();
    if (signal === null) {
      process.exit(code ?? 70);
    }
    // Die of the same signal where that is what the caller would have seen (the ones passed on, a
    // kill); otherwise (a core dump, a signal Node ignores) its conventional status.
    const status = 128 + (constants.signals[signal] ?? 0);
    if ((FORWARDED as readonly string[]).includes(signal) || signal === "SIGKILL") {
      process.kill(process.pid, signal);
      // Delivered at once with its default action; should it not be, the status says the same.
      setTimeout(() => process.exit(status), 1000).unref();
      return;
    }
    process.exit(status);
  });
}
