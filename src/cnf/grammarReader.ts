/** The reference reader, loaded on first use so that the ANTLR runtime costs nothing until then. */
import type { ReadResult } from "./scanner.js";
import { bytesOf, type DimacsInput } from "./source.js";

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
  const { readDimacsWithGrammar: read } = await import("./antlrReader.js");
  return read(bytesOf(input));
}
