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
export { readDimacs } from "./cnf/source.js";
export { writeDimacs } from "./cnf/writer.js";
export { evaluate, evaluateWords } from "./cnf/evaluate.js";
export type { CountOptions, CountResult } from "./cnf/count.js";
export { countModels, DEFAULT_COUNT_LIMIT, MAX_COUNT_LIMIT } from "./cnf/count.js";

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
