// Reading circuits back: every fault class of the JSON and OpenQASM 3 readers is refused with one
// diagnostic pointing at the offending value, in byte columns (DEVELOPERS.md, "Positions are byte
// offsets"), also after non-ASCII text; everything clausegate writes reads back unchanged.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { randomKSat } from "../helpers/formulas.js";
import { collect, compileOracle, emitJson, emitQasm3, readCircuit, readCircuitJson, readCircuitQasm3, type Circuit } from "../helpers/lib.js";
import { MAX_CIRCUIT_QUBITS, validateCircuit } from "../../dist/src/ir/validate.js";

/**
 * The place a diagnostic must point at, marked in the text by `§` (removed before reading):
 * line and byte column counted independently of the reader, from the UTF-8 bytes of the prefix.
 */
function marked(template: string): { text: string; line: number; column: number } {
  const at = template.indexOf("§");
  if (at < 0 || template.indexOf("§", at + 1) >= 0) throw new Error("mark exactly one place with §");
  const before = Buffer.from(template.slice(0, at), "utf8");
  const lastNewline = before.lastIndexOf(0x0a);
  let line = 1;
  for (const b of before) if (b === 0x0a) line++;
  const origin = before[0] === 0xef && before[1] === 0xbb && before[2] === 0xbf && line === 1 ? 3 : 0;
  return { text: template.slice(0, at) + template.slice(at + 1), line, column: before.length - (lastNewline + 1) - origin + 1 };
}

/** Reads the marked text and expects one error there, its message matching `message`. */
function expectRejected(template: string, message: RegExp, read: (t: string | Uint8Array) => ReturnType<typeof readCircuit> = readCircuit): void {
  const { text, line, column } = marked(template);
  const r = read(text);
  expect(r.circuit, text).toBeUndefined();
  expect(r.diagnostics).toHaveLength(1);
  const d = r.diagnostics[0]!;
  expect(d.message, text).toMatch(message);
  expect(d.hint).toBeTruthy();
  expect(d.message).not.toMatch(/\n/);
  expect({ line: d.line, column: d.column }, `${d.message} in ${text}`).toEqual({ line, column });
  // The same from the file's bytes.
  const again = read(Buffer.from(text, "utf8")).diagnostics[0]!;
  expect({ line: again.line, column: again.column, message: again.message }).toEqual({ line, column, message: d.message });
}

// Non-ASCII text on the line before each fault and on an earlier line: 2-, 3- and 4-byte characters.
const WIDE = "Größe ✓ 😀";
const REGS = `"registers":[{"name":"vars","role":"search","start":0,"size":4},{"name":"work","role":"work","start":4,"size":6}]`;
/** A one-line JSON circuit with 4 search and 6 work qubits, 2 classical bits, and the given gates. */
const json = (gates: string, head = `"qubits":10,"clbits":2,${REGS}`): string =>
  `{"format":"clausegate-circuit","version":1,\n"comments":["${WIDE}"],${head},"gates":[{"op":"x","qubits":[0]},${gates}]}\n`;

describe("readCircuitJson: every fault class is refused at the offending value (exit-2 material)", () => {
  const cases: [string, string, RegExp][] = [
    // gphase angle
    ["angle a string", json(`{"op":"gphase","qubits":[],"angle":§"x"}`), /expected "angle" as a whole number in gate 1 \(gphase\) but found "x"/],
    ["angle null", json(`{"op":"gphase","qubits":[],"angle":§null}`), /found null/],
    ["angle missing", json(`§{"op":"gphase","qubits":[]}`), /expected an angle for gphase but found none/],
    ["angle 8", json(`{"op":"gphase","qubits":[],"angle":§8}`), /expected an angle in 0\.\.7 \(units of pi\/4\) but found 8/],
    ["angle 1.5", json(`{"op":"gphase","qubits":[],"angle":§1.5}`), /angle in 0\.\.7 .* found 1\.5/],
    ["angle on x", json(`{"op":"x","qubits":[1],"angle":§2}`), /expected no angle: only gphase has one, not x/],
    ["qubits on gphase", json(`{"op":"gphase","qubits":§[1],"angle":2}`), /expected 0 qubits for gphase but found 1/],
    // negated
    ["negated past the controls", json(`{"op":"mcx","qubits":[0,1,4],"negated":[§7]}`), /expected a control position in 0\.\.1 but found 7/],
    ["negated target", json(`{"op":"mcx","qubits":[0,1,4],"negated":[0,§2]}`), /position 2 is the target/],
    ["negated repeated", json(`{"op":"mcz","qubits":[0,1,4],"negated":[1,§1]}`), /expected distinct positions but 1 appears twice/],
    ["negated on ccx", json(`{"op":"ccx","qubits":[0,1,4],"negated":§[0]}`), /ccx has no control polarity/],
    ["negated not a number", json(`{"op":"mcx","qubits":[0,1,4],"negated":[§"0"]}`), /expected a control position \(a whole number\) in gate 1 \(mcx\) but found "0"/],
    ["negated negative", json(`{"op":"mcz","qubits":[0,1],"negated":[§-1]}`), /control position in 0\.\.1 but found -1/],
    // qubits
    ["qubit -1", json(`{"op":"x","qubits":[§-1]}`), /expected a qubit in 0\.\.9 but found -1 in gate 1 \(x\)/],
    ["qubit past the end", json(`{"op":"cx","qubits":[0,§10]}`), /expected a qubit in 0\.\.9 but found 10/],
    ["qubit 2^31", json(`{"op":"x","qubits":[§2147483648]}`), /found 2147483648/],
    ["qubit beyond 2^53, as written", json(`{"op":"x","qubits":[§100000000000000000000000]}`), /expected a qubit in 0\.\.9 but found 100000000000000000000000 in gate 1 \(x\)$/],
    ["qubit 1e21, as written", json(`{"op":"x","qubits":[§1e21]}`), /but found 1e21 in gate 1/],
    ["angle beyond 2^53, as written", json(`{"op":"gphase","qubits":[],"angle":§100000000000000000000000}`), /angle in 0\.\.7 \(units of pi\/4\) but found 100000000000000000000000 in/],
    ["angle 1e300, as written", json(`{"op":"gphase","qubits":[],"angle":§1e300}`), /but found 1e300 in gate 1/],
    ["negated beyond 2^53, as written", json(`{"op":"mcx","qubits":[0,1,4],"negated":[§100000000000000000000000]}`), /control position in 0\.\.1 but found 100000000000000000000000 in/],
    ["if beyond 2^53, as written", json(`{"op":"x","qubits":[4],"if":§1e100}`), /classical bit in 0\.\.1 but found 1e100 in/],
    ["qubit 1.5", json(`{"op":"x","qubits":[§1.5]}`), /found 1\.5/],
    ["qubit a string", json(`{"op":"x","qubits":[§"1"]}`), /expected a qubit index \(a whole number\) in gate 1 \(x\) but found "1"/],
    ["ccx with a repeated qubit", json(`{"op":"ccx","qubits":[0,1,§0]}`), /expected distinct qubits but qubit 0 appears twice/],
    ["ccx with two qubits", json(`{"op":"ccx","qubits":§[0,1]}`), /expected 3 qubits for ccx but found 2/],
    ["mcx without a target", json(`{"op":"mcx","qubits":§[]}`), /at least one qubit \(the target\)/],
    ["qubits missing", json(`§{"op":"h"}`), /expected "qubits", the list of qubits, in gate 1 \(h\)/],
    ["qubits null", json(`{"op":"h","qubits":§null}`), /expected "qubits" as a list of qubit indices in gate 1 \(h\) but found null/],
    // measure, if
    ["measure without a clbit", json(`§{"op":"measure","qubits":[4]}`), /expected the classical bit a measure writes/],
    ["measure into bit 2 of 2", json(`{"op":"measure","qubits":[4],"clbit":§2}`), /expected a classical bit in 0\.\.1 but found 2/],
    ["clbit on x", json(`{"op":"x","qubits":[4],"clbit":§0}`), /only measure writes one/],
    ["if out of range", json(`{"op":"x","qubits":[4],"if":§5}`), /condition on a classical bit in 0\.\.1 but found 5/],
    ["if a string", json(`{"op":"x","qubits":[4],"if":§"0"}`), /expected "if" as a whole number/],
    ["if without classical bits", json(`{"op":"x","qubits":[4],"if":§0}`, `"qubits":10,"clbits":0,${REGS}`), /expected a condition on a classical bit, but the circuit declares no classical bits; found 0/],
    // gate objects
    ["unknown kind", json(`{"op":§"rx","qubits":[1]}`), /expected a gate kind \(x y z .*\) but found "rx"/],
    ["kind not a string", json(`{"op":§3,"qubits":[1]}`), /expected a gate kind .* but found 3/],
    ["op missing", json(`§{"qubits":[1]}`), /expected "op"/],
    ["unknown gate field", json(`{"op":"x","qubits":[1],§"phase":1}`), /expected a field of gate 1 \(op, qubits, negated, angle, clbit, if\) but found "phase"/],
    ["repeated gate field", json(`{"op":"x","qubits":[1],§"qubits":[2]}`), /"qubits" again/],
    ["gate not an object", json(`§[1]`), /expected gate 1 as an object but found a list/],
  ];
  for (const [name, template, message] of cases) it(name, () => expectRejected(template, message, readCircuitJson));

  const doc = (body: string): string => `{"format":"clausegate-circuit","version":1,"comments":["${WIDE}"],${body}}`;
  const top: [string, string, RegExp][] = [
    ["gates null", doc(`"qubits":10,"clbits":0,${REGS},"gates":§null`), /expected "gates" as a list of gates but found null/],
    ["gates missing", `§${doc(`"qubits":10,"clbits":0,${REGS}`)}`, /expected "gates", the list of gates, but found none/],
    ["overlapping registers", doc(`"qubits":10,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":4},{"name":"work","role":"work","start":§3,"size":6}],"gates":[]`), /expected register work to start at qubit 4, where the one before it ends, but found 3/],
    ["a gap between registers", doc(`"qubits":11,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":4},{"name":"work","role":"work","start":§5,"size":6}],"gates":[]`), /start at qubit 4/],
    ["absurd register size", doc(`"qubits":10,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":4},{"name":"work","role":"work","start":4,"size":§1e12}],"gates":[]`), new RegExp(`expected a register size in 0\\.\\.${MAX_CIRCUIT_QUBITS} but found 1000000000000`)],
    ["registers too large together", doc(`"qubits":1,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":${MAX_CIRCUIT_QUBITS}},{"name":"work","role":"work","start":${MAX_CIRCUIT_QUBITS},"size":§1}],"gates":[]`), /expected at most 67108864 qubits in all/],
    ["negative register size", doc(`"qubits":10,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":§-4}],"gates":[]`), /expected a register size in 0\.\.67108864 but found -4/],
    ["unknown register", doc(`"qubits":4,"clbits":0,"registers":[{"name":§"anc","role":"work","start":0,"size":4}],"gates":[]`), /expected a register named vars, target, work but found "anc"/],
    ["wrong role", doc(`"qubits":4,"clbits":0,"registers":[{"name":"vars","role":§"work","start":0,"size":4}],"gates":[]`), /expected the role "search" for register vars but found "work"/],
    ["registers out of order", doc(`"qubits":5,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":4},{"name":"work","role":"work","start":4,"size":0},{"name":§"target","role":"target","start":4,"size":1}],"gates":[]`), /in the order vars, target, work, each once, but found target after work/],
    ["a register twice", doc(`"qubits":8,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":4},{"name":§"vars","role":"search","start":4,"size":4}],"gates":[]`), /each once/],
    ["a target of two qubits", doc(`"qubits":6,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":4},{"name":"target","role":"target","start":4,"size":§2}],"gates":[]`), /expected the target register to hold 1 qubit but found 2/],
    ["register size a string", doc(`"qubits":4,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":§"4"}],"gates":[]`), /expected the register's "size" \(a whole number\) but found "4"/],
    ["register without a start", doc(`"qubits":4,"clbits":0,"registers":[§{"name":"vars","role":"search","size":4}],"gates":[]`), /expected the register's "start" but found none/],
    ["qubits disagree with the registers", doc(`"qubits":§11,"clbits":0,${REGS},"gates":[]`), /expected the circuit's qubit count to be 10, what its registers hold, but found 11/],
    ["qubits not a number", doc(`"qubits":§"10","clbits":0,${REGS},"gates":[]`), /"qubits", the number of qubits \(a whole number\)/],
    ["clbits negative", doc(`"qubits":10,"clbits":§-1,${REGS},"gates":[]`), /expected "clbits" in 0\.\.67108864 but found -1/],
    ["clbits absurd", doc(`"qubits":10,"clbits":§1e300,${REGS},"gates":[]`), /"clbits", the number of classical bits \(a whole number of at most 2\^53\) but found 1e300$/],
    // Numbers beyond 2^53 are shown as written, never as a double's text ("1e+23").
    ["qubits beyond 2^53", doc(`"qubits":§100000000000000000000000,"clbits":0,${REGS},"gates":[]`), /\(a whole number of at most 2\^53\) but found 100000000000000000000000$/],
    ["register size beyond 2^53", doc(`"qubits":10,"clbits":0,"registers":[{"name":"vars","role":"search","start":0,"size":§100000000000000000000000}],"gates":[]`), /the register's "size" \(a whole number of at most 2\^53\) but found 100000000000000000000000$/],
    ["wrong format", `{"format":§"other","version":1}`, /expected "format": "clausegate-circuit" but found "other"/],
    ["wrong version", `{"format":"clausegate-circuit","version":§2}`, /expected "version": 1 but found 2/],
    ["unknown top-level field", doc(`"qubits":10,§"depth":3,"clbits":0,${REGS},"gates":[]`), /expected a field of the circuit .* but found "depth"/],
    ["a comment not a string", `{"format":"clausegate-circuit","version":1,"comments":["${WIDE}",§7]}`, /expected a comment \(a string\) but found 7/],
    // Syntax, encoding, nesting.
    ["a trailing comma", doc(`"qubits":10,"clbits":0,${REGS},"gates":[{"op":"x","qubits":[1],§}]`), /expected a key in double quotes but found '\}'/],
    ["a missing comma", doc(`"qubits":10 §"clbits":0`), /expected ',' or '\}' but found '"'/],
    ["text after the object", `${doc(`"qubits":10,"clbits":0,${REGS},"gates":[]`)} §x`, /expected the end of the input after the JSON value but found 'x'/],
    ["an unterminated string", `{"format":"clausegate-circuit","comments":[§"${WIDE}`, /expected a closing '"' for this string but found the end of the input/],
    ["a raw control character in a string", `{"format":"clausegate-circuit","comments":["${WIDE}§\t"]}`, /control characters must be escaped/],
    ["a bad escape", `{"format":"clausegate-circuit","comments":["${WIDE}\\§q"]}`, /expected an escape/],
    ["a bad number", doc(`"qubits":-§x`), /expected a digit but found 'x'/],
    ["a number with a leading dot", doc(`"qubits":§.5`), /expected a JSON value but found '\.'/],
    ["nesting too deep", `{"format":"clausegate-circuit","comments":${"[".repeat(63)}§[`, /expected at most 64 levels of nesting/],
  ];
  for (const [name, template, message] of top) it(name, () => expectRejected(template, message, readCircuitJson));

  it("columns are byte columns after non-ASCII text on the same line (hand-counted)", () => {
    // {"comments":["é"],"x": -- '{' is byte 1, 'é' takes bytes 15-16, the key "x" starts at byte 20.
    const r = readCircuitJson('{"comments":["é"],"x":1}');
    expect(r.diagnostics[0]).toMatchObject({ line: 1, column: 20, message: expect.stringMatching(/found "x"/) });
  });
  it("a byte-order mark is skipped and line 1 starts after it", () => {
    expectRejected(`\uFEFF{"format":"clausegate-circuit","version":§9}`, /expected "version": 1 but found 9/, readCircuitJson);
  });
  it("invalid UTF-8 is refused at its first bad byte", () => {
    const bytes = Buffer.concat([Buffer.from('{"format":"clausegate-circuit",\n"comments":["é'), Buffer.from([0xc3, 0x28]), Buffer.from('"]}')]);
    const d = readCircuit(bytes).diagnostics[0]!;
    expect(d).toMatchObject({ line: 2, column: 16, message: "expected UTF-8 text but found the byte 0xc3" });
    for (const bad of [[0xc0, 0x80], [0xed, 0xa0, 0x80], [0xf4, 0x90, 0x80, 0x80], [0xff]]) {
      // Overlong, a surrogate, above U+10FFFF, never valid (Unicode 15, table 3-7).
      expect(readCircuit(Buffer.concat([Buffer.from('{"comments":["'), Buffer.from(bad), Buffer.from('"]}')])).diagnostics[0]!.column).toBe(15);
    }
  });
  it("a JSON list is read as JSON and refused as such", () => {
    expectRejected(`  \n§[{"op":"x","qubits":[0]}]`, /^expected a JSON object \('\{'\) but found '\['$/);
  });
  it("an empty input and a lone brace are refused with one diagnostic", () => {
    for (const text of ["", "{", "{}", "   \n"]) {
      const r = readCircuit(text);
      expect(r.circuit).toBeUndefined();
      expect(r.diagnostics).toHaveLength(1);
    }
  });
});

describe("readCircuitQasm3: every fault class is refused at the offending operand", () => {
  const head = `OPENQASM 3.0;\n// ${WIDE}: a comment of 2-, 3- and 4-byte characters\n// ${WIDE}\ninclude "stdgates.inc";\nqubit[4] vars;\nqubit[1] target;\nqubit[6] work;\nbit[2] outcome;\n`;
  const cases: [string, string, RegExp][] = [
    ["ccx with a repeated qubit", `${head}ccx vars[0], vars[1], §vars[0];\n`, /expected distinct qubits but vars\[0\] appears twice/],
    ["ctrl @ x with a repeated target", `${head}x vars[1]; negctrl(2) @ x work[0], vars[2], §work[0];\n`, /work\[0\] appears twice/],
    ["a qubit past its register", `${head}  cx vars[0], §vars[9];\n`, /expected a declared qubit but found 'vars\[9\]'/],
    ["an undeclared register", `${head}h §anc[0];\n`, /expected a declared qubit but found 'anc\[0\]'/],
    ["ccx with two qubits", `${head}§ccx vars[0], vars[1];\n`, /expected 3 qubits for ccx but found 2/],
    ["too many qubits for ctrl", `${head}§ctrl @ x vars[0], vars[1], vars[2];\n`, /expected 2 qubits \(1 controls and a target\) but found 3/],
    ["ctrl on h", `${head}§ctrl @ h vars[0], vars[1];\n`, /ctrl\/negctrl only on x or z/],
    ["a bad angle", `${head}gphase(§pi/3);\n`, /expected a multiple of pi\/4 .* but found 'pi\/3'/],
    ["measure into an undeclared bit", `${head}§flag[0] = measure work[0];\n`, /expected a declared classical bit but found flag\[0\]/],
    ["measure into bit 2 of 2", `${head}§outcome[2] = measure work[0];\n`, /found outcome\[2\]/],
    ["measure of an undeclared qubit", `${head}outcome[0] = measure §work[6];\n`, /found 'work\[6\]'/],
    ["if on bit 3 of 2", `${head}if (§outcome[3]) { x vars[0]; }\n`, /found outcome\[3\]/],
    ["a repeated qubit inside an if", `${head}if (outcome[0]) { cz work[1], §work[1]; }\n`, /work\[1\] appears twice/],
    ["an unclosed if block", `${head}if (outcome[0]) {\n  x vars[0];\n§`, /expected '\}' to close the if block/],
    ["a stray brace", `${head}§}\n`, /expected a statement but found '\}'/],
    ["a missing semicolon", `${head}x vars[0]§\n`, /expected ';' at the end of the statement/],
    ["an unknown gate", `${head}§rx(pi) vars[0];\n`, /expected a gate, gphase, measure or reset/],
    ["an unknown register name", `OPENQASM 3.0;\n// ${WIDE}\nqubit[4] §x;\n`, /expected a register named vars, target, work but found 'x'/],
    ["a register twice", `OPENQASM 3.0;\n// ${WIDE}\nqubit[4] vars;\nqubit[2] §vars;\n`, /expected each register once but found 'vars' again/],
    ["an absurd register size", `OPENQASM 3.0;\n// ${WIDE}\nqubit[4] vars;\nqubit[§99999999999] work;\n`, /expected a register size in 0\.\.67108864 but found 99999999999/],
    ["an absurd bit register", `OPENQASM 3.0;\n// ${WIDE}\nbit[§4294967296] outcome;\n`, /register size in 0\.\.67108864/],
    ["registers too large together", `OPENQASM 3.0;\nqubit[67108864] vars;\nqubit[§1] work;\n`, /expected at most 67108864 qubits in all but the registers hold 67108865/],
    ["a target of two qubits", `OPENQASM 3.0;\n// ${WIDE}\nqubit[§2] target;\n`, /expected the target register to hold 1 qubit but found 2/],
    ["a declaration after a gate", `${head}x vars[0];\n§qubit[2] more;\n`, /expected declarations before the first gate/],
    ["a second bit register", `${head}§bit[1] more;\n`, /expected one bit register but found a second, 'more'/],
    // A bit register named as a stdgates.inc gate, a keyword or a qubit register is ill-formed OpenQASM 3.
    ["a bit register named ccx", `OPENQASM 3.0;\ninclude "stdgates.inc";\nqubit[4] vars;\nbit[2] §ccx;\n`, /expected the bit register to be named outcome but found 'ccx'/],
    ["a bit register named measure", `OPENQASM 3.0;\nqubit[4] vars;\nbit[2] §measure;\n`, /found 'measure'/],
    ["a bit register named vars", `OPENQASM 3.0;\nqubit[4] vars;\nbit[2] §vars;\n`, /found 'vars'/],
    ["OpenQASM 2", `§OPENQASM 2.0;\ninclude "qelib1.inc";\n`, /expected OpenQASM 3 or clausegate JSON but found OpenQASM 2\.0/],
    ["no version line", `// ${WIDE}\n§qubit[4] vars;\n`, /expected 'OPENQASM 3\.0;' first/],
    // Text that is no OpenQASM: said so, not that its first line lacks a ';'.
    ["a DIMACS file", `// ${WIDE}\n  §p cnf 3 2\n1 -2 0\n`, /^expected 'OPENQASM 3\.0;' first but found 'p cnf 3 2'$/],
    ["null", `§null`, /^expected 'OPENQASM 3\.0;' first but found 'null'$/],
    // CR line ends: the whole file would be one line, all of it after the first // a comment.
    ["bare CR line ends", `OPENQASM 3.0;§\r// ${WIDE}\rinclude "stdgates.inc";\rqubit[4] vars;\r`, /^a bare carriage return \(CR, not followed by LF\): it is not a line end$/],
    ["a bare CR inside a line", `${head}qubit[1] work;§\rx vars[0];\n`, /bare carriage return/],
    // No empty statement in the official grammar (qasm3Parser.g4, openqasm/openqasm).
    ["a lone ';'", `${head}x vars[0];\n§;\n`, /^expected a statement before ';' but found none/],
    ["a doubled ';'", `${head}x vars[0];§;\n`, /^expected a statement before ';' but found none/],
  ];
  for (const [name, template, message] of cases) it(name, () => expectRejected(template, message, readCircuitQasm3));
  it("invalid UTF-8 in a comment is refused at its byte", () => {
    const bytes = Buffer.concat([Buffer.from(`OPENQASM 3.0;\n// ${WIDE} `), Buffer.from([0xe2, 0x28]), Buffer.from("\nqubit[1] vars;\n")]);
    expect(readCircuit(bytes).diagnostics[0]).toMatchObject({ line: 2, column: 4 + Buffer.byteLength(WIDE) + 1, message: "expected UTF-8 text but found the byte 0xe2" });
  });
});

describe("what clausegate writes reads back unchanged", () => {
  const same = (a: Circuit, b: Circuit): void => {
    expect({ q: b.qubits, c: b.clbits, r: b.registers, g: b.gates }).toEqual({ q: a.qubits, c: a.clbits, r: a.registers, g: a.gates });
    expect(Array.from(b.kind)).toEqual(Array.from(a.kind));
    expect(Array.from(b.cond)).toEqual(Array.from(a.cond));
  };
  it("JSON: every kind, strategy, basis and uncomputation, gate for gate", () => {
    fc.assert(
      fc.property(fc.integer({ min: 3, max: 9 }), fc.integer({ min: 1, max: 500 }), fc.constantFrom("phase", "flag"), fc.constantFrom("wide", "lean"),
        fc.constantFrom("mcx", "toffoli", "clifford+t"), fc.constantFrom("unitary", "measured"), (n, seed, kind, strategy, basis, uncompute) => {
          const c = compileOracle(randomKSat(n, 2 * n, 3, seed), { kind, strategy, basis, uncompute }).circuit;
          expect(validateCircuit(c)).toBeNull();
          const back = readCircuit(collect((s) => emitJson(c, s, [WIDE])));
          expect(back.diagnostics).toEqual([]);
          same(c, back.circuit!);
          expect(Array.from(back.circuit!.ops)).toEqual(Array.from(c.ops));
          // OpenQASM 3 writes and/unand as controlled x and may wrap an all-|0> mcz in X gates, so
          // only its invariants and size are compared here (test/sim/verify checks its meaning).
          const q = readCircuit(collect((s) => emitQasm3(c, s, [WIDE])));
          expect(q.diagnostics).toEqual([]);
          expect(validateCircuit(q.circuit!)).toBeNull();
          expect(q.circuit!.registers).toEqual(c.registers.filter((r) => r.size > 0 || r.role === "search" || r.role === "work"));
        }),
      { numRuns: 40 },
    );
  }, 60_000);
  it("a byte-order mark before a valid circuit is accepted", () => {
    const c = compileOracle(randomKSat(4, 8, 3, 1)).circuit;
    for (const text of [collect((s) => emitJson(c, s)), collect((s) => emitQasm3(c, s))]) {
      expect(readCircuit(`\uFEFF${text}`).diagnostics).toEqual([]);
    }
  });
});
