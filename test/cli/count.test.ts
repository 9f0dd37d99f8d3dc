// The count command and the CLI's common behaviour, run as a child process.
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

describe("clausegate count", () => {
  it("prints variables, clauses and models", () => {
    const r = cli(["count", "examples/allotment-row.cnf"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe("variables 12\nclauses   32\nmodels    4\n");
  });
  it("prints JSON with --json, reading standard input from -", () => {
    const r = cli(["count", "-", "--json"], "p cnf 3 1\n1 2 0\n");
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout)).toEqual({ variables: 3, clauses: 1, models: 6, log2_models: Math.log2(6) });
  });
  it("prints counts beyond 2^53 exactly in JSON, as decimal strings a JSON reader cannot round", () => {
    const r = cli(["count", "-", "--json"], "p cnf 70 0\n");
    expect(r.stdout).toBe(`{"variables":70,"clauses":0,"models":"${2n ** 70n}","log2_models":70}\n`);
    // 2^53 - 1 is the largest whole number a double holds with all below it (ECMA-262
    // Number.MAX_SAFE_INTEGER): one clause (1 2) excludes a quarter of the assignments, so 54
    // variables give 3 * 2^52 models (above: a string) and 53 give 3 * 2^51 (below: a number).
    const safe = JSON.parse(cli(["count", "-", "--json"], "p cnf 54 1\n1 2 0\n").stdout);
    expect(safe.models).toBe(String(3n * 2n ** 52n));
    const small = JSON.parse(cli(["count", "-", "--json"], "p cnf 53 1\n1 2 0\n").stdout);
    expect(small.models).toBe(3 * 2 ** 51);
    expect(small.log2_models).toBeCloseTo(Math.log2(3) + 51, 12);
    expect(JSON.parse(cli(["count", "-", "--json"], "p cnf 1 2\n1 0\n-1 0\n").stdout).log2_models).toBe(null);
  });
  it("warns about a missing final 0 on stderr and still counts", () => {
    const r = cli(["count", "-"], "p cnf 2 1\n1");
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/^<stdin>:2:2: warning: the last clause is not terminated by 0/);
    expect(r.stdout).toContain("models    2");
  });
  it("refuses too many variables with exit code 2 and says how to raise the limit", () => {
    const clauses = Array.from({ length: 40 }, (_, i) => `${i + 1} -${((i + 1) % 40) + 1} 0`).join("\n");
    const r = cli(["count", "-", "--max-variables", "30"], `p cnf 40 40\n${clauses}\n`);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/refusing to enumerate 2\^40 assignments.*the limit is 30.*--max-variables/);
    // A tiny enumeration refused by a limit of 0: no "about 1 seconds".
    const tiny = cli(["count", "-", "--max-variables", "0"], "p cnf 2 1\n1 2 0\n");
    expect(tiny.code).toBe(2);
    expect(tiny.stderr).toMatch(/that would take under a second on two cores; hint: /);
  });
  it("rejects bad option values and unknown options with exit code 2", () => {
    expect(cli(["count", "-", "--max-variables", "x"]).stderr).toMatch(/--max-variables expects a whole number/);
    const r = cli(["count", "x.cnf", "--frobnicate"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^clausegate count: error: unknown option '--frobnicate'; hint: /);
    expect(cli(["count"]).code).toBe(2);
  });
});

describe("formulas too large to handle", () => {
  const huge = "p cnf 2147483647 1\n1 0\n";
  it("count refuses a count with hundreds of thousands of digits, exit 2", () => {
    const r = cli(["count", "-"], huge);
    expect(r.code).toBe(2);
    // 2^2147483646 has floor(2147483646 log10 2) + 1 digits; the error points at the header's count.
    expect(r.stderr).toBe("<stdin>:1:7: error: the count is a multiple of 2^2147483646 (2147483646 declared variables occur in no clause), which alone has 646,456,993 digits; hint: declare only the variables the formula uses\n");
    // Just over the limit: 2^1000001 has 301,031 digits, as BigInt writes it out.
    const just = cli(["count", "-"], "c a comment\n p cnf  1000002 1\n1 0\n");
    expect(just.stderr).toBe(`<stdin>:2:9: error: the count is a multiple of 2^1000001 (1000001 declared variables occur in no clause), which alone has ${(2n ** 1000001n).toString().length.toLocaleString("en-US")} digits; hint: declare only the variables the formula uses\n`);
  });
  it("names the file of a count refused for its size", () => {
    const file = join(mkdtempSync(join(tmpdir(), "cg-count-")), "wide.cnf");
    writeFileSync(file, "p cnf 2147483647 2\n1 0\n2 0\n");
    const r = cli(["count", file]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(new RegExp(`^${file.replace(/[.]/g, "\\.")}:1:7: error: the count is a multiple of 2\\^2147483645 .*which alone has 646,456,993 digits; hint: `));
  });
  // plan is not here: it plans at any size (test/cli/search.test.ts, "clausegate plan at any size").
  // search (and plan) default to the free register, which holds no qubit here: --register full.
  it.each(["oracle", "cost", "verify", "search"])("%s refuses a search register of 2^31-1 qubits, exit 2", (command) => {
    const r = cli([command, "-", "--register", "full"], huge);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/2147483647 (variables|qubits)/);
    expect(r.stderr).not.toMatch(/internal error/);
  });
  it.each(["oracle", "verify"])("%s points a header-size refusal at the header's VARIABLES count", (command) => {
    const r = cli([command, "-", "--register", "full"], "c x\n  p  cnf   2147483647 1\n1 0\n");
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^<stdin>:2:12: error: the header declares 2147483647 variables; /);
  });
});

describe("the command line", () => {
  it("has --help, --version and per-command help", () => {
    expect(cli(["--help"]).stdout).toMatch(/Usage: clausegate COMMAND/);
    expect(cli(["--version"]).stdout).toMatch(/^\d+\.\d+\.\d+\n$/);
    expect(cli(["count", "--help"]).stdout).toMatch(/Usage: clausegate count FILE\|-/);
  });
  it("rejects an unknown command with exit code 2", () => {
    const r = cli(["frob"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/unknown command 'frob'/);
  });
});
