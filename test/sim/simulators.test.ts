// The simulators against outside references: gate identities, the CCX unitary, and the npm
// state-vector simulator quantum-circuit on random circuits.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { arbitraryCircuit, CircuitBuilder, K, sameState, stateOf } from "../helpers/circuits.js";
import { collect, emitQasm2, type Circuit } from "../helpers/lib.js";
import { quantumCircuitRun } from "../helpers/reference.js";
import { compileBitProgram, newBlock, runBlock } from "../../dist/src/sim/bitsim.js";

const one = (build: (b: CircuitBuilder) => void, qubits = 1): Circuit => {
  const b = new CircuitBuilder({ search: qubits, target: 0 });
  build(b);
  return b.finish();
};
const equal = (a: Circuit, b: Circuit): void => {
  for (let x = 0; x < 2 ** a.qubits; x++) expect(sameState(stateOf(a, x), stateOf(b, x))).toBe(true);
};

describe("textbook gate identities (exact, global phase included)", () => {
  it("HZH = X", () => equal(one((b) => b.add(K.h, 0).add(K.z, 0).add(K.h, 0)), one((b) => b.add(K.x, 0))));
  it("T^8 = I", () => equal(one((b) => { for (let i = 0; i < 8; i++) b.add(K.t, 0); }), one(() => {})));
  it("S = T^2, Z = S^2, Sdg = S^3", () => {
    equal(one((b) => b.add(K.t, 0).add(K.t, 0)), one((b) => b.add(K.s, 0)));
    equal(one((b) => b.add(K.s, 0).add(K.s, 0)), one((b) => b.add(K.z, 0)));
    equal(one((b) => b.add(K.s, 0).add(K.s, 0).add(K.s, 0)), one((b) => b.add(K.sdg, 0)));
  });
  it("CZ = (I x H) CX (I x H), and HXH = Z", () => {
    equal(one((b) => b.add(K.cz, 0, 2), 2), one((b) => b.add(K.h, 2).add(K.cx, 0, 2).add(K.h, 2), 2));
    equal(one((b) => b.add(K.h, 0).add(K.x, 0).add(K.h, 0)), one((b) => b.add(K.z, 0)));
  });
  it("Y = i X Z", () => equal(one((b) => b.add(K.y, 0)), one((b) => b.add(K.z, 0).add(K.x, 0).add(K.gphase, 2))));
});

describe("against the npm package quantum-circuit (amplitudes to 1e-9)", () => {
  it("random circuits of x y z h s sdg t tdg cx cz ccx on 4 qubits, every basis input", () => {
    const plain = arbitraryCircuit(4, 25).filter((c) => Array.from(c.kind).every((k) => k <= K.ccx));
    fc.assert(
      fc.property(plain, (c) => {
        const qasm = collect((s) => emitQasm2(c, s));
        for (let x = 0; x < 16; x++) {
          const ours = stateOf(c, x);
          const theirs = quantumCircuitRun(qasm, [0, 1, 2, 3].map((q) => (x >> q) & 1));
          const norm = [...ours.values()].filter((t) => t.re * t.re + t.im * t.im > 1e-18);
          expect(norm.length).toBe([...theirs.values()].filter(([re, im]) => re * re + im * im > 1e-18).length);
          for (const t of norm) {
            const [re, im] = theirs.get(t.bits[0]!) ?? [0, 0];
            expect(t.re).toBeCloseTo(re, 9);
            expect(t.im).toBeCloseTo(im, 9);
          }
        }
      }),
      { numRuns: 40 },
    );
  });
});

describe("the bit-parallel simulator agrees with the state-vector simulator", () => {
  it("on random classical circuits (X, CX, CCX, MCX and MCZ with polarities, Z, CZ), every lane", () => {
    const classical = arbitraryCircuit(5, 30).filter((c) => Array.from(c.kind).every((k) => [K.x, K.z, K.cx, K.cz, K.ccx, K.mcx, K.mcz].includes(k)));
    fc.assert(
      fc.property(classical, (c) => {
        const p = compileBitProgram(c);
        if ("unsupported" in p) throw new Error(p.unsupported);
        const block = newBlock(p, 1);
        for (let q = 0; q < 5; q++) block.state[q] = [0xaaaaaaaa, 0xcccccccc, 0xf0f0f0f0, 0xff00ff00, 0xffff0000][q]! | 0;
        runBlock(p, block, () => 0);
        for (let x = 0; x < 32; x++) {
          const terms = [...stateOf(c, x).values()];
          expect(terms).toHaveLength(1);
          let out = 0;
          for (let q = 0; q < 5; q++) out |= ((block.state[q]! >>> x) & 1) << q;
          expect(terms[0]!.bits[0]).toBe(out);
          expect(terms[0]!.re).toBeCloseTo((block.sign[0]! >>> x) & 1 ? -1 : 1, 12);
        }
      }),
      { numRuns: 200 },
    );
  });
});
