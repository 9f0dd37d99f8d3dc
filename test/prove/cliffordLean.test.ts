// The prover on lean-counter oracles in Clifford+T, where the optimizer cancels gate pairs at the
// seams of the gadgets (H H, T Tdg, CNOT pairs): the path-sum reduction (after Amy 2018, "Towards
// large-scale functional verification of universal quantum circuits") must still close every
// path variable of the 4-T temporary AND (Gidney 2018) and the 7-T Toffoli (Amy, Maslov, Mosca &
// Roetteler 2013), and a wrong circuit must never be proved. Decided against exhaustive exact
// simulation (small formulas, every assignment, 4 seeds of measurement outcomes).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { K } from "../helpers/circuits.js";
import { randomKSat } from "../helpers/formulas.js";
import { edit, failsOn } from "../helpers/prove.js";
import { allAssignments, checkOracleSparse, cnfFromClauses, compileOracle, proveOracle, type Circuit, type Cnf } from "../helpers/lib.js";
import { plantedCnf } from "../../dist/bench/prove.js";
import { formulaLiteral } from "../../dist/src/prove/miter.js";
import { REDUCTIONS, SymbolicRun } from "../../dist/src/prove/symbolic.js";

const COMBOS = (["phase", "flag"] as const).flatMap((kind) => (["unitary", "measured"] as const).map((uncompute) => ({ kind, uncompute })));

function simulatedCorrect(c: Circuit, cnf: Cnf, kind: "phase" | "flag"): boolean {
  for (let seed = 1; seed <= 4; seed++) if (checkOracleSparse(c, cnf, { kind, assignments: allAssignments(cnf.variables), seed }) !== null) return false;
  return true;
}

/** The gates of kind k (unconditioned). */
const gatesOf = (c: Circuit, k: number): number[] => Array.from({ length: c.gates }, (_, g) => g).filter((g) => c.kind[g] === k && c.cond[g]! < 0);

/** The Clifford+T mutants of the brief: a stray T, a dropped H, a CNOT with control and target swapped. */
type CtMutation = "stray-t" | "drop-h" | "flip-cx";
function mutateCt(c: Circuit, m: CtMutation, pick: number): Circuit | null {
  switch (m) {
    case "stray-t": {
      const at = pick % (c.gates + 1);
      const q = Math.floor(pick / (c.gates + 1)) % c.qubits;
      return edit(c, (b, g) => {
        if (g === at) b.add(K.t, q << 1);
        return false;
      });
    }
    case "drop-h": {
      const hs = gatesOf(c, K.h);
      if (hs.length === 0) return null;
      const drop = hs[pick % hs.length]!;
      return edit(c, (_b, g) => g === drop);
    }
    case "flip-cx": {
      const cxs = gatesOf(c, K.cx);
      if (cxs.length === 0) return null;
      const at = cxs[pick % cxs.length]!;
      const ops = c.ops.slice();
      const s = c.opStart[at]!;
      [ops[s], ops[s + 1]] = [ops[s + 1]!, ops[s]!];
      return { ...c, ops };
    }
  }
}

describe("lean x Clifford+T: proved through the optimizer's seam cancellations", () => {
  it("every kind x uncomputation, structure off and on, is proved on random 3-SAT (4 to 8 variables), as exhaustive simulation agrees", () => {
    fc.assert(
      fc.property(fc.integer({ min: 4, max: 8 }), fc.integer({ min: 1, max: 10_000 }), fc.constantFrom(...COMBOS), fc.boolean(), (n, seed, o, structure) => {
        const cnf = randomKSat(n, 3 * n, 3, seed);
        const c = compileOracle(cnf, { ...o, strategy: "lean", basis: "clifford+t", structure }).circuit;
        const p = proveOracle(cnf, c, { kind: o.kind });
        expect(p.status, `${JSON.stringify(o)} structure ${structure}: ${p.message}`).toBe("proved");
        if (n <= 6) expect(simulatedCorrect(c, cnf, o.kind)).toBe(true);
      }),
      { numRuns: 24 },
    );
  });
  it("oracles from recovered structure (a Tseitin circuit with its output forced) are proved, not left to simulation", () => {
    // y1 = x1 AND x2 (4), y2 = y1 XOR x3 (5), y2 forced, plus a clause over the inputs.
    const cnf = cnfFromClauses(5, [[-4, 1], [-4, 2], [4, -1, -2], [-5, 4, 3], [-5, -4, -3], [5, -4, 3], [5, 4, -3], [5], [1, -3]]);
    for (const o of COMBOS) {
      const oracle = compileOracle(cnf, { ...o, strategy: "lean", basis: "clifford+t", structure: true });
      const p = proveOracle(cnf, oracle.circuit, { kind: o.kind });
      expect(p.status, `${JSON.stringify(o)}: ${p.message}`).toBe("proved");
    }
  });
});

describe("lean x Clifford+T mutants (stray T, dropped H, flipped CNOT): never proved when wrong", () => {
  it("a mutant is proved only when exhaustive simulation finds it correct, and refuted only with a counterexample the sparse simulator confirms", () => {
    let rejected = 0;
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 6 }), fc.integer({ min: 1, max: 10_000 }), fc.constantFrom(...COMBOS), fc.constantFrom<CtMutation>("stray-t", "drop-h", "flip-cx"), fc.nat(),
        (n, seed, o, m, pick) => {
          const cnf = randomKSat(n, 3 * n, 3, seed);
          const mutated = mutateCt(compileOracle(cnf, { ...o, strategy: "lean", basis: "clifford+t" }).circuit, m, pick);
          fc.pre(mutated !== null);
          const p = proveOracle(cnf, mutated!, { kind: o.kind });
          const correct = simulatedCorrect(mutated!, cnf, o.kind);
          if (p.status === "proved") expect(correct, `${m} ${JSON.stringify(o)} proved but wrong`).toBe(true);
          if (p.status === "refuted") expect(failsOn(mutated!, cnf, o.kind, p.counterexample!)).toBe(true);
          if (!correct) rejected++;
        },
      ),
      { numRuns: 60 },
    );
    expect(rejected).toBeGreaterThan(0); // the mutations do harm (else the check above proves nothing)
  });
});

describe("the flag oracle's marking Toffoli (lean x Clifford+T x unitary)", () => {
  // The 7-T Toffoli (Amy, Maslov, Mosca & Roetteler 2013) from the counter's bits onto the target,
  // where the gadget's CNOTs leave a control as b XOR a beside a: the target's path variable must
  // close under the first reduction (collapse), as in the phase oracles, not only under the later
  // ones (which run out of their budgets at 200 variables and 800 clauses).
  const flagOracle = (n: number, seed: number): { cnf: Cnf; c: Circuit; target: number } => {
    const cnf = plantedCnf(n, 4 * n, seed);
    const c = compileOracle(cnf, { kind: "flag", strategy: "lean", basis: "clifford+t", uncompute: "unitary" }).circuit;
    return { cnf, c, target: c.registers.find((r) => r.role === "target")!.start };
  };
  const closesFirst = (cnf: Cnf, c: Circuit, target: number): boolean => {
    const run = new SymbolicRun(c, cnf.variables, target, REDUCTIONS[0]);
    const cuts: number[] = [];
    formulaLiteral(run.g, cnf, run.vars, cuts);
    run.g.setCuts(cuts);
    return run.run() === null && !run.exhausted && !run.openPaths();
  };
  /** The gates from the target's first Hadamard to its last: the marking Toffoli. */
  const toffoliSpan = (c: Circuit, target: number): [number, number] => {
    const on: number[] = [];
    for (let g = 0; g < c.gates; g++) for (let p = c.opStart[g]!; p < c.opStart[g + 1]!; p++) if (c.ops[p]! >>> 1 === target) on.push(g);
    return [on[0]!, on[on.length - 1]!];
  };

  it("closes under the first reduction and is proved (planted formulas, 6 and 10 variables)", () => {
    for (const [n, seed] of [[6, 1], [10, 2]] as const) {
      const { cnf, c, target } = flagOracle(n, seed);
      expect(closesFirst(cnf, c, target), `${n} variables, seed ${seed}`).toBe(true);
      const p = proveOracle(cnf, c, { kind: "flag" });
      expect(p.status, p.message).toBe("proved");
      expect(["structural", "bdd", "sat"]).toContain(p.method);
    }
  });
  it("a CNOT onto the target dropped from it, or a stray Z on the target, still closes and is refuted with a counterexample", () => {
    const { cnf, c, target } = flagOracle(6, 1);
    const [first, last] = toffoliSpan(c, target);
    const mutants: Circuit[] = [edit(c, (b, g) => {
      if (g === last) b.add(K.z, target << 1);
      return false;
    })];
    for (let g = first; g <= last; g++) {
      if (c.kind[g] === K.cx && c.ops[c.opStart[g]! + 1]! >>> 1 === target) mutants.push(edit(c, (_b, x) => x === g));
    }
    let closed = 0;
    for (const m of mutants) {
      if (!closesFirst(cnf, m, target)) continue; // the other ones leave the symbolic run (cliffordLean mutants above)
      closed++;
      const p = proveOracle(cnf, m, { kind: "flag" });
      expect(p.status, p.message).toBe("refuted");
      expect(failsOn(m, cnf, "flag", p.counterexample!)).toBe(true);
    }
    expect(closed).toBeGreaterThanOrEqual(2);
  });
});
