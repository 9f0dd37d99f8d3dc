/**
 * The entry of clausegate's own command line and tests: the public API (index.ts) plus the
 * stage internals the commands use. Not part of the package's exports: toolchains import
 * `clausegate`, which is index.ts.
 */
export type { Diagnostic, Severity } from "./diag/diagnostic.js";
export { formatDiagnostic } from "./diag/diagnostic.js";
export type { Cnf } from "./cnf/cnf.js";
export { clauseCount, clausesOf, cnfFromClauses } from "./cnf/cnf.js";
export type { ReadResult } from "./cnf/scanner.js";
export type { DimacsInput } from "./cnf/source.js";
export { loadBytes, readDimacs, readDimacsFile, readDimacsSource } from "./cnf/source.js";
export { writeDimacs } from "./cnf/writer.js";
export { evaluate, evaluateWords } from "./cnf/evaluate.js";
export type { CountResult } from "./count/clauses.js";
export { DEFAULT_COUNT_LIMIT, MAX_COUNT_LIMIT } from "./count/clauses.js";
export type { CountOptions } from "./count/index.js";
export { countModels } from "./count/index.js";
export type { Structure, StructureOptions, StructureReport, StructuredEvaluation, Definition, DefinitionKind, Parity, Group } from "./structure/index.js";
export { recoverStructure, extendAssignment, satisfiesStructure, evaluateStructured } from "./structure/index.js";

export type { Circuit, Register, RegisterRole } from "./ir/circuit.js";
export { withoutIdleTail } from "./ir/circuit.js";
export type { GateKind } from "./ir/kinds.js";
export { GATE_KINDS } from "./ir/kinds.js";
export type { Basis, Uncompute } from "./passes/lower.js";
export type { OracleKind, Strategy, AnyStrategy, SimplifyReport } from "./synth/index.js";
export type { Oracle, OracleOptions, RegisterPlan, ConstructionPlan } from "./compile.js";
export { compileOracle, compilePlanned, completeModel, planConstruction, registerOf, searchConstruction, DEFAULT_ORACLE_OPTIONS } from "./compile.js";
export type { RegisterMode, StructureSummary, OraclePlan, StructuredFormula } from "./synth/index.js";
export { planOracle, sharingPlans, synthesizePlan, synthesizeStructured } from "./synth/index.js";
export type { Completion } from "./structure/completion.js";
export { completeAssignment, fullCompletion, isFullCompletion } from "./structure/completion.js";
export type {
  Construction, ConstructionFamily, ConstructionCost, ConstructionChoice, ConstructionRow, CostFront, FrontPoint, FrontOptions, Prefer,
} from "./cost/front.js";
export {
  chooseConstruction, chooseAmong, constructionCandidates, constructionName, constructionRow, costConstructions, costFront, countConstructionOracle,
  nonDominated, parseConstruction,
} from "./cost/front.js";
export type { FrontPlotInput } from "./draw/frontPlot.js";
export { plotFrontSvg } from "./draw/frontPlot.js";
export type { CostOptions, CostRow, PartCost, SearchCost, ResourceReport, SimplificationReport, CompiledOracle, EngineResult } from "./cost/index.js";
export { constructionSearchCost, costTable, countConstruction, oracleResources, searchCosts } from "./cost/index.js";
export { costTables } from "./cost/split.js";
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
export type { VerifyOptions, VerifyResult, Counterexample, ModelSearchReport } from "./sim/verify.js";
export { DEFAULT_CONFLICT_LIMIT } from "./cnf/findModels.js";
export { verifyOracle, DEFAULT_EXHAUSTIVE_LIMIT, MAX_EXHAUSTIVE_LIMIT } from "./sim/verify.js";
export type { ProveOptions, OracleProof, ProofCounterexample, ProofMethod, ExpectedFunction, FunctionBuilder } from "./prove/index.js";
export { proveOracle, exhaustiveInReach, DEFAULT_SOLVER_SECONDS } from "./prove/index.js";
export { expectedOfCompletion } from "./prove/completion.js";
export type { CircuitReadResult } from "./ir/read.js";
export type { SearchPlan, ScheduleRound, ScaledCount, Solutions, BigCount, Probability, ExpectedCalls } from "./search/plan.js";
export {
  planSearch, successAfter, successAfterIterations, bbhtRound, bbhtRounds, bbhtLastRound, bbhtExpectedCalls, bbhtSequence, averageSuccess,
  BBHT_LAMBDA, EXACT_BITS,
} from "./search/plan.js";
export type { Reduction, VariableRange } from "./cnf/reduce.js";
export { reduceSearch } from "./cnf/reduce.js";
export type { SolutionsCount } from "./search/solutions.js";
export { countSolutions } from "./search/solutions.js";
export type { SearchOptions } from "./compile.js";
export { compileSearch } from "./compile.js";
export { drawCircuitSvg, drawProblem, DRAW_LIMITS } from "./draw/circuit.js";
export type { PlotOptions } from "./draw/plot.js";
export { plotSuccessSvg } from "./draw/plot.js";
export { readCircuit, readCircuitJson, readCircuitQasm3 } from "./ir/read.js";
export type { LogicalErrorModel, LogicalErrorModelName } from "./forecast/surfaceCode.js";
export { LOGICAL_ERROR_MODELS, logicalErrorRate, codeDistanceFor, patchQubits, MAX_CODE_DISTANCE } from "./forecast/surfaceCode.js";
export type { DistillationProtocol, ProtocolChoice } from "./forecast/factories.js";
export { DISTILLATION_PROTOCOLS, DISTILLATION_SOURCE, MAX_TABULATED_ERROR_RATE, chooseDistillation, fifteenToOneQubits, fifteenToOneCycles } from "./forecast/factories.js";
export { routingPatches, ROUTING_SOURCE } from "./forecast/layout.js";
export type { LogicalWork, ForecastInput, Machine, Assumption, PhysicalQubits, RegimeEstimate, Forecast } from "./forecast/model.js";
export { forecastSearch, inputAssumptions, DEFAULT_MACHINE, MACHINE_DEFAULT_SOURCES } from "./forecast/model.js";
export type { EvaluationRate } from "./forecast/classical.js";
export { measureEvaluationRate } from "./forecast/classical.js";
export type { LogLinearFit, Crossover } from "./forecast/fit.js";
export { fitLogLinear, fitAt, crossoverOf } from "./forecast/fit.js";
export { formatSeconds, formatCount, formatLog10Count, formatLog10Seconds, SECONDS_PER_YEAR, UNIVERSE_AGE_YEARS } from "./forecast/format.js";
export type { ForecastPlotInput, ForecastPlotSeries, ForecastPlotCrossover } from "./draw/forecastPlot.js";
export { plotForecastSvg } from "./draw/forecastPlot.js";

export { readDimacsWithGrammar } from "./cnf/grammarReader.js";
