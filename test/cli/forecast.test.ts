// clausegate forecast from the command line: the bundled example, a small family with its plot,
// the options and the refusals.
import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { cli, ROOT } from "../helpers/cli.js";
import { checkXml, countClass } from "../helpers/xml.js";

const dir = mkdtempSync(join(tmpdir(), "cg-forecast-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const oneLine = (s: string): void => {
  const lines = s.split("\n").filter((l) => l !== "");
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(/: error: .*; hint: /);
};

/** A satisfiable random 3-SAT formula: clauses kept only when a hidden assignment satisfies them (seeded). */
function planted(n: number, seed: number): string {
  let s = seed;
  const random = (): number => {
    s = (Math.imul(s, 1103515245) + 12345) >>> 0;
    return s / 2 ** 32;
  };
  const hidden = Array.from({ length: n }, () => random() < 0.5);
  const clauses: number[][] = [];
  while (clauses.length < 4 * n) {
    const vars = new Set<number>();
    while (vars.size < 3) vars.add(1 + Math.floor(random() * n));
    const c = [...vars].map((v) => (random() < 0.5 ? v : -v));
    if (c.some((l) => hidden[Math.abs(l) - 1] === l > 0)) clauses.push(c);
  }
  return `p cnf ${n} ${clauses.length}\n${clauses.map((c) => `${c.join(" ")} 0`).join("\n")}\n`;
}

describe("clausegate forecast examples/launch-rota.cnf", () => {
  // The full register: N = 2^12 over every variable (the default free register is tested in test/cli/register.test.ts).
  const text = cli(["forecast", "examples/launch-rota.cnf", "--register", "full"]);
  const json = cli(["forecast", "examples/launch-rota.cnf", "--register", "full", "--json"]);
  const doc = JSON.parse(json.stdout);

  it("says it is a model, gives both regimes and lists its assumptions with sources", () => {
    expect(text.code).toBe(0);
    expect(text.stdout).toMatch(/A MODEL, NOT A MEASUREMENT/);
    expect(text.stdout).toMatch(/enough factories +one factory/);
    for (const row of ["code distance", "factories", "physical qubits: data", "routing", "total", "time per oracle call", "time per iteration", "time per run", "expected until success"]) {
      expect(text.stdout).toContain(row);
    }
    expect(text.stdout).toMatch(/factory: \(15-to-1\)_\{17,7,7\} \(Litinski 2019, Table 1, p = 0\.001\): 4620 qubits, 42\.6 code cycles per state, output error 4\.5e-8/);
    expect(text.stdout).toMatch(/^assumptions \(value: source\):$/m);
    expect(text.stdout).toMatch(/physical_error_rate = 0\.001: default: .*Gidney & Ekera 2021/);
    // No advantage claim without the numbers beside it.
    expect(text.stdout).toMatch(/comparison \(enough factories\): .* faster .* by a factor [\d.e+]+ \(quantum model [^,]+, classical brute force [^)]+\)/);
    expect(text.stdout).not.toMatch(/Infinity|NaN/);
  });
  it("prints JSON with the stable keys", () => {
    expect(json.code).toBe(0);
    for (const k of ["code_distance", "physical_qubits", "factories", "run_seconds", "expected_seconds", "classical_expected_seconds", "assumptions"]) expect(doc).toHaveProperty(k);
    expect(doc).toMatchObject({ variables: 12, solutions: 49, solutions_source: "exact", iterations: 7, headline_regime: "reaction_limited" });
    expect(doc.expected_seconds).toBe(doc.run_seconds / doc.success_probability);
    expect(doc.physical_qubits).toBe(doc.regimes.reaction_limited.physical_qubits.total);
    expect(doc.regimes.one_factory.factories).toBe(1);
    for (const a of doc.assumptions) {
      expect(Object.keys(a)).toEqual(["name", "value", "source"]);
      expect(a.source.length).toBeGreaterThan(5);
    }
    const names = doc.assumptions.map((a: { name: string }) => a.name);
    for (const n of ["physical_error_rate", "cycle_seconds", "reaction_seconds", "failure_budget", "magic_state_protocol", "classical_evaluations_per_second", "classical_expected_evaluations"]) expect(names).toContain(n);
  });
  it("follows its own rules: run = k x max(T-depth x reaction, T-count x state time / factories); d the smallest odd within half the budget", () => {
    const r = doc.regimes.reaction_limited;
    const it1 = doc.logical.iteration;
    const state = doc.magic_state_protocol.code_cycles * 1e-6;
    expect(r.run_seconds).toBe(doc.iterations * Math.max(it1.t_depth * 1e-5, it1.t_count * (state / r.factories)));
    const patches = doc.logical.qubits + doc.logical.routing_patches;
    const pl = (d: number): number => 0.1 * 0.1 ** ((d + 1) / 2); // Fowler & Gidney 2018 at p = 1e-3
    expect(patches * r.expected_code_cycles * pl(r.code_distance)).toBeLessThanOrEqual(0.005);
    expect(patches * r.expected_code_cycles * pl(r.code_distance - 2)).toBeGreaterThan(0.005);
    expect(r.physical_qubits.data).toBe(doc.logical.qubits * 2 * r.code_distance ** 2);
    // Classical: N/M = 4096/49 evaluations at the measured rate.
    expect(doc.classical_expected_evaluations).toBeCloseTo(4096 / 49, 9);
    expect(doc.classical_expected_seconds).toBeCloseTo(doc.classical_expected_evaluations / doc.classical_evaluations_per_second, 15);
    expect(doc.quantum_over_classical).toBeCloseTo(doc.expected_seconds / doc.classical_expected_seconds, 6);
  });
});

describe("options", () => {
  it("--error-rate, --failure-budget and --logical-model change the estimate and are listed as given", () => {
    const base = JSON.parse(cli(["forecast", "examples/launch-rota.cnf", "--json"]).stdout);
    const quiet = JSON.parse(cli(["forecast", "examples/launch-rota.cnf", "--json", "--error-rate", "1e-4", "--failure-budget", "0.001", "--logical-model", "fowler-2012"]).stdout);
    expect(quiet.magic_state_protocol.physical_error_rate).toBe(1e-4);
    expect(quiet.code_distance).toBeLessThan(base.code_distance);
    const given = Object.fromEntries(quiet.assumptions.map((a: { name: string; source: string }) => [a.name, a.source]));
    expect(given.physical_error_rate).toBe("given");
    expect(given.failure_budget).toBe("given");
    expect(given.logical_error_model).toMatch(/^given; Fowler, Mariantoni, Martinis & Cleland 2012/);
  });
  it("--classical-time puts a solver's time and the ratio beside the model", () => {
    const r = cli(["forecast", "examples/launch-rota.cnf", "--classical-time", "0.5"]);
    expect(r.stdout).toContain("solver: 500 ms (given with --classical-time)");
    expect(r.stdout).toMatch(/comparison \(enough factories\): the quantum model is faster than the solver by a factor [\d.]+ \(quantum model [\d.]+ ms, the solver 500 ms\)/);
    const doc = JSON.parse(cli(["forecast", "examples/launch-rota.cnf", "--classical-time", "0.5", "--json", "--reaction-time", "2e-5", "--cycle-time", "2e-6"]).stdout);
    expect(doc.solver_seconds).toBe(0.5);
    expect(doc.quantum_over_solver).toBeCloseTo(doc.expected_seconds / 0.5, 12);
    expect(doc.regimes.reaction_limited.t_layer_seconds).toBe(2e-5);
  });
  it("refuses bad values in one line with a hint, exit 2, before any work", () => {
    for (const args of [["--error-rate", "0.002"], ["--error-rate", "abc"], ["--failure-budget", "0"], ["--classical-time", "1,2"], []]) {
      const r = cli(["forecast", ...(args.length ? ["examples/launch-rota.cnf", ...args] : [])]);
      expect(r.code, args.join(" ")).toBe(2);
      expect(r.stdout).toBe("");
      oneLine(r.stderr);
    }
    const model = cli(["forecast", "examples/launch-rota.cnf", "--logical-model", "other"]);
    expect(model.code).toBe(2);
    expect(model.stderr).toMatch(/--logical-model expects one of fowler-gidney-2018, fowler-2012/);
  });
  it("an unsatisfiable formula: exit 3, no estimate, the reason given", () => {
    const r = cli(["forecast", "examples/herb-spiral.cnf", "--json"]);
    expect(r.code).toBe(3);
    const doc = JSON.parse(r.stdout);
    expect(doc).toMatchObject({ solutions: 0, code_distance: null, expected_seconds: null, classical_expected_seconds: null });
    expect(doc.model_limit).toMatch(/unsatisfiable/);
  });
  it("works at any register size: k and the classical time as powers beyond a double, and why there is no quantum estimate", () => {
    // x_i or x_(i+1) for i < n: every variable used, no unit clause, so all n stay in the free register.
    const chain = (n: number): string => `p cnf ${n} ${n - 1}\n${Array.from({ length: n - 1 }, (_, i) => `${i + 1} ${i + 2} 0`).join("\n")}\n`;
    const f = join(dir, "chain-3000.cnf");
    writeFileSync(f, chain(3000));
    const r = cli(["forecast", f]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe("");
    // M cannot be counted here: M = 1, k = floor(pi / (4 asin(2^-1500))) = 2^1499.65 (log2(pi/4) = -0.349).
    expect(r.stdout).toMatch(/\n  N = 2\^3000; M unknown: M = 1 assumed; k = 2\^1499\.7 iterations, /);
    expect(r.stdout).toMatch(/\n  no quantum estimate: k = 2\^1499\.7 iterations of \d+ T gates consume about 10\^\d+\.\d magic states over the expected search, so each must fail with probability at most 10\^-\d+\.\d, far beyond every tabulated distillation protocol/);
    expect(r.stdout).toMatch(/\n  classical brute force: 10\^903\.1 evaluations expected \(N: M unknown\) at .*: 10\^\d+\.\d years \(longer than the age of the universe\)\n/);
    expect(r.stdout).not.toMatch(/Infinity|NaN|beyond the range of a double/);
    const doc = JSON.parse(cli(["forecast", f, "--json"]).stdout);
    expect(doc).toMatchObject({ search_qubits: 3000, iterations: null, classical_expected_seconds: null, expected_seconds: null });
    expect(doc.iterations_log2).toBeCloseTo(1500 + Math.log2(Math.PI / 4), 6);
    // log10(2^3000) = 903.09; seconds = evaluations / the measured rate.
    expect(doc.classical_expected_evaluations_log10).toBeCloseTo(3000 * Math.log10(2), 9);
    expect(doc.classical_expected_seconds_log10).toBeCloseTo(3000 * Math.log10(2) - Math.log10(doc.classical_evaluations_per_second), 9);
    expect(doc.assumptions.find((a: { name: string }) => a.name === "iterations").value).toBe("2^1499.7");
    // Within doubles (1,200 qubits) the model runs and says why it has no estimate either; the classical time is a power of ten too.
    const g = join(dir, "chain-1200.cnf");
    writeFileSync(g, chain(1200));
    const s = cli(["forecast", g]);
    expect(s.code).toBe(0);
    expect(s.stdout).toMatch(/k = 3\.26e\+180 iterations/);
    expect(s.stdout).toMatch(/no quantum estimate: the search consumes so many magic states/);
    expect(s.stdout).toMatch(/: 10\^\d+\.\d years \(longer than the age of the universe\)/);
  });
});

describe("a family at growing sizes", () => {
  const files = [6, 8, 10, 12].map((n) => {
    const f = join(dir, `planted-${n}.cnf`);
    writeFileSync(f, planted(n, 7 * n + 1));
    return f;
  });
  const plot = join(dir, "family.svg");
  const r = cli(["forecast", ...files, "--plot", plot]);

  it("prints one table, the fitted lines and the crossover (or that there is none), and the assumptions once", () => {
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^forecast for 4 formulas: A MODEL, NOT A MEASUREMENT/);
    expect(r.stdout).toMatch(/^file +vars +M +k +d +phys\. qubits +factories +expected \(enough f\.\) +expected \(one f\.\) +classical brute force/m);
    for (const n of [6, 8, 10, 12]) expect(r.stdout).toMatch(new RegExp(`planted-${n}\\.cnf +${n} `));
    expect(r.stdout).toMatch(/quantum, enough factories: log10\(seconds\) = -?[\d.]+ \+ -?[\d.]+ n over 4 points/);
    expect(r.stdout).toMatch(/classical brute force: log10\(seconds\) = -?[\d.]+ \+ [\d.]+ n over 4 points/);
    expect(r.stdout).toMatch(/^crossover(: none|:\n {2}quantum.* at n = [\d.]+ variables, where both take .*\(fitted lines, (within|extrapolated))/m);
    expect(r.stdout.match(/^assumptions \(value: source\):$/gm)).toHaveLength(1);
    expect(r.stdout).not.toMatch(/Infinity|NaN/);
  });
  it("plots quantum (both regimes) and classical on a log scale, with the fits stated", () => {
    const svg = readFileSync(plot, "utf8");
    const xml = checkXml(svg);
    expect(xml.ok).toBe(true);
    expect(countClass(svg, "point-quantum")).toBe(5); // four points and the legend marker
    expect(countClass(svg, "point-quantum-one-factory")).toBe(5);
    expect(countClass(svg, "point-classical")).toBe(5);
    expect(countClass(svg, "line-quantum fit")).toBe(1);
    expect(svg).toContain("A MODEL, NOT A MEASUREMENT");
    expect(svg).toMatch(/least-squares lines of log10\(seconds\) on n/);
    expect(svg).toMatch(/log scale/);
  });
  it("--json holds every forecast, the fits and the crossovers", () => {
    const doc = JSON.parse(cli(["forecast", ...files, "--json", "--classical-time", "0.1,0.2,0.4,0.8"]).stdout);
    expect(doc.forecasts).toHaveLength(4);
    expect(doc.forecasts.map((f: { variables: number }) => f.variables)).toEqual([6, 8, 10, 12]);
    for (const f of doc.forecasts) expect(f.expected_seconds).toBe(f.run_seconds / f.success_probability);
    expect(doc.fits.solver).toMatchObject({ points: 4 });
    expect(doc.fits.solver.slope).toBeCloseTo(Math.log10(2) / 2, 9); // doubling every two variables
    expect(Object.keys(doc.fits)).toEqual(["reaction_limited", "one_factory", "classical", "solver"]);
    expect(Array.isArray(doc.crossovers)).toBe(true);
  });
  it("writes no plot when the run fails", () => {
    const out = join(dir, "never.svg");
    expect(cli(["forecast", ...files, "--plot", out, "--error-rate", "5"]).code).toBe(2);
    expect(existsSync(out)).toBe(false);
  });
});

describe("the README's command summary", () => {
  it("lists every option that forecast --help lists", () => {
    const readme = readFileSync(join(ROOT, "README.md"), "utf8");
    const start = readme.indexOf("clausegate forecast FILE...");
    const summary = readme.slice(start, readme.indexOf("```", start));
    const options = [...cli(["forecast", "--help"]).stdout.matchAll(/^ {2}(--[\w-]+)/gm)].map((m) => m[1]!).filter((o) => o !== "--help");
    expect(options).toContain("--logical-model");
    for (const o of options) expect(summary, o).toContain(o);
  });
});
