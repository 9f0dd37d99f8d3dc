// One shape for every user-caused failure: exit 2, nothing on standard output, and one line on
// standard error, "WHERE: error: WHAT; hint: WHAT TO DO" (notes and warnings may precede it).
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const dir = mkdtempSync(join(tmpdir(), "cg-err-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const bad = join(dir, "bad.cnf");
writeFileSync(bad, "p cnf 2 1\n1 3 0\n");
const circuit = join(dir, "c.json");
writeFileSync(circuit, '{"format":"clausegate-circuit","version":1,"comments":[],"qubits":2,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":2}],"gates":[{"op":"gphase","qubits":[],"angle":"x"}]}\n');
const EX = "examples/allotment-pair.cnf";

const cases: [string, string[], string?][] = [
  ["no command", []],
  ["unknown command", ["frobnicate"]],
  ["unknown option", ["oracle", EX, "--frobnicate"]],
  ["option without its value", ["oracle", EX, "-o"]],
  ["value for a flag", ["oracle", EX, "--verify=yes"]],
  ["two inputs", ["count", EX, EX]],
  ["no input", ["plan"]],
  ["missing file", ["count", join(dir, "missing.cnf")]],
  ["malformed formula", ["oracle", bad]],
  ["malformed formula on stdin", ["cost", "-"], "p cnf 1 1\nx 0\n"],
  ["bad choice", ["oracle", EX, "--basis", "cliffordt"]],
  ["bad number", ["count", EX, "--max-variables", "many"]],
  ["bad solutions", ["plan", EX, "--solutions", "lots"]],
  ["draw without -o", ["draw", EX]],
  ["draw --iterations without --search", ["draw", EX, "--iterations", "2", "-o", join(dir, "d.svg")]],
  ["search with --kind", ["search", EX, "--kind", "flag"]],
  ["verify --circuit with a compile option", ["verify", EX, "--circuit", circuit, "--basis", "mcx"]],
  ["malformed circuit", ["verify", EX, "--circuit", circuit]],
  ["output into a missing folder", ["oracle", EX, "-o", join(dir, "no/such/folder.qasm")]],
  ["output onto the input", ["oracle", EX, "-o", EX]],
  ["output onto a folder", ["oracle", EX, "-o", dir]],
  ["qasm2 of a multi-controlled gate", ["oracle", EX, "--format", "qasm2", "--basis", "mcx"]],
  ["too many iterations", ["search", EX, "--iterations", "99999999"]],
  ["count refused", ["count", "-", "--max-variables", "2"], "p cnf 4 2\n1 2 0\n3 4 0\n"],
  ["help for an unknown command", ["help", "frobnicate"]],
  ["structure of a malformed formula", ["structure", bad]],
  ["forecast with a bad error rate", ["forecast", EX, "--error-rate", "lots"]],
  // The search-register options (issue 9) on every command that takes them.
  ...["oracle", "verify", "cost", "plan", "search", "forecast"].map((c): [string, string[]] => [`${c} --register with a bad value`, [c, EX, "--register", "half"]]),
  ["draw --register with a bad value", ["draw", EX, "--register", "half", "-o", join(dir, "r.svg")]],
  ["--no-structure with a value", ["oracle", EX, "--no-structure=1"]],
  ["--reduce against --register full", ["plan", EX, "--reduce", "--register", "full"]],
  ["search --complete of the wrong width", ["search", EX, "--complete", "111"]],
  ["search --complete of other digits", ["search", EX, "--complete", "2x"]],
  ["search --complete with --iterations", ["search", EX, "--complete", "10", "--iterations", "1"]],
  ["search --seed without --shots", ["search", EX, "--seed", "2"]],
  ["search --shots of nothing", ["search", EX, "--shots", "0"]],
  ["search --shots over a register too wide to simulate", ["search", "examples/shed-lock.cnf", "--register", "full", "--shots", "2", "--iterations", "1"]],
  ["oracle below the smallest budget", ["oracle", EX, "--max-qubits", "3"]],
  ["verify below the smallest budget", ["verify", EX, "--max-qubits", "3"]],
  ["cost below the smallest budget", ["cost", EX, "--max-qubits", "3"]],
  ["search below the smallest budget", ["search", EX, "--max-qubits", "3", "--iterations", "1"]],
  ["draw below the smallest budget", ["draw", EX, "--max-qubits", "3", "-o", join(dir, "b.svg")]],
  ["a named construction over the budget", ["oracle", EX, "--construction", "fanout-1", "--max-qubits", "5"]],
  ["no such construction", ["oracle", EX, "--construction", "blocks-1"]],
  ["strategy and construction", ["oracle", EX, "--strategy", "lean", "--construction", "wide"]],
  ["prefer with a construction", ["oracle", EX, "--prefer", "t-depth", "--construction", "wide"]],
  ["bad budget", ["oracle", EX, "--max-qubits", "0"]],
  ["cost --plot without --front", ["cost", EX, "--plot", join(dir, "f.svg")]],
  ["cost --front with a budget", ["cost", EX, "--front", "--max-qubits", "9"]],
  // The budget options on forecast (issue 12 takes them), and with the register options.
  ["forecast below the smallest budget", ["forecast", EX, "--max-qubits", "3"]],
  ["forecast with a strategy and a construction", ["forecast", EX, "--strategy", "lean", "--construction", "wide"]],
  ["forecast with no such construction", ["forecast", EX, "--construction", "blocks-1"]],
  ["oracle below the smallest free-register budget", ["oracle", EX, "--register", "free", "--max-qubits", "1"]],
  ["cost --front --register with a bad value", ["cost", EX, "--front", "--register", "half"]],
];

describe("error shape", () => {
  for (const [name, args, input] of cases) {
    it(name, () => {
      const r = cli(args, input);
      expect(r.code, r.stderr).toBe(2);
      expect(r.stdout).toBe("");
      if (args.length === 0) {
        expect(r.stderr).toMatch(/^clausegate \S+: compile DIMACS CNF/); // no command: the usage, on stderr
        return;
      }
      const lines = r.stderr.split("\n").filter((l) => l !== "" && !/: (note|warning): /.test(l));
      expect(lines, r.stderr).toHaveLength(1);
      expect(lines[0]).toMatch(/^\S.*?: error: .+; hint: .+$/);
      expect(r.stderr).not.toMatch(/\n\s+at |internal error/);
    });
  }
});

describe("a command's errors name the command", () => {
  const named: [string[], string][] = [
    [["search", EX, "--iterations", "1048577"], "clausegate search: error: --iterations expects a whole number in 0..1048576 but got '1048577'; hint: give a value in that range\n"],
    [["oracle", EX, "--format", "qasm4"], "clausegate oracle: error: --format expects one of qasm3, qasm2, json but got 'qasm4'; hint: pick one of those\n"],
    [["count", EX, "--threads", "0"], "clausegate count: error: --threads expects a whole number in 1..256 but got '0'; hint: give a value in that range\n"],
    [["oracle", EX, "--strategy", "lean", "--construction", "wide"], "clausegate oracle: error: --strategy and --construction both name the construction; hint: give one of them (--construction wide is --strategy wide)\n"],
  ];
  for (const [args, line] of named) {
    it(args.slice(0, 1).concat(args.slice(2)).join(" "), () => {
      const r = cli(args);
      expect(r.code).toBe(2);
      expect(r.stderr).toBe(line);
    });
  }
  it("an unknown command is still clausegate's own error", () => {
    expect(cli(["frobnicate"]).stderr).toMatch(/^clausegate: error: unknown command 'frobnicate'/);
  });
});
