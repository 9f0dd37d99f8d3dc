// ESLint flat config. Its main job is the import-direction rule: every pipeline stage (one folder of
// src/) may import only the stages upstream of it, so the pipeline stays one-way (DEVELOPERS.md,
// "Architecture"). Imports inside a folder are never restricted.
import { readdirSync } from "node:fs";
import { defineConfig } from "eslint/config";
import tseslint from "typescript-eslint";

/**
 * What each stage may import besides itself. diag/ and util/ import nothing and anything may import
 * them (they sit upstream of every stage), so they are added to every list below.
 * The top-level files are separate: compile.ts, index.ts (the public API) and internal.ts (the public
 * API plus the internals the command line uses) may import every stage, nothing imports cli/, and
 * cli/ imports internal.ts only.
 */
const leaves = ["diag", "util"];
const mayImport = {
  diag: [],
  util: [],
  cnf: [],
  ir: [],
  structure: ["cnf"],
  count: ["cnf", "structure"],
  synth: ["cnf", "ir", "structure"],
  passes: ["ir"],
  emit: ["ir"],
  cost: ["ir", "synth", "passes", "emit", "cnf"],
  sim: ["ir", "cnf", "structure"],
  // The prover: symbolic simulation of circuits (ir), the formula and the solver (cnf), and the
  // simulators to confirm a counterexample on one input (sim).
  prove: ["ir", "cnf", "sim", "structure"],
  search: ["cnf", "ir", "synth", "count"],
  draw: ["ir", "search"],
  // The physical model takes plain numbers; cnf only for the classical evaluator's rate.
  forecast: ["cnf"],
  // The command line uses the library through its own entry (internal.ts), never a stage directly.
  cli: [],
};
const topLevel = ["index", "compile", "internal"];

// A stage folder missing from the table would go unchecked: refuse to lint until it is added.
const unlisted = readdirSync(new URL("./src", import.meta.url), { withFileTypes: true })
  .filter((e) => e.isDirectory() && !(e.name in mayImport))
  .map((e) => e.name);
if (unlisted.length > 0) {
  throw new Error(`eslint.config.js: add src/${unlisted.join(", src/")} to the import table (mayImport)`);
}

const stages = Object.keys(mayImport);
const escape = (s) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/**
 * The rules for the files of one folder at one depth below src/. `up` is the relative prefix that
 * reaches src/ from there ("../" for src/emit/x.ts, "../../" for src/emit/qasm3/x.ts), so a pattern
 * matches exactly the specifiers that resolve into a forbidden folder or file.
 */
function restrict(files, up, forbiddenStages, forbiddenTop, allowedText) {
  const targets = [...forbiddenStages.map((s) => `${escape(s)}/`), ...forbiddenTop.map((f) => `${escape(f)}\\.js$`)];
  if (targets.length === 0) return [];
  const regex = `^${escape(up)}(?:${targets.join("|")})`;
  const message = `imports point downstream only: ${allowedText} (DEVELOPERS.md, "Architecture")`;
  return [
    {
      files,
      rules: {
        "no-restricted-imports": ["error", { patterns: [{ regex, message }] }],
        // no-restricted-imports does not look at import(): the same check for dynamic imports.
        "no-restricted-syntax": ["error", { selector: `ImportExpression > Literal.source[value=/${regex.replaceAll("/", "\\/")}/]`, message }],
      },
    },
  ];
}

const direction = [];
for (const stage of stages) {
  const allowed = stage === "diag" || stage === "util" ? [] : [...leaves, ...mayImport[stage]];
  const forbidden = stages.filter((s) => s !== stage && !allowed.includes(s));
  const forbiddenTop = stage === "cli" ? ["compile", "index"] : topLevel;
  const text =
    stage === "cli"
      ? "src/cli imports the library through internal.ts only, not index.ts, compile.ts or a stage folder"
      : `src/${stage} may import ${allowed.length > 0 ? allowed.join(", ") : "nothing else in src"}`;
  for (let depth = 1; depth <= 3; depth++) {
    const dirs = "/*".repeat(depth);
    direction.push(...restrict([`src/${stage}${dirs}.ts`], "../".repeat(depth), forbidden, forbiddenTop, text));
  }
}
// compile.ts may import every stage; index.ts every stage and compile.ts; neither imports the CLI.
// (The later entry wins for compile.ts, which both globs match.)
direction.push(...restrict(["src/*.ts"], "./", ["cli"], [], "top-level files may import every stage but not cli/"));
direction.push(...restrict(["src/compile.ts"], "./", ["cli"], ["index"], "compile.ts may import every stage but not cli/ or index.ts"));

export default defineConfig(
  { ignores: ["dist/", "node_modules/", "src/cnf/generated/", "bench/out/", "coverage/", "docs-site/"] },
  {
    files: ["**/*.ts"],
    extends: [tseslint.configs.recommended],
    // tsc already reports unused locals and parameters (noUnusedLocals, noUnusedParameters), with its
    // "_name" convention for parameters an interface requires: one checker is enough.
    rules: { "@typescript-eslint/no-unused-vars": "off" },
  },
  ...direction,
);
