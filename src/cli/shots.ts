/**
 * `search --shots` and `search --complete`: measured register values completed to models. Shots
 * come from the exact state-vector simulator run on the search circuit itself (without its final
 * measurements), so what they show is what the written circuit does.
 */
import { basisTerm, compileSearch, runSparse, seededRandom, type Cnf, type OracleOptions } from "../internal.js";
import { displayName, headerWhere, MAX_CIRCUIT_VARIABLES, UserError } from "./io.js";
import { constructionLabel, constructionPhrase, intOption } from "./options.js";
import { bitsText, completeValue, modelLine, parseRegisterValue, registerText, type SearchProblem } from "./register.js";

/** Largest search register --shots simulates (2^16 basis states in superposition). */
export const MAX_SHOT_QUBITS = 16;
/** Largest simulation --shots runs: basis states times gates. */
const MAX_SHOT_WORK = 2 ** 31;
/** Most shots. */
const MAX_SHOTS = 1 << 16;

export const COMPLETE_ARGS = {
  shots: { type: "string" },
  seed: { type: "string" },
  complete: { type: "string" },
} as const;

export const SHOTS_HELP = `  --shots S                   simulate the search circuit (exact state vector, registers of at most ${MAX_SHOT_QUBITS}
                              qubits) and print S measured values (1..${MAX_SHOTS}), each completed to an
                              assignment of every variable (a DIMACS v line) and checked against the
                              formula; the circuit is then written only with -o
  --seed N                    seed of the shots and of mid-circuit measurement outcomes (default 1)
  --complete BITS[,BITS...]   complete values measured elsewhere (n bits 0/1 each, outcome[0] first) to
                              assignments, check and print them; builds nothing`;

/** What --shots, --seed and --complete ask for. */
export interface Sampling {
  readonly shots: number | undefined;
  readonly seed: number;
  readonly complete: string[] | undefined;
}

export function shotsOptions(values: Record<string, string | boolean | undefined>): Sampling {
  const shots = intOption(values["shots"] as string | undefined, "--shots", 1, MAX_SHOTS);
  const seed = intOption(values["seed"] as string | undefined, "--seed", 0, 2 ** 31 - 1) ?? 1;
  const raw = values["complete"] as string | undefined;
  if (raw !== undefined) {
    const clash = ["shots", "iterations", "solutions", "output", "report", "format", "seed"].find((k) => values[k] !== undefined);
    if (clash !== undefined) {
      throw new UserError(`clausegate search: error: --complete completes values measured elsewhere and builds nothing, so --${clash} does not apply; hint: drop --${clash}, or drop --complete to build (and with --shots simulate) the search`);
    }
  } else if (values["seed"] !== undefined && shots === undefined) {
    throw new UserError("clausegate search: error: --seed seeds the simulated shots; hint: add --shots S, or leave out --seed");
  }
  return { shots, seed, complete: raw === undefined ? undefined : raw.split(",").map((v) => v.trim()) };
}

/** Refuses completions that would list a huge header's variables. */
function checkListable(file: string, cnf: Cnf, what: string, lines: number): void {
  if (cnf.variables > MAX_CIRCUIT_VARIABLES) {
    throw new UserError(`${headerWhere(file)}: error: ${what} assigns every declared variable, and the header declares ${cnf.variables}; clausegate search prints at most ${MAX_CIRCUIT_VARIABLES}; hint: declare only the variables the formula uses`);
  }
  // All lines are one string on standard output (printed only once all is well): V8's strings
  // stop short of 2^29 characters (200 shots of a million variables, 1.6 GB, ended in exit 70).
  const bytes = lines * assignmentBytes(cnf.variables);
  if (bytes > MAX_LISTING_BYTES) {
    throw new UserError(`${displayName(file)}: error: ${what} would print ${lines} assignment${lines === 1 ? "" : "s"} of ${cnf.variables} variables, about ${Math.ceil(bytes / 2 ** 20)} MB; clausegate search prints at most ${MAX_LISTING_BYTES / 2 ** 20} MB; hint: ${what === "--shots" ? "give fewer --shots" : "complete fewer values at once"}, or declare only the variables the formula uses`);
  }
}

/** Characters of one assignment of variables 1..n as DIMACS literals (a sign or none, digits, a space). */
function assignmentBytes(n: number): number {
  let bytes = 0;
  for (let d = 1, lo = 1; lo <= n; d++, lo *= 10) bytes += (Math.min(n, lo * 10 - 1) - lo + 1) * (d + 2);
  return bytes + 2;
}

/** Most characters --shots and --complete print (see checkListable). */
const MAX_LISTING_BYTES = 256 * 2 ** 20;

/** The completions of values given with --complete, and whether all of them are models. */
export function completionLines(file: string, cnf: Cnf, p: SearchProblem, raw: readonly string[]): { lines: string[]; allModels: boolean } {
  checkListable(file, cnf, "--complete", raw.length);
  const values = raw.map((r) => parseRegisterValue(r, p.n, "search"));
  const lines = [`formula: ${displayName(file)}; search register: ${p.n} qubit${p.n === 1 ? "" : "s"}, ${registerText(p)}`];
  let allModels = true;
  values.forEach((value, i) => {
    const { model, satisfies } = completeValue(cnf, p, value);
    allModels &&= satisfies;
    lines.push(`value ${i + 1}: outcome ${bitsText(value) || "(empty)"} -> ${modelLine(model)} (${satisfies ? "a model" : "not a model: the oracle does not mark this value"})`);
  });
  return { lines, allModels };
}

/** Refuses, before building, a simulation too large for --shots. */
export function checkShots(file: string, cnf: Cnf, p: SearchProblem, o: OracleOptions, K: number, shots: number): void {
  checkListable(file, cnf, "--shots", shots);
  const free = p.mode === "full" ? "try --register free (the default), or " : "";
  if (p.n > MAX_SHOT_QUBITS) {
    throw new UserError(`clausegate search: error: --shots simulates search registers of at most ${MAX_SHOT_QUBITS} qubits and this one has ${p.n}; hint: ${free}run the circuit elsewhere and complete its measured values with --complete`);
  }
  const one = compileSearch(cnf, { ...o, iterations: Math.min(K, 1), measure: false });
  const gates = one.gates * Math.max(1, K);
  if (2 ** p.n * gates > MAX_SHOT_WORK) {
    throw new UserError(`clausegate search: error: --shots would simulate about ${gates} gates on ${2 ** p.n} basis states, more than it runs (${MAX_SHOT_WORK} gate-states); hint: ${free}give fewer --iterations, or complete values measured elsewhere with --complete`);
  }
}

/**
 * Simulates the search circuit (K iterations, no final measurement) once, exactly: the state's
 * distribution over the search register is what a measurement samples (work qubits are back to
 * |0>, and mid-circuit measurements of the measured uncomputation leave the register's
 * distribution as it is). Draws `shots` values from it with `seed` and completes each.
 */
export function shotLines(file: string, cnf: Cnf, p: SearchProblem, o: OracleOptions, K: number, shots: number, seed: number): string[] {
  const c = compileSearch(cnf, { ...o, iterations: K, measure: false });
  const random = seededRandom(seed);
  const run = runSparse(c, [basisTerm(c.qubits, [])], random);
  const size = 2 ** p.n;
  const mask = size - 1;
  const probability = new Float64Array(size);
  for (const t of run.terms) probability[t.bits[0]! & mask]! += t.re * t.re + t.im * t.im;
  // Which register values complete to a model, and the chance that a shot does.
  const value = (x: number): Uint8Array => Uint8Array.from({ length: p.n }, (_, i) => (x >>> i) & 1);
  let success = 0;
  const completions = new Map<number, { model: Uint8Array; satisfies: boolean }>();
  const completion = (x: number) => {
    let r = completions.get(x);
    if (r === undefined) completions.set(x, (r = completeValue(cnf, p, value(x))));
    return r;
  };
  for (let x = 0; x < size; x++) if (probability[x]! > 0 && completion(x).satisfies) success += probability[x]!;
  const lines = [
    `formula: ${displayName(file)}; search register: ${p.n} qubit${p.n === 1 ? "" : "s"}, ${registerText(p)}`,
    `simulated: the search circuit (${K} iteration${K === 1 ? "" : "s"}, ${constructionPhrase(constructionLabel(o))}, basis ${o.basis}, uncompute ${o.uncompute}) on the exact state-vector simulator, ${shots} shot${shots === 1 ? "" : "s"} drawn with seed ${seed}`,
    `probability that a shot completes to a model: ${Number(success.toPrecision(10))}`,
  ];
  let models = 0;
  const distinct = new Set<number>();
  for (let s = 0; s < shots; s++) {
    // Inverse-CDF sampling over the register values.
    let u = random();
    let x = -1;
    for (let y = 0; y < size; y++) {
      if (probability[y]! <= 0) continue;
      x = y;
      u -= probability[y]!;
      if (u < 0) break;
    }
    const r = completion(x);
    if (r.satisfies) {
      models++;
      distinct.add(x);
    }
    lines.push(`shot ${s + 1}: outcome ${bitsText(value(x)) || "(empty)"} -> ${modelLine(r.model)} (${r.satisfies ? "a model" : "not a model"})`);
  }
  lines.push(`models among the shots: ${models} of ${shots} (${distinct.size} distinct)`);
  return lines;
}
