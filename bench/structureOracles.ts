/**
 * Oracles from recovered structure (issue 9's examples and larger encoded formulas): search
 * register, qubits, T-counts with and without structure, Grover iterations planned over the full
 * and the free register, compile times. Prints figures, asserts nothing.
 *   npm run build && node --expose-gc dist/bench/structureOracles.js
 * T-counts are of built circuits: Clifford+T basis, measured uncomputation (Gidney 2018), phase
 * oracle; "free" is the free register (unit propagation, unused variables dropped, structure).
 */
import { cnfFromClauses, type Cnf } from "../src/cnf/cnf.js";
import { compileOracle, type OracleOptions } from "../src/compile.js";
import { countCircuit } from "../src/emit/resources.js";
import { planSearch, type BigCount } from "../src/search/plan.js";
import { verifyOracle } from "../src/sim/verify.js";
import { adder, multiplier, randomXorRows, xorSystem, type Encoded } from "../test/helpers/encoders.js";

const cnfOf = (f: Encoded): Cnf => cnfFromClauses(f.variables, f.clauses);
const fmt = (x: BigCount | undefined): string => (x === undefined ? "-" : x.exact !== undefined ? x.exact.toLocaleString("en-US") : `2^${x.log2.toFixed(1)}`);

function figures(cnf: Cnf, o: OracleOptions): { register: number; qubits: number; t: number; ms: number } {
  const t0 = performance.now();
  const oracle = compileOracle(cnf, { basis: "clifford+t", uncompute: "measured", ...o });
  const ms = performance.now() - t0;
  return { register: oracle.register.length, qubits: oracle.circuit.qubits, t: countCircuit(oracle.circuit).tCount, ms };
}

async function example(name: string, f: Encoded, models: number): Promise<void> {
  const cnf = cnfOf(f);
  console.log(`${name}: ${cnf.variables} variables, ${f.clauses.length} clauses, ${f.inputs.length || "no"} circuit inputs, ${models} models`);
  for (const strategy of ["wide", "lean"] as const) {
    const rows: [string, OracleOptions][] = [
      ["full register, no structure", { strategy, structure: false }],
      ["full register, structure", { strategy }],
      ["reduced register, no structure (--reduce)", { strategy, register: "free", structure: false }],
      ["free register, structure", { strategy, register: "free" }],
    ];
    for (const [label, o] of rows) {
      const r = figures(cnf, o);
      console.log(`  ${strategy.padEnd(4)} ${label.padEnd(42)} search ${String(r.register).padStart(3)}, qubits ${String(r.qubits).padStart(4)}, T ${String(r.t).padStart(5)} (${r.ms.toFixed(0)} ms)`);
    }
  }
  // Iterations: N = 2^register; M = the register values some model extends: the models divided
  // by 2^(variables neither held, fixed nor computed, which take any value); checked against the
  // verified oracle's marks where the register is small enough to enumerate.
  for (const [register, structure] of [["full", true], ["free", false], ["free", true]] as const) {
    const oracle = compileOracle(cnf, { register, structure, basis: "toffoli", uncompute: "measured" });
    const n = oracle.register.length;
    const c = oracle.completion;
    const M = models / 2 ** (cnf.variables - n - c.fixed.length - c.definitions.length);
    const marked = n <= 26 ? (await verifyOracle(cnf, oracle.circuit, { completion: c })).models : undefined;
    const plan = planSearch(n, M);
    const label = register === "full" ? "full register" : structure ? "free register, structure" : "reduced register, no structure";
    console.log(`  plan, ${label}: N = 2^${n}, M = ${M}${marked === undefined ? "" : ` (verified oracle marks ${marked})`}, iterations ${fmt(plan.iterations)}`);
  }
}

// Issue 9's examples.
await example("4 x 4 multiplier = 143 (11 x 13)", multiplier(4, 4, 143n), 2);
await example("6-bit ripple-carry adder = 40", adder(6, 40n), 41);
const rows = randomXorRows(18, 12, 4, 1);
{
  const f = xorSystem(18, rows);
  const cnf = cnfOf(f);
  const a = figures(cnf, { structure: false });
  const b = figures(cnf, {});
  const c = figures(cnf, { register: "free" });
  console.log(`12 random 4-XOR over 18 variables (seed 1, ${f.clauses.length} clauses), wide: ${a.t} T without structure, ${b.t} T with (${(b.t / 12).toFixed(2)} T per constraint), free register ${c.register} qubits and ${c.t} T`);
}

// Larger encoded formulas: compile time and size of the free-register oracle.
for (const [bits, product] of [[8, 60491n], [16, 1234567n], [32, 1234567n]] as const) {
  const f = multiplier(bits, bits, product);
  const cnf = cnfOf(f);
  const full = figures(cnf, {});
  const plain = figures(cnf, { structure: false });
  const free = figures(cnf, { register: "free" });
  console.log(`${bits} x ${bits} multiplier = ${product}: ${f.variables} variables, ${f.clauses.length} clauses; full register T ${plain.t} -> ${full.t} with structure (${full.ms.toFixed(0)} ms); free register ${free.register} qubits, ${free.qubits} in all, T ${free.t} (${free.ms.toFixed(0)} ms)`);
}
