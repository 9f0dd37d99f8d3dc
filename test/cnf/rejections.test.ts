// Every rejected input: exact line and column, the diagnostic code, exit code 2 from the CLI,
// one line on stderr with a hint, no stack trace, nothing on stdout.
import { spawnSync } from "node:child_process";
import { closeSync, mkdtempSync, openSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli, ROOT } from "../helpers/cli.js";
import { readWithGrammarSync, scanDimacs } from "../helpers/lib.js";

// [what, input, line, column, code]
const cases: [string, string, number, number, string][] = [
  ["empty input", "", 1, 1, "empty-input"],
  ["only comments (no header)", "c nothing here\n", 2, 1, "missing-header"],
  ["no header", "1 -2 0\n", 1, 1, "missing-header"],
  ["header after a clause", "c x\n1 2 0\np cnf 2 1\n", 2, 1, "missing-header"],
  ["a second header", "p cnf 2 1\n1 0\np cnf 2 1\n", 3, 1, "second-header"],
  ["a format other than cnf", "p wcnf 2 1\n1 0\n", 1, 3, "unsupported-format"],
  ["no format", "p\n", 1, 2, "missing-format"],
  ["negative variable count", "p cnf -2 1\n1 0\n", 1, 7, "negative-count"],
  ["negative clause count", "p cnf 2 -1\n", 1, 9, "negative-count"],
  ["missing clause count", "p cnf 2\n1 0\n", 1, 8, "missing-count"],
  ["missing both counts at end of file", "p cnf", 1, 6, "missing-count"],
  ["non-numeric count", "p cnf two 1\n", 1, 7, "bad-count"],
  ["count beyond 2^31-1", "p cnf 2147483648 1\n", 1, 7, "count-out-of-range"],
  ["text after the counts", "p cnf 2 1 1 0\n", 1, 11, "header-trailing"],
  ["variable beyond the declared count", "p cnf 3 2\n1 2 0\n-1\t4 0\n", 3, 4, "variable-out-of-range"],
  ["more clauses than declared", "p cnf 2 1\n1 0\n2 0\n", 3, 1, "too-many-clauses"],
  ["an extra empty clause", "p cnf 2 1\n1 0 0\n", 2, 5, "too-many-clauses"],
  ["a lone 0 line followed by a second one", "p cnf 2 1\n1 0\n0\n0\n", 3, 1, "too-many-clauses"],
  ["a lone 0 line followed by a clause", "p cnf 2 1\n1 0\nc x\n 0\n2 0\n", 4, 2, "too-many-clauses"],
  ["a lone 0 line followed by a bad token", "p cnf 2 1\n1 0\n0\nend\n", 3, 1, "too-many-clauses"],
  ["a 0 sharing the last clause's line (CR is not a line end)", "p cnf 2 1\n1 0\r0\n", 2, 5, "too-many-clauses"],
  ["fewer clauses than declared", "p cnf 2 3\n1 0\n2 0\n", 4, 1, "too-few-clauses"],
  ["fewer clauses than declared before '%'", "p cnf 2 3\n1 0\n%\n0\n", 3, 1, "too-few-clauses"],
  ["non-integer token 3x", "p cnf 3 1\n1 3x 0\n", 2, 3, "bad-literal"],
  ["non-integer token 1.5", "p cnf 3 1\n1.5 0\n", 2, 1, "bad-literal"],
  ["non-integer token --2", "p cnf 3 1\n1 --2 0\n", 2, 3, "bad-literal"],
  ["negative zero", "p cnf 3 1\n1 -0\n", 2, 3, "negative-zero"],
  ["literal beyond 2^31-1", "p cnf 3 1\n-2147483648 0\n", 2, 1, "literal-out-of-range"],
  ["a NUL byte", "p cnf 1 1\n1 \0 0\n", 2, 3, "nul-byte"],
  ["binary (gzip) input", "\x1f\x8b\x08\x00\x00", 1, 4, "nul-byte"],
  ["non-ASCII bytes outside comments", "p cnf 1 1\n\xc3\xa9 0\n", 2, 1, "non-ascii-input"],
  ["a non-ASCII byte inside a token (the byte's own column)", "p cnf 3 1\n1 2x\xc3\xa9 9\n", 2, 5, "non-ascii-input"],
  ["UTF-16 with a byte-order mark", "\xff\xfep\0 \0c\0n\0f\0", 1, 1, "utf16-input"],
  ["UTF-16 without a byte-order mark", "p\0 \0c\0n\0f\0", 1, 1, "utf16-input"],
];

describe("bare carriage returns (classic Mac line ends)", () => {
  it("the error's hint names the CR and how to convert, in both readers; CRLF and a CR between tokens of the body stay fine", () => {
    for (const [src, line, column, crColumn] of [["p cnf 3 2\r1 -2 0\r2 3 0\r", 1, 11, 10], ["c made on a Mac\rp cnf 3 2\r1 -2 0\r", 1, 34, 16]] as const) {
      for (const read of [scanDimacs, readWithGrammarSync]) {
        const err = read(Buffer.from(src, "latin1")).diagnostics.find((d) => d.severity === "error")!;
        expect({ line: err.line, column: err.column }).toEqual({ line, column });
        expect(err.hint).toBe(`the line holds a bare carriage return (CR) at column ${crColumn}: lines of a DIMACS file end with LF or CRLF; convert CR line ends, e.g. tr '\\r' '\\n' < OLD.cnf > NEW.cnf`);
      }
    }
    for (const read of [scanDimacs, readWithGrammarSync]) {
      expect(read(Buffer.from("p cnf 3 2\r\n1 -2 0\r\n2 3 0\r\n", "latin1")).cnf?.clauseStart.length).toBe(3);
      expect(read(Buffer.from("p cnf 3 2\n1 -2 0\r2 3 0\n", "latin1")).cnf?.clauseStart.length).toBe(3);
    }
    for (const read of [scanDimacs, readWithGrammarSync]) {
      const error = (src: string) => read(Buffer.from(src, "latin1")).diagnostics.find((d) => d.severity === "error")!;
      // Elsewhere the error keeps its own hint, and the CR is added to it.
      const body = error("p cnf 3 2\n1 -2 0\r2 4 0\r");
      expect(body.code).toBe("variable-out-of-range");
      expect(body.hint).toMatch(/^declare at least 4 variables in the header: 'p cnf 4 \.\.\.'; this line holds a bare carriage return \(CR\) at column 7, which is not a line end: /);
      // A comment line holding one swallows what follows (here the header).
      const comment = error("c made on a Mac\rp cnf 3 2\n1 -2 0\n");
      expect({ code: comment.code, line: comment.line }).toEqual({ code: "missing-header", line: 2 });
      expect(comment.hint).toMatch(/; line 1 holds a bare carriage return \(CR\) at column 16, which is not a line end \(the comment runs on past it\): /);
      // A CR between the tokens of an earlier clause line is only a blank: not named.
      const blank = error("p cnf 3 2\n1 -2 0\r2 3 0\n1 4 0\n");
      expect(blank.code).toBe("too-many-clauses");
      expect(blank.hint).not.toMatch(/carriage/);
    }
  });
});

describe("a bare CR inside a comment line", () => {
  it("swallows the rest of the line into the comment: a warning in both readers (the input stays valid), none for CRLF or a trailing CR", () => {
    for (const read of [scanDimacs, readWithGrammarSync]) {
      const r = read(Buffer.from("p cnf 2 1\nc x\r1 0\n2 0\n", "latin1"));
      expect(r.cnf?.clauseStart.length).toBe(2);
      expect(Array.from(r.cnf!.lits)).toEqual([2]);
      expect(r.diagnostics).toHaveLength(1);
      expect(r.diagnostics[0]).toMatchObject({ code: "cr-in-comment", severity: "warning", line: 2, column: 5 });
      for (const fine of ["p cnf 2 1\r\nc x\r\n1 0\r\n", "p cnf 2 1\nc x\r\n1 0\n", "c note\r\r\np cnf 1 1\n1 0\n", "p cnf 2 2\n1 -2 0\r2 0\n"]) {
        expect(read(Buffer.from(fine, "latin1")).diagnostics, JSON.stringify(fine)).toEqual([]);
      }
    }
  });
});

describe("rejected inputs", () => {
  const dir = mkdtempSync(join(tmpdir(), "clausegate-rej-"));
  it.each(cases)("%s", (_what, src, line, column, code) => {
    const bytes = Buffer.from(src, "latin1");
    for (const read of [scanDimacs, readWithGrammarSync]) {
      const r = read(bytes);
      expect(r.cnf).toBeUndefined();
      const err = r.diagnostics.find((d) => d.severity === "error")!;
      expect({ line: err.line, column: err.column, code: err.code }).toEqual({ line, column, code });
      expect(err.hint?.length).toBeGreaterThan(10);
    }
    const file = join(dir, `${code}.cnf`);
    writeFileSync(file, bytes);
    const run = cli(["count", file]);
    expect(run.code).toBe(2);
    expect(run.stdout).toBe("");
    const lines = run.stderr.trimEnd().split("\n");
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(new RegExp(`^${file.replace(/[.]/g, "\\.")}:${line}:${column}: error: .+; hint: .+$`));
    expect(run.stderr).not.toMatch(/\n\s+at /);
  });

  it("accepts a lone 0 line after the declared clauses with one warning line, exit 0 (rule S5)", () => {
    const file = join(dir, "lone-zero.cnf");
    writeFileSync(file, "c ends like SATLIB's pret files\np cnf 2 2\n1 -2 0\n2 0\n0\n");
    const run = cli(["count", file]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/^clauses +2$/m);
    expect(run.stderr).toBe(
      `${file}:5:1: warning: the lone 0 after the 2 declared clauses was read as an end marker, not as an empty clause; hint: remove the line, or raise the header's CLAUSES count if an empty clause was meant\n`,
    );
  });

  it("names the non-ASCII byte that stands at the column given, in both readers", () => {
    for (const read of [scanDimacs, readWithGrammarSync]) {
      const err = read(Buffer.from("p cnf 3 1\n1 2x\xc3\xa9 9\n", "latin1")).diagnostics.find((d) => d.severity === "error")!;
      expect({ line: err.line, column: err.column }).toEqual({ line: 2, column: 5 });
      expect(err.message).toBe("expected plain ASCII DIMACS text but found the byte 0xc3");
    }
  });

  it("names standard input as <stdin>", () => {
    const run = cli(["count", "-"], "p cnf 1 1\n2 0\n");
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/^<stdin>:2:1: error: expected a variable in 1\.\.1 .*hint: declare at least 2 variables/);
  });

  it("says both clause numbers when the count is wrong", () => {
    const r = scanDimacs(Buffer.from("p cnf 2 3\n1 0\n"));
    expect(r.diagnostics[0]!.message).toContain("expected 3 clauses");
    expect(r.diagnostics[0]!.message).toContain("found 1");
  });

  it("stops reading an endless device at the first chunk holding a NUL byte, and reports that NUL", () => {
    const started = Date.now();
    const run = cli(["count", "/dev/zero"]);
    expect(run.code).toBe(2);
    expect(run.stderr).toBe("/dev/zero:1:1: error: expected DIMACS text but found a NUL byte; hint: the input looks binary; give a plain-text DIMACS CNF file\n");
    const random = cli(["count", "/dev/urandom"]);
    expect(random.code).toBe(2);
    expect(random.stderr).toMatch(/^\/dev\/urandom:\d+:\d+: error: .+; hint: .+\n$/);
    const circuit = cli(["verify", "examples/launch-rota.cnf", "--circuit", "/dev/zero"]);
    expect(circuit.code).toBe(2);
    expect(Date.now() - started).toBeLessThan(60_000);
  });

  it("says a folder given as the input, or as standard input, is a folder", () => {
    expect(cli(["count", dir]).stderr).toBe(`${dir}:1:1: error: cannot read the input (it is a folder); hint: give a DIMACS CNF file, not a folder\n`);
    const fd = openSync(dir, "r");
    try {
      for (const args of [["count", "-"], ["verify", "examples/launch-rota.cnf", "--circuit", "-"]]) {
        const r = spawnSync(process.execPath, ["dist/src/cli/bin.js", ...args], { cwd: ROOT, stdio: [fd, "pipe", "pipe"], encoding: "utf8" });
        expect(r.status).toBe(2);
        expect(r.stderr).toMatch(/\(it is a folder\); hint: /);
      }
    } finally {
      closeSync(fd);
    }
  });

  it("reports a missing file as bad input, without a stack trace", () => {
    const run = cli(["count", join(dir, "nope.cnf")]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/nope\.cnf:1:1: error: cannot read the input \(no such file\); hint: check the path/);
  });
});
