/**
 * clausegate: compile DIMACS CNF formulas into quantum search oracles.
 *
 * This module is the whole public API. Readers return diagnostics as data and never throw for
 * bad input; they throw only on clausegate's own bugs.
 *
 * @packageDocumentation
 */
export type { Diagnostic, Severity } from "./diag/diagnostic.js";
export { formatDiagnostic } from "./diag/diagnostic.js";
export type { Cnf } from "./cnf/cnf.js";
export { clauseCount, clausesOf, cnfFromClauses } from "./cnf/cnf.js";
export type { ReadResult } from "./cnf/scanner.js";
export type { DimacsInput } from "./cnf/source.js";
export { readDimacs, readDimacsFile } from "./cnf/source.js";
export { writeDimacs } from "./cnf/writer.js";
export { evaluate, evaluateWords } from "./cnf/evaluate.js";
export type { CountOptions, CountResult } from "./cnf/count.js";
export { countModels, DEFAULT_COUNT_LIMIT, MAX_COUNT_LIMIT } from "./cnf/count.js";

export type { Circuit, Register, RegisterRole } from "./ir/circuit.js";
export type { GateKind } from "./ir/kinds.js";
export { GATE_KINDS } from "./ir/kinds.js";
export type { Basis, Uncompute } from "./passes/lower.js";
export type { OracleKind, Strategy, AnyStrategy, SimplifyReport } from "./synth/index.js";
export type { Oracle, OracleOptions } from "./compile.js";
export { compileOracle, DEFAULT_ORACLE_OPTIONS } from "./compile.js";
export type { CostOptions, CostRow, PartCost, SearchCost, ResourceReport, SimplificationReport, CompiledOracle } from "./cost/index.js";
export { costTable, oracleResources, searchCosts } from "./cost/index.js";
export { PassError } from "./passes/runner.js";
export type { Sink } from "./emit/sink.js";
export { collect } from "./emit/sink.js";
export { emitQasm3 } from "./emit/qasm3/index.js";
export { emitQasm2, qasm2Problem } from "./emit/qasm2.js";
export { emitJson, CIRCUIT_FORMAT, CIRCUIT_FORMAT_VERSION } from "./emit/json.js";
export type { CircuitCounts } from "./emit/resources.js";
export { countCircuit } from "./emit/resources.js";
export type { Term, SparseRun, SparseOptions } from "./sim/sparse.js";
export { runSparse, basisTerm, seededRandom, CircuitFault } from "./sim/sparse.js";
export type { Mismatch, OracleCheck } from "./sim/check.js";
export { checkOracleSparse, allAssignments } from "./sim/check.js";
export type { ClassicalRun } from "./sim/bitsim.js";
export { simulateClassical } from "./sim/bitsim.js";
export type { VerifyOptions, VerifyResult, Counterexample } from "./sim/verify.js";
export { verifyOracle, DEFAULT_EXHAUSTIVE_LIMIT, MAX_EXHAUSTIVE_LIMIT } from "./sim/verify.js";
export type { CircuitReadResult } from "./ir/read.js";
export type { SearchPlan, ScheduleRound } from "./search/plan.js";
export { planSearch, successAfter, bbhtRounds, bbhtExpectedCalls, bbhtSequence, averageSuccess, BBHT_LAMBDA } from "./search/plan.js";
export type { Reduction } from "./search/reduce.js";
export { reduceSearch } from "./search/reduce.js";
export type { SearchOptions } from "./compile.js";
export { compileSearch } from "./compile.js";
export { drawCircuitSvg, drawProblem, DRAW_LIMITS } from "./draw/circuit.js";
export { plotSuccessSvg } from "./draw/plot.js";
export { readCircuit, readCircuitJson, readCircuitQasm3 } from "./ir/read.js";

import type { ReadResult } from "./cnf/scanner.js";
import { bytesOf, type DimacsInput } from "./cnf/source.js";

/**
 * Reads DIMACS CNF with the parser generated from the normative grammar in `grammar/`. Same
 * result as {@link readDimacs} (a test holds them equal) but slower; use it as the reference.
 * Loads the ANTLR runtime on first use.
 *
 * @example
 * ```ts
 * const { cnf } = await readDimacsWithGrammar("p cnf 1 1\n1 0\n");
 * ```
 */
export async function readDimacsWithGrammar(input: DimacsInput): Promise<ReadResult> {
  const { readDimacsWithGrammar: read } = await import("./cnf/antlrReader.js");
  return read(bytesOf(input));
}
