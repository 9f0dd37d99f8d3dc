// The bundled examples: their stated model counts (examples/README.md) by three independent counts.
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { ROOT } from "./helpers/cli.js";
import { bruteCount } from "./helpers/formulas.js";
import { clausesOf, countModels, readDimacs } from "./helpers/lib.js";
import { logicSolverCount } from "./helpers/reference.js";

// The counts stated in examples/README.md (worked out by hand there).
const stated: Record<string, number> = {
  "allotment-pair.cnf": 2,
  "allotment-row.cnf": 4,
  "herb-spiral.cnf": 0,
  "launch-rota.cnf": 49,
};

describe("bundled examples", () => {
  const readme = readFileSync(join(ROOT, "examples", "README.md"), "utf8");
  it.each(Object.entries(stated))("%s has the stated model count", async (file, models) => {
    const { cnf, diagnostics } = readDimacs(readFileSync(join(ROOT, "examples", file)));
    expect(diagnostics).toEqual([]);
    const r = await countModels(cnf!);
    expect(r.ok && r.models).toBe(BigInt(models));
    expect(bruteCount(cnf!.variables, clausesOf(cnf!))).toBe(models);
    expect(logicSolverCount(cnf!)).toBe(models);
    expect(readme).toMatch(new RegExp(`\`${file.replace(".", "\\.")}\` \\|[^\\n]*\\| ${models} \\|`));
  });
});
