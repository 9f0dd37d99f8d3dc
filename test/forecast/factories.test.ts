// Magic-state factories against Litinski 2019, "Magic state distillation: not as costly as you
// think" (Quantum 3:205): Table 1's operating points, and its space and time formulas for the
// one-level (15-to-1)_{dX,dZ,dm} protocol.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { chooseDistillation, DISTILLATION_PROTOCOLS, fifteenToOneCycles, fifteenToOneQubits, MAX_TABULATED_ERROR_RATE } from "../helpers/lib.js";

const row = (name: string) => DISTILLATION_PROTOCOLS.find((r) => r.name === name)!;
/** Rounded to three significant digits, as Table 1 prints qubit counts. */
const three = (x: number): number => Number(x.toPrecision(3));

describe("Litinski 2019, Table 1", () => {
  it("(15-to-1)_{17,7,7} at p = 1e-3: 4,620 qubits, 42.6 code cycles, output error 4.5e-8", () => {
    expect(row("(15-to-1)_{17,7,7}")).toEqual({ name: "(15-to-1)_{17,7,7}", physicalErrorRate: 1e-3, outputError: 4.5e-8, qubits: 4620, codeCycles: 42.6 });
  });
  it("(15-to-1)_{9,3,3} at p = 1e-4: 1,150 qubits, 18.1 code cycles, output error 9.3e-10", () => {
    expect(row("(15-to-1)_{9,3,3}")).toMatchObject({ physicalErrorRate: 1e-4, outputError: 9.3e-10, qubits: 1150, codeCycles: 18.1 });
  });
  it("the one-level rows' qubits follow 2 (dX + 4 dZ) 3 dX + 4 dm (Litinski 2019's space cost), to the table's rounding", () => {
    for (const [name, dX, dZ, dm] of [["(15-to-1)_{7,3,3}", 7, 3, 3], ["(15-to-1)_{9,3,3}", 9, 3, 3], ["(15-to-1)_{11,5,5}", 11, 5, 5], ["(15-to-1)_{17,7,7}", 17, 7, 7]] as const) {
      expect(three(fifteenToOneQubits(dX, dZ, dm))).toBe(row(name).qubits);
    }
    expect(fifteenToOneQubits(17, 7, 7)).toBe(4618);
  });
  it("the one-level rows' cycles are 6 dm per attempt over the acceptance rate: at most 2% above 6 dm (Litinski 2019's time cost)", () => {
    for (const [name, dm] of [["(15-to-1)_{7,3,3}", 3], ["(15-to-1)_{9,3,3}", 3], ["(15-to-1)_{11,5,5}", 5], ["(15-to-1)_{17,7,7}", 7]] as const) {
      const cycles = row(name).codeCycles;
      expect(cycles).toBeGreaterThanOrEqual(6 * dm);
      expect(cycles).toBeLessThanOrEqual(6 * dm * 1.02);
    }
    // 42.6 = 42 / (1 - 1.4%): the rejection rate the (17,7,7) row implies.
    expect(fifteenToOneCycles(7, 0.014)).toBeCloseTo(42.6, 1);
  });
  it("two-level rows distil further at a higher cost: output error falls as qubits and cycles rise, per physical error rate", () => {
    for (const p of [1e-4, 1e-3]) {
      const rows = DISTILLATION_PROTOCOLS.filter((r) => r.physicalErrorRate === p).sort((a, b) => b.outputError - a.outputError);
      expect(rows.length).toBeGreaterThanOrEqual(2);
      for (let i = 1; i < rows.length; i++) {
        expect(rows[i]!.qubits).toBeGreaterThan(rows[i - 1]!.qubits);
        expect(rows[i]!.codeCycles).toBeGreaterThanOrEqual(rows[i - 1]!.codeCycles);
      }
    }
  });
});

describe("choosing a protocol", () => {
  it("takes the cheapest row (qubits x cycles) whose output error is within the need", () => {
    const pick = (p: number, need: number): string => {
      const c = chooseDistillation(p, need);
      return c.ok ? c.protocol.name : `refused: ${c.reason}`;
    };
    expect(pick(1e-3, 1e-7)).toBe("(15-to-1)_{17,7,7}");
    expect(pick(1e-3, 1e-9)).toBe("(15-to-1)^6_{11,5,5} x (15-to-1)_{25,11,11}");
    expect(pick(1e-3, 1e-13)).toBe("(15-to-1)^6_{13,5,5} x (15-to-1)_{29,11,13}");
    expect(pick(1e-3, 1e-16)).toBe("(15-to-1)^6_{17,7,7} x (15-to-1)_{41,17,17}");
    expect(pick(1e-4, 1e-7)).toBe("(15-to-1)_{7,3,3}");
    expect(pick(1e-4, 1e-9)).toBe("(15-to-1)_{9,3,3}");
    expect(pick(1e-4, 1e-12)).toBe("(15-to-1)^4_{9,3,3} x (15-to-1)_{25,9,9}");
  });
  it("between tabulated rates uses the rows of the next higher rate (conservative); refuses above 1e-3 and beyond the best row", () => {
    const mid = chooseDistillation(5e-4, 1e-7);
    expect(mid.ok && mid.protocol.name).toBe("(15-to-1)_{17,7,7}");
    const low = chooseDistillation(1e-5, 1e-7);
    expect(low.ok && low.protocol.name).toBe("(15-to-1)_{7,3,3}");
    const high = chooseDistillation(2e-3, 1e-7);
    expect(high.ok).toBe(false);
    if (!high.ok) expect(high.reason).toMatch(/above the distillation table's highest rate \(0\.001/);
    const far = chooseDistillation(1e-3, 1e-21);
    expect(far.ok).toBe(false);
    if (!far.ok) expect(far.reason).toMatch(/best tabulated protocol at this error rate, .*41,17,17.*, gives 4\.5e-20/);
    expect(MAX_TABULATED_ERROR_RATE).toBe(1e-3);
  });
  it("property: the chosen factory's qubits and cycles never fall as the need tightens or the error rate rises", () => {
    const rate = fc.double({ min: 1e-6, max: 1e-3, noNaN: true });
    const need = fc.double({ min: 1e-26, max: 1e-6, noNaN: true });
    fc.assert(
      fc.property(rate, rate, need, need, (p1, p2, e1, e2) => {
        const [pl, ph] = p1 <= p2 ? [p1, p2] : [p2, p1];
        const [tight, loose] = e1 <= e2 ? [e1, e2] : [e2, e1];
        const base = chooseDistillation(pl, loose);
        if (!base.ok) {
          // A refusal at the easier setting must hold at the harder ones too.
          expect(chooseDistillation(ph, loose).ok).toBe(false);
          expect(chooseDistillation(pl, tight).ok).toBe(false);
          return;
        }
        for (const harder of [chooseDistillation(ph, loose), chooseDistillation(pl, tight)]) {
          if (!harder.ok) continue;
          expect(harder.protocol.qubits).toBeGreaterThanOrEqual(base.protocol.qubits);
          expect(harder.protocol.codeCycles).toBeGreaterThanOrEqual(base.protocol.codeCycles);
        }
      }),
      { numRuns: 500 },
    );
  });
});
