// An error is one line on standard error even when a file name or an option value holds a line
// feed or another control character: they are shown escaped.
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { cli, ROOT } from "../helpers/cli.js";

const dir = mkdtempSync(join(tmpdir(), "cg-line-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const EXAMPLE = join(ROOT, "examples/allotment-pair.cnf");

const oneLineError = (args: string[]): string => {
  const r = cli(args);
  expect(r.code).toBe(2);
  expect(r.stdout).toBe("");
  expect(r.stderr.endsWith("\n")).toBe(true);
  expect(r.stderr.slice(0, -1)).not.toMatch(/[\x00-\x1f]/);
  return r.stderr;
};

describe("control characters in messages", () => {
  it("a bad file whose name holds a line feed: the diagnostic stays one line", () => {
    const file = join(dir, "bad\nname.cnf");
    writeFileSync(file, "p cnf 3 x\n");
    expect(oneLineError(["count", file])).toBe(`${join(dir, "bad")}\\nname.cnf:1:9: error: expected the CLAUSES count as a decimal number but found 'x'; hint: counts in 'p cnf VARIABLES CLAUSES' are whole numbers 0..2147483647\n`);
  });
  it("a missing input, an output folder that does not exist, an option value", () => {
    expect(oneLineError(["count", join(dir, "no\nfile.cnf")])).toMatch(/no\\nfile\.cnf:1:1: error: cannot read the input/);
    expect(oneLineError(["oracle", EXAMPLE, "-o", join(dir, "no\ndir", "x.qasm")])).toMatch(/no\\ndir\/x\.qasm: error: cannot write the circuit/);
    expect(oneLineError(["oracle", EXAMPLE, "--kind", "a\nb\u0001"])).toMatch(/got 'a\\nb\\x01'; hint: /);
  });
});
