/**
 * The cost front and qubit budgets (npm run bench -- front, or node dist/bench/front.js): for a
 * seeded random 3-SAT formula of 20 variables and 90 clauses and for n-queens formulas, the
 * candidates counted, the non-dominated points, the targets of the budget issue, and the
 * construction chosen at a range of budgets; the same with structure recovery off, and a
 * multiplier over the full and the free register (constructions composed with structure).
 * Prints figures; asserts nothing.
 */
import { fileURLToPath } from "node:url";
import { cnfFromClauses, type Cnf } from "../src/cnf/cnf.js";
import { compileOracle } from "../src/compile.js";
import { chooseAmong, costConstructions, costFront, type FrontOptions } from "../src/cost/front.js";
import { countCircuit } from "../src/emit/resources.js";
import { simplify } from "../src/synth/simplify.js";
import { randomClauses } from "./random.js";
import { multiplier } from "../test/helpers/encoders.js";

/** n-queens, one variable per square: a queen in every row, no two attacking (as test/helpers/formulas.ts). */
function queens(n: number): Cnf {
  const v = (r: number, c: number): number => 1 + r * n + c;
  const clauses: number[][] = [];
  for (let r = 0; r < n; r++) clauses.push(Array.from({ length: n }, (_, c) => v(r, c)));
  for (let a = 0; a < n * n; a++) {
    for (let b = a + 1; b < n * n; b++) {
      const [r1, c1, r2, c2] = [Math.floor(a / n), a % n, Math.floor(b / n), b % n];
      if (r1 === r2 || c1 === c2 || Math.abs(r1 - r2) === Math.abs(c1 - c2)) clauses.push([-(a + 1), -(b + 1)]);
    }
  }
  return cnfFromClauses(n * n, clauses);
}

function shape(cnf: Cnf): { n: number; m: number; k: number } {
  const f = simplify(cnf);
  const m = f.clauseStart.length - 1;
  let k = 1;
  for (let i = 0; i < m; i++) k = Math.max(k, f.clauseStart[i + 1]! - f.clauseStart[i]!);
  return { n: cnf.variables, m, k };
}

const log2up = (x: number): number => Math.ceil(Math.log2(Math.max(1, x)));

/** The register options of a report, in words. */
const registerWords = (o: Pick<FrontOptions, "register" | "structure">): string => `${o.register ?? "full"} register, structure ${o.structure === false ? "off" : "on"}`;

function report(label: string, cnf: Cnf, budgetsOf: (lean: number, wide: number) => number[], reg: Pick<FrontOptions, "register" | "structure"> = {}): void {
  const { n, m, k } = shape(cnf);
  console.log(`${label} (${registerWords(reg)}): ${n} variables, ${m} clauses (width up to ${k}) after simplification`);
  const t0 = performance.now();
  const front = costFront(cnf, { uncompute: "measured", ...reg });
  const ms = performance.now() - t0;
  const { wide, lean, textbook } = front.references;
  console.log(`  front: ${front.points.length} of ${front.candidates.length} constructions not dominated; counted in ${(ms / 1000).toFixed(2)} s (measured uncomputation, Clifford+T)`);
  for (const r of [wide, lean, textbook]) console.log(`    ${r.construction.padEnd(9)} qubits ${r.qubits}, T ${r.t_count}, T-depth ${r.t_depth}`);
  const qTarget = n + 2 * Math.ceil(Math.sqrt(k * m)) + 2 * k;
  const within = front.points.filter((p) => p.qubits <= qTarget && p.t_count <= 3 * wide.t_count).sort((a, b) => a.t_count - b.t_count)[0];
  console.log(`  target: a point with qubits <= n + 2 ceil(sqrt(k m)) + 2k = ${qTarget} and T <= 3 x ${wide.t_count} = ${3 * wide.t_count}: ${within ? `${within.construction}, ${within.qubits} qubits, T ${within.t_count} (${(within.t_count / wide.t_count).toFixed(2)} x wide), T-depth ${within.t_depth}` : "none"}`);
  const deep = compileOracle(cnf, { prefer: "t-depth", basis: "clifford+t", uncompute: "measured", ...reg });
  const bound = 2 * (log2up(k) + log2up(m)) + 2;
  const d = countCircuit(deep.circuit);
  console.log(`  target: depth preferred, no budget: ${deep.options.construction}, T-depth ${d.tDepth} (bound 2 (ceil(log2 k) + ceil(log2 m)) + 2 = ${bound}; wide ${wide.t_depth}), ${deep.circuit.qubits} qubits, T ${d.tCount}`);
  const costs = costConstructions(cnf, { uncompute: "measured", ...reg });
  console.log("  budget -> chosen (prefer t-count) | (prefer t-depth):");
  for (const Q of [...new Set(budgetsOf(lean.qubits, wide.qubits))].sort((a, b) => a - b)) {
    const a = chooseAmong(costs, Q, "t-count");
    const b = chooseAmong(costs, Q, "t-depth");
    const text = (c: typeof a): string => (c.ok ? `${c.chosen.construction} ${c.chosen.qubits} q, T ${c.chosen.t_count}, T-depth ${c.chosen.t_depth}` : `none (smallest ${c.smallestQubits})`);
    console.log(`    ${String(Q).padStart(5)}: ${text(a).padEnd(48)} | ${text(b)}`);
  }
}

export function benchFront(): void {
  report("random 3-SAT (bench/random.ts, seed 45)", cnfFromClauses(20, [...randomClauses(20, 90, 3, 45)]), () => [34, 35, 40, 45, 52, 60, 80, 100, 150, 200, 288, 400, 540]);
  // n-queens with one variable per square: 4-queens has 16 variables, 5-queens 25.
  // Structure recovery finds the at-most-one groups of the queens formulas: with it and without.
  for (const q of [4, 5]) {
    for (const structure of [true, false]) {
      report(`${q}-queens`, queens(q), (lean, wide) => [lean - 1, lean, lean + 5, lean + 10, lean + 20, Math.round((lean + wide) / 2), wide, 2 * wide], { structure });
    }
  }
  // A 3 x 3 multiplier fixed to 35 (Tseitin-encoded): every construction over the recovered gates,
  // on the full register and on the free one (2 search qubits, the other variables computed).
  const mul = multiplier(3, 3, 35n);
  for (const reg of [{ structure: false }, {}, { register: "free" as const }]) {
    report("3 x 3 multiplier = 35", cnfFromClauses(mul.variables, mul.clauses), (lean, wide) => [lean - 1, lean, lean + 4, Math.round((lean + wide) / 2), wide], reg);
  }
  const big = cnfFromClauses(200, [...randomClauses(200, 850, 3, 7)]);
  const t0 = performance.now();
  const front = costFront(big, { uncompute: "measured" });
  console.log(`random 3-SAT 200 x 850: ${front.points.length} of ${front.candidates.length} constructions on the front, counted in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
}

if (process.argv[1] === fileURLToPath(import.meta.url)) benchFront();
