/**
 * The prover's bench (`npm run bench -- prove`, or `node dist/bench/prove.js [planted|million]`):
 *   planted  planted random 3-SAT, 200 variables and 800 clauses: every kind x strategy x basis x
 *            uncomputation compiled and proved, each timed, wall and CPU (target: each under 60 s);
 *            `planted lean clifford+t` (any words among kind, strategy, basis, uncompute) runs
 *            only those rows;
 *   million  the 1,000,000-clause bench file (bench/out/random3sat-1m.cnf, the reader bench's
 *            seeded formula), default construction (phase, wide, toffoli, unitary): compiled and
 *            proved in a fresh process, timed, with peak memory (target: under 10 minutes);
 *   mutants  `mutants SIZES CONSTRUCTIONS PICKS BASES CONFLICTS`: the mutation sweep (benchMutants;
 *            MUTANTS_VERBOSE=1 prints each mutant, MUTANTS_CHECK_SAMPLES sets the cross-check's
 *            random sample);
 *   explain  `explain N CONSTRUCTION "KIND BASIS UNCOMPUTE MUTATION" [RANDOM]`: one mutant of the
 *            sweep, its changed gate and whether that gate acts on the states reached there
 *            (explainMutant).
 * Prints figures; asserts nothing. The prover runs without its solver's time budget here
 * (solverSeconds: Infinity), so that what it proves does not depend on the machine's speed.
 */
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { cnfFromClauses, type Cnf } from "../src/cnf/cnf.js";
import { scanDimacs } from "../src/cnf/scanner.js";
import { compileOracle, type OracleOptions } from "../src/compile.js";
import { proveOracle } from "../src/prove/index.js";
import { verifyOracle } from "../src/sim/verify.js";
import { seededRandom } from "../src/util/random.js";
import { edit, MUTATIONS, mutate } from "./mutants.js";
import { findModels } from "../src/cnf/findModels.js";
import { GATE_KINDS } from "../src/ir/kinds.js";
import type { Circuit } from "../src/ir/circuit.js";
import { basisTerm, runSparse } from "../src/sim/sparse.js";
import { randomClauses, writeRandomCnf } from "./random.js";

const here = dirname(fileURLToPath(import.meta.url));
const out = join(here, "..", "..", "bench", "out");

/** Planted random 3-SAT: clauses drawn at random, kept only when the hidden assignment satisfies them. */
export function plantedCnf(n: number, m: number, seed: number): Cnf {
  const r = seededRandom(seed);
  const hidden = Array.from({ length: n }, () => r() < 0.5);
  const clauses: number[][] = [];
  while (clauses.length < m) {
    const c: number[] = [];
    while (c.length < 3) {
      const v = 1 + Math.floor(r() * n);
      if (c.some((l) => Math.abs(l) === v)) continue;
      c.push(r() < 0.5 ? v : -v);
    }
    if (c.some((l) => hidden[Math.abs(l) - 1] === l > 0)) clauses.push(c);
  }
  return cnfFromClauses(n, clauses);
}

/**
 * `only` restricts the rows (any of kind, strategy, basis, uncompute, e.g. ["lean", "clifford+t"]),
 * so that a slow part can be re-run alone. Each proof's CPU time (user + system of this process,
 * one thread) is printed beside its wall time: on a loaded machine the wall time is not the cost.
 */
function benchPlanted(only: readonly string[] = []): void {
  const cnf = plantedCnf(200, 800, 20261202);
  console.log(`proof of planted random 3-SAT, 200 variables, 800 clauses (seed 20261202): ${only.length > 0 ? `the ${only.join(" ")} constructions` : "every construction"}`);
  console.log("  kind   strategy  basis       uncompute    gates  result   method      miter vars/clauses  compile    prove (wall)  prove (CPU)");
  let worst = 0;
  for (const kind of ["phase", "flag"] as const) {
    for (const strategy of ["wide", "lean"] as const) {
      for (const basis of ["mcx", "toffoli", "clifford+t"] as const) {
        for (const uncompute of ["unitary", "measured"] as const) {
          if (!only.every((w) => w === kind || w === strategy || w === basis || w === uncompute)) continue;
          const o: OracleOptions = { kind, strategy, basis, uncompute };
          const t0 = performance.now();
          const c = compileOracle(cnf, o).circuit;
          const compileS = (performance.now() - t0) / 1000;
          const cpu0 = process.cpuUsage();
          const p = proveOracle(cnf, c, { kind, solverSeconds: Infinity });
          const cpu = process.cpuUsage(cpu0);
          const cpuS = (cpu.user + cpu.system) / 1e6;
          worst = Math.max(worst, p.seconds);
          const miter = `${p.miter.variables}/${p.miter.clauses}`;
          console.log(`  ${kind.padEnd(6)} ${strategy.padEnd(9)} ${basis.padEnd(11)} ${uncompute.padEnd(9)} ${String(c.gates).padStart(8)}  ${p.status.padEnd(8)} ${p.method.padEnd(11)} ${miter.padStart(18)} ${compileS.toFixed(2).padStart(6)} s ${p.seconds.toFixed(2).padStart(9)} s ${cpuS.toFixed(2).padStart(9)} s${p.proved ? "" : `  (${p.message})`}`);
        }
      }
    }
  }
  console.log(`  slowest proof: ${worst.toFixed(2)} s wall (target: each under 60 s)`);
}

/** The million-clause proof, in this process (run by benchMillion in a fresh one). */
function proveMillionHere(file: string): void {
  const t0 = performance.now();
  const { cnf } = scanDimacs(readFileSync(file));
  const tRead = performance.now();
  const oracle = compileOracle(cnf!);
  const tCompile = performance.now();
  const p = proveOracle(cnf!, oracle.circuit, { solverSeconds: Infinity });
  const tProve = performance.now();
  console.log(JSON.stringify({
    gates: oracle.circuit.gates, status: p.status, method: p.method, miter: p.miter, graphNodes: p.graphNodes, message: p.message,
    readS: (tRead - t0) / 1000, compileS: (tCompile - tRead) / 1000, proveS: (tProve - tCompile) / 1000,
    peakMB: process.resourceUsage().maxRSS / 1024,
  }));
}

function benchMillion(): void {
  mkdirSync(out, { recursive: true });
  const file = join(out, "random3sat-1m.cnf");
  if (!existsSync(file)) writeRandomCnf(file, 234742, 1_000_000, 3, 20261201); // as the reader bench
  const t0 = performance.now();
  const line = execFileSync(process.execPath, [fileURLToPath(import.meta.url), "million-here", file], { encoding: "utf8", maxBuffer: 1 << 20 });
  const wall = (performance.now() - t0) / 1000;
  const r = JSON.parse(line) as { gates: number; status: string; method: string; miter: { variables: number; clauses: number }; graphNodes: number; message: string; readS: number; compileS: number; proveS: number; peakMB: number };
  console.log(`proof of the 1,000,000-clause bench formula (${file}), default construction (phase, wide, toffoli, unitary):`);
  console.log(`  ${r.gates} gates; ${r.status} (${r.method}; miter ${r.miter.variables} variables, ${r.miter.clauses} clauses; ${r.graphNodes} graph nodes)`);
  console.log(`  read ${r.readS.toFixed(1)} s, compile ${r.compileS.toFixed(1)} s, prove ${r.proveS.toFixed(1)} s; whole process ${wall.toFixed(1)} s; peak ${r.peakMB.toFixed(0)} MB (target: under 10 minutes)`);
}

/**
 * The mutation sweep: random 3-SAT (3n clauses) at 60, 100 and 200 variables; for each
 * construction (wide, lean, blocks-6, fanout-1) x kind x basis x uncomputation x mutation,
 * `picks` mutants (random places). Each is proved, refuted or left unknown by the prover; a proof
 * is cross-checked by sampled simulation (a proved mutant that simulation fails is a prover bug:
 * counted as "WRONG"), an unknown one too (harmful when simulation fails: "fallback"; else
 * "undecided"). Prints counts and times per size and construction. `conflictLimit` is the
 * solver's budget per mutant (the proof is synchronous, so it is the only way to cap its time:
 * the harmless lean mutants are the ones that spend it).
 */
async function benchMutants(sizes: readonly number[], constructions: readonly string[], picks: number, bases: readonly string[] = ["mcx", "toffoli", "clifford+t"], conflictLimit = 1_000_000): Promise<void> {
  console.log(`mutants of oracles of random 3-SAT (3n clauses): ${picks} per construction x kind x basis x uncomputation x mutation; ${conflictLimit} conflicts per mutant`);
  console.log("  vars  construction  mutants  refuted  proved  fallback  undecided  WRONG   mean s   max s  (slowest)");
  for (const n of sizes) {
    const cnf = cnfFromClauses(n, [...randomClauses(n, 3 * n, 3, 1000 + n)]);
    for (const construction of constructions) {
      const counts = { mutants: 0, refuted: 0, proved: 0, fallback: 0, undecided: 0, wrong: 0 };
      let total = 0;
      let worst = 0;
      let slowest = "";
      const r = seededRandom(n * 31 + construction.length);
      for (const kind of ["phase", "flag"] as const) {
        for (const basis of bases as readonly ("mcx" | "toffoli" | "clifford+t")[]) {
          for (const uncompute of ["unitary", "measured"] as const) {
            const o: OracleOptions = { kind, construction, basis, uncompute, structure: false };
            const c = compileOracle(cnf, o).circuit;
            for (const m of MUTATIONS) {
              for (let k = 0; k < picks; k++) {
                const mutated = mutate(c, m, Math.floor(r() * 2 ** 31));
                if (mutated === null) continue;
                counts.mutants++;
                const p = proveOracle(cnf, mutated, { kind, conflictLimit, solverSeconds: Infinity });
                total += p.seconds;
                if (process.env.MUTANTS_VERBOSE) console.log(`    ${n} ${construction} ${kind} ${basis} ${uncompute} ${m}: ${p.status} by ${p.method} in ${p.seconds.toFixed(2)} s`);
                if (p.seconds > worst) {
                  worst = p.seconds;
                  slowest = `${kind} ${basis} ${uncompute} ${m}: ${p.status} by ${p.method}`;
                }
                if (p.status === "refuted") {
                  counts.refuted++;
                  continue;
                }
                // The cross-check's random sample (MUTANTS_CHECK_SAMPLES, default 256; the exact
                // sparse simulator takes seconds per input on a 200-variable Clifford+T oracle).
                const samples = Number(process.env.MUTANTS_CHECK_SAMPLES ?? 256);
                const sim = await verifyOracle(cnf, mutated, { kind, threads: 1, samples, models: Math.min(16, Math.max(1, samples)) });
                const where = `${n} ${construction} ${kind} ${basis} ${uncompute} ${m}`;
                if (p.status === "proved") {
                  if (sim.counterexample !== null) {
                    counts.wrong++;
                    console.log(`  WRONG: proved, but simulation fails: ${where}`);
                  } else counts.proved++;
                } else if (sim.counterexample !== null) {
                  counts.fallback++;
                  if (process.env.MUTANTS_VERBOSE) console.log(`  fallback: ${where}: ${p.message}`);
                } else {
                  counts.undecided++;
                  if (process.env.MUTANTS_VERBOSE) console.log(`  undecided: ${where}: ${p.message}`);
                }
              }
            }
          }
        }
      }
      const c = counts;
      console.log(`  ${String(n).padStart(4)}  ${construction.padEnd(12)} ${String(c.mutants).padStart(8)} ${String(c.refuted).padStart(8)} ${String(c.proved).padStart(7)} ${String(c.fallback).padStart(9)} ${String(c.undecided).padStart(10)} ${String(c.wrong).padStart(6)} ${(total / Math.max(1, c.mutants)).toFixed(2).padStart(8)} ${worst.toFixed(2).padStart(7)}  (${slowest})`);
    }
  }
}

/**
 * One mutant of the sweep, explained: `node dist/bench/prove.js explain N CONSTRUCTION "KIND
 * BASIS UNCOMPUTE MUTATION" [random inputs]` rebuilds it (same picks as benchMutants, one per
 * mutation), names the changed gate and, for a CX or CCX changed (polarity, duplicate = the gate
 * twice, wrong target), simulates the original circuit exactly up to that gate and reports
 * whether its controls are 1 in any term of the state there: where they never are, the change
 * acts on nothing on those inputs. Inputs: the solver's models, random assignments and, since
 * the lean oracle's counter bits above 2^b are set only by inputs that violate at least 2^b
 * clauses, assignments made by local search to violate as many clauses as it can. Evidence for
 * an undecided mutant, not a proof.
 */
async function explainMutant(n: number, construction: string, which: string, randomInputs: number): Promise<void> {
  const cnf = cnfFromClauses(n, [...randomClauses(n, 3 * n, 3, 1000 + n)]);
  const r = seededRandom(n * 31 + construction.length);
  const [kindW, basisW] = which.split(" ");
  for (const kind of ["phase", "flag"] as const) {
    for (const basis of ["clifford+t"] as const) {
      for (const uncompute of ["unitary", "measured"] as const) {
        const c = compileOracle(cnf, { kind, construction, basis, uncompute, structure: false }).circuit;
        for (const m of MUTATIONS) {
          const pick = Math.floor(r() * 2 ** 31);
          if (`${kind} ${basis} ${uncompute} ${m}` !== which) continue;
          const mutated = mutate(c, m, pick)!;
          let g = 0;
          const same = (x: number): boolean => c.kind[x] === mutated.kind[x] && c.opStart[x + 1]! - c.opStart[x]! === mutated.opStart[x + 1]! - mutated.opStart[x]!
            && c.ops.subarray(c.opStart[x]!, c.opStart[x + 1]!).every((o, i) => o === mutated.ops[mutated.opStart[x]! + i]);
          while (g < c.gates && same(g)) g++;
          // A duplicate is the gate before the first difference, put twice.
          if (m === "duplicate") g--;
          const ops = (x: Circuit, y: number): number[] => Array.from(x.ops.subarray(x.opStart[y]!, x.opStart[y + 1]!));
          const show = (x: Circuit, y: number): string => y < x.gates ? `${GATE_KINDS[x.kind[y]!]} ${ops(x, y).map((o) => `${o & 1 ? "!" : ""}${o >>> 1}`).join(",")}` : "(end)";
          console.log(`${n} ${construction} ${which}: ${c.gates} gates; changed gate ${g}: ${show(c, g)} -> ${m === "duplicate" ? "twice" : show(mutated, g)}`);
          const kindName = GATE_KINDS[c.kind[g]!];
          const changedGate = m === "duplicate" || m === "target" || m === "polarity" ? g : -1;
          if (changedGate < 0 || (kindName !== "cx" && kindName !== "ccx")) {
            console.log("  (only a changed CX or CCX is explained)");
            return;
          }
          const controls = ops(c, g).slice(0, -1);
          const prefix = edit(c, (_b, x) => x >= g);
          const violated = (a: boolean[]): number => {
            let v = 0;
            for (let i = 0; i + 1 < cnf.clauseStart.length; i++) {
              let sat = false;
              for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]! && !sat; k++) sat = a[Math.abs(cnf.lits[k]!) - 1] === cnf.lits[k]! > 0;
              if (!sat) v++;
            }
            return v;
          };
          const rnd = seededRandom(99);
          const inputs: { a: boolean[]; why: string }[] = [];
          for (const model of findModels(cnf, 16, { seed: 3, conflictLimit: 100_000 }).models) inputs.push({ a: Array.from(model, (b) => b === 1), why: "model" });
          for (let i = 0; i < randomInputs; i++) inputs.push({ a: Array.from({ length: n }, () => rnd() < 0.5), why: "random" });
          for (let s = 0; s < 8; s++) {
            const a = Array.from({ length: n }, () => rnd() < 0.5);
            for (let pass = 0; pass < 3; pass++) {
              for (let v = 0; v < n; v++) {
                const before = violated(a);
                a[v] = !a[v];
                if (violated(a) < before) a[v] = !a[v];
              }
            }
            inputs.push({ a, why: "local maximum of violated clauses" });
          }
          const target = c.registers.find((x) => x.role === "target");
          let fired = 0;
          let most = 0;
          for (const { a, why } of inputs) {
            most = Math.max(most, violated(a));
            const ones = a.flatMap((on, v) => (on ? [v] : []));
            for (const start of kind === "flag" && target ? [ones, [...ones, target.start]] : [ones]) {
              const terms = runSparse(prefix, [basisTerm(c.qubits, start)], seededRandom(1)).terms;
              const on = terms.filter((t) => controls.every((o) => (((t.bits[(o >>> 1) >>> 5]! >>> ((o >>> 1) & 31)) & 1) === 1) !== ((o & 1) === 1))).length;
              if (on > 0) {
                fired++;
                console.log(`  controls on in ${on} of ${terms.length} terms: ${why}, ${violated(a)} clauses violated`);
              }
            }
          }
          console.log(`  ${inputs.length} inputs (${kind === "flag" ? "each with target 0 and 1; " : ""}most clauses violated: ${most} of ${cnf.clauseStart.length - 1}): the gate's controls ${fired === 0 ? "are on in no term of any of them: the change acts on nothing there" : `are on for ${fired} of them`}`);
          return;
        }
      }
    }
  }
  console.log(`${which}: no such mutant (expected "KIND clifford+t UNCOMPUTE MUTATION", e.g. "flag clifford+t unitary target"; basis ${basisW ?? "?"}, kind ${kindW ?? "?"})`);
}

const part = process.argv[2];
if (part === "million-here") proveMillionHere(process.argv[3]!);
else if (import.meta.url === `file://${process.argv[1]}`) {
  if (part === undefined || part === "planted") benchPlanted(process.argv.slice(3));
  if (part === undefined || part === "million") benchMillion();
  if (part === "explain") await explainMutant(Number(process.argv[3]), process.argv[4]!, process.argv[5]!, Number(process.argv[6] ?? 20));
  if (part === "mutants") {
    // node dist/bench/prove.js mutants [sizes, e.g. 60,100,200] [constructions, e.g. lean,blocks-6] [picks] [bases, e.g. mcx,toffoli] [conflicts per mutant]
    const sizes = (process.argv[3] ?? "60,100,200").split(",").map(Number);
    const constructions = (process.argv[4] ?? "wide,lean,blocks-6,fanout-1").split(",");
    await benchMutants(sizes, constructions, Number(process.argv[5] ?? 2), (process.argv[6] ?? "mcx,toffoli,clifford+t").split(","), Number(process.argv[7] ?? 1_000_000));
  }
}

export { benchPlanted, benchMillion, benchMutants };
