// Structure recovery: gate definitions, parity constraints and one-hot groups found in clauses.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CircuitEncoder, randomCircuit, randomXorRows, xorSystem, type Encoded } from "../helpers/encoders.js";
import { bruteCount } from "../helpers/formulas.js";
import { cnfFromClauses, recoverStructure, type Cnf, type StructureOptions } from "../helpers/lib.js";
import { checkEquivalence, checkShape } from "./check.js";

const cnfOf = (f: Encoded): Cnf => cnfFromClauses(f.variables, f.clauses);

function recover(cnf: Cnf, options?: StructureOptions) {
  const s = recoverStructure(cnf, options);
  checkShape(cnf, s);
  return s;
}

describe("gate patterns", () => {
  it("finds AND and OR of any width, with negated inputs", () => {
    const e = new CircuitEncoder();
    const x = e.inputWord(6);
    const y = e.and([x[0]!, -x[1]!, x[2]!, -x[3]!, x[4]!, x[5]!]);
    const z = e.or([-x[0]!, x[1]!]);
    const s = recover(cnfOf(e.encoded()));
    expect(s.definitions).toEqual([
      { variable: y, kind: "and", inputs: [x[0], -x[1]!, x[2], -x[3]!, x[4], x[5]] },
      { variable: z, kind: "or", inputs: [-x[0]!, x[1]] },
    ]);
    expect(Array.from(s.free)).toEqual(x);
    expect(s.report.definitionClauses).toBe(7 + 3);
  });
  it("finds XOR and XNOR of any width, NOT and equivalence", () => {
    const e = new CircuitEncoder();
    const x = e.inputWord(5);
    const a = e.xor(x);
    const b = e.xnor([x[0]!, x[1]!]);
    const c = e.not(x[2]!);
    const d = e.buffer(x[3]!);
    const s = recover(cnfOf(e.encoded()));
    const byVar = new Map(s.definitions.map((q) => [q.variable, q]));
    expect(byVar.get(a)).toEqual({ variable: a, kind: "xor", inputs: x });
    expect(byVar.get(b)).toEqual({ variable: b, kind: "xnor", inputs: [x[0], x[1]] });
    expect(byVar.get(c)).toEqual({ variable: c, kind: "not", inputs: [x[2]] });
    expect(byVar.get(d)).toEqual({ variable: d, kind: "equiv", inputs: [x[3]] });
    expect(s.free.length).toBe(5);
    expect(s.report.definitionClauses).toBe(32 + 4 + 2 + 2);
  });
  it("reads a negated XOR input as a flipped parity", () => {
    const e = new CircuitEncoder();
    const [p, q] = e.inputWord(2);
    const y = e.xor([p!, -q!]); // y = p xor not q = xnor(p, q)
    const s = recover(cnfOf(e.encoded()));
    expect(s.definitions).toEqual([{ variable: y, kind: "xnor", inputs: [p, q] }]);
  });
  it("orders definitions topologically and computes the rest from the free variables", () => {
    const e = new CircuitEncoder();
    const x = e.inputWord(3);
    const t = e.and([x[0]!, x[1]!]);
    const u = e.xor([t, x[2]!]);
    const w = e.or([u, -t]);
    e.force(w);
    // Clauses listed output first, so the definitions are found in reverse order.
    const f = e.encoded();
    const s = recover(cnfFromClauses(f.variables, [...f.clauses].reverse()));
    expect(s.definitions.map((d) => d.variable)).toEqual([t, u, w]);
    expect(Array.from(s.free)).toEqual(x);
    expect(checkEquivalence(cnfFromClauses(f.variables, f.clauses), s)).toBe(bruteCount(f.variables, f.clauses));
  });
});

describe("parities, groups, cycles and clean-up", () => {
  it("keeps a k-XOR whose variables are all defined as a standalone parity constraint", () => {
    const e = new CircuitEncoder();
    const x = e.inputWord(2);
    const a = e.and(x);
    const b = e.or(x);
    e.parity([a, b, x[0]!], 1);
    const s = recover(cnfOf(e.encoded()));
    expect(s.definitions.map((d) => d.variable).sort()).toEqual([a, b].sort());
    expect(s.parities).toEqual([{ variables: [x[0], a, b], parity: 1 }]);
    expect(s.report.parityClauses).toBe(4);
  });
  it("breaks a cycle of equivalences by leaving one variable free, deterministically", () => {
    const f = cnfFromClauses(3, [[1, -2], [-1, 2], [2, -3], [-2, 3], [3, -1], [-3, 1]]);
    const s = recover(f);
    expect(s.definitions.length).toBe(2);
    expect(s.parities.length).toBe(1);
    expect(s.free.length).toBe(1);
    expect(recoverStructure(f)).toEqual(s);
    expect(checkEquivalence(f, s)).toBe(2);
  });
  it("finds exactly-one groups first with prefer groups, a NOR definition plus at-most-one otherwise", () => {
    const e = new CircuitEncoder();
    e.variables = 9;
    e.exactlyOne([1, 2, 3, 4]);
    e.atMostOne([5, 6, 7, 8]);
    e.clauses.push([9, 1]);
    const f = cnfOf(e.encoded());
    const g = recover(f, { prefer: "groups" });
    expect(g.groups).toEqual([{ variables: [1, 2, 3, 4], exactlyOne: true }, { variables: [5, 6, 7, 8], exactlyOne: false }]);
    expect(g.definitions).toEqual([]);
    const d = recover(f);
    expect(d.definitions).toEqual([{ variable: 4, kind: "and", inputs: [-1, -2, -3] }]);
    expect(d.groups).toEqual([{ variables: [1, 2, 3], exactlyOne: false }, { variables: [5, 6, 7, 8], exactlyOne: false }]);
    expect(checkEquivalence(f, g)).toBe(checkEquivalence(f, d));
  });
  it("finds an exactly-one group whose members are all defined", () => {
    // y1, y2, y3 are ANDs of inputs; the one-hot constraint over them defines nothing.
    const e = new CircuitEncoder();
    const x = e.inputWord(4);
    const ys = [e.and([x[0]!, x[1]!]), e.and([x[1]!, x[2]!]), e.and([x[2]!, x[3]!])];
    e.exactlyOne(ys);
    const f = cnfOf(e.encoded());
    const s = recover(f);
    expect(s.groups).toEqual([{ variables: ys, exactlyOne: true }]);
    expect(s.free.length).toBe(4);
    checkEquivalence(f, s);
  });
  it("cleans repeated literals, tautologies and repeated clauses first", () => {
    const f = cnfFromClauses(3, [[-3, 1, 1], [-3, 2], [2, -3], [3, -1, -2], [1, -1, 2]]);
    const s = recover(f);
    expect(s.report).toMatchObject({ clauses: 5, cleanedClauses: 3, duplicateLiterals: 1, tautologies: 1, duplicateClauses: 1 });
    expect(s.definitions).toEqual([{ variable: 3, kind: "and", inputs: [1, 2] }]);
  });
  it("handles empty formulas, empty clauses and unused variables", () => {
    expect(recover(cnfFromClauses(0, [])).free.length).toBe(0);
    const s = recover(cnfFromClauses(5, [[1, 2], []]));
    expect(s.unsat).toBe(true);
    expect(s.unused).toBe(3);
    expect(s.remaining.clauseStart.length).toBe(3);
    const sparse = recoverStructure({ variables: 2147483647, lits: Int32Array.of(-7, 2147483647, 7, -2147483647), clauseStart: Uint32Array.of(0, 2, 4) });
    expect(sparse.definitions).toEqual([{ variable: 2147483647, kind: "equiv", inputs: [7] }]);
    expect(sparse.unused).toBe(2147483645);
  });
});

describe("the invariant (fast-check)", () => {
  const options = fc.record({
    inputs: fc.integer({ min: 2, max: 5 }),
    gates: fc.integer({ min: 1, max: 8 }),
    maxWidth: fc.integer({ min: 2, max: 4 }),
    forceOutput: fc.boolean(),
    extraClauses: fc.integer({ min: 0, max: 3 }),
    oneHot: fc.constantFrom(0, 0, 3, 4),
    parities: fc.integer({ min: 0, max: 2 }),
  });
  it("on random encoded circuits: equivalent structure, each clause consumed once, counts agree", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), options, fc.constantFrom<"definitions" | "groups">("definitions", "groups"), (seed, o, prefer) => {
        const f = randomCircuit(seed, o);
        fc.pre(f.variables <= 14);
        const cnf = cnfOf(f);
        const s = recover(cnf, { prefer });
        expect(checkEquivalence(cnf, s)).toBe(bruteCount(f.variables, f.clauses));
      }),
      { numRuns: 200 },
    );
  }, 60_000);
  it("on random encoded circuits with nothing else: no more free variables than circuit inputs", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), fc.integer({ min: 2, max: 8 }), fc.integer({ min: 1, max: 30 }), (seed, inputs, gates) => {
        const f = randomCircuit(seed, { inputs, gates, maxWidth: 5 });
        const s = recover(cnfOf(f));
        expect(s.free.length).toBeLessThanOrEqual(f.inputs.length);
        expect(s.definitions.length).toBe(gates);
      }),
      { numRuns: Number(process.env["STRUCTURE_RUNS"] ?? 300) },
    );
  });
  it("on plain random CNF of widths 1-4 (where patterns arise by chance)", () => {
    const formula = fc.integer({ min: 1, max: 10 }).chain((n) =>
      fc.record({
        n: fc.constant(n),
        clauses: fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { minLength: 0, maxLength: 4 }), { maxLength: 40 }),
      }),
    );
    fc.assert(
      fc.property(formula, fc.boolean(), ({ n, clauses }, groups) => {
        const cnf = cnfFromClauses(n, clauses);
        const s = recover(cnf, { prefer: groups ? "groups" : "definitions" });
        expect(checkEquivalence(cnf, s)).toBe(bruteCount(n, clauses));
      }),
      { numRuns: 400 },
    );
  });
  it("on dense small formulas built from complete XOR, AND and one-hot patterns over few variables", () => {
    // Few variables and many patterns: definitions compete for variables and clauses, cycles arise.
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), (seed) => {
        const f = randomCircuit(seed, { inputs: 3, gates: 6, maxWidth: 3, parities: 3, oneHot: 3, extraClauses: 2 });
        const n = 6;
        // Fold every variable onto 1..n, which turns gates into overlapping patterns.
        const clauses = f.clauses.map((c) => c.map((l) => Math.sign(l) * (((Math.abs(l) - 1) % n) + 1)));
        const cnf = cnfFromClauses(n, clauses);
        expect(checkEquivalence(cnf, recover(cnf))).toBe(bruteCount(n, clauses));
        expect(checkEquivalence(cnf, recover(cnf, { prefer: "groups" }))).toBe(bruteCount(n, clauses));
      }),
      { numRuns: 300 },
    );
  });
  it("on XOR systems: every row defines a variable or stays a parity constraint", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), fc.integer({ min: 3, max: 12 }), fc.integer({ min: 1, max: 8 }), fc.integer({ min: 2, max: 4 }), (seed, n, rows, width) => {
        fc.pre(width <= n);
        const sys = randomXorRows(n, rows, width, seed);
        const f = xorSystem(n, sys);
        const cnf = cnfOf(f);
        const s = recover(cnf);
        const distinctRows = new Set(sys.map((x) => `${[...x.variables].sort().join(",")}:${x.parity}`)).size;
        expect(s.definitions.length + s.parities.length).toBeLessThanOrEqual(distinctRows);
        expect(checkEquivalence(cnf, s)).toBe(bruteCount(n, f.clauses));
      }),
      { numRuns: 200 },
    );
  });
});
