// Runs `npm run build` when dist/ is missing or older than any source, grammar or config file.
import { execSync } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
import { join } from "node:path";

const root = new URL("..", import.meta.url).pathname;
const stamp = join(root, "dist", ".build-stamp");

function newest(path) {
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  let t = 0;
  for (const e of readdirSync(path)) if (e !== "generated") t = Math.max(t, newest(join(path, e)));
  return t;
}

const inputs = ["src", "grammar", "bench", "tsconfig.json", "package.json"].map((p) => join(root, p)).filter(existsSync);
const sourceTime = Math.max(...inputs.map(newest));
if (!existsSync(stamp) || statSync(stamp).mtimeMs < sourceTime) {
  execSync("npm run build", { cwd: root, stdio: "inherit" });
}
