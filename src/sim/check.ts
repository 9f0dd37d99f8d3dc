/**
 * Checking an oracle against the formula: for each assignment x, run the circuit from
 * |x>|0...0>(|b>) and require exactly (-1)^f(x) |x>|0...0> (phase) or |x>|0...0>|b xor f(x)>
 * (flag), amplitudes to 1e-9, with no global phase.
 */
import type { Cnf } from "../cnf/cnf.js";
import { evaluate } from "../cnf/evaluate.js";
import type { Circuit } from "../ir/circuit.js";
import { seededRandom } from "../util/random.js";
import { basisTerm, CircuitFault, runSparse, type Term } from "./sparse.js";

/** A failed check: the assignment and what went wrong. */
export interface Mismatch {
  /** Values of x[0..n-1]. */
  readonly assignment: boolean[];
  /** What the circuit did instead. */
  readonly message: string;
}

/** What {@link checkOracleSparse} checks. */
export interface OracleCheck {
  /** The oracle's kind. */
  readonly kind: "phase" | "flag";
  /** Assignments to check, each as a bit mask over variables (bit v-1 = variable v). */
  readonly assignments: Iterable<number>;
  /** More assignments to check, as values of variables 1..n (for formulas beyond 52 variables). */
  readonly explicit?: readonly boolean[][] | undefined;
  /** Seed for measurement outcomes. */
  readonly seed?: number;
  /**
   * A free register: its size (assignments are then of its qubits) and the oracle's expected value
   * on a register value (default: the formula on the assignment itself).
   */
  readonly register?: { readonly size: number; readonly value: (assignment: boolean[]) => boolean } | undefined;
  /** Told after each assignment checked, with how many so far (a Clifford+T run takes a second or more each). */
  readonly onChecked?: ((done: number) => void) | undefined;
}

const TOL = 1e-9;

/**
 * Checks the oracle on each assignment; returns the first mismatch or null. Measurements take
 * the outcomes drawn for the first input for every later input too, without renormalizing, so
 * that the check is of one linear map: each outcome branch must act on every input as the
 * oracle times one common positive factor (a branch whose outcome depends on the input, or
 * whose factor differs between inputs, would spoil superpositions of inputs).
 */
export function checkOracleSparse(c: Circuit, cnf: Cnf, opts: OracleCheck): Mismatch | null {
  const n = opts.register?.size ?? cnf.variables;
  const search = c.registers.find((r) => r.role === "search")!;
  if (search.size !== n) return { assignment: [], message: `search register has ${search.size} qubits, the formula ${n} variables` };
  const value = opts.register?.value ?? ((a: boolean[]) => evaluate(cnf, a));
  const targetReg = c.registers.find((r) => r.role === "target");
  const random = seededRandom(opts.seed ?? 1);
  let forced: number[] | undefined;
  let scale = 0;
  function* all(): Generator<boolean[]> {
    for (const x of opts.assignments) yield Array.from({ length: n }, (_, v) => Math.floor(x / 2 ** v) % 2 === 1);
    if (opts.explicit) yield* opts.explicit;
  }
  let done = 0;
  for (const assignment of all()) {
    if (done > 0) opts.onChecked?.(done);
    done++;
    const f = value(assignment);
    const ones = assignment.flatMap((on, v) => (on ? [v] : []));
    const bs = opts.kind === "flag" ? [0, 1] : [0];
    for (const b of bs) {
      const input = b && targetReg ? [...ones, targetReg.start] : ones;
      const expectOnes = opts.kind === "flag" && targetReg && (b ^ (f ? 1 : 0)) ? [...ones, targetReg.start] : ones;
      const expected = basisTerm(c.qubits, expectOnes);
      const sign = opts.kind === "phase" && f ? -1 : 1;
      let terms: Term[];
      let runScale: number;
      const record: number[] = [];
      try {
        const run = runSparse(c, [basisTerm(c.qubits, input)], random, forced ? { forced } : { record });
        terms = run.terms;
        runScale = run.scale;
      } catch (e) {
        if (e instanceof CircuitFault) return { assignment, message: e.message };
        throw e;
      }
      const key = expected.bits.join(",");
      let hit: Term | undefined;
      let stray = 0;
      for (const t of terms) {
        if (t.bits.join(",") === key) hit = t;
        else stray += t.re * t.re + t.im * t.im;
      }
      if (stray > TOL * TOL || hit === undefined) {
        const other = terms.find((t) => t.bits.join(",") !== key);
        return { assignment, message: `the state left the expected basis state${other ? `: a term with ${describeBits(other, c)}` : ""}` };
      }
      if (forced === undefined) {
        forced = record;
        scale = runScale;
      }
      if (Math.abs(hit.re - sign) > TOL || Math.abs(hit.im) > TOL) {
        const shown = `${hit.re.toFixed(6)}${hit.im >= 0 ? "+" : ""}${hit.im.toFixed(6)}i`;
        return { assignment, message: `phase ${shown} where ${sign} was expected (f = ${f ? 1 : 0}${b ? ", target 1" : ""})` };
      }
      if (Math.abs(runScale / scale - 1) > TOL) {
        return { assignment, message: `its measurement outcomes have probability ${(runScale * runScale).toExponential(3)} here but ${(scale * scale).toExponential(3)} for another input: the outcome depends on the input` };
      }
    }
  }
  return null;
}

function describeBits(t: Term, c: Circuit): string {
  const ones: string[] = [];
  for (const r of c.registers) {
    for (let i = 0; i < r.size; i++) {
      const q = r.start + i;
      if ((t.bits[q >>> 5]! >>> (q & 31)) & 1) ones.push(`${r.name}[${i}]=1`);
    }
  }
  return ones.join(" ") || "all qubits 0";
}

/** All 2^n assignments. */
export function* allAssignments(n: number): Generator<number> {
  for (let x = 0; x < 2 ** n; x++) yield x;
}
