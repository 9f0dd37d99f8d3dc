/**
 * Reading circuits back: the JSON form and OpenQASM 3 as clausegate writes it (a straight-line
 * program over the registers x, target and work, standard gates with ctrl/negctrl modifiers,
 * gphase, measurement into `outcome`, reset, and `if (outcome[i])` blocks). Anything else is
 * rejected with its line and column: this is not a general OpenQASM 3 parser.
 */
import { place, type Diagnostic, type Finding } from "../diag/diagnostic.js";
import { CircuitBuilder, SEARCH_REGISTER, type Circuit } from "./circuit.js";
import { GATE_KINDS, K, type GateKind } from "./kinds.js";
import { validateCircuit } from "./validate.js";

/** A circuit read from text, or the diagnostic that rejects it. */
export interface CircuitReadResult {
  /** The circuit, or undefined when the text was rejected. */
  readonly circuit: Circuit | undefined;
  /** The error that rejected the text (with line and column), if any. */
  readonly diagnostics: readonly Diagnostic[];
}

const err = (offset: number, message: string, hint: string, code = "bad-circuit"): Finding => ({ code, severity: "error", message, offset, hint });

/** Reads a circuit in clausegate's JSON form or OpenQASM 3, telling them apart by their first bytes. */
export function readCircuit(text: string): CircuitReadResult {
  const start = text.search(/\S/);
  if (start >= 0 && text[start] === "{") return readCircuitJson(text);
  return readCircuitQasm3(text);
}

class Stop {
  constructor(readonly finding: Finding) {}
}

function finish(bytes: Uint8Array, build: () => Circuit): CircuitReadResult {
  try {
    const circuit = build();
    const broken = validateCircuit(circuit);
    if (broken !== null) return { circuit: undefined, diagnostics: [place(bytes, err(0, `the circuit is malformed: ${broken}`, "give a circuit that clausegate wrote"))] };
    return { circuit, diagnostics: [] };
  } catch (e) {
    if (e instanceof Stop) return { circuit: undefined, diagnostics: [place(bytes, e.finding)] };
    throw e;
  }
}

// ---- JSON ---------------------------------------------------------------------------------

interface JsonGate {
  op: string;
  qubits: number[];
  negated?: number[];
  angle?: number;
  clbit?: number;
  if?: number;
}

/** Reads the JSON form written by `emitJson` (format clausegate-circuit, version 1). */
export function readCircuitJson(text: string): CircuitReadResult {
  const bytes = Buffer.from(text, "utf8");
  let doc: { format?: unknown; version?: unknown; qubits?: unknown; clbits?: unknown; registers?: unknown; gates?: unknown };
  try {
    doc = JSON.parse(text) as typeof doc;
  } catch (e) {
    const m = /position (\d+)/.exec((e as Error).message);
    return { circuit: undefined, diagnostics: [place(bytes, err(m ? Number(m[1]) : 0, `expected JSON but found a syntax error (${(e as Error).message})`, "give the JSON that clausegate oracle --format json wrote"))] };
  }
  return finish(bytes, () => {
    if (doc.format !== "clausegate-circuit") throw new Stop(err(0, `expected "format": "clausegate-circuit" but found ${JSON.stringify(doc.format)}`, "give the JSON that clausegate oracle --format json wrote"));
    if (doc.version !== 1) throw new Stop(err(0, `expected "version": 1 but found ${JSON.stringify(doc.version)}`, "this clausegate reads version 1 circuits"));
    const regs = Array.isArray(doc.registers) ? (doc.registers as { role?: string; size?: number }[]) : [];
    const size = (role: string): number => regs.find((r) => r.role === role)?.size ?? 0;
    const b = new CircuitBuilder({ search: size("search"), target: size("target"), work: size("work"), clbits: typeof doc.clbits === "number" ? doc.clbits : 0 });
    if (b.qubits !== doc.qubits) throw new Stop(err(0, `expected the registers to hold ${String(doc.qubits)} qubits but they hold ${b.qubits}`, "the registers must be x, target and work in that order"));
    const gates = Array.isArray(doc.gates) ? (doc.gates as JsonGate[]) : [];
    let at = 0;
    gates.forEach((g, i) => {
      at = text.indexOf('"op"', at + 1);
      const where = Math.max(0, at);
      const kind = GATE_KINDS.indexOf(g.op as GateKind);
      if (kind < 0) throw new Stop(err(where, `expected a gate kind (${GATE_KINDS.join(" ")}) but found ${JSON.stringify(g.op)} in gate ${i}`, "give the JSON that clausegate wrote"));
      if (!Array.isArray(g.qubits) || g.qubits.some((q) => !Number.isInteger(q))) throw new Stop(err(where, `expected "qubits" as a list of integers in gate ${i}`, "give the JSON that clausegate wrote"));
      const neg = new Set(g.negated ?? []);
      const ops = g.qubits.map((q, k) => (q << 1) | (neg.has(k) ? 1 : 0));
      if (g.op === "gphase") ops.push(g.angle ?? 0);
      if (g.op === "measure") ops.push(g.clbit ?? -1);
      b.addN(kind, ops, g.if ?? -1);
    });
    return b.finish();
  });
}

// ---- OpenQASM 3 ---------------------------------------------------------------------------

const ANGLES: Record<string, number> = { "0": 0, "pi/4": 1, "pi/2": 2, "3*pi/4": 3, pi: 4, "5*pi/4": 5, "3*pi/2": 6, "7*pi/4": 7 };
const FIXED = new Set(["x", "y", "z", "h", "s", "sdg", "t", "tdg", "cx", "cz", "ccx"]);
const HINT = "clausegate reads back OpenQASM 3 as it writes it (see clausegate oracle)";

/** Reads OpenQASM 3 as written by `emitQasm3`. */
export function readCircuitQasm3(text: string): CircuitReadResult {
  const bytes = Buffer.from(text, "utf8");
  return finish(bytes, () => new Qasm3Reader(text).read());
}

class Qasm3Reader {
  private readonly sizes = new Map<string, number>();
  private clbitName = "";
  private b: CircuitBuilder | undefined;

  constructor(private readonly text: string) {}

  read(): Circuit {
    // Statements end with ';' or are block braces; comments run to the end of the line.
    const stmts = this.statements();
    const first = stmts.shift();
    if (!first || first.text !== "OPENQASM 3.0" && first.text !== "OPENQASM 3") {
      throw new Stop(err(first?.at ?? 0, `expected 'OPENQASM 3.0;' first but found ${first ? `'${first.text}'` : "nothing"}`, HINT));
    }
    let cond = -1;
    let inBlock = false;
    for (const s of stmts) {
      const t = s.text;
      if (t.startsWith("include ")) continue;
      let m = /^qubit\[(\d+)\] (\w+)$/.exec(t);
      if (m) {
        if (this.b) throw new Stop(err(s.at, "expected declarations before the first gate", HINT));
        if (![SEARCH_REGISTER, "target", "work"].includes(m[2]!)) throw new Stop(err(s.at, `expected a register named ${SEARCH_REGISTER}, target or work but found '${m[2]}'`, HINT));
        this.sizes.set(m[2]!, Number(m[1]));
        continue;
      }
      m = /^bit\[(\d+)\] (\w+)$/.exec(t);
      if (m) {
        this.clbitName = m[2]!;
        this.sizes.set(`#${m[2]}`, Number(m[1]));
        continue;
      }
      const b = this.builder();
      m = /^if \((\w+)\[(\d+)\]\) \{$/.exec(t);
      if (m) {
        cond = this.clbit(m[1]!, m[2]!, s.at);
        inBlock = true;
        continue;
      }
      if (t === "}") {
        if (!inBlock) throw new Stop(err(s.at, "expected a statement but found '}'", HINT));
        inBlock = false;
        cond = -1;
        continue;
      }
      m = /^if \((\w+)\[(\d+)\]\) \{ (.*) \}$/.exec(t);
      if (m) {
        this.statement(b, m[3]!.replace(/;$/, ""), s.at, this.clbit(m[1]!, m[2]!, s.at));
        continue;
      }
      this.statement(b, t, s.at, inBlock ? cond : -1);
    }
    return this.builder().finish();
  }

  private builder(): CircuitBuilder {
    this.b ??= new CircuitBuilder({
      search: this.sizes.get(SEARCH_REGISTER) ?? 0,
      target: this.sizes.get("target") ?? 0,
      work: this.sizes.get("work") ?? 0,
      clbits: this.sizes.get(`#${this.clbitName}`) ?? 0,
    });
    return this.b;
  }

  private clbit(name: string, index: string, at: number): number {
    const size = this.sizes.get(`#${name}`);
    if (size === undefined || Number(index) >= size) throw new Stop(err(at, `expected a declared classical bit but found ${name}[${index}]`, HINT));
    return Number(index);
  }

  private qubit(ref: string, at: number): number {
    const m = /^(\w+)\[(\d+)\]$/.exec(ref.trim());
    const size = m ? this.sizes.get(m[1]!) : undefined;
    if (!m || size === undefined || Number(m[2]) >= size) throw new Stop(err(at, `expected a declared qubit but found '${ref.trim()}'`, HINT));
    const i = Number(m[2]);
    const n = this.sizes.get(SEARCH_REGISTER) ?? 0;
    const t = this.sizes.get("target") ?? 0;
    return m[1] === SEARCH_REGISTER ? i : m[1] === "target" ? n + i : n + t + i;
  }

  private statement(b: CircuitBuilder, t: string, at: number, cond: number): void {
    let m = /^gphase\(([^)]*)\)$/.exec(t);
    if (m) {
      const k = ANGLES[m[1]!.replace(/\s+/g, "")];
      if (k === undefined) throw new Stop(err(at, `expected a multiple of pi/4 but found '${m[1]}'`, HINT));
      b.add(K.gphase, k, NaN, NaN, cond);
      return;
    }
    m = /^(\w+)\[(\d+)\] = measure (.+)$/.exec(t);
    if (m) {
      b.add(K.measure, this.qubit(m[3]!, at) << 1, this.clbit(m[1]!, m[2]!, at), NaN, cond);
      return;
    }
    m = /^reset (.+)$/.exec(t);
    if (m) {
      b.add(K.reset, this.qubit(m[1]!, at) << 1, NaN, NaN, cond);
      return;
    }
    m = /^((?:(?:ctrl|negctrl)(?:\(\d+\))? @ )*)(\w+) (.+)$/.exec(t);
    if (!m || !FIXED.has(m[2]!)) throw new Stop(err(at, `expected a gate, gphase, measure or reset but found '${t}'`, HINT));
    const qubits = m[3]!.split(",").map((r) => this.qubit(r, at));
    const polarity: number[] = [];
    for (const mod of m[1]!.matchAll(/(ctrl|negctrl)(?:\((\d+)\))? @ /g)) {
      for (let i = 0; i < Number(mod[2] ?? 1); i++) polarity.push(mod[1] === "negctrl" ? 1 : 0);
    }
    const name = m[2]!;
    if (polarity.length === 0) {
      const arity = name === "ccx" ? 3 : name === "cx" || name === "cz" ? 2 : 1;
      if (qubits.length !== arity) throw new Stop(err(at, `expected ${arity} qubits for ${name} but found ${qubits.length}`, HINT));
      b.addN(K[name as GateKind], qubits.map((q) => q << 1), cond);
      return;
    }
    if (name !== "x" && name !== "z") throw new Stop(err(at, `expected ctrl/negctrl only on x or z but found them on ${name}`, HINT));
    if (qubits.length !== polarity.length + 1) throw new Stop(err(at, `expected ${polarity.length + 1} qubits but found ${qubits.length}`, HINT));
    const ops = qubits.map((q, i) => (q << 1) | (polarity[i] ?? 0));
    b.addN(name === "x" ? K.mcx : K.mcz, ops, cond);
  }

  /**
   * Splits the text into statements with their offsets, dropping comments. Line-based, as
   * clausegate writes: a line holds statements ending in ';', a block brace, or a one-line
   * `if (...) { statement; }`.
   */
  private statements(): { text: string; at: number }[] {
    const out: { text: string; at: number }[] = [];
    let lineStart = 0;
    for (const raw of this.text.split("\n")) {
      const comment = raw.indexOf("//");
      const line = comment >= 0 ? raw.slice(0, comment) : raw;
      const lead = line.length - line.trimStart().length;
      const body = line.trim().replace(/\r$/, "");
      const at = lineStart + lead;
      lineStart += raw.length + 1;
      if (body === "") continue;
      if (/^if \(.*\) \{ .* \}$/.test(body) || body.endsWith("{") || body === "}") {
        out.push({ text: body, at });
        continue;
      }
      let col = 0;
      for (const part of body.split(";")) {
        if (part.trim() !== "") out.push({ text: part.trim(), at: at + col + (part.length - part.trimStart().length) });
        col += part.length + 1;
      }
      if (!body.endsWith(";")) throw new Stop(err(at + body.length, `expected ';' at the end of the statement but found the end of the line`, HINT));
    }
    return out;
  }
}
