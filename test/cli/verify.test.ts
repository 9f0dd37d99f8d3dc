// clausegate verify and oracle --verify, run as a user would.
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { describe, expect, it } from "vitest";
import { cli, ROOT, type Run } from "../helpers/cli.js";

const dir = mkdtempSync(join(tmpdir(), "clausegate-verify-"));

describe("clausegate verify", () => {
  it("compiles and verifies with exit 0, exhaustively, and counts the models", () => {
    const r = cli(["verify", "examples/launch-rota.cnf", "--strategy", "lean", "--uncompute", "measured"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe("verified: exhaustive (4096 assignments, bit-parallel simulator); 49 satisfying, 4047 not\n");
  });
  it("prints JSON with --json", () => {
    const r = cli(["verify", "examples/allotment-row.cnf", "--json", "--basis", "clifford+t"]);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout)).toEqual({
      verified: true, method: "exhaustive", simulator: "state-vector", assignments: 4096, models: 4, non_models: 4092,
      model_search: null, falsifying: 0, random_samples: 0, notes: [], register: "full", counterexample: null,
    });
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
    expect(r.stderr).toMatch(/^[^\n]*malformed\.qasm:5:16: error: expected a declared qubit but found 'vars\[9\]'; hint: [^\n]*\n$/);
    expect(r.stdout).toBe("");
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
    expect(r.stdout).toMatch(/not an oracle for this formula: the search register vars has 4 qubits but the formula declares 12 variables/);
  });
  it("with --sample, samples above --exhaustive-limit and says so", () => {
    const r = cli(["verify", "--sample", "examples/launch-rota.cnf", "--exhaustive-limit", "8", "--samples", "500", "--models", "5", "--json"]);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout);
    expect(json).toMatchObject({ verified: true, method: "sampled", random_samples: 500, model_search: { method: "cdcl", status: "sat", found: 5, all: false } });
    expect(json.models).toBeGreaterThanOrEqual(5);
    expect(json.non_models).toBeGreaterThan(0);
    expect(json.models + json.non_models).toBe(json.assignments);
    // 523 = 500 random + 5 models + 18 distinct assignments falsifying one clause each (made for
    // each of the 19 clauses; two of them coincide and are counted once).
    const text = cli(["verify", "--sample", "examples/launch-rota.cnf", "--exhaustive-limit", "8", "--samples", "500", "--models", "5"]);
    expect(text.stdout).toMatch(/^verified: sampled \(523 assignments, bit-parallel simulator\); \d+ satisfying, \d+ not\nmodels: 5 found by the CDCL solver in \d+ conflicts?; also checked: 18 assignments falsifying one clause each, 500 random\n$/);
  });
});

const SATLIB = resolve(ROOT, "../shared/satlib");
const haveSatlib = existsSync(resolve(SATLIB, "manifest.json"));

/** One line on stderr, nothing on stdout, exit 2. */
function expectRefused(r: Run, line: RegExp): void {
  expect(r.code, r.stderr).toBe(2);
  expect(r.stdout).toBe("");
  expect(r.stderr).toMatch(/^[^\n]+\n$/);
  expect(r.stderr).toMatch(line);
  expect(r.stderr).not.toMatch(/ at .*\.js:\d+/); // no stack trace
}

describe("clausegate verify --circuit refuses malformed circuits with exit 2 and one line", () => {
  const pair = "examples/allotment-pair.cnf";
  const head = '{"format":"clausegate-circuit","version":1,"comments":["Größe ✓"],"qubits":10,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":4},{"name":"work","role":"work","start":4,"size":6}],';
  const run = (name: string, text: string): Run => {
    const path = join(dir, name);
    writeFileSync(path, text);
    return cli(["verify", pair, "--circuit", path]);
  };
  // Byte columns: the comment's ö, ✓ take 2 and 3 bytes, so each column is 3 more than the character count.
  const col = (text: string, at: string): number => Buffer.byteLength(text.slice(0, text.indexOf(at))) + 1;
  it("a gphase angle that is a string, null or missing", () => {
    for (const [angle, found] of [['"x"', '"x"'], ["null", "null"]] as const) {
      const text = `${head}"gates":[{"op":"gphase","qubits":[],"angle":${angle}}]}`;
      expectRefused(run("angle.json", text), new RegExp(`angle\\.json:1:${col(text, `${angle}}]}`)}: error: expected "angle" as a whole number in gate 0 \\(gphase\\) but found ${found}; hint: `));
    }
    const text = `${head}"gates":[{"op":"gphase","qubits":[]}]}`;
    expectRefused(run("angle.json", text), new RegExp(`:1:${col(text, '{"op"')}: error: expected an angle for gphase but found none`));
  });
  it("negated: [7] on a gate with fewer controls", () => {
    const text = `${head}"gates":[{"op":"mcx","qubits":[0,1,4],"negated":[7]}]}`;
    expectRefused(run("neg.json", text), new RegExp(`:1:${col(text, "7]")}: error: expected a control position in 0\\.\\.1 but found 7 in gate 0 \\(mcx\\)`));
  });
  it("overlapping registers", () => {
    const text = head.replace('"start":4', '"start":2') + '"gates":[]}';
    expectRefused(run("overlap.json", text), new RegExp(`:1:${col(text, '2,"size":6')}: error: expected register work to start at qubit 4, where the one before it ends, but found 2`));
  });
  it('"gates": null is bad input (exit 2), not a failed check', () => {
    const text = `${head}"gates":null}`;
    expectRefused(run("null.json", text), new RegExp(`:1:${col(text, "null}")}: error: expected "gates" as a list of gates but found null`));
  });
  it("qubit -1 is reported as -1", () => {
    const text = `${head}"gates":[{"op":"x","qubits":[-1]}]}`;
    expectRefused(run("neg1.json", text), new RegExp(`:1:${col(text, "-1")}: error: expected a qubit in 0\\.\\.9 but found -1 in gate 0 \\(x\\)`));
  });
  it("a ccx with a repeated qubit is reported at the repeated qubit, in JSON and OpenQASM 3", () => {
    const text = `${head}"gates":[\n{"op":"x","qubits":[5]},\n{"op":"ccx","qubits":[4,5,4]}]}`;
    expectRefused(run("rep.json", text), /rep\.json:3:27: error: expected distinct qubits but qubit 4 appears twice in gate 1 \(ccx\)/);
    const qasm = 'OPENQASM 3.0;\n// Größe ✓\ninclude "stdgates.inc";\nqubit[4] vars;\nqubit[6] work;\nx vars[1]; ccx vars[0], vars[1], vars[0];\n';
    expectRefused(run("rep.qasm", qasm), /rep\.qasm:6:34: error: expected distinct qubits but vars\[0\] appears twice; hint: /);
    // Gates without the standard library that defines them (OpenQASM 3: stdgates.inc) are refused.
    const bare = 'OPENQASM 3.0;\nqubit[4] vars;\nx vars[1];\n';
    expectRefused(run("bare.qasm", bare), /bare\.qasm:3:1: error: gate 'x' is defined in stdgates\.inc, which the program does not include before it; hint: /);
    const old = 'OPENQASM 3.0;\ninclude "qelib1.inc";\nqubit[4] vars;\nx vars[1];\n';
    expectRefused(run("old.qasm", old), /old\.qasm:2:1: error: expected 'include "stdgates\.inc";' but found 'include "qelib1\.inc"'/);
  });
  it("an absurd register size is bad input (exit 2), not an internal error", () => {
    const text = head.replace('"size":6', '"size":1e15') + '"gates":[]}';
    expectRefused(run("huge.json", text), /huge\.json:1:\d+: error: expected a register size in 0\.\.67108864 but found 1000000000000000/);
    expectRefused(run("huge.qasm", "OPENQASM 3.0;\nqubit[4] vars;\nqubit[123456789012] work;\n"), /huge\.qasm:3:7: error: expected a register size in 0\.\.67108864 but found 123456789012/);
  });
  it("an empty .json file, or one holding null, gets a JSON circuit's message, not OpenQASM's", () => {
    for (const [name, text] of [["empty.json", ""], ["null.json", "null\n"], ["blank.JSON", "  \n"]] as const) {
      const r = run(name, text);
      expectRefused(r, new RegExp(`${name.replace(".", "\\.")}:\\d+:\\d+: error: .+; hint: give the JSON that clausegate oracle --format json wrote$`, "m"));
      expect(r.stderr).not.toMatch(/OPENQASM/);
    }
  });
  it("a .json file holding OpenQASM (oracle -o c.json writes OpenQASM 3 by default) is read as OpenQASM", () => {
    const path = join(dir, "written.json");
    expect(cli(["oracle", pair, "-o", path]).code).toBe(0);
    const r = cli(["verify", pair, "--circuit", path]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^verified: exhaustive/);
  });
  it("a missing circuit file", () => {
    expectRefused(cli(["verify", pair, "--circuit", join(dir, "absent.json")]), /^clausegate verify: error: cannot read the circuit .*absent\.json \(no such file\); hint: /);
  });
});

describe("clausegate verify --circuit refuses the options that only shape a compilation", () => {
  it("--strategy, --basis, --uncompute, --no-optimize and --check-passes, each with exit 2 and one line", () => {
    const out = join(dir, "given.json");
    expect(cli(["oracle", "examples/allotment-pair.cnf", "--format", "json", "-o", out]).code).toBe(0);
    for (const extra of [["--strategy", "lean"], ["--basis", "mcx"], ["--uncompute", "measured"], ["--no-optimize"], ["--check-passes"]]) {
      const r = cli(["verify", "examples/allotment-pair.cnf", "--circuit", out, ...extra]);
      expectRefused(r, new RegExp(`^clausegate verify: error: ${extra[0]} shapes the oracle that verify compiles, and --circuit gives the circuit instead; hint: drop ${extra[0]}, or drop --circuit`));
    }
    // --kind still applies: it says how to read the circuit.
    expect(cli(["verify", "examples/allotment-pair.cnf", "--circuit", out, "--kind", "phase"]).code).toBe(0);
    expect(cli(["verify", "--help"]).stdout).toMatch(/only --kind of the\s+oracle options applies then/);
  });
  it("--help says that with --circuit and no --kind the kind is read from the circuit, not phase by default", () => {
    const help = cli(["verify", "--help"]).stdout;
    const kind = help.slice(help.indexOf("  --kind"), help.indexOf("  --strategy"));
    expect(kind).toMatch(/Without --circuit,\s+phase by default; with --circuit and no --kind, read from the circuit/);
    expect(kind).not.toMatch(/\(default\)/);
    // As it says: a flag circuit checks as flag with no --kind.
    const flag = join(dir, "flag.json");
    expect(cli(["oracle", "examples/allotment-pair.cnf", "--kind", "flag", "--format", "json", "-o", flag]).code).toBe(0);
    const r = cli(["verify", "examples/allotment-pair.cnf", "--circuit", flag, "--json"]);
    expect(r.code, r.stderr).toBe(0);
  });
});

describe.skipIf(!haveSatlib)("clausegate verify --sample on SATLIB (Hoos & Stuetzle 2000) formulas", () => {
  it("aim-50-1_6-yes1-1 (one model): the oracle without its phase gate fails with exit 1, even with 65536 samples", () => {
    const cnf = resolve(SATLIB, "aim/aim-50-1_6-yes1-1.cnf");
    const out = join(dir, "aim.json");
    expect(cli(["oracle", cnf, "--basis", "mcx", "--format", "json", "-o", out]).code).toBe(0);
    const lines = readFileSync(out, "utf8").split("\n");
    const marking = lines.filter((l) => l.startsWith('{"op":"mcz"'));
    expect(marking).toHaveLength(1);
    const broken = join(dir, "aim-identity.json");
    writeFileSync(broken, lines.filter((l) => !l.startsWith('{"op":"mcz"')).join("\n").replace(",\n]}", "\n]}"));
    const r = cli(["verify", "--sample", cnf, "--circuit", broken, "--samples", "65536"]);
    // 65568 = 65536 random + the one model + 31 distinct falsifying assignments (32 made from the one model; two coincide).
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/^mismatch: sampled \(65568 assignments, bit-parallel simulator\)\ncounterexample: (-?\d+ ){50}0\nexpected: phase -1 \(the formula is satisfied\)/);
    expect(r.stdout).toMatch(/\nmodels: 1 found by the CDCL solver in \d+ conflicts? \(all there are\); also checked: 31 assignments falsifying one clause each, 65536 random\n$/);
    const json = JSON.parse(cli(["verify", "--sample", cnf, "--circuit", broken, "--json"]).stdout);
    expect(json).toMatchObject({ verified: false, method: "sampled", models: 1, model_search: { method: "cdcl", status: "sat", found: 1, all: true } });
    expect(cli(["verify", "--sample", cnf, "--circuit", out]).code).toBe(0);
  });
  it("an unsatisfiable formula is verified on its unmarked inputs, and the output says why that suffices", () => {
    const r = cli(["verify", "--sample", resolve(SATLIB, "aim/aim-50-1_6-no-1.cnf"), "--basis", "mcx"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^verified: sampled \(4128 assignments, bit-parallel simulator\); 0 satisfying, 4128 not\nmodels: none, as the CDCL solver proved in \d+ conflicts?; .*\nnote: no models: the formula is unsatisfiable\n$/);
  });
  it("SATLIB ais6's lean oracle: the proof ends at --proof-seconds and the check falls back to simulation; --prove then says not proven (exit 1); a bad value is refused", () => {
    const ais6 = resolve(SATLIB, "ais/ais6.cnf");
    const r = cli(["verify", ais6, "--strategy", "lean", "--proof-seconds", "1"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^not proven: the solver ran out of its time budget, 1 s, at \d+ conflicts \(after \d+\.\d+ s\); checked by simulation instead\nverified: sampled \(/);
    const p = cli(["verify", ais6, "--strategy", "lean", "--proof-seconds", "1", "--prove"]);
    expect(p.code).toBe(1);
    expect(p.stdout).toMatch(/time budget, 1 s, at/);
    const sampled = cli(["verify", ais6, "--sample", "--proof-seconds", "5"]);
    expect(sampled.code).toBe(2);
    expect(sampled.stderr).toBe("clausegate verify: error: --proof-seconds bounds a proof, and --sample runs none; hint: leave out --sample or --proof-seconds\n");
    const bad = cli(["verify", ais6, "--proof-seconds", "0"]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toBe("clausegate verify: error: --proof-seconds expects a whole number in 1..86400 but got '0'; hint: give a value in that range\n");
  }, 120_000);
  it("a solver out of budget: exit 1 and the reason, with a hint", () => {
    const r = cli(["verify", "--sample", resolve(SATLIB, "aim/aim-50-1_6-yes1-1.cnf"), "--basis", "mcx", "--conflict-limit", "0"]);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/^not verified: sampled .*; 0 satisfying, 4128 not\nreason: no satisfying assignment was checked: the CDCL solver spent its budget of 0 conflicts without finding one or proving that there is none; hint: raise --conflict-limit\n/);
    const json = JSON.parse(cli(["verify", "--sample", resolve(SATLIB, "aim/aim-50-1_6-yes1-1.cnf"), "--basis", "mcx", "--conflict-limit", "0", "--json"]).stdout);
    expect(json).toMatchObject({ verified: false, counterexample: null, unchecked: expect.stringMatching(/^no satisfying assignment was checked/), model_search: { status: "unknown" } });
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

describe("clausegate verify --circuit - (standard input)", () => {
  it("reads the circuit from standard input and names it <stdin> in diagnostics", () => {
    const circuit = cli(["oracle", "examples/allotment-pair.cnf", "--format", "json"]).stdout;
    const r = cli(["verify", "examples/allotment-pair.cnf", "--circuit", "-"], circuit);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^verified: exhaustive/);
    const bad = cli(["verify", "examples/allotment-pair.cnf", "--circuit", "-"], circuit.replace('{"op":"cx","qubits":[0,4]}', '{"op":"cx","qubits":[0,99]}'));
    expect(bad.code).toBe(2);
    expect(bad.stdout).toBe("");
    expect(bad.stderr).toMatch(/^<stdin>:4:24: error: expected a qubit in 0\.\.9 but found 99 in gate 0 \(cx\); hint: /);
  });
  it("refuses the formula and the circuit both from standard input", () => {
    const r = cli(["verify", "-", "--circuit", "-"], "p cnf 1 1\n1 0\n");
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(/^clausegate verify: error: the formula and the circuit both come from standard input.*; hint: /);
  });
});

describe("clausegate verify of a circuit with the wrong register", () => {
  it("above the exhaustive limit, says only that it is no oracle for the formula (no 'not proven' line first)", () => {
    const out = join(dir, "shed-free.json");
    expect(cli(["oracle", "examples/shed-lock.cnf", "--register", "free", "--format", "json", "-o", out]).code).toBe(0);
    const r = cli(["verify", "examples/shed-lock.cnf", "--circuit", out]);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe(`${out}: not an oracle for this formula: the search register vars has 4 qubits but the formula declares 40 variables\n`);
  });
});

describe("clausegate verify --sample with the free register", () => {
  it("names its near misses as register values with one bit flipped (no clause is falsified by a register value)", () => {
    const out = join(dir, "rota-free-ok.json");
    expect(cli(["oracle", "examples/launch-rota.cnf", "--register", "free", "--format", "json", "-o", out]).code).toBe(0);
    const r = cli(["verify", "examples/launch-rota.cnf", "--register", "free", "--circuit", out, "--exhaustive-limit", "4", "--sample", "--samples", "100"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/also checked: \d+ register values? with one bit flipped, \d+ random/);
    expect(r.stdout).not.toMatch(/falsifying one clause/);
  });
});
