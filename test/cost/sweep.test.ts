// The sweep (cost/sweep.ts) against the engine it shortcuts: wherever the sweep gives figures
// they must be the engine's, on every stream it may be handed (wide, textbook and lean oracles,
// both kinds, both uncomputations, both bases), and it must not give up on the streams it is
// used for (the wide and textbook oracles of random formulas, where it is meant to be faster).
import fc from "fast-check";
import { existsSync, readFileSync } from "node:fs";
import { resolve } from "node:path";
import { describe, expect, it } from "vitest";
import { ROOT } from "../helpers/cli.js";
import { cnfFromClauses, scanDimacs, type Cnf } from "../helpers/lib.js";
import { run } from "../../dist/src/cost/run.js";
import { WireReuse } from "../../dist/src/cost/reuse.js";
import { sweepCount } from "../../dist/src/cost/sweep.js";
import { InstanceTally } from "../../dist/src/cost/tally.js";
import { T_H } from "../../dist/src/cost/templates.js";
import { LoweringStream, VirtualIds } from "../../dist/src/cost/lowering.js";
import { leanOracle, textbookOracle, wideOracle } from "../../dist/src/cost/sources.js";
import { simplify } from "../../dist/src/synth/simplify.js";
import { randomKSat } from "../helpers/formulas.js";

type Strategy = "wide" | "textbook" | "lean";
type Kind = "phase" | "flag";
type Unc = "unitary" | "measured";
type Basis = "clifford+t" | "toffoli";

const FIGURES = ["qubits", "tCount", "tDepth", "cnotCount", "toffoliCount", "depth", "measurements", "instances", "exact", "freedAt"] as const;

function both(cnf: Cnf, strategy: Strategy, kind: Kind, uncompute: Unc, basis: Basis) {
  const f = simplify(cnf);
  const levels = basis === "clifford+t";
  const mode = { basis, uncompute, toffoliAnds: strategy === "textbook" };
  const base = f.variables + (kind === "flag" ? 1 : 0);
  const stream = strategy === "wide" ? wideOracle : strategy === "textbook" ? textbookOracle : leanOracle;
  const emit = (low: LoweringStream, ids: VirtualIds): void => stream(f, kind, low, ids, f.variables);
  // keepFreed: when the wires free at the end were freed (a search's diffusion takes them next).
  const engine = run(base, true, levels, mode, emit, { lag: 2048, history: 1, wires: base + 64, ids: base + 1024, keepFreed: 6 });
  const swept = sweepCount({ base, levels, wires: base + 64, ids: base + 1024, keepFreed: 6 }, (sink) => {
    const ids = new VirtualIds(base);
    const low = new LoweringStream(sink, ids, mode, base + 1024, 1024);
    emit(low, ids);
    low.finish();
  });
  return { engine, swept };
}

const figures = (r: Record<string, unknown>): Record<string, unknown> => Object.fromEntries(FIGURES.map((k) => [k, r[k] instanceof Int32Array ? Array.from(r[k]) : r[k]]));

// Few variables and clauses of 1 to 8 literals (repeats and opposite literals included), so that
// neighbouring clauses share wires, polarities and the work wires reuse hands on.
const formula = fc.integer({ min: 1, max: 12 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    clauses: fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { minLength: 1, maxLength: 8 }), { maxLength: 24 }),
  }),
);

describe("sweepCount", () => {
  it("gives the engine's figures wherever it does not give up (random formulas, every stream, kind, uncomputation and basis)", () => {
    let swept = 0;
    fc.assert(
      fc.property(
        formula,
        fc.constantFrom<Strategy>("wide", "textbook", "lean"),
        fc.constantFrom<Kind>("phase", "flag"),
        fc.constantFrom<Unc>("unitary", "measured"),
        fc.constantFrom<Basis>("clifford+t", "toffoli"),
        ({ n, clauses }, strategy, kind, uncompute, basis) => {
          const r = both(cnfFromClauses(n, clauses), strategy, kind, uncompute, basis);
          if (r.swept === null) return;
          swept++;
          expect(figures(r.swept as unknown as Record<string, unknown>)).toEqual(figures(r.engine as unknown as Record<string, unknown>));
        },
      ),
      { numRuns: 1500, seed: 20261203 },
    );
    // Most runs are swept (it gives up mainly where a walk goes far back).
    expect(swept).toBeGreaterThan(1000);
  });

  it("sweeps the Clifford+T wide and textbook oracles of random 3-SAT formulas, with the engine's figures", () => {
    for (const [n, m, seed] of [[300, 1200, 1], [1000, 4200, 2], [4000, 17000, 3]] as const) {
      const cnf = randomKSat(n, m, 3, seed);
      for (const strategy of ["wide", "textbook"] as const) {
        for (const uncompute of strategy === "wide" ? (["unitary", "measured"] as const) : (["unitary"] as const)) {
          for (const kind of ["phase", "flag"] as const) {
            const r = both(cnf, strategy, kind, uncompute, "clifford+t");
            expect(r.swept, `${strategy} ${uncompute} ${kind} n=${n}`).not.toBeNull();
            expect(figures(r.swept as unknown as Record<string, unknown>)).toEqual(figures(r.engine as unknown as Record<string, unknown>));
          }
        }
      }
    }
  });

  // SATLIB (Hoos & Stuetzle 2000) logistics.c: its textbook toffoli-basis run cancels X gates on
  // search variables, and later walks along those wires must still be told from the summary
  // (the newest gate is known) instead of replayed past the ring, where the sweep would give up.
  const logistics = resolve(ROOT, "../shared/satlib/logistics/logistics.c.cnf");
  it.skipIf(!existsSync(logistics))("sweeps the textbook toffoli run of SATLIB logistics.c, with the engine's figures", () => {
    const cnf = scanDimacs(readFileSync(logistics)).cnf!;
    for (const kind of ["phase", "flag"] as const) {
      const r = both(cnf, "textbook", kind, "unitary", "toffoli");
      expect(r.swept, kind).not.toBeNull();
      expect(figures(r.swept as unknown as Record<string, unknown>)).toEqual(figures(r.engine as unknown as Record<string, unknown>));
    }
  });
});

describe("work-wire reuse (reuse.ts)", () => {
  it("keeps when each free wire was freed only when timed (searchCosts' runs read it; the cost table's do not)", () => {
    const timed = new WireReuse(2, 16);
    const untimed = new WireReuse(2, 16, false);
    for (const r of [timed, untimed]) {
      // Ids 2..5 take wires 2..5; 3 and 5 are freed after instances 7 and 9; id 6 takes 5 again.
      for (let v = 2; v < 6; v++) expect(r.wireFor(v)).toBe(v);
      r.release(3, 7);
      r.release(5, 9);
      expect(r.wireFor(6)).toBe(5);
    }
    expect([...timed.freedAt(4)]).toEqual([7]);
    expect(() => untimed.freedAt(4)).toThrow(/timed/);
    // Past the first 256 frees (the tables grow) the times still come out in order.
    const many = new WireReuse(0, 1024);
    for (let v = 0; v < 600; v++) many.wireFor(v);
    for (let v = 0; v < 600; v++) many.release(v, 1000 + v);
    expect([...many.freedAt(3)]).toEqual([1597, 1598, 1599]);
  });
});

describe("ids and wires given back in order (no stack)", () => {
  // A plain stack of given-back ids (what VirtualIds and WireReuse were before they let ids and
  // wires given back in order rejoin the unused ones): the same ids and wires must come out.
  const ops = fc.array(fc.tuple(fc.boolean(), fc.nat(1000)), { minLength: 1, maxLength: 300 });

  it("VirtualIds hands out the ids a plain stack would", () => {
    fc.assert(
      fc.property(ops, (seq) => {
        const ids = new VirtualIds(5);
        const stack: number[] = [];
        let next = 5;
        const live: number[] = [];
        for (const [take, pick] of seq) {
          if (take || live.length === 0) {
            const want = stack.length > 0 ? stack.pop()! : next++;
            expect(ids.take()).toBe(want);
            live.push(want);
          } else {
            const id = live.splice(pick % live.length, 1)[0]!;
            ids.give(id);
            stack.push(id);
          }
        }
      }),
      { numRuns: 400, seed: 20261203 },
    );
  });

  it("WireReuse without times gives the wires, and makes the wires, that it gives with them", () => {
    fc.assert(
      fc.property(ops, (seq) => {
        const timed = new WireReuse(3, 8);
        const untimed = new WireReuse(3, 8, false);
        const live: number[] = [];
        let nextId = 3;
        seq.forEach(([take, pick], i) => {
          if (take || live.length === 0) {
            const v = nextId++;
            expect(untimed.wireFor(v)).toBe(timed.wireFor(v));
            live.push(v);
          } else {
            const v = live.splice(pick % live.length, 1)[0]!;
            timed.release(v, i);
            untimed.release(v, i);
          }
          expect(untimed.workWires).toBe(timed.workWires);
        });
      }),
      { numRuns: 400, seed: 20261204 },
    );
  });

  it("takes a wide oracle's wires, given back in reverse order, again lowest first, making none", () => {
    const r = new WireReuse(0, 4096, false);
    for (let v = 0; v < 4000; v++) expect(r.wireFor(v)).toBe(v);
    for (let v = 3999; v >= 0; v--) r.release(v, v);
    // Taken again lowest first (the last one given back), and no new wire made.
    for (let v = 4000; v < 8000; v++) expect(r.wireFor(v)).toBe(v - 4000);
    expect(r.workWires).toBe(4000);
  });
});

describe("32-bit levels (tally.ts, the sweep's tables)", () => {
  it("says when a level passes 2^32 - 1, where a 32-bit table would wrap", () => {
    const tally = new InstanceTally(true, true);
    const lvl = new Uint32Array(4);
    tally.lvl = lvl;
    tally.tlvl = new Uint32Array(4);
    tally.pend = new Uint8Array(4);
    lvl[1] = 0xffffffff - 2;
    tally.add(T_H, 0, 1, -1, -1);
    expect(tally.overflow).toBe(false);
    expect(lvl[1]).toBe(0xffffffff - 1);
    tally.add(T_H, 0, 1, -1, -1);
    expect(tally.overflow).toBe(false);
    tally.add(T_H, 0, 1, -1, -1);
    expect(tally.overflow).toBe(true);
  });
});
