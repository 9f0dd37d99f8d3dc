// The main help's exit code 3 names every command whose own help says it exits 3, as the
// README does, and those commands do exit 3 on an unsatisfiable formula.
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const UNSAT = "p cnf 1 2\n1 0\n-1 0\n";

describe("exit code 3 in the help texts", () => {
  it("the main help names plan, forecast, search and draw --search, and they exit 3", () => {
    const line = cli(["--help"]).stdout.replace(/\n(?!\n)/g, " ").match(/Exit codes:[^.]*\./)![0];
    for (const name of ["plan", "forecast", "search", "draw --search"]) expect(line).toContain(name);
    expect(line).toContain("without --iterations");
    for (const args of [["plan", "-"], ["forecast", "-"], ["search", "-"], ["draw", "-", "--search", "-o", "/tmp/never-written.svg"]]) {
      expect(cli(args, UNSAT).code, args.join(" ")).toBe(3);
    }
  });
});

describe("every command's help says its exit codes", () => {
  it("each help has an 'Exit codes:' line, and each code it names is one the command can give", () => {
    for (const c of ["oracle", "cost", "count", "structure", "verify", "search", "plan", "forecast", "draw"]) {
      const help = cli([c, "--help"]).stdout;
      expect(help, c).toMatch(/Exit codes: /);
      expect(help, c).toMatch(/2 bad input/);
    }
    // count: an unsatisfiable formula is a count of 0, not an error.
    expect(cli(["count", "-"], UNSAT).code).toBe(0);
    // oracle --verify on a formula: 0 (a correct oracle is written).
    expect(cli(["oracle", "-", "--verify"], "p cnf 2 1\n1 2 0\n").code).toBe(0);
  });
});
