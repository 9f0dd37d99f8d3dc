// An option given twice with different values is refused: parseArgs would keep the last and
// drop the first without a word (issue: options that are ignored are refused).
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli, ROOT } from "../helpers/cli.js";

const EXAMPLE = join(ROOT, "examples/allotment-pair.cnf");

describe("repeated options", () => {
  it.each([
    [["oracle", EXAMPLE, "--format", "json", "--format", "qasm2"], "--format"],
    [["oracle", EXAMPLE, "-o", "a.qasm", "--output", "b.qasm"], "--output"],
    [["verify", EXAMPLE, "--seed", "1", "--seed=2"], "--seed"],
    [["count", EXAMPLE, "--max-variables", "20", "--max-variables", "30"], "--max-variables"],
    [["plan", EXAMPLE, "--register", "full", "--register", "free"], "--register"],
  ])("%j is refused in one line, exit 2, nothing written", (args, name) => {
    const r = cli(args);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toContain(`${name} is given twice`);
    expect(r.stderr).toMatch(/; hint: give it once\n$/);
  });
  it("the same value twice, and --help, are accepted", () => {
    expect(cli(["oracle", EXAMPLE, "--format", "json", "--format=json"]).code).toBe(0);
    expect(cli(["count", EXAMPLE, "--json", "--json"]).code).toBe(0);
    expect(cli(["oracle", "--help", "--kind", "flag", "--kind", "phase"]).code).toBe(0);
  });
});

describe("a value that starts with '-' after a space", () => {
  it("is refused with what to write instead, not parseArgs's 'argument is ambiguous'", () => {
    const r = cli(["plan", EXAMPLE, "--solutions", "-1"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe("clausegate plan: error: option --solutions is followed by a value that starts with '-', which reads as an option; hint: write --solutions=VALUE for such a value\n");
    const o = cli(["oracle", EXAMPLE, "-o", "-x"]);
    expect(o.code).toBe(2);
    expect(o.stderr).toMatch(/^clausegate oracle: error: option -o is followed by .*; hint: write -oVALUE for such a value\n$/);
  });
});

describe("oracle: the check options without a check", () => {
  it.each(["--exhaustive-limit=5", "--samples=5", "--models=5", "--conflict-limit=5", "--proof-seconds=5", "--seed=5", "--sample"])("%s without --verify or --prove is refused", (opt) => {
    const r = cli(["oracle", EXAMPLE, opt]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    const name = opt.split("=")[0]!;
    expect(r.stderr).toBe(`clausegate oracle: error: ${name} shapes the check that --verify or --prove runs, and neither is given; hint: add --verify (or --prove), or leave out ${name}\n`);
  });
  it.each(["--exhaustive-limit=5", "--samples=5", "--models=5", "--seed=5"])("%s with --prove (which runs no simulation) is refused, not ignored", (opt) => {
    const r = cli(["oracle", EXAMPLE, "--prove", opt]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    const name = opt.split("=")[0]!;
    expect(r.stderr).toBe(`clausegate oracle: error: ${name} shapes the simulation that --verify runs, and --prove runs none; hint: use --verify instead, or leave out ${name}\n`);
  });
  it("--prove with --verify is refused; --prove takes --conflict-limit", () => {
    const both = cli(["oracle", EXAMPLE, "--prove", "--verify"]);
    expect(both.code).toBe(2);
    expect(both.stderr).toMatch(/^clausegate oracle: error: --prove and --verify ask for a proof and for a simulation .*; hint: give one of them\n$/);
    const p = cli(["oracle", EXAMPLE, "--prove", "--conflict-limit", "100000"]);
    expect(p.code).toBe(0);
    expect(p.stderr).toMatch(/^proved: /);
  });
  it("--prove with --sample is refused as verify refuses it; with --verify the options apply", () => {
    const r = cli(["oracle", EXAMPLE, "--prove", "--sample"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^clausegate oracle: error: --prove and --sample ask for a proof and for sampling only; hint: /);
    const v = cli(["oracle", EXAMPLE, "--verify", "--sample", "--seed", "3"]);
    expect(v.code).toBe(0);
    expect(v.stderr).toMatch(/^verified: /);
  });
});
