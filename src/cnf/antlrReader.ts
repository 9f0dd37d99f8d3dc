/**
 * The reference DIMACS reader: the parser that antlr-ng generates from grammar/*.g4, driven as a
 * stream (no parse tree, unbuffered tokens), with the grammar's semantic rules S1-S4 applied as
 * tokens are consumed. It is the specification the byte scanner is tested against; it is loaded
 * only on demand (dynamic import), so the default path carries no ANTLR runtime.
 */
import {
  BaseErrorListener, PredictionMode, Token, UnbufferedTokenStream, type CharStream, type ErrorNode,
  type Interval, type ParseTreeListener, type ParserRuleContext, type TerminalNode,
} from "antlr4ng";
import { place, type Diagnostic, type Finding } from "../diag/diagnostic.js";
import type { Cnf } from "./cnf.js";
import { DimacsLexer } from "./generated/DimacsLexer.js";
import { DimacsParser } from "./generated/DimacsParser.js";
import {
  MAX_INDEX, Phase, checkEncoding, countTooLarge, literalTooLarge, missingTerminator, negativeZero,
  crInComment, placeError, tooFewClauses, tooManyClauses, trailingZeroEndMarker, unexpected, variableOutOfRange, type Found,
} from "./messages.js";
import type { ReadResult } from "./scanner.js";

/** A character stream over ASCII bytes: avoids decoding the whole input into a JS string. */
class ByteCharStream implements CharStream {
  name = "<bytes>";
  index = 0;
  constructor(private readonly data: Uint8Array) {}
  get size(): number {
    return this.data.length;
  }
  reset(): void {
    this.index = 0;
  }
  consume(): void {
    if (this.index >= this.data.length) throw new Error("cannot consume EOF");
    this.index++;
  }
  LA(offset: number): number {
    if (offset === 0) return 0;
    const i = offset < 0 ? this.index + offset : this.index + offset - 1;
    return i < 0 || i >= this.data.length ? Token.EOF : this.data[i]!;
  }
  mark(): number {
    return -1;
  }
  release(): void {}
  seek(index: number): void {
    this.index = Math.min(index, this.data.length);
  }
  getTextFromRange(start: number, stop: number): string {
    return Buffer.from(this.data.subarray(start, Math.min(stop + 1, this.data.length))).toString("latin1");
  }
  getTextFromInterval(interval: Interval): string {
    return this.getTextFromRange(interval.start, interval.stop);
  }
  getSourceName(): string {
    return this.name;
  }
}

class Stop {
  constructor(readonly finding: Finding) {}
}

/** Applies the semantic rules while tokens are consumed, and builds the formula. */
class Builder implements ParseTreeListener {
  phase = Phase.BeforeHeader;
  vars = 0;
  declared = 0;
  lits: number[] = [];
  starts: number[] = [0];
  end = -1;
  /** Line of the token before the current one (0 before the first). */
  lastLine = 0;
  /** A ZERO past the declared clauses that may still be the end marker of rule S5, or -1. */
  pendingZero = -1;

  constructor(private readonly b: Uint8Array, private readonly origin: number) {}

  bytesOf(t: Token): Uint8Array {
    return this.b.subarray(this.origin + t.start, this.origin + t.stop + 1);
  }

  visitTerminal(node: TerminalNode): void {
    const t = node.symbol;
    const at = this.origin + t.start;
    const lastLine = this.lastLine;
    this.lastLine = t.line;
    // Rule S5: a pending ZERO stays the end marker only if END or EOF comes next.
    if (this.pendingZero >= 0 && t.type !== DimacsParser.END && t.type !== Token.EOF) this.extraZero();
    switch (t.type) {
      case DimacsParser.P:
      case DimacsParser.CNF:
        this.phase++;
        return;
      case DimacsParser.H_NUM: {
        const v = decimal(this.bytesOf(t));
        if (v > MAX_INDEX) throw new Stop(countTooLarge(this.phase, at, this.bytesOf(t)));
        if (this.phase === Phase.Variables) this.vars = v;
        else this.declared = v;
        this.phase++;
        return;
      }
      case DimacsParser.NL:
        this.phase = Phase.Body;
        return;
      case DimacsParser.ZERO:
        if (this.starts.length - 1 === this.declared) {
          // First on its line: every token before it (comments never reach here) is on an earlier line.
          if (t.line === lastLine) throw new Stop(tooManyClauses(at, this.declared));
          this.pendingZero = at;
          return;
        }
        this.starts.push(this.lits.length);
        return;
      case DimacsParser.INT:
        return this.literal(t, at);
      case DimacsParser.END:
        this.end = at;
        return;
    }
  }

  /** The pending ZERO was not the last token: it is the extra clause it looks like. */
  extraZero(): never {
    throw new Stop(tooManyClauses(this.pendingZero, this.declared));
  }

  literal(t: Token, at: number): void {
    const bytes = this.bytesOf(t);
    const neg = bytes[0] === 45;
    const v = decimal(neg ? bytes.subarray(1) : bytes);
    if (v === 0) throw new Stop(negativeZero(at));
    if (v > MAX_INDEX) throw new Stop(literalTooLarge(at, bytes));
    if (v > this.vars) throw new Stop(variableOutOfRange(at, v, this.vars));
    const nc = this.starts.length - 1;
    if (this.lits.length === this.starts[nc] && nc === this.declared) throw new Stop(tooManyClauses(at, this.declared));
    this.lits.push(neg ? -v : v);
  }

  visitErrorNode(_node: ErrorNode): void {}
  enterEveryRule(_ctx: ParserRuleContext): void {}
  exitEveryRule(_ctx: ParserRuleContext): void {}
}

function decimal(bytes: Uint8Array): number {
  let v = 0;
  for (const c of bytes) v = v * 10 + (c - 48);
  return v;
}

/**
 * Reads DIMACS CNF with the parser generated from the normative grammar. Same contract as
 * `scanDimacs`, slower; use it as the reference.
 */
export function readDimacsWithGrammar(b: Uint8Array): ReadResult {
  const enc = checkEncoding(b);
  if ("error" in enc) return { cnf: undefined, diagnostics: [place(b, enc.error)] };
  const origin = enc.start;
  const builder = new Builder(b, origin);
  const lexer = new DimacsLexer(new ByteCharStream(b.subarray(origin)));
  const parser = new DimacsParser(new UnbufferedTokenStream(lexer));
  parser.buildParseTrees = false;
  parser.interpreter.predictionMode = PredictionMode.SLL;
  parser.removeErrorListeners();
  lexer.removeErrorListeners();
  const onError = new (class extends BaseErrorListener {
    override syntaxError<S extends Token>(_r: unknown, offending: S | null): void {
      const t = offending!;
      if (builder.pendingZero >= 0) builder.extraZero();
      const at = origin + t.start;
      let f: Found;
      if (t.type === Token.EOF) f = { kind: "eof" };
      else if (t.type === DimacsParser.NL) f = { kind: "eol" };
      else f = { kind: "token", bytes: builder.bytesOf(t) };
      throw new Stop(unexpected(builder.phase, at, f));
    }
  })();
  parser.addErrorListener(onError);
  lexer.addErrorListener(onError);
  parser.addParseListener(builder);
  const warnings: Diagnostic[] = [];
  try {
    parser.dimacs();
    const end = builder.end >= 0 ? builder.end : b.length;
    const { lits, starts } = builder;
    const cr = crInComment(b, origin, end);
    if (cr !== null) warnings.push(place(b, cr, origin));
    if (builder.pendingZero >= 0) warnings.push(place(b, trailingZeroEndMarker(builder.pendingZero, builder.declared), origin));
    if (lits.length > starts[starts.length - 1]!) {
      warnings.push(place(b, missingTerminator(end), origin));
      starts.push(lits.length);
    }
    if (starts.length - 1 < builder.declared) throw new Stop(tooFewClauses(end, builder.declared, starts.length - 1));
    const cnf: Cnf = { variables: builder.vars, lits: Int32Array.from(lits), clauseStart: Uint32Array.from(starts) };
    return { cnf, diagnostics: warnings };
  } catch (e) {
    if (!(e instanceof Stop)) throw e;
    return { cnf: undefined, diagnostics: [...warnings, placeError(b, e.finding, origin)] };
  }
}
