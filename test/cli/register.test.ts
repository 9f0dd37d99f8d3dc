// --register full|free and --no-structure on every command that compiles or plans (issue 9): the
// defaults per command, the JSON keys, measured values completed to models (checked with the
// formula's own evaluation), free-register verification, and cost with and without structure.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { adder, dimacs, randomCircuit } from "../helpers/encoders.js";
import { completeModel, evaluate, readDimacs, registerOf, type Cnf } from "../helpers/lib.js";

const dir = mkdtempSync(join(tmpdir(), "cg-register-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const LOCK = "examples/shed-lock.cnf";
const cnfOf = (text: string | Buffer): Cnf => readDimacs(typeof text === "string" ? Buffer.from(text) : text).cnf!;
const lock = cnfOf(readFileSync(LOCK));

/** Register values (bit i = search qubit i) whose completion is a model, by brute force. */
function markedValues(cnf: Cnf, register: { register: Int32Array; completion: Parameters<typeof completeModel>[0]["completion"] }): number {
  const n = register.register.length;
  let marked = 0;
  for (let x = 0; x < 2 ** n; x++) {
    const value = Array.from({ length: n }, (_, i) => ((x >>> i) & 1) as 0 | 1);
    if (evaluate(cnf, completeModel(register, value))) marked++;
  }
  return marked;
}

/** The DIMACS value line "v 1 -2 ... 0" as 0/1 per variable. */
function parseModel(line: string, variables: number): Uint8Array {
  const lits = line.replace(/^v /, "").trim().split(/\s+/).map(Number);
  expect(lits.at(-1)).toBe(0);
  expect(lits.length - 1).toBe(variables);
  return Uint8Array.from(lits.slice(0, -1), (l, i) => {
    expect(Math.abs(l)).toBe(i + 1);
    return l > 0 ? 1 : 0;
  });
}

describe("defaults per command", { timeout: 120_000 }, () => {
  it("oracle, verify, cost and draw use the full register; plan, search and forecast the free one", () => {
    expect(cli(["oracle", LOCK]).stdout).toMatch(/^qubit\[40\] vars;$/m);
    expect(cli(["oracle", LOCK, "--register", "free"]).stdout).toMatch(/^qubit\[4\] vars;$/m);
    expect(cli(["verify", LOCK]).stdout).toMatch(/^proved: every assignment, /); // 40 variables: above the exhaustive limit, so proved
    expect(cli(["verify", LOCK, "--sample"]).stdout).toMatch(/^verified: sampled \(\d+ assignments, /);
    expect(cli(["cost", LOCK]).stdout).toContain("search register: 40 qubits, full (every declared variable");
    const svg = join(dir, "pair.svg");
    expect(cli(["draw", "examples/allotment-pair.cnf", "-o", svg]).code).toBe(0);
    expect(readFileSync(svg, "utf8")).toContain(">vars[3]</text>");
    expect(cli(["draw", "examples/allotment-pair.cnf", "--register", "free", "-o", svg]).code).toBe(0);
    expect(readFileSync(svg, "utf8")).not.toContain(">vars[2]</text>");
    expect(cli(["plan", LOCK]).stdout).toContain("search register: 4 qubits, N = 2^4 = 16");
    expect(cli(["plan", LOCK, "--register", "full"]).stdout).toContain("search register: 40 qubits, N = 2^40 = 1099511627776");
    expect(cli(["search", LOCK]).stdout).toMatch(/^qubit\[4\] vars;$/m);
    const f = JSON.parse(cli(["forecast", LOCK, "--json"]).stdout);
    expect(f).toMatchObject({ search_qubits: 4, register_mode: "free", solutions: 10 });
    expect(f.assumptions.find((a: { name: string }) => a.name === "search_register")).toMatchObject({ value: "free" });
  });
  it("help texts name the option and each command's default; --reduce is documented as an alias", () => {
    for (const [command, fallback] of [["oracle", "full"], ["verify", "full"], ["cost", "full"], ["draw", "full"], ["plan", "free"], ["search", "free"], ["forecast", "free"]]) {
      const help = cli([command!, "--help"]).stdout;
      expect(help, command).toContain("--register full|free");
      expect(help, command).toContain(`${fallback} (default)`);
      expect(help, command).toContain("--no-structure");
    }
    for (const command of ["plan", "search"]) expect(cli([command, "--help"]).stdout).toMatch(/--reduce +an alias of --register free/);
  });
});

describe("plan over the free register", { timeout: 120_000 }, () => {
  it("the shed lock: 4 qubits and k = 0 instead of 30 qubits and k = 8138 (unit propagation alone) or 40 and k = 260429", () => {
    const free = JSON.parse(cli(["plan", LOCK, "--json"]).stdout);
    expect(free).toMatchObject({ variables: 40, search_qubits: 4, n_assignments: 16, solutions: 10, iterations: 0, register_mode: "free", structure: true, register: [1, 2, 3, 4] });
    // Unit propagation and unused variables only (what --reduce did before): the same M over 30 qubits.
    const plain = JSON.parse(cli(["plan", LOCK, "--no-structure", "--json"]).stdout);
    expect(plain).toMatchObject({ search_qubits: 30, solutions: 10, iterations: 8138, structure: false });
    expect(JSON.parse(cli(["plan", LOCK, "--reduce", "--no-structure", "--json"]).stdout)).toEqual(plain);
    const full = JSON.parse(cli(["plan", LOCK, "--register", "full", "--json"]).stdout);
    expect(full).toMatchObject({ search_qubits: 40, solutions: 10, iterations: 260429, register_mode: "full", completion: null });
    expect(full.register).toEqual(Array.from({ length: 40 }, (_, i) => i + 1));
  });
  it("the JSON's register and completion are the library's, and M is the number of register values whose completion is a model", () => {
    const doc = JSON.parse(cli(["plan", LOCK, "--json"]).stdout);
    const r = registerOf(lock, { register: "free" });
    expect(doc.register).toEqual(Array.from(r.register));
    expect(doc.completion.fixed).toEqual(Array.from(r.completion.fixed, (l) => ({ variable: Math.abs(l), value: l > 0 })));
    expect(doc.completion.definitions.map((d: { variable: number }) => d.variable)).toEqual(r.completion.definitions.map((d) => d.variable));
    expect(doc.completion.other_variables).toBe(40 - 4 - r.completion.fixed.length - r.completion.definitions.length);
    expect(doc.completion.rule).toMatch(/measured bit.*unit propagation.*in the order listed.*\(0 chosen\)/);
    expect(doc.solutions).toBe(markedValues(lock, r));
  });
  it("M over the free register is the brute-force count of marked register values, on encoded circuits and adders (with and without structure)", () => {
    const formulas = [
      ...[3, 11, 19, 27, 35, 43].map((seed) => dimacs(randomCircuit(seed, { inputs: 4, gates: 6, extraClauses: seed % 3, oneHot: seed % 2 ? 3 : 0, parities: seed % 4 === 3 ? 1 : 0 }))),
      dimacs(adder(3, 9n)), // a + b = 9 with 3-bit a, b: 6 models (a = 2..7), the closed form S + 1 capped by the width
    ];
    for (const text of formulas) {
      const cnf = cnfOf(text);
      for (const structure of [true, false]) {
        const doc = JSON.parse(cli(["plan", "-", "--json", ...(structure ? [] : ["--no-structure"])], text).stdout);
        const r = registerOf(cnf, { register: "free", structure });
        expect(doc.search_qubits).toBe(r.register.length);
        expect(doc.solutions, text).toBe(markedValues(cnf, r));
      }
    }
  });
  it("text names the register and where M comes from", () => {
    const r = cli(["plan", LOCK]);
    expect(r.stdout).toContain("register: free (vars[i] is variable 1 2 3 4; of 40: 10 fixed by unit propagation, 26 defined, 0 in no open clause)");
    expect(r.stdout).toContain("solutions: M = 10 (exact model count: register values that extend to a model)");
    expect(cli(["plan", LOCK, "--register", "full"]).stdout).toContain("register: full (every declared variable: vars[v-1] is variable v)");
  });
});

describe("search: measured values completed to models", { timeout: 120_000 }, () => {
  it("--shots simulates the circuit and every shot marked a model satisfies the formula (its own evaluation), and only those", () => {
    for (const args of [["--iterations", "2"], ["--iterations", "1", "--uncompute", "measured", "--basis", "clifford+t"], ["--no-structure", "--register", "full", "--iterations", "1", "-"]]) {
      const input = args.includes("-") ? "p cnf 6 4\n1 2 0\n-1 3 0\n-3 -4 5 0\n6 -2 0\n" : undefined;
      const file = input === undefined ? [LOCK] : [];
      const r = cli(["search", ...file, ...args, "--shots", "40", "--seed", "5"], input);
      expect(r.code, r.stderr).toBe(0);
      const cnf = input === undefined ? lock : cnfOf(input);
      const shots = r.stdout.split("\n").filter((l) => l.startsWith("shot "));
      expect(shots).toHaveLength(40);
      let models = 0;
      for (const line of shots) {
        const m = /^shot \d+: outcome ([01]*) -> (v [-\d ]+ 0) \((a model|not a model)\)$/.exec(line);
        expect(m, line).not.toBeNull();
        const model = parseModel(m![2]!, cnf.variables);
        expect(evaluate(cnf, model), line).toBe(m![3] === "a model");
        if (m![3] === "a model") models++;
      }
      expect(r.stdout).toContain(`models among the shots: ${models} of 40`);
      // The construction simulated is named (the default: wide), never "undefined".
      expect(r.stdout).toMatch(/simulated: the search circuit \(\d+ iterations?, strategy wide, basis /);
    }
  });
  it("the probability printed is what the plan says: sin^2((2K+1) theta) with sin^2 theta = M/N = 10/16 on the lock", () => {
    const theta = Math.asin(Math.sqrt(10 / 16));
    for (const K of [0, 1, 2]) {
      const r = cli(["search", LOCK, "--iterations", String(K), "--shots", "1"]);
      const p = Number(/probability that a shot completes to a model: ([\d.e-]+)/.exec(r.stdout)![1]);
      expect(p).toBeCloseTo(Math.sin((2 * K + 1) * theta) ** 2, 9);
    }
  });
  it("the lock's codes: the 16 register values complete to exactly its 10 models, each a real model; exit 1 as some are not", () => {
    const values = Array.from({ length: 16 }, (_, x) => Array.from({ length: 4 }, (_, i) => (x >>> i) & 1).join(""));
    const r = cli(["search", LOCK, "--complete", values.join(",")]);
    expect(r.code).toBe(1);
    const lines = r.stdout.split("\n").filter((l) => l.startsWith("value "));
    expect(lines).toHaveLength(16);
    const models = new Set<string>();
    for (const line of lines) {
      const m = /^value \d+: outcome ([01]{4}) -> (v [-\d ]+ 0) \((a model|not a model[^)]*)\)$/.exec(line)!;
      const model = parseModel(m[2]!, 40);
      expect(evaluate(lock, model)).toBe(m[3] === "a model");
      if (m[3] === "a model") models.add(m[2]!);
    }
    expect(models.size).toBe(10);
    expect(r.stdout).toMatch(/^formula: examples\/shed-lock\.cnf; search register: 4 qubits, free \(vars\[i\] is variable 1 2 3 4;/);
    // All of them models: exit 0.
    const good = lines.filter((l) => l.endsWith("(a model)")).map((l) => /outcome ([01]{4})/.exec(l)![1]!);
    expect(cli(["search", LOCK, "--complete", good.join(",")]).code).toBe(0);
  });
  it("the circuit's comments and the report name each qubit's variable and the completion", () => {
    const rep = join(dir, "lock.json");
    const r = cli(["search", LOCK, "--report", rep]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain("// search register: free (vars[i] is variable 1 2 3 4; of 40: 10 fixed by unit propagation, 26 defined, 0 in no open clause)");
    expect(r.stdout).toContain("// a measured value completes to a model:");
    const report = JSON.parse(readFileSync(rep, "utf8"));
    expect(report).toMatchObject({ variables: 40, search_qubits: 4, register_mode: "free", structure: true, register: [1, 2, 3, 4] });
    expect(report.completion.definitions.length).toBe(26);
    expect(report.plan).toMatchObject({ solutions: 10, optimal_iterations: 0 });
    // The costs are those of the free-register oracle: its search register is 4 qubits wide.
    for (const c of report.costs) expect(c.diffusion.qubits).toBeLessThanOrEqual(4 + 2);
    const full = join(dir, "lock-full.json");
    expect(cli(["search", LOCK, "--register", "full", "--iterations", "1", "--report", full, "-o", join(dir, "lock-full.qasm")]).code).toBe(0);
    expect(JSON.parse(readFileSync(full, "utf8"))).toMatchObject({ search_qubits: 40, register_mode: "full", completion: null });
  });
  it("--no-structure searches the 30 variables unit propagation leaves", () => {
    expect(cli(["search", LOCK, "--no-structure", "--iterations", "1"]).stdout).toMatch(/^qubit\[30\] vars;$/m);
  });
});

describe("oracle, verify and draw with a free register", { timeout: 120_000 }, () => {
  it("oracle --report: register, register_mode, structure, recovered and completion", () => {
    const rep = join(dir, "o.json");
    expect(cli(["oracle", LOCK, "--register", "free", "--report", rep, "-o", join(dir, "o.qasm")]).code).toBe(0);
    const report = JSON.parse(readFileSync(rep, "utf8"));
    expect(report).toMatchObject({ register: [1, 2, 3, 4], register_mode: "free", structure: true, qubits: { search: 4 } });
    expect(report.recovered).toMatchObject({ used: true, definitions: 26 });
    expect(report.completion.fixed).toHaveLength(10);
    const off = join(dir, "off.json");
    expect(cli(["oracle", LOCK, "--no-structure", "--report", off, "-o", join(dir, "off.qasm")]).code).toBe(0);
    expect(JSON.parse(readFileSync(off, "utf8"))).toMatchObject({ register_mode: "full", structure: false, recovered: null, completion: null, qubits: { search: 40 } });
    expect(readFileSync(join(dir, "off.qasm"), "utf8")).toContain("// structure: recovery off (--no-structure): the clause construction");
  });
  it("verify --register free passes against the projection, in every basis and uncomputation, with and without structure", () => {
    for (const args of [[], ["--basis", "clifford+t", "--uncompute", "measured"], ["--strategy", "lean", "--kind", "flag"], ["--basis", "mcx"]]) {
      const r = cli(["verify", LOCK, "--register", "free", ...args]);
      expect(r.code, `${args.join(" ")}: ${r.stdout}${r.stderr}`).toBe(0);
      expect(r.stdout).toMatch(/^verified: exhaustive \(16 register values, [\w-]+ simulator; free register, against the formula's projection\); 10 extending to a model, 6 not/);
    }
    // Without structure the free register is 30 qubits: above the exhaustive limit, so proved
    // against the projection; --sample samples, models from the solver projected.
    const proved = cli(["verify", LOCK, "--register", "free", "--no-structure"]);
    expect(proved.code, proved.stdout).toBe(0);
    expect(proved.stdout).toMatch(/^proved: every assignment, /);
    const plain = cli(["verify", LOCK, "--register", "free", "--no-structure", "--sample"]);
    expect(plain.code, plain.stdout).toBe(0);
    expect(plain.stdout).toMatch(/^verified: sampled \(\d+ register values, bit-parallel simulator; free register, against the formula's projection\)/);
    const doc = JSON.parse(cli(["verify", LOCK, "--register", "free", "--json"]).stdout);
    expect(doc).toMatchObject({ verified: true, register: "free", assignments: 16, models: 10, non_models: 6 });
  });
  it("a mutated free-register oracle fails, and the counterexample names the register value and its completion", () => {
    const good = join(dir, "free.json");
    expect(cli(["oracle", LOCK, "--register", "free", "--format", "json", "-o", good]).code).toBe(0);
    expect(cli(["verify", LOCK, "--circuit", good, "--register", "free"]).code).toBe(0);
    // A Z on search qubit 0 flips the phase of every value with variable 1 set.
    const doc = JSON.parse(readFileSync(good, "utf8"));
    doc.gates.push({ op: "z", qubits: [0] });
    const bad = join(dir, "bad.json");
    writeFileSync(bad, JSON.stringify(doc));
    const r = cli(["verify", LOCK, "--circuit", bad, "--register", "free"]);
    expect(r.code).toBe(1);
    const m = /^counterexample: register value ((?:-?\d+ )+0) \(register variables as literals\), completed to ((?:-?\d+ )+0)$/m.exec(r.stdout);
    expect(m, r.stdout).not.toBeNull();
    const regLits = m![1]!.split(" ").map(Number).slice(0, -1);
    expect(regLits.map(Math.abs)).toEqual([1, 2, 3, 4]);
    expect(regLits[0]).toBe(1); // variable 1 set: where the Z acts
    const completion = m![2]!.split(" ").map(Number).slice(0, -1);
    expect(completion).toHaveLength(40);
    // The completion is the library's for that register value, and the expected phase follows it.
    const value = regLits.map((l) => (l > 0 ? 1 : 0) as 0 | 1);
    const model = completeModel(registerOf(lock, { register: "free" }), value);
    expect(completion.map((l) => (l > 0 ? 1 : 0))).toEqual(Array.from(model));
    const json = JSON.parse(cli(["verify", LOCK, "--circuit", bad, "--register", "free", "--json"]).stdout);
    expect(json).toMatchObject({ verified: false, register: "free", counterexample_register: m![1], counterexample: m![2] });
    expect(json.counterexample_register_bits).toBe(value.join(""));
    // Read as a full-register circuit it is not even the right shape.
    const full = cli(["verify", LOCK, "--circuit", good]);
    expect(full.code).toBe(1);
    expect(full.stdout).toMatch(/has 4 qubits but the formula declares 40 variables/);
  });
  it("verify --prove proves a free-register oracle against the projection, and refutes the mutated one at a register value", () => {
    const good = join(dir, "free-p.json");
    expect(cli(["oracle", LOCK, "--register", "free", "--format", "json", "-o", good]).code).toBe(0);
    const ok = cli(["verify", LOCK, "--circuit", good, "--register", "free", "--prove", "--json"]);
    expect(ok.code).toBe(0);
    expect(JSON.parse(ok.stdout)).toMatchObject({ verified: true, method: "proof" });
    const doc = JSON.parse(readFileSync(good, "utf8"));
    doc.gates.push({ op: "z", qubits: [0] });
    const bad = join(dir, "bad-p.json");
    writeFileSync(bad, JSON.stringify(doc));
    const r = cli(["verify", LOCK, "--circuit", bad, "--register", "free", "--prove"]);
    expect(r.code).toBe(1);
    const m = /^counterexample: register value ((?:-?\d+ )+0) \(register variables as literals\), completed to ((?:-?\d+ )+0)$/m.exec(r.stdout);
    expect(m, r.stdout).not.toBeNull();
    const regLits = m![1]!.split(" ").map(Number).slice(0, -1);
    expect(regLits.map(Math.abs)).toEqual([1, 2, 3, 4]);
    expect(regLits[0]).toBe(1); // the stray Z acts where variable 1 is set
    const value = regLits.map((l) => (l > 0 ? 1 : 0) as 0 | 1);
    const model = completeModel(registerOf(lock, { register: "free" }), value);
    expect(m![2]!.split(" ").map(Number).slice(0, -1).map((l) => (l > 0 ? 1 : 0))).toEqual(Array.from(model));
    const json = JSON.parse(cli(["verify", LOCK, "--circuit", bad, "--register", "free", "--prove", "--json"]).stdout);
    expect(json).toMatchObject({ verified: false, method: "proof", counterexample_register: m![1], counterexample: m![2] });
  });
  it("oracle --verify checks a free-register oracle against the projection before writing it", () => {
    const out = join(dir, "v.qasm");
    const r = cli(["oracle", LOCK, "--register", "free", "--verify", "-o", out]);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/verified: exhaustive \(16 register values/);
  });
  it("draw --no-structure draws the clause construction", () => {
    const a = join(dir, "a.svg");
    const b = join(dir, "b.svg");
    expect(cli(["draw", "examples/allotment-pair.cnf", "--basis", "mcx", "-o", a]).code).toBe(0);
    expect(cli(["draw", "examples/allotment-pair.cnf", "--basis", "mcx", "--no-structure", "-o", b]).code).toBe(0);
    expect(readFileSync(a, "utf8")).not.toBe(readFileSync(b, "utf8"));
    const s = join(dir, "s.svg");
    expect(cli(["draw", LOCK, "--search", "--register", "free", "--iterations", "1", "-o", s]).code).toBe(0);
    expect(readFileSync(s, "utf8")).toContain("free register of 4 qubits");
  });
});

describe("cost with and without structure", { timeout: 120_000 }, () => {
  it("shows both sets of rows and the registers; structure never costs more T on the lock", () => {
    const doc = JSON.parse(cli(["cost", LOCK, "--json"]).stdout);
    expect(doc).toMatchObject({ variables: 40, register_mode: "full", recovered: { used: true } });
    expect(doc.register).toHaveLength(40);
    const key = (r: { strategy: string; uncompute: string; structure: boolean }) => `${r.strategy} ${r.uncompute} ${r.structure}`;
    expect(doc.rows.map(key)).toEqual([
      "wide unitary true", "wide measured true", "lean unitary true", "lean measured true",
      "wide unitary false", "wide measured false", "lean unitary false", "lean measured false", "textbook unitary false",
    ]);
    for (const r of doc.rows.filter((x: { structure: boolean }) => x.structure)) {
      const plain = doc.rows.find((x: { structure: boolean; strategy: string; uncompute: string }) => !x.structure && x.strategy === r.strategy && x.uncompute === r.uncompute);
      expect(r.t_count).toBeLessThanOrEqual(plain.t_count);
    }
    const free = JSON.parse(cli(["cost", LOCK, "--json", "--register", "free"]).stdout);
    expect(free).toMatchObject({ register_mode: "free", register: [1, 2, 3, 4] });
    expect(free.register_without_structure).toHaveLength(30);
    const text = cli(["cost", LOCK, "--register", "free"]).stdout;
    expect(text).toContain("search register (rows with structure): 4 qubits, free");
    expect(text).toContain("search register (rows without structure): 30 qubits, free");
  });
  it("--no-structure shows the rows without structure only; a formula with nothing to recover says so", () => {
    const off = JSON.parse(cli(["cost", LOCK, "--json", "--no-structure"]).stdout);
    expect(off.recovered).toBeNull();
    expect(off.rows.every((r: { structure: boolean }) => !r.structure)).toBe(true);
    expect(off.rows).toHaveLength(5);
    const plain = cli(["cost", "-"], "p cnf 3 2\n1 2 3 0\n-1 -2 0\n");
    expect(plain.stdout).toContain("structure: none recovered: the clause construction (the rows with structure would repeat those below)");
    expect(plain.stdout.trimEnd().split("\n").slice(4)).toHaveLength(5);
  });
});

describe("forecast's register", { timeout: 120_000 }, () => {
  it("free by default; --register full and --no-structure change N, and the assumptions say which register was used", () => {
    const free = JSON.parse(cli(["forecast", LOCK, "--json"]).stdout);
    const full = JSON.parse(cli(["forecast", LOCK, "--json", "--register", "full"]).stdout);
    const plain = JSON.parse(cli(["forecast", LOCK, "--json", "--no-structure"]).stdout);
    expect([free.search_qubits, full.search_qubits, plain.search_qubits]).toEqual([4, 40, 30]);
    expect([free.iterations, full.iterations, plain.iterations]).toEqual([0, 260429, 8138]);
    const assumption = (d: { assumptions: { name: string; value: unknown; source: string }[] }, name: string) => d.assumptions.find((a) => a.name === name)!;
    expect(assumption(free, "search_register")).toMatchObject({ value: "free" });
    expect(assumption(free, "search_register").source).toMatch(/^default/);
    expect(assumption(full, "search_register")).toMatchObject({ value: "full" });
    expect(assumption(full, "search_register").source).toMatch(/^given/);
    expect(assumption(plain, "search_register")).toMatchObject({ value: "free, no structure" });
    expect(assumption(free, "search_register_variables").value).toMatch(/vars\[i\] is variable 1 2 3 4/);
    // The classical brute force runs over the same register: N/M = 2^n / 10.
    expect(free.classical_expected_evaluations).toBeCloseTo(16 / 10, 12);
    expect(full.classical_expected_evaluations).toBeCloseTo(2 ** 40 / 10, 0);
    const text = cli(["forecast", LOCK]).stdout;
    expect(text).toContain("search register: 4 search qubits, free (vars[i] is variable 1 2 3 4;");
    expect(text).toMatch(/search_register = free: default/);
  });
});

describe("bad values", () => {
  it("one line, exit 2, nothing on standard output", () => {
    const cases: [string[], RegExp][] = [
      [["plan", LOCK, "--register", "partial"], /^clausegate plan: error: --register expects one of full, free but got 'partial'; hint: /],
      [["search", LOCK, "--reduce", "--register", "full"], /--reduce is an alias of --register free and contradicts --register full; hint: /],
      [["search", LOCK, "--complete", "101"], /--complete expects 4 bits \(0 or 1, outcome\[0\] first\) per value but got '101'; hint: /],
      [["search", LOCK, "--complete", "1010", "-o", join(dir, "x.qasm")], /--complete completes values measured elsewhere .* --output does not apply; hint: /],
      [["search", LOCK, "--seed", "3"], /--seed seeds the simulated shots; hint: add --shots/],
      [["search", LOCK, "--register", "full", "--iterations", "1", "--shots", "3"], /--shots simulates search registers of at most 16 qubits and this one has 40; hint: try --register free/],
      [["search", LOCK, "--shots", "0"], /--shots expects a whole number in 1\.\.65536/],
      [["cost", LOCK, "--no-structure=yes"], /option --no-structure takes no value/],
      [["verify", LOCK, "--register", "Free"], /--register expects one of full, free/],
      [["forecast", LOCK, "--register", ""], /--register expects one of full, free/],
    ];
    for (const [args, message] of cases) {
      const r = cli(args);
      expect(r.code, args.join(" ")).toBe(2);
      expect(r.stdout).toBe("");
      const lines = r.stderr.split("\n").filter((l) => l !== "");
      expect(lines, r.stderr).toHaveLength(1);
      expect(lines[0]).toMatch(message);
    }
  });
});
