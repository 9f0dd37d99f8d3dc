/** Shared argument checks for the commands. */
import type { OracleOptions } from "../internal.js";
import { UserError } from "./io.js";

/** The single FILE|- positional of a command. */
export function oneInput(positionals: string[], command: string): string {
  if (positionals.length !== 1) {
    throw new UserError(
      `clausegate ${command}: error: expected one input file (or - for standard input) but got ${positionals.length}; hint: see clausegate ${command} --help`,
    );
  }
  return positionals[0]!;
}

/** Parses an integer option within [min, max]; undefined when absent. */
export function intOption(raw: string | undefined, name: string, min: number, max: number): number | undefined {
  if (raw === undefined) return undefined;
  const v = /^\d+$/.test(raw) ? Number(raw) : NaN;
  if (!Number.isSafeInteger(v) || v < min || v > max) {
    throw new UserError(`clausegate: error: ${name} expects a whole number in ${min}..${max} but got '${raw}'; hint: give a value in that range`);
  }
  return v;
}

/** Parses an option with a closed set of values; `fallback` when absent. */
export function choice<T extends string>(raw: string | undefined, name: string, values: readonly T[], fallback: T): T {
  if (raw === undefined) return fallback;
  if ((values as readonly string[]).includes(raw)) return raw as T;
  throw new UserError(`clausegate: error: ${name} expects one of ${values.join(", ")} but got '${raw}'; hint: pick one of those`);
}

/** The oracle options every circuit-making command shares, for parseArgs. */
export const ORACLE_ARGS = {
  kind: { type: "string" },
  strategy: { type: "string" },
  basis: { type: "string" },
  uncompute: { type: "string" },
  "no-optimize": { type: "boolean" },
  "check-passes": { type: "boolean" },
} as const;

export const ORACLE_HELP = `  --kind phase|flag           phase: |x> -> (-1)^f(x)|x> (default); flag: |x>|b> -> |x>|b xor f(x)>
  --strategy wide|lean        wide: every clause bit kept, fewest T (default); lean: a clause counter, fewest qubits
  --basis mcx|toffoli|clifford+t
                              gate basis (default toffoli); mcx keeps multi-controlled gates whole
  --uncompute unitary|measured
                              unitary inverse (default) or measurement and fix-up (Gidney 2018)
  --no-optimize               skip the optimizer passes
  --check-passes              check the circuit's invariants after every pass (debug)`;

/** The oracle options given on the command line. */
export function oracleOptions(values: Record<string, string | boolean | undefined>): Required<OracleOptions> {
  const str = (k: string): string | undefined => values[k] as string | undefined;
  return {
    kind: choice(str("kind"), "--kind", ["phase", "flag"] as const, "phase"),
    strategy: choice(str("strategy"), "--strategy", ["wide", "lean"] as const, "wide"),
    basis: choice(str("basis"), "--basis", ["mcx", "toffoli", "clifford+t"] as const, "toffoli"),
    uncompute: choice(str("uncompute"), "--uncompute", ["unitary", "measured"] as const, "unitary"),
    optimize: values["no-optimize"] !== true,
    validatePasses: values["check-passes"] === true,
    // The library's defaults until the command line gains --register and --no-structure.
    register: "full",
    structure: true,
  };
}
