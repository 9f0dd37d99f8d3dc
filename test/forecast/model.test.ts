// The physical model on plain numbers: a hand-computed case, the time laws it promises, and
// monotonicity in the error rate and the failure budget.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { DEFAULT_MACHINE, forecastSearch, type ForecastInput, type Forecast } from "../helpers/lib.js";

/** The counts clausegate gives examples/launch-rota.cnf today (wide, unitary), frozen here so the arithmetic is checked by hand. */
const ROTA: ForecastInput = {
  logicalQubits: 60,
  iterations: 7,
  successProbability: 0.9946633498501684,
  source: "frozen counts of examples/launch-rota.cnf",
  oracle: { tCount: 384, tDepth: 46, toffoliCount: 96, cnotCount: 769, depth: 216 },
  iteration: { tCount: 444, tDepth: 58, toffoliCount: 116, cnotCount: 930, depth: 281 },
};

const ok = (f: Forecast): Extract<Forecast, { ok: true }> => {
  if (!f.ok) throw new Error(`no estimate: ${f.reason}`);
  return f;
};

describe("a case computed by hand (defaults: p = 1e-3, 1 us cycle, 10 us reaction, budget 0.01)", () => {
  const f = ok(forecastSearch(ROTA));
  it("needs 7 x 444 / P = 3124.7 magic states, each failing at most 0.005 / 3124.7 = 1.6e-6: the (15-to-1)_{17,7,7} factory", () => {
    expect(f.expectedTStates).toBeCloseTo((7 * 444) / ROTA.successProbability, 9);
    expect(f.neededOutputError!).toBeCloseTo(0.005 / f.expectedTStates, 15);
    expect(f.protocol!.name).toBe("(15-to-1)_{17,7,7}");
  });
  it("enough factories: ceil(444 x 42.6 us / (58 x 10 us)) = 33; run 7 x 58 x 10 us = 4.06 ms; d = 15", () => {
    const r = f.reactionLimited;
    expect(r.factories).toBe(33);
    expect(r.runSeconds).toBeCloseTo(7 * 58 * 1e-5, 15);
    expect(r.expectedSeconds).toBe(r.runSeconds / ROTA.successProbability);
    // 60 data + 83 routing patches (60 + ceil(sqrt 480) + 1) over 4081.8 cycles: p_L must be at most
    // 0.005 / (143 x 4081.8) = 8.6e-9; d = 13 gives 1e-8 (too much), d = 15 gives 1e-9.
    expect(f.patches).toEqual({ data: 60, routing: 83 });
    expect(r.codeDistance).toBe(15);
    expect(r.physicalQubits).toEqual({ data: 60 * 450, routing: 83 * 450, factories: 33 * 4620, total: 143 * 450 + 33 * 4620 });
    expect(r.limitedBy).toBe("t-depth");
  });
  it("one factory: 444 states x 42.6 us per iteration = 18.9 ms; run 132.4 ms; d = 17", () => {
    const r = f.oneFactory;
    expect(r.factories).toBe(1);
    expect(r.iterationSeconds).toBeCloseTo(444 * 42.6e-6, 15);
    expect(r.runSeconds).toBeCloseTo(7 * 444 * 42.6e-6, 15);
    // 143 patches x 133,111 cycles: p_L at most 2.6e-10, so d = 17 (1e-10).
    expect(r.codeDistance).toBe(17);
    expect(r.limitedBy).toBe("magic-states");
    expect(r.physicalQubits.total).toBe(143 * 578 + 4620);
  });
  it("stays within the failure budget, and lists every input with its source", () => {
    for (const r of [f.reactionLimited, f.oneFactory]) expect(r.logicalFailure.total).toBeLessThanOrEqual(DEFAULT_MACHINE.failureBudget);
    const names = f.assumptions.map((a) => a.name);
    for (const n of ["physical_error_rate", "cycle_seconds", "reaction_seconds", "failure_budget", "logical_error_model", "patch_qubits", "routing_patches", "t_layer_seconds", "magic_state_protocol", "failure_budget_split"]) {
      expect(names).toContain(n);
    }
    for (const a of f.assumptions) expect(a.source.length).toBeGreaterThan(5);
    expect(f.assumptions.find((a) => a.name === "physical_error_rate")!.source).toMatch(/^default: .*Gidney & Ekera 2021/);
    const given = ok(forecastSearch(ROTA, { physicalErrorRate: 1e-4 }));
    expect(given.assumptions.find((a) => a.name === "physical_error_rate")).toEqual({ name: "physical_error_rate", value: 1e-4, source: "given" });
  });
});

describe("refusals are data, with a reason and a hint", () => {
  it("above the distillation table, at threshold, without solutions, or beyond the best factory", () => {
    const cases: [Partial<typeof DEFAULT_MACHINE>, ForecastInput, RegExp][] = [
      [{ physicalErrorRate: 2e-3 }, ROTA, /above the distillation table/],
      [{ physicalErrorRate: 0.01 }, ROTA, /not below the surface-code threshold/],
      [{}, { ...ROTA, successProbability: 0 }, /success probability/],
      [{ failureBudget: 1.5 }, ROTA, /failure budget/],
      [{}, { ...ROTA, iterations: 1e20 }, /best tabulated protocol/],
    ];
    for (const [machine, input, reason] of cases) {
      const f = forecastSearch(input, machine);
      expect(f.ok).toBe(false);
      if (!f.ok) {
        expect(f.reason).toMatch(reason);
        expect(f.hint.length).toBeGreaterThan(3);
      }
    }
  });
  it("a search without T gates (k = 0) takes no time and no factory", () => {
    const f = ok(forecastSearch({ ...ROTA, iterations: 0, successProbability: 1 }));
    expect(f.protocol).toBeUndefined();
    expect(f.reactionLimited).toMatchObject({ factories: 0, runSeconds: 0, expectedSeconds: 0, codeDistance: 3, limitedBy: "none" });
  });
});

const work = fc.record({
  tCount: fc.integer({ min: 1, max: 1e6 }),
  tDepthShare: fc.double({ min: 0.001, max: 1, noNaN: true }),
  toffoliCount: fc.nat(1e5),
  cnotCount: fc.nat(1e6),
  depth: fc.nat(1e6),
});
const input: fc.Arbitrary<ForecastInput> = fc
  .record({
    logicalQubits: fc.integer({ min: 1, max: 5000 }),
    oracleShare: fc.double({ min: 0.1, max: 1, noNaN: true }),
    iteration: work,
    iterations: fc.oneof(fc.integer({ min: 0, max: 100 }), fc.integer({ min: 0, max: 2 ** 40 })),
    successProbability: fc.double({ min: 0.01, max: 1, noNaN: true }),
  })
  .map((r) => {
    const tDepth = Math.max(1, Math.round(r.iteration.tCount * r.iteration.tDepthShare));
    const iteration = { tCount: r.iteration.tCount, tDepth, toffoliCount: r.iteration.toffoliCount, cnotCount: r.iteration.cnotCount, depth: r.iteration.depth };
    const oracle = { ...iteration, tCount: Math.max(1, Math.floor(iteration.tCount * r.oracleShare)), tDepth: Math.max(1, Math.floor(tDepth * r.oracleShare)) };
    return { logicalQubits: r.logicalQubits, oracle, iteration, iterations: r.iterations, successProbability: r.successProbability, source: "fast-check" };
  });
const machine = fc.record({
  physicalErrorRate: fc.double({ min: 1e-6, max: 1e-3, noNaN: true }),
  cycleSeconds: fc.double({ min: 1e-8, max: 1e-4, noNaN: true }),
  reactionSeconds: fc.double({ min: 1e-7, max: 1e-3, noNaN: true }),
  failureBudget: fc.double({ min: 1e-6, max: 0.5, noNaN: true }),
});

describe("laws (fast-check)", () => {
  it("expected time = run time / success probability, exactly, in both regimes", () => {
    fc.assert(
      fc.property(input, machine, (i, m) => {
        const f = forecastSearch(i, m);
        if (!f.ok) return;
        for (const r of [f.reactionLimited, f.oneFactory]) expect(r.expectedSeconds).toBe(r.runSeconds / i.successProbability);
      }),
      { numRuns: 300 },
    );
  });
  it("run time = k x max(T-depth x reaction time, T-count x cycles per state x cycle time / factories); enough factories is the fewest that keep the T-depth bound", () => {
    fc.assert(
      fc.property(input, machine, (i, m) => {
        const f = forecastSearch(i, m);
        if (!f.ok || f.protocol === undefined) return;
        const state = f.protocol.codeCycles * m.cycleSeconds;
        const depthBound = i.iteration.tDepth * m.reactionSeconds;
        for (const r of [f.reactionLimited, f.oneFactory]) {
          expect(r.iterationSeconds).toBe(Math.max(depthBound, i.iteration.tCount * (state / r.factories)));
          expect(r.runSeconds).toBe(i.iterations * r.iterationSeconds);
          expect(r.oracleSeconds).toBe(Math.max(i.oracle.tDepth * m.reactionSeconds, i.oracle.tCount * (state / r.factories)));
        }
        const F = f.reactionLimited.factories;
        expect(f.oneFactory.factories).toBe(1);
        expect(i.iteration.tCount * (state / F)).toBeLessThanOrEqual(depthBound * (1 + 1e-12));
        if (F > 1) expect(i.iteration.tCount * (state / (F - 1))).toBeGreaterThan(depthBound * (1 - 1e-12));
        expect(Math.abs(f.reactionLimited.runSeconds - i.iterations * depthBound)).toBeLessThanOrEqual(1e-12 * i.iterations * depthBound);
      }),
      { numRuns: 300 },
    );
  });
  it("code distance and physical qubits never fall as the error rate rises or the failure budget tightens", () => {
    fc.assert(
      fc.property(input, machine, fc.double({ min: 1e-6, max: 1e-3, noNaN: true }), fc.double({ min: 1e-6, max: 0.5, noNaN: true }), (i, m, p2, b2) => {
        const base = forecastSearch(i, m);
        const harder = [
          forecastSearch(i, { ...m, physicalErrorRate: Math.max(m.physicalErrorRate, p2) }),
          forecastSearch(i, { ...m, failureBudget: Math.min(m.failureBudget, b2) }),
        ];
        for (const h of harder) {
          if (!base.ok) {
            expect(h.ok).toBe(false);
            continue;
          }
          if (!h.ok) continue;
          for (const k of ["reactionLimited", "oneFactory"] as const) {
            expect(h[k].codeDistance).toBeGreaterThanOrEqual(base[k].codeDistance);
            expect(h[k].physicalQubits.total).toBeGreaterThanOrEqual(base[k].physicalQubits.total);
            expect(h[k].logicalFailure.total).toBeLessThanOrEqual(h === harder[1] ? Math.min(m.failureBudget, b2) * (1 + 1e-12) : m.failureBudget * (1 + 1e-12));
          }
        }
      }),
      { numRuns: 400 },
    );
  });
});
