// Two outputs sent to standard output: refused before either is written (issue: nothing on
// standard output before an exit-2 error), and text output mixed with a drawing is refused too.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { cli, ROOT } from "../helpers/cli.js";

const EXAMPLE = join(ROOT, "examples/allotment-pair.cnf");
const dir = mkdtempSync(join(tmpdir(), "cg-claim-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const refused = (args: string[], pattern: RegExp): void => {
  const r = cli(args);
  expect(r.code).toBe(2);
  expect(r.stdout).toBe("");
  expect(r.stderr.trim().split("\n")).toHaveLength(1);
  expect(r.stderr).toMatch(pattern);
};

describe("standard output claimed by two outputs", () => {
  it("oracle and search: the report and the circuit", () => {
    refused(["oracle", EXAMPLE, "--report", "-"], /the circuit and the report both go to standard output; hint: /);
    refused(["search", EXAMPLE, "--report", "-"], /the circuit and the report both go to standard output; hint: /);
    refused(["search", EXAMPLE, "--report", "-", "-o", "-"], /both go to standard output/);
  });
  it("search --shots: the shots and a circuit or report on standard output", () => {
    refused(["search", EXAMPLE, "--shots", "2", "-o", "-"], /the circuit and the shots both go to standard output/);
    refused(["search", EXAMPLE, "--shots", "2", "--report", "-"], /the report and the shots both go to standard output/);
  });
  it("plan, cost --front and forecast: the plot and the text", () => {
    refused(["plan", EXAMPLE, "--plot", "-"], /the plot and the plan both go to standard output/);
    refused(["cost", EXAMPLE, "--front", "--plot", "-"], /the plot and the cost front both go to standard output/);
    refused(["forecast", EXAMPLE, "--plot", "-"], /the plot and the forecast both go to standard output/);
  });
  it("one output on standard output and the other in a file still works", () => {
    const r = cli(["oracle", EXAMPLE, "--report", "-", "-o", join(dir, "o.qasm")]);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout)).toHaveProperty("qubits");
    const s = cli(["search", EXAMPLE, "--shots", "2", "-o", join(dir, "s.qasm")]);
    expect(s.code).toBe(0);
    expect(s.stdout).toMatch(/^formula: /);
    const c = cli(["search", EXAMPLE, "--complete", "00"]);
    expect(c.code).toBe(1);
    expect(c.stdout).not.toBe("");
  });
});

describe("outputs are named for what they hold", () => {
  it("draw -o naming its input: 'the drawing would replace the input'", () => {
    const r = cli(["draw", EXAMPLE, "-o", EXAMPLE]);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`${EXAMPLE}: error: the drawing would replace the input ${EXAMPLE}; hint: write it to another file\n`);
  });
});
