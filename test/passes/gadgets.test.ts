// The Clifford+T constructions, checked exactly.
import { describe, expect, it } from "vitest";
import { CircuitBuilder, K, stateOf } from "../helpers/circuits.js";
import { temporaryAnd, temporaryAndInverse, toffoli7 } from "../../dist/src/passes/lower.js";
import { countCircuit, type Circuit } from "../helpers/lib.js";

/** The single basis output and its amplitude of a permutation-like circuit on input x. */
function image(c: Circuit, x: number): { out: number; re: number; im: number } {
  const terms = [...stateOf(c, x).values()].filter((t) => t.re * t.re + t.im * t.im > 1e-18);
  expect(terms).toHaveLength(1);
  const t = terms[0]!;
  return { out: t.bits[0]!, re: t.re, im: t.im };
}

/** Toffoli as drawn in Nielsen & Chuang 2010, Fig. 4.9 (6 CNOT, 7 T, 2 H), in that order. */
function textbookToffoli(): Circuit {
  const b = new CircuitBuilder({ search: 3, target: 0 });
  const [a, c, t] = [0, 2, 4]; // qubits 0, 1, 2 encoded
  b.add(K.h, t).add(K.cx, c, t).add(K.tdg, t).add(K.cx, a, t).add(K.t, t).add(K.cx, c, t).add(K.tdg, t).add(K.cx, a, t);
  b.add(K.t, c).add(K.t, t).add(K.h, t).add(K.cx, a, c).add(K.t, a).add(K.tdg, c).add(K.cx, a, c);
  return b.finish();
}

describe("Toffoli constructions equal the CCX unitary exactly (8x8, global phase 1)", () => {
  const ccxImage = (x: number): number => (x & 1 && x & 2 ? x ^ 4 : x);
  it("7-T, T-depth-3 Toffoli (Amy, Maslov, Mosca & Roetteler 2013)", () => {
    const b = new CircuitBuilder({ search: 3, target: 0 });
    toffoli7(b, 0, 1, 2);
    const c = b.finish();
    for (let x = 0; x < 8; x++) expect(image(c, x)).toEqual({ out: ccxImage(x), re: expect.closeTo(1, 9), im: expect.closeTo(0, 9) });
    const k = countCircuit(c);
    expect(k.tCount).toBe(7);
    expect(k.tDepth).toBe(3);
  });
  it("the textbook Toffoli of Nielsen & Chuang Fig. 4.9: CCX exactly, T-depth 4 as written (ASAP)", () => {
    const c = textbookToffoli();
    for (let x = 0; x < 8; x++) expect(image(c, x)).toEqual({ out: ccxImage(x), re: expect.closeTo(1, 9), im: expect.closeTo(0, 9) });
    expect(countCircuit(c).tCount).toBe(7);
    expect(countCircuit(c).tDepth).toBe(4);
  });
});

describe("temporary logical-AND (Gidney 2018)", () => {
  it("computes a AND b into a fresh |0> with 4 T, exactly (amplitude 1)", () => {
    const b = new CircuitBuilder({ search: 3, target: 0 });
    temporaryAnd(b, 0, 1, 2);
    const c = b.finish();
    for (let x = 0; x < 4; x++) expect(image(c, x)).toEqual({ out: x | ((x & 1) & (x >> 1)) << 2, re: expect.closeTo(1, 9), im: expect.closeTo(0, 9) });
    expect(countCircuit(c).tCount).toBe(4);
  });
  it("its unitary inverse restores |a, b, 0> exactly", () => {
    const b = new CircuitBuilder({ search: 3, target: 0 });
    temporaryAnd(b, 0, 1, 2);
    temporaryAndInverse(b, 0, 1, 2);
    const c = b.finish();
    for (let x = 0; x < 4; x++) expect(image(c, x)).toEqual({ out: x, re: expect.closeTo(1, 9), im: expect.closeTo(0, 9) });
  });
});
