/**
 * Qubit budgets and the cost front: every construction of a family of candidates (wide, lean,
 * the blocked constructions of synth/blocked.ts, fan-out copies) counted in qubits, T-count and
 * T-depth of its Clifford+T circuit, as the emitted circuit has them (after work-qubit reuse and
 * the optimizer passes); the cheapest within a budget; the non-dominated points.
 *
 * Counted, not built, by the same engine as the cost table: a construction's logical circuit is
 * replayed through the lowering stream (sources.ts's replayLogical; lean's stream is generated
 * clause by clause, a structured wide or lean oracle's from its checks by structuredSource.ts). Where the engine cannot be exact a small circuit is built instead.
 */
import type { Cnf } from "../cnf/cnf.js";
import type { Uncompute } from "../passes/lower.js";
import {
  constructionName, constructionFamily, parseConstruction, planShape, synthesizePlanned, type Construction, type ConstructionFamily,
} from "../synth/construction.js";
import { planOracle, synthesize, type OracleKind, type OraclePlan, type RegisterMode, type SimplifiedCnf } from "../synth/index.js";
import { builtCounts } from "./built.js";
import type { CostRow } from "./index.js";
import type { EngineResult } from "./engine.js";
import { BUILD_LIMIT, DEFAULT_LAG, run } from "./run.js";
import { lastUses, leanOracle, replayLogical } from "./sources.js";
import { StructuredSource } from "./structuredSource.js";

export type { Construction, ConstructionFamily } from "../synth/construction.js";
export { constructionName, constructionFamily, parseConstruction } from "../synth/construction.js";

/** What "cheapest" means within a budget: fewest T gates or smallest T-depth (ties: the other, then qubits). */
export type Prefer = "t-count" | "t-depth";

/** Figures of one construction's Clifford+T circuit (and, when asked for, its toffoli-basis Toffolis). */
export interface ConstructionCost {
  /** The construction's name, parameters included (e.g. `blocks-6`, `fanout-1`). */
  readonly construction: string;
  /** Its family: wide, lean, blocks or fanout (`textbook` for the reference). */
  readonly family: ConstructionFamily | "textbook";
  /** Qubits (search, target and work). */
  readonly qubits: number;
  /** T gates. */
  readonly t_count: number;
  /** ASAP T-depth. */
  readonly t_depth: number;
  /** CX plus CZ gates. */
  readonly cnot_count: number;
  /** ASAP depth. */
  readonly depth: number;
  /** False: the figures are upper bounds (see CostRow.exact). */
  readonly exact: boolean;
}

/** Options of the budget and front functions. */
export interface FrontOptions {
  /** Phase (default) or flag oracle. */
  readonly kind?: OracleKind;
  /** Uncomputation the figures are counted with (default measured, which never costs more). */
  readonly uncompute?: Uncompute;
  /** Count with the optimizer passes (default true). */
  readonly optimize?: boolean;
  /** The search register of the oracles (default `full`; see OracleOptions.register). */
  readonly register?: RegisterMode;
  /** Build from recovered structure (default true, as compileOracle; see OracleOptions.structure). */
  readonly structure?: boolean;
  /** Progress, as a fraction of the candidates counted. */
  readonly onProgress?: (fraction: number) => void;
}

/** A choice within a budget. */
export type ConstructionChoice =
  | {
      /** A construction fits. */
      readonly ok: true;
      /** The chosen construction and its figures. */
      readonly chosen: ConstructionCost;
      /** Every construction within the budget, best first (the chosen one first). */
      readonly ranked: readonly ConstructionCost[];
    }
  | {
      /** None fits. */
      readonly ok: false;
      /** The fewest qubits any candidate needs (the smallest budget that works). */
      readonly smallestQubits: number;
      /** The candidate that needs them. */
      readonly smallest: ConstructionCost;
    };

/** An oracle plan whose oracle is the clause construction over `f` (a full register, no structure). */
function clausePlan(f: SimplifiedCnf): OraclePlan {
  const register = Int32Array.from({ length: f.variables }, (_, i) => i + 1);
  return { variables: f.variables, register, completion: { variables: f.variables, register, fixed: new Int32Array(0), definitions: [] }, clauses: f, structured: null, summary: null };
}

const asPlan = (source: SimplifiedCnf | OraclePlan): OraclePlan => ("structured" in source ? source : clausePlan(source));

/**
 * Counts one construction's oracle in one basis (cost/index.ts's countOracle, for any
 * construction), over simplified clauses or an oracle plan (its register and structure): the
 * clause construction's lean oracle from its stream, every other from its logical circuit.
 */
export function countConstructionOracle(source: SimplifiedCnf | OraclePlan, kind: OracleKind, c: Construction, basis: "toffoli" | "clifford+t", uncompute: Uncompute, optimize = true, levels = basis === "clifford+t"): EngineResult {
  const plan = asPlan(source);
  const f = plan.clauses;
  // A structured wide or lean oracle is streamed from its checks (structuredSource.ts), as the
  // cost table does; a blocked one (no single check order to stream) is built and replayed.
  const family = c.family === "blocks" && c.plan.sizes.length === 0 && c.plan.fanout === 0 ? "wide" : c.family;
  if (plan.structured !== null && family !== "blocks") {
    const src = new StructuredSource(plan.structured, kind, family);
    // Far seams (a lean oracle's work wires idle across most of the circuit): see countOracle.
    const r = run(src.base, optimize, levels, { basis, uncompute, toffoliAnds: false }, (low, ids) => src.emit(low, ids), {
      lag: DEFAULT_LAG, history: 1, farReach: family === "lean", wires: src.base + (family === "lean" ? 64 : src.checkQubits + 64), ids: src.base + src.checkQubits + 1024,
    });
    if (r.exact || r.instances > BUILD_LIMIT) return r;
    return { ...r, ...builtCounts(synthesizePlanned(plan, kind, c), basis, uncompute, optimize), exact: true, upperBound: false, reason: null };
  }
  const lean = c.family === "lean" && plan.structured === null;
  const logical = lean ? null : synthesizePlanned(plan, kind, c);
  // The search register is the plan's (the clauses' variables, or the structure's free ones).
  const base = logical === null ? f.variables + (kind === "flag" ? 1 : 0) : logical.registers.reduce((q, r) => q + (r.role === "work" ? 0 : r.size), 0);
  const last = logical === null ? null : lastUses(logical);
  const sizing = {
    lag: DEFAULT_LAG,
    history: lean ? 4 : 1,
    wires: base + (lean ? 64 : (logical?.qubits ?? 0) - base + 64),
    ids: (logical?.qubits ?? base) + 1024,
  };
  const r = run(base, optimize, levels, { basis, uncompute, toffoliAnds: false }, (low, ids) => {
    if (logical === null) leanOracle(f, kind, low, ids, f.variables);
    else replayLogical(logical, base, low, ids, last!);
  }, sizing);
  if (r.exact || r.instances > BUILD_LIMIT) return r;
  const b = builtCounts(logical ?? synthesizePlanned(plan, kind, c), basis, uncompute, optimize);
  return { ...r, ...b, exact: true, upperBound: false, reason: null };
}

/** Counts the textbook reference (a Toffoli V-chain per gate, unitary), for the front's plot. */
export function countTextbook(f: SimplifiedCnf, kind: OracleKind): EngineResult {
  const base = f.variables + (kind === "flag" ? 1 : 0);
  const logical = synthesize(f, kind, "textbook");
  const last = lastUses(logical);
  const r = run(base, true, true, { basis: "clifford+t", uncompute: "unitary", toffoliAnds: true }, (low, ids) => replayLogical(logical, base, low, ids, last), {
    lag: DEFAULT_LAG, history: 1, wires: logical.qubits + 64, ids: logical.qubits + 1024,
  });
  if (r.exact || r.instances > BUILD_LIMIT) return r;
  return { ...r, ...builtCounts(logical, "clifford+t", "unitary", true, true), exact: true, upperBound: false, reason: null };
}

/** Above this many literals the candidates are thinned (each one is a count of the whole oracle). */
const THIN_ABOVE = 200_000;

/**
 * The candidates a budget or a front chooses from, for a formula (its clauses, or an oracle plan,
 * whose structure's checks count as clauses here): wide and lean; fan-out copies
 * (fanout-U for U below the most readings of a variable); one level of blocks of 2 to m/2
 * clauses (a geometric grid); blocks with a share of the clauses held; two and three levels of
 * small blocks; and one level of blocks with fan-out. A fixed list for a given formula, so a larger
 * budget only ever adds candidates (the T-count chosen never rises with the budget). Above
 * 200,000 literals (each candidate a count of the whole oracle) the list is thinned to about a
 * dozen: wide, lean, fanout-1, blocks of 2, 8, 32, ... clauses and blocks-8x8.
 */
export function constructionCandidates(source: SimplifiedCnf | OraclePlan): Construction[] {
  const { m, reads, literals } = planShape(asPlan(source));
  const out: Construction[] = [{ family: "wide" }, { family: "lean" }];
  if (m <= 1) return out;
  const thin = literals > THIN_ABOVE;
  const blocks = (sizes: number[], fanout = 0, held = 0): void => {
    out.push({ family: "blocks", plan: { sizes, fanout, held } });
  };
  for (const u of thin ? [1] : [1, 2, 3, 4, 6, 8, 12, 16, 24, 32]) if (u < reads) blocks([], u);
  // One level: sizes 2..8, then about 1.25 times the last, below m (thinned: 2, 8, 32, ...).
  const one: number[] = [];
  if (thin) for (let b = 2; b < m; b *= 4) one.push(b);
  else for (let b = 2; b < m; b = b < 8 ? b + 1 : Math.ceil(b * 1.25)) one.push(b);
  const oneShown = one;
  for (const b of oneShown) blocks([b]);
  // Held clauses: eighths of m beside blocks of a few sizes.
  for (const b of thin ? [] : [2, 3, 4, 6]) {
    if (b >= m) continue;
    const seen = new Set<number>();
    for (let e = 1; e < 8; e++) {
      const h = Math.round((e * m) / 8);
      if (h >= 1 && h <= m - 2 && !seen.has(h)) {
        seen.add(h);
        blocks([b], 0, h);
      }
    }
  }
  const small = thin ? [8] : [2, 3, 4, 6, 8];
  for (const b1 of small) for (const b2 of small) if (b1 * b2 < m) blocks([b1, b2]);
  for (const b1 of [2, 3]) for (const b2 of [2, 3]) for (const b3 of [2, 3]) if (!thin && b1 * b2 * b3 < m) blocks([b1, b2, b3]);
  if (reads > 1 && !thin) for (const b of oneShown.filter((_, i) => i % 2 === 0)) blocks([b], 1);
  return out;
}

/**
 * The candidates' figures by formula and counting mode: choosing within several budgets, or
 * compiling a search whose size is first estimated, counts a formula's candidates once. Keyed by
 * the Cnf object (a formula is not changed once read).
 */
const counted = new WeakMap<Cnf, Map<string, ConstructionCost[]>>();

/**
 * Counts constructions (by default every candidate, each formula and mode once) in Clifford+T.
 *
 * @example
 * ```ts
 * const costs = costConstructions(cnf, { uncompute: "measured" });
 * costs.find((c) => c.construction === "blocks-6")?.t_count;
 * ```
 */
export function costConstructions(cnf: Cnf, options: FrontOptions = {}, candidates?: readonly Construction[]): ConstructionCost[] {
  const kind = options.kind ?? "phase";
  const uncompute = options.uncompute ?? "measured";
  const register = options.register ?? "full";
  const structure = options.structure ?? true;
  const key = `${kind} ${uncompute} ${options.optimize ?? true} ${register} ${structure}`;
  if (candidates === undefined) {
    const known = counted.get(cnf)?.get(key);
    if (known !== undefined) {
      options.onProgress?.(1);
      return known;
    }
  }
  const plan = planOracle(cnf, register, structure);
  const list = candidates ?? constructionCandidates(plan);
  const out: ConstructionCost[] = [];
  for (let i = 0; i < list.length; i++) {
    options.onProgress?.(i / list.length);
    const c = list[i]!;
    const r = countConstructionOracle(plan, kind, c, "clifford+t", uncompute, options.optimize ?? true, true);
    out.push({
      construction: constructionName(c), family: constructionFamily(c), qubits: r.qubits, t_count: r.tCount, t_depth: r.tDepth,
      cnot_count: r.cnotCount, depth: r.depth, exact: r.exact,
    });
  }
  options.onProgress?.(1);
  if (candidates === undefined) {
    let byMode = counted.get(cnf);
    if (byMode === undefined) counted.set(cnf, (byMode = new Map()));
    byMode.set(key, out);
  }
  return out;
}

/** Orders by preference: the preferred figure, then the other, then qubits, then name (stable). */
export function byPreference(prefer: Prefer): (a: ConstructionCost, b: ConstructionCost) => number {
  return (a, b) =>
    (prefer === "t-count" ? a.t_count - b.t_count || a.t_depth - b.t_depth : a.t_depth - b.t_depth || a.t_count - b.t_count) ||
    a.qubits - b.qubits ||
    (a.construction < b.construction ? -1 : a.construction > b.construction ? 1 : 0);
}

/**
 * The cheapest construction (by `prefer`, default t-count) whose qubits are at most `maxQubits`
 * (default: no limit), among the candidates; or, when none fits, the fewest qubits any needs.
 *
 * @example
 * ```ts
 * const choice = chooseConstruction(cnf, { maxQubits: 60, prefer: "t-count", uncompute: "measured" });
 * if (choice.ok) compileOracle(cnf, { construction: choice.chosen.construction, uncompute: "measured" });
 * ```
 */
export function chooseConstruction(cnf: Cnf, options: FrontOptions & { readonly maxQubits?: number; readonly prefer?: Prefer } = {}): ConstructionChoice {
  return chooseAmong(costConstructions(cnf, options), options.maxQubits ?? Infinity, options.prefer ?? "t-count");
}

/** The choice within `maxQubits` among counted constructions. */
export function chooseAmong(costs: readonly ConstructionCost[], maxQubits: number, prefer: Prefer): ConstructionChoice {
  const ranked = costs.filter((c) => c.qubits <= maxQubits).sort(byPreference(prefer));
  if (ranked.length > 0) return { ok: true, chosen: ranked[0]!, ranked };
  const smallest = [...costs].sort((a, b) => a.qubits - b.qubits || byPreference(prefer)(a, b))[0]!;
  return { ok: false, smallestQubits: smallest.qubits, smallest };
}

/** A cost-table row of a construction: a {@link CostRow}'s figures, named by construction instead of strategy. */
export interface ConstructionRow extends Omit<CostRow, "strategy"> {
  /** The construction, parameters included. */
  readonly construction: string;
}

/** The row of a counted construction (with these register options), with the Toffolis of its toffoli basis counted too. */
export function constructionRow(cnf: Cnf, kind: OracleKind, c: ConstructionCost, uncompute: Uncompute, options: Pick<FrontOptions, "register" | "structure"> = {}): ConstructionRow {
  const plan = planOracle(cnf, options.register ?? "full", options.structure ?? true);
  const tof = countConstructionOracle(plan, kind, constructionOf(c.construction), "toffoli", uncompute, true, false);
  return {
    construction: c.construction, uncompute, qubits: c.qubits, toffoli_count: tof.toffoliCount, t_count: c.t_count, t_depth: c.t_depth,
    cnot_count: c.cnot_count, depth: c.depth, exact: c.exact && tof.exact,
  };
}

/** One point of the cost front. */
export interface FrontPoint {
  /** Qubits of the Clifford+T circuit. */
  readonly qubits: number;
  /** T gates. */
  readonly t_count: number;
  /** T-depth. */
  readonly t_depth: number;
  /** The construction, parameters included. */
  readonly construction: string;
  /** `clausegate oracle` arguments that reproduce the point exactly. */
  readonly options: string;
}

/** The cost front of a formula, with the reference constructions for a plot. */
export interface CostFront {
  /** The non-dominated points (fewer qubits, T or T-depth), by qubits. */
  readonly points: FrontPoint[];
  /** wide, lean and the textbook reference, whether on the front or not. */
  readonly references: {
    /** Every clause bit held (fewest T). */
    readonly wide: ConstructionCost;
    /** The clause counter (fewest qubits of the two strategies). */
    readonly lean: ConstructionCost;
    /** One clause bit per clause with 7-T Toffoli V-chains, unitary (a reference, not an option). */
    readonly textbook: ConstructionCost;
  };
  /** Every candidate counted. */
  readonly candidates: ConstructionCost[];
}

/** The non-dominated entries: none other is at most as large in all three figures and smaller in one. */
export function nonDominated<T extends { readonly qubits: number; readonly t_count: number; readonly t_depth: number }>(items: readonly T[]): T[] {
  const sorted = [...items].sort((a, b) => a.qubits - b.qubits || a.t_count - b.t_count || a.t_depth - b.t_depth);
  const out: T[] = [];
  for (const p of sorted) {
    const dominated = out.some((o) => o.qubits <= p.qubits && o.t_count <= p.t_count && o.t_depth <= p.t_depth);
    if (!dominated) out.push(p);
  }
  return out;
}

/**
 * The cost front: the candidates' non-dominated (qubits, T-count, T-depth) points, each with the
 * oracle arguments that reproduce it. `basis` only goes into those arguments (the figures are
 * those of the Clifford+T circuit whatever basis is emitted); default clifford+t, whose emitted
 * circuit has exactly the figures.
 *
 * @example
 * ```ts
 * const front = costFront(cnf, { uncompute: "measured" });
 * front.points.map((p) => `${p.qubits} ${p.t_count} ${p.options}`);
 * ```
 */
export function costFront(cnf: Cnf, options: FrontOptions & { readonly basis?: string } = {}): CostFront {
  const kind = options.kind ?? "phase";
  const uncompute = options.uncompute ?? "measured";
  const candidates = costConstructions(cnf, options);
  // The oracle command's defaults: a full register, structure on.
  const args = (name: string): string =>
    [
      `--construction ${name}`, ...(kind === "flag" ? ["--kind flag"] : []), `--basis ${options.basis ?? "clifford+t"}`, `--uncompute ${uncompute}`,
      ...(options.optimize === false ? ["--no-optimize"] : []), ...(options.register === "free" ? ["--register free"] : []), ...(options.structure === false ? ["--no-structure"] : []),
    ].join(" ");
  const points = nonDominated(candidates).map((c) => ({ qubits: c.qubits, t_count: c.t_count, t_depth: c.t_depth, construction: c.construction, options: args(c.construction) }));
  // The textbook reference is a clause construction, over the register's clauses.
  const textbookCount = countTextbook(planOracle(cnf, options.register ?? "full", options.structure ?? true).clauses, kind);
  const textbook: ConstructionCost = {
    construction: "textbook", family: "textbook", qubits: textbookCount.qubits, t_count: textbookCount.tCount, t_depth: textbookCount.tDepth,
    cnot_count: textbookCount.cnotCount, depth: textbookCount.depth, exact: textbookCount.exact,
  };
  return {
    points,
    references: { wide: candidates.find((c) => c.construction === "wide")!, lean: candidates.find((c) => c.construction === "lean")!, textbook },
    candidates,
  };
}

/** Parses a construction name, or throws RangeError (for options a program passes). */
export function constructionOf(name: string): Construction {
  const c = parseConstruction(name);
  if (typeof c === "string") throw new RangeError(c);
  return c;
}
