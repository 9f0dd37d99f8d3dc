/** The library under test: the built package (what users import), plus internals by path. */
export * from "../../dist/src/internal.js";
export { scanDimacs } from "../../dist/src/cnf/scanner.js";
export { readDimacsWithGrammar as readWithGrammarSync } from "../../dist/src/cnf/antlrReader.js";
