/**
 * Reading circuits back: the JSON form and OpenQASM 3 as clausegate writes it (a straight-line
 * program over the registers vars, target and work, standard gates with ctrl/negctrl modifiers,
 * gphase, measurement into `outcome`, reset, and `if (outcome[i])` blocks). Anything else is
 * rejected with its line and column: this is not a general OpenQASM 3 parser.
 *
 * Every field of every gate is checked (validate.ts) before the gate is built, and a diagnostic
 * points at the offending value: its byte offset, so line and column are in bytes (a UTF-8
 * byte-order mark is skipped, and line 1 starts after it).
 */
import { place, type Diagnostic, type Finding } from "../diag/diagnostic.js";
import { CircuitBuilder, OUTCOME_REGISTER, SEARCH_REGISTER, type Circuit } from "./circuit.js";
import { firstInvalidUtf8, JsonScanner, JsonSyntaxError, shownByte, shownValue, type JsonNode } from "./json.js";
import { encodeQubit, GATE_KINDS, K, type GateKind } from "./kinds.js";
import {
  checkRegisters, GateChecker, MAX_CIRCUIT_CLBITS, MAX_CIRCUIT_QUBITS, REGISTER_ORDER, validateCircuit, type GateFault, type GateFields,
  type RegisterFields,
} from "./validate.js";

/** A circuit read from text, or the diagnostic that rejects it. */
export interface CircuitReadResult {
  /** The circuit, or undefined when the text was rejected. */
  readonly circuit: Circuit | undefined;
  /** The error that rejected the text (one, with line and column), if any. */
  readonly diagnostics: readonly Diagnostic[];
}

const err = (offset: number, message: string, hint: string, code = "bad-circuit"): Finding => ({ code, severity: "error", message, offset, hint });

class Stop {
  constructor(readonly finding: Finding) {}
}

/** The input as bytes, and where line 1 starts (after a byte-order mark). */
function bytesOf(input: string | Uint8Array): { bytes: Uint8Array; origin: number } {
  const bytes = typeof input === "string" ? Buffer.from(input, "utf8") : input;
  const bom = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
  return { bytes, origin: bom ? 3 : 0 };
}

/**
 * Reads a circuit in clausegate's JSON form or OpenQASM 3 (given as text or as the file's bytes),
 * telling them apart by their first non-blank byte.
 *
 * @example
 * ```ts
 * const { circuit, diagnostics } = readCircuit(readFileSync("oracle.qasm"));
 * if (circuit === undefined) console.error(formatDiagnostic(diagnostics[0]!, "oracle.qasm"));
 * ```
 */
export function readCircuit(input: string | Uint8Array): CircuitReadResult {
  const { bytes, origin } = bytesOf(input);
  let i = origin;
  while (i < bytes.length && (bytes[i] === 0x20 || bytes[i] === 0x09 || bytes[i] === 0x0a || bytes[i] === 0x0d)) i++;
  // A list is no circuit, but it is JSON: the JSON reader says what is wrong with it.
  return bytes[i] === 0x7b /* { */ || bytes[i] === 0x5b /* [ */ ? readCircuitJson(bytes) : readCircuitQasm3(bytes);
}

/** Runs a reader: UTF-8 first, then the reader's own checks, then the circuit's invariants. */
function finish(bytes: Uint8Array, origin: number, build: () => Circuit, hint: string): CircuitReadResult {
  const reject = (f: Finding): CircuitReadResult => ({ circuit: undefined, diagnostics: [place(bytes, f, origin)] });
  const bad = firstInvalidUtf8(bytes, origin);
  if (bad >= 0) return reject(err(bad, `expected UTF-8 text but found the byte 0x${bytes[bad]!.toString(16).padStart(2, "0")}`, "save the circuit as UTF-8"));
  try {
    const circuit = build();
    // The readers check every field, so this is a second line of defence that should never fire.
    const broken = validateCircuit(circuit);
    if (broken !== null) return reject(err(origin, `the circuit is malformed: ${broken}`, hint));
    return { circuit, diagnostics: [] };
  } catch (e) {
    if (e instanceof Stop) return reject(e.finding);
    if (e instanceof JsonSyntaxError) return reject(err(e.offset, e.message, hint));
    throw e;
  }
}

// ---- JSON ---------------------------------------------------------------------------------

const JSON_HINT = "give the JSON that clausegate oracle --format json wrote";
const FORMAT = "clausegate-circuit";
const TOP_KEYS = ["format", "version", "comments", "qubits", "clbits", "registers", "gates"] as const;
const GATE_KEYS = ["op", "qubits", "negated", "angle", "clbit", "if"] as const;
const REGISTER_KEYS = ["name", "role", "start", "size"] as const;

/**
 * Reads the JSON form written by `emitJson` (format clausegate-circuit, version 1).
 *
 * @example
 * ```ts
 * const back = readCircuitJson(collect((s) => emitJson(circuit, s)));
 * ```
 */
export function readCircuitJson(input: string | Uint8Array): CircuitReadResult {
  const { bytes, origin } = bytesOf(input);
  return finish(bytes, origin, () => new JsonCircuitReader(bytes, origin).read(), JSON_HINT);
}

const stop = (at: number, message: string): Stop => new Stop(err(at, message, JSON_HINT));

/** The members of an object node by key, refusing keys outside `allowed` and repeated keys. */
function fieldsOf<K extends string>(node: JsonNode, allowed: readonly K[], where: string): Partial<Record<K, JsonNode>> {
  if (node.kind !== "object") throw stop(node.at, `expected ${where} as an object but found ${shownValue(node)}`);
  const out: Partial<Record<K, JsonNode>> = {};
  for (const e of node.entries) {
    if (!(allowed as readonly string[]).includes(e.key)) {
      throw stop(e.keyAt, `expected a field of ${where} (${allowed.join(", ")}) but found ${JSON.stringify(e.key)}`);
    }
    if (out[e.key as K] !== undefined) throw stop(e.keyAt, `expected each field once but found ${JSON.stringify(e.key)} again in ${where}`);
    out[e.key as K] = e.value;
  }
  return out;
}

/**
 * A whole number from a number node. One beyond 2^53 is refused here, with the text the file
 * gives: later range checks print the double, whose text ("1e+23") is not what was written.
 */
function integerOf(node: JsonNode | undefined, what: string, missingAt: number): number {
  if (node === undefined) throw stop(missingAt, `expected ${what} but found none`);
  if (node.kind !== "number" || !Number.isInteger(node.value)) throw stop(node.at, `expected ${what} (a whole number) but found ${shownValue(node)}`);
  if (!Number.isSafeInteger(node.value)) throw stop(node.at, `expected ${what} (a whole number of at most 2^53) but found ${shownValue(node)}`);
  return node.value;
}

/** The JSON number that starts at `at`, as written (shortened as shownValue shortens). */
function numberText(bytes: Uint8Array, at: number): string {
  let end = at;
  for (;;) {
    const b = bytes[end];
    // - + . 0-9 E e: the characters of a JSON number
    if (b === 0x2d || b === 0x2b || b === 0x2e || (b !== undefined && b >= 0x30 && b <= 0x39) || b === 0x45 || b === 0x65) end++;
    else break;
  }
  const text = Buffer.from(bytes.subarray(at, end)).toString("latin1");
  return text.length > 40 ? `${text.slice(0, 37)}...` : text;
}

/** A register's value nodes by field, and its own node (where a missing field is reported). */
type RegisterNodes = Partial<Record<(typeof REGISTER_KEYS)[number], JsonNode>> & { readonly self: JsonNode };

class JsonCircuitReader {
  constructor(private readonly bytes: Uint8Array, private readonly origin: number) {}

  read(): Circuit {
    const sc = new JsonScanner(this.bytes, this.origin);
    if (sc.peek() !== 0x7b) throw stop(sc.pos, `expected a JSON object ('{') but found ${shownByte(this.bytes, sc.pos)}`);
    const objectAt = sc.pos;
    // Every member but the gates is small: read them as values. The gates are checked for syntax
    // now and read one at a time later, once the registers say what a valid qubit is.
    const top: JsonNode[] = [];
    const keys: { key: string; keyAt: number }[] = [];
    let gatesAt = -1;
    sc.members((key, keyAt) => {
      keys.push({ key, keyAt });
      if (key === "gates") {
        sc.peek();
        gatesAt = sc.pos;
        sc.skip(1);
        top.push({ kind: "null", at: gatesAt, end: sc.pos }); // a stand-in: the gates are read from gatesAt
      } else top.push(sc.value(1));
    });
    sc.end();
    const doc = fieldsOf({ kind: "object", at: objectAt, end: sc.pos, entries: keys.map((k, i) => ({ ...k, value: top[i]! })) }, TOP_KEYS, "the circuit");

    const format = doc.format;
    if (format?.kind !== "string" || format.value !== FORMAT) {
      throw stop(format?.at ?? objectAt, `expected "format": "${FORMAT}" but found ${format === undefined ? "no format" : shownValue(format)}`);
    }
    if (doc.version?.kind !== "number" || doc.version.value !== 1) {
      throw stop(doc.version?.at ?? objectAt, `expected "version": 1 but found ${doc.version === undefined ? "no version" : shownValue(doc.version)}`);
    }
    if (doc.comments !== undefined) {
      if (doc.comments.kind !== "array") throw stop(doc.comments.at, `expected "comments" as a list of strings but found ${shownValue(doc.comments)}`);
      const bad = doc.comments.items.find((c) => c.kind !== "string");
      if (bad) throw stop(bad.at, `expected a comment (a string) but found ${shownValue(bad)}`);
    }
    const registers = this.registers(doc.registers, objectAt);
    const qubits = integerOf(doc.qubits, `"qubits", the number of qubits`, objectAt);
    const regFault = checkRegisters(registers.fields, qubits);
    if (regFault !== null) {
      const reg = registers.nodes[regFault.index];
      const at = reg === undefined ? doc.qubits!.at : (regFault.field === "total" ? undefined : reg[regFault.field])?.at ?? reg.self.at;
      throw stop(at, regFault.message);
    }
    const clbits = integerOf(doc.clbits, `"clbits", the number of classical bits`, objectAt);
    if (clbits < 0 || clbits > MAX_CIRCUIT_CLBITS) throw stop(doc.clbits!.at, `expected "clbits" in 0..${MAX_CIRCUIT_CLBITS} but found ${clbits}`);
    if (doc.gates === undefined) throw stop(objectAt, `expected "gates", the list of gates, but found none`);
    const size = (name: string): number => registers.fields.find((r) => r.name === name)?.size ?? 0;
    const b = new CircuitBuilder({ search: size(SEARCH_REGISTER), target: size("target"), work: size("work"), clbits });
    this.gates(new JsonScanner(this.bytes, gatesAt), b);
    return b.finish();
  }

  private registers(node: JsonNode | undefined, objectAt: number): { fields: RegisterFields[]; nodes: RegisterNodes[] } {
    if (node === undefined) throw stop(objectAt, `expected "registers" but found none`);
    if (node.kind !== "array") throw stop(node.at, `expected "registers" as a list of registers but found ${shownValue(node)}`);
    const fields: RegisterFields[] = [];
    const nodes: RegisterNodes[] = [];
    for (const item of node.items) {
      const f = fieldsOf(item, REGISTER_KEYS, "a register");
      const text = (key: "name" | "role"): string => {
        const v = f[key];
        if (v === undefined) throw stop(item.at, `expected the register's "${key}" but found none`);
        if (v.kind !== "string") throw stop(v.at, `expected the register's "${key}" as a string but found ${shownValue(v)}`);
        return v.value;
      };
      const name = text("name");
      const role = text("role");
      const start = integerOf(f.start, `the register's "start"`, item.at);
      const size = integerOf(f.size, `the register's "size"`, item.at);
      fields.push({ name, role, start, size });
      nodes.push({ ...f, self: item });
    }
    return { fields, nodes };
  }

  /**
   * Reads, checks and builds the gates one at a time, straight from the bytes into arrays that
   * are reused from gate to gate: no tree and no garbage per gate (circuit files hold millions).
   */
  private gates(sc: JsonScanner, b: CircuitBuilder): void {
    if (sc.peek() !== 0x5b) throw stop(sc.pos, `expected "gates" as a list of gates but found ${shownValue(sc.value(1))}`);
    const checker = new GateChecker(b.qubits, b.clbits);
    const g = new GateReader(sc);
    const ops: number[] = [];
    sc.items((i) => {
      g.read(i);
      const where = `in gate ${i} (${g.kind})`;
      const fault = checker.check(g);
      if (fault !== null) throw stop(g.faultAt(fault), `${fault.message} ${where}`);
      ops.length = 0;
      for (let k = 0; k < g.qubits.length; k++) ops.push(encodeQubit(g.qubits[k]!));
      for (const p of g.negated) ops[p]! |= 1;
      if (g.angle !== undefined) ops.push(g.angle);
      if (g.clbit !== undefined) ops.push(g.clbit);
      b.addN(K[g.kind], ops, g.cond ?? -1);
    }, 1);
  }
}

const OP = 0;
const QUBITS = 1;
const NEGATED = 2;
const ANGLE = 3;
const CLBIT = 4;
const IF = 5;
/** A value of the wrong type, and its message once the gate's kind is known. */
interface Pending {
  readonly at: number;
  readonly message: (where: string) => string;
}
const GATE_KEY_INDEX = new Map<string, number>(GATE_KEYS.map((k, i) => [k, i]));

/** One gate of a JSON circuit as read: its fields and where each value (and list element) starts. */
class GateReader implements GateFields {
  kind: GateKind = "x";
  readonly qubits: number[] = [];
  readonly negated: number[] = [];
  angle: number | undefined;
  clbit: number | undefined;
  cond: number | undefined;
  private readonly qubitAt: number[] = [];
  private readonly negatedAt: number[] = [];
  /** Offset of each field's value, -1 when absent. */
  private readonly fieldAt = new Float64Array(GATE_KEYS.length);
  private seen = 0;
  private index = 0;
  private gateAt = 0;
  private opText: string | undefined;
  private opShown = "";
  /** The first value of a wrong type, reported once the gate's kind is known. */
  private pending: Pending | undefined;
  private list: number[] = this.qubits;
  private listAt: number[] = this.qubitAt;
  private listKey: "qubits" | "negated" = "qubits";
  private readonly member: (key: string, keyAt: number) => void;
  private readonly element: () => void;

  constructor(private readonly sc: JsonScanner) {
    this.member = (key, keyAt) => this.field(key, keyAt);
    this.element = () => {
      this.sc.peek();
      const at = this.sc.pos;
      const byte = this.sc.bytes[at];
      if (byte === 0x2d || (byte !== undefined && byte >= 0x30 && byte <= 0x39)) {
        this.list.push(this.sc.numberValue());
        this.listAt.push(at);
        return;
      }
      const node = this.sc.value(4);
      const one = this.listKey === "qubits" ? "a qubit index" : "a control position";
      this.pending ??= { at, message: (where) => `expected ${one} (a whole number) ${where} but found ${shownValue(node)}` };
    };
  }

  /** Reads gate `i` (the scanner at its value). */
  read(i: number): void {
    const sc = this.sc;
    this.index = i;
    sc.peek();
    this.gateAt = sc.pos;
    if (sc.bytes[this.gateAt] !== 0x7b) throw stop(this.gateAt, `expected gate ${i} as an object but found ${shownValue(sc.value(2))}`);
    this.qubits.length = 0;
    this.negated.length = 0;
    this.qubitAt.length = 0;
    this.negatedAt.length = 0;
    this.fieldAt.fill(-1);
    this.seen = 0;
    this.angle = this.clbit = this.cond = undefined;
    this.opText = undefined;
    this.pending = undefined;
    sc.members(this.member, 2);
    if (this.fieldAt[OP]! < 0) throw stop(this.gateAt, `expected "op", the gate's kind, in gate ${i} but found none`);
    const kind = this.opText === undefined ? -1 : GATE_KINDS.indexOf(this.opText as GateKind);
    if (kind < 0) throw stop(this.fieldAt[OP]!, `expected a gate kind (${GATE_KINDS.join(" ")}) but found ${this.opShown} in gate ${i}`);
    this.kind = GATE_KINDS[kind]!;
    const where = `in gate ${i} (${this.kind})`;
    if (this.fieldAt[QUBITS]! < 0) throw stop(this.gateAt, `expected "qubits", the list of qubits, ${where} but found none`);
    const pending = this.pending as Pending | undefined; // set by the member callbacks
    if (pending) throw stop(pending.at, pending.message(where));
  }

  private field(key: string, keyAt: number): void {
    const sc = this.sc;
    const k = GATE_KEY_INDEX.get(key);
    if (k === undefined) throw stop(keyAt, `expected a field of gate ${this.index} (${GATE_KEYS.join(", ")}) but found ${JSON.stringify(key)}`);
    if ((this.seen >> k) & 1) throw stop(keyAt, `expected each field once but found ${JSON.stringify(key)} again in gate ${this.index}`);
    this.seen |= 1 << k;
    sc.peek();
    const at = sc.pos;
    this.fieldAt[k] = at;
    const byte = sc.bytes[at];
    if (k === OP) {
      if (byte === 0x22) {
        this.opText = sc.string();
        this.opShown = JSON.stringify(this.opText);
      } else this.opShown = shownValue(sc.value(3));
      return;
    }
    if (k === QUBITS || k === NEGATED) {
      if (byte === 0x5b) {
        this.list = k === QUBITS ? this.qubits : this.negated;
        this.listAt = k === QUBITS ? this.qubitAt : this.negatedAt;
        this.listKey = k === QUBITS ? "qubits" : "negated";
        sc.items(this.element, 3);
        return;
      }
      const node = sc.value(3);
      const what = k === QUBITS ? "qubit indices" : "control positions";
      this.pending ??= { at, message: (where) => `expected "${key}" as a list of ${what} ${where} but found ${shownValue(node)}` };
      return;
    }
    if (byte === 0x2d || (byte !== undefined && byte >= 0x30 && byte <= 0x39)) {
      const v = sc.numberValue();
      if (k === ANGLE) this.angle = v;
      else if (k === CLBIT) this.clbit = v;
      else if (k === IF) this.cond = v;
      return;
    }
    const node = sc.value(3);
    this.pending ??= { at, message: (where) => `expected "${key}" as a whole number ${where} but found ${shownValue(node)}` };
  }

  shown(field: GateFault["field"], index: number): string {
    return numberText(this.sc.bytes, this.faultAt({ field, index, message: "" }));
  }

  /** The offset a fault points at: the list element, else the field, else the gate. */
  faultAt(fault: GateFault): number {
    const k = GATE_KEY_INDEX.get(fault.field)!;
    const at = this.fieldAt[k]!;
    if (at < 0) return this.gateAt;
    if (fault.index >= 0 && (k === QUBITS || k === NEGATED)) return (k === QUBITS ? this.qubitAt : this.negatedAt)[fault.index] ?? at;
    return at;
  }
}

// ---- OpenQASM 3 ---------------------------------------------------------------------------

const ANGLES: Record<string, number> = { "0": 0, "pi/4": 1, "pi/2": 2, "3*pi/4": 3, pi: 4, "5*pi/4": 5, "3*pi/2": 6, "7*pi/4": 7 };
const FIXED = new Set(["x", "y", "z", "h", "s", "sdg", "t", "tdg", "cx", "cz", "ccx"]);
const HINT = "clausegate reads back OpenQASM 3 as it writes it (see clausegate oracle)";

/**
 * Reads OpenQASM 3 as written by `emitQasm3`.
 *
 * @example
 * ```ts
 * const back = readCircuitQasm3(collect((s) => emitQasm3(circuit, s)));
 * ```
 */
export function readCircuitQasm3(input: string | Uint8Array): CircuitReadResult {
  const { bytes, origin } = bytesOf(input);
  return finish(bytes, origin, () => {
    const text = new TextDecoder("utf-8", { ignoreBOM: true }).decode(bytes.subarray(origin));
    // Offsets below are string indices; a diagnostic needs bytes. Convert only when one is made.
    try {
      return new Qasm3Reader(text).read();
    } catch (e) {
      if (e instanceof Stop) throw new Stop({ ...e.finding, offset: origin + Buffer.byteLength(text.slice(0, e.finding.offset), "utf8") });
      throw e;
    }
  }, HINT);
}

const qstop = (at: number, message: string, hint = HINT): Stop => new Stop(err(at, message, hint));

class Qasm3Reader {
  private readonly sizes = new Map<string, number>();
  private clbitName = "";
  /** Whether `include "stdgates.inc";` came (the gates other than gphase, measure, reset need it). */
  private stdgates = false;
  private clbitCount = 0;
  private b: CircuitBuilder | undefined;
  private checker: GateChecker | undefined;

  constructor(private readonly text: string) {}

  read(): Circuit {
    // Statements end with ';' or are block braces; comments run to the end of the line.
    const stmts = this.statements();
    const first = stmts.shift();
    if (first && /^OPENQASM\s+2(\.\d+)?$/.test(first.text)) {
      throw qstop(first.at, "expected OpenQASM 3 or clausegate JSON but found OpenQASM 2.0", "verify the OpenQASM 3 or JSON form of the oracle");
    }
    if (!first || first.text !== "OPENQASM 3.0" && first.text !== "OPENQASM 3") {
      throw qstop(first?.at ?? 0, `expected 'OPENQASM 3.0;' first but found ${first ? `'${first.text}'` : "nothing"}`);
    }
    let cond = -1;
    let inBlock = false;
    for (const s of stmts) {
      const t = s.text;
      if (t.startsWith("include ")) {
        // The standard library is the one include an oracle needs (OpenQASM 3: qelib1.inc is
        // OpenQASM 2's); once, before the gates it defines.
        if (t !== 'include "stdgates.inc"') throw qstop(s.at, `expected 'include "stdgates.inc";' but found '${t}'`);
        if (this.stdgates) throw qstop(s.at, `expected 'include "stdgates.inc";' once but found it again`);
        this.stdgates = true;
        continue;
      }
      let m = /^(qubit|bit)\[(\d+)\] (\w+)$/.exec(t);
      if (m) {
        this.declare(m[1] as "qubit" | "bit", m[2]!, m[3]!, s.at);
        continue;
      }
      const b = this.builder();
      m = /^if \((\w+)\[(\d+)\]\) \{$/.exec(t);
      if (m) {
        if (inBlock) throw qstop(s.at, "expected '}' before another if block", HINT);
        cond = this.clbit(m[1]!, m[2]!, s.at + 4);
        inBlock = true;
        continue;
      }
      if (t === "}") {
        if (!inBlock) throw qstop(s.at, "expected a statement but found '}'");
        inBlock = false;
        cond = -1;
        continue;
      }
      m = /^if \((\w+)\[(\d+)\]\) \{ (.*) \}$/.exec(t);
      if (m) {
        const inner = m[3]!.replace(/;$/, "");
        this.statement(b, inner, s.at + t.length - 2 - m[3]!.length, this.clbit(m[1]!, m[2]!, s.at + 4));
        continue;
      }
      this.statement(b, t, s.at, inBlock ? cond : -1);
    }
    if (inBlock) throw qstop(this.text.length, "expected '}' to close the if block but found the end of the input");
    return this.builder().finish();
  }

  private declare(type: "qubit" | "bit", sizeText: string, name: string, at: number): void {
    const sizeAt = at + type.length + 1;
    const nameAt = sizeAt + sizeText.length + 2;
    if (this.b) throw qstop(at, "expected declarations before the first gate");
    const max = type === "qubit" ? MAX_CIRCUIT_QUBITS : MAX_CIRCUIT_CLBITS;
    const size = Number(sizeText);
    if (size > max) throw qstop(sizeAt, `expected a register size in 0..${max} but found ${sizeText}`);
    if (type === "bit") {
      if (this.clbitName !== "") throw qstop(at, `expected one bit register but found a second, '${name}'`);
      // The one name clausegate writes: any other could clash with a gate of stdgates.inc, a
      // keyword or a qubit register (ill-formed OpenQASM 3 that a parser may still accept).
      if (name !== OUTCOME_REGISTER) throw qstop(nameAt, `expected the bit register to be named ${OUTCOME_REGISTER} but found '${name}'`);
      this.clbitName = name;
      this.clbitCount = size;
      return;
    }
    const names = REGISTER_ORDER.map((r) => r.name);
    if (!names.includes(name)) throw qstop(nameAt, `expected a register named ${names.join(", ")} but found '${name}'`);
    if (this.sizes.has(name)) throw qstop(nameAt, `expected each register once but found '${name}' again`);
    if (name === "target" && size !== 1) throw qstop(sizeAt, `expected the target register to hold 1 qubit but found ${sizeText}`);
    const total = [...this.sizes.values()].reduce((a, x) => a + x, size);
    if (total > MAX_CIRCUIT_QUBITS) throw qstop(sizeAt, `expected at most ${MAX_CIRCUIT_QUBITS} qubits in all but the registers hold ${total}`);
    this.sizes.set(name, size);
  }

  private builder(): CircuitBuilder {
    if (this.b === undefined) {
      this.b = new CircuitBuilder({
        search: this.sizes.get(SEARCH_REGISTER) ?? 0,
        target: this.sizes.get("target") ?? 0,
        work: this.sizes.get("work") ?? 0,
        clbits: this.clbitCount,
      });
      const named = (q: number): string => this.nameOf(q);
      this.checker = new GateChecker(this.b.qubits, this.b.clbits, named);
    }
    return this.b;
  }

  private nameOf(q: number): string {
    const n = this.sizes.get(SEARCH_REGISTER) ?? 0;
    const t = this.sizes.get("target") ?? 0;
    return q < n ? `${SEARCH_REGISTER}[${q}]` : q < n + t ? `target[${q - n}]` : `work[${q - n - t}]`;
  }

  /** A classical bit `name[index]` written at `at`. */
  private clbit(name: string, index: string, at: number): number {
    if (name !== this.clbitName || Number(index) >= this.clbitCount) throw qstop(at, `expected a declared classical bit but found ${name}[${index}]`);
    return Number(index);
  }

  /** A qubit reference written at `at`. */
  private qubit(ref: string, at: number): number {
    const m = /^(\w+)\[(\d+)\]$/.exec(ref);
    const size = m ? this.sizes.get(m[1]!) : undefined;
    if (!m || size === undefined || Number(m[2]) >= size) throw qstop(at, `expected a declared qubit but found '${ref}'`);
    const i = Number(m[2]);
    const n = this.sizes.get(SEARCH_REGISTER) ?? 0;
    const t = this.sizes.get("target") ?? 0;
    return m[1] === SEARCH_REGISTER ? i : m[1] === "target" ? n + i : n + t + i;
  }

  /** The comma-separated qubit references of `list` (which starts at `at`), with their offsets. */
  private qubitList(list: string, at: number): { qubits: number[]; offsets: number[] } {
    const qubits: number[] = [];
    const offsets: number[] = [];
    let col = 0;
    for (const part of list.split(",")) {
      const lead = part.length - part.trimStart().length;
      offsets.push(at + col + lead);
      qubits.push(this.qubit(part.trim(), at + col + lead));
      col += part.length + 1;
    }
    return { qubits, offsets };
  }

  /** Checks a gate's fields (validate.ts) and adds it, or stops at the offending operand. */
  private add(b: CircuitBuilder, kind: GateKind, qubits: number[], negatedAt: number[], offsets: number[], extra: number | undefined, at: number, cond: number): void {
    const fault = this.checker!.check({
      kind, qubits, negated: negatedAt,
      angle: kind === "gphase" ? extra : undefined, clbit: kind === "measure" ? extra : undefined, cond: cond < 0 ? undefined : cond,
    });
    if (fault !== null) throw qstop(fault.field === "qubits" && fault.index >= 0 ? offsets[fault.index]! : at, fault.message);
    const ops = qubits.map((q) => encodeQubit(q));
    for (const p of negatedAt) ops[p]! |= 1;
    if (extra !== undefined) ops.push(extra);
    b.addN(K[kind], ops, cond);
  }

  private statement(b: CircuitBuilder, t: string, at: number, cond: number): void {
    let m = /^gphase\(([^)]*)\)$/.exec(t);
    if (m) {
      const k = ANGLES[m[1]!.replace(/\s+/g, "")];
      if (k === undefined) throw qstop(at + 7, `expected a multiple of pi/4 (0, pi/4, ..., 7*pi/4) but found '${m[1]}'`);
      this.add(b, "gphase", [], [], [], k, at, cond);
      return;
    }
    m = /^(\w+)\[(\d+)\] = measure (.+)$/.exec(t);
    if (m) {
      const bit = this.clbit(m[1]!, m[2]!, at);
      const qAt = at + t.length - m[3]!.length;
      this.add(b, "measure", [this.qubit(m[3]!, qAt)], [], [qAt], bit, at, cond);
      return;
    }
    m = /^reset (.+)$/.exec(t);
    if (m) {
      this.add(b, "reset", [this.qubit(m[1]!, at + 6)], [], [at + 6], undefined, at, cond);
      return;
    }
    m = /^((?:(?:ctrl|negctrl)(?:\(\d+\))? @ )*)(\w+) (.+)$/.exec(t);
    if (!m || !FIXED.has(m[2]!)) throw qstop(at, `expected a gate, gphase, measure or reset but found '${t}'`);
    // Gates other than gphase, measure and reset are defined by the standard library.
    if (!this.stdgates) throw qstop(at + m[1]!.length, `gate '${m[2]}' is defined in stdgates.inc, which the program does not include before it`, `add 'include "stdgates.inc";' after the OPENQASM line`);
    const { qubits, offsets } = this.qubitList(m[3]!, at + t.length - m[3]!.length);
    const polarity: number[] = [];
    for (const mod of m[1]!.matchAll(/(ctrl|negctrl)(?:\((\d+)\))? @ /g)) {
      const count = Number(mod[2] ?? 1);
      if (count > qubits.length) throw qstop(at + mod.index, `expected at most ${qubits.length} controls but found ${mod[2]}`);
      for (let i = 0; i < count; i++) polarity.push(mod[1] === "negctrl" ? 1 : 0);
    }
    const name = m[2]! as GateKind;
    if (polarity.length === 0) {
      this.add(b, name, qubits, [], offsets, undefined, at, cond);
      return;
    }
    if (name !== "x" && name !== "z") throw qstop(at, `expected ctrl/negctrl only on x or z but found them on ${name}`);
    if (qubits.length !== polarity.length + 1) throw qstop(at, `expected ${polarity.length + 1} qubits (${polarity.length} controls and a target) but found ${qubits.length}`);
    const negatedAt = polarity.flatMap((p, i) => (p ? [i] : []));
    this.add(b, name === "x" ? "mcx" : "mcz", qubits, negatedAt, offsets, undefined, at, cond);
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
      // A carriage return not followed by LF is not a line end here: a comment would run on past
      // it and swallow what follows (a file with CR line ends read as one comment, "no qubits").
      const cr = raw.indexOf("\r");
      if (cr >= 0 && cr < raw.length - 1) {
        throw qstop(lineStart + cr, "a bare carriage return (CR, not followed by LF): it is not a line end", "lines of an OpenQASM file end with LF or CRLF; convert CR line ends, e.g. tr '\\r' '\\n' < OLD.qasm > NEW.qasm");
      }
      const comment = raw.indexOf("//");
      const line = (comment >= 0 ? raw.slice(0, comment) : raw).replace(/\r$/, "");
      const lead = line.length - line.trimStart().length;
      const body = line.trim();
      const at = lineStart + lead;
      lineStart += raw.length + 1;
      if (body === "") continue;
      if (/^if \(.*\) \{ .* \}$/.test(body) || body.endsWith("{") || body === "}") {
        out.push({ text: body, at });
        continue;
      }
      let col = 0;
      const parts = body.split(";");
      for (let i = 0; i < parts.length; i++) {
        const part = parts[i]!;
        if (part.trim() !== "") out.push({ text: part.trim(), at: at + col + (part.length - part.trimStart().length) });
        // The official grammar (qasm3Parser.g4) has no empty statement: a ';' must end one.
        else if (i < parts.length - 1) throw qstop(at + col + part.length, "expected a statement before ';' but found none (OpenQASM 3 has no empty statement)", "remove the extra ';'");
        col += part.length + 1;
      }
      if (!body.endsWith(";")) {
        // Text that is not OpenQASM at all is told so, not that its first line lacks a ';'.
        if (out.length <= 1 && !body.startsWith("OPENQASM")) {
          throw qstop(at, `expected 'OPENQASM 3.0;' first but found '${body.length > 40 ? `${body.slice(0, 37)}...` : body}'`);
        }
        throw qstop(at + body.length, `expected ';' at the end of the statement but found the end of the line`);
      }
    }
    return out;
  }
}
