/** `clausegate count FILE|-`: variables, clauses and the exact model count. */
import { clauseCount, countModels, DEFAULT_COUNT_LIMIT, MAX_COUNT_LIMIT } from "../internal.js";
import { headerWhere, loadCnf, progress, UserError } from "./io.js";
import { intOption, oneInput, parseCommandArgs } from "./options.js";

export const countHelp = `Usage: clausegate count FILE|- [options]

Reads a DIMACS CNF file ("-" for standard input) and prints its number of variables, clauses and
satisfying assignments (models), counted exactly by exhaustive enumeration. Declared variables
that occur in no clause double the count without costing time.

Gate definitions that the clauses encode (AND, OR, XOR, NOT, equivalence: see clausegate
structure) are computed rather than enumerated: only the free variables they leave are
enumerated, so a Tseitin-encoded circuit costs 2^inputs, not 2^variables. When recovery does
not shrink the enumeration, every variable occurring in a clause is enumerated (above 30 of
them, with splitting and unit propagation).

Options:
  --json                 print {"variables":..,"clauses":..,"models":..,"log2_models":..}; models
                         is a number up to 2^53 - 1, a decimal string above (exact either way);
                         log2_models is its base-2 logarithm (null for 0)
  --max-variables N      refuse to enumerate more than N variables: the free variables left by
                         structure recovery, else those occurring in clauses (default ${DEFAULT_COUNT_LIMIT}, at most ${MAX_COUNT_LIMIT})
  --no-structure         skip structure recovery: enumerate every variable occurring in a clause
  --threads N            worker threads (default: number of cores)
  -h, --help             show this help
Exit codes: 0 (an unsatisfiable formula too: models 0), 2 bad input or usage.
`;

export async function countCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs("count", {
    args: argv,
    allowPositionals: true,
    options: {
      json: { type: "boolean" },
      "max-variables": { type: "string" },
      "no-structure": { type: "boolean" },
      threads: { type: "string" },
      help: { type: "boolean", short: "h" },
    },
  });
  if (values.help) {
    process.stdout.write(countHelp);
    return 0;
  }
  const file = oneInput(positionals, "count");
  const maxVariables = intOption(values["max-variables"], "--max-variables", 0, MAX_COUNT_LIMIT) ?? DEFAULT_COUNT_LIMIT;
  const threads = intOption(values.threads, "--threads", 1, 256);
  const cnf = await loadCnf(file);
  const bar = progress("counting");
  const r = await countModels(cnf, {
    maxVariables,
    structure: values["no-structure"] !== true,
    ...(threads === undefined ? {} : { threads }),
    onProgress: bar.update,
  });
  bar.stop();
  // A count refused for its size is the input's doing: point at the header's VARIABLES count.
  if (!r.ok) throw new UserError(`${r.doubling !== undefined ? headerWhere(file) : "clausegate count"}: error: ${r.reason}`);
  const clauses = clauseCount(cnf);
  if (values.json) {
    // As plan --json does: a count a double cannot hold exactly is a decimal string (JSON readers
    // parse long number literals into doubles, silently rounded), with its base-2 logarithm beside.
    const models = r.models <= BigInt(Number.MAX_SAFE_INTEGER) ? String(r.models) : `"${r.models}"`;
    process.stdout.write(`{"variables":${cnf.variables},"clauses":${clauses},"models":${models},"log2_models":${JSON.stringify(log2Big(r.models))}}\n`);
  } else {
    process.stdout.write(`variables ${cnf.variables}\nclauses   ${clauses}\nmodels    ${r.models}\n`);
  }
  return 0;
}

/** log2 of a non-negative whole number (null for 0), from its top 53 bits. */
function log2Big(x: bigint): number | null {
  if (x === 0n) return null;
  const bits = x.toString(2).length;
  if (bits <= 53) return Math.log2(Number(x));
  return bits - 53 + Math.log2(Number(x >> BigInt(bits - 53)));
}
