// Structure recovery on real formulas: SATLIB (Hoos & Stuetzle 2000), in ../shared/satlib.
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { resolve } from "node:path";
import { describe, expect, it } from "vitest";
import { ROOT } from "../helpers/cli.js";
import { countModels, readDimacsFile, recoverStructure, type Cnf } from "../helpers/lib.js";
import { checkShape } from "./check.js";

const satlib = resolve(ROOT, "../shared/satlib");
const present = existsSync(resolve(satlib, "manifest.json"));

interface Entry {
  file: string;
  family: string;
  expected: "SAT" | "UNSAT";
  model_count_picosat: number | null;
}

const manifest: Entry[] = present ? (JSON.parse(readFileSync(resolve(satlib, "manifest.json"), "utf8")) as { files: Entry[] }).files : [];

async function load(file: string): Promise<Cnf | undefined> {
  return (await readDimacsFile(resolve(satlib, file))).cnf;
}

const files = (family: string): string[] => (present ? readdirSync(resolve(satlib, family)).filter((f) => f.endsWith(".cnf")).sort().map((f) => `${family}/${f}`) : []);

describe.skipIf(!present)("SATLIB (Hoos & Stuetzle 2000); skipped when ../shared/satlib is absent", () => {
  it("every readable file: each clause consumed once, definitions acyclic, both preferences", async () => {
    let checked = 0;
    for (const e of manifest) {
      const cnf = await load(e.file);
      if (cnf === undefined) continue; // the pret files declare fewer clauses than they hold
      if (cnf.clauseStart.length > 40_000) continue; // bw_large.c/d: covered by the timing benchmark, not here
      checkShape(cnf, recoverStructure(cnf));
      checkShape(cnf, recoverStructure(cnf, { prefer: "groups" }));
      checked++;
    }
    expect(checked).toBeGreaterThan(150);
  }, 120_000);
  it("dubois (XOR chains, from memory: Dubois's generator): all XOR, and unsatisfiable as published, by elimination", async () => {
    for (const file of files("dubois")) {
      const cnf = (await load(file))!;
      const s = recoverStructure(cnf);
      expect(s.remaining.clauseStart.length - 1).toBe(0);
      expect(s.definitions.every((d) => d.kind === "xor" || d.kind === "xnor")).toBe(true);
      expect(manifest.find((e) => e.file === file)!.expected).toBe("UNSAT");
      const r = await countModels(cnf);
      expect(r.ok && r.models).toBe(0n);
    }
  }, 60_000);
  it("hole (pigeonhole, unsatisfiable): one at-most-one group per hole over all pigeons", async () => {
    for (const [file, holes] of [["hole/hole6.cnf", 6], ["hole/hole7.cnf", 7], ["hole/hole8.cnf", 8]] as const) {
      const s = recoverStructure((await load(file))!);
      expect(s.groups.map((g) => [g.variables.length, g.exactlyOne])).toEqual(Array.from({ length: holes }, () => [holes + 1, false]));
      expect(s.definitions).toEqual([]);
    }
  });
  it("flat graph 3-colouring: one exactly-one group per vertex, or a NOR definition per vertex", async () => {
    for (const file of files("flat30-60")) {
      const cnf = (await load(file))!;
      const vertices = cnf.variables / 3;
      expect(recoverStructure(cnf, { prefer: "groups" }).groups.filter((g) => g.exactlyOne && g.variables.length === 3).length).toBe(vertices);
      const d = recoverStructure(cnf).definitions;
      expect(d.length).toBe(vertices);
      expect(d.every((x) => x.kind === "and" && x.inputs.length === 2 && x.inputs.every((l) => l < 0))).toBe(true);
    }
  });
  it("uniform random 3-SAT holds no gates, and the front end counts uf20-91 as picosat did (manifest)", async () => {
    for (const family of ["uf20-91", "uf50-218", "uuf50-218"]) {
      for (const file of files(family)) expect(recoverStructure((await load(file))!).definitions).toEqual([]);
    }
    for (const e of manifest.filter((x) => x.family === "uf20-91" && x.model_count_picosat !== null).slice(0, 10)) {
      const r = await countModels((await load(e.file))!);
      expect(r.ok && r.models).toBe(BigInt(e.model_count_picosat!));
    }
  }, 60_000);
  it("blocksworld anomaly (satisfiable): counted over its 25 free variables", async () => {
    const cnf = (await load("blocksworld/anomaly.cnf"))!;
    const r = await countModels(cnf);
    const plain = await countModels(cnf, { structure: false, maxVariables: 48 });
    expect(r.ok && r.enumerated).toBe(25);
    expect(r.ok && plain.ok && r.models === plain.models && r.models > 0n).toBe(true);
    expect(manifest.find((e) => e.file === "blocksworld/anomaly.cnf")!.expected).toBe("SAT");
  }, 60_000);
});
