// The oracle and cost commands, run as a user would.
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const dir = mkdtempSync(join(tmpdir(), "clausegate-oracle-"));

describe("clausegate oracle", () => {
  it("writes OpenQASM 3 to standard output by default (phase, wide, toffoli, unitary)", () => {
    const r = cli(["oracle", "examples/allotment-pair.cnf"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^OPENQASM 3\.0;\n/);
    expect(r.stdout).toContain("// strategy wide, basis toffoli, uncompute unitary");
    expect(r.stdout).toContain("qubit[4] vars;");
    expect(r.stdout).toMatch(/^ccx /m);
  });
  it("counts variables and clauses in words that agree with the number", () => {
    const file = join(dir, "one.cnf");
    writeFileSync(file, "p cnf 1 1\n1 0\n");
    expect(cli(["oracle", file]).stdout).toContain("// clausegate phase oracle: 1 variable, 1 clause\n");
    expect(cli(["cost", file]).stdout).toMatch(/^phase oracle for .*: 1 variable, 1 clause\n/);
    expect(cli(["oracle", "examples/allotment-pair.cnf"]).stdout).toMatch(/^\/\/ clausegate phase oracle: 4 variables, \d+ clauses$/m);
  });
  it("writes a file with -o and a report with --report, both complete", () => {
    const out = join(dir, "o.qasm");
    const rep = join(dir, "o.json");
    const r = cli(["oracle", "examples/launch-rota.cnf", "-o", out, "--report", rep, "--basis", "clifford+t", "--uncompute", "measured", "--strategy", "lean", "--kind", "flag"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe("");
    expect(readFileSync(out, "utf8")).toMatch(/^OPENQASM 3\.0;[\s\S]*\nreset work\[\d+\];\n[\s\S]*;\n$/);
    const report = JSON.parse(readFileSync(rep, "utf8"));
    expect(Object.keys(report)).toEqual([
      "variables", "clauses", "kind", "strategy", "construction", "basis", "uncompute", "qubits", "gates", "toffoli_count", "t_count",
      "t_depth", "cnot_count", "depth", "measurements", "simplification", "register", "register_mode", "structure", "recovered", "completion",
    ]);
    expect(report).toMatchObject({ variables: 12, clauses: 19, kind: "flag", strategy: "lean", construction: "lean", basis: "clifford+t", uncompute: "measured" });
    expect(report.qubits.search).toBe(12);
    expect(report.qubits.target).toBe(1);
    expect(report.qubits.total).toBe(report.qubits.search + report.qubits.work + report.qubits.target);
    expect(report.measurements).toBeGreaterThan(0);
    expect(report.gates.t + report.gates.tdg).toBe(report.t_count);
  });
  it("writes OpenQASM 2 and JSON", () => {
    expect(cli(["oracle", "examples/allotment-pair.cnf", "--format", "qasm2"]).stdout).toMatch(/^OPENQASM 2\.0;\n[\s\S]*include "qelib1\.inc";\nqreg vars\[4\];/);
    expect(JSON.parse(cli(["oracle", "examples/allotment-pair.cnf", "--format", "json"]).stdout).format).toBe("clausegate-circuit");
  });
  it("refuses OpenQASM 2 for multi-controlled gates with exit 2 and leaves no partial file", () => {
    const out = join(dir, "refused.qasm");
    const r = cli(["oracle", "examples/launch-rota.cnf", "--basis", "mcx", "--format", "qasm2", "-o", out]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/cannot write OpenQASM 2\.0.*; hint: choose --basis toffoli/);
    expect(existsSync(out)).toBe(false);
    expect(readdirSync(dir).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });
  it("leaves no output file when the input is bad", () => {
    const bad = join(dir, "bad.cnf");
    writeFileSync(bad, "p cnf 2 1\n1 3 0\n");
    const out = join(dir, "never.qasm");
    const r = cli(["oracle", bad, "-o", out]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/bad\.cnf:2:3: error: expected a variable in 1\.\.2/);
    expect(existsSync(out)).toBe(false);
  });
  it("says what simplification removed", () => {
    const r = cli(["oracle", "-"], "p cnf 3 3\n1 1 2 0\n1 -1 0\n1 2 3 0\n");
    expect(r.stderr).toBe("<stdin>: note: simplified before synthesis: removed 1 duplicate literal, 1 tautology, 1 subsumed clause\n");
  });
  it("depends only on the formula and the options, not on where it was read from", () => {
    const file = cli(["oracle", "examples/allotment-pair.cnf"]).stdout;
    expect(cli(["oracle", "-"], readFileSync("examples/allotment-pair.cnf")).stdout).toBe(file);
  });
  it("is byte-identical across runs; --no-optimize gives a larger circuit", () => {
    const a = cli(["oracle", "examples/launch-rota.cnf", "--basis", "clifford+t"]).stdout;
    expect(cli(["oracle", "examples/launch-rota.cnf", "--basis", "clifford+t"]).stdout).toBe(a);
    const raw = cli(["oracle", "examples/launch-rota.cnf", "--basis", "clifford+t", "--no-optimize", "--check-passes"]).stdout;
    expect(raw.split("\n").length).toBeGreaterThan(a.split("\n").length);
  });
  it("rejects an unknown option value with exit 2", () => {
    const r = cli(["oracle", "examples/allotment-pair.cnf", "--basis", "cliffordt"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--basis expects one of mcx, toffoli, clifford\+t but got 'cliffordt'/);
  });
});

describe("clausegate cost", () => {
  it("prints one row per strategy and uncomputation plus the textbook row", () => {
    const r = cli(["cost", "examples/launch-rota.cnf"]);
    expect(r.code).toBe(0);
    const lines = r.stdout.trimEnd().split("\n");
    expect(lines[3]).toMatch(/^strategy\s+uncompute\s+structure\s+qubits\s+Toffolis\s+T-count\s+T-depth\s+CNOTs\s+depth$/);
    // Rows with the recovered structure, then without it, then the textbook reference.
    expect(lines.slice(4).map((l) => l.split(/\s+/).slice(0, 3).join(" "))).toEqual([
      "wide unitary yes", "wide measured yes", "lean unitary yes", "lean measured yes",
      "wide unitary no", "wide measured no", "lean unitary no", "lean measured no", "textbook unitary -",
    ]);
  });
  it("prints JSON with --json", () => {
    const doc = JSON.parse(cli(["cost", "examples/allotment-pair.cnf", "--json"]).stdout);
    expect(doc.rows).toHaveLength(9);
    expect(Object.keys(doc.rows[0])).toEqual(["strategy", "uncompute", "qubits", "toffoli_count", "t_count", "t_depth", "cnot_count", "depth", "exact", "structure"]);
  });
  it("prints the same table with one thread or two, and refuses --threads where it does not apply", () => {
    const one = cli(["cost", "examples/launch-rota.cnf", "--threads", "1"]);
    expect(one.code).toBe(0);
    expect(cli(["cost", "examples/launch-rota.cnf", "--threads", "2"]).stdout).toBe(one.stdout);
    expect(cli(["cost", "examples/launch-rota.cnf"]).stdout).toBe(one.stdout);
    const front = cli(["cost", "examples/launch-rota.cnf", "--front", "--threads", "2"]);
    expect(front.code).toBe(2);
    expect(front.stdout).toBe("");
    expect(front.stderr).toMatch(/^clausegate cost: error: --threads .*; hint: /);
    expect(cli(["cost", "examples/launch-rota.cnf", "--threads", "0"]).code).toBe(2);
  });
  it("says structure recovery was off only when --no-structure turned it off", () => {
    const dir = mkdtempSync(join(tmpdir(), "clausegate-cost-"));
    // Three clauses with no definition, parity or group among them.
    const file = join(dir, "plain.cnf");
    writeFileSync(file, "p cnf 4 3\n1 -2 3 0\n-1 2 4 0\n2 -3 -4 0\n");
    const on = cli(["cost", file]).stdout.split("\n");
    expect(on[1]).toBe("search register: 4 qubits, full (every declared variable: vars[v-1] is variable v)");
    expect(on[2]).toMatch(/^structure: none recovered/);
    const off = cli(["cost", file, "--no-structure"]).stdout.split("\n");
    expect(off[1]).toBe("search register: 4 qubits, full (every declared variable: vars[v-1] is variable v; structure recovery off)");
    expect(off[2]).toMatch(/^structure: recovery off \(--no-structure\)/);
  });
});
