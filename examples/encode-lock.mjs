// Encodes the tool-shed lock example (examples/shed-lock.cnf) from the lock's check circuit, the
// way a hardware-to-CNF encoder does (Tseitin: one variable per gate output, the clauses of each
// gate, unit clauses forcing the outputs). Deterministic: rerun to reproduce the file.
//   node examples/encode-lock.mjs
//
// The allotment's tool shed has a keypad of hex keys; the code is three digits d0 d1 d2 (4 bits
// each, variables 1..12, least significant bit first). The lock's check circuit opens when
//   1. d0 + d1 = 19 (a 4-bit ripple-carry adder, 5-bit sum),
//   2. d2 XOR (d0 rotated left by one bit) = 1010 in binary (bits 0..3: 0,1,0,1),
//   3. d1 AND d2 is not zero (some key bit is set in both digits).
// Every gate output is a variable of its own; only the 12 code bits are free. The script also
// counts the codes that open the lock by running the circuit on all 4096 codes.
import { writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const here = dirname(fileURLToPath(import.meta.url));
const clauses = [];
let next = 13; // variables 1..12 are the code bits
const fresh = () => next++;
const digit = (d) => [0, 1, 2, 3].map((b) => 1 + 4 * d + b);

// Tseitin definitions: y <-> a AND b, y <-> a OR b, y <-> a XOR b (inputs are literals).
function and2(a, b) {
  const y = fresh();
  clauses.push([-y, a], [-y, b], [y, -a, -b]);
  return y;
}
function or2(a, b) {
  const y = fresh();
  clauses.push([y, -a], [y, -b], [-y, a, b]);
  return y;
}
function xor2(a, b) {
  const y = fresh();
  clauses.push([-y, a, b], [-y, -a, -b], [y, -a, b], [y, a, -b]);
  return y;
}
const force = (l, value) => clauses.push([value ? l : -l]);

const [d0, d1, d2] = [digit(0), digit(1), digit(2)];

// 1. Ripple-carry adder: sum bit i = a xor b xor carry, carry out = (a and b) or (carry and (a xor b)).
let carry = 0;
const sum = [];
for (let i = 0; i < 4; i++) {
  const p = xor2(d0[i], d1[i]);
  if (carry === 0) {
    sum.push(p);
    carry = and2(d0[i], d1[i]);
  } else {
    sum.push(xor2(p, carry));
    carry = or2(and2(d0[i], d1[i]), and2(carry, p));
  }
}
sum.push(carry);
const TARGET_SUM = 19;
sum.forEach((l, i) => force(l, (TARGET_SUM >> i) & 1));

// 2. d2 XOR rotl(d0, 1) = 1010 (bit i of rotl(d0, 1) is bit i-1 mod 4 of d0).
const PATTERN = 0b1010;
for (let i = 0; i < 4; i++) force(xor2(d2[i], d0[(i + 3) % 4]), (PATTERN >> i) & 1);

// 3. Some bit set in both d1 and d2.
let any = and2(d1[0], d2[0]);
for (let i = 1; i < 4; i++) any = or2(any, and2(d1[i], d2[i]));
force(any, 1);

// The same circuit on plain numbers, over all 4096 codes.
const opens = [];
for (let code = 0; code < 4096; code++) {
  const a = code & 15;
  const b = (code >> 4) & 15;
  const c = (code >> 8) & 15;
  const rot = ((a << 1) | (a >> 3)) & 15;
  if (a + b === TARGET_SUM && (c ^ rot) === PATTERN && (b & c) !== 0) opens.push([a, b, c]);
}

const variables = next - 1;
const lines = [
  "c clausegate example: the allotment tool shed's keypad lock, encoded from its check circuit",
  "c code digits d0 d1 d2 (hex keys, 4 bits each): variable 1 + 4*digit + bit, least significant bit first",
  `c opens when d0 + d1 = ${TARGET_SUM}, d2 xor rotl(d0, 1) = ${PATTERN.toString(2)}, and d1 and d2 share a set bit`,
  `c variables 13..${variables} are gate outputs (Tseitin); written by examples/encode-lock.mjs`,
  `c codes that open it: ${opens.length}`,
  `p cnf ${variables} ${clauses.length}`,
  ...clauses.map((c) => `${c.join(" ")} 0`),
];
writeFileSync(join(here, "shed-lock.cnf"), `${lines.join("\n")}\n`);
process.stdout.write(`shed-lock.cnf: ${variables} variables, ${clauses.length} clauses, ${opens.length} codes open the lock: ${opens.map((d) => d.map((x) => x.toString(16)).join("")).join(" ")}\n`);
