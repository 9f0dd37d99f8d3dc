// Regenerates the ANTLR reader from grammar/*.g4 into src/cnf/generated/ (ignored by git).
// antlr-ng is the ANTLR tool written in TypeScript, so no Java is needed.
import { execFileSync } from "node:child_process";
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const root = join(dirname(fileURLToPath(import.meta.url)), "..");
const out = join(root, "src", "cnf", "generated");
rmSync(out, { recursive: true, force: true });
mkdirSync(out, { recursive: true });
const tool = join(root, "node_modules", "antlr-ng", "dist", "cli", "runner.js");
execFileSync(
  process.execPath,
  [tool, "-Dlanguage=TypeScript", "--generate-listener", "-o", out,
    join(root, "grammar", "DimacsLexer.g4"), join(root, "grammar", "DimacsParser.g4")],
  { stdio: "inherit" },
);
const banner = "// @ts-nocheck\n// Generated from grammar/*.g4 by antlr-ng: do not edit. Run `npm run generate`.\n";
for (const f of readdirSync(out)) {
  if (!f.endsWith(".ts")) continue;
  const p = join(out, f);
  writeFileSync(p, banner + readFileSync(p, "utf8"));
}
