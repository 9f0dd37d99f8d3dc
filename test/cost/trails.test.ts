// Deferred trails (EngineOptions.deferTrails, src/cost/engine.ts): a freed work wire's closing
// single-qubit gates wait untallied until the wire is taken again, so that the next use's opening
// gates may cancel them however long the wire sat free. Clauses of mixed widths leave wires deep
// in reuse's stack: without deferral a short window falls short (the run then keeps every
// instance); with it the window holds, and every figure is the built circuit's.
import { describe, expect, it } from "vitest";
import { cnfFromClauses, compileOracle, countCircuit, type Cnf } from "../helpers/lib.js";
import { CountingEngine, type EngineResult } from "../../dist/src/cost/engine.js";
import { LoweringStream, VirtualIds } from "../../dist/src/cost/lowering.js";
import { leanOracle } from "../../dist/src/cost/sources.js";
import { simplify } from "../../dist/src/synth/index.js";
import { randomClausesOfWidths } from "../helpers/formulas.js";

type Basis = "toffoli" | "clifford+t";
type Uncompute = "unitary" | "measured";

function mixedWidths(seed: number, n: number, m: number, lo: number, hi: number): Cnf {
  return cnfFromClauses(n, randomClausesOfWidths(seed, n, m, lo, hi));
}

/** The lean oracle counted by the engine alone, with the given window and deferral. */
function count(cnf: Cnf, basis: Basis, uncompute: Uncompute, lag: number, deferTrails: boolean): EngineResult {
  const f = simplify(cnf);
  const base = f.variables;
  const engine = new CountingEngine({ base, optimize: true, levels: basis === "clifford+t", lag, history: 4, wires: base + 64, ids: base + 1024, eagerLag: true, deferTrails });
  const ids = new VirtualIds(base);
  const low = new LoweringStream(engine, ids, { basis, uncompute, toffoliAnds: false }, base + 1024);
  leanOracle(f, "phase", low, ids, f.variables);
  low.finish();
  return engine.finish();
}

function builtFigures(cnf: Cnf, basis: Basis, uncompute: Uncompute): Record<string, number> {
  const circuit = compileOracle(cnf, { kind: "phase", strategy: "lean", basis, uncompute, optimize: true, structure: false }).circuit;
  const k = countCircuit(circuit);
  return { qubits: circuit.qubits, tCount: k.tCount, tDepth: k.tDepth, cnotCount: k.cnotCount, toffoliCount: k.toffoliCount, depth: k.depth };
}

describe("deferred trails of freed work wires", () => {
  it("clauses of widths 2-8: a window of 256 instances falls short without deferral and holds with it, with the built circuit's figures", () => {
    const cnf = mixedWidths(21, 300, 400, 2, 8);
    const without = count(cnf, "clifford+t", "unitary", 256, false);
    expect(without.lagShort).toBe(true);
    const withTrails = count(cnf, "clifford+t", "unitary", 256, true);
    expect(withTrails.lagShort).toBe(false);
    expect(withTrails.historyShort).toBe(false);
    expect(withTrails.exact).toBe(true);
    const b = builtFigures(cnf, "clifford+t", "unitary");
    for (const k of Object.keys(b)) expect((withTrails as unknown as Record<string, number>)[k], k).toBe(b[k]);
  });

  it("every basis and uncomputation, windows of 256 and 4,096 instances and everything kept: the built circuit's figures", () => {
    for (const [seed, lo, hi] of [[22, 2, 5], [23, 2, 8], [24, 3, 3], [25, 1, 12]] as const) {
      const cnf = mixedWidths(seed, 60, 150, lo, hi);
      expect(simplify(cnf).unsat).toBe(false);
      for (const basis of ["clifford+t", "toffoli"] as const) {
        for (const uncompute of ["unitary", "measured"] as const) {
          const b = builtFigures(cnf, basis, uncompute);
          for (const lag of [256, 4096, Infinity]) {
            const r = count(cnf, basis, uncompute, lag, true);
            const label = `seed ${seed}, ${basis}, ${uncompute}, window ${lag}`;
            expect(r.lagShort || r.historyShort, label).toBe(false);
            expect(r.exact, label).toBe(true);
            const keys = basis === "clifford+t" ? Object.keys(b) : ["qubits", "toffoliCount"];
            for (const k of keys) expect((r as unknown as Record<string, number>)[k], `${k}, ${label}`).toBe(b[k]);
          }
        }
      }
    }
  });
});
