// Plans shared within one command (sharingPlans): the same plan as planned anew, made once.
import { describe, expect, it } from "vitest";
import { planOracle, sharingPlans } from "../../dist/src/synth/plan.js";
import { cnfFromClauses } from "../helpers/lib.js";

// A Tseitin AND (3 <-> 1 AND 2) and a unit clause, so both register modes and structure matter.
const cnf = cnfFromClauses(5, [[-3, 1], [-3, 2], [3, -1, -2], [3, 4, 5], [-4, -5], [1]]);

describe("sharingPlans", () => {
  it("gives every mode and structure setting the plan made anew, once per formula object", () => {
    for (const mode of ["full", "free"] as const) {
      for (const structure of [true, false]) {
        const fresh = planOracle(cnf, mode, structure);
        sharingPlans(() => {
          const a = planOracle(cnf, mode, structure);
          const b = planOracle(cnf, mode, structure);
          expect(b).toBe(a);
          expect(a).toStrictEqual(fresh);
          // The other setting of the same formula is its own plan.
          expect(planOracle(cnf, mode, !structure)).toStrictEqual(planOracle(cnf, mode, !structure));
          expect(planOracle(cnf, mode, !structure)).not.toBe(a);
        });
      }
    }
  });

  it("shares nothing outside its scope, nor across formula objects", () => {
    let inside: unknown;
    sharingPlans(() => {
      inside = planOracle(cnf, "full", true);
      const copy = cnfFromClauses(5, [[-3, 1], [-3, 2], [3, -1, -2], [3, 4, 5], [-4, -5], [1]]);
      expect(planOracle(copy, "full", true)).not.toBe(inside);
    });
    expect(planOracle(cnf, "full", true)).not.toBe(inside);
  });
});
