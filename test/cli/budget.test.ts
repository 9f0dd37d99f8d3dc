// --max-qubits, --prefer and --construction on oracle, verify, search and draw; cost --front and
// cost --max-qubits. The examples' launch-rota formula (12 variables, 19 clauses).
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const dir = mkdtempSync(join(tmpdir(), "cg-budget-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const EX = "examples/launch-rota.cnf";

/** Total qubits declared by an OpenQASM 3 circuit clausegate wrote. */
const qubitsOf = (qasm: string): number => [...qasm.matchAll(/^qubit\[(\d+)\] \w+;$/gm)].reduce((s, m) => s + Number(m[1]), 0);

interface Point {
  qubits: number;
  t_count: number;
  t_depth: number;
  construction: string;
  options: string;
}

describe("clausegate cost --front", { timeout: 120_000 }, () => {
  const r = cli(["cost", EX, "--front", "--json"]);
  const doc = JSON.parse(r.stdout) as { points: Point[]; references: Record<string, { qubits: number; t_count: number }> };

  it("prints the points with the keys of the issue and the references", () => {
    expect(r.code).toBe(0);
    expect(doc.points.length).toBeGreaterThan(5);
    for (const p of doc.points) expect(Object.keys(p)).toEqual(["qubits", "t_count", "t_depth", "construction", "options"]);
    expect(Object.keys(doc.references)).toEqual(["wide", "lean", "textbook"]);
    // Sorted by qubits; every point beats each earlier one in T-count or T-depth.
    for (let i = 1; i < doc.points.length; i++) {
      const [a, b] = [doc.points[i - 1]!, doc.points[i]!];
      expect(b.qubits).toBeGreaterThanOrEqual(a.qubits);
      for (const e of doc.points.slice(0, i)) expect(b.t_count < e.t_count || b.t_depth < e.t_depth || b.qubits < e.qubits).toBe(true);
    }
  });
  it("the points' options make clausegate oracle write exactly those points (report and circuit)", () => {
    // Every fourth point and the last (the library test reproduces every point of a larger front).
    for (const p of doc.points.filter((_, i) => i % 4 === 0 || i === doc.points.length - 1)) {
      const rep = join(dir, `${p.construction}.json`);
      const out = join(dir, `${p.construction}.qasm`);
      const o = cli(["oracle", EX, ...p.options.split(" "), "--report", rep, "-o", out]);
      expect(o.code, o.stderr).toBe(0);
      const report = JSON.parse(readFileSync(rep, "utf8"));
      expect([report.qubits.total, report.t_count, report.t_depth, report.construction]).toEqual([p.qubits, p.t_count, p.t_depth, p.construction]);
      expect(qubitsOf(readFileSync(out, "utf8"))).toBe(p.qubits);
    }
  });
  it("prints a table, and plots T-count and T-depth against qubits with wide, lean and textbook marked", () => {
    const plot = join(dir, "front.svg");
    const t = cli(["cost", EX, "--front", "--plot", plot]);
    expect(t.code).toBe(0);
    const lines = t.stdout.trimEnd().split("\n");
    // The register the points have and what recovery gave, then the front.
    expect(lines[1]).toMatch(/^search register: 12 qubits, full /);
    expect(lines[2]).toMatch(/^structure: /);
    expect(lines[3]).toMatch(/^cost front: \d+ of \d+ constructions are not dominated \(measured uncomputation; Clifford\+T figures\)$/);
    expect(lines[4]).toMatch(/^qubits\s+T-count\s+T-depth\s+construction\s+oracle arguments$/);
    expect(lines.length - 5).toBe(doc.points.length);
    const svg = readFileSync(plot, "utf8");
    expect(svg).toMatch(/^<\?xml/);
    for (const label of [">wide<", ">lean<", ">textbook<", "T-count (log scale)", "T-depth (log scale)"]) expect(svg).toContain(label);
    expect(svg.match(/class="front-point"/g)!.length).toBe(2 * doc.points.length + 1);
  });
  it("takes --kind, --uncompute and --basis into the points' arguments", () => {
    const f = cli(["cost", EX, "--front", "--json", "--kind", "flag", "--uncompute", "unitary", "--basis", "toffoli"]);
    expect(f.code).toBe(0);
    for (const p of (JSON.parse(f.stdout) as { points: Point[] }).points) expect(p.options).toBe(`--construction ${p.construction} --kind flag --basis toffoli --uncompute unitary`);
  });
});

describe("budgets on the command line", { timeout: 120_000 }, () => {
  it("oracle --max-qubits: the cheapest construction within the budget, named in the report and the comments", () => {
    let lastT = Infinity;
    for (const Q of [22, 25, 30, 40, 60, 100]) {
      const rep = join(dir, `q${Q}.json`);
      const r = cli(["oracle", EX, "--max-qubits", String(Q), "--basis", "clifford+t", "--uncompute", "measured", "--report", rep]);
      expect(r.code, r.stderr).toBe(0);
      const report = JSON.parse(readFileSync(rep, "utf8"));
      expect(report.qubits.total).toBeLessThanOrEqual(Q);
      expect(qubitsOf(r.stdout)).toBe(report.qubits.total);
      expect(report.t_count).toBeLessThanOrEqual(lastT);
      lastT = report.t_count;
      expect(r.stdout).toMatch(new RegExp(`^// (strategy|construction) ${report.construction}, basis clifford\\+t, uncompute measured$`, "m"));
    }
  });
  it("names the smallest budget that works", () => {
    const r = cli(["oracle", EX, "--max-qubits", "21", "--uncompute", "measured"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/error: no construction fits in 21 qubits; the smallest \(\S+\) needs 22; hint: give --max-qubits 22 or more/);
  });
  it("says 1 qubit, not 1 qubits, for a budget of one", () => {
    for (const [args, line] of [
      [["oracle", EX, "--max-qubits", "1"], /^clausegate oracle: error: no construction fits in 1 qubit; the smallest/m],
      [["cost", EX, "--max-qubits", "1"], /^clausegate cost: error: no construction fits in 1 qubit; the smallest/m],
      [["search", EX, "--max-qubits", "1", "--iterations", "1"], /^clausegate search: error: no search circuit fits in 1 qubit; the smallest/m],
    ] as const) {
      const r = cli([...args]);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(line);
    }
  });
  it("--prefer t-depth trades T gates for depth", () => {
    const a = join(dir, "c.json");
    const b = join(dir, "d.json");
    expect(cli(["oracle", EX, "--max-qubits", "40", "--uncompute", "measured", "--report", a]).code).toBe(0);
    expect(cli(["oracle", EX, "--max-qubits", "40", "--uncompute", "measured", "--prefer", "t-depth", "--report", b]).code).toBe(0);
    const [c, d] = [JSON.parse(readFileSync(a, "utf8")), JSON.parse(readFileSync(b, "utf8"))];
    expect(d.t_depth).toBeLessThanOrEqual(c.t_depth);
    expect(c.t_count).toBeLessThanOrEqual(d.t_count);
  });
  it("verify checks the construction chosen within the budget", () => {
    const r = cli(["verify", EX, "--max-qubits", "25", "--uncompute", "measured", "--json"]);
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).verified).toBe(true);
  });
  it("cost --max-qubits prints the choice for each uncomputation", () => {
    const r = cli(["cost", EX, "--max-qubits", "30", "--json"]);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.rows.map((x: { uncompute: string }) => x.uncompute)).toEqual(["unitary", "measured"]);
    for (const row of doc.rows) {
      expect(row.qubits).toBeLessThanOrEqual(30);
      expect(Object.keys(row)).toEqual(["construction", "uncompute", "qubits", "toffoli_count", "t_count", "t_depth", "cnot_count", "depth", "exact"]);
    }
  });
  it("search --max-qubits: the whole search circuit within the budget (oracle and diffusion share work qubits)", () => {
    const out = join(dir, "s.qasm");
    const rep = join(dir, "s.json");
    const r = cli(["search", EX, "--max-qubits", "24", "--uncompute", "measured", "-o", out, "--report", rep]);
    expect(r.code, r.stderr).toBe(0);
    const qasm = readFileSync(out, "utf8");
    expect(qubitsOf(qasm)).toBeLessThanOrEqual(24);
    const report = JSON.parse(readFileSync(rep, "utf8"));
    expect(qasm).toContain(`construction ${report.construction}, basis toffoli, uncompute measured`);
    const tight = cli(["search", EX, "--max-qubits", "20", "--iterations", "1", "--register", "full"]);
    expect(tight.code).toBe(2);
    expect(tight.stderr).toMatch(/the smallest needs 22 .*hint: give --max-qubits 22 or more/);
    // The default free register searches fewer qubits: its smallest search is smaller.
    const free = cli(["search", EX, "--max-qubits", "18", "--iterations", "1"]);
    expect(free.code).toBe(2);
    expect(free.stderr).toMatch(/the smallest needs (\d+) .*hint: give --max-qubits \1 or more/);
    expect(Number(/the smallest needs (\d+)/.exec(free.stderr)![1])).toBeLessThan(22);
  });
  it("draw --max-qubits draws the chosen oracle, and the search with it", () => {
    const a = join(dir, "o.svg");
    const b = join(dir, "s.svg");
    const r = cli(["draw", "examples/allotment-pair.cnf", "--max-qubits", "9", "-o", a]);
    expect(r.code, r.stderr).toBe(0);
    expect(readFileSync(a, "utf8")).toMatch(/<title>phase oracle for examples\/allotment-pair\.cnf: \S+, toffoli, unitary<\/title>/);
    const s = cli(["draw", "examples/allotment-pair.cnf", "--search", "--iterations", "1", "--max-qubits", "9", "-o", b]);
    expect(s.code, s.stderr).toBe(0);
  });
});

describe("budgets with the free register and structure", { timeout: 120_000 }, () => {
  it("cost --front --register free: the free register's points, each reproduced by oracle with its arguments", () => {
    const r = cli(["cost", EX, "--front", "--json", "--register", "free"]);
    expect(r.code, r.stderr).toBe(0);
    const doc = JSON.parse(r.stdout) as { points: Point[]; register_mode: string; register: number[] };
    expect(doc.register_mode).toBe("free");
    expect(doc.register.length).toBeLessThan(12);
    for (const p of doc.points) expect(p.options).toBe(`--construction ${p.construction} --basis clifford+t --uncompute measured --register free`);
    for (const p of doc.points.filter((_, i) => i % 5 === 0)) {
      const rep = join(dir, `free-${p.construction}.json`);
      const o = cli(["oracle", EX, ...p.options.split(" "), "--report", rep, "-o", join(dir, "free.qasm")]);
      expect(o.code, o.stderr).toBe(0);
      const report = JSON.parse(readFileSync(rep, "utf8"));
      expect([report.qubits.total, report.t_count, report.t_depth, report.construction, report.register_mode]).toEqual([p.qubits, p.t_count, p.t_depth, p.construction, "free"]);
      expect(report.register).toEqual(doc.register);
    }
    // The smallest free-register point is below the smallest full-register one.
    const full = JSON.parse(cli(["cost", EX, "--front", "--json"]).stdout) as { points: Point[] };
    expect(doc.points[0]!.qubits).toBeLessThan(full.points[0]!.qubits);
  });
  it("cost --front --no-structure names --no-structure in the arguments", () => {
    const r = cli(["cost", EX, "--front", "--json", "--no-structure"]);
    expect(r.code, r.stderr).toBe(0);
    for (const p of (JSON.parse(r.stdout) as { points: Point[] }).points) expect(p.options).toMatch(/ --no-structure$/);
  });
  it("cost --max-qubits --register free, oracle and verify --max-qubits --register free keep the budget", () => {
    const c = cli(["cost", EX, "--max-qubits", "22", "--register", "free", "--json"]);
    expect(c.code, c.stderr).toBe(0);
    const doc = JSON.parse(c.stdout);
    expect(doc.register_mode).toBe("free");
    for (const row of doc.rows) expect(row.qubits).toBeLessThanOrEqual(22);
    const rep = join(dir, "free-budget.json");
    const o = cli(["oracle", EX, "--max-qubits", "22", "--register", "free", "--basis", "clifford+t", "--uncompute", "measured", "--report", rep, "-o", join(dir, "fb.qasm")]);
    expect(o.code, o.stderr).toBe(0);
    const report = JSON.parse(readFileSync(rep, "utf8"));
    expect(report.qubits.total).toBeLessThanOrEqual(22);
    expect(report.construction).toBe(doc.rows.find((x: { uncompute: string }) => x.uncompute === "measured").construction);
    const v = cli(["verify", EX, "--max-qubits", "22", "--register", "free", "--json"]);
    expect(v.code, v.stdout).toBe(0);
    expect(JSON.parse(v.stdout).verified).toBe(true);
  });
  it("forecast --max-qubits: the chosen construction's search fits, and the construction and budget are assumptions", () => {
    const r = cli(["forecast", EX, "--max-qubits", "24", "--json"]);
    expect(r.code, r.stderr).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.register_mode).toBe("free");
    expect(doc.logical.qubits).toBeLessThanOrEqual(24);
    const named = (n: string) => doc.assumptions.find((a: { name: string }) => a.name === n);
    expect(named("max_logical_qubits")).toMatchObject({ value: 24, source: expect.stringMatching(/^given \(--max-qubits\)/) });
    expect(named("construction").source).toMatch(/^chosen: the cheapest construction by t-count whose one-iteration search circuit has at most 24 logical qubits/);
    expect(named("oracle_options").value).toBe(`construction ${named("construction").value}, uncompute unitary, basis toffoli`);
    // The same figures as a named construction gives.
    const same = JSON.parse(cli(["forecast", EX, "--construction", named("construction").value, "--json"]).stdout);
    expect(same.logical).toEqual(doc.logical);
    expect(same.assumptions.find((a: { name: string }) => a.name === "construction").source).toBe("given (--construction)");
    // Below every construction: exit 2, one line naming the smallest budget.
    const tight = cli(["forecast", EX, "--max-qubits", "12"]);
    expect(tight.code).toBe(2);
    expect(tight.stdout).toBe("");
    expect(tight.stderr.trimEnd().split("\n")).toHaveLength(1);
    expect(tight.stderr).toMatch(/^examples\/launch-rota\.cnf: error: no search circuit fits in 12 qubits; the smallest needs \d+ .*; hint: give --max-qubits \d+ or more$/m);
  });
});

describe("search --report with a construction", { timeout: 120_000 }, () => {
  it("costs the circuit's own construction beside wide and lean, with the oracle's figures", () => {
    const rep = join(dir, "search-blocks.json");
    const r = cli(["search", EX, "--construction", "blocks-2", "--iterations", "1", "--basis", "clifford+t", "-o", join(dir, "s.qasm"), "--report", rep]);
    expect(r.code, r.stderr).toBe(0);
    const report = JSON.parse(readFileSync(rep, "utf8"));
    expect(report.construction).toBe("blocks-2");
    expect(report.costs.map((c: { strategy: string }) => c.strategy)).toEqual(["wide", "lean", "blocks"]);
    const row = report.costs[2];
    expect(row.construction).toBe("blocks-2");
    // The same oracle compiled alone (search's default register is the free one).
    const orep = join(dir, "oracle-blocks.json");
    expect(cli(["oracle", EX, "--register", "free", "--construction", "blocks-2", "--basis", "clifford+t", "-o", join(dir, "o.qasm"), "--report", orep]).code).toBe(0);
    const oracle = JSON.parse(readFileSync(orep, "utf8"));
    expect(row.oracle.t_count).toBe(oracle.t_count);
    expect(row.oracle.qubits).toBe(oracle.qubits.total);
  });
});
