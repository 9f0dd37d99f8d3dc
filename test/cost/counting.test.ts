// The counting engine against the built circuits: for random formulas (clause widths 1..6, unit
// clauses, duplicate literals, tautologies, repeated and subsumed clauses, clauses sharing a
// prefix with the one before, the empty formula, unsatisfiable ones) every construction (wide,
// lean, textbook), kind, basis, uncomputation and optimizer setting must give exactly the figures
// of the circuit the pipeline builds and emit/resources.ts counts. A count the engine does not
// claim exact must still bound the built one from above.
import { readFileSync, existsSync } from "node:fs";
import { resolve } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ROOT } from "../helpers/cli.js";
import { cnfFromClauses, compileOracle, countCircuit, readDimacs, type Cnf } from "../helpers/lib.js";
import { countConstruction } from "../../dist/src/cost/index.js";
import { lowerAndOptimize } from "../../dist/src/cost/built.js";
import { simplify, synthesize } from "../../dist/src/synth/index.js";

type Strategy = "wide" | "lean" | "textbook";
type Basis = "toffoli" | "clifford+t";
type Uncompute = "unitary" | "measured";
type Kind = "phase" | "flag";
interface Combo { kind: Kind; strategy: Strategy; basis: Basis; uncompute: Uncompute; optimize: boolean }

const COMBOS: Combo[] = [];
for (const kind of ["phase", "flag"] as const) {
  for (const strategy of ["wide", "lean", "textbook"] as const) {
    for (const basis of ["toffoli", "clifford+t"] as const) {
      for (const uncompute of ["unitary", "measured"] as const) {
        for (const optimize of [true, false]) COMBOS.push({ kind, strategy, basis, uncompute, optimize });
      }
    }
  }
}

const FIGURES = ["qubits", "tCount", "tDepth", "cnotCount", "toffoliCount", "depth", "measurements"] as const;

/** The figures of the circuit clausegate builds: compileOracle's for wide and lean, the cost table's pipeline for textbook. */
function built(cnf: Cnf, c: Combo): Record<(typeof FIGURES)[number], number> {
  let circuit;
  if (c.strategy === "textbook") circuit = lowerAndOptimize(synthesize(simplify(cnf), c.kind, "textbook"), c.basis, c.uncompute, c.optimize, true);
  else circuit = compileOracle(cnf, { kind: c.kind, strategy: c.strategy, basis: c.basis, uncompute: c.uncompute, optimize: c.optimize }).circuit;
  const k = countCircuit(circuit);
  return { qubits: circuit.qubits, tCount: k.tCount, tDepth: k.tDepth, cnotCount: k.cnotCount, toffoliCount: k.toffoliCount, depth: k.depth, measurements: k.measurements };
}

function check(cnf: Cnf, c: Combo): void {
  const counted = countConstruction(cnf, c);
  const b = built(cnf, c);
  const label = `${JSON.stringify(c)} on ${cnf.variables} variables: ${JSON.stringify(Array.from({ length: cnf.clauseStart.length - 1 }, (_, i) => Array.from(cnf.lits.subarray(cnf.clauseStart[i], cnf.clauseStart[i + 1]))))}`;
  if (counted.exact) {
    for (const f of FIGURES) expect(counted[f], `${f} of ${label}`).toBe(b[f]);
  } else {
    expect(counted.upperBound, `${label}: ${counted.reason}`).toBe(true);
    for (const f of FIGURES) expect(counted[f], `${f} of ${label}`).toBeGreaterThanOrEqual(b[f]);
  }
}

const literal = (n: number) => fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v));

/**
 * Formulas up to 8 variables: random clauses of width 1..6 (a literal may repeat, a clause may be a
 * tautology), some clauses copied, extended (subsumed) or sharing their first literals with the
 * clause before (seams where one AND's wire is taken up by an AND with the same inputs), and now
 * and then an empty clause.
 */
const formula = fc.integer({ min: 1, max: 8 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    base: fc.array(fc.array(literal(n), { minLength: 1, maxLength: 6 }), { maxLength: 10 }),
    derived: fc.array(fc.record({ from: fc.nat(), how: fc.constantFrom("copy", "extend", "prefix", "empty"), extra: fc.array(literal(n), { minLength: 1, maxLength: 3 }) }), { maxLength: 5 }),
  }).map(({ n, base, derived }) => {
    const clauses = base.map((c) => [...c]);
    for (const d of derived) {
      if (d.how === "empty") {
        if (d.from % 4 === 0) clauses.push([]);
        continue;
      }
      if (clauses.length === 0) continue;
      const at = d.from % clauses.length;
      const src = clauses[at]!;
      const c = d.how === "copy" ? [...src] : d.how === "extend" ? [...src, ...d.extra] : [...src.slice(0, 2), ...d.extra];
      clauses.splice(at + 1, 0, c);
    }
    return { n, clauses };
  }),
);

describe("counted figures are those of the built circuits", () => {
  for (const strategy of ["wide", "lean", "textbook"] as const) {
    it(`${strategy}: every kind, basis, uncomputation and optimizer setting on random formulas`, () => {
      fc.assert(
        fc.property(formula, ({ n, clauses }) => {
          const cnf = cnfFromClauses(n, clauses);
          for (const c of COMBOS) if (c.strategy === strategy) check(cnf, c);
        }),
        { numRuns: 30 },
      );
    });
  }

  it("the empty formula, an empty clause, complementary units, one clause of each width", () => {
    const cases: [number, number[][]][] = [[3, []], [3, [[1, 2], []]], [2, [[2], [-2], [1, 2]]], [1, [[1]]], [1, [[-1]]]];
    for (let k = 1; k <= 6; k++) cases.push([6, [Array.from({ length: k }, (_, i) => (i % 2 ? -(i + 1) : i + 1))]]);
    for (const [n, clauses] of cases) for (const c of COMBOS) check(cnfFromClauses(n, clauses), c);
  });

  it("consecutive clauses with the same first literals (full and partial cancellations at seams)", () => {
    const cases: [number, number[][]][] = [
      [4, [[1, 2, 3], [1, 2, 4]]],
      [4, [[1, 2, 3], [1, 2, -4], [1, 2, 4]]],
      [5, [[-1, -2], [-1, -3], [-1, -4], [-2, -3], [-2, -4], [5]]],
      [6, [[1, 2, 3, 4], [1, 2, 3, 5], [1, 2, -6], [-1, 2, 6]]],
    ];
    for (const [n, clauses] of cases) for (const c of COMBOS) check(cnfFromClauses(n, clauses), c);
  });
});

const satlib = resolve(ROOT, "../shared/satlib");

describe("counted figures on SATLIB formulas (Hoos & Stuetzle 2000)", () => {
  // Structured formulas: many two-literal clauses sharing literals, as planning and pigeonhole
  // encodings have; and one random 3-SAT formula of the uf20-91 family.
  for (const file of ["blocksworld/anomaly.cnf", "hole/hole6.cnf", "dubois/dubois20.cnf", "uf20-91/uf20-01.cnf"]) {
    it.skipIf(!existsSync(resolve(satlib, file)))(`${file} (skipped when ../shared/satlib is absent)`, { timeout: 240_000 }, () => {
      const cnf = readDimacs(readFileSync(resolve(satlib, file))).cnf!;
      for (const c of COMBOS) if (c.optimize && (c.kind === "phase" || c.strategy !== "lean")) check(cnf, c);
    });
  }
});
