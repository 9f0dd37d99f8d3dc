// The CDCL solver (src/cnf/solve.ts) and model finding (src/cnf/findModels.ts): against the published
// status of every SATLIB formula it decides in a test budget, against picosat's model counts, against
// exhaustive counting and the npm package logic-solver on random formulas.
import { existsSync, readFileSync } from "node:fs";
import { resolve } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ROOT } from "../helpers/cli.js";
import { bruteCount, pigeonhole, randomKSat } from "../helpers/formulas.js";
import { logicSolverCount } from "../helpers/reference.js";
import { cnfFromClauses, countModels, readDimacs, type Cnf } from "../helpers/lib.js";
import { CdclSolver } from "../../dist/src/cnf/solve.js";
import { findModels } from "../../dist/src/cnf/findModels.js";
import { evaluate } from "../../dist/src/cnf/evaluate.js";

const SATLIB = resolve(ROOT, "../shared/satlib");
const haveSatlib = existsSync(resolve(SATLIB, "manifest.json"));

interface ManifestEntry {
  file: string;
  family: string;
  expected: "SAT" | "UNSAT";
  model_count_picosat: number | null;
}
const manifest = (): ManifestEntry[] => (JSON.parse(readFileSync(resolve(SATLIB, "manifest.json"), "utf8")) as { files: ManifestEntry[] }).files;
const satlib = (file: string): Cnf | undefined => readDimacs(readFileSync(resolve(SATLIB, file))).cnf;
const satisfies = (cnf: Cnf, m: Uint8Array): boolean => evaluate(cnf, Array.from(m, (b) => b === 1));

/** Formulas up to `max` variables: empty, unit and tautological clauses, repeated literals, unused variables. */
const formulaUpTo = (max: number) =>
  fc.integer({ min: 0, max }).chain((n) =>
    fc.record({
      n: fc.constant(n),
      clauses: n === 0
        ? fc.array(fc.constant([] as number[]), { maxLength: 1 })
        : fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { maxLength: 5 }), { maxLength: 3 * n + 2 }),
    }),
  );

describe.skipIf(!haveSatlib)("SATLIB (Hoos & Stuetzle 2000) formulas, ../shared/satlib", () => {
  it("the solver agrees with the published status of every formula it decides within 200,000 conflicts, and its models satisfy", () => {
    let read = 0;
    let decided = 0;
    const undecided: string[] = [];
    for (const f of manifest()) {
      const cnf = satlib(f.file);
      if (cnf === undefined) continue; // a file the reader refuses (the pret family's lone 0 line, until it is accepted)
      read++;
      const s = new CdclSolver(cnf.variables, 1);
      s.addCnf(cnf);
      const status = s.solve(200_000);
      if (status === "unknown") {
        undecided.push(f.file);
        continue;
      }
      decided++;
      // Expected status: manifest.json, as each family is published in SATLIB.
      expect(status, f.file).toBe(f.expected === "SAT" ? "sat" : "unsat");
      if (status === "sat") expect(satisfies(cnf, s.model()), f.file).toBe(true);
    }
    expect(read).toBeGreaterThanOrEqual(211);
    // All of them fit the budget today (hole8, the hardest, takes about 25,000 conflicts).
    expect(undecided).toEqual([]);
    expect(decided).toBe(read);
  }, 120_000);

  it("finds all models of the uf20-91 formulas: as many as picosat --all counted (manifest.json)", () => {
    const counted = manifest().filter((f) => f.model_count_picosat !== null);
    expect(counted.length).toBeGreaterThanOrEqual(60);
    for (const f of counted) {
      const cnf = satlib(f.file)!;
      const r = findModels(cnf, 10_000);
      expect(r.all, f.file).toBe(true);
      expect(r.models.length, f.file).toBe(f.model_count_picosat);
      expect(new Set(r.models.map((m) => m.join(""))).size).toBe(r.models.length);
      for (const m of r.models) expect(satisfies(cnf, m), f.file).toBe(true);
    }
  }, 60_000);

  it("finds a model of each of the 15 satisfiable formulas whose few models sampling never reaches", () => {
    // aim *-1_6-yes1 have exactly one model (SATLIB's description of the aim family).
    const files = [
      ...["1", "2", "3", "4"].map((i) => `aim/aim-50-1_6-yes1-${i}.cnf`), "aim/aim-100-1_6-yes1-1.cnf",
      "ais/ais10.cnf", "ais/ais12.cnf",
      ...["a", "b", "c", "d"].map((x) => `logistics/logistics.${x}.cnf`),
      ...["a", "b", "c", "d"].map((x) => `blocksworld/bw_large.${x}.cnf`),
    ];
    for (const file of files) {
      const cnf = satlib(file)!;
      const r = findModels(cnf, 2);
      expect(r.status, file).toBe("sat");
      expect(r.models.length, file).toBeGreaterThanOrEqual(1);
      for (const m of r.models) expect(satisfies(cnf, m), file).toBe(true);
      if (file.includes("1_6-yes1")) expect({ file, all: r.all, found: r.models.length }).toEqual({ file, all: true, found: 1 });
    }
  }, 60_000);
});

describe("the solver on random formulas", () => {
  it("finds exactly the models exhaustive counting finds (plain loops over every assignment)", () => {
    fc.assert(
      fc.property(formulaUpTo(10), fc.integer({ min: 1, max: 1000 }), ({ n, clauses }, seed) => {
        const cnf = cnfFromClauses(n, clauses);
        const r = findModels(cnf, 1 << 11, { seed });
        const exact = bruteCount(n, clauses);
        expect(r.all).toBe(true);
        expect(r.models.length).toBe(exact);
        expect(r.status).toBe(exact > 0 ? "sat" : "unsat");
        expect(new Set(r.models.map((m) => m.join(""))).size).toBe(exact);
        for (const m of r.models) expect(satisfies(cnf, m)).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
  it("agrees with clausegate's exact counter on satisfiability up to 22 variables", async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 10, max: 22 }), fc.integer({ min: 1, max: 10_000 }), async (n, seed) => {
        const cnf = randomKSat(n, Math.round(4.26 * n), 3, seed); // near the 3-SAT threshold: both answers occur
        const exact = await countModels(cnf, { threads: 1 });
        expect(exact.ok).toBe(true);
        const r = findModels(cnf, 1);
        expect(r.status).toBe(exact.ok && exact.models > 0n ? "sat" : "unsat");
      }),
      { numRuns: 40 },
    );
  }, 60_000);
  it("counts models as the npm package logic-solver (MiniSat in JavaScript) does", () => {
    for (let seed = 1; seed <= 12; seed++) {
      const cnf = randomKSat(14, 50, 3, seed);
      expect(findModels(cnf, 1 << 14).models.length, `seed ${seed}`).toBe(logicSolverCount(cnf));
    }
  });
  it("proves pigeonhole formulas unsatisfiable (Haken 1985: no pigeon fits)", () => {
    for (let h = 2; h <= 6; h++) expect(findModels(pigeonhole(h + 1, h), 1).status).toBe("unsat");
    expect(findModels(pigeonhole(5, 5), 200).models.length).toBe(120); // 5! placements, one per permutation
  });
  it("stops at its conflict budget with 'unknown', and goes on when called again", () => {
    const hard = pigeonhole(8, 7);
    const s = new CdclSolver(hard.variables);
    s.addCnf(hard);
    expect(s.solve(10)).toBe("unknown");
    expect(s.conflicts).toBeGreaterThanOrEqual(10);
    expect(s.solve()).toBe("unsat");
    expect(findModels(hard, 1, { conflictLimit: 5 })).toMatchObject({ status: "unknown", models: [], all: false });
  });
  it("stops at its deadline with 'unknown' (timedOut), and goes on when called again: the pigeonhole proof (Haken 1985)", () => {
    const hard = pigeonhole(8, 7);
    const s = new CdclSolver(hard.variables);
    s.addCnf(hard);
    expect(s.solve(Infinity, performance.now() - 1)).toBe("unknown");
    expect(s.timedOut).toBe(true);
    // The clock is looked at every 256 conflicts.
    expect(s.conflicts).toBeLessThanOrEqual(256);
    expect(s.solve(Infinity, performance.now() + 3_600_000)).toBe("unsat");
    expect(s.timedOut).toBe(false);
  });
  it("reports no models for an empty clause, and one model of no variables for no clauses", () => {
    expect(findModels(cnfFromClauses(3, [[1], []]), 5)).toMatchObject({ status: "unsat", models: [], all: true });
    const none = findModels(cnfFromClauses(0, []), 5);
    expect(none).toMatchObject({ status: "sat", all: true });
    expect(none.models).toHaveLength(1);
    expect(findModels(cnfFromClauses(2, [[1, -1]]), 5).models).toHaveLength(4);
  });
  it("handles a clause of 100,000 literals (the models of x1 ∧ ¬x2 ∧ (the long clause) are found and correct)", () => {
    const n = 100_000;
    const long = Array.from({ length: n }, (_, i) => (i % 2 === 0 ? i + 1 : -(i + 1)));
    const cnf = cnfFromClauses(n, [long, [1], [-2]]);
    const r = findModels(cnf, 3);
    expect(r.models).toHaveLength(3);
    for (const m of r.models) expect([satisfies(cnf, m), m[0], m[1]]).toEqual([true, 1, 0]);
    // With x1 forced true the long clause holds; forcing every literal of it false leaves none.
    const none = cnfFromClauses(n, [long, ...long.map((l) => [-l])]);
    expect(findModels(none, 1).status).toBe("unsat");
  });
  it("different seeds reach different models of a formula with many", () => {
    const cnf = randomKSat(40, 60, 3, 3);
    const firsts = new Set([1, 2, 3, 4, 5, 6].map((seed) => findModels(cnf, 1, { seed }).models[0]!.join("")));
    expect(firsts.size).toBeGreaterThan(1);
  });
});
