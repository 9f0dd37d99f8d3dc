// clausegate verify --prove, plain verify above the exhaustive limit, oracle --prove: run as a user would.
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { describe, expect, it } from "vitest";
import { cli, ROOT } from "../helpers/cli.js";
import { randomKSat } from "../helpers/formulas.js";
import { writeDimacs } from "../helpers/lib.js";

const dir = mkdtempSync(join(tmpdir(), "clausegate-prove-"));
const formula = join(dir, "r40.cnf");
writeFileSync(formula, writeDimacs(randomKSat(40, 160, 3, 3)));

/** A circuit file of the formula's oracle, in JSON, one gate per line. */
function oracleJson(file: string, args: string[], name: string): string[] {
  const out = join(dir, name);
  expect(cli(["oracle", file, "--format", "json", "-o", out, ...args]).code).toBe(0);
  return readFileSync(out, "utf8").split("\n");
}
const writeLines = (name: string, lines: string[]): string => {
  const path = join(dir, name);
  writeFileSync(path, lines.join("\n").replace(",\n]}", "\n]}"));
  return path;
};

describe("clausegate verify --prove", () => {
  it("proves a compiled oracle at any size with exit 0, naming the method, the miter and the time", () => {
    const r = cli(["verify", formula, "--prove"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^proved: every assignment, proof by structural hashing \(the miter is a constant\); miter 0 variables, 0 clauses; \d+\.\d+ s\n$/);
    const lean = cli(["verify", formula, "--prove", "--strategy", "lean", "--json"]);
    expect(lean.code).toBe(0);
    const json = JSON.parse(lean.stdout);
    expect(json).toMatchObject({ verified: true, method: "proof", counterexample: null });
    expect(["bdd", "sat"]).toContain(json.proof_method);
    expect(json.miter.variables).toBeGreaterThan(0);
    expect(json.miter.clauses).toBeGreaterThan(0);
    expect(typeof json.seconds).toBe("number");
  });
  it("refutes a broken circuit with exit 1 and a DIMACS counterexample (the marking gate removed)", () => {
    const lines = oracleJson(formula, ["--basis", "toffoli"], "good.json");
    const broken = writeLines("broken.json", lines.filter((l) => !l.startsWith('{"op":"cz"') && !l.startsWith('{"op":"z"')));
    const r = cli(["verify", formula, "--circuit", broken, "--prove"]);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/^mismatch: proof by .*; confirmed by simulating the counterexample\ncounterexample: (-?\d+ ){40}0\nexpected: phase -1 \(the formula is satisfied\), every work qubit back to \|0>\ncircuit: {2}the phase is 1 where -1 is expected \(f = 1\)\n$/);
    const json = JSON.parse(cli(["verify", formula, "--circuit", broken, "--prove", "--json"]).stdout);
    expect(json).toMatchObject({ verified: false, method: "proof", counterexample: expect.stringMatching(/^(-?\d+ ){40}0$/) });
  });
  it("plain verify proves above the exhaustive limit instead of sampling; --sample keeps sampling", () => {
    expect(cli(["verify", formula]).stdout).toMatch(/^proved: every assignment/);
    expect(cli(["verify", formula, "--sample"]).stdout).toMatch(/^verified: sampled/);
    expect(cli(["verify", "examples/launch-rota.cnf"]).stdout).toMatch(/^verified: exhaustive/);
  });
  it("a Clifford+T file that no gadget matches: not proven, checked by simulation instead (exit 1 under --prove, 0 without)", () => {
    const small = join(dir, "r14.cnf");
    writeFileSync(small, writeDimacs(randomKSat(14, 50, 3, 9)));
    const lines = oracleJson(small, ["--basis", "clifford+t"], "ct.json");
    // (H S)^3 = e^(i pi/4) I on the first work qubit (|0> at the start), then a global phase of -pi/4:
    // the identity, written so that no Hadamard pair closes as a gadget does.
    const head = lines.findIndex((l) => l.startsWith('"gates":[') || l.endsWith('"gates":['));
    const work = JSON.parse(lines.slice(0, head + 1).join("").replace(/"gates":\[$/, '"gates":[]}')).registers.find((r: { role: string }) => r.role === "work").start as number;
    const extra = Array.from({ length: 3 }, () => [`{"op":"h","qubits":[${work}]},`, `{"op":"s","qubits":[${work}]},`]).flat();
    const odd = writeLines("odd.json", [...lines.slice(0, head + 1), ...extra, '{"op":"gphase","qubits":[],"angle":7},', ...lines.slice(head + 1)]);
    const proved = cli(["verify", small, "--circuit", odd, "--prove"]);
    expect(proved.stderr).toBe("");
    expect(proved.code).toBe(1);
    expect(proved.stdout).toMatch(/^not proven: the Clifford\+T circuit does not reduce to a classical one .*; checked by simulation instead\nverified: sampled/);
    const plain = cli(["verify", small, "--circuit", odd, "--json"]);
    expect(plain.code).toBe(0);
    expect(JSON.parse(plain.stdout)).toMatchObject({ verified: true, method: "sampled", proof: { status: "not proven" } });
  });
  it("refuses --prove with --sample: one line, exit 2", () => {
    const r = cli(["verify", formula, "--prove", "--sample"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^clausegate verify: error: --prove and --sample .*; hint: .*\n$/);
    expect(r.stdout).toBe("");
  });
});

describe("clausegate oracle --prove", () => {
  it("writes only after the proof, and says so on standard error", () => {
    const out = join(dir, "proved.qasm");
    const r = cli(["oracle", formula, "--prove", "-o", out, "--basis", "clifford+t", "--uncompute", "measured"]);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/^proved: every assignment/m);
    expect(existsSync(out)).toBe(true);
  });
  it("bad input is still exit 2 with one line and no file", () => {
    const out = join(dir, "never.qasm");
    const bad = join(dir, "bad.cnf");
    writeFileSync(bad, "p cnf 2 1\n1 x 0\n");
    const r = cli(["oracle", bad, "--prove", "-o", out]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(existsSync(out)).toBe(false);
  });
});

describe.skipIf(!existsSync(resolve(ROOT, "../shared/satlib/manifest.json")))("the regression of the issue, from the command line", () => {
  it("SATLIB (Hoos & Stuetzle 2000) aim-50-1_6-yes1-1: the oracle without its phase gate is rejected by plain verify, at the formula's one model", () => {
    const cnf = resolve(ROOT, "../shared/satlib/aim/aim-50-1_6-yes1-1.cnf");
    const lines = oracleJson(cnf, ["--basis", "mcx"], "aim.json");
    const broken = writeLines("aim-broken.json", lines.filter((l) => !l.startsWith('{"op":"mcz"')));
    const r = cli(["verify", cnf, "--circuit", broken]);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/^mismatch: proof by .*\ncounterexample: (-?\d+ ){50}0\nexpected: phase -1 \(the formula is satisfied\)/);
  });
});
