// The constructions between lean and wide (blocks, held clauses, fan-out copies), their names,
// and their counted figures: each is an oracle for its formula, and the counted figures are
// those of the built circuits.
import { describe, expect, it } from "vitest";
import { simplify } from "../../dist/src/synth/simplify.js";
import { lowerAndOptimize } from "../../dist/src/cost/built.js";
import { synthesizeConstruction } from "../../dist/src/synth/construction.js";
import { conjoinChecks } from "../../dist/src/synth/blocked.js";
import { CircuitBuilder, K } from "../helpers/circuits.js";
import {
  cnfFromClauses, compileOracle, constructionCandidates, constructionName, countCircuit, countConstructionOracle, oracleResources, parseConstruction,
  verifyOracle, type Cnf, type Construction,
} from "../helpers/lib.js";
import { queens, randomKSat, rng } from "../helpers/formulas.js";

/** Random CNF with clause widths 1..kmax (unit clauses positive, so that none contradict). */
function ragged(n: number, m: number, kmax: number, seed: number): Cnf {
  const r = rng(seed);
  const clauses: number[][] = [];
  for (let i = 0; i < m; i++) {
    const k = 1 + Math.floor(r() * kmax);
    const c: number[] = [];
    for (let j = 0; j < k; j++) {
      const v = 1 + Math.floor(r() * n);
      c.push(k > 1 && r() < 0.5 ? -v : v);
    }
    clauses.push(c);
  }
  return cnfFromClauses(n, clauses);
}

const named = (name: string): Construction => {
  const c = parseConstruction(name);
  if (typeof c === "string") throw new Error(c);
  return c;
};

describe("construction names", () => {
  it("round-trip, parameters included", () => {
    for (const name of ["wide", "lean", "blocks-6", "blocks-4x3", "blocks-2x3x4", "blocks-4-held-30", "fanout-1", "fanout-12", "blocks-6-fanout-1", "blocks-3-held-7-fanout-2"]) {
      expect(constructionName(named(name))).toBe(name);
    }
  });
  it("refuse what is no construction, saying why", () => {
    for (const bad of ["", "blocks", "blocks-1", "blocks-6x", "blocks-0x3", "fanout-0", "held-3", "blocks-6-held-0", "wide-fanout-1", "blocks-1234567890", "Blocks-6", "blocks-2x2x2x2x2x2x2x2x2"]) {
      expect(typeof parseConstruction(bad), bad).toBe("string");
    }
  });
});

describe("the candidates", () => {
  it("are thinned to about a dozen above 200,000 literals (each is a count of the whole oracle)", () => {
    const names = constructionCandidates(simplify(randomKSat(20_000, 70_000, 3, 1))).map(constructionName);
    expect(names.length).toBeLessThanOrEqual(14);
    for (const n of ["wide", "lean", "fanout-1", "blocks-2", "blocks-8", "blocks-32", "blocks-8x8"]) expect(names).toContain(n);
    expect(constructionCandidates(simplify(randomKSat(20, 90, 3, 45))).length).toBeGreaterThan(80);
  });
});

describe("every candidate construction is an oracle for its formula", { timeout: 120_000 }, () => {
  // Exhaustive checks (all 2^n assignments) of the toffoli circuits with measured and unitary
  // uncomputation, both kinds; the mcx basis keeps the logical gates; Clifford+T on the smallest.
  const all = [["phase", "toffoli", "measured"], ["flag", "toffoli", "unitary"], ["phase", "mcx", "unitary"]] as const;
  // 4-queens (16 variables): every third candidate, one mode, to stay quick.
  const formulas: [string, Cnf, readonly (readonly ["phase" | "flag", "toffoli" | "mcx", "measured" | "unitary"])[], number][] = [
    ["random 3-SAT 9 x 34", randomKSat(9, 34, 3, 5), [...all, ["flag", "mcx", "measured"], ["flag", "toffoli", "measured"]], 1],
    ["ragged widths 1..6, 8 x 25", ragged(8, 25, 6, 11), all, 1],
    ["4-queens", queens(4), [all[0]], 3],
  ];
  for (const [label, cnf, modes, every] of formulas) {
    it(label, async () => {
      const f = simplify(cnf);
      const candidates = constructionCandidates(f);
      expect(candidates.length).toBeGreaterThan(10);
      for (const c of candidates.filter((_, i) => i % every === 0)) {
        const construction = constructionName(c);
        for (const [kind, basis, uncompute] of modes) {
          const oracle = compileOracle(cnf, { construction, kind, basis, uncompute });
          const r = await verifyOracle(cnf, oracle.circuit, { kind });
          expect(r.verified, `${label} ${construction} ${kind} ${basis} ${uncompute}: ${JSON.stringify(r.counterexample)}`).toBe(true);
        }
      }
    });
  }
  it("in Clifford+T too (state-vector simulator, every assignment)", async () => {
    const cnf = randomKSat(6, 16, 3, 9);
    for (const construction of ["blocks-3", "blocks-2x3", "blocks-2-held-5", "fanout-1", "blocks-4-fanout-1"]) {
      for (const [kind, uncompute] of [["phase", "measured"], ["phase", "unitary"], ["flag", "measured"]] as const) {
        const oracle = compileOracle(cnf, { construction, kind, basis: "clifford+t", uncompute });
        const r = await verifyOracle(cnf, oracle.circuit, { kind });
        expect(r.verified, `${construction} ${kind} ${uncompute}`).toBe(true);
      }
    }
  });
  it("handles the trivial formulas (no clause, an empty clause, one clause)", async () => {
    for (const cnf of [cnfFromClauses(3, []), cnfFromClauses(3, [[1, 2], []]), cnfFromClauses(3, [[1, -2, 3]]), cnfFromClauses(3, [[2]])]) {
      for (const construction of ["blocks-2", "blocks-2x2", "fanout-1", "blocks-2-held-1"]) {
        for (const kind of ["phase", "flag"] as const) {
          const r = await verifyOracle(cnf, compileOracle(cnf, { construction, kind }).circuit, { kind });
          expect(r.verified).toBe(true);
        }
      }
    }
  });
});

describe("checks other than clauses", () => {
  it("conjoin like clauses: equalities x_a = x_b as parity checks, against their CNF", async () => {
    // Each check's violated bit is x_a XOR x_b, computed by two CNOTs into a fresh qubit.
    const pairs = [[0, 1], [1, 2], [3, 4], [2, 5], [4, 5]] as const;
    const checks = {
      count: pairs.length,
      occurrences: (i: number) => ({ start: 2 * i, controls: [pairs[i]![0] << 1, pairs[i]![1] << 1] }),
      compute(b: InstanceType<typeof CircuitBuilder>, i: number, out: [number, number[]][], holder: ((o: number, c: number) => number) | null) {
        const w = b.newWork();
        const via = (j: number): number => (holder === null ? pairs[i]![j]! << 1 : holder(2 * i + j, pairs[i]![j]! << 1));
        for (const op of [[K.mcx, [via(0), w << 1]], [K.mcx, [via(1), w << 1]]] as [number, number[]][]) {
          out.push(op);
          b.addN(op[0], op[1]);
        }
        return w << 1;
      },
    };
    const cnf = cnfFromClauses(6, pairs.flatMap(([a, b]) => [[a + 1, -(b + 1)], [-(a + 1), b + 1]]));
    for (const plan of [{ sizes: [], fanout: 0 }, { sizes: [2], fanout: 0 }, { sizes: [2, 2], fanout: 1 }, { sizes: [2], fanout: 0, held: 2 }]) {
      for (const kind of ["phase", "flag"] as const) {
        const b = new CircuitBuilder({ search: 6, target: kind === "flag" ? 1 : 0 });
        conjoinChecks(b, kind, 6, checks, plan);
        const c = lowerAndOptimize(b.finish(), "toffoli", "measured", true);
        expect((await verifyOracle(cnf, c, { kind })).verified, JSON.stringify(plan)).toBe(true);
      }
    }
  });
});

describe("counted figures are those of the built circuits", { timeout: 120_000 }, () => {
  it("for every candidate, both uncomputations, Clifford+T and toffoli", () => {
    for (const [cnf, every] of [[randomKSat(10, 42, 3, 3), 1], [ragged(9, 30, 5, 4), 3]] as const) {
      const f = simplify(cnf);
      for (const c of constructionCandidates(f).filter((_, i) => i % every === 0)) {
        for (const uncompute of ["measured", "unitary"] as const) {
          const built = lowerAndOptimize(synthesizeLogical(cnf, c), "clifford+t", uncompute, true);
          const counts = countCircuit(built);
          const counted = countConstructionOracle(f, "phase", c, "clifford+t", uncompute, true, true);
          expect([counted.qubits, counted.tCount, counted.tDepth, counted.cnotCount, counted.depth], `${constructionName(c)} ${uncompute}`)
            .toEqual([built.qubits, counts.tCount, counts.tDepth, counts.cnotCount, counts.depth]);
          const tof = countConstructionOracle(f, "phase", c, "toffoli", uncompute, true, false);
          expect(tof.toffoliCount).toBe(countCircuit(lowerAndOptimize(synthesizeLogical(cnf, c), "toffoli", uncompute, true)).toffoliCount);
        }
      }
    }
  });
  it("the resource report names the construction and counts it", () => {
    const cnf = randomKSat(10, 42, 3, 3);
    for (const construction of ["blocks-4", "fanout-2", "lean", "wide"]) {
      const oracle = compileOracle(cnf, { construction, basis: "toffoli", uncompute: "measured" });
      const report = oracleResources(cnf, oracle);
      expect(report.construction).toBe(construction);
      expect(report.strategy).toBe(construction.split("-")[0]);
      const ct = countCircuit(compileOracle(cnf, { construction, basis: "clifford+t", uncompute: "measured" }).circuit);
      expect([report.t_count, report.t_depth]).toEqual([ct.tCount, ct.tDepth]);
    }
  });
});

function synthesizeLogical(cnf: Cnf, c: Construction) {
  return synthesizeConstruction(simplify(cnf), "phase", c);
}
