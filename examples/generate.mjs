// Generates the example formulas of examples/README.md. Deterministic: rerun to reproduce them.
//   node examples/generate.mjs
import { writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const here = dirname(fileURLToPath(import.meta.url));

/** One-hot encoding helpers: variable of (item, choice) is 1 + item * choices + choice. */
function oneHot(items, choices) {
  const v = (i, c) => 1 + i * choices + c;
  const clauses = [];
  for (let i = 0; i < items; i++) {
    clauses.push(Array.from({ length: choices }, (_, c) => v(i, c))); // at least one
    for (let a = 0; a < choices; a++) for (let b = a + 1; b < choices; b++) clauses.push([-v(i, a), -v(i, b)]); // at most one
  }
  return { v, clauses };
}

function write(name, comments, variables, clauses) {
  const lines = comments.map((c) => `c ${c}`);
  lines.push(`p cnf ${variables} ${clauses.length}`);
  for (const c of clauses) lines.push(`${c.join(" ")} 0`);
  writeFileSync(join(here, name), `${lines.join("\n")}\n`);
}

// 1. Community allotment: four raised beds in a row, each planted with exactly one of
//    beans (0), onions (1), kale (2). Neighbouring beds never hold the same crop (pests spread
//    along a row), beans never stand next to onions (onions stunt beans), and bed 1 lies in the
//    shade of the shed, where kale will not do well.
{
  const crops = ["beans", "onions", "kale"];
  const { v, clauses } = oneHot(4, 3);
  for (let i = 0; i + 1 < 4; i++) {
    for (let c = 0; c < 3; c++) clauses.push([-v(i, c), -v(i + 1, c)]);
    clauses.push([-v(i, 0), -v(i + 1, 1)], [-v(i, 1), -v(i + 1, 0)]);
  }
  clauses.push([-v(0, 2)]);
  write("allotment-row.cnf", [
    "clausegate example: four raised beds in a row, one crop each (beans, onions, kale)",
    "variable 1 + 3*(bed-1) + crop is true when that bed holds that crop",
    `crops: ${crops.map((c, i) => `${i}=${c}`).join(" ")}`,
    "rules: one crop per bed; neighbours differ; beans never beside onions; no kale in bed 1",
  ], 12, clauses);
}

// 2. The same allotment cut down to two beds and two crops, small enough to draw and simulate.
{
  const { v, clauses } = oneHot(2, 2);
  clauses.push([-v(0, 0), -v(1, 0)], [-v(0, 1), -v(1, 1)]);
  write("allotment-pair.cnf", [
    "clausegate example: two neighbouring beds, crops beans (0) and onions (1), neighbours differ",
    "variable 1 + 2*(bed-1) + crop is true when that bed holds that crop",
  ], 4, clauses);
}

// 3. The herb spiral: three beds in a ring (each bed touches the other two) and only two crops,
//    neighbours must differ: impossible (an odd ring cannot be two-coloured).
{
  const { v, clauses } = oneHot(3, 2);
  for (const [a, b] of [[0, 1], [1, 2], [2, 0]]) for (let c = 0; c < 2; c++) clauses.push([-v(a, c), -v(b, c)]);
  write("herb-spiral.cnf", [
    "clausegate example: three beds in a ring, two crops, neighbours differ: unsatisfiable",
    "variable 1 + 2*(bed-1) + crop is true when that bed holds that crop",
  ], 6, clauses);
}

// 4. The harbour launch rota: four volunteers (Ada, Bram, Cleo, Dev) and three sailings. Each
//    sailing needs at least two of them aboard; nobody crews all three sailings; Bram cannot
//    make the first sailing; Ada and Cleo, who share a car, crew the last sailing together or
//    not at all. Variable 1 + 3*volunteer + sailing.
{
  const people = 4;
  const v = (p, s) => 1 + 3 * p + s;
  const clauses = [];
  for (let s = 0; s < 3; s++) {
    // at least two aboard: every set of people-1 volunteers has one of them aboard
    for (let out = 0; out < people; out++) {
      clauses.push(Array.from({ length: people }, (_, p) => p).filter((p) => p !== out).map((p) => v(p, s)));
    }
  }
  for (let p = 0; p < people; p++) clauses.push([-v(p, 0), -v(p, 1), -v(p, 2)]);
  clauses.push([-v(1, 0)]);
  clauses.push([-v(0, 2), v(2, 2)], [v(0, 2), -v(2, 2)]);
  write("launch-rota.cnf", [
    "clausegate example: harbour launch rota, volunteers Ada(0) Bram(1) Cleo(2) Dev(3), sailings 0..2",
    "variable 1 + 3*volunteer + sailing is true when that volunteer crews that sailing",
    "rules: two or more aboard each sailing; nobody crews all three; Bram misses sailing 0;",
    "Ada and Cleo crew sailing 2 together or not at all",
  ], 12, clauses);
}
