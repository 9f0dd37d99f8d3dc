// The sparse simulator (the independent check behind every refutation) against a dense
// state vector written here from the gate definitions, on qubits spread over several 32-bit words,
// with every gate kind: Hadamards that open and merge thousands of terms, measurements (forced
// and drawn), resets, conditioned gates and the temporary ANDs' checks.
import { describe, expect, it } from "vitest";
import { CircuitBuilder, K } from "../helpers/circuits.js";
import { basisTerm, CircuitFault, runSparse, seededRandom, type Circuit, type Term } from "../helpers/lib.js";

/** A dense simulation of `c` restricted to the qubits in `on` (every gate must act only on them). */
function dense(c: Circuit, on: readonly number[], input: readonly number[], outcomes: readonly number[]): { re: Float64Array; im: Float64Array; scale: number } {
  const n = on.length;
  const index = new Map(on.map((q, j) => [q, j]));
  let re = new Float64Array(2 ** n);
  let im = new Float64Array(2 ** n);
  re[input.reduce((x, q) => x | (1 << index.get(q)!), 0)] = 1;
  const clbits = new Uint8Array(c.clbits);
  const bitOf = (x: number, op: number): number => (x >> index.get(op >>> 1)!) & 1;
  const firesAll = (x: number, ops: number[]): boolean => ops.every((op) => bitOf(x, op) === ((op & 1) ? 0 : 1));
  const phase = (x: number, k: number): void => {
    const a = (Math.PI / 4) * k;
    const [r, i] = [re[x]!, im[x]!];
    re[x] = r * Math.cos(a) - i * Math.sin(a);
    im[x] = r * Math.sin(a) + i * Math.cos(a);
  };
  let m = 0;
  let scale = 1;
  for (let g = 0; g < c.gates; g++) {
    if (c.cond[g]! >= 0 && clbits[c.cond[g]!] !== 1) continue;
    const ops = Array.from(c.ops.subarray(c.opStart[g]!, c.opStart[g + 1]!));
    const kind = c.kind[g]!;
    const tq = ops[ops.length - 1]!;
    const flipIf = (cond: (x: number) => boolean, q: number): void => {
      const nr = new Float64Array(re.length);
      const ni = new Float64Array(im.length);
      for (let x = 0; x < re.length; x++) {
        const y = cond(x) ? x ^ (1 << index.get(q >>> 1)!) : x;
        nr[y] = re[x]!;
        ni[y] = im[x]!;
      }
      re = nr;
      im = ni;
    };
    const diag = (cond: (x: number) => boolean, k: number): void => {
      for (let x = 0; x < re.length; x++) if (cond(x)) phase(x, k);
    };
    const one = (x: number): boolean => bitOf(x, ops[0]!) === 1;
    switch (kind) {
      case K.x: flipIf(() => true, ops[0]!); break;
      case K.y: diag(one, 4); flipIf(() => true, ops[0]!); diag(() => true, 2); break;
      case K.z: diag(one, 4); break;
      case K.s: diag(one, 2); break;
      case K.sdg: diag(one, 6); break;
      case K.t: diag(one, 1); break;
      case K.tdg: diag(one, 7); break;
      case K.gphase: diag(() => true, ops[0]!); break;
      case K.cx: case K.ccx: case K.mcx: flipIf((x) => firesAll(x, ops.slice(0, -1)), tq); break;
      case K.cz: case K.mcz: diag((x) => firesAll(x, ops), 4); break;
      case K.h: {
        const b = 1 << index.get(ops[0]! >>> 1)!;
        for (let x = 0; x < re.length; x++) {
          if (x & b) continue;
          const [r0, i0, r1, i1] = [re[x]!, im[x]!, re[x | b]!, im[x | b]!];
          re[x] = (r0 + r1) * Math.SQRT1_2;
          im[x] = (i0 + i1) * Math.SQRT1_2;
          re[x | b] = (r0 - r1) * Math.SQRT1_2;
          im[x | b] = (i0 - i1) * Math.SQRT1_2;
        }
        break;
      }
      case K.measure: case K.reset: {
        const o = outcomes[m++]!;
        let p = 0;
        for (let x = 0; x < re.length; x++) if (bitOf(x, ops[0]!) === o) p += re[x]! ** 2 + im[x]! ** 2;
        for (let x = 0; x < re.length; x++) {
          if (bitOf(x, ops[0]!) === o) {
            re[x] = re[x]! / Math.sqrt(p);
            im[x] = im[x]! / Math.sqrt(p);
          } else re[x] = im[x] = 0;
        }
        scale *= Math.sqrt(p);
        if (kind === K.measure) clbits[ops[1]!] = o;
        else if (o) flipIf(() => true, ops[0]!);
        break;
      }
      default: throw new Error(`the reference has no gate ${kind}`);
    }
  }
  return { re, im, scale };
}

/** Checks the sparse run's terms against the dense state (every other qubit must be 0). */
function expectSame(terms: Term[], on: readonly number[], want: { re: Float64Array; im: Float64Array }): void {
  const got = new Map<number, Term>();
  for (const t of terms) {
    let x = 0;
    for (let q = 0; q < t.bits.length * 32; q++) {
      if (((t.bits[q >>> 5]! >>> (q & 31)) & 1) === 0) continue;
      const j = on.indexOf(q);
      expect(j, `qubit ${q} is set but no gate touches it`).toBeGreaterThanOrEqual(0);
      x |= 1 << j;
    }
    expect(got.has(x), "two terms with one basis state").toBe(false);
    got.set(x, t);
  }
  for (let x = 0; x < want.re.length; x++) {
    const t = got.get(x) ?? { re: 0, im: 0 };
    expect(Math.abs(t.re - want.re[x]!) + Math.abs(t.im - want.im[x]!), `amplitude of ${x}`).toBeLessThan(1e-9);
  }
}

// Spread over three words, with both sides of each word boundary.
const ON = [0, 5, 31, 32, 33, 63, 64, 70] as const;
const QUBITS = 71;

function randomCircuit(seed: number, gates: number): Circuit {
  const r = seededRandom(seed);
  const pick = (): number => ON[Math.floor(r() * ON.length)]!;
  const distinct = (k: number): number[] => {
    const out: number[] = [];
    while (out.length < k) {
      const q = pick();
      if (!out.includes(q)) out.push(q);
    }
    return out;
  };
  const b = new CircuitBuilder({ search: QUBITS, target: 0, clbits: 3 });
  const singles = [K.x, K.y, K.z, K.h, K.h, K.h, K.s, K.sdg, K.t, K.tdg];
  for (let i = 0; i < gates; i++) {
    const u = r();
    const cond = r() < 0.1 ? Math.floor(r() * 3) : -1;
    if (u < 0.5) b.add(singles[Math.floor(r() * singles.length)]!, pick() << 1, NaN, NaN, cond);
    else if (u < 0.6) b.add(K.cx, ...(distinct(2).map((q) => q << 1) as [number, number]), NaN, cond);
    else if (u < 0.67) b.add(K.cz, ...(distinct(2).map((q) => q << 1) as [number, number]), NaN, cond);
    else if (u < 0.72) b.add(K.ccx, ...(distinct(3).map((q) => q << 1) as [number, number, number]), cond);
    else if (u < 0.85) {
      const qs = distinct(1 + Math.floor(r() * 4));
      // Any operand of an mcz may be negated; an mcx's target may not.
      const kind = r() < 0.5 ? K.mcx : K.mcz;
      b.addN(kind, qs.map((q, j) => (q << 1) | ((kind === K.mcz || j < qs.length - 1) && r() < 0.5 ? 1 : 0)), cond);
    } else if (u < 0.9) b.add(K.gphase, Math.floor(r() * 8), NaN, NaN, cond);
    else if (u < 0.96) b.add(K.measure, pick() << 1, Math.floor(r() * 3));
    else b.add(K.reset, pick() << 1);
  }
  return b.finish();
}

describe("runSparse against a dense state vector", () => {
  it("random circuits of every kind on qubits across three words, outcomes drawn then forced", () => {
    for (let seed = 1; seed <= 60; seed++) {
      const c = randomCircuit(seed, 80);
      const input = ON.filter((_, j) => (seed >> (j % 5)) & 1);
      const record: number[] = [];
      const run = runSparse(c, [basisTerm(c.qubits, input)], seededRandom(seed), { record });
      const want = dense(c, ON, input, record);
      expectSame(run.terms, ON, want);
      expect(run.scale).toBeCloseTo(want.scale, 9);
      // The same outcomes forced give the same state.
      const again = runSparse(c, [basisTerm(c.qubits, input)], seededRandom(seed + 1000), { forced: record });
      expectSame(again.terms, ON, want);
    }
  });

  it("opens 2^12 terms with Hadamards on twelve qubits, phases them, and closes them to one", () => {
    const on = [0, 3, 17, 31, 32, 40, 63, 64, 80, 95, 96, 127];
    const b = new CircuitBuilder({ search: 128, target: 0 });
    for (const q of on) b.add(K.h, q << 1);
    for (let j = 0; j + 1 < on.length; j++) b.add(K.cz, on[j]! << 1, on[j + 1]! << 1).add(K.t, on[j]! << 1);
    b.addN(K.mcz, on.slice(0, 6).map((q, j) => (q << 1) | (j & 1)));
    const open = b.finish();
    const r1 = runSparse(open, [basisTerm(128, [3, 64, 127])], seededRandom(1));
    expect(r1.terms).toHaveLength(4096);
    expectSame(r1.terms, on, dense(open, on, [3, 64, 127], []));
    // Undoing the phases and the Hadamards merges every term back into the input.
    const b2 = new CircuitBuilder({ search: 128, target: 0 });
    for (let g = 0; g < open.gates; g++) b2.copy(open, g);
    b2.addN(K.mcz, on.slice(0, 6).map((q, j) => (q << 1) | (j & 1)));
    for (let j = on.length - 2; j >= 0; j--) b2.add(K.tdg, on[j]! << 1).add(K.cz, on[j]! << 1, on[j + 1]! << 1);
    for (const q of on) b2.add(K.h, q << 1);
    const r2 = runSparse(b2.finish(), [basisTerm(128, [3, 64, 127])], seededRandom(1));
    expect(r2.terms).toHaveLength(1);
    expect(Array.from(r2.terms[0]!.bits)).toEqual(Array.from(basisTerm(128, [3, 64, 127]).bits));
    expect(r2.terms[0]!.re).toBeCloseTo(1, 9);
    expect(r2.terms[0]!.im).toBeCloseTo(0, 9);
  });

  it("merges 2^16 terms that differ only in the high bits of their words in well under a second", () => {
    // Rows alike in their low bits once all fell into one hash slot: quadratic probing, 109 s for
    // one confirming run at 200 variables.
    const on = [...Array.from({ length: 8 }, (_, i) => 24 + i), ...Array.from({ length: 8 }, (_, i) => 56 + i)];
    const b = new CircuitBuilder({ search: 64, target: 0 });
    for (const q of on) b.add(K.h, q << 1);
    b.add(K.t, 24 << 1).add(K.cx, 24 << 1, 63 << 1);
    for (const q of on) b.add(K.h, q << 1);
    const t0 = performance.now();
    const run = runSparse(b.finish(), [basisTerm(64, [])], seededRandom(1));
    expect(performance.now() - t0).toBeLessThan(1500);
    expect(run.terms.length).toBeLessThanOrEqual(4);
  });

  it("a temporary AND faults at its gate when one term of a superposition has its target set", () => {
    const b = new CircuitBuilder({ search: 2, target: 0, work: 40 });
    b.add(K.h, 0).add(K.and, 0, 2 << 1, 33 << 1).add(K.unand, 0, 2 << 1, 33 << 1).add(K.cx, 0, 33 << 1).add(K.and, 1 << 1, 2 << 1, 33 << 1);
    const c = b.finish();
    expect(() => runSparse(c, [basisTerm(c.qubits, [])], seededRandom(1))).toThrow(CircuitFault);
    try {
      runSparse(c, [basisTerm(c.qubits, [])], seededRandom(1));
    } catch (e) {
      expect((e as CircuitFault).gate).toBe(4);
    }
    // Without the stray CNOT the ANDs are clean in both terms.
    const ok = new CircuitBuilder({ search: 2, target: 0, work: 40 });
    ok.add(K.h, 0).add(K.and, 0, 2 << 1, 33 << 1).add(K.unand, 0, 2 << 1, 33 << 1);
    expect(runSparse(ok.finish(), [basisTerm(42, [])], seededRandom(1)).terms).toHaveLength(2);
  });

  it("a forced outcome of probability zero is a fault", () => {
    const b = new CircuitBuilder({ search: 40, target: 0, clbits: 1 });
    b.add(K.x, 35 << 1).add(K.measure, 35 << 1, 0);
    expect(() => runSparse(b.finish(), [basisTerm(40, [])], seededRandom(1), { forced: [0] })).toThrow(CircuitFault);
  });
});
