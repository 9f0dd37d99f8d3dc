// An interrupt while a command computes, before any output file exists, ends it at once. A
// JavaScript signal handler defers the signal to the end of the synchronous stage (Ctrl-C waited
// some 5 s of compiling on a 60,000-clause formula), so clausegate installs its clean-up handler
// only when the first temporary file is about to be made.
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it, vi } from "vitest";
import { ROOT } from "../helpers/cli.js";
import { main } from "../../dist/src/cli/main.js";
import { resetOutputs } from "../../dist/src/cli/output.js";

const dir = mkdtempSync(join(tmpdir(), "cg-int-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const EXAMPLE = join(ROOT, "examples/allotment-pair.cnf");

describe("the clean-up handler for signals", () => {
  it("is not installed by a run that writes no file", async () => {
    const before = process.listenerCount("SIGINT");
    const quiet = vi.spyOn(process.stdout, "write").mockImplementation(() => true);
    try {
      expect(await main(["count", EXAMPLE])).toBe(0);
    } finally {
      quiet.mockRestore();
      resetOutputs();
    }
    expect(process.listenerCount("SIGINT")).toBe(before);
  });
  it("is installed once a temporary file is made, and removed by resetOutputs", async () => {
    const before = process.listenerCount("SIGINT");
    const out = join(dir, "o.qasm");
    expect(await main(["oracle", EXAMPLE, "-o", out])).toBe(0);
    expect(readFileSync(out, "utf8")).toMatch(/^OPENQASM 3\.0;/);
    expect(process.listenerCount("SIGINT")).toBe(before + 1);
    resetOutputs();
    expect(process.listenerCount("SIGINT")).toBe(before);
  });
});

describe("an in-process run with standard output stubbed", () => {
  it("settles and moves its files into place (the commit waits on no write callback)", async () => {
    const report = join(dir, "inproc-report.json");
    const quiet = vi.spyOn(process.stdout, "write").mockImplementation(() => true);
    let code: number;
    try {
      code = await main(["oracle", EXAMPLE, "--report", report]);
    } finally {
      quiet.mockRestore();
      resetOutputs();
    }
    expect(code).toBe(0);
    expect(JSON.parse(readFileSync(report, "utf8"))).toHaveProperty("qubits");
  });
});
