// The public surface: what a toolchain imports from "clausegate" (package.json "exports" -> index).
// Listed here so that growing it is a decision, not a side effect of the command line's needs.
import { describe, expect, it } from "vitest";
import * as api from "../dist/src/index.js";

const PUBLIC = [
  // read and write formulas, count models
  "readDimacs", "readDimacsFile", "readDimacsWithGrammar", "writeDimacs", "cnfFromClauses", "clausesOf", "formatDiagnostic", "countModels",
  // compile
  "compileOracle", "compileSearch", "completeModel", "registerOf", "DEFAULT_ORACLE_OPTIONS", "GATE_KINDS", "planConstruction",
  // emit and read back
  "emitQasm3", "emitQasm2", "emitJson", "qasm2Problem", "collect", "readCircuit",
  // verify
  "verifyOracle", "proveOracle",
  // cost
  "oracleResources", "costTable", "searchCosts", "countCircuit", "costFront", "chooseConstruction",
  // plan
  "planSearch", "bbhtRounds", "bbhtExpectedCalls", "EXACT_BITS",
  // forecast
  "forecastSearch", "DEFAULT_MACHINE", "LOGICAL_ERROR_MODELS",
  // structure
  "recoverStructure", "extendAssignment", "satisfiesStructure", "evaluateStructured",
];

describe("public API", () => {
  it("exports exactly the documented names", () => {
    expect(Object.keys(api).sort()).toEqual([...PUBLIC].sort());
  });
  it("keeps simulator and pass internals out of it", () => {
    for (const internal of ["runSparse", "simulateClassical", "PassError", "reduceSearch", "drawCircuitSvg", "evaluateWords"]) {
      expect(Object.keys(api)).not.toContain(internal);
    }
  });
  it("compiles, emits and verifies through the public names alone", async () => {
    const { cnf } = api.readDimacs("p cnf 3 2\n1 -2 0\n2 3 0\n");
    const oracle = api.compileOracle(cnf!, { basis: "clifford+t", uncompute: "measured" });
    expect(api.collect((s) => api.emitQasm3(oracle.circuit, s))).toMatch(/^OPENQASM 3\.0;/);
    const r = await api.verifyOracle(cnf!, oracle.circuit, { kind: "phase" });
    expect(r.verified).toBe(true);
  });
});

describe("compile progress", () => {
  it("tells rising fractions up to 1 through planning, synthesis, lowering and each pass, and records no watcher in the options", () => {
    const { cnfFromClauses, compileOracle } = api;
    const cnf = cnfFromClauses(4, [[1, 2, -3], [-1, 3, 4], [2, -4]]);
    const seen: number[] = [];
    const oracle = compileOracle(cnf, { basis: "clifford+t", onProgress: (f) => seen.push(f) });
    expect(seen.length).toBeGreaterThan(5);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!).toBeGreaterThanOrEqual(seen[i - 1]!);
    expect(seen[seen.length - 1]).toBe(1);
    expect("onProgress" in oracle.options).toBe(false);
    // Watching changes nothing of the circuit.
    expect(emitQasm3String(oracle.circuit)).toBe(emitQasm3String(compileOracle(cnf, { basis: "clifford+t" }).circuit));
  });
});

function emitQasm3String(c: api.Circuit): string {
  let s = "";
  api.emitQasm3(c, (chunk) => (s += chunk));
  return s;
}
