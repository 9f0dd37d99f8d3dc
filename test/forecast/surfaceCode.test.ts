// The surface-code scalings against their published forms, and the code-distance rule.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { codeDistanceFor, LOGICAL_ERROR_MODELS, logicalErrorRate, patchQubits, routingPatches } from "../helpers/lib.js";

const FG = LOGICAL_ERROR_MODELS["fowler-gidney-2018"];
const F12 = LOGICAL_ERROR_MODELS["fowler-2012"];

describe("logical error per qubit per code cycle", () => {
  it("Fowler & Gidney 2018: p_L = 0.1 (100 p)^((d+1)/2), evaluated by hand at p = 1e-3 and 1e-4", () => {
    // At p = 1e-3 every 2 added to d gains a factor 10: 0.1 x 0.1^((d+1)/2).
    expect(logicalErrorRate(FG, 1e-3, 3)).toBeCloseTo(1e-3, 15);
    expect(logicalErrorRate(FG, 1e-3, 17) / 1e-10).toBeCloseTo(1, 12);
    expect(logicalErrorRate(FG, 1e-3, 27) / 1e-15).toBeCloseTo(1, 12);
    // At p = 1e-4 a factor 100 per step: 0.1 x 0.01^((d+1)/2); d = 9 gives 1e-11.
    expect(logicalErrorRate(FG, 1e-4, 9) / 1e-11).toBeCloseTo(1, 12);
  });
  it("Fowler, Mariantoni, Martinis & Cleland 2012: P_L ~ 0.03 (p / p_th)^((d+1)/2) with p_th = 0.57%", () => {
    expect(F12.prefactor).toBe(0.03);
    expect(F12.threshold).toBe(0.0057);
    // p a tenth of the threshold: 0.03 x 10^-(d+1)/2, so d = 5 gives 3e-5 and d = 15 gives 3e-10.
    expect(logicalErrorRate(F12, 0.00057, 5) / 3e-5).toBeCloseTo(1, 12);
    expect(logicalErrorRate(F12, 0.00057, 15) / 3e-10).toBeCloseTo(1, 12);
  });
  it("a patch of distance d takes 2 d^2 physical qubits (d^2 data, d^2 - 1 measurement, rounded up)", () => {
    expect([3, 15, 27].map(patchQubits)).toEqual([18, 450, 1458]);
  });
  it("routing of the fast block: 2n + sqrt(8n) + 1 tiles in all (Litinski 2019, A Game of Surface Codes)", () => {
    // n = 2: 4 + 4 + 1 = 9 tiles, 7 of them routing; n = 100: 200 + 29 (sqrt 800 = 28.3, rounded up) + 1.
    expect(routingPatches(2)).toBe(7);
    expect(routingPatches(100) + 100).toBe(230);
    expect(routingPatches(0)).toBe(0);
  });
});

describe("code distance", () => {
  it("is the smallest odd d >= 3 within the budget (hand-computed: 1e8 patch-cycles, 0.005, p = 1e-3 -> 19)", () => {
    // 1e8 x 0.1 x 0.1^((d+1)/2) <= 0.005 needs (d+1)/2 >= 9.3, so d = 19 (d = 17 gives 1e-2 > 0.005).
    expect(codeDistanceFor(FG, 1e-3, 1e8, 0.005)).toBe(19);
    expect(codeDistanceFor(FG, 1e-3, 0, 0.005)).toBe(3);
    expect(codeDistanceFor(FG, 1e-3, 1, 0.5)).toBe(3);
  });
  it("stays finite for astronomically long computations, and refuses at or above threshold", () => {
    const d = codeDistanceFor(FG, 1e-3, 1e150, 0.005)!;
    expect(d % 2).toBe(1);
    expect(1e150 * logicalErrorRate(FG, 1e-3, d)).toBeLessThanOrEqual(0.005);
    expect(1e150 * logicalErrorRate(FG, 1e-3, d - 2)).toBeGreaterThan(0.005);
    expect(codeDistanceFor(FG, 0.01, 10, 0.005)).toBeUndefined();
    expect(codeDistanceFor(FG, 0.02, 10, 0.005)).toBeUndefined();
  });
  it("property: the returned d meets the budget, d - 2 does not, and d never falls as p, the work or the tightness rises", () => {
    const rate = fc.double({ min: 1e-6, max: 5e-3, noNaN: true });
    const work = fc.double({ min: 1, max: 1e40, noNaN: true });
    const budget = fc.double({ min: 1e-6, max: 0.5, noNaN: true });
    fc.assert(
      fc.property(rate, rate, work, work, budget, budget, (p1, p2, w1, w2, b1, b2) => {
        const [pl, ph] = p1 <= p2 ? [p1, p2] : [p2, p1];
        const [wl, wh] = w1 <= w2 ? [w1, w2] : [w2, w1];
        const [bt, bl] = b1 <= b2 ? [b1, b2] : [b2, b1];
        for (const model of [FG, F12]) {
          const d = codeDistanceFor(model, pl, wl, bl)!;
          expect(wl * logicalErrorRate(model, pl, d)).toBeLessThanOrEqual(bl);
          if (d > 3) expect(wl * logicalErrorRate(model, pl, d - 2)).toBeGreaterThan(bl);
          expect(codeDistanceFor(model, ph, wl, bl)!).toBeGreaterThanOrEqual(d);
          expect(codeDistanceFor(model, pl, wh, bl)!).toBeGreaterThanOrEqual(d);
          expect(codeDistanceFor(model, pl, wl, bt)!).toBeGreaterThanOrEqual(d);
        }
      }),
      { numRuns: 300 },
    );
  });
});
