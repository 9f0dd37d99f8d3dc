// Cost tables with their runs shared between two threads (cost/split.ts) give costTable's
// figures, row for row, with and without structure, both kinds and both register modes.
import { existsSync, readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { randomKSat } from "../helpers/formulas.js";
import { costTable } from "../helpers/lib.js";
import { costTables } from "../../dist/src/cost/split.js";
import { collectBetweenRuns } from "../../dist/src/util/collect.js";
import { scanDimacs } from "../../dist/src/cnf/scanner.js";
import { cnfFromClauses } from "../../dist/src/cnf/cnf.js";

// A Tseitin-encoded gate chain (definitions recovered), a one-hot group and plain clauses.
function structured(): ReturnType<typeof cnfFromClauses> {
  const clauses: number[][] = [];
  // 5 <-> 1 AND 2, 6 <-> 5 OR 3, 7 <-> 6 XOR 4
  clauses.push([-5, 1], [-5, 2], [5, -1, -2], [6, -5], [6, -3], [-6, 5, 3]);
  clauses.push([-7, 6, 4], [-7, -6, -4], [7, -6, 4], [7, 6, -4]);
  // exactly one of 8, 9, 10
  clauses.push([8, 9, 10], [-8, -9], [-8, -10], [-9, -10]);
  clauses.push([7, 8], [-1, 9, 3], [2, -10, 4]);
  return cnfFromClauses(10, clauses);
}

const BW = fileURLToPath(new URL("../../../shared/satlib/blocksworld/bw_large.a.cnf", import.meta.url));

describe("costTables", () => {
  it("gives costTable's rows when its runs are shared with a worker thread", async () => {
    const cases = [randomKSat(12, 50, 3, 7), randomKSat(9, 30, 4, 8), structured()];
    for (const cnf of cases) {
      for (const kind of ["phase", "flag"] as const) {
        for (const register of ["full", "free"] as const) {
          const specs = [{ register, structure: true, textbook: false }, { register, structure: false }];
          // splitFrom 0: split however small (the second longest run goes to the worker).
          const [withS, without] = await costTables(cnf, kind, specs, { threads: 2, splitFrom: 0 });
          expect(withS).toStrictEqual(costTable(cnf, kind, { register, structure: true }).filter((r) => r.strategy !== "textbook"));
          expect(without).toStrictEqual(costTable(cnf, kind, { register, structure: false }));
          // One thread, or every run held heavy (kept on this thread): the same.
          expect(await costTables(cnf, kind, specs, { threads: 1 })).toStrictEqual([withS, without]);
          expect(await costTables(cnf, kind, specs, { threads: 2, splitFrom: 0, heavyBytes: 0 })).toStrictEqual([withS, without]);
        }
      }
    }
  });

  it("a thread started before planning (earlyFrom 0) gives the same rows; when the table is not split after all, it is let go and the call returns", async () => {
    const cnf = randomKSat(12, 50, 3, 13);
    const expected = costTable(cnf, "phase", { structure: false });
    expect((await costTables(cnf, "phase", [{ structure: false }], { threads: 2, splitFrom: 0, earlyFrom: 0 }))[0]).toStrictEqual(expected);
    expect((await costTables(cnf, "phase", [{ structure: false }], { threads: 2, splitFrom: Infinity, earlyFrom: 0 }))[0]).toStrictEqual(expected);
    const missing = new URL("./no-such-worker.js", import.meta.url);
    expect((await costTables(cnf, "phase", [{ structure: false }], { threads: 2, splitFrom: 0, earlyFrom: 0, worker: missing }))[0]).toStrictEqual(expected);
  });

  it("collects garbage only after large runs (64 MB estimated), and only where the host exposes it", async () => {
    const cnf = randomKSat(10, 40, 3, 17);
    const g = globalThis as { gc?: unknown };
    const before = g.gc;
    let calls = 0;
    g.gc = () => void calls++;
    try {
      const [rows] = await costTables(cnf, "phase", [{ structure: false }], { threads: 1 });
      // Ten variables: every run is small, none is followed by a full collection.
      expect(rows!.length).toBeGreaterThan(0);
      expect(calls).toBe(0);
      // A run estimated at 64 MB or more is (a million clauses' wide run: some 210 MB).
      collectBetweenRuns((64 << 20) - 1);
      expect(calls).toBe(0);
      collectBetweenRuns(64 << 20);
      collectBetweenRuns(210e6);
      expect(calls).toBe(2);
    } finally {
      g.gc = before;
    }
    g.gc = "not a function";
    try {
      expect((await costTables(cnf, "phase", [{ structure: false }], { threads: 1 }))[0]).toStrictEqual(costTable(cnf, "phase", { structure: false }));
    } finally {
      g.gc = before;
    }
  });

  it("counts the worker's runs itself when the thread cannot run", async () => {
    const cnf = randomKSat(10, 40, 3, 11);
    const missing = new URL("./no-such-worker.js", import.meta.url);
    const [rows] = await costTables(cnf, "flag", [{ structure: false }], { threads: 2, splitFrom: 0, worker: missing });
    expect(rows).toStrictEqual(costTable(cnf, "flag", { structure: false }));
  });

  it("reports progress from both threads, rising to 1", async () => {
    const seen: number[] = [];
    await costTables(randomKSat(40, 170, 3, 9), "phase", [{ structure: false }], { threads: 2, splitFrom: 0, onProgress: (f) => seen.push(f) });
    expect(seen.length).toBeGreaterThan(2);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!).toBeGreaterThanOrEqual(seen[i - 1]!);
    expect(seen.at(-1)).toBe(1);
  });

  it.skipIf(!existsSync(BW))("splits a SATLIB planning formula with recovered structure (Hoos & Stuetzle 2000: blocksworld/bw_large.a)", async () => {
    const { cnf } = scanDimacs(readFileSync(BW));
    const [rows] = await costTables(cnf!, "phase", [{ structure: true }], { threads: 2, splitFrom: 0 });
    expect(rows).toStrictEqual(costTable(cnf!, "phase", { structure: true }));
  });
});
