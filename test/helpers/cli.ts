/** Runs the built CLI as a user would: a child process, with exit code and both streams. */
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";

export const ROOT = fileURLToPath(new URL("../..", import.meta.url));
const BIN = fileURLToPath(new URL("../../dist/src/cli/bin.js", import.meta.url));

export interface Run {
  code: number;
  stdout: string;
  stderr: string;
}

export function cli(args: string[], input?: string | Buffer, cwd = ROOT): Run {
  const r = spawnSync(process.execPath, [BIN, ...args], {
    input: input ?? "",
    cwd,
    encoding: "utf8",
    env: { ...process.env, NO_COLOR: "1" },
    maxBuffer: 1 << 28,
  });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}
