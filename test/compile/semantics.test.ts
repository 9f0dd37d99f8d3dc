// Exact oracle semantics for every kind x strategy x basis x uncomputation, on random formulas
// and on the bundled examples: every assignment, every amplitude, work qubits back to |0>,
// several measurement outcome sequences.
import { readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ROOT } from "../helpers/cli.js";
import { rng } from "../helpers/formulas.js";
import { allAssignments, checkOracleSparse, cnfFromClauses, compileOracle, evaluate, readDimacs, type Cnf, type OracleOptions } from "../helpers/lib.js";

const bitsOf = (x: number, n: number): boolean[] => Array.from({ length: n }, (_, v) => Math.floor(x / 2 ** v) % 2 === 1);

const KINDS = ["phase", "flag"] as const;
const STRATEGIES = ["wide", "lean"] as const;
const BASES = ["mcx", "toffoli", "clifford+t"] as const;
const UNCOMPUTES = ["unitary", "measured"] as const;
const COMBOS: Required<Pick<OracleOptions, "kind" | "strategy" | "basis" | "uncompute">>[] = [];
for (const kind of KINDS) for (const strategy of STRATEGIES) for (const basis of BASES) for (const uncompute of UNCOMPUTES) COMBOS.push({ kind, strategy, basis, uncompute });

/**
 * Checks every assignment; for circuits over 3000 gates (the lean Clifford+T oracles of the
 * 12-variable example, 17 s exhaustively) every satisfying assignment and 300 seeded others.
 */
function verify(cnf: Cnf, o: (typeof COMBOS)[number], seeds: number[], optimize = true): void {
  const oracle = compileOracle(cnf, { ...o, optimize, validatePasses: true });
  const all = [...allAssignments(cnf.variables)];
  const r = rng(99);
  const assignments = oracle.circuit.gates <= 3000 ? all : all.filter((x) => evaluate(cnf, bitsOf(x, cnf.variables)) || r() < 300 / all.length);
  for (const seed of seeds) {
    const bad = checkOracleSparse(oracle.circuit, cnf, { kind: o.kind, assignments, seed });
    expect(bad, `${JSON.stringify(o)} seed ${seed}`).toBeNull();
  }
}

/** Formulas up to 7 variables with clause widths 0..6: empty, unit, tautological, duplicate literals, unused variables. */
const formula = fc.integer({ min: 1, max: 7 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    clauses: fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { maxLength: 6 }), { maxLength: 9 }),
  }),
);

describe("oracle semantics on random formulas", () => {
  for (const o of COMBOS) {
    it(`${o.kind} ${o.strategy} ${o.basis} ${o.uncompute}`, () => {
      fc.assert(
        fc.property(formula, fc.boolean(), ({ n, clauses }, optimize) => verify(cnfFromClauses(n, clauses), o, o.uncompute === "measured" ? [1, 2, 3] : [1], optimize)),
        { numRuns: 25 },
      );
    });
  }
});

describe("oracle semantics on the examples", () => {
  const load = (f: string): Cnf => readDimacs(readFileSync(join(ROOT, "examples", f))).cnf!;
  for (const file of ["allotment-pair.cnf", "herb-spiral.cnf", "allotment-row.cnf"]) {
    it(`${file}, every combination`, { timeout: 240_000 }, () => {
      const cnf = load(file);
      for (const o of COMBOS) verify(cnf, o, [7]);
    });
  }
});

describe("special formulas", () => {
  it("no clauses: a phase oracle is a global phase of -1 (gphase), a flag oracle flips the target", () => {
    const cnf = cnfFromClauses(2, []);
    for (const o of COMBOS) verify(cnf, o, [1]);
    const c = compileOracle(cnf).circuit;
    expect(c.gates).toBe(1);
  });
  it("an empty clause: the identity, no gates", () => {
    const cnf = cnfFromClauses(3, [[1, 2], []]);
    for (const o of COMBOS) verify(cnf, o, [1]);
    expect(compileOracle(cnf).circuit.gates).toBe(0);
  });
  it("complementary unit clauses are found unsatisfiable before synthesis", () => {
    expect(compileOracle(cnfFromClauses(2, [[2], [-2], [1, 2]])).circuit.gates).toBe(0);
  });
  it("declares every variable in the search register, used or not", () => {
    const c = compileOracle(cnfFromClauses(9, [[1, -2]])).circuit;
    expect(c.registers.find((r) => r.role === "search")!.size).toBe(9);
  });
});
