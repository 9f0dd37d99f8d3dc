// Writing outputs safely: one fault class per test (issue: devices, links, FIFOs, inputs,
// clashing outputs, long names, file modes, standard-output failures, signals).
import { spawn, spawnSync } from "node:child_process";
import {
  chmodSync, closeSync, existsSync, linkSync, lstatSync, mkdirSync, mkdtempSync, openSync, readdirSync, readFileSync, rmSync, statSync, symlinkSync,
  writeFileSync,
} from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { cli, ROOT } from "../helpers/cli.js";

const BIN = join(ROOT, "dist/src/cli/bin.js");
const EXAMPLE = join(ROOT, "examples/allotment-pair.cnf");
const dir = mkdtempSync(join(tmpdir(), "cg-out-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const oneLine = (s: string): void => {
  const lines = s.split("\n").filter((l) => l !== "" && !/: note: /.test(l));
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(/: error: .*; hint: /);
  expect(s).not.toMatch(/\n\s+at /);
};
const leftovers = (d: string): string[] => readdirSync(d).filter((f) => f.endsWith(".tmp"));

describe("output destinations", () => {
  // A character device of the machine (a tool run as root elsewhere may have replaced one of them).
  const device = ["/dev/full", "/dev/zero", "/dev/null"].find((d) => existsSync(d) && statSync(d).isCharacterDevice());
  it.skipIf(device === undefined)("refuses a character device rather than replacing it", () => {
    const r = cli(["oracle", EXAMPLE, "-o", device!]);
    expect(r.code).toBe(2);
    oneLine(r.stderr);
    expect(r.stderr).toMatch(/refusing to replace a character device/);
    expect(statSync(device!).isCharacterDevice()).toBe(true);
  });
  it("refuses a FIFO and a folder", () => {
    const fifo = join(dir, "pipe");
    spawnSync("mkfifo", [fifo]);
    const r = cli(["oracle", EXAMPLE, "-o", fifo]);
    expect(r.code).toBe(2);
    oneLine(r.stderr);
    expect(lstatSync(fifo).isFIFO()).toBe(true);
    const f = cli(["oracle", EXAMPLE, "-o", dir]);
    expect(f.code).toBe(2);
    expect(f.stderr).toMatch(/refusing to replace a folder/);
  });
  it("writes through a symbolic link to a regular file and keeps the link", () => {
    const real = join(dir, "real.qasm");
    const link = join(dir, "link.qasm");
    writeFileSync(real, "old\n");
    symlinkSync(real, link);
    const r = cli(["oracle", EXAMPLE, "-o", link]);
    expect(r.code).toBe(0);
    expect(lstatSync(link).isSymbolicLink()).toBe(true);
    expect(readFileSync(real, "utf8")).toMatch(/^OPENQASM 3\.0;/);
  });
  it("treats -o - as standard output", () => {
    const r = cli(["oracle", EXAMPLE, "-o", "-"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^OPENQASM 3\.0;/);
  });
  it("refuses to overwrite the input, and two outputs on one path, writing nothing", () => {
    const copy = join(dir, "input.cnf");
    writeFileSync(copy, readFileSync(EXAMPLE));
    const before = readFileSync(copy, "utf8");
    const r = cli(["oracle", copy, "-o", copy]);
    expect(r.code).toBe(2);
    oneLine(r.stderr);
    expect(r.stderr).toMatch(/would replace the input/);
    expect(readFileSync(copy, "utf8")).toBe(before);
    const same = join(dir, "same.qasm");
    const s = cli(["oracle", EXAMPLE, "-o", same, "--report", same]);
    expect(s.code).toBe(2);
    expect(s.stderr).toMatch(/name the same file/);
    expect(existsSync(same)).toBe(false);
    expect(leftovers(dir)).toEqual([]);
  });
  it("refuses two outputs naming one file through a linked folder or a hard link", () => {
    const sub = join(dir, "clash");
    mkdirSync(sub);
    symlinkSync(".", join(sub, "self"));
    const r = cli(["oracle", EXAMPLE, "-o", join(sub, "c.qasm"), "--report", join(sub, "self", "c.qasm")]);
    expect(r.code).toBe(2);
    oneLine(r.stderr);
    expect(r.stderr).toMatch(/name the same file/);
    expect(existsSync(join(sub, "c.qasm"))).toBe(false);
    writeFileSync(join(sub, "a"), "x\n");
    linkSync(join(sub, "a"), join(sub, "b"));
    const h = cli(["oracle", EXAMPLE, "-o", join(sub, "a"), "--report", join(sub, "b")]);
    expect(h.code).toBe(2);
    expect(h.stderr).toMatch(/name the same file/);
    expect(readFileSync(join(sub, "a"), "utf8")).toBe("x\n");
    expect(leftovers(sub)).toEqual([]);
  });
  it("refuses an empty path, for every output of every command that writes files, in one line naming the command", () => {
    const cases: [string[], string][] = [
      [["oracle", EXAMPLE, "-o", ""], "clausegate oracle: error: the path given for the circuit is empty"],
      [["oracle", EXAMPLE, "--report", ""], "clausegate oracle: error: the path given for the report is empty"],
      [["search", EXAMPLE, "--iterations", "1", "-o", ""], "clausegate search: error: the path given for the circuit is empty"],
      [["search", EXAMPLE, "--iterations", "1", "--report", ""], "clausegate search: error: the path given for the report is empty"],
      [["draw", EXAMPLE, "-o", ""], "clausegate draw: error: the path given for the drawing is empty"],
      [["cost", EXAMPLE, "--front", "--plot", ""], "clausegate cost: error: the path given for the plot is empty"],
      [["plan", EXAMPLE, "--plot", ""], "clausegate plan: error: the path given for the plot is empty"],
      [["forecast", EXAMPLE, "--plot", ""], "clausegate forecast: error: the path given for the plot is empty"],
    ];
    for (const [args, start] of cases) {
      const r = cli(args);
      expect(r.code, args.join(" ")).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toBe(`${start}; hint: name a file, or - for standard output\n`);
    }
  });
  it("checks every destination before reading the input: a bad one is refused even when the input is malformed or missing", () => {
    const bad = join(dir, "malformed.cnf");
    writeFileSync(bad, "p cnf 2 1\n1 3 0\n");
    const folder = cli(["oracle", bad, "-o", dir]);
    expect(folder.stderr).toBe(`${dir}: error: refusing to replace a folder with the circuit; hint: name a regular file inside it\n`);
    const missing = cli(["search", join(dir, "absent.cnf"), "--iterations", "1", "--report", join(dir, "no", "such", "r.json")]);
    expect(missing.stderr).toBe(`${join(dir, "no", "such", "r.json")}: error: cannot write the report (no such folder); hint: check that the folder exists, is writable and has space\n`);
    const same = cli(["oracle", bad, "-o", join(dir, "s.qasm"), "--report", join(dir, "s.qasm")]);
    expect(same.stderr).toMatch(/^\S+s\.qasm: error: the \w+ and the \w+ name the same file; hint: /);
    const input = cli(["draw", bad, "-o", bad]);
    expect(input.stderr).toBe(`${bad}: error: the drawing would replace the input ${bad}; hint: write it to another file\n`);
    for (const r of [folder, missing, same, input]) expect(r.code).toBe(2);
  });
  it.skipIf(!existsSync("/proc/self"))("gives the errno's own meaning when the folder exists but no file can be made there (/proc)", () => {
    const r = cli(["oracle", EXAMPLE, "-o", "/proc/cg-x.qasm"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^\/proc\/cg-x\.qasm: error: cannot write the circuit \(no such file or directory \(ENOENT\)\); hint: /m);
    expect(r.stderr).not.toMatch(/no such folder/);
  });
  it("writes a legal 255-byte file name (short temporary names)", () => {
    const name = join(dir, "o".repeat(250) + ".qasm");
    const r = cli(["oracle", EXAMPLE, "-o", name]);
    expect(r.stderr).not.toMatch(/error/);
    expect(r.code).toBe(0);
    expect(existsSync(name)).toBe(true);
  });
  it("refuses a name too long for the file system and a path through a regular file: one line, exit 2", () => {
    // 256 bytes: one more than Linux's NAME_MAX (limits.h), for the circuit and for the report.
    for (const args of [["-o", join(dir, "o".repeat(251) + ".qasm")], ["--report", join(dir, "r".repeat(251) + ".json")]]) {
      const r = cli(["oracle", EXAMPLE, ...args]);
      expect(r.code).toBe(2);
      oneLine(r.stderr);
      expect(r.stderr).toMatch(/cannot write the (circuit|report) \(the name is too long\); hint: /);
    }
    const through = cli(["oracle", EXAMPLE, "-o", join(EXAMPLE, "x.qasm")]);
    expect(through.code).toBe(2);
    oneLine(through.stderr);
    expect(through.stderr).toMatch(/a part of the path is not a folder/);
    expect(leftovers(dir)).toEqual([]);
  });
  it("keeps the mode of a file it replaces", () => {
    const out = join(dir, "mode.qasm");
    writeFileSync(out, "old\n");
    chmodSync(out, 0o640);
    expect(cli(["oracle", EXAMPLE, "-o", out]).code).toBe(0);
    expect(statSync(out).mode & 0o777).toBe(0o640);
    expect(readFileSync(out, "utf8")).toMatch(/^OPENQASM/);
  });
  it("reports a failed write to standard output in one line with exit 2", () => {
    const fd = openSync("/dev/full", "w");
    const r = spawnSync(process.execPath, [BIN, "oracle", EXAMPLE], { stdio: ["ignore", fd, "pipe"], encoding: "utf8" });
    closeSync(fd);
    expect(r.status).toBe(2);
    oneLine(r.stderr);
    expect(r.stderr).toMatch(/cannot write to standard output \(ENOSPC\)/);
  });
  it("exits quietly with 0 when the reader of standard output stops early", () => {
    const r = spawnSync("bash", ["-c", `node ${BIN} oracle ${EXAMPLE} --basis clifford+t | head -c 10 >/dev/null; echo "\${PIPESTATUS[0]}"`], { encoding: "utf8" });
    expect(r.stdout.trim()).toBe("0");
    expect(r.stderr).not.toMatch(/error/);
  });
});

describe("standard streams, folders and standard input as destinations", () => {
  const sh = (script: string): { code: number | null; stdout: string; stderr: string } => {
    const r = spawnSync("bash", ["-c", script], { cwd: dir, encoding: "utf8", env: { ...process.env, NO_COLOR: "1" } });
    return { code: r.status, stdout: r.stdout, stderr: r.stderr };
  };
  it("writes -o /dev/stdout through standard output: a file appended to keeps its lines", () => {
    const log = join(dir, "append.log");
    writeFileSync(log, "earlier line\n");
    const r = sh(`node ${BIN} oracle ${EXAMPLE} -o /dev/stdout >> ${log}`);
    expect(r.code).toBe(0);
    const text = readFileSync(log, "utf8");
    expect(text.startsWith("earlier line\nOPENQASM 3.0;")).toBe(true);
  });
  it("refuses -o /dev/stdout beside another output on standard output, and -o /dev/stderr", () => {
    const both = sh(`node ${BIN} search ${EXAMPLE} -o /dev/stdout --report - > ${join(dir, "both.txt")}`);
    expect(both.code).toBe(2);
    oneLine(both.stderr);
    expect(readFileSync(join(dir, "both.txt"), "utf8")).toBe("");
    const err = sh(`node ${BIN} oracle ${EXAMPLE} -o /dev/stderr 2> ${join(dir, "err.txt")}`);
    expect(err.code).toBe(2);
    expect(readFileSync(join(dir, "err.txt"), "utf8")).toMatch(/standard error's file/);
  });
  it.skipIf(!existsSync("/dev/full"))("moves no output file into place when standard output fails", () => {
    const plot = join(dir, "never.svg");
    const r = sh(`node ${BIN} forecast ${EXAMPLE} --plot ${plot} > /dev/full`);
    expect(r.code).toBe(2);
    oneLine(r.stderr);
    expect(existsSync(plot)).toBe(false);
    expect(leftovers(dir)).toEqual([]);
  });
  it.skipIf(!existsSync("/proc/self"))("prints a report for standard output only when every file output was written", () => {
    const r = sh(`node ${BIN} oracle ${EXAMPLE} -o /proc/self/never.qasm --report -`);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
  });
  it.skipIf(!existsSync("/dev/full"))("goes on when standard error cannot be written: the file is written, no temporary file left", () => {
    const out = join(dir, "noerr.qasm");
    // A note on standard error (the formula is simplified) that cannot be shown.
    writeFileSync(join(dir, "dup.cnf"), "p cnf 2 2\n1 2 0\n1 2 0\n");
    const r = sh(`node ${BIN} oracle ${join(dir, "dup.cnf")} -o ${out} 2>/dev/full`);
    expect(r.code).toBe(0);
    expect(readFileSync(out, "utf8")).toMatch(/^OPENQASM 3\.0;/);
    expect(leftovers(dir)).toEqual([]);
  });
  it("keeps the files of a run whose standard output's reader stopped early (exit 0)", () => {
    const report = join(dir, "kept-report.json");
    // A formula whose circuit is more than a pipe holds, so that the reader stops mid-circuit.
    const big = join(dir, "pipe.cnf");
    writeFileSync(big, `p cnf 400 1600\n${Array.from({ length: 1600 }, (_, i) => `${1 + (i % 400)} -${1 + ((i * 7) % 400)} ${1 + ((i * 13 + 5) % 400)} 0`).join("\n")}\n`);
    const r = sh(`node ${BIN} oracle ${big} --basis clifford+t --report ${report} | head -c 10 > /dev/null; echo "\${PIPESTATUS[0]}"`);
    expect(r.stdout.trim()).toBe("0");
    expect(JSON.parse(readFileSync(report, "utf8"))).toHaveProperty("qubits");
    expect(leftovers(dir)).toEqual([]);
  });
  it("refuses a path that names a folder (a trailing slash or dot) instead of replacing the file before it", () => {
    const file = join(dir, "kept.txt");
    writeFileSync(file, "kept\n");
    for (const p of [`${file}/`, `${file}/.`, join(dir, "nofolder") + "/"]) {
      const r = cli(["oracle", EXAMPLE, "-o", p]);
      expect(r.code, p).toBe(2);
      oneLine(r.stderr);
      expect(r.stderr).toMatch(/names a folder/);
    }
    expect(readFileSync(file, "utf8")).toBe("kept\n");
    expect(existsSync(join(dir, "nofolder"))).toBe(false);
  });
  it("refuses to replace the file standard input reads", () => {
    const input = join(dir, "stdin.cnf");
    writeFileSync(input, readFileSync(EXAMPLE));
    const r = sh(`node ${BIN} oracle - -o ${input} < ${input}`);
    expect(r.code).toBe(2);
    oneLine(r.stderr);
    expect(readFileSync(input, "utf8")).toBe(readFileSync(EXAMPLE, "utf8"));
  });
});

describe("signals during a write", () => {
  // A formula whose OpenQASM output takes a few seconds to write, so a signal lands mid-write.
  const big = join(dir, "big.cnf");
  const lines = ["p cnf 3000 60000"];
  let seed = 7;
  const rand = (): number => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
  for (let i = 0; i < 60000; i++) {
    const lits = [0, 1, 2].map((j) => (1 + ((Math.floor(rand() * 1000) * 3 + j) % 3000)) * (rand() < 0.5 ? -1 : 1));
    lines.push(`${lits.join(" ")} 0`);
  }
  writeFileSync(big, `${lines.join("\n")}\n`);

  for (const [signal, code] of [["SIGTERM", 143], ["SIGINT", 130], ["SIGHUP", 129]] as const) {
    it(`${signal}: removes the temporary file and dies of the signal (status ${code} in a shell)`, async () => {
      const out = mkdtempSync(join(dir, "sig-"));
      const child = spawn(process.execPath, [BIN, "oracle", big, "--basis", "clifford+t", "-o", join(out, "o.qasm")], { stdio: "ignore" });
      const ended = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((done) => child.on("exit", (c, s) => done({ code: c, signal: s })));
      // Wait until the temporary file exists (the write has begun), then interrupt.
      const start = Date.now();
      let sawTemporary = false;
      while (Date.now() - start < 60_000) {
        if (readdirSync(out).some((f) => f.endsWith(".tmp"))) {
          sawTemporary = true;
          break;
        }
        await new Promise((r) => setTimeout(r, 20));
      }
      child.kill(signal);
      const r = await ended;
      expect(sawTemporary).toBe(true);
      expect(r.signal === signal || r.code === code).toBe(true);
      expect(readdirSync(out)).toEqual([]);
    }, 120_000);
  }
});
