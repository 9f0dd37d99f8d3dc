// The T-count targets of structured synthesis (issue 9), measured on built circuits: full
// register, wide strategy, measured uncomputation, Clifford+T basis.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { adder, CircuitEncoder, multiplier, randomCircuit, randomXorRows, xorSystem, type Encoded } from "../helpers/encoders.js";
import { colouring } from "../helpers/formulas.js";
import { cnfFromClauses, compileOracle, countCircuit, type Cnf } from "../helpers/lib.js";

const cnfOf = (f: Encoded): Cnf => cnfFromClauses(f.variables, f.clauses);

/** T gates of the full-register wide oracle, measured uncomputation, Clifford+T, with or without structure. */
const tCount = (cnf: Cnf, structure: boolean): number =>
  countCircuit(compileOracle(cnf, { basis: "clifford+t", uncompute: "measured", structure }).circuit).tCount;

/** Formulas built from gates, parities and one-hot groups. */
function structuredFormulas(): [string, Cnf][] {
  const out: [string, Cnf][] = [];
  for (let seed = 1; seed <= 40; seed++) {
    const f = randomCircuit(seed, { gates: 2 + (seed % 9), oneHot: [0, 3, 4, 6][seed % 4]!, parities: seed % 3 });
    out.push([`random circuit ${seed}`, cnfOf(f)]);
  }
  for (const [a, b, n] of [[3, 3, 15], [4, 4, 143], [4, 4, 36]] as const) out.push([`${a} x ${b} multiplier = ${n}`, cnfOf(multiplier(a, b, BigInt(n)))]);
  for (const [bits, s] of [[4, 11], [6, 77], [8, 300]] as const) out.push([`${bits}-bit adder = ${s}`, cnfOf(adder(bits, BigInt(s)))]);
  for (const [n, rows, k] of [[18, 12, 4], [12, 6, 3], [20, 8, 5]] as const) out.push([`${rows} random ${k}-XOR over ${n}`, cnfOf(xorSystem(n, randomXorRows(n, rows, k, n + rows)))]);
  out.push(["3-colourings of a 5-cycle", colouring(5, [[0, 1], [1, 2], [2, 3], [3, 4], [4, 0]], 3)]);
  out.push(["4-colourings of K4 plus a pendant", colouring(5, [[0, 1], [0, 2], [0, 3], [1, 2], [1, 3], [2, 3], [3, 4]], 4)]);
  const e = new CircuitEncoder();
  const rows = Array.from({ length: 4 }, () => e.inputWord(5));
  for (const r of rows) e.exactlyOne(r);
  for (let c = 0; c < 5; c++) e.atMostOne(rows.map((r) => r[c]!));
  out.push(["4 x 5 assignment (exactly one per row, at most one per column)", cnfOf(e.encoded())]);
  return out;
}

describe("structured T-count (full register, wide, measured, Clifford+T)", () => {
  it("is never above the clause construction's, and at most half of it in the median", () => {
    const ratios: number[] = [];
    const lines: string[] = [];
    for (const [name, cnf] of structuredFormulas()) {
      const withStructure = tCount(cnf, true);
      const without = tCount(cnf, false);
      expect(withStructure, name).toBeLessThanOrEqual(without);
      ratios.push(withStructure / without);
      lines.push(`${name}: ${withStructure} T with structure, ${without} without`);
    }
    ratios.sort((a, b) => a - b);
    const median = ratios[Math.floor(ratios.length / 2)]!;
    console.log(`structured / clause T-count over ${ratios.length} formulas: median ${median.toFixed(3)}, max ${ratios[ratios.length - 1]!.toFixed(3)}\n${lines.slice(-12).join("\n")}`);
    expect(median).toBeLessThanOrEqual(0.5);
  });

  it("is never above the clause construction's on random CNF with a few encoded gates mixed in (fast-check)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), fc.integer({ min: 0, max: 12 }), fc.integer({ min: 0, max: 3 }), (seed, extra, oneHot) => {
        const f = randomCircuit(seed, { gates: 1 + (seed % 6), extraClauses: extra, oneHot: oneHot ? 2 + oneHot : 0, parities: seed % 2, forceOutput: seed % 3 !== 0 });
        const cnf = cnfOf(f);
        expect(tCount(cnf, true)).toBeLessThanOrEqual(tCount(cnf, false));
      }),
      { numRuns: 80 },
    );
  });

  it("costs at most 4 T per constraint on formulas of k-XOR constraints only", () => {
    for (const k of [2, 3, 4, 5, 6]) {
      for (const rows of [1, 2, 5, 12, 20]) {
        const cnf = cnfOf(xorSystem(24, randomXorRows(24, rows, k, 100 * k + rows)));
        expect(tCount(cnf, true), `${rows} ${k}-XOR`).toBeLessThanOrEqual(4 * rows);
      }
    }
    // The example: 12 random 4-XOR over 18 variables (96 clauses), 1,528 T clause by clause.
    const cnf = cnfOf(xorSystem(18, randomXorRows(18, 12, 4, 1)));
    const [withStructure, without] = [tCount(cnf, true), tCount(cnf, false)];
    console.log(`12 random 4-XOR over 18 variables: ${withStructure} T with structure, ${without} without`);
    expect(withStructure).toBeLessThanOrEqual(48);
  });
});
