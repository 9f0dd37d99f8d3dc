/** Shared argument checks for the commands. */
import type { OracleOptions, RegisterMode } from "../internal.js";
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

/**
 * The search-register options (issue 9), beside ORACLE_ARGS: every command that compiles or
 * plans takes them. `--reduce`, where a command had it, is an alias of `--register free`.
 */
export const REGISTER_ARGS = {
  register: { type: "string" },
  "no-structure": { type: "boolean" },
} as const;

/** Help lines of REGISTER_ARGS, with the command's default register marked. */
export function registerHelp(fallback: RegisterMode): string {
  const mark = (m: RegisterMode): string => (m === fallback ? " (default)" : "");
  return `  --register full|free        the search register. full${mark("full")}: every declared variable, vars[v-1] is
                              variable v, and the oracle marks exactly the models. free${mark("free")}: only the
                              variables left free by unit propagation (variables in no clause dropped)
                              and structure recovery; the oracle computes the others from them and
                              marks a register value when some model extends it
  --no-structure              skip structure recovery (gate definitions, parities, one-hot groups): the
                              clause construction alone, for comparison`;
}

/** The register options given on the command line; `fallback` is the command's default register. */
export function registerOptions(values: Record<string, string | boolean | undefined>, fallback: RegisterMode): { register: RegisterMode; structure: boolean } {
  const raw = values["register"] as string | undefined;
  if (values["reduce"] === true && raw !== undefined && raw !== "free") {
    throw new UserError(`clausegate: error: --reduce is an alias of --register free and contradicts --register ${raw}; hint: give one of them`);
  }
  return {
    register: choice(raw ?? (values["reduce"] === true ? "free" : undefined), "--register", ["full", "free"] as const, fallback),
    structure: values["no-structure"] !== true,
  };
}

/**
 * The oracle options given on the command line; the register options too when the command
 * parses REGISTER_ARGS (`fallback`: its default register).
 */
export function oracleOptions(values: Record<string, string | boolean | undefined>, fallback: RegisterMode = "full"): Required<OracleOptions> {
  const str = (k: string): string | undefined => values[k] as string | undefined;
  return {
    kind: choice(str("kind"), "--kind", ["phase", "flag"] as const, "phase"),
    strategy: choice(str("strategy"), "--strategy", ["wide", "lean"] as const, "wide"),
    basis: choice(str("basis"), "--basis", ["mcx", "toffoli", "clifford+t"] as const, "toffoli"),
    uncompute: choice(str("uncompute"), "--uncompute", ["unitary", "measured"] as const, "unitary"),
    optimize: values["no-optimize"] !== true,
    validatePasses: values["check-passes"] === true,
    ...registerOptions(values, fallback),
  };
}
