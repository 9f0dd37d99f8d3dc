// plan, search and draw from the command line; the SVGs are checked as XML and, where a browser
// is installed, rendered in headless Chromium.
import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { checkXml, countClass } from "../helpers/xml.js";

const dir = mkdtempSync(join(tmpdir(), "clausegate-search-"));

describe("clausegate plan", () => {
  it("prints theta, k, P, expected oracle calls and the classical comparison", () => {
    const r = cli(["plan", "examples/launch-rota.cnf"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain("solutions: M = 49 (exact model count)");
    expect(r.stdout).toContain("iterations: k = floor(pi / (4 theta)) = 7");
    expect(r.stdout).toMatch(/success probability: sin\^2\(\(2k\+1\) theta\) = 0\.99466/);
    expect(r.stdout).toMatch(/classical: 83\.59\d* evaluations expected .*; 4048 in the worst case/);
  });
  it("prints JSON with the stable keys", () => {
    const doc = JSON.parse(cli(["plan", "examples/allotment-row.cnf", "--json"]).stdout);
    expect(Object.keys(doc)).toEqual(["variables", "search_qubits", "solutions", "solutions_source", "theta", "iterations", "success_probability", "expected_oracle_calls", "classical_expected_evaluations"]);
    expect(doc).toMatchObject({ variables: 12, search_qubits: 12, solutions: 4, solutions_source: "exact", iterations: 25 });
  });
  it("takes --solutions and says when M is given", () => {
    const doc = JSON.parse(cli(["plan", "examples/allotment-pair.cnf", "--solutions", "1", "--json"]).stdout);
    expect(doc).toMatchObject({ solutions: 1, solutions_source: "given", iterations: 3 });
  });
  it("exits 3 for an unsatisfiable formula, with the numbers printed", () => {
    const r = cli(["plan", "examples/herb-spiral.cnf"]);
    expect(r.code).toBe(3);
    expect(r.stdout).toContain("verdict: the formula is unsatisfiable");
  });
  it("says when every assignment works, and when classical sampling is cheaper", () => {
    expect(cli(["plan", "-"], "p cnf 3 0\n").stdout).toContain("no search is needed");
    expect(cli(["plan", "-"], "p cnf 3 1\n1 2 3 0\n").stdout).toContain("a classical random guess is cheaper");
  });
  it("prints the schedule for an unknown M and a seeded sequence of iteration counts", () => {
    const r = cli(["plan", "examples/launch-rota.cnf", "--solutions", "unknown", "--simulate", "7"]);
    expect(r.stdout).toMatch(/lambda = 1\.2/);
    expect(r.stdout).toMatch(/^ +0 +1 +0\.\.0$/m);
    expect(r.stdout).toMatch(/^iteration counts to run, rounds 0\.\.\d+ \(seed 7\): (\d+ )+\d+$/m);
    expect(cli(["plan", "examples/launch-rota.cnf", "--solutions", "unknown", "--simulate", "7"]).stdout).toBe(r.stdout);
  });
  it("plots the success probability as SVG, marking k", () => {
    const out = join(dir, "plot.svg");
    expect(cli(["plan", "examples/launch-rota.cnf", "--plot", out]).code).toBe(0);
    const svg = readFileSync(out, "utf8");
    const xml = checkXml(svg);
    expect(xml.ok).toBe(true);
    if (xml.ok) expect(xml.elements.get("polyline")).toBe(1);
    expect(countClass(svg, "chosen-point")).toBe(1);
    expect(countClass(svg, "point")).toBe(16); // j = 0..16 (2k+2), one of them the chosen point
  });
});

describe("clausegate search", () => {
  it("writes the search circuit and a whole-run report (wide and lean side by side)", () => {
    const out = join(dir, "s.qasm");
    const rep = join(dir, "s.json");
    const r = cli(["search", "examples/launch-rota.cnf", "-o", out, "--report", rep, "--uncompute", "measured"]);
    expect(r.code).toBe(0);
    const qasm = readFileSync(out, "utf8");
    expect(qasm).toContain("7 iterations");
    expect(qasm).toMatch(/^outcome\[11\] = measure vars\[11\];$/m);
    const report = JSON.parse(readFileSync(rep, "utf8"));
    expect(report.plan).toMatchObject({ solutions: 49, optimal_iterations: 7 });
    expect(report.costs.map((c: { strategy: string }) => c.strategy)).toEqual(["wide", "lean"]);
    for (const c of report.costs) {
      expect(Object.keys(c.oracle)).toEqual(["qubits", "t_count", "t_depth", "cnot_count", "depth", "toffoli_count"]);
      expect(c.circuit.t_count).toBeGreaterThanOrEqual(7 * c.oracle.t_count);
      expect(c.expected_t_count).toBeCloseTo(c.circuit.t_count * c.expected_runs, 6);
    }
  });
  it("reduces the search register and maps each bit back to its variable", () => {
    const rep = join(dir, "r.json");
    const r = cli(["search", "-", "--reduce", "--report", rep], "p cnf 5 3\n1 0\n-1 2 3 0\n3 -4 0\n");
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^qubit\[3\] vars;$/m);
    const report = JSON.parse(readFileSync(rep, "utf8"));
    expect(report.reduction.register).toEqual([{ bit: 0, variable: 2 }, { bit: 1, variable: 3 }, { bit: 2, variable: 4 }]);
    expect(report.reduction.fixed).toEqual([{ variable: 1, value: true }]);
    expect(report.reduction.free).toEqual([5]);
  });
  it("refuses to search an unsatisfiable formula (exit 3) unless told how many iterations", () => {
    expect(cli(["search", "examples/herb-spiral.cnf"]).code).toBe(3);
    expect(cli(["search", "examples/herb-spiral.cnf", "--iterations", "1"]).code).toBe(0);
  });
});

describe("clausegate draw", () => {
  it("draws an oracle: dots for controls on 1, open dots for controls on 0, circled plus for targets", () => {
    const out = join(dir, "o.svg");
    expect(cli(["draw", "examples/allotment-pair.cnf", "--basis", "mcx", "-o", out]).code).toBe(0);
    const svg = readFileSync(out, "utf8");
    expect(checkXml(svg).ok).toBe(true);
    // Six clauses of two literals, computed and uncomputed: 12 ANDs (4 open dots each for the two
    // all-positive-literal clauses... counted exactly below), 12 targets, and the root: 6 open dots.
    expect(countClass(svg, "target")).toBe(12);
    expect(countClass(svg, "ctrl-on") + countClass(svg, "ctrl-off")).toBe(12 * 2 + 6);
    expect(svg).toContain(">vars[0]</text>");
    expect(svg).toContain(">work[5]</text>");
  });
  it("draws a search circuit with measurements", () => {
    const out = join(dir, "s.svg");
    expect(cli(["draw", "examples/allotment-pair.cnf", "--search", "--basis", "mcx", "-o", out]).code).toBe(0);
    const svg = readFileSync(out, "utf8");
    expect(checkXml(svg).ok).toBe(true);
    expect(countClass(svg, "meter")).toBe(4);
  });
  it("refuses a circuit too large to read, saying its size", () => {
    const r = cli(["draw", "examples/launch-rota.cnf", "--search", "--basis", "clifford+t", "-o", join(dir, "big.svg")]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/refusing to draw: the circuit has \d+ qubits and \d+ gates.*clausegate cost/);
  });
  it("renders in headless Chromium", (ctx) => {
    const browser = ["/usr/bin/chromium", "/usr/bin/chromium-browser"].find((b) => existsSync(b));
    if (browser === undefined) {
      ctx.skip("no Chromium installed (Debian: apt-get install chromium): SVG rendering not checked");
      return;
    }
    const svg = join(dir, "o.svg");
    cli(["draw", "examples/allotment-pair.cnf", "--basis", "mcx", "--uncompute", "measured", "-o", svg]);
    const png = join(dir, "o.png");
    execFileSync(browser, [
      "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
      "--disable-component-update", "--disable-sync", `--user-data-dir=${mkdtempSync(join(tmpdir(), "chromium-"))}`,
      `--screenshot=${png}`, "--window-size=1200,500", `file://${svg}`,
    ], { stdio: "ignore", timeout: 60_000 });
    expect(statSync(png).size).toBeGreaterThan(5000);
  }, 90_000);
});
