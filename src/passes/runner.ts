/** Runs a list of passes; in debug mode validates after each one and blames the pass by name. */
import { recycleCircuit, type Circuit } from "../ir/circuit.js";
import { validateCircuit } from "../ir/validate.js";
import { PASSES } from "./registry.js";

export interface RunPassesOptions {
  /** Validate the circuit after every pass (debug mode). */
  readonly validate?: boolean;
  /** Called with each pass's name and its output (for --trace). */
  readonly onPass?: (name: string, c: Circuit) => void;
  /**
   * Recycle the buffers of intermediate circuits (never the input) for later passes. Only for
   * callers that keep none of the intermediates; ignored when `onPass` is given.
   */
  readonly recycle?: boolean;
  /** Told after each pass how many of the passes named have run (for a progress display). */
  readonly onProgress?: (done: number, total: number) => void;
}

/** Thrown when a pass leaves a circuit that breaks an invariant. */
export class PassError extends Error {
  constructor(
    /** The pass that ran last. */
    readonly pass: string,
    /** The invariant its output breaks. */
    readonly invariant: string,
  ) {
    super(`pass '${pass}' broke an invariant: ${invariant}`);
  }
}

export function runPasses(c: Circuit, names: readonly string[], opts: RunPassesOptions = {}): Circuit {
  // A pass returns its input object when it changes nothing; a pass whose input is exactly its
  // own last output (nothing ran in between that changed the circuit) is not run again.
  const lastOutput = new Map<string, Circuit>();
  const input = c;
  const recycle = opts.recycle === true && opts.onPass === undefined;
  let done = 0;
  for (const name of names) {
    done++;
    opts.onProgress?.(done - 1, names.length);
    const pass = PASSES[name];
    if (pass === undefined) throw new Error(`unknown pass '${name}'`);
    if (lastOutput.get(name) === c) continue;
    const before = c;
    c = pass.run(c);
    if (recycle && c !== before && before !== input) recycleCircuit(before);
    lastOutput.set(name, c);
    if (opts.validate) {
      const broken = validateCircuit(c);
      if (broken !== null) throw new PassError(name, broken);
    }
    opts.onPass?.(name, c);
  }
  opts.onProgress?.(names.length, names.length);
  return c;
}
