// The bundled examples: their stated model counts (examples/README.md) by three independent counts.
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { ROOT } from "./helpers/cli.js";
import { bruteCount } from "./helpers/formulas.js";
import { clausesOf, countModels, evaluateStructured, readDimacs, recoverStructure } from "./helpers/lib.js";
import { logicSolverCount } from "./helpers/reference.js";

// The counts stated in examples/README.md (worked out by hand there).
const stated: Record<string, number> = {
  "allotment-pair.cnf": 2,
  "allotment-row.cnf": 4,
  "herb-spiral.cnf": 0,
  "launch-rota.cnf": 49,
  // Worked out in examples/README.md from the lock's rules; the test below also runs the rules on all 4096 codes.
  "shed-lock.cnf": 10,
};

describe("bundled examples", () => {
  const readme = readFileSync(join(ROOT, "examples", "README.md"), "utf8");
  it.each(Object.entries(stated))("%s has the stated model count", async (file, models) => {
    const { cnf, diagnostics } = readDimacs(readFileSync(join(ROOT, "examples", file)));
    expect(diagnostics).toEqual([]);
    const r = await countModels(cnf!);
    expect(r.ok && r.models).toBe(BigInt(models));
    // A truth table over every variable only where it is small (the lock has 40 variables; its
    // own check runs over the 12 code bits below).
    if (cnf!.variables <= 20) expect(bruteCount(cnf!.variables, clausesOf(cnf!))).toBe(models);
    expect(logicSolverCount(cnf!)).toBe(models);
    expect(readme).toMatch(new RegExp(`\`${file.replace(".", "\\.")}\` \\|[^\\n]*\\| ${models} \\|`));
  });
});

describe("the shed lock example (examples/encode-lock.mjs)", () => {
  it("has one model per code that opens the lock, and the code bits are the formula's free variables", async () => {
    // The lock's rules on plain numbers (examples/README.md), independent of the encoder's clauses.
    const opening: number[] = [];
    for (let code = 0; code < 4096; code++) {
      const [a, b, c] = [code & 15, (code >> 4) & 15, (code >> 8) & 15];
      const rot = ((a << 1) | (a >> 3)) & 15;
      if (a + b === 19 && (c ^ rot) === 0b1010 && (b & c) !== 0) opening.push(code);
    }
    expect(opening.length).toBe(stated["shed-lock.cnf"]);
    const { cnf } = readDimacs(readFileSync(join(ROOT, "examples", "shed-lock.cnf")));
    const s = recoverStructure(cnf!);
    expect(Array.from(s.free)).toEqual(Array.from({ length: 12 }, (_, i) => i + 1));
    // Every opening code, completed through the circuit's definitions, is a model.
    for (const code of opening) {
      const bits = Array.from({ length: cnf!.variables }, (_, i) => (i < 12 ? (code >> i) & 1 : 0));
      expect(evaluateStructured(s, bits).satisfied).toBe(true);
    }
  });
});
