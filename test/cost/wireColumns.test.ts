// The counting engine's per-wire columns (cost/engine.ts): one buffer carved into columns, grown
// by half when a run needs more wires than it was sized for, and handed from one run to the next
// through a shared WireMemory (the runs of a cost table), whatever number of copies per wire each
// run keeps. Every way of getting there must give exactly the figures of the built circuits (the
// pipeline's own lowering, passes and emit/resources.ts count): random small formulas with unit
// clauses, repeated and complementary literals, wide clauses, and the empty formula.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { cnfFromClauses, compileOracle, costTable, countCircuit, type Cnf } from "../helpers/lib.js";
import { lowerAndOptimize } from "../../dist/src/cost/built.js";
import { CountingEngine, type WireMemory } from "../../dist/src/cost/engine.js";
import { LoweringStream, VirtualIds } from "../../dist/src/cost/lowering.js";
import { leanOracle, textbookOracle, wideOracle } from "../../dist/src/cost/sources.js";
import { planOracle, simplify, synthesize } from "../../dist/src/synth/index.js";

type Strategy = "wide" | "lean" | "textbook";
type Basis = "toffoli" | "clifford+t";
type Uncompute = "unitary" | "measured";

interface Figures { qubits: number; tCount: number; tDepth: number; cnotCount: number; toffoliCount: number; depth: number }

function built(cnf: Cnf, strategy: Strategy, basis: Basis, uncompute: Uncompute): Figures {
  const circuit = strategy === "textbook"
    ? lowerAndOptimize(synthesize(simplify(cnf), "phase", "textbook"), basis, uncompute, true, true)
    : compileOracle(cnf, { kind: "phase", strategy, basis, uncompute, optimize: true, structure: false }).circuit;
  const k = countCircuit(circuit);
  return { qubits: circuit.qubits, tCount: k.tCount, tDepth: k.tDepth, cnotCount: k.cnotCount, toffoliCount: k.toffoliCount, depth: k.depth };
}

/** One engine run over a stream, asked for one wire (the engine starts at 64 + base; its columns grow as wires come), on the given memory. */
function counted(cnf: Cnf, strategy: Strategy, basis: Basis, uncompute: Uncompute, history: number, memory: WireMemory): Figures & { exact: boolean } {
  const f = planOracle(cnf, "full", false).clauses;
  const base = f.variables;
  const engine = new CountingEngine({ base, optimize: true, levels: true, lag: Infinity, history, wires: 1, ids: 1, wireMemory: memory });
  const ids = new VirtualIds(base);
  const low = new LoweringStream(engine, ids, { basis, uncompute, toffoliAnds: strategy === "textbook" }, 1, 1, memory);
  const stream = strategy === "wide" ? wideOracle : strategy === "lean" ? leanOracle : textbookOracle;
  stream(f, "phase", low, ids, base);
  low.finish();
  const r = engine.finish();
  return { qubits: r.qubits, tCount: r.tCount, tDepth: r.tDepth, cnotCount: r.cnotCount, toffoliCount: r.toffoliCount, depth: r.depth, exact: r.exact };
}

const literal = (n: number) => fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v));

/**
 * Up to `vars` variables and `most` clauses of width 1..8: units, a literal twice, a literal and its
 * negation, wide clauses; sometimes none.
 */
const formulaOf = (most: number, vars: number) => fc.integer({ min: 1, max: vars }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    clauses: fc.array(
      fc.oneof(
        fc.array(literal(n), { minLength: 1, maxLength: 1 }),
        fc.array(literal(n), { minLength: 2, maxLength: 3 }),
        fc.array(literal(n), { minLength: 4, maxLength: 8 }),
        literal(n).chain((l) => fc.array(literal(n), { maxLength: 2 }).map((r) => [l, ...r, l])),
        literal(n).chain((l) => fc.array(literal(n), { maxLength: 2 }).map((r) => [l, ...r, -l])),
      ),
      { maxLength: most },
    ),
  }),
);
const formula = formulaOf(12, 8);
/**
 * Enough clauses over enough variables (simplification keeps most of them) that the oracles'
 * work wires can outgrow the engine's first 64 + base wires, so that the columns grow mid-run.
 * (Not proven sensitive to a growth that loses the levels: such a mutation went unnoticed.)
 */
const longer = formulaOf(40, 40);

const label = (n: number, clauses: number[][]): string => `${n} variables: ${JSON.stringify(clauses)}`;

describe("the engine's wire columns give the built figures", () => {
  it("grown from one wire, on memory handed from run to run (one copy per wire, then four, then one)", () => {
    fc.assert(
      fc.property(fc.oneof(formula, longer), fc.constantFrom<Basis>("toffoli", "clifford+t"), fc.constantFrom<Uncompute>("unitary", "measured"), ({ n, clauses }, basis, uncompute) => {
        const cnf = cnfFromClauses(n, clauses);
        const memory: WireMemory = { buffer: null, records: null };
        // Wide first (the most wires), then runs that take its buffer with other layouts.
        for (const [strategy, history] of [["wide", 1], ["lean", 4], ["textbook", 1], ["wide", 4]] as const) {
          const c = counted(cnf, strategy, basis, uncompute, history, memory);
          const b = built(cnf, strategy, basis, uncompute);
          expect(c.exact, `${strategy} ${basis} ${uncompute} history ${history} on ${label(n, clauses)}`).toBe(true);
          const { exact: _, ...figures } = c;
          expect(figures, `${strategy} ${basis} ${uncompute} history ${history} on ${label(n, clauses)}`).toEqual(b);
        }
      }),
      { numRuns: 40, seed: 20261202 },
    );
  });

  it("the cost table's rows (its runs share one buffer) are the built figures", () => {
    fc.assert(
      fc.property(formula, ({ n, clauses }) => {
        const cnf = cnfFromClauses(n, clauses);
        const rows = costTable(cnf, "phase", { structure: false });
        for (const r of rows) {
          const ct = built(cnf, r.strategy as Strategy, "clifford+t", r.uncompute);
          const tof = built(cnf, r.strategy as Strategy, "toffoli", r.uncompute);
          const at = `${r.strategy} ${r.uncompute} on ${label(n, clauses)}`;
          expect(r.exact, at).toBe(true);
          expect({ qubits: r.qubits, toffoli: r.toffoli_count, t: r.t_count, tDepth: r.t_depth, cnot: r.cnot_count, depth: r.depth }, at)
            .toEqual({ qubits: ct.qubits, toffoli: tof.toffoliCount, t: ct.tCount, tDepth: ct.tDepth, cnot: ct.cnotCount, depth: ct.depth });
        }
      }),
      { numRuns: 25, seed: 20261203 },
    );
  });

  it("the empty formula", () => {
    const cnf = cnfFromClauses(3, []);
    const memory: WireMemory = { buffer: null, records: null };
    for (const strategy of ["wide", "lean", "textbook"] as const) {
      const { exact, ...figures } = counted(cnf, strategy, "clifford+t", "measured", 1, memory);
      expect(exact).toBe(true);
      expect(figures).toEqual(built(cnf, strategy, "clifford+t", "measured"));
    }
  });
});
