/** The OpenQASM 3 emitter: lower to the syntax tree one statement at a time, print as it goes. */
import type { Circuit } from "../../ir/circuit.js";
import { batched, type Sink } from "../sink.js";
import { forEachStatement, programHead } from "./lower.js";
import { printHead, printStatement } from "./print.js";

/**
 * Writes `c` as an OpenQASM 3 program to `out`, in chunks. Deterministic: the same circuit and
 * comments give the same bytes.
 */
export function emitQasm3(c: Circuit, out: Sink, comments: readonly string[] = []): void {
  const w = batched(out);
  printHead(programHead(c, comments), w.write);
  forEachStatement(c, (s) => w.write(printStatement(s)));
  w.flush();
}
