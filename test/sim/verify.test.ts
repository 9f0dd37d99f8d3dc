// Verification: both simulators against each other and against outside references, every
// combination verified, and mutated circuits rejected with a true counterexample.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CircuitBuilder, K } from "../helpers/circuits.js";
import { randomKSat } from "../helpers/formulas.js";
import { existsSync, readFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { ROOT } from "../helpers/cli.js";
import { evaluate } from "../../dist/src/cnf/evaluate.js";
import { randomPart } from "../../dist/src/sim/verify.js";
import { drawIndex, drawPermuted, unskipped } from "../../dist/src/sim/verifyKernel.js";
import {
  checkOracleSparse, cnfFromClauses, collect, compileOracle, countModels, emitJson, emitQasm3, readCircuit, readDimacs,
  simulateClassical, verifyOracle, type Circuit, type Cnf,
} from "../helpers/lib.js";

/** Formulas up to `max` variables, clause widths 0..6: empty, unit, tautological clauses, repeated literals, unused variables. */
const formulaUpTo = (max: number) =>
  fc.integer({ min: 1, max }).chain((n) =>
    fc.record({ n: fc.constant(n), clauses: fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { maxLength: 6 }), { maxLength: 14 }) }),
  );
const formula = formulaUpTo(8);
const COMBOS = (["phase", "flag"] as const).flatMap((kind) =>
  (["wide", "lean"] as const).flatMap((strategy) =>
    (["mcx", "toffoli", "clifford+t"] as const).flatMap((basis) => (["unitary", "measured"] as const).map((uncompute) => ({ kind, strategy, basis, uncompute }))),
  ),
);

describe("verifyOracle", () => {
  it("verifies every strategy x kind x basis x uncomputation exhaustively on random formulas (up to 12 variables; 8 for Clifford+T)", async () => {
    await fc.assert(
      fc.asyncProperty(formulaUpTo(12), fc.constantFrom(...COMBOS), async ({ n, clauses }, o) => {
        fc.pre(o.basis !== "clifford+t" || n <= 8);
        const cnf = cnfFromClauses(n, clauses);
        const r = await verifyOracle(cnf, compileOracle(cnf, o).circuit, { threads: 1 });
        expect(r.counterexample).toBeNull();
        expect(r).toMatchObject({ verified: true, method: "exhaustive", assignments: 2 ** n });
        // Clifford+T circuits need the state-vector simulator, unless they hold no T gate at all.
        if (o.basis !== "clifford+t") expect(r.simulator).toBe("bit-parallel");
      }),
      { numRuns: 150 },
    );
  });
  it("finds on all 2^n inputs exactly as many satisfying assignments as the exact model count", async () => {
    await fc.assert(
      fc.asyncProperty(formula, async ({ n, clauses }) => {
        const cnf = cnfFromClauses(n, clauses);
        const r = await verifyOracle(cnf, compileOracle(cnf, { basis: "mcx" }).circuit, { threads: 1 });
        const exact = await countModels(cnf);
        if (!exact.ok) throw new Error(`the exact count failed: ${exact.reason}`);
        expect(BigInt(r.models)).toBe(exact.models);
        expect(r.models + r.nonModels).toBe(2 ** n);
      }),
      { numRuns: 100 },
    );
  });
  it("checks 2^20 assignments of a 20-variable formula on worker threads", async () => {
    const cnf = randomKSat(20, 85, 3, 7);
    const r = await verifyOracle(cnf, compileOracle(cnf, { basis: "toffoli", uncompute: "measured" }).circuit, { threads: 2 });
    expect(r).toMatchObject({ verified: true, method: "exhaustive", assignments: 2 ** 20 });
    const exact = await countModels(cnf);
    if (!exact.ok) throw new Error(`the exact count failed: ${exact.reason}`);
    expect(exact.models).toBeGreaterThan(0n);
    expect(BigInt(r.models)).toBe(exact.models);
  });
  it("samples above the exhaustive limit, including satisfying assignments found by the CDCL solver", async () => {
    const cnf = randomKSat(60, 200, 3, 8);
    const r = await verifyOracle(cnf, compileOracle(cnf, { basis: "mcx" }).circuit, { samples: 1000 });
    expect(r).toMatchObject({ verified: true, method: "sampled", samples: 1000, falsifying: 32, notes: [] });
    expect(r.modelSearch).toMatchObject({ status: "sat", found: 64 });
    expect(r.assignments).toBe(1000 + 64 + 32);
    expect(r.models).toBeGreaterThanOrEqual(64);
    expect(r.nonModels).toBeGreaterThanOrEqual(32);
    expect(r.models + r.nonModels).toBe(r.assignments);
  });
  it("verifies the examples in every combination", async () => {
    for (const file of ["allotment-pair.cnf", "allotment-row.cnf", "herb-spiral.cnf", "launch-rota.cnf"]) {
      const cnf = readDimacs(readFileSync(join(ROOT, "examples", file))).cnf!;
      for (const o of COMBOS) {
        if (o.basis === "clifford+t" && o.strategy === "lean" && cnf.variables > 8) continue; // covered by test/compile/semantics
        const r = await verifyOracle(cnf, compileOracle(cnf, o).circuit, { threads: 1 });
        expect(r.verified, `${file} ${JSON.stringify(o)}`).toBe(true);
      }
    }
  }, 300_000);
  it("simulateClassical runs one basis input of a classical circuit", () => {
    const cnf = cnfFromClauses(2, [[1, 2]]);
    const c = compileOracle(cnf, { kind: "flag", basis: "toffoli" }).circuit;
    const r = simulateClassical(c, [true, false, false]);
    expect("unsupported" in r).toBe(false);
    if (!("unsupported" in r)) expect(r).toMatchObject({ phase: 1, faultGate: -1, qubits: [true, false, true, ...Array(c.qubits - 3).fill(false)] });
  });
  it("rejects a search register of the wrong size", async () => {
    const cnf = cnfFromClauses(3, [[1, 2]]);
    const r = await verifyOracle(cnfFromClauses(4, [[1, 2]]), compileOracle(cnf).circuit);
    expect(r.verified).toBe(false);
    expect(r.problem).toBe("the search register vars has 3 qubits but the formula declares 4 variables");
  });
  it("verifies circuits read back from OpenQASM 3 and JSON", async () => {
    const cnf = randomKSat(8, 30, 3, 9);
    for (const basis of ["mcx", "toffoli", "clifford+t"] as const) {
      const c = compileOracle(cnf, { basis, uncompute: "measured", kind: "flag" }).circuit;
      for (const text of [collect((s) => emitQasm3(c, s)), collect((s) => emitJson(c, s))]) {
        const back = readCircuit(text);
        expect(back.diagnostics).toEqual([]);
        expect((await verifyOracle(cnf, back.circuit!)).verified).toBe(true);
      }
    }
  });
});

/** A copy of c with gate `drop` removed, or with gates inserted before index `at`. */
function edit(c: Circuit, change: (b: CircuitBuilder, g: number) => boolean): Circuit {
  const b = new CircuitBuilder({ search: c.registers[0]!.size, target: c.registers.find((r) => r.role === "target")?.size ?? 0, work: c.registers.find((r) => r.role === "work")?.size ?? 0, clbits: c.clbits });
  for (let g = 0; g <= c.gates; g++) {
    if (change(b, g)) continue;
    if (g < c.gates) b.copy(c, g);
  }
  return b.finish();
}

/**
 * True when the sparse simulator finds the circuit wrong on this assignment, for some of 16
 * measurement-outcome sequences (a dropped reset shows only when its measurement gives 1).
 */
function wrongOn(cnf: Cnf, c: Circuit, kind: "phase" | "flag", assignment: boolean[]): boolean {
  const x = assignment.reduce((acc, on, v) => acc + (on ? 2 ** v : 0), 0);
  return Array.from({ length: 16 }, (_, i) => i + 1).some((seed) => checkOracleSparse(c, cnf, { kind, assignments: [x], seed }) !== null);
}

describe("mutation tests: verify rejects a broken oracle with a true counterexample", () => {
  const satisfiable = fc.integer({ min: 3, max: 8 }).chain((n) => fc.integer({ min: 1, max: 1000 }).map((seed) => randomKSat(n, Math.round(n * 2.5), 3, seed)));

  async function expectCaught(cnf: Cnf, mutated: Circuit, kind: "phase" | "flag"): Promise<void> {
    const r = await verifyOracle(cnf, mutated, { threads: 1 });
    expect(r.verified).toBe(false);
    expect(r.counterexample).not.toBeNull();
    expect(wrongOn(cnf, mutated, kind, r.counterexample!.assignment)).toBe(true);
    expect(r.counterexample!.dimacs).toMatch(/^(-?\d+ )+0$/);
  }

  it("flipping one control polarity (mcx basis)", async () => {
    await fc.assert(
      fc.asyncProperty(satisfiable, fc.nat(), async (cnf, pick) => {
        const c = compileOracle(cnf, { basis: "mcx" }).circuit;
        const controlled = Array.from({ length: c.gates }, (_, g) => g).filter((g) => c.kind[g] === K.mcx && c.opStart[g + 1]! - c.opStart[g]! > 1);
        fc.pre(controlled.length > 0);
        const g = controlled[pick % controlled.length]!;
        const ops = c.ops.slice();
        ops[c.opStart[g]!]! ^= 1;
        const mutated = { ...c, ops };
        await expectCaught(cnf, mutated, "phase");
      }),
      { numRuns: 40 },
    );
  });
  it("dropping one uncomputation gate (toffoli basis, unitary and measured)", async () => {
    await fc.assert(
      fc.asyncProperty(satisfiable, fc.constantFrom("unitary" as const, "measured" as const), fc.nat(), async (cnf, uncompute, pick) => {
        const c = compileOracle(cnf, { basis: "toffoli", uncompute }).circuit;
        const kind = uncompute === "unitary" ? K.ccx : K.reset;
        const candidates = Array.from({ length: c.gates }, (_, g) => g).filter((g) => c.kind[g] === kind && g > c.gates / 2);
        fc.pre(candidates.length > 0);
        const drop = candidates[pick % candidates.length]!;
        await expectCaught(cnf, edit(c, (_b, g) => g === drop), "phase");
      }),
      { numRuns: 40 },
    );
  });
  it("adding a stray T (clifford+t basis, state-vector simulator)", async () => {
    await fc.assert(
      fc.asyncProperty(satisfiable, fc.nat(), async (cnf, pick) => {
        const c = compileOracle(cnf, { basis: "clifford+t" }).circuit;
        const at = pick % (c.gates + 1);
        await expectCaught(cnf, edit(c, (b, g) => {
          if (g === at) b.add(K.t, 0); // on x[0]: a phase of e^(i pi/4) whenever x1 = 1
          return false;
        }), "phase");
      }),
      { numRuns: 25 },
    );
  });
  it("omitting the phase (the marking gate removed)", async () => {
    await fc.assert(
      fc.asyncProperty(satisfiable, fc.constantFrom("mcx" as const, "toffoli" as const), async (cnf, basis) => {
        const c = compileOracle(cnf, { basis }).circuit;
        const marks = Array.from({ length: c.gates }, (_, g) => g).filter((g) => c.kind[g] === K.mcz || c.kind[g] === K.cz || c.kind[g] === K.z || c.kind[g] === K.gphase);
        fc.pre(marks.length === 1);
        await expectCaught(cnf, edit(c, (_b, g) => g === marks[0]), "phase");
      }),
      { numRuns: 30 },
    );
  });
  it("an oracle that leaves a work qubit dirty is reported with the qubit's name", async () => {
    const cnf = cnfFromClauses(3, [[1, 2, 3], [-1, 2]]);
    const c = compileOracle(cnf, { basis: "mcx" }).circuit;
    const lastAnd = Array.from({ length: c.gates }, (_, g) => g).filter((g) => c.kind[g] === K.mcx).at(-1)!;
    const r = await verifyOracle(cnf, edit(c, (_b, g) => g === lastAnd));
    expect(r.counterexample!.actual).toMatch(/work\[\d+\] left at \|1>/);
  });
});

const SATLIB = resolve(ROOT, "../shared/satlib");
const haveSatlib = existsSync(resolve(SATLIB, "manifest.json"));
const satlib = (file: string): Cnf => readDimacs(readFileSync(resolve(SATLIB, file))).cnf!;
/** Everything but the gates that mark: the oracle's own computation, uncomputed, with no phase. */
const withoutMarking = (c: Circuit): Circuit => edit(c, (_b, g) => g < c.gates && (c.kind[g] === K.mcz || c.kind[g] === K.cz || c.kind[g] === K.z || c.kind[g] === K.gphase));
/** The identity on the circuit's registers: no gates at all. */
const identity = (c: Circuit): Circuit => edit(c, (_b, g) => g < c.gates);

describe("sampled verification says verified only after checking both marked and unmarked inputs", () => {
  it.skipIf(!haveSatlib)("SATLIB (Hoos & Stuetzle 2000) aim-50-1_6-yes1-1, one model: its oracle without the phase gate is not verified", async () => {
    const cnf = satlib("aim/aim-50-1_6-yes1-1.cnf");
    const c = compileOracle(cnf, { basis: "mcx" }).circuit;
    expect(Array.from(c.kind).filter((k) => k === K.mcz)).toHaveLength(1); // the only phase gate
    for (const broken of [withoutMarking(c), identity(c)]) {
      const r = await verifyOracle(cnf, broken, { samples: 65536 });
      expect(r).toMatchObject({ verified: false, method: "sampled", models: 1 });
      expect(r.modelSearch).toMatchObject({ status: "sat", found: 1, all: true });
      // The counterexample is the formula's one model, left unmarked.
      expect(evaluate(cnf, r.counterexample!.assignment)).toBe(true);
      expect(r.counterexample!.actual).toBe("phase +1");
    }
    const good = await verifyOracle(cnf, c);
    expect(good).toMatchObject({ verified: true, method: "sampled", models: 1 });
  });
  it.skipIf(!haveSatlib)("15 satisfiable SATLIB formulas (aim *-1_6-yes1, ais10, ais12, logistics, bw_large) each get models checked", async () => {
    const files = [
      ...["1", "2", "3", "4"].map((i) => `aim/aim-50-1_6-yes1-${i}.cnf`), "aim/aim-100-1_6-yes1-1.cnf",
      "ais/ais10.cnf", "ais/ais12.cnf",
      ...["a", "b", "c", "d"].map((x) => `logistics/logistics.${x}.cnf`),
      ...["a", "b", "c", "d"].map((x) => `blocksworld/bw_large.${x}.cnf`),
    ];
    for (const file of files) {
      const cnf = satlib(file);
      // Unoptimized: the optimizer's passes take most of a minute on bw_large.c/d and change nothing checked here.
      const c = compileOracle(cnf, { basis: "mcx", optimize: false }).circuit;
      const r = await verifyOracle(cnf, c, { samples: 256, models: 4 });
      expect(r.verified, file).toBe(true);
      expect(r.method, file).toBe("sampled");
      expect(r.modelSearch!.status, file).toBe("sat");
      expect(r.models, file).toBeGreaterThanOrEqual(1);
      expect(r.nonModels, file).toBeGreaterThanOrEqual(256);
    }
  }, 120_000);
  it.skipIf(!haveSatlib)("an unsatisfiable formula (SATLIB aim-50-1_6-no-1) checks only unmarked inputs, and says so", async () => {
    const cnf = satlib("aim/aim-50-1_6-no-1.cnf");
    const c = compileOracle(cnf, { basis: "toffoli" }).circuit;
    const r = await verifyOracle(cnf, c, { samples: 512 });
    expect(r).toMatchObject({ verified: true, method: "sampled", models: 0, nonModels: 512 + 32, notes: ["no models: the formula is unsatisfiable"] });
    expect(r.modelSearch).toMatchObject({ status: "unsat", found: 0, all: true });
    // An oracle that marks everything is caught on the unmarked inputs.
    const marksAll = edit(c, (b, g) => {
      if (g === 0) b.add(K.gphase, 4);
      return false;
    });
    expect(await verifyOracle(cnf, marksAll, { samples: 512 })).toMatchObject({ verified: false, counterexample: { actual: "phase -1" } });
  });
  it("a formula every assignment satisfies has no unmarked inputs to check, and says so", async () => {
    const n = 30;
    const cnf = cnfFromClauses(n, [[1, -1], [5, 2, -5]]);
    const c = compileOracle(cnf, { basis: "mcx" }).circuit;
    const r = await verifyOracle(cnf, c, { samples: 300 });
    expect(r).toMatchObject({ verified: true, method: "sampled", nonModels: 0, falsifying: 0 });
    expect(r.notes).toEqual(["no unmarked inputs: every assignment satisfies the formula (every clause holds a literal and its negation)"]);
    expect(r.models).toBe(r.assignments);
    const none = await verifyOracle(cnf, identity(c), { samples: 300 });
    expect(none).toMatchObject({ verified: false, counterexample: { actual: "phase +1" } });
    const exhaustive = await verifyOracle(cnfFromClauses(4, [[1, -1]]), compileOracle(cnfFromClauses(4, [[1, -1]]), { basis: "mcx" }).circuit);
    expect(exhaustive).toMatchObject({ verified: true, method: "exhaustive", models: 16, nonModels: 0, notes: ["no unmarked inputs: every assignment satisfies the formula"] });
  });
  it("a solver out of budget leaves the marked inputs unchecked: not verified, and why", async () => {
    const cnf = randomKSat(40, 170, 3, 11);
    const c = compileOracle(cnf, { basis: "mcx" }).circuit;
    const r = await verifyOracle(cnf, c, { samples: 100, conflictLimit: 0 });
    expect(r.modelSearch!.status).toBe("unknown");
    // At 4.25 clauses per variable a random sample of 100 holds no model (the chance is below 1e-6).
    expect(r).toMatchObject({ verified: false, models: 0, counterexample: null });
    expect(r.unchecked).toBe("no satisfying assignment was checked: the CDCL solver spent its budget of 0 conflicts without finding one or proving that there is none");
  });
  it("every check of a sampled run is counted: models, others, the solver's, the falsifying and the random ones", async () => {
    const cnf = randomKSat(30, 100, 3, 5);
    const r = await verifyOracle(cnf, compileOracle(cnf, { basis: "toffoli", uncompute: "measured" }).circuit, { exhaustiveLimit: 10, samples: 64, models: 8 });
    expect(r.modelSearch!.found).toBe(8);
    expect(r.assignments).toBe(64 + 8 + r.falsifying);
    // 32 made, one per clause; two made from the same model may coincide: counted once.
    expect(r.falsifying).toBeGreaterThan(24);
    expect(r.falsifying).toBeLessThanOrEqual(32);
    expect(r.models).toBeGreaterThanOrEqual(8);
    expect(r.models + r.nonModels).toBe(r.assignments);
  });
  it("the state-vector simulator's sampled check includes the solver's models too", async () => {
    const cnf = cnfFromClauses(14, [[1, 2], [-1, 3], [4, -5, 6], [7, 8, 9], [-10, 11], [12, -13, 14], [-2, -3, -4], [5, 6], [-6, -7]]);
    const c = compileOracle(cnf, { basis: "clifford+t" }).circuit;
    const r = await verifyOracle(cnf, c, { exhaustiveLimit: 8, samples: 16, models: 4 });
    expect(r).toMatchObject({ verified: true, method: "sampled", simulator: "state-vector" });
    expect(r.modelSearch!.found).toBe(4);
    expect(r.models).toBeGreaterThanOrEqual(4);
    const broken = await verifyOracle(cnf, withoutMarking(c), { exhaustiveLimit: 8, samples: 16, models: 4 });
    expect(broken.verified).toBe(false);
    expect(evaluate(cnf, broken.counterexample!.assignment)).toBe(true);
  });
  it("exhaustive checks of an unsatisfiable formula say that there are no models", async () => {
    const cnf = cnfFromClauses(3, [[1], [-1]]);
    const r = await verifyOracle(cnf, compileOracle(cnf, { basis: "mcx" }).circuit);
    expect(r).toMatchObject({ verified: true, method: "exhaustive", models: 0, nonModels: 8, notes: ["no models: the formula is unsatisfiable"], modelSearch: null });
  });
});

describe("a sample counts distinct assignments", () => {
  it("a sample of half the assignments or more checks them all instead (was: 4102 assignments of 8)", async () => {
    const cnf = cnfFromClauses(3, [[1, -2], [2, 3]]);
    const r = await verifyOracle(cnf, compileOracle(cnf, { basis: "mcx" }).circuit, { exhaustiveLimit: 1 });
    expect(r).toMatchObject({ verified: true, method: "exhaustive", assignments: 8, models: 4, nonModels: 4 });
    expect(r.notes[0]).toMatch(/^the sample asked for \(4096 random and \d+ chosen assignments\) is at least half of the 8 there are/);
  });
  it("random draws are distinct, differ from the chosen ones and repeat with the seed (a keyed bijection, nothing stored)", () => {
    for (const n of [1, 9, 12, 20, 33, 40]) {
      const space = 2 ** n;
      // The permutation is a bijection of [0, 2^n) and its inverse undoes it.
      const seen = new Set<number>();
      const probe = Math.min(space, 3000);
      for (let i = 0; i < probe; i++) {
        const x = drawPermuted(7, n, i);
        expect(x >= 0 && x < space && Number.isInteger(x), `n=${n}`).toBe(true);
        expect(drawIndex(7, n, x)).toBe(i);
        seen.add(x);
      }
      expect(seen.size).toBe(probe);
      if (n < 4) continue;
      const chosen = [new Uint8Array(n), new Uint8Array(n).fill(1)];
      const samples = n === 9 ? 200 : 1000;
      const a = randomPart(n, chosen, samples, 7);
      expect(a.covers).toBe(false);
      expect(a.explicit).toHaveLength(2);
      // The kernel's draws: the s-th index not skipped; none is a chosen value (0 or 2^n - 1).
      const values = Array.from({ length: samples }, (_, s) => drawPermuted(7, n, unskipped(a.distinct!, s)));
      expect(new Set(values).size, `n=${n}`).toBe(samples);
      expect(values.includes(0) || values.includes(space - 1)).toBe(false);
      expect(randomPart(n, chosen, samples, 7).distinct).toEqual(a.distinct);
    }
    // 253 + 2 of 512 is not half: drawn; 254 + 2 is: covered.
    expect(randomPart(9, [new Uint8Array(9), new Uint8Array(9).fill(1)], 253, 1).covers).toBe(false);
    expect(randomPart(9, [new Uint8Array(9), new Uint8Array(9).fill(1)], 254, 1).covers).toBe(true);
    // Above 40 variables the kernel hashes its draws (a repeat has probability below 2^-17); above 36 a sample never turns exhaustive.
    expect(randomPart(41, [], 4096, 1)).toMatchObject({ distinct: null, covers: false });
    expect(randomPart(37, [], 2 ** 36, 1).covers).toBe(false);
  });
  it("a chosen value that a draw would hit is skipped: every index lands elsewhere", () => {
    const n = 10;
    // Choose the values of draws 0, 5 and 6: the sample must step over those indices.
    const bits = (x: number) => Uint8Array.from({ length: n }, (_, v) => Math.floor(x / 2 ** v) % 2);
    const chosen = [0, 5, 6].map((i) => bits(drawPermuted(3, n, i)));
    const a = randomPart(n, chosen, 100, 3);
    expect(Array.from(a.distinct!)).toEqual([0, 5, 6]);
    expect(Array.from({ length: 8 }, (_, s) => unskipped(a.distinct!, s))).toEqual([1, 2, 3, 4, 7, 8, 9, 10]);
  });
  it("a sampled check of 11 variables reports distinct assignments only", async () => {
    const cnf = randomKSat(11, 30, 3, 4);
    const r = await verifyOracle(cnf, compileOracle(cnf, { basis: "toffoli" }).circuit, { exhaustiveLimit: 5, samples: 900 });
    expect(r.method).toBe("sampled");
    expect(r.assignments).toBe(900 + r.falsifying + r.modelSearch!.found);
    expect(r.assignments).toBeLessThanOrEqual(2 ** 11);
  });
});

describe("progress of a state-vector check", () => {
  it("is reported per assignment, not once at the end (a Clifford+T circuit without measurements has one run)", async () => {
    const cnf = randomKSat(12, 40, 3, 5);
    const { circuit } = compileOracle(cnf, { kind: "phase", strategy: "wide", basis: "clifford+t", uncompute: "unitary" });
    const seen: number[] = [];
    const r = await verifyOracle(cnf, circuit, { exhaustiveLimit: 4, samples: 20, onProgress: (f) => seen.push(f) });
    expect(r.verified).toBe(true);
    // Rising fractions, many of them, the last one 1.
    expect(seen.length).toBeGreaterThan(10);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!).toBeGreaterThanOrEqual(seen[i - 1]!);
    expect(seen[seen.length - 1]).toBe(1);
  });
});
