// Accepted inputs and their meaning, read by the fast scanner and the grammar reader alike.
import { describe, expect, it } from "vitest";
import { clausesOf, countModels, readDimacs, readDimacsFile, readWithGrammarSync, scanDimacs, type ReadResult } from "../helpers/lib.js";

const enc = (s: string): Uint8Array => Buffer.from(s, "latin1");

function both(src: string): ReadResult {
  const a = scanDimacs(enc(src));
  const b = readWithGrammarSync(enc(src));
  expect(JSON.stringify(b, typed)).toBe(JSON.stringify(a, typed));
  return a;
}
const typed = (_k: string, v: unknown): unknown => (ArrayBuffer.isView(v) ? Array.from(v as Int32Array) : v);

function clauses(src: string): number[][] {
  const r = both(src);
  expect(r.diagnostics.filter((d) => d.severity === "error")).toEqual([]);
  return clausesOf(r.cnf!);
}

describe("accepted DIMACS", () => {
  it("reads a plain file", () => {
    expect(clauses("p cnf 3 2\n1 -2 0\n2 3 0\n")).toEqual([[1, -2], [2, 3]]);
  });
  it("takes comment lines before and after the header and between clauses", () => {
    expect(clauses("c a\nc\np cnf 2 2\nc b\n1 0\nc c 1 2 0\n-2 0\nc end\n")).toEqual([[1], [-2]]);
  });
  it("takes any spaces and tabs in the header, and trailing space (SATLIB 'p cnf 20  91 ')", () => {
    expect(clauses("p\tcnf  2 \t 1 \t\n1 2 0\n")).toEqual([[1, 2]]);
  });
  it("lets clauses span lines and share lines", () => {
    expect(clauses("p cnf 3 3\n1\n-2\n\n3 0 -1 0\n2 0")).toEqual([[1, -2, 3], [-1], [2]]);
  });
  it("takes CRLF line ends", () => {
    expect(clauses("c x\r\np cnf 2 2\r\n1 -2 0\r\n2 0\r\n")).toEqual([[1, -2], [2]]);
  });
  it("stops at the SATLIB end marker: the '0' after '%' is not an empty clause", () => {
    const r = both("p cnf 2 1\n1 2 0\n%\n0\n\n");
    expect(clausesOf(r.cnf!)).toEqual([[1, 2]]);
  });
  it("reads a lone 0 line after the declared clauses as an end marker, with a warning at the 0 (rule S5, SATLIB pret files)", () => {
    const r = both("p cnf 3 2\n1 -2 0\n2 3 0\n0\n");
    expect(clausesOf(r.cnf!)).toEqual([[1, -2], [2, 3]]);
    expect(r.diagnostics).toHaveLength(1);
    expect(r.diagnostics[0]).toMatchObject({ severity: "warning", code: "trailing-zero-end-marker", line: 4, column: 1 });
    expect(r.diagnostics[0]!.message).toContain("after the 2 declared clauses");
  });
  it("allows blanks before the lone 0, and comments, whitespace or '%' after it", () => {
    for (const [src, line, column] of [
      ["p cnf 2 1\n1 0\n\t 0 c end\nc more\n\n", 3, 3],
      ["p cnf 2 1\r\n1 0\r\n0\r\n", 3, 1],
      ["p cnf 2 1\n1 0\n0", 3, 1],
      ["p cnf 2 1\n1 0\n0\n%\n0\n", 3, 1],
      ["p cnf 0 0\n00\n", 2, 1],
    ] as const) {
      const r = both(src);
      expect(clausesOf(r.cnf!), src).toEqual(src.startsWith("p cnf 0") ? [] : [[1]]);
      expect(r.diagnostics.map((d) => [d.code, d.line, d.column]), src).toEqual([["trailing-zero-end-marker", line, column]]);
    }
  });
  it("keeps a lone 0 before the declared count is reached an empty clause, with no warning", () => {
    const r = both("p cnf 2 2\n1 0\n0\n");
    expect(clausesOf(r.cnf!)).toEqual([[1], []]);
    expect(r.diagnostics).toEqual([]);
  });
  it("skips a UTF-8 byte-order mark", () => {
    expect(clauses("\xef\xbb\xbfp cnf 1 1\n1 0\n")).toEqual([[1]]);
  });
  it("accepts leading zeros and '00' as a terminator", () => {
    expect(clauses("p cnf 10 1\n007 -010 00\n")).toEqual([[7, -10]]);
  });
  it("warns but accepts a last clause without its 0", () => {
    const r = both("p cnf 2 2\n1 0\n2 -1");
    expect(clausesOf(r.cnf!)).toEqual([[1], [2, -1]]);
    expect(r.diagnostics).toHaveLength(1);
    expect(r.diagnostics[0]).toMatchObject({ severity: "warning", code: "missing-terminator", line: 3, column: 5 });
  });
});

describe("reading from a file", () => {
  it("reads a file with readDimacsFile and reports a missing one as a diagnostic", async () => {
    const { cnf } = await readDimacsFile("examples/allotment-pair.cnf");
    expect(cnf?.variables).toBe(4);
    const missing = await readDimacsFile("examples/no-such.cnf");
    expect(missing.cnf).toBeUndefined();
    expect(missing.diagnostics[0]).toMatchObject({ code: "io-error", line: 1, column: 1 });
  });
});

describe("semantics of unusual clauses", () => {
  const count = async (src: string): Promise<bigint> => {
    const r = await countModels(readDimacs(src).cnf!);
    if (!r.ok) throw new Error(r.reason);
    return r.models;
  };
  it("an empty clause makes the formula unsatisfiable", async () => {
    expect(clauses("p cnf 2 2\n1 2 0\n0\n")).toEqual([[1, 2], []]);
    expect(await count("p cnf 2 2\n1 2 0\n0\n")).toBe(0n);
  });
  it("zero clauses: every assignment satisfies it", async () => {
    expect(await count("p cnf 5 0\n")).toBe(32n);
    expect(await count("p cnf 0 0\n")).toBe(1n);
  });
  it("declared variables in no clause each double the count", async () => {
    expect(await count("p cnf 1 1\n1 0\n")).toBe(1n);
    expect(await count("p cnf 4 1\n1 0\n")).toBe(8n);
  });
  it("keeps duplicate literals, tautologies and repeated clauses, which change nothing", async () => {
    expect(clauses("p cnf 2 3\n1 1 0\n1 -1 0\n1 1 0\n")).toEqual([[1, 1], [1, -1], [1, 1]]);
    expect(await count("p cnf 2 3\n1 1 0\n1 -1 0\n1 1 0\n")).toBe(2n);
  });
});
