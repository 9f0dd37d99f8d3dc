// Qubit budgets, the preference between T-count and T-depth, and the cost front: the targets of
// the issue on budgets, measured on a seeded random 3-SAT formula of 20 variables and 90 clauses
// (the bench's generator, seed 45: wide with measured uncomputation has 288 qubits, 1,072 T and
// T-depth 87 there) and on small random formulas.
import { describe, expect, it } from "vitest";
import { simplify } from "../../dist/src/synth/simplify.js";
import {
  chooseAmong, chooseConstruction, compileOracle, compileSearch, costConstructions, costFront, countCircuit, nonDominated, planConstruction,
  searchConstruction, verifyOracle, GATE_KINDS, type Circuit, type Cnf,
} from "../helpers/lib.js";
import { randomKSat } from "../helpers/formulas.js";

const R = randomKSat(20, 90, 3, 45);
const log2up = (x: number): number => Math.ceil(Math.log2(Math.max(1, x)));
/** Clauses kept and their widest, after simplification. */
function mk(cnf: Cnf): { m: number; k: number } {
  const f = simplify(cnf);
  const m = f.clauseStart.length - 1;
  let k = 1;
  for (let i = 0; i < m; i++) k = Math.max(k, f.clauseStart[i + 1]! - f.clauseStart[i]!);
  return { m, k };
}
/** True when no T or Tdg gate is conditioned on a measurement: the T-count is then that of every outcome. */
const unconditionalT = (c: Circuit): boolean => {
  for (let g = 0; g < c.gates; g++) {
    const k = GATE_KINDS[c.kind[g]!];
    if ((k === "t" || k === "tdg") && c.cond[g]! >= 0) return false;
  }
  return true;
};

describe("the cost front of a random 3-SAT formula (20 variables, 90 clauses)", { timeout: 120_000 }, () => {
  const front = costFront(R, { uncompute: "measured" });
  const wide = front.references.wide;

  it("starts from wide and lean as today", () => {
    expect([wide.qubits, wide.t_count, wide.t_depth]).toEqual([288, 1072, 87]);
    expect([front.references.lean.qubits, front.references.lean.t_count]).toEqual([35, 5780]);
  });
  it("holds a point within n + 2 ceil(sqrt(k m)) + 2k qubits at most 3 times wide's T-count", () => {
    const { m, k } = mk(R);
    const qubits = 20 + 2 * Math.ceil(Math.sqrt(k * m)) + 2 * k; // 60
    const point = front.points.find((p) => p.qubits <= qubits && p.t_count <= 3 * wide.t_count);
    expect(point, JSON.stringify(front.points.slice(0, 12))).toBeDefined();
    // The T-count is the worst case over measurement outcomes: no T gate waits on an outcome.
    const c = compileOracle(R, { construction: point!.construction, basis: "clifford+t", uncompute: "measured" }).circuit;
    expect(unconditionalT(c)).toBe(true);
    expect(countCircuit(c).tCount).toBe(point!.t_count);
  });
  it("is non-dominated, and each point's arguments build exactly its figures", () => {
    expect(nonDominated(front.points)).toHaveLength(front.points.length);
    for (const p of front.points) {
      for (const q of front.candidates) expect(q.qubits <= p.qubits && q.t_count <= p.t_count && q.t_depth <= p.t_depth && (q.qubits < p.qubits || q.t_count < p.t_count || q.t_depth < p.t_depth)).toBe(false);
      const m = /^--construction (\S+) --basis clifford\+t --uncompute measured$/.exec(p.options);
      expect(m, p.options).not.toBeNull();
      const c = compileOracle(R, { construction: m![1]!, basis: "clifford+t", uncompute: "measured" }).circuit;
      const counts = countCircuit(c);
      expect([c.qubits, counts.tCount, counts.tDepth], p.construction).toEqual([p.qubits, p.t_count, p.t_depth]);
    }
  });
  it("every point is an oracle for the formula (sampled: solver models, falsifying and random assignments)", async () => {
    for (const p of front.points) {
      const c = compileOracle(R, { construction: p.construction, basis: "toffoli", uncompute: "measured" }).circuit;
      const r = await verifyOracle(R, c, { kind: "phase", exhaustiveLimit: 12, samples: 512 });
      expect(r.verified, p.construction).toBe(true);
    }
  });
  it("with the depth preferred and no budget: T-depth at most 2 (ceil(log2 k) + ceil(log2 m)) + 2 = 20", () => {
    const oracle = compileOracle(R, { prefer: "t-depth", basis: "clifford+t", uncompute: "measured" });
    const { m, k } = mk(R);
    const bound = 2 * (log2up(k) + log2up(m)) + 2;
    expect(bound).toBe(20);
    const d = countCircuit(oracle.circuit).tDepth;
    expect(d).toBeLessThanOrEqual(bound);
    expect(oracle.options.construction).toBe("fanout-1");
    expect(d).toBe(17);
  });
});

describe("the cost front of a smaller formula, every point checked on every assignment", { timeout: 120_000 }, () => {
  it("random 3-SAT, 12 variables, 50 clauses; flag oracles, unitary uncomputation", async () => {
    const cnf = randomKSat(12, 50, 3, 8);
    const front = costFront(cnf, { kind: "flag", uncompute: "unitary" });
    expect(front.points.length).toBeGreaterThan(5);
    for (const p of front.points) {
      expect(p.options).toBe(`--construction ${p.construction} --kind flag --basis clifford+t --uncompute unitary`);
      const c = compileOracle(cnf, { construction: p.construction, kind: "flag", uncompute: "unitary" }).circuit;
      const r = await verifyOracle(cnf, c, { kind: "flag" });
      expect(r.verified && r.assignments === 4096, p.construction).toBe(true);
    }
  });
});

describe("budgets", { timeout: 120_000 }, () => {
  const costs = costConstructions(R, { uncompute: "measured" });
  const smallest = Math.min(...costs.map((c) => c.qubits));

  it("never exceed the budget, and the T-count never rises as it grows (prefer t-count)", () => {
    let last = Infinity;
    for (let Q = smallest; Q <= 560; Q++) {
      const choice = chooseAmong(costs, Q, "t-count");
      expect(choice.ok).toBe(true);
      if (!choice.ok) continue;
      expect(choice.chosen.qubits).toBeLessThanOrEqual(Q);
      expect(choice.chosen.t_count).toBeLessThanOrEqual(last);
      last = choice.chosen.t_count;
    }
    expect(last).toBe(1072);
  });
  it("the T-depth never rises either when it is preferred", () => {
    let last = Infinity;
    for (let Q = smallest; Q <= 560; Q++) {
      const choice = chooseAmong(costs, Q, "t-depth");
      if (!choice.ok) throw new Error("no choice");
      expect(choice.chosen.t_depth).toBeLessThanOrEqual(last);
      last = choice.chosen.t_depth;
    }
  });
  it("compiled circuits keep the budget in every basis", () => {
    for (const Q of [smallest, 40, 52, 60, 100, 200, 300]) {
      for (const basis of ["toffoli", "clifford+t", "mcx"] as const) {
        const oracle = compileOracle(R, { maxQubits: Q, basis, uncompute: "measured" });
        expect(oracle.circuit.qubits, `${Q} ${basis} ${oracle.options.construction}`).toBeLessThanOrEqual(Q);
      }
    }
  });
  it("below the smallest construction: the smallest budget that works, as data; compileOracle throws RangeError", () => {
    const plan = planConstruction(R, { maxQubits: smallest - 1, uncompute: "measured" });
    expect(plan).toMatchObject({ ok: false, smallestQubits: smallest });
    expect(smallest).toBe(35);
    expect(() => compileOracle(R, { maxQubits: 34 })).toThrow(RangeError);
    expect(planConstruction(R, { construction: "wide", maxQubits: 100 })).toMatchObject({ ok: false, smallestQubits: 288 });
    expect(planConstruction(R, { construction: "blocks-0" }).ok).toBe(false);
  });
  it("chooseConstruction agrees with the counted candidates", () => {
    const a = chooseConstruction(R, { maxQubits: 60, uncompute: "measured" });
    const b = chooseAmong(costs, 60, "t-count");
    expect(a.ok && b.ok && a.chosen.construction === b.chosen.construction).toBe(true);
  });
  it("a search within a budget: oracle and diffusion share the work qubits", () => {
    const small = randomKSat(10, 40, 3, 2);
    const r = searchConstruction(small, { maxQubits: 30, iterations: 1, uncompute: "measured" });
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.circuit.qubits).toBeLessThanOrEqual(30);
    // Few clauses over 12 variables: lean's oracle needs 12 + 2 * 3 + 1 = 19 qubits (lean.ts), the
    // diffusion's Z controlled on 12 qubits a tree of 10 work qubits in the toffoli basis: 22.
    const sparse = randomKSat(12, 4, 3, 6);
    const tight = searchConstruction(sparse, { maxQubits: 20, iterations: 1 });
    expect(tight).toMatchObject({ ok: false, smallestQubits: 22 });
    expect(compileSearch(sparse, { maxQubits: 22, iterations: 2 }).qubits).toBeLessThanOrEqual(22);
    expect(() => compileSearch(sparse, { maxQubits: 21, iterations: 2 })).toThrow(RangeError);
  });
});

describe("logarithmic T-depth on random formulas", { timeout: 120_000 }, () => {
  it("depth preferred, no budget, measured, phase, Clifford+T: T-depth <= 2 (ceil(log2 k) + ceil(log2 m)) + 2", async () => {
    for (let seed = 1; seed <= 8; seed++) {
      const n = 6 + (seed % 7);
      const k = 2 + (seed % 5);
      const cnf = randomKSat(n, 10 + 13 * seed, k, seed);
      const oracle = compileOracle(cnf, { prefer: "t-depth", basis: "clifford+t", uncompute: "measured" });
      const { m, k: kk } = mk(cnf);
      const d = countCircuit(oracle.circuit).tDepth;
      expect(d, `seed ${seed}: n ${n} m ${m} k ${kk}`).toBeLessThanOrEqual(2 * (log2up(kk) + log2up(m)) + 2);
      // The same construction in the toffoli basis, checked on every assignment (bit-parallel).
      const same = compileOracle(cnf, { construction: oracle.options.construction, uncompute: "measured" });
      expect((await verifyOracle(cnf, same.circuit, { kind: "phase" })).verified).toBe(true);
    }
  });
});
