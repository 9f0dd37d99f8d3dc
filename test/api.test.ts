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
