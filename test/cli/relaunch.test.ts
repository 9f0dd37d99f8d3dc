// A command over a large input runs in a child process with glibc's mmap threshold fixed
// (src/cli/relaunch.ts): when that happens, and that the child's end is the command's end.
import { spawn } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { RELAUNCH_FROM_BYTES, shouldRelaunch } from "../../dist/src/cli/relaunch.js";
import { cli, ROOT } from "../helpers/cli.js";

const dir = mkdtempSync(join(tmpdir(), "cg-relaunch-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A satisfiable formula of at least `bytes` bytes (clauses (x_i or x_{i+1}) repeated over 1,000 variables). */
function formula(bytes: number): string {
  const lines = ["p cnf 1000 0"];
  let size = 0;
  let m = 0;
  while (size < bytes) {
    const i = 1 + (m % 999);
    const line = `${i} ${i + 1} 0`;
    lines.push(line);
    size += line.length + 1;
    m++;
  }
  lines[0] = `p cnf 1000 ${m}`;
  return `${lines.join("\n")}\n`;
}
const small = join(dir, "small.cnf");
const large = join(dir, "large.cnf");
writeFileSync(small, formula(1000));
writeFileSync(large, formula(RELAUNCH_FROM_BYTES + 1000));
const glibc = (process.report?.getReport() as { header?: { glibcVersionRuntime?: string } } | undefined)?.header?.glibcVersionRuntime !== undefined;

describe("when a command starts again", () => {
  it.skipIf(!glibc || process.platform !== "linux")("over an input of 256 KB or more, on Linux with glibc, unless the variable is set", () => {
    const env = {};
    expect(shouldRelaunch(["cost", large], env, "linux")).toBe(true);
    expect(shouldRelaunch(["oracle", small, "--report", large], env, "linux")).toBe(true);
    expect(shouldRelaunch(["cost", small], env, "linux")).toBe(false);
    expect(shouldRelaunch(["cost", "-"], env, "linux")).toBe(false);
    expect(shouldRelaunch(["cost", dir], env, "linux")).toBe(false);
    expect(shouldRelaunch(["cost", join(dir, "missing.cnf")], env, "linux")).toBe(false);
    // The child has the variable: it never starts a third process.
    expect(shouldRelaunch(["cost", large], { MALLOC_MMAP_THRESHOLD_: "1048576" }, "linux")).toBe(false);
    expect(shouldRelaunch(["cost", large], env, "darwin")).toBe(false);
  });
});

describe("the child is the command", () => {
  it("gives the same output and exit codes as the command run in one process", () => {
    const env = { ...process.env, MALLOC_MMAP_THRESHOLD_: "131072" };
    const direct = cli(["cost", large, "--json", "--threads", "1"]);
    expect(direct.code).toBe(0);
    // The same command with the variable already set runs in one process.
    const one = spawnCli(["cost", large, "--json", "--threads", "1"], env);
    return one.then((r) => {
      expect(r.code).toBe(0);
      expect(r.stdout).toBe(direct.stdout);
      const bad = cli(["cost", large, "--no-such-option"]);
      expect(bad.code).toBe(2);
      expect(bad.stdout).toBe("");
      expect(bad.stderr.trim().split("\n")).toHaveLength(1);
    });
  }, 120_000);

  it.skipIf(!glibc || process.platform !== "linux")("runs with the threshold set, and dies of a signal sent to the command", async () => {
    // It waits for the circuit on standard input, which never ends: alive until the signal.
    const child = spawn(process.execPath, [join(ROOT, "dist/src/cli/bin.js"), "verify", large, "--circuit", "-"], { stdio: ["pipe", "ignore", "ignore"] });
    const ended = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((done) => child.on("exit", (c, s) => done({ code: c, signal: s })));
    // The grandchild, as /proc lists the command's children.
    let environ = "";
    const start = Date.now();
    while (Date.now() - start < 20_000 && environ === "") {
      const children = `/proc/${child.pid}/task/${child.pid}/children`;
      const pid = existsSync(children) ? readFileSync(children, "utf8").trim().split(/\s+/)[0] : "";
      if (pid) {
        try {
          environ = readFileSync(`/proc/${pid}/environ`, "utf8");
        } catch {
          environ = "";
        }
      }
      if (environ === "") await new Promise((r) => setTimeout(r, 20));
    }
    child.kill("SIGTERM");
    const r = await ended;
    expect(environ.split("\0")).toContain("MALLOC_MMAP_THRESHOLD_=1048576");
    expect(r.signal === "SIGTERM" || r.code === 143).toBe(true);
  }, 60_000);
});

describe("the child without its parent", () => {
  it.skipIf(!glibc || process.platform !== "linux")("stops and writes nothing when the command's process is killed outright", async () => {
    const out = mkdtempSync(join(dir, "kill-"));
    // It waits for a circuit on standard input, then would write a report: killed before.
    const child = spawn(process.execPath, [join(ROOT, "dist/src/cli/bin.js"), "verify", large, "--circuit", "-"], { stdio: ["pipe", "ignore", "ignore"] });
    const ended = new Promise<void>((done) => child.on("exit", () => done()));
    let grandchild = "";
    const start = Date.now();
    while (Date.now() - start < 20_000 && grandchild === "") {
      const children = `/proc/${child.pid}/task/${child.pid}/children`;
      grandchild = existsSync(children) ? readFileSync(children, "utf8").trim().split(/\s+/)[0] ?? "" : "";
      if (grandchild === "") await new Promise((r) => setTimeout(r, 20));
    }
    expect(grandchild).not.toBe("");
    child.kill("SIGKILL");
    await ended;
    // The grandchild notices at once (its channel closes) and is gone.
    const gone = Date.now();
    while (Date.now() - gone < 10_000 && existsSync(`/proc/${grandchild}`)) await new Promise((r) => setTimeout(r, 20));
    expect(existsSync(`/proc/${grandchild}`)).toBe(false);
    expect(readdirSync(out)).toEqual([]);
  }, 60_000);
});

function spawnCli(args: string[], env: NodeJS.ProcessEnv): Promise<{ code: number | null; stdout: string }> {
  return new Promise((done) => {
    const c = spawn(process.execPath, [join(ROOT, "dist/src/cli/bin.js"), ...args], { env, stdio: ["ignore", "pipe", "ignore"] });
    let out = "";
    c.stdout.setEncoding("utf8");
    c.stdout.on("data", (d: string) => (out += d));
    c.on("close", (code) => done({ code, stdout: out }));
  });
}
