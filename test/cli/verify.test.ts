// clausegate verify and oracle --verify, run as a user would.
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const dir = mkdtempSync(join(tmpdir(), "clausegate-verify-"));

describe("clausegate verify", () => {
  it("compiles and verifies with exit 0, exhaustively, and counts the models", () => {
    const r = cli(["verify", "examples/launch-rota.cnf", "--strategy", "lean", "--uncompute", "measured"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe("verified: exhaustive (4096 assignments, bit-parallel simulator); 49 satisfying\n");
  });
  it("prints JSON with --json", () => {
    const r = cli(["verify", "examples/allotment-row.cnf", "--json", "--basis", "clifford+t"]);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout)).toEqual({ verified: true, method: "exhaustive", simulator: "state-vector", assignments: 4096, models: 4, counterexample: null });
  });
  it("verifies a circuit file in OpenQASM 3 and in JSON", () => {
    for (const format of ["qasm3", "json"]) {
      const out = join(dir, `rota.${format}`);
      expect(cli(["oracle", "examples/launch-rota.cnf", "--kind", "flag", "--basis", "mcx", "--uncompute", "measured", "--format", format, "-o", out]).code).toBe(0);
      const r = cli(["verify", "examples/launch-rota.cnf", "--circuit", out]);
      expect(r.code).toBe(0);
      expect(r.stdout).toMatch(/^verified: exhaustive/);
    }
  });
  it("reports a broken circuit with exit 1 and its first counterexample as a DIMACS assignment", () => {
    const out = join(dir, "broken.qasm");
    cli(["oracle", "examples/allotment-pair.cnf", "--basis", "mcx", "-o", out]);
    const text = readFileSync(out, "utf8");
    // Drop the last line that uncomputes a clause bit: that work qubit stays dirty.
    const lines = text.trimEnd().split("\n");
    writeFileSync(out, `${lines.slice(0, -1).join("\n")}\n`);
    const r = cli(["verify", "examples/allotment-pair.cnf", "--circuit", out]);
    expect(r.code).toBe(1);
    const [, cex, expected, actual] = r.stdout.trimEnd().split("\n");
    expect(cex).toMatch(/^counterexample: (-?\d+ ){4}0$/);
    expect(expected).toMatch(/^expected: phase [+-]1/);
    expect(actual).toMatch(/^circuit: +work\[\d+\] left at \|1>$/);
    const json = JSON.parse(cli(["verify", "examples/allotment-pair.cnf", "--circuit", out, "--json"]).stdout);
    expect(json.verified).toBe(false);
    expect(json.counterexample).toMatch(/^(-?\d+ ){4}0$/);
  });
  it("rejects a malformed circuit with its line and column and exit 2", () => {
    const out = join(dir, "malformed.qasm");
    writeFileSync(out, 'OPENQASM 3.0;\ninclude "stdgates.inc";\nqubit[4] vars;\nqubit[1] work;\n  ccx vars[0], vars[9], work[0];\n');
    const r = cli(["verify", "examples/allotment-pair.cnf", "--circuit", out]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/malformed\.qasm:5:3: error: expected a declared qubit but found 'vars\[9\]'; hint: /);
  });
  it("refuses OpenQASM 2 input with exit 2", () => {
    const out = join(dir, "old.qasm");
    cli(["oracle", "examples/allotment-pair.cnf", "--format", "qasm2", "-o", out]);
    const r = cli(["verify", "examples/allotment-pair.cnf", "--circuit", out]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/found OpenQASM 2\.0/);
  });
  it("says when the circuit was made for another formula", () => {
    const out = join(dir, "other.json");
    cli(["oracle", "examples/allotment-pair.cnf", "--format", "json", "-o", out]);
    const r = cli(["verify", "examples/launch-rota.cnf", "--circuit", out]);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/not an oracle for this formula: the search register x has 4 qubits but the formula declares 12 variables/);
  });
  it("samples above --exhaustive-limit and says so", () => {
    const r = cli(["verify", "examples/launch-rota.cnf", "--exhaustive-limit", "8", "--samples", "500", "--json"]);
    expect(JSON.parse(r.stdout)).toMatchObject({ verified: true, method: "sampled" });
  });
});

describe("clausegate oracle --verify", () => {
  it("writes the output only after verification passes", () => {
    const out = join(dir, "checked.qasm");
    const r = cli(["oracle", "examples/launch-rota.cnf", "--verify", "-o", out, "--basis", "toffoli", "--uncompute", "measured"]);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/^verified: exhaustive \(4096 assignments/m);
    expect(existsSync(out)).toBe(true);
  });
});
