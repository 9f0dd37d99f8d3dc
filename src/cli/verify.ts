/** `clausegate verify`: check an oracle against its formula; `oracle --verify` uses it too. */
import {
  DEFAULT_CONFLICT_LIMIT, loadBytes, DEFAULT_EXHAUSTIVE_LIMIT, DEFAULT_SOLVER_SECONDS, formatDiagnostic, MAX_EXHAUSTIVE_LIMIT, readCircuit, readCircuitJson, registerOf, withoutIdleTail, type Circuit,
  type Completion,
} from "../internal.js";
import { checkCheckSize, displayName, loadCnf, UserError } from "./io.js";
import { choice, compileWithOptions, oneInput, ORACLE_ARGS, parseCommandArgs, ORACLE_HELP, oracleOptions, REGISTER_ARGS, registerHelp, registerOptions } from "./options.js";
import { checkJson, checkLines, runCheck, VERIFY_ARGS, verifyFlags } from "./checking.js";

/** ORACLE_HELP with verify's own --kind line: with --circuit, the kind is read from the circuit unless given. */
const VERIFY_ORACLE_HELP = ORACLE_HELP.replace(/^ {2}--kind .*$/m, `  --kind phase|flag           phase: |x> -> (-1)^f(x)|x>; flag: |x>|b> -> |x>|b xor f(x)>. Without --circuit,
                              phase by default; with --circuit and no --kind, read from the circuit (flag
                              when it has a target register, else phase)`);

export const verifyHelp = `Usage: clausegate verify FILE|- [--circuit CIRCUIT|- [--kind phase|flag]] [options]

Checks that a circuit is an oracle for the formula: for every checked assignment x, the phase
(or the target bit) equals f(x), every work qubit is back to |0>, the search register is
unchanged and there is no stray phase. Without --circuit, compiles the formula with the given
oracle options and checks the result. With it, reads a circuit clausegate wrote (JSON, or
OpenQASM 3 as clausegate emits it), after checking every field of every gate; only --kind of the
oracle options applies then (the others shape a compilation, and are refused).

All 2^n assignments are simulated when n is at most the exhaustive limit (the bit-parallel
simulator, for mcx and toffoli circuits; the exact state-vector simulator, for Clifford+T
circuits, up to 12 variables). Above it the circuit is proved: run symbolically over all inputs
at once, it must equal the formula's oracle (a miter of the two, shown unsatisfiable by
structural hashing, a BDD or a CDCL solver); a Clifford+T circuit must reduce, Hadamard pair by
Hadamard pair, to a classical one through the lowering's gadgets. A circuit that fails the proof
gets a counterexample, confirmed by simulating that one input. When the proof is out of reach
("not proven", with the reason: e.g. a Clifford+T circuit that no gadget matches) the check is
sampled: satisfying assignments found by a CDCL solver (which also proves a formula
unsatisfiable), assignments that falsify one clause each, and a seeded random sample.
"verified" needs both satisfying and falsifying assignments checked, unless the formula has none
of one kind; otherwise the exit code is 1 and the reason is printed.

With --register free the oracle's search register holds only the free variables (see clausegate
oracle --help), and it is checked against the formula's projection: it must mark a register value
exactly when some model extends it, that is when the value's completion (register variables as
given, fixed variables forced, defined variables computed in order, others 0) is a model. The
checked inputs are register values; a counterexample names the register value and its completion.
With --circuit, --register and --no-structure say which register the circuit has (the one clausegate
oracle gives with the same options).

Options:
  --circuit FILE|-            the circuit to check (.json or OpenQASM 3; - for standard input)
${VERIFY_ORACLE_HELP}
                              (--strategy, --construction, --max-qubits, --prefer, --basis, --uncompute,
                              --no-optimize and --check-passes apply only without --circuit)
${registerHelp("full")}
  --exhaustive-limit N        check every assignment up to N variables (default ${DEFAULT_EXHAUSTIVE_LIMIT}, at most ${MAX_EXHAUSTIVE_LIMIT})
  --samples K                 random assignments to sample above the limit (default 4096; 256 for state vectors),
                              distinct up to 40 variables; a sample of half the assignments or more checks
                              them all instead
  --models K                  satisfying assignments the solver looks for above the limit (default 64; 16 for state vectors)
  --conflict-limit N          conflicts the solver may spend finding them, and on a proof's miter (default
                              ${DEFAULT_CONFLICT_LIMIT} each)
  --proof-seconds S           seconds a proof's SAT solver may spend on the miter (default ${DEFAULT_SOLVER_SECONDS}); the
                              proof then ends "not proven" and the check falls back to simulation (a clock:
                              a proof near it may pass on a fast machine only; --conflict-limit is exact)
  --seed S                    seed for samples, the solver and measurement outcomes (default 1)
  --prove                     prove at any size (no exhaustive simulation); exit 0 only when proved
  --sample                    simulate only: sample above the exhaustive limit instead of proving
  --json                      print the result as one JSON object (a proof: method "proof",
                              proof_method, miter {variables, clauses}, seconds, counterexample)
  -h, --help                  show this help

Exit codes: 0 verified (proved), 1 not verified (a mismatch, with the counterexample printed; a
kind of input left unchecked, with the reason; under --prove, not proven), 2 bad input or usage.
`;

/** Oracle options that shape a compilation: meaningless when the circuit is given. */
const COMPILE_ONLY = ["strategy", "construction", "max-qubits", "prefer", "basis", "uncompute", "no-optimize", "check-passes"] as const;

export async function verifyCommand(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs("verify", {
    args: argv,
    allowPositionals: true,
    options: { ...ORACLE_ARGS, ...REGISTER_ARGS, ...VERIFY_ARGS, circuit: { type: "string" }, json: { type: "boolean" }, help: { type: "boolean", short: "h" } },
  });
  if (values.help) {
    process.stdout.write(verifyHelp);
    return 0;
  }
  const file = oneInput(positionals, "verify");
  if (values.circuit !== undefined) {
    const ignored = COMPILE_ONLY.find((k) => values[k] !== undefined);
    if (ignored !== undefined) {
      throw new UserError(`clausegate verify: error: --${ignored} shapes the oracle that verify compiles, and --circuit gives the circuit instead; hint: drop --${ignored}, or drop --circuit to compile and check`);
    }
    if (file === "-" && values.circuit === "-") {
      throw new UserError("clausegate verify: error: the formula and the circuit both come from standard input, which can be read only once; hint: name a file for one of them");
    }
  }
  const flags = verifyFlags(values);
  if (values.prove && values.sample) {
    throw new UserError("clausegate verify: error: --prove and --sample ask for a proof and for sampling only; hint: give one of them");
  }
  let kind: "phase" | "flag" | undefined;
  let options: ReturnType<typeof oracleOptions> | undefined;
  const reg = registerOptions(values, "full");
  if (values.circuit !== undefined) {
    if (values.kind !== undefined) kind = choice(values.kind, "--kind", ["phase", "flag"] as const, "phase");
  } else {
    options = oracleOptions(values);
    kind = options.kind;
  }
  const cnf = await loadCnf(file);
  checkCheckSize(cnf, file, "verify");
  let circuit: Circuit;
  let completion: Completion | undefined;
  if (options === undefined) {
    circuit = await loadCircuit(values.circuit!);
    // The register the circuit claims: the one compileOracle gives with these options.
    if (reg.register === "free") completion = registerOf(cnf, reg).completion;
  } else {
    const oracle = compileWithOptions(cnf, options, "verify");
    circuit = oracle.circuit;
    if (reg.register === "free") completion = oracle.completion;
  }
  const r = await runCheck(cnf, circuit, flags, kind, completion);
  if (values.json) process.stdout.write(`${JSON.stringify(checkJson(r))}\n`);
  else process.stdout.write(`${checkLines(r, displayName(values.circuit ?? file)).join("\n")}\n`);
  return r.ok ? 0 : 1;
}

/** Whether the bytes begin, after a byte-order mark, white space and comments, with OPENQASM. */
function holdsOpenQasm(bytes: Uint8Array): boolean {
  let text = new TextDecoder().decode(bytes.subarray(0, 4096)).replace(/^\uFEFF/, "");
  for (;;) {
    const t = text.replace(/^\s+/, "");
    if (t.startsWith("//")) text = t.slice(t.indexOf("\n") < 0 ? t.length : t.indexOf("\n"));
    else if (t.startsWith("/*")) text = t.indexOf("*/") < 0 ? "" : t.slice(t.indexOf("*/") + 2);
    else return t.startsWith("OPENQASM");
  }
}

async function loadCircuit(path: string): Promise<Circuit> {
  let bytes: Uint8Array;
  try {
    bytes = await loadBytes(path);
  } catch (e) {
    const code = (e as { code?: string }).code;
    const why = code === "ENOENT" ? "no such file" : code === "EISDIR" ? "it is a folder" : code === "EACCES" ? "permission denied" : code ?? "unreadable";
    throw new UserError(`clausegate verify: error: cannot read the circuit ${path === "-" ? "from standard input" : path} (${why}); hint: check the path given to --circuit`);
  }
  // A .json file is read as the JSON circuit (an empty file, `null`: its errors then speak of
  // JSON, not of the OpenQASM 3 header that sniffing the content would expect), unless it holds
  // OpenQASM (oracle -o c.json writes OpenQASM 3 by default: the name does not set the format).
  const { circuit, diagnostics } = /\.json$/i.test(path) && !holdsOpenQasm(bytes) ? readCircuitJson(bytes) : readCircuit(bytes);
  if (circuit === undefined) throw new UserError(formatDiagnostic(diagnostics[0]!, displayName(path)));
  // Idle work qubits declared at the end cost the checkers memory per qubit and change nothing.
  return withoutIdleTail(circuit);
}
