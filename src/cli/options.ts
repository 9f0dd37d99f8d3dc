/** Shared argument checks for the commands. */
import { parseArgs, type ParseArgsConfig } from "node:util";
import { compilePlanned, planConstruction, searchConstruction, type Cnf, type Oracle, type OracleOptions, type RegisterMode } from "../internal.js";
import { plural, UserError, withProgress } from "./io.js";
import { noteInput } from "./output.js";

/**
 * Node's parseArgs, refusing an option given twice with different values: parseArgs keeps the
 * last, and the first would be dropped without a word.
 */
export function parseCommandArgs<T extends ParseArgsConfig>(command: string, config: T): ReturnType<typeof parseArgs<T>> {
  const parsed = parseArgs(config);
  if ((parsed.values as Record<string, unknown>)["help"] === true) return parsed;
  const given = new Map<string, string>();
  for (const t of parseArgs({ ...config, tokens: true }).tokens ?? []) {
    if (t.kind !== "option" || t.value === undefined) continue;
    const before = given.get(t.name);
    if (before !== undefined && before !== t.value) {
      throw new UserError(`clausegate ${command}: error: --${t.name} is given twice, as '${before}' and as '${t.value}'; hint: give it once`);
    }
    given.set(t.name, t.value);
  }
  return parsed;
}

/** The single FILE|- positional of a command. */
export function oneInput(positionals: string[], command: string): string {
  if (positionals.length !== 1) {
    throw new UserError(
      `clausegate ${command}: error: expected one input file (or - for standard input) but got ${positionals.length}; hint: see clausegate ${command} --help`,
    );
  }
  // Noted now, so that an output's destination, checked before the input is read, may not be it.
  noteInput(positionals[0]!);
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
  construction: { type: "string" },
  "max-qubits": { type: "string" },
  prefer: { type: "string" },
} as const;

/** Largest --max-qubits accepted (the circuit's qubit limit). */
const MAX_BUDGET = 1 << 30;

export const ORACLE_HELP = `  --kind phase|flag           phase: |x> -> (-1)^f(x)|x> (default); flag: |x>|b> -> |x>|b xor f(x)>
  --strategy wide|lean        wide: every clause bit kept, fewest T (default); lean: a clause counter, fewest qubits
  --basis mcx|toffoli|clifford+t
                              gate basis (default toffoli); mcx keeps multi-controlled gates whole
  --uncompute unitary|measured
                              unitary inverse (default) or measurement and fix-up (Gidney 2018)
  --construction NAME         build this construction: wide, lean, blocks-B (blocks of B clauses, each block's
                              bit stored and its clause bits erased), blocks-B1xB2... (blocks of blocks),
                              blocks-B-held-H (H clauses held as in wide), fanout-U (wide with CNOT copies
                              of each variable for every U readings: low T-depth), blocks-...-fanout-U;
                              with recovered structure the blocks hold its checks (definitions, parities,
                              groups, remaining clauses); clausegate cost --front lists the ones worth having
  --max-qubits Q              the cheapest construction whose qubits (search, work and target) are at most
                              Q; exit 2, naming the smallest Q that works, when none fits
  --prefer t-count|t-depth    what cheapest means (default t-count; ties go to the other, then to fewer
                              qubits); without --max-qubits, chooses among every construction
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
 * The oracle options given on the command line: the basic ones and the register's filled with
 * their defaults; the strategy, construction, budget and preference only when given (a given
 * strategy fixes the construction, a default one does not).
 */
export type CliOracleOptions = Required<Pick<OracleOptions, "kind" | "basis" | "uncompute" | "optimize" | "validatePasses" | "register" | "structure">> & OracleOptions;

/**
 * The oracle options given on the command line; the register options too when the command
 * parses REGISTER_ARGS (`fallback`: its default register).
 */
export function oracleOptions(values: Record<string, string | boolean | undefined>, fallback: RegisterMode = "full"): CliOracleOptions {
  const str = (k: string): string | undefined => values[k] as string | undefined;
  const strategy = str("strategy") === undefined ? undefined : choice(str("strategy"), "--strategy", ["wide", "lean"] as const, "wide");
  const construction = str("construction");
  if (strategy !== undefined && construction !== undefined) {
    throw new UserError("clausegate: error: --strategy and --construction both name the construction; hint: give one of them (--construction wide is --strategy wide)");
  }
  const prefer = str("prefer") === undefined ? undefined : choice(str("prefer"), "--prefer", ["t-count", "t-depth"] as const, "t-count");
  if (prefer !== undefined && (strategy !== undefined || construction !== undefined)) {
    throw new UserError(`clausegate: error: --prefer chooses a construction, and --${strategy !== undefined ? "strategy" : "construction"} names one; hint: leave out one of them`);
  }
  const maxQubits = intOption(str("max-qubits"), "--max-qubits", 1, MAX_BUDGET);
  return {
    kind: choice(str("kind"), "--kind", ["phase", "flag"] as const, "phase"),
    basis: choice(str("basis"), "--basis", ["mcx", "toffoli", "clifford+t"] as const, "toffoli"),
    uncompute: choice(str("uncompute"), "--uncompute", ["unitary", "measured"] as const, "unitary"),
    optimize: values["no-optimize"] !== true,
    validatePasses: values["check-passes"] === true,
    ...registerOptions(values, fallback),
    ...(strategy !== undefined ? { strategy } : {}),
    ...(construction !== undefined ? { construction } : {}),
    ...(maxQubits !== undefined ? { maxQubits } : {}),
    ...(prefer !== undefined ? { prefer } : {}),
  };
}

/** What to do about a construction plan that failed, for the hint. */
function planHint(o: OracleOptions, smallest: number | undefined, command: string): string {
  if (smallest === undefined) return `see clausegate ${command} --help for the construction names`;
  if (o.construction !== undefined || o.strategy !== undefined) {
    return `give --max-qubits ${smallest} or more, or leave out --${o.construction !== undefined ? "construction" : "strategy"} to choose a construction within the budget`;
  }
  return `give --max-qubits ${smallest} or more`;
}

/**
 * Compiles the oracle the options ask for. A name that is no construction, or a budget that
 * nothing meets, is a usage error (exit 2) naming the smallest budget that works.
 */
export function compileWithOptions(cnf: Cnf, o: CliOracleOptions, command: string): Oracle {
  const plan = planConstruction(cnf, o);
  if (!plan.ok) throw new UserError(`clausegate ${command}: error: ${plan.message}; hint: ${planHint(o, plan.smallestQubits, command)}`);
  const oracle = withProgress("compiling", (onProgress) => compilePlanned(cnf, { ...o, onProgress }, plan));
  if (oracle === null) {
    throw new UserError(`clausegate ${command}: error: no construction's ${o.basis} circuit fits in ${plural(o.maxQubits ?? Infinity, "qubit")}; hint: raise --max-qubits, or try --basis clifford+t`);
  }
  return oracle;
}

/**
 * For a search: settles the oracle's construction once (a budget covers the oracle and the
 * diffusion, which take turns on the work qubits), so that estimating and building the circuit
 * count nothing again. A budget nothing meets is a usage error naming the smallest that works.
 */
export function settleSearchOptions(cnf: Cnf, o: CliOracleOptions, command: string): CliOracleOptions {
  if (o.maxQubits === undefined && o.prefer === undefined && o.construction === undefined) return o;
  const r = searchConstruction(cnf, { ...o, iterations: 1 });
  if (!r.ok) throw new UserError(`clausegate ${command}: error: ${r.message}; hint: ${planHint(o, r.smallestQubits, command)}`);
  const { prefer: _prefer, strategy: _strategy, ...rest } = o;
  return { ...rest, construction: r.construction };
}

/** The construction the options name, for titles and comments ("chosen" until it is settled). */
export function constructionLabel(o: OracleOptions): string {
  return o.construction ?? o.strategy ?? (o.maxQubits !== undefined || o.prefer !== undefined ? "chosen" : "wide");
}

/** How comments and titles name a construction: "strategy wide" as before for wide and lean, else "construction NAME". */
export function constructionPhrase(name: string): string {
  return name === "wide" || name === "lean" ? `strategy ${name}` : `construction ${name}`;
}

/** The basic options alone (kind, basis, uncompute, optimize, checks, register): no construction, budget or preference. */
export function basicOptions(o: CliOracleOptions): CliOracleOptions {
  return { kind: o.kind, basis: o.basis, uncompute: o.uncompute, optimize: o.optimize, validatePasses: o.validatePasses, register: o.register, structure: o.structure };
}
