// The structured oracles streamed from their recorded checks (cost/structuredSource.ts) are the
// built structured circuits (synth/structured.ts) replayed: call for call, with the same ids and
// the same ends of spans, on random formulas with planted definitions (AND / OR / XOR / XNOR /
// NOT / buffer gates), parity constraints, exactly-one and at-most-one groups; full and free
// register, phase and flag, wide and lean. And the counting engine over the stream gives the
// figures of the built circuit after lowering and the passes, both uncomputations (the cost table's
// count and the cost front's).
import { existsSync, readFileSync } from "node:fs";
import { resolve } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { mulberry32, multiplier, randomCircuit, randomXorRows, xorSystem, type Encoded } from "../helpers/encoders.js";
import { ROOT } from "../helpers/cli.js";
import { cnfFromClauses, countConstruction, readDimacs, type Cnf } from "../helpers/lib.js";
import { planOracle, simplify, synthesizeStructured, type StructuredFormula } from "../../dist/src/synth/index.js";
import { recoverStructure } from "../../dist/src/structure/index.js";
import { builtCounts } from "../../dist/src/cost/built.js";
import { LoweringStream, VirtualIds, type LogicalSink } from "../../dist/src/cost/lowering.js";
import { CountingEngine, type EngineResult } from "../../dist/src/cost/engine.js";
import { lastUses, replayLogical } from "../../dist/src/cost/sources.js";
import { StructuredSource } from "../../dist/src/cost/structuredSource.js";
import { countConstructionOracle } from "../../dist/src/cost/front.js";

type Register = "full" | "free";
type Kind = "phase" | "flag";

/** Every call as a line, ids and flags exactly as given. */
class Calls implements LogicalSink {
  readonly out: string[] = [];
  and(ctrls: ArrayLike<number>, t: number): void {
    this.out.push(`and ${Array.from(ctrls).join(",")} ${t}`);
  }
  andPair(a: number, b: number, t: number): void {
    this.out.push(`andPair ${a},${b} ${t}`);
  }
  unand(t: number, dies: boolean, controlsDie = 0): void {
    this.out.push(`unand ${t} ${dies} ${controlsDie}`);
  }
  mcx(ctrls: ArrayLike<number>, t: number, dies: boolean): void {
    this.out.push(`mcx ${Array.from(ctrls).join(",")} ${t} ${dies}`);
  }
  mcx1(ctrl: number, t: number, dies: boolean): void {
    this.out.push(`mcx1 ${ctrl} ${t} ${dies}`);
  }
  mcz(qs: ArrayLike<number>): void {
    this.out.push(`mcz ${Array.from(qs).join(",")}`);
  }
  single(template: number, q: number, dies: boolean): void {
    this.out.push(`single ${template} ${q} ${dies}`);
  }
  measure(q: number): void {
    this.out.push(`measure ${q}`);
  }
  gphase(): void {
    this.out.push("gphase");
  }
}

/**
 * A random encoded circuit (gates, a forced output, maybe an exactly-one group, parities, extra
 * clauses) and, for some seeds, an at-most-one group over fresh variables (pairwise clauses, each
 * fresh variable also in a clause with an existing one so that it is not simply left free).
 */
function planted(seed: number): Cnf {
  const r = mulberry32(seed ^ 0x5bd1e995);
  const f: Encoded = randomCircuit(seed, { gates: 1 + (seed % 8), oneHot: seed % 3 === 0 ? 2 + (seed % 4) : 0, parities: seed % 3, extraClauses: seed % 4 });
  const clauses = f.clauses.map((c) => [...c]);
  let variables = f.variables;
  if (seed % 5 < 2) {
    const g = 2 + Math.floor(r() * 4);
    const vs = Array.from({ length: g }, () => ++variables);
    for (let i = 0; i < g; i++) for (let j = i + 1; j < g; j++) clauses.push([-vs[i]!, -vs[j]!]);
    for (const v of vs) clauses.push([v, 1 + Math.floor(r() * f.variables)]);
  }
  return cnfFromClauses(variables, clauses);
}

/** The stream's calls and those of replayLogical over the built structured circuit. */
function compare(f: StructuredFormula, kind: Kind, strategy: "wide" | "lean"): { streamed: string[]; replayed: string[] } {
  const built = synthesizeStructured(f, kind, strategy);
  const base = f.register.length + (kind === "flag" ? 1 : 0);
  const replayed = new Calls();
  replayLogical(built, base, replayed, new VirtualIds(base), lastUses(built));
  const source = new StructuredSource(f, kind, strategy);
  expect(source.base).toBe(base);
  const streamed = new Calls();
  source.emit(streamed, new VirtualIds(base));
  return { streamed: streamed.out, replayed: replayed.out };
}

/** The same for the oracle planOracle plans; null when the plan has no structure. */
function both(cnf: Cnf, register: Register, kind: Kind, strategy: "wide" | "lean"): { streamed: string[]; replayed: string[] } | null {
  const plan = planOracle(cnf, register, true);
  return plan.structured === null ? null : compare(plan.structured, kind, strategy);
}

const cnfOf = (f: Encoded): Cnf => cnfFromClauses(f.variables, f.clauses);

const cases = (["full", "free"] as const).flatMap((register) => (["phase", "flag"] as const).flatMap((kind) => (["wide", "lean"] as const).map((strategy) => [register, kind, strategy] as const)));

describe("the structured stream", () => {
  it("is replayLogical over the built structured circuit, call for call (fast-check)", () => {
    let structured = 0;
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), (seed) => {
        const cnf = planted(seed);
        for (const [register, kind, strategy] of cases) {
          const r = both(cnf, register, kind, strategy);
          if (r === null) continue;
          structured++;
          expect(r.streamed, `seed ${seed} ${register} ${kind} ${strategy}`).toEqual(r.replayed);
        }
      }),
      { numRuns: 120 },
    );
    // Most planted formulas keep their structure (the full register drops it only when it saves nothing).
    expect(structured).toBeGreaterThan(120 * 4);
  });

  it("is replayLogical over the built circuit on structures with every kind of check (exactly-one groups, parities, computed definitions)", () => {
    // Recovery preferring groups keeps one-hot groups as exactly-one groups (by default their
    // at-least-one clause defines a member instead); an XOR system gives standalone parities.
    const formulas: [string, Cnf][] = [
      ["8 random 4-XOR over 12", cnfOf(xorSystem(12, randomXorRows(12, 8, 4, 3)))],
      ["3 x 3 multiplier = 12", cnfOf(multiplier(3, 3, 12n))],
      ...Array.from({ length: 40 }, (_, i): [string, Cnf] => [`planted ${i}`, planted(i)]),
    ];
    const seen = { parities: 0, exactlyOne: 0, atMostOne: 0, computed: 0 };
    for (const [name, cnf] of formulas) {
      const s = recoverStructure(cnf, { prefer: "groups" });
      for (const computeDefinitions of [false, true]) {
        const register = computeDefinitions ? s.free : Int32Array.from({ length: cnf.variables }, (_, i) => i + 1);
        const f: StructuredFormula = { structure: s, register, computeDefinitions, constants: new Int32Array(0), remaining: simplify(s.remaining) };
        seen.parities += s.parities.length;
        seen.exactlyOne += s.groups.filter((g) => g.exactlyOne).length;
        seen.atMostOne += s.groups.filter((g) => !g.exactlyOne).length;
        if (computeDefinitions) seen.computed += s.definitions.length;
        for (const kind of ["phase", "flag"] as const) {
          for (const strategy of ["wide", "lean"] as const) {
            const r = compare(f, kind, strategy);
            expect(r.streamed, `${name} ${computeDefinitions ? "free" : "full"} ${kind} ${strategy}`).toEqual(r.replayed);
          }
        }
      }
    }
    expect(Math.min(seen.parities, seen.exactlyOne, seen.atMostOne, seen.computed)).toBeGreaterThan(0);
  });

  it("counted gives the built circuit's figures, both uncomputations and bases (fast-check)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 31 - 1 }), fc.constantFrom(...cases), fc.constantFrom("unitary", "measured") as fc.Arbitrary<"unitary" | "measured">, (seed, [register, kind, strategy], uncompute) => {
        const cnf = planted(seed);
        const plan = planOracle(cnf, register, true);
        if (plan.structured === null) return;
        const built = synthesizeStructured(plan.structured, kind, strategy);
        for (const basis of ["clifford+t", "toffoli"] as const) {
          const counted = countConstruction(cnf, { kind, strategy, basis, uncompute, engine: "instances" }, { register, structure: true });
          const b = builtCounts(built, basis, uncompute, true);
          const want = { qubits: b.qubits, tCount: b.tCount, tDepth: b.tDepth, cnotCount: b.cnotCount, depth: b.depth, toffoliCount: b.toffoliCount };
          expect({ qubits: counted.qubits, tCount: counted.tCount, tDepth: counted.tDepth, cnotCount: counted.cnotCount, depth: counted.depth, toffoliCount: counted.toffoliCount }, `seed ${seed} ${register} ${kind} ${strategy} ${uncompute} ${basis}`).toEqual(want);
          expect(counted.exact).toBe(true);
          // The cost front counts the same stream (cost/front.ts).
          const front = countConstructionOracle(plan, kind, { family: strategy }, basis, uncompute, true, true);
          expect({ qubits: front.qubits, tCount: front.tCount, tDepth: front.tDepth, cnotCount: front.cnotCount, depth: front.depth, toffoliCount: front.toffoliCount }).toEqual(want);
        }
      }),
      { numRuns: 60 },
    );
  });
});

const satlib = resolve(ROOT, "../shared/satlib");
const bwLargeA = resolve(satlib, "blocksworld/bw_large.a.cnf");

describe.skipIf(!existsSync(bwLargeA))("on a real planning formula: SATLIB (Hoos & Stuetzle 2000) blocksworld/bw_large.a; skipped when ../shared/satlib is absent", () => {
  it("counts the far-seam case exactly: lean, unitary, Clifford+T, in the engine's default window (deferred trails)", () => {
    const cnf = readDimacs(readFileSync(bwLargeA)).cnf!;
    const plan = planOracle(cnf, "full", true);
    expect(plan.structured).not.toBeNull();
    // One-hot groups free wires that the mirror half takes again across most of the circuit,
    // farther back than the window (65536 instances): the closing Tdg and H of a wire's last use
    // cancel against the next use's opening H and T. Without deferred trails the run falls short.
    const src = new StructuredSource(plan.structured!, "phase", "lean");
    const windowed = (deferTrails: boolean): EngineResult => {
      const engine = new CountingEngine({ base: src.base, optimize: true, levels: true, lag: 65536, history: 1, wires: src.base + 64, ids: src.base + src.checkQubits + 1024, deferTrails });
      const ids = new VirtualIds(src.base);
      const low = new LoweringStream(engine, ids, { basis: "clifford+t", uncompute: "unitary", toffoliAnds: false }, src.base + src.checkQubits + 1024);
      src.emit(low, ids);
      low.finish();
      return engine.finish();
    };
    expect(windowed(false).lagShort).toBe(true);
    const r = windowed(true);
    expect(r.lagShort || r.historyShort).toBe(false);
    expect(r.exact).toBe(true);
    const counted = countConstruction(cnf, { kind: "phase", strategy: "lean", basis: "clifford+t", uncompute: "unitary" });
    const b = builtCounts(synthesizeStructured(plan.structured!, "phase", "lean"), "clifford+t", "unitary", true);
    expect(counted.exact).toBe(true);
    expect([counted.qubits, counted.tCount, counted.tDepth, counted.cnotCount, counted.depth]).toEqual([b.qubits, b.tCount, b.tDepth, b.cnotCount, b.depth]);
    expect([r.qubits, r.tCount, r.tDepth, r.cnotCount, r.depth]).toEqual([b.qubits, b.tCount, b.tDepth, b.cnotCount, b.depth]);
  });
});
