// A circuit OpenQASM 2.0 cannot express is refused in the one-line shape WHAT; hint: WHAT TO DO,
// with one hint that fits the case (not "the circuit has the circuit has", not two hints).
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

describe("--format qasm2 refusals", () => {
  it("a gate with three controls: the bases that avoid it are the hint", () => {
    const r = cli(["oracle", "examples/launch-rota.cnf", "--basis", "mcx", "--format", "qasm2"]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr.split("\n").filter((l) => l.includes("error"))).toEqual([
      "clausegate oracle: error: cannot write OpenQASM 2.0: the circuit has a 3-controlled X gate (the qelib1.inc of OpenQASM 2.0, Cross et al. 2017, has none beyond ccx); hint: choose --basis toffoli or --basis clifford+t, or write --format qasm3 or json",
    ]);
  });
  it("a circuit with no qubits (a formula of no variables)", () => {
    const r = cli(["oracle", "-", "--format", "qasm2"], "p cnf 0 0\n");
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toBe("clausegate oracle: error: cannot write OpenQASM 2.0: the circuit has no qubits, and OpenQASM 2.0 cannot declare an empty register; hint: write --format qasm3 or json\n");
  });
});
