// The structure command, run as a child process.
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { dimacs, multiplier, xorSystem } from "../helpers/encoders.js";
import { colouring } from "../helpers/formulas.js";
import { clausesOf, cnfFromClauses, recoverStructure } from "../helpers/lib.js";

const mul = multiplier(5, 5, 120n);
const mulText = dimacs(mul, "5 x 5 bit multiplier, product 120");

describe("clausegate structure", () => {
  it("prints the free variables, definitions by kind, the rest and the search space", () => {
    const r = cli(["structure", "-"], mulText);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe("");
    expect(r.stdout).toContain("variables          120\n");
    expect(r.stdout).toContain("free variables     10: 1 2 3 4 5 6 7 8 9 10\n");
    expect(r.stdout).toMatch(/^definitions +110 \(365 clauses\)$/m);
    expect(r.stdout).toMatch(/^ {2}and +60 +e\.g\. 11 = AND\(1, 6\);/m);
    expect(r.stdout).toMatch(/^ {2}xor +\d+ +e\.g\./m);
    expect(r.stdout).toContain("remaining clauses  10 (10 of width 1)\n");
    expect(r.stdout).toContain(`search space       2^120 = ${2n ** 120n}\n                -> 2^10 = 1024 over the free variables\n`);
  });
  it("prints JSON with the issue's keys, literals in DIMACS form, equal to the library's result", () => {
    const r = cli(["structure", "-", "--json"], mulText);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout) as Record<string, unknown>;
    for (const key of ["variables", "free", "definitions", "parities", "groups", "remaining_clauses", "search_space"]) expect(j).toHaveProperty(key);
    const s = recoverStructure(cnfFromClauses(mul.variables, mul.clauses));
    expect(j["variables"]).toBe(120);
    expect(j["free"]).toEqual(Array.from(s.free));
    expect(j["definitions"]).toEqual(s.definitions.map((d) => ({ variable: d.variable, kind: d.kind, inputs: d.inputs })));
    expect(j["remaining_clauses"]).toEqual(clausesOf(s.remaining));
    expect(j["search_space"]).toEqual({ before_log2: 120, after_log2: 10 });
  });
  it("reports parity constraints and groups", () => {
    // Two XOR rows over the same 3 variables cannot both define: one stays a parity constraint.
    const x = cli(["structure", "-", "--json"], dimacs(xorSystem(4, [{ variables: [1, 2, 3], parity: 1 }, { variables: [1, 2, 3, 4], parity: 0 }, { variables: [2, 3, 4], parity: 0 }])));
    const jx = JSON.parse(x.stdout) as { parities: { variables: number[]; parity: number }[]; definitions: unknown[] };
    expect(jx.definitions.length + jx.parities.length).toBe(3);
    expect(jx.parities.length).toBeGreaterThan(0);
    const edges: [number, number][] = [[0, 1], [1, 2], [2, 0]];
    const g = cli(["structure", "-", "--json", "--prefer", "groups"], dimacs({ variables: 12, clauses: clausesOf(colouring(3, edges, 4)), inputs: [] }));
    const jg = JSON.parse(g.stdout) as { groups: { variables: number[]; exactly_one: boolean }[] };
    expect(jg.groups.filter((q) => q.exactly_one).map((q) => q.variables)).toEqual([[1, 2, 3, 4], [5, 6, 7, 8], [9, 10, 11, 12]]);
    const t = cli(["structure", "-", "--prefer", "groups"], dimacs({ variables: 12, clauses: clausesOf(colouring(3, edges, 4)), inputs: [] }));
    expect(t.stdout).toMatch(/^groups +3 exactly-one, \d+ at-most-one/m);
    expect(t.stdout).toContain("e.g. exactly one of {1, 2, 3, 4}");
  });
  it("counts variables in no clause apart and writes huge search spaces by their digits", () => {
    const r = cli(["structure", "-"], "p cnf 1000 1\n1 2 0\n");
    expect(r.stdout).toContain("free variables     2: 1 2\n                   plus 998 declared variables in no clause (any value)\n");
    expect(r.stdout).toContain("search space       2^1000 (a 302-digit number)\n");
  });
  it("says when the formula has an empty clause", () => {
    const r = cli(["structure", "-"], "p cnf 1 2\n1 0\n0\n");
    expect(r.code).toBe(0);
    expect(r.stdout).toContain("the formula has an empty clause: nothing satisfies it");
  });
  it("rejects bad input and usage with one line and exit code 2", () => {
    const bad = cli(["structure", "-"], "p cnf 2 1\n1 x 0\n");
    expect(bad.code).toBe(2);
    expect(bad.stdout).toBe("");
    expect(bad.stderr).toMatch(/^<stdin>:2:3: error: .*; hint: .*\n$/);
    const missing = cli(["structure", "no-such-file.cnf"]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/^no-such-file\.cnf: error: |^no-such-file\.cnf:1:1: error: /);
    expect(missing.stderr.trim().split("\n")).toHaveLength(1);
    const prefer = cli(["structure", "-", "--prefer", "gates"], "p cnf 0 0\n");
    expect(prefer.code).toBe(2);
    expect(prefer.stderr).toBe("clausegate structure: error: --prefer expects definitions or groups but got 'gates'; hint: see clausegate structure --help\n");
    const unknown = cli(["structure", "-", "--frobnicate"]);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr.trim().split("\n")).toHaveLength(1);
    expect(cli(["structure"]).code).toBe(2);
  }, 30_000);
  it("has help, and is listed in the command table", () => {
    const h = cli(["structure", "-h"]);
    expect(h.code).toBe(0);
    expect(h.stdout).toMatch(/^Usage: clausegate structure FILE\|- \[options\]/);
    expect(h.stdout).toContain("--json");
    expect(cli(["--help"]).stdout).toMatch(/^ {2}structure +recover gate definitions/m);
  });
});

describe("clausegate count over the free variables", () => {
  it("counts a 120-variable multiplier by its 10 inputs; --no-structure and --max-variables as documented", () => {
    const r = cli(["count", "-", "--json"], mulText);
    expect(r.code).toBe(0);
    // 120 = a x b with a, b < 32: (4, 30), (5, 24), (6, 20), (8, 15), (10, 12) and their swaps.
    expect(JSON.parse(r.stdout)).toEqual({ variables: 120, clauses: 375, models: 10, log2_models: Math.log2(10) });
    const plain = cli(["count", "-", "--no-structure"], mulText);
    expect(plain.code).toBe(2);
    expect(plain.stderr).toMatch(/refusing to enumerate 2\^120 assignments \(120 variables occur in clauses/);
    const limited = cli(["count", "-", "--max-variables", "9"], mulText);
    expect(limited.code).toBe(2);
    expect(limited.stderr).toMatch(/^clausegate count: error: refusing to enumerate 2\^10 assignments \(10 free variables left by structure recovery, of 120 in clauses; the limit is 9\).*--max-variables N\)\n$/);
    expect(cli(["count", "--help"]).stdout).toContain("--no-structure");
  }, 30_000);
});
