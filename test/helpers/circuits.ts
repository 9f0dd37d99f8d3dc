/** Circuit helpers for tests: random circuits, exact state comparison, and law checks for passes. */
import fc from "fast-check";
import { CircuitBuilder, K, type Circuit } from "../../dist/src/ir/circuit.js";
import { basisTerm, runSparse, seededRandom, type Term } from "./lib.js";

export { CircuitBuilder, K };

/** Runs a circuit from a basis state (bit q of `x` is qubit q) and returns its terms by key. */
export function stateOf(c: Circuit, x: number, seed = 1): Map<string, Term> {
  const ones: number[] = [];
  for (let q = 0; q < c.qubits; q++) if (Math.floor(x / 2 ** q) % 2 === 1) ones.push(q);
  const run = runSparse(c, [basisTerm(c.qubits, ones)], seededRandom(seed));
  return new Map(run.terms.map((t) => [Array.from(t.bits).join(","), t]));
}

/** True when two states agree to 1e-9 in every amplitude (global phase included). */
export function sameState(a: Map<string, Term>, b: Map<string, Term>): boolean {
  const keys = new Set([...a.keys(), ...b.keys()]);
  for (const k of keys) {
    const x = a.get(k) ?? { re: 0, im: 0 };
    const y = b.get(k) ?? { re: 0, im: 0 };
    if (Math.abs(x.re - y.re) > 1e-9 || Math.abs(x.im - y.im) > 1e-9) return false;
  }
  return true;
}

type GateSpec = { kind: string; qubits: number[]; negated: readonly boolean[] };

/** Random unitary circuits over `qubits` qubits, with every unitary kind (polarities included). */
export function arbitraryCircuit(qubits: number, maxGates = 30): fc.Arbitrary<Circuit> {
  const distinct = (k: number): fc.Arbitrary<number[]> => fc.uniqueArray(fc.integer({ min: 0, max: qubits - 1 }), { minLength: k, maxLength: k });
  const single = fc.record({ kind: fc.constantFrom("x", "y", "z", "h", "s", "sdg", "t", "tdg"), qubits: distinct(1), negated: fc.constant([false]) });
  const two = fc.record({ kind: fc.constantFrom("cx", "cz"), qubits: distinct(2), negated: fc.constant([false, false]) });
  const three = fc.record({ kind: fc.constant("ccx"), qubits: distinct(Math.min(3, qubits)), negated: fc.constant([false, false, false]) });
  const multi = fc
    .integer({ min: 1, max: qubits })
    .chain((k) => fc.record({ kind: fc.constantFrom("mcx", "mcz"), qubits: distinct(k), negated: fc.array(fc.boolean(), { minLength: k, maxLength: k }) }));
  const gate: fc.Arbitrary<GateSpec> = fc.oneof({ weight: 4, arbitrary: single }, { weight: 3, arbitrary: two }, { weight: qubits >= 3 ? 1 : 0, arbitrary: three }, { weight: 2, arbitrary: multi });
  // Runs of the same few gates make cancellations and merges likely.
  return fc.array(gate, { maxLength: maxGates }).chain((gates) => fc.shuffledSubarray([...gates, ...gates], { minLength: 0 })).map((gates) => {
    const b = new CircuitBuilder({ search: qubits, target: 0 });
    for (const g of gates) {
      const kind = (K as Record<string, number>)[g.kind]!;
      const ops = g.qubits.map((q, i) => {
        const isTarget = g.kind === "mcx" && i === g.qubits.length - 1;
        return (q << 1) | (g.negated[i] && !isTarget && (g.kind === "mcx" || g.kind === "mcz") ? 1 : 0);
      });
      b.addN(kind, ops);
    }
    return b.finish();
  });
}

/** Asserts that `pass` keeps the action of `c` on every basis input and never adds gates. */
export function checkPassLaws(pass: (c: Circuit) => Circuit, c: Circuit): void {
  const after = pass(c);
  if (after.gates > c.gates) throw new Error(`gate count grew from ${c.gates} to ${after.gates}`);
  for (let x = 0; x < 2 ** c.qubits; x++) {
    if (!sameState(stateOf(c, x), stateOf(after, x))) throw new Error(`action differs on basis input ${x}`);
  }
}
