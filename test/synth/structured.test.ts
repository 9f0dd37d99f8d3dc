// Oracles built from recovered structure (synth/structured.ts), on a full and on a free search
// register: every construction verified, free registers checked against the projection by brute
// force, and the plain construction kept gate for gate where nothing is recovered.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { adder, CircuitEncoder, multiplier, randomCircuit, randomXorRows, xorSystem, type Encoded } from "../helpers/encoders.js";
import { colouring, randomKSat } from "../helpers/formulas.js";
import {
  cnfFromClauses, compileOracle, completeModel, evaluate, isFullCompletion, reduceSearch, registerOf, verifyOracle, type Circuit, type Cnf, type OracleOptions,
} from "../helpers/lib.js";

const cnfOf = (f: Encoded): Cnf => cnfFromClauses(f.variables, f.clauses);

const BASES = ["mcx", "toffoli", "clifford+t"] as const;
const STRATEGIES = ["wide", "lean"] as const;
const KINDS = ["phase", "flag"] as const;
const UNCOMPUTE = ["unitary", "measured"] as const;
const REGISTERS = ["full", "free"] as const;

/** Every option combination of the structured constructions (in the given bases). */
function* configurations(bases: readonly (typeof BASES)[number][] = BASES): Generator<OracleOptions & { register: "full" | "free"; basis: (typeof BASES)[number] }> {
  for (const register of REGISTERS) for (const strategy of STRATEGIES) for (const kind of KINDS) for (const uncompute of UNCOMPUTE) for (const basis of bases) {
    yield { register, strategy, kind, uncompute, basis };
  }
}

/** Compiles and verifies exhaustively (the free register against the projection); returns the oracle. */
async function verified(cnf: Cnf, o: OracleOptions) {
  const oracle = compileOracle(cnf, { ...o, validatePasses: true });
  const r = await verifyOracle(cnf, oracle.circuit, { threads: 1, completion: oracle.completion });
  expect(r.problem).toBeUndefined();
  expect(r.counterexample, `${JSON.stringify(o)}: ${r.counterexample?.actual}`).toBeNull();
  expect(r.method).toBe("exhaustive");
  expect(r.verified).toBe(true);
  // A free register that is every variable in order (nothing fixed or computed) is checked as a full one.
  expect(r.register).toBe(o.register === "free" && !isFullCompletion(oracle.completion) ? "free" : "full");
  return oracle;
}

/**
 * The register values whose completion is a model, against the projection of the models by
 * brute force over all 2^n assignments (independent of the completion rule): the same sets.
 */
function checkProjection(cnf: Cnf, register: Int32Array, complete: (value: number[]) => Uint8Array): void {
  const n = cnf.variables;
  const projected = new Set<number>();
  for (let x = 0; x < 2 ** n; x++) {
    const a = Array.from({ length: n }, (_, v) => Math.floor(x / 2 ** v) % 2 === 1);
    if (!evaluate(cnf, a)) continue;
    let key = 0;
    register.forEach((v, i) => (key += a[v - 1] ? 2 ** i : 0));
    projected.add(key);
  }
  for (let y = 0; y < 2 ** register.length; y++) {
    const value = Array.from({ length: register.length }, (_, i) => Math.floor(y / 2 ** i) % 2);
    const full = complete(value);
    expect(evaluate(cnf, Array.from(full, (b) => b === 1)), `register value ${value.join("")}`).toBe(projected.has(y));
  }
}

/** Encoder formulas of each kind the structure stage recovers. */
function encoderFormulas(): [string, Cnf][] {
  const e = new CircuitEncoder();
  const x = e.inputWord(4);
  const g = e.or([e.and([x[0]!, -x[1]!]), e.xor([x[2]!, x[3]!]), e.not(x[1]!)]);
  e.force(g);
  const gates = e.encoded();
  const oneHot = new CircuitEncoder();
  const a = oneHot.inputWord(5);
  const b = oneHot.inputWord(4);
  oneHot.exactlyOne(a);
  oneHot.atMostOne(b);
  oneHot.clauses.push([-a[0]!, b[0]!], [a[4]!, b[3]!, -b[1]!]);
  return [
    ["2 x 2 multiplier = 6", cnfOf(multiplier(2, 2, 6n))],
    ["3-bit adder = 9", cnfOf(adder(3, 9n))],
    ["5 random 3-XOR over 9 variables", cnfOf(xorSystem(9, randomXorRows(9, 5, 3, 7)))],
    ["one-hot 3-colourings of a 4-cycle", colouring(4, [[0, 1], [1, 2], [2, 3], [3, 0]], 3)],
    ["a gate network, output forced", cnfOf(gates)],
    ["exactly-one and at-most-one groups with side clauses", cnfOf(oneHot.encoded())],
    ["random circuit with a one-hot group and parities", cnfOf(randomCircuit(11, { inputs: 4, gates: 5, oneHot: 4, parities: 2 }))],
  ];
}

describe("every structured construction is verified", () => {
  for (const [name, cnf] of encoderFormulas()) {
    it(`${name} (${cnf.variables} variables): full and free register, mcx and toffoli bases, every strategy, kind and uncomputation`, async () => {
      expect(compileOracle(cnf).structure?.used).toBe(true);
      for (const o of configurations(["mcx", "toffoli"])) await verified(cnf, o);
    });
  }

  // The exact state-vector simulator runs Clifford+T circuits: some 0.1 s per configuration on
  // these formulas, several seconds on the larger ones above.
  const small: [string, Cnf][] = (() => {
    const oh = new CircuitEncoder();
    const a = oh.inputWord(4);
    const b = oh.inputWord(3);
    oh.exactlyOne(a);
    oh.atMostOne(b);
    oh.clauses.push([-a[0]!, b[0]!]);
    const g = new CircuitEncoder();
    const x = g.inputWord(3);
    g.force(g.or([g.and([x[0]!, -x[1]!]), g.xor([x[1]!, x[2]!])]));
    return [
      ["three 3-XOR over 6 variables", cnfOf(xorSystem(6, randomXorRows(6, 3, 3, 2)))],
      ["one-hot groups", cnfOf(oh.encoded())],
      ["a gate network", cnfOf(g.encoded())],
      ["a random circuit with a group and a parity", cnfOf(randomCircuit(3, { inputs: 3, gates: 2, oneHot: 3, parities: 1 }))],
    ];
  })();
  for (const [name, cnf] of small) {
    it(`${name}: full and free register in the clifford+t basis, every strategy, kind and uncomputation`, async () => {
      expect(compileOracle(cnf).structure?.used).toBe(true);
      for (const o of configurations(["clifford+t"])) await verified(cnf, o);
    });
  }

  it("free registers mark exactly the projection of the models (brute force over every assignment)", () => {
    for (const [, cnf] of encoderFormulas()) {
      const plan = registerOf(cnf, { register: "free" });
      checkProjection(cnf, plan.register, (v) => completeModel(plan, v));
    }
  });

  it("random encoded circuits with groups, parities and side clauses (fast-check)", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 0, max: 2 ** 31 - 1 }),
        fc.record({
          inputs: fc.integer({ min: 2, max: 5 }),
          gates: fc.integer({ min: 1, max: 8 }),
          maxWidth: fc.integer({ min: 2, max: 4 }),
          forceOutput: fc.boolean(),
          extraClauses: fc.integer({ min: 0, max: 3 }),
          oneHot: fc.constantFrom(0, 3, 4),
          parities: fc.integer({ min: 0, max: 2 }),
        }),
        fc.constantFrom(...REGISTERS), fc.constantFrom(...STRATEGIES), fc.constantFrom(...KINDS), fc.constantFrom(...UNCOMPUTE), fc.constantFrom("mcx", "toffoli") as fc.Arbitrary<"mcx" | "toffoli">,
        async (seed, options, register, strategy, kind, uncompute, basis) => {
          const f = randomCircuit(seed, options);
          fc.pre(f.variables <= 16);
          const cnf = cnfOf(f);
          const oracle = await verified(cnf, { register, strategy, kind, uncompute, basis });
          if (register === "free") checkProjection(cnf, oracle.register, (v) => completeModel(oracle, v));
        },
      ),
      { numRuns: 60 },
    );
  });

  it("random CNF, structure or not (fast-check)", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 1, max: 10 }).chain((n) =>
          fc.tuple(fc.constant(n), fc.array(fc.array(fc.integer({ min: 1, max: n }).chain((v) => fc.constantFrom(v, -v)), { minLength: 0, maxLength: 4 }), { maxLength: 24 })),
        ),
        fc.constantFrom(...REGISTERS), fc.constantFrom(...STRATEGIES), fc.constantFrom(...KINDS), fc.constantFrom(...UNCOMPUTE), fc.constantFrom(...BASES),
        async ([n, clauses], register, strategy, kind, uncompute, basis) => {
          const cnf = cnfFromClauses(n, clauses);
          const oracle = await verified(cnf, { register, strategy, kind, uncompute, basis });
          if (register === "free") checkProjection(cnf, oracle.register, (v) => completeModel(oracle, v));
        },
      ),
      { numRuns: 120 },
    );
  });

  it("random small circuits with a gate family the formula makes complete: XOR chains, OR trees, equivalences", async () => {
    for (let seed = 1; seed <= 12; seed++) {
      const e = new CircuitEncoder();
      const x = e.inputWord(5);
      let y = e.xor([x[0]!, x[1]!, x[2]!]);
      y = e.or([y, -x[3]!, e.buffer(x[4]!)]);
      y = e.xnor([y, e.not(x[seed % 5]!)]);
      e.force(seed % 2 ? y : -y);
      const cnf = cnfOf(e.encoded());
      for (const register of REGISTERS) await verified(cnf, { register, strategy: seed % 3 ? "wide" : "lean", basis: "toffoli", uncompute: seed % 4 < 2 ? "unitary" : "measured" });
    }
  });
});

describe("the free register", () => {
  it("holds at most the circuit's inputs on encoded circuits with the output forced", () => {
    for (let seed = 1; seed <= 200; seed++) {
      const f = randomCircuit(seed, { gates: 1 + (seed % 12) });
      expect(registerOf(cnfOf(f), { register: "free" }).register.length, `seed ${seed}`).toBeLessThanOrEqual(f.inputs.length);
    }
    for (const [a, b, n] of [[4, 4, 143], [4, 4, 36], [5, 5, 391]] as const) {
      const f = multiplier(a, b, BigInt(n));
      expect(registerOf(cnfOf(f), { register: "free" }).register.length).toBeLessThanOrEqual(a + b);
    }
    const sum = adder(6, 77n);
    expect(registerOf(cnfOf(sum), { register: "free" }).register.length).toBeLessThanOrEqual(sum.inputs.length);
  });

  it("completes every marked register value of a multiplier to a factor pair (a x b = N read off the model)", async () => {
    const f = multiplier(4, 4, 143n);
    const cnf = cnfOf(f);
    const oracle = await verified(cnf, { register: "free", basis: "toffoli", uncompute: "measured" });
    const r = oracle.register.length;
    const pairs: string[] = [];
    for (let y = 0; y < 2 ** r; y++) {
      const model = completeModel(oracle, Array.from({ length: r }, (_, i) => (y >> i) & 1));
      if (!evaluate(cnf, Array.from(model, (b) => b === 1))) continue;
      const word = (bits: number[]): number => bits.reduce((s, v, i) => s + (model[v - 1]! << i), 0);
      const a = word(f.inputs.slice(0, 4));
      const b = word(f.inputs.slice(4));
      expect(a * b).toBe(143);
      pairs.push(`${a}x${b}`);
    }
    // 143 = 11 x 13 (elementary number theory): the ordered pairs within 4 bits.
    expect(pairs.sort()).toEqual(["11x13", "13x11"]);
  });

  it("lists its variables, fixed values and definitions in DIMACS numbers", () => {
    // 3 <-> 1 AND 2, 4 <-> 3 XOR 5, 4 forced true, 6 in no clause.
    const cnf = cnfFromClauses(6, [[-3, 1], [-3, 2], [3, -1, -2], ...xorClauses([4, 3, 5]), [4]]);
    const o = compileOracle(cnf, { register: "free" });
    expect(Array.from(o.completion.fixed)).toEqual([4]);
    expect(Array.from(o.register)).toEqual([1, 2]);
    expect(o.completion.definitions.map((d) => d.variable).sort()).toEqual([3, 5]);
    // 1 = 1, 2 = 0: 3 = 0, so 5 = 1 to make 4 true; 6 is in no clause: 0.
    expect(Array.from(completeModel(o, [1, 0]))).toEqual([1, 0, 0, 1, 1, 0]);
  });
});

function xorClauses(vs: number[]): number[][] {
  const out: number[][] = [];
  for (let a = 0; a < 2 ** vs.length; a++) {
    let x = 0;
    for (let i = 0; i < vs.length; i++) x ^= (a >> i) & 1;
    if (x !== 0) out.push(vs.map((v, i) => ((a >> i) & 1 ? -v : v)));
  }
  return out;
}

function sameCircuit(a: Circuit, b: Circuit): void {
  expect(a.qubits).toBe(b.qubits);
  expect(a.registers).toEqual(b.registers);
  expect(Array.from(a.kind)).toEqual(Array.from(b.kind));
  expect(Array.from(a.ops)).toEqual(Array.from(b.ops));
  expect(Array.from(a.opStart)).toEqual(Array.from(b.opStart));
}

describe("where nothing is recovered", () => {
  it("the circuit is the clause construction's, gate for gate", () => {
    let plain = 0;
    for (let seed = 1; seed <= 4; seed++) {
      const cnf = randomKSat(10, 40, 3, seed);
      for (const o of configurations()) {
        if (o.register === "free") continue;
        const s = compileOracle(cnf, o);
        if (s.structure?.used) continue;
        plain++;
        sameCircuit(s.circuit, compileOracle(cnf, { ...o, structure: false }).circuit);
      }
    }
    expect(plain).toBeGreaterThan(0);
  });

  it("a free register without structure is the reduced formula's oracle (the search-register reduction)", () => {
    const e = randomCircuit(5, { gates: 6 });
    const cnf = cnfOf(e);
    const r = reduceSearch(cnf);
    const free = compileOracle(cnf, { register: "free", structure: false, basis: "clifford+t" });
    expect(Array.from(free.register)).toEqual(r.searched);
    sameCircuit(free.circuit, compileOracle(r.cnf, { structure: false, basis: "clifford+t" }).circuit);
  });

  it("the full register is 1..n and completes to the value itself", () => {
    const cnf = cnfOf(adder(2, 3n));
    const o = compileOracle(cnf);
    expect(Array.from(o.register)).toEqual(Array.from({ length: cnf.variables }, (_, i) => i + 1));
    const v = Array.from({ length: cnf.variables }, (_, i) => (i % 3 === 0 ? 1 : 0));
    expect(Array.from(completeModel(o, v))).toEqual(v);
  });

  it("an unsatisfiable formula gives the identity, and a formula propagation settles marks everything", async () => {
    // Propagation finds the contradiction for the free register; the full register's oracle is
    // the identity when the clauses themselves say so.
    expect(compileOracle(cnfFromClauses(3, [[1], [-1, 2], [-2]]), { register: "free" }).circuit.gates).toBe(0);
    expect(compileOracle(cnfFromClauses(4, [[-3, 1], [-3, 2], [3, -1, -2], [3], [-3]])).circuit.gates).toBe(0);
    const settled = cnfFromClauses(3, [[1], [-1, 2]]);
    const o = compileOracle(settled, { register: "free", kind: "flag" });
    expect(o.register.length).toBe(0);
    expect((await verifyOracle(settled, o.circuit, { completion: o.completion })).verified).toBe(true);
  });
});
