/**
 * clausegate: compile DIMACS CNF formulas into verified, costed quantum search oracles.
 *
 * This module is the whole public API, what a toolchain needs: read a formula, compile an oracle
 * or a search circuit, emit it, verify it, cost it, plan and forecast the search. Readers return
 * diagnostics as data and never throw for bad input; a throw is a clausegate bug.
 *
 * Naming: functions are verb first (`readDimacs`, `compileOracle`, `emitQasm3`, `verifyOracle`,
 * `planSearch`); objects that are also written as JSON reports (`ResourceReport`, `CostRow`,
 * `SearchCost`) keep the snake_case keys of their JSON form, every other object is camelCase.
 *
 * @packageDocumentation
 */

// Reading and writing formulas.
export type { Diagnostic, Severity } from "./diag/diagnostic.js";
export { formatDiagnostic } from "./diag/diagnostic.js";
export type { Cnf } from "./cnf/cnf.js";
export { clausesOf, cnfFromClauses } from "./cnf/cnf.js";
export type { ReadResult } from "./cnf/scanner.js";
export type { DimacsInput } from "./cnf/source.js";
export { readDimacs, readDimacsFile } from "./cnf/source.js";
export { readDimacsWithGrammar } from "./cnf/grammarReader.js";
export { writeDimacs } from "./cnf/writer.js";
export type { CountResult } from "./count/clauses.js";
export type { CountOptions } from "./count/index.js";
export { countModels } from "./count/index.js";

// Recovering structure (gates, parities, one-hot groups).
export type { Structure, StructureOptions, StructureReport, StructuredEvaluation, Definition, DefinitionKind, Parity, Group } from "./structure/index.js";
export { recoverStructure, extendAssignment, satisfiesStructure, evaluateStructured } from "./structure/index.js";

// Compiling.
export type { Circuit, Register, RegisterRole } from "./ir/circuit.js";
export type { GateKind } from "./ir/kinds.js";
export { GATE_KINDS } from "./ir/kinds.js";
export type { Basis, Uncompute } from "./passes/lower.js";
export type { OracleKind, Strategy, AnyStrategy, SimplifyReport } from "./synth/index.js";
export type { Oracle, OracleOptions, SearchOptions, RegisterPlan, ConstructionPlan } from "./compile.js";
export { compileOracle, compileSearch, completeModel, registerOf, DEFAULT_ORACLE_OPTIONS, planConstruction } from "./compile.js";
export type { RegisterMode, StructureSummary } from "./synth/index.js";
export type { Completion } from "./structure/completion.js";

// Emitting and reading circuits back.
export type { Sink } from "./emit/sink.js";
export { collect } from "./emit/sink.js";
export { emitQasm3 } from "./emit/qasm3/index.js";
export { emitQasm2, qasm2Problem } from "./emit/qasm2.js";
export { emitJson } from "./emit/json.js";
export type { CircuitReadResult } from "./ir/read.js";
export { readCircuit } from "./ir/read.js";

// Verifying.
export type { VerifyOptions, VerifyResult, Counterexample, ModelSearchReport } from "./sim/verify.js";
export { verifyOracle } from "./sim/verify.js";
export type { ProveOptions, OracleProof, ProofCounterexample, ProofMethod, ExpectedFunction, FunctionBuilder } from "./prove/index.js";
export { proveOracle } from "./prove/index.js";

// Costing.
export type { CostOptions, CostRow, PartCost, SearchCost, ResourceReport, SimplificationReport, CompiledOracle } from "./cost/index.js";
export { costTable, oracleResources, searchCosts } from "./cost/index.js";
export type { ConstructionFamily, ConstructionCost, ConstructionChoice, CostFront, FrontPoint, FrontOptions, Prefer } from "./cost/front.js";
export { costFront, chooseConstruction } from "./cost/front.js";
export type { CircuitCounts } from "./emit/resources.js";
export { countCircuit } from "./emit/resources.js";

// Planning.
export type { SearchPlan, ScheduleRound, ScaledCount, Solutions, BigCount, Probability, ExpectedCalls } from "./search/plan.js";
export { planSearch, bbhtRounds, bbhtExpectedCalls, EXACT_BITS } from "./search/plan.js";

// Forecasting a fault-tolerant run.
export type { LogicalWork, ForecastInput, Machine, Assumption, PhysicalQubits, RegimeEstimate, Forecast } from "./forecast/model.js";
export { forecastSearch, DEFAULT_MACHINE } from "./forecast/model.js";
export type { DistillationProtocol } from "./forecast/factories.js";
export type { LogicalErrorModel, LogicalErrorModelName } from "./forecast/surfaceCode.js";
export { LOGICAL_ERROR_MODELS } from "./forecast/surfaceCode.js";
