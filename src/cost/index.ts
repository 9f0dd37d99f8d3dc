/**
 * The cost model: what an oracle, a diffusion or a whole search costs in qubits, Toffolis,
 * T-count, T-depth, CNOTs and depth, always those of the circuits clausegate emits (Clifford+T
 * lowering for qubits, T, CNOTs and depth; toffoli lowering for Toffolis), after work-qubit reuse
 * and the optimizer passes.
 *
 * Figures come from counting, not from building: the counting engine (engine.ts) replays the
 * lowering, the work-qubit reuse and the passes over a stream of gate templates, with memory for
 * one level per qubit and a bounded window of recent templates. A property test holds its figures
 * equal to those of the built circuits. Where the engine meets a case its replay does not cover,
 * it says so: the figures are then built exactly when the circuit is small, else reported as
 * upper bounds (`exact: false`).
 */
import type { Cnf } from "../cnf/cnf.js";
import type { Circuit } from "../ir/circuit.js";
import { countCircuit } from "../emit/resources.js";
import type { Basis, Uncompute } from "../passes/lower.js";
import { planOracle, synthesizePlan, synthesizePlanned, type AnyStrategy, type OracleKind, type OraclePlan, type RegisterMode, type SimplifiedCnf, type SimplifyReport, type Strategy } from "../synth/index.js";
import { BlockCounter, KEEP_SWITCHES } from "./blocks.js";
import { builtCounts } from "./built.js";
import { LeanBlocks } from "./leanBlocks.js";
import type { EngineResult, WireMemory } from "./engine.js";
import { BUILD_LIMIT, DEFAULT_LAG, HISTORY_BYTES, runSwept } from "./run.js";
import { LoweringStream, VirtualIds } from "./lowering.js";
import { diffusionOps, lastUses, leanOracle, LogicalRecorder, phaseOracleOps, replayLogical, searchOps, textbookOracle, wideOracle, type Fraction, type OracleOps } from "./sources.js";
import { StructuredSource } from "./structuredSource.js";
import { wideToffolis } from "./toffolis.js";
import { constructionFamily, constructionName, countConstructionOracle, parseConstruction, type ConstructionFamily } from "./front.js";
import { collectBetweenRuns } from "../util/collect.js";

/** Options of the cost functions. */
export interface CostOptions {
  /**
   * Called now and then with the fraction of the work done (0 to 1), for a progress display.
   * Calls are at most every 1/200 of the work.
   */
  readonly onProgress?: (fraction: number) => void;
  /**
   * Cost the oracles built from recovered structure (default true, as compileOracle builds
   * them); false: the clause constructions alone. {@link oracleResources} takes it from the oracle.
   */
  readonly structure?: boolean;
  /**
   * The search register the costed oracles have (default `full`; see OracleOptions.register).
   * {@link oracleResources} takes it from the oracle.
   */
  readonly register?: RegisterMode;
}

/** One row of the cost table. */
export interface CostRow {
  /** `wide`, `lean`, or the `textbook` reference. */
  readonly strategy: AnyStrategy;
  /** How temporary ANDs are uncomputed. */
  readonly uncompute: Uncompute;
  /** Qubits of the Clifford+T circuit. */
  readonly qubits: number;
  /** Toffolis of the toffoli-basis circuit. */
  readonly toffoli_count: number;
  /** T gates of the Clifford+T circuit. */
  readonly t_count: number;
  /** T-depth of the Clifford+T circuit. */
  readonly t_depth: number;
  /** CX plus CZ gates of the Clifford+T circuit. */
  readonly cnot_count: number;
  /** Depth of the Clifford+T circuit. */
  readonly depth: number;
  /**
   * True: every figure is that of the emitted circuits. False: the figures are upper bounds (the
   * counting could not follow one optimizer step, and the circuit was too large to build).
   */
  readonly exact: boolean;
}

/** Costs of one part of a search (Clifford+T counts; Toffolis from the toffoli basis). */
export interface PartCost {
  /** Qubits of the Clifford+T circuit. */
  readonly qubits: number;
  /** T gates. */
  readonly t_count: number;
  /** T-depth. */
  readonly t_depth: number;
  /** CX plus CZ gates. */
  readonly cnot_count: number;
  /** Depth. */
  readonly depth: number;
  /** Toffolis in the toffoli basis. */
  readonly toffoli_count: number;
}

/** Costs of a whole search with one strategy and uncomputation. */
export interface SearchCost {
  /** The oracle's strategy. */
  readonly strategy: Strategy;
  /** How temporary ANDs are uncomputed. */
  readonly uncompute: Uncompute;
  /** Grover iterations per run. */
  readonly iterations: number;
  /** One oracle. */
  readonly oracle: PartCost;
  /** One diffusion. */
  readonly diffusion: PartCost;
  /** The whole circuit of one run (K iterations and the measurements). */
  readonly circuit: PartCost;
  /** Runs expected until success (1 / P). */
  readonly expected_runs: number;
  /** T gates over the expected number of runs. */
  readonly expected_t_count: number;
  /** Toffolis over the expected number of runs. */
  readonly expected_toffoli_count: number;
  /** Circuit depth over the expected number of runs (run one after another). */
  readonly expected_depth: number;
  /** True: every figure is that of the emitted circuits; false: upper bounds (see {@link CostRow.exact}). */
  readonly exact: boolean;
}

/** What simplification removed, in the resource report (snake_case like every report key). */
export interface SimplificationReport {
  /** Literals that stood twice in one clause. */
  readonly duplicate_literals: number;
  /** Clauses holding a literal and its negation. */
  readonly tautologies: number;
  /** Clauses equal to an earlier one. */
  readonly repeated: number;
  /** Clauses containing another, shorter clause. */
  readonly subsumed: number;
  /** False when the subsumption check stopped at its work budget. */
  readonly subsumption_complete: boolean;
  /** Clauses left for synthesis. */
  readonly clauses_kept: number;
  /** Literals left for synthesis (L in the cost formulas). */
  readonly literals_kept: number;
}

/** The resource report of an oracle (stable keys, for `--report`). */
export interface ResourceReport {
  /** Declared variables. */
  readonly variables: number;
  /** Clauses in the input. */
  readonly clauses: number;
  /** The oracle's kind. */
  readonly kind: OracleKind;
  /** Its construction's family: wide, lean, blocks or fanout. */
  readonly strategy: Strategy | ConstructionFamily;
  /** Its construction, parameters included (e.g. `wide`, `blocks-6`, `fanout-1`). */
  readonly construction: string;
  /** The basis it was emitted in. */
  readonly basis: Basis;
  /** How its temporary ANDs are uncomputed. */
  readonly uncompute: Uncompute;
  /** Qubits by register, and in all. */
  readonly qubits: {
    /** The search register vars. */
    readonly search: number;
    /** Work qubits. */
    readonly work: number;
    /** 1 for a flag oracle, else 0. */
    readonly target: number;
    /** All qubits. */
    readonly total: number;
  };
  /** Gates of the emitted circuit by OpenQASM 3 name. */
  readonly gates: Record<string, number>;
  /** Toffolis in the toffoli-basis lowering (with the chosen uncomputation). */
  readonly toffoli_count: number;
  /** T gates of the Clifford+T lowering (with the chosen uncomputation). */
  readonly t_count: number;
  /** T-depth of the Clifford+T lowering (ASAP). */
  readonly t_depth: number;
  /** CX plus CZ gates of the Clifford+T lowering. */
  readonly cnot_count: number;
  /** Depth of the emitted circuit. */
  readonly depth: number;
  /** Measurements in the emitted circuit. */
  readonly measurements: number;
  /** What simplification removed before synthesis. */
  readonly simplification: SimplificationReport;
  /** The DIMACS variable held by each search qubit, in order (1..n for a full register). */
  readonly register: number[];
}

/** What {@link oracleResources} needs of a compiled oracle (compileOracle's result has it). */
export interface CompiledOracle {
  /** The emitted circuit. */
  readonly circuit: Circuit;
  /** The options it was compiled with. */
  readonly options: {
    /** Phase or flag oracle. */
    readonly kind: OracleKind;
    /** Wide or lean. */
    readonly strategy: Strategy;
    /** The construction built (overrides strategy when given; see OracleOptions.construction). */
    readonly construction?: string;
    /** The basis it was emitted in. */
    readonly basis: Basis;
    /** How temporary ANDs are uncomputed. */
    readonly uncompute: Uncompute;
    /** Whether the optimizer passes ran. */
    readonly optimize: boolean;
    /** Its search register (absent: `full`). */
    readonly register?: RegisterMode;
    /** Whether it was built from recovered structure (absent: false). */
    readonly structure?: boolean;
  };
  /** Declared variables. */
  readonly variables: number;
  /** Clauses in the input. */
  readonly clauses: number;
  /** What simplification removed, with the clauses and literals kept. */
  readonly simplification: SimplifyReport & {
    /** Clauses left for synthesis. */
    readonly clausesKept: number;
    /** Literals left for synthesis. */
    readonly literalsKept: number;
  };
}

/** One construction to count. */
interface Spec {
  readonly f: SimplifiedCnf;
  readonly kind: OracleKind;
  readonly strategy: AnyStrategy;
  readonly basis: "toffoli" | "clifford+t";
  readonly uncompute: Uncompute;
  readonly optimize: boolean;
  /** Depth and T-depth wanted (Clifford+T runs); Toffoli runs need counts only. */
  readonly levels: boolean;
  /** How to count a lean oracle (see {@link CountEngine}); default "auto". */
  readonly engine?: CountEngine;
  /** Wire-record memory shared with the other runs of the same cost table. */
  readonly wireMemory?: WireMemory;
}

/**
 * The oracles of one plan: the structured ones as streams generated from their recorded checks
 * (structuredSource.ts; no circuit is built: a lean one has a qubit per carry and per mirror
 * copy, millions on a SATLIB planning formula), and built logical circuits only for the small
 * fallbacks (built instead of counted when the counting cannot be exact).
 */
class Logicals {
  private readonly kept = new Map<string, Circuit>();
  private readonly sources = new Map<string, StructuredSource>();
  constructor(private readonly plan: OraclePlan) {}
  /** True when the strategy's oracle is built from recovered structure (then it is streamed from its checks, lean too). */
  structured(strategy: AnyStrategy): boolean {
    return this.plan.structured !== null && strategy !== "textbook";
  }
  /** The structured oracle's stream (its checks recorded once, shared by the runs). */
  source(kind: OracleKind, strategy: Strategy): StructuredSource {
    const key = `${kind} ${strategy}`;
    let v = this.sources.get(key);
    if (v === undefined) {
      v = new StructuredSource(this.plan.structured!, kind, strategy);
      this.sources.set(key, v);
    }
    return v;
  }
  /** The logical circuit (built: for the small fallbacks only). */
  get(kind: OracleKind, strategy: AnyStrategy): Circuit {
    const key = `${kind} ${strategy}`;
    let c = this.kept.get(key);
    if (c === undefined) {
      c = synthesizePlan(this.plan, kind, strategy);
      this.kept.set(key, c);
    }
    return c;
  }
  /** Lets go of what is no longer needed. */
  keepOnly(strategy: AnyStrategy): void {
    for (const m of [this.kept, this.sources]) for (const key of [...m.keys()]) if (!key.endsWith(` ${strategy}`)) m.delete(key);
  }
}

/**
 * How an oracle is counted: a lean one "blocks" by the block counter (blocks.ts: work per clause,
 * exact, falling back to the engine where it cannot go on), "instances" by the engine instance by
 * instance (the wide and textbook ones too, without the sweep of sweep.ts), "auto" by blocks from
 * BLOCKS_FROM clauses on and by the sweep first.
 */
export type CountEngine = "auto" | "blocks" | "instances";

/**
 * Clauses from which "auto" counts a lean oracle by blocks. Below, the engine is as fast or
 * faster: blocks repeat too rarely for the memo to pay for its replays (measured, CPU time of the
 * four lean counts: random 3-SAT of 2,048 clauses 0.7 s by the engine, 1.0 s by blocks; 4,096
 * clauses even; 8,192 clauses 1.7-2.4 s against 1.5-2.0 s; SATLIB blocksworld `huge`, 7,054
 * clauses, 1.3 s against 1.6 s; `bw_large.b`, 13,772 clauses, 1.5-2.4 s against 0.9 s).
 */
const BLOCKS_FROM = 8192;
/**
 * "auto" uses the block counter (for BLOCKS_FROM clauses and more). It was off while a property
 * test's mismatch (2 CNOTs, test/cost/blocks.test.ts) stood; fixed, and held to the built
 * circuits by that test's seam property.
 */
const BLOCKS_IN_AUTO = true;

/**
 * The window for the wide and textbook oracles: their cancellations are between neighbouring
 * gates (a clause's AND and the mark's, the textbook's V-chains of consecutive clauses), and a
 * short window keeps each wire's figures in cache until its instances are final (a million
 * clauses have 3 million wires): a third less time than 65536. A longer reach makes the run
 * fall short and go again with more (see run).
 */
const WIDE_LAG = 1 << 11;
/** The longest window a search run asks for (its work wires come back one iteration later). */
const MAX_LAG = 1 << 22;

/** Counts one oracle construction with the engine. */
function countOracle(s: Spec, logicals: Logicals, progress?: Fraction): EngineResult {
  const mode = { basis: s.basis, uncompute: s.uncompute, toffoliAnds: s.strategy === "textbook" };
  if (logicals.structured(s.strategy)) {
    // A structured oracle is streamed from its recorded checks (structuredSource.ts); its search
    // register is the plan's register, not the clauses' variables.
    const src = logicals.source(s.kind, s.strategy as Strategy);
    const base = src.base;
    // Wires: a wide oracle holds each check's work qubits until the mark; the lean one a few.
    // Far seams: in the lean oracle a check with many work qubits (a one-hot group's conflict
    // bits) leaves wires deep in reuse's stack of free wires; the next such check, often in the
    // mirror half, takes them again, and with unitary uncomputation the closing Tdg and H of the
    // last use cancel against the opening H and T of the next across nearly the whole circuit
    // (bw_large.c: 204 cancellations, the farthest over 4.2 of 4.3 million instances). The
    // engine defers those trails (EngineOptions.deferTrails), so the window holds: bw_large.c's
    // cost 614 MB -> 222 MB against keeping every instance from the start, the same table. Should
    // a run fall short anyway, farReach: a longer window would too, keep everything at once.
    // History: a check's walks go back along search qubits read long before (a structured
    // oracle on bw_large.d fell short with one copy per wire and not with 16); as many as the
    // rerun would keep, at once.
    const wires = base + (s.strategy === "lean" ? 64 : src.checkQubits + 64);
    const history = Math.max(1, Math.min(16, Math.floor(HISTORY_BYTES / 40 / wires)));
    const sizing = { lag: DEFAULT_LAG, history, wires, ids: base + src.checkQubits + 1024, farReach: s.strategy === "lean", ...(s.wireMemory ? { wireMemory: s.wireMemory } : {}) };
    return runSwept(s.strategy !== "lean" && s.engine !== "instances", base, s.optimize, s.levels, mode, (low, ids) => src.emit(low, ids, progress), sizing);
  }
  const base = s.f.variables + (s.kind === "flag" ? 1 : 0);
  // Wires: a wide or textbook oracle has about one per literal (clause bits, AND trees, the
  // mark's tree); the lean oracle reuses a few, some of them seldom (a work qubit of a longer
  // clause), so keeping a few instances per wire costs little there.
  const wires = base + (s.strategy === "lean" ? 64 : s.f.lits.length + 64);
  // Ids: work qubits live at once. A wide oracle keeps every AND until the uncomputation: k - 1 per
  // clause of k literals and the mark's m - 1, about one per literal; a textbook oracle one per
  // clause and its V-chain's k - 2. Sized so (grown by half from one per clause, each per-id table
  // was copied ten times over a million clauses' runs).
  const clauses = s.f.clauseStart.length - 1;
  const idCount = base + (s.strategy === "lean" ? 0 : s.strategy === "wide" ? s.f.lits.length : s.f.lits.length - clauses) + 1024;
  // A wide oracle keeps each clause's AND record until the mark: 3 numbers per 2-input AND (k - 1
  // of them for k literals) and 2 more, at most 3L - m in all.
  const records = s.strategy === "wide" ? wideRecords(s.f) : 1024;
  // farReach: the lean oracle's Clifford+T run with unitary uncomputation cancels across a work
  // wire's idle stretch (its last use's closing Tdg and H against the next use's opening H and T),
  // which can span the circuit when clauses of mixed widths leave a wire deep in reuse's stack.
  // The engine defers those trails (EngineOptions.deferTrails) and the window holds (100,000
  // clauses of widths 2-8: that run 13.5 s / 836 MB keeping every instance, 7.8 s / 234 MB now);
  // a run that falls short anyway keeps everything at once.
  const farReach = s.strategy === "lean" && s.basis === "clifford+t" && s.uncompute === "unitary" && s.optimize;
  const sizing = { lag: s.strategy === "lean" ? DEFAULT_LAG : WIDE_LAG, history: s.strategy === "lean" ? 4 : 1, wires, ids: idCount, records, farReach, ...(s.wireMemory ? { wireMemory: s.wireMemory } : {}) };
  // The wide oracle's Toffolis need no replay (toffolis.ts says why none is ever removed).
  if (s.strategy === "wide" && s.basis === "toffoli" && s.optimize && !s.levels) return wideToffolis(s.f, s.kind, s.uncompute);
  if (s.strategy === "lean" && s.engine !== "instances" && LeanBlocks.fits(s.f) && (s.engine === "blocks" || (BLOCKS_IN_AUTO && s.f.clauseStart.length - 1 >= BLOCKS_FROM))) {
    // Work wires' tails kept short first; where a walk needs more, again without the limit.
    const first = new BlockCounter(new LeanBlocks(s.f, s.kind, mode), { optimize: s.optimize, levels: s.levels, keepSwitches: KEEP_SWITCHES, ...(progress ? { progress } : {}) });
    const r = first.run() ?? (first.stoppedOnTail ? new BlockCounter(new LeanBlocks(s.f, s.kind, mode), { optimize: s.optimize, levels: s.levels, ...(progress ? { progress } : {}) }).run() : null);
    if (r !== null) return r;
    // The counter gave up (clauses of mixed widths): its tables go before the engine's come (a
    // million clauses of widths 2-8: some 200 MB).
    collectBetweenRuns(BLOCK_BYTES_PER_LITERAL * s.f.lits.length);
  }
  return runSwept(s.strategy !== "lean" && s.engine !== "instances", base, s.optimize, s.levels, mode, (low, ids) => {
    // The oracles are streamed as synthesis would build them (sources.ts; a test holds them equal).
    const stream = s.strategy === "lean" ? leanOracle : s.strategy === "wide" ? wideOracle : textbookOracle;
    stream(s.f, s.kind, low, ids, s.f.variables, progress);
  }, sizing);
}

/** Counts a circuit given as logical operations (search parts). */
function countOps(base: number, basis: "toffoli" | "clifford+t", uncompute: Uncompute, levels: boolean, emit: (low: LoweringStream, ids: VirtualIds) => void, lag = DEFAULT_LAG, sizing: OpsSizing = {}): EngineResult {
  return runSwept(sizing.sweep === true, base, true, levels, { basis, uncompute, toffoliAnds: false }, emit, {
    lag, history: sizing.history ?? 4, wires: base + (sizing.work ?? 0) + 64, ids: base + (sizing.ids ?? sizing.work ?? 0) + 1024,
    ...(sizing.records ? { records: sizing.records } : {}), ...(sizing.wireMemory ? { wireMemory: sizing.wireMemory } : {}),
    ...(sizing.ring ? { ring: sizing.ring } : {}), ...(sizing.eagerLag ? { eagerLag: true } : {}), ...(sizing.keepFreed ? { keepFreed: sizing.keepFreed } : {}),
  });
}

/**
 * How much a search part's counting holds, known ahead (the tables are sized once: growing them
 * by half as the wide oracle of a million clauses took its 3 million wires held old and new
 * copies at once, and four copies per wire took 490 MB where one does).
 */
interface OpsSizing {
  /** Work wires expected. */
  readonly work?: number;
  /** Work qubit ids live at once (default: work). */
  readonly ids?: number;
  /** Wire-record memory shared by the runs of one search's costs (see EngineOptions.wireMemory). */
  readonly wireMemory?: WireMemory;
  /** Copies kept per wire (default 4; a wide oracle's millions of wires: 1, raised if a walk falls short). */
  readonly history?: number;
  /** Numbers of the AND records live at once (see countOracle). */
  readonly records?: number;
  /** With an infinite lag: instances expected (the ring sized once). */
  readonly ring?: number;
  /** The whole window from the first instance (see EngineOptions.eagerLag). */
  readonly eagerLag?: boolean;
  /** See EngineOptions.keepFreed. */
  readonly keepFreed?: number;
  /** Try the sweep first (sweep.ts; a wide oracle alone: a whole run's seams reach too far back for its ring). */
  readonly sweep?: boolean;
}

/** Splits one progress callback over weighted steps. */
export class Progress {
  private doneWeight = 0;
  private last = -1;
  constructor(private readonly total: number, private readonly report?: (fraction: number) => void) {}
  /** A callback for the next step, of weight w. */
  step(w: number): Fraction | undefined {
    const report = this.report;
    if (report === undefined) return undefined;
    const start = this.doneWeight;
    this.doneWeight += w;
    return (x) => this.emit((start + Math.min(1, Math.max(0, x)) * w) / this.total);
  }
  emit(fraction: number): void {
    if (this.report === undefined) return;
    if (fraction < 1 && fraction - this.last < 0.005) return;
    this.last = fraction;
    this.report(Math.min(1, fraction));
  }
}

/** Numbers the wide oracle's live AND records take at most (see countOracle). */
function wideRecords(f: SimplifiedCnf): number {
  return 3 * f.lits.length - (f.clauseStart.length - 1) + 1024;
}

/** Relative work of counting one oracle construction (template instances, roughly). */
function workOf(f: SimplifiedCnf, strategy: AnyStrategy, levels: boolean): number {
  const m = f.clauseStart.length - 1;
  const L = f.lits.length;
  const w = Math.ceil(Math.log2(m + 2));
  const instances = strategy === "lean" ? m * (12 * w + 4) : strategy === "wide" ? 4 * L : 6 * L;
  return (levels ? 3 : 1) * instances + 1;
}

function rowOf(strategy: AnyStrategy, uncompute: Uncompute, ct: EngineResult, tof: EngineResult): CostRow {
  return {
    strategy, uncompute, qubits: ct.qubits, toffoli_count: tof.toffoliCount, t_count: ct.tCount, t_depth: ct.tDepth,
    cnot_count: ct.cnotCount, depth: ct.depth, exact: ct.exact && tof.exact,
  };
}

/**
 * Costs of every strategy and uncomputation for one formula, plus the textbook reference
 * (one clause bit per clause, V-chains of 7-T Toffolis, unitary uncomputation). Counted, not
 * built: memory grows with the qubits (a few numbers per wire), not with the gates; time with
 * the gates, except for the lean oracle, counted clause block by clause block with a memo (a
 * million clauses: seconds per row). Progress goes to `options.onProgress`.
 *
 * @example
 * ```ts
 * const rows = costTable(cnfFromClauses(3, [[1, -2], [2, 3]]));
 * rows.find((r) => r.strategy === "wide" && r.uncompute === "measured")!.t_count;
 * ```
 */
export function costTable(cnf: Cnf, kind: OracleKind = "phase", options: CostOptions = {}): CostRow[] {
  const table = new TableCounter(cnf, kind, options, true);
  const runs = table.runs();
  const progress = new Progress(runs.reduce((s, r) => s + r.weight, 0), options.onProgress);
  const results = runs.map((r) => table.count(r, progress.step(r.weight)));
  progress.emit(1);
  return table.rows(results);
}

/** One counting run of a cost table: a row's Clifford+T run (with levels) or its toffoli run (Toffolis). */
export interface TableRun {
  /** Row of the table. */
  readonly row: number;
  /** Clifford+T (qubits, T, CNOTs, depths) or toffoli (the Toffoli count). */
  readonly basis: "clifford+t" | "toffoli";
  /** Relative work, for progress (template instances, roughly). */
  readonly weight: number;
  /** Estimated CPU seconds on this kind of machine, for sharing runs between threads. */
  readonly seconds: number;
  /**
   * Roughly the most memory the run holds at once (the engine's per-wire records, or every
   * instance where far seams make it keep them), for sharing runs between threads.
   */
  readonly bytes: number;
}

/**
 * Engine bytes per wire (engine.ts: one copy per wire kept) and per instance kept; the sweep's per
 * wire (sweep.ts), with levels (Clifford+T) and without (toffoli basis).
 */
const BYTES_PER_WIRE = 54;
const BYTES_PER_INSTANCE = 64;
const SWEEP_BYTES_PER_WIRE = 22;
const SWEEP_COUNT_BYTES_PER_WIRE = 13;
/**
 * Bytes per id of a wide or textbook run: reuse's wire table, the lowering's flips and records'
 * places (ids and wires given back in order need no stack). Measured, a million random 3-SAT
 * clauses over the plan's memory: the wide Clifford+T run 101 MB (estimated 132), the textbook
 * ones 70 and 52 MB (69 and 49).
 */
const BYTES_PER_ID = 9;
/** Bytes per literal of a block-counter run (blocks.ts, leanBlocks.ts: occurrences, blocks, clause of each place). */
const BLOCK_BYTES_PER_LITERAL = 24;

/**
 * Estimated CPU microseconds per literal of one run of each construction and uncomputation,
 * measured on a million-clause random 3-SAT formula on this kind of 2-core machine (sweep and
 * block counter; the wide oracle with unitary uncomputation takes a sixth more than with
 * measured): used only to share runs between threads, never in a figure.
 */
const MICROS_PER_LITERAL: Record<AnyStrategy, Record<Uncompute, readonly [cliffordT: number, toffoli: number]>> = {
  wide: { unitary: [1.45, 1.3], measured: [1.25, 1.3] },
  lean: { unitary: [0.93, 0.85], measured: [0.87, 0.57] },
  textbook: { unitary: [1.8, 0.93], measured: [1.8, 0.93] },
};

/** Per literal, how much more a block-counter run takes per clause width above 3 (see runs()). */
const LEAN_WIDTH_FACTOR = 1.5;

/** The same for the wide oracle's Toffoli tally (toffolis.ts), roughly. */
const TALLY_MICROS_PER_LITERAL = 0.05;

/**
 * The runs of one cost table and what they give: every strategy and uncomputation (the textbook
 * reference too, unless left out), each counted in Clifford+T and in the toffoli basis.
 * costTable counts them in turn; costTables (split.ts) shares them between threads.
 */
export class TableCounter {
  private readonly plan: [AnyStrategy, Uncompute][];
  private readonly f: SimplifiedCnf;
  private readonly logicals: Logicals;
  private readonly structuredWeight = new Map<AnyStrategy, number>();
  private readonly wireMemory: WireMemory = { buffer: null, records: null };

  /** The plan the table counts (planned here, or given). */
  readonly oraclePlan: OraclePlan;

  /**
   * `plan`: the formula's plan for these options, made already (a worker thread is given the main
   * thread's instead of planning again); `cnf` is then not read.
   */
  constructor(cnf: Cnf | null, private readonly kind: OracleKind, options: Pick<CostOptions, "register" | "structure">, textbook: boolean, plan?: OraclePlan) {
    if (plan === undefined && cnf === null) throw new Error("TableCounter: a formula or its plan is needed");
    const oraclePlan = plan ?? planOf(cnf!, options);
    this.oraclePlan = oraclePlan;
    this.f = oraclePlan.clauses;
    this.logicals = new Logicals(oraclePlan);
    this.plan = [["wide", "unitary"], ["wide", "measured"], ["lean", "unitary"], ["lean", "measured"], ...(textbook ? [["textbook", "unitary"] as [AnyStrategy, Uncompute]] : [])];
    // A structured oracle's work is that of its checks' stream, not of the clauses.
    for (const st of ["wide", "lean"] as const) if (this.logicals.structured(st)) this.structuredWeight.set(st, this.logicals.source(kind, st).weight);
  }

  /** Every run, in the order costTable counts them (by row, Clifford+T first). */
  runs(): TableRun[] {
    const f = this.f;
    const L = f.lits.length;
    const m = f.clauseStart.length - 1;
    return this.plan.flatMap(([strategy, uncompute], row) => (["clifford+t", "toffoli"] as const).map((basis) => {
      const levels = basis === "clifford+t";
      const sw = this.structuredWeight.get(strategy);
      const weight = sw === undefined ? workOf(f, strategy, levels) : (levels ? 3 : 1) * sw + 1;
      // A structured stream's weight is in instances, about 4 per literal of the clause stream.
      const literals = sw === undefined ? L : sw / 4;
      let bytes: number;
      // The sweep's wires and ids (about one per literal each) and a wide oracle's AND records (3 numbers per literal, one less per clause).
      if (strategy !== "lean") bytes = (f.variables + literals + 64) * ((levels ? SWEEP_BYTES_PER_WIRE : SWEEP_COUNT_BYTES_PER_WIRE) + BYTES_PER_ID) + (strategy === "wide" ? 4 * (3 * literals - m) : 0);
      else if (sw !== undefined) bytes = levels && uncompute === "unitary" ? (sw + 64) * BYTES_PER_INSTANCE : (f.variables + 64) * BYTES_PER_WIRE;
      // Counted block by block from BLOCKS_FROM clauses (a few MB of states and keys), else a window of instances.
      else bytes = (f.variables + 64) * BYTES_PER_WIRE + (m >= BLOCKS_FROM ? (16 << 20) + BLOCK_BYTES_PER_LITERAL * L : DEFAULT_LAG * 2 * BYTES_PER_INSTANCE);
      // The wide oracle's Toffolis are tallied from its operations, no replay (toffolis.ts).
      if (strategy === "wide" && !levels && sw === undefined) return { row, basis, weight: L / 20 + 1, seconds: (TALLY_MICROS_PER_LITERAL * L) / 1e6, bytes: 4 * f.variables + 12 * m };
      // The block counter replays more as clauses widen (more X patterns a clause): a million random
      // 4-SAT clauses' lean runs took 1.5 times the 3-SAT rate per literal.
      const wider = strategy === "lean" && sw === undefined && m >= BLOCKS_FROM ? LEAN_WIDTH_FACTOR ** Math.max(0, L / Math.max(1, m) - 3) : 1;
      return { row, basis, weight, seconds: (MICROS_PER_LITERAL[strategy][uncompute][levels ? 0 : 1] * literals * wider) / 1e6, bytes };
    }));
  }

  /** Counts one run. */
  count(r: TableRun, progress?: Fraction): EngineResult {
    const [strategy, uncompute] = this.plan[r.row]!;
    this.logicals.keepOnly(strategy);
    // A lean oracle of the clauses is counted by blocks, without the per-wire tables that the wide
    // and textbook runs hand on to one another (a million clauses: 115 MB idle through each lean run).
    if (strategy === "lean" && !this.logicals.structured(strategy)) {
      const held = (this.wireMemory.buffer?.byteLength ?? 0) + (this.wireMemory.records?.byteLength ?? 0);
      this.wireMemory.buffer = null;
      this.wireMemory.records = null;
      // Before the lean run's own tables: a run after a small one is not preceded by a collection.
      collectBetweenRuns(held);
    }
    const levels = r.basis === "clifford+t";
    return countOracle({ f: this.f, kind: this.kind, strategy, uncompute, optimize: true, wireMemory: this.wireMemory, basis: r.basis, levels }, this.logicals, progress);
  }

  /** The table's rows from the results of runs() (in that order). */
  rows(results: readonly EngineResult[]): CostRow[] {
    return this.plan.map(([strategy, uncompute], row): CostRow => {
      const ct = results[2 * row]!;
      const tof = results[2 * row + 1]!;
      if ((ct.exact && tof.exact) || ct.instances > BUILD_LIMIT) return rowOf(strategy, uncompute, ct, tof);
      const logical = this.logicals.get(this.kind, strategy);
      const bc = builtCounts(logical, "clifford+t", uncompute, true, strategy === "textbook");
      const bt = builtCounts(logical, "toffoli", uncompute, true, strategy === "textbook");
      return {
        strategy, uncompute, qubits: bc.qubits, toffoli_count: bt.toffoliCount, t_count: bc.tCount, t_depth: bc.tDepth,
        cnot_count: bc.cnotCount, depth: bc.depth, exact: true,
      };
    });
  }
}

/**
 * Counts one oracle construction in one basis: the figures of the circuit compileOracle emits
 * with these options (the textbook reference has no compileOracle option; its circuit is the
 * one the cost table describes).
 *
 * @example
 * ```ts
 * const c = countConstruction(cnf, { kind: "phase", strategy: "lean", basis: "clifford+t", uncompute: "measured" });
 * c.tCount;
 * ```
 */
export function countConstruction(
  cnf: Cnf,
  o: { readonly kind: OracleKind; readonly strategy: AnyStrategy; readonly basis: "toffoli" | "clifford+t"; readonly uncompute: Uncompute; readonly optimize?: boolean; readonly engine?: CountEngine },
  options: CostOptions = {},
): EngineResult {
  const plan = planOf(cnf, options);
  const f = plan.clauses;
  const progress = new Progress(1, options.onProgress);
  const r = countOracle({ f, kind: o.kind, strategy: o.strategy, basis: o.basis, uncompute: o.uncompute, optimize: o.optimize ?? true, levels: true, engine: o.engine ?? "auto" }, new Logicals(plan), progress.step(1));
  progress.emit(1);
  return r;
}

function snake(s: CompiledOracle["simplification"]): SimplificationReport {
  return {
    duplicate_literals: s.duplicateLiterals,
    tautologies: s.tautologies,
    repeated: s.repeated,
    subsumed: s.subsumed,
    subsumption_complete: s.subsumptionComplete,
    clauses_kept: s.clausesKept,
    literals_kept: s.literalsKept,
  };
}

/**
 * The resource report of a compiled oracle. The emitted circuit gives the gates, depth and
 * measurements; the Toffoli count of the toffoli lowering and the T and CNOT figures of the
 * Clifford+T lowering are counted (built when the counting cannot be exact). Pass the formula
 * the oracle was compiled from.
 *
 * @example
 * ```ts
 * const oracle = compileOracle(cnf, { strategy: "lean" });
 * oracleResources(cnf, oracle).t_count;
 * ```
 */
export function oracleResources(cnf: Cnf, oracle: CompiledOracle, options: CostOptions = {}): ResourceReport {
  const o = oracle.options;
  const emitted = countCircuit(oracle.circuit);
  const plan = planOracle(cnf, o.register ?? "full", o.structure ?? false);
  const f = plan.clauses;
  const logicals = new Logicals(plan);
  const progress = new Progress(2, options.onProgress);
  const named = o.construction === undefined ? null : parseConstruction(o.construction);
  const construction = named === null || typeof named === "string" ? { family: o.strategy } as const : named;
  const counted = (basis: "toffoli" | "clifford+t"): { toffoliCount: number; tCount: number; tDepth: number; cnotCount: number } => {
    const step = progress.step(1);
    if (o.basis === basis) return emitted;
    // Constructions beyond wide and lean are counted by cost/front.ts (built when not exact and small).
    if (construction.family === "blocks") return countConstructionOracle(plan, o.kind, construction, basis, o.uncompute, o.optimize, basis === "clifford+t");
    const strategy = construction.family;
    const r = countOracle({ f, kind: o.kind, strategy, basis, uncompute: o.uncompute, optimize: o.optimize, levels: basis === "clifford+t" }, logicals, step);
    if (r.exact) return r;
    return builtCounts(logicals.get(o.kind, strategy), basis, o.uncompute, o.optimize);
  };
  const cliffordT = counted("clifford+t");
  const toffoli = counted("toffoli");
  progress.emit(1);
  const reg = (role: string): number => oracle.circuit.registers.find((r) => r.role === role)?.size ?? 0;
  return {
    variables: oracle.variables,
    clauses: oracle.clauses,
    kind: o.kind,
    strategy: constructionFamily(construction),
    construction: constructionName(construction),
    basis: o.basis,
    uncompute: o.uncompute,
    qubits: { search: reg("search"), work: reg("work"), target: reg("target"), total: oracle.circuit.qubits },
    gates: emitted.gates,
    toffoli_count: toffoli.toffoliCount,
    t_count: cliffordT.tCount,
    t_depth: cliffordT.tDepth,
    cnot_count: cliffordT.cnotCount,
    depth: emitted.depth,
    measurements: emitted.measurements,
    simplification: snake(oracle.simplification),
    register: Array.from(plan.register),
  };
}

/** The part figures from a Clifford+T count and a toffoli count, and whether both are exact. */
function part(ct: EngineResult, tof: EngineResult): [PartCost, boolean] {
  return [{ qubits: ct.qubits, t_count: ct.tCount, t_depth: ct.tDepth, cnot_count: ct.cnotCount, depth: ct.depth, toffoli_count: tof.toffoliCount }, ct.exact && tof.exact];
}

function builtPart(logical: Circuit, uncompute: Uncompute): [PartCost, boolean] {
  const ct = builtCounts(logical, "clifford+t", uncompute, true);
  const tof = builtCounts(logical, "toffoli", uncompute, true);
  return [{ qubits: ct.qubits, t_count: ct.tCount, t_depth: ct.tDepth, cnot_count: ct.cnotCount, depth: ct.depth, toffoli_count: tof.toffoliCount }, true];
}

/**
 * What a whole search costs, per strategy: one phase oracle, one diffusion, and the circuit of
 * one run (H on all, `iterations` times oracle and diffusion, the measurements), each counted
 * (a run is streamed, never built), and the totals over the expected 1 / P runs.
 *
 * @example
 * ```ts
 * const plan = planSearch(cnf.variables, 1);
 * searchCosts(cnf, plan.iterations, plan.successProbability, "measured")[0]!.circuit.t_count;
 * ```
 * `only` counts that strategy's row alone (a million clauses: each row is minutes of counting).
 */
export function searchCosts(cnf: Cnf, iterations: number, successProbability: number, uncompute: Uncompute, options: CostOptions = {}, only?: Strategy): SearchCost[] {
  const plan = planOf(cnf, options);
  const f = plan.clauses;
  const logicals = new Logicals(plan);
  const strategies: readonly Strategy[] = only === undefined ? ["wide", "lean"] : [only];
  const oracleWeight = (s: Strategy): number => workOf(f, s, true) + workOf(f, s, false);
  const total = strategies.reduce((sum, s) => sum + (2 + iterations) * oracleWeight(s), 0);
  const progress = new Progress(total, options.onProgress);
  const costs = strategies.map((strategy): SearchCost => {
    const n = searchRegister(plan);
    let ops = phaseOracleOps(f, strategy);
    if (logicals.structured(strategy)) {
      const src = logicals.source("phase", strategy);
      ops = (sink, ids, p) => src.emit(sink, ids, p);
    }
    // Sized as countOracle sizes the oracle's own run (far seams: see countOracle).
    let sizing: OpsSizing = {};
    if (logicals.structured(strategy)) {
      const src = logicals.source("phase", strategy);
      // One copy per wire: a run that falls short goes again with more (bw_large.d's wide search
      // run does not: 3.3 s and 203 MB, against 6.6 s and 368 MB with countOracle's 16).
      sizing = strategy === "wide" ? { work: src.checkQubits, history: 1 } : { ids: src.checkQubits };
    } else if (strategy === "wide") sizing = { work: f.lits.length, ids: f.clauseStart.length, history: 1, records: wideRecords(f) };
    return searchCostOf(strategy, n, ops, () => logicals.get("phase", strategy), oracleWeight(strategy), iterations, successProbability, uncompute, progress, sizing);
  });
  progress.emit(1);
  return costs;
}

/** The search register of a plan: all variables, or the free ones. */
function searchRegister(plan: OraclePlan): number {
  return plan.structured === null ? plan.clauses.variables : plan.register.length;
}

/**
 * What a whole search costs with one named construction (see OracleOptions.construction): as
 * {@link searchCosts} does for wide and lean, for any construction over the oracle plan the
 * options give (its `strategy` is the construction's family).
 *
 * @example
 * ```ts
 * constructionSearchCost(cnf, "blocks-6", 1, 1, "measured", { register: "free" }).circuit.t_count;
 * ```
 */
export function constructionSearchCost(
  cnf: Cnf, construction: string, iterations: number, successProbability: number, uncompute: Uncompute, options: CostOptions = {},
): Omit<SearchCost, "strategy"> & { readonly strategy: ConstructionFamily; readonly construction: string } {
  const c = parseConstruction(construction);
  if (typeof c === "string") throw new RangeError(c);
  const plan = planOf(cnf, options);
  const n = searchRegister(plan);
  const logical = synthesizePlanned(plan, "phase", c);
  const w = 2 * (4 * logical.gates + 1);
  const progress = new Progress((2 + iterations) * w, options.onProgress);
  const cost = searchCostOf(constructionFamily(c), n, replayOps(logical, n), () => logical, w, iterations, successProbability, uncompute, progress);
  progress.emit(1);
  return { ...cost, construction: constructionName(c) };
}

/**
 * One search's costs from its phase oracle as a stream: one oracle, one diffusion, the circuit of
 * one run (each counted, built when the counting is not exact and the circuit is small), and the
 * totals over the expected runs.
 */
function searchCostOf<S extends Strategy | ConstructionFamily>(
  strategy: S, n: number, ops: OracleOps, logical: () => Circuit, oracleWeight: number, iterations: number, successProbability: number, uncompute: Uncompute, progress: Progress, sizing: OpsSizing = {},
): Omit<SearchCost, "strategy"> & { readonly strategy: S } {
  const runs = successProbability > 0 ? 1 / successProbability : Infinity;
  // One wire-record buffer for the six runs, each taking the one before's (a million clauses'
  // wide oracle: some 240 MB each).
  const memory: WireMemory = { buffer: null, records: null };
  // Sized for the whole run (the oracle's wires and the diffusion's) from the first, so that the
  // buffer is allocated once.
  sizing = { ...sizing, work: (sizing.work ?? 0) + n, wireMemory: memory };
  const both = (emit: (low: LoweringStream, ids: VirtualIds, p?: Fraction) => void, w: number, lag: number, size: OpsSizing): [EngineResult, EngineResult] => {
    const p1 = progress.step(w / 2);
    const p2 = progress.step(w / 2);
    return [
      countOps(n, "clifford+t", uncompute, true, (low, ids) => emit(low, ids, p1), lag, size),
      countOps(n, "toffoli", uncompute, false, (low, ids) => emit(low, ids, p2), lag, size),
    ];
  };
  // The oracle's runs say when the wires free at their end were freed: the diffusion's tree takes
  // the last n of them (its n - 2 ANDs).
  const [oct, otof] = both((low, ids, p) => ops(low, ids, p), oracleWeight, DEFAULT_LAG, { ...sizing, keepFreed: n, sweep: strategy === "wide" });
  const [dct, dtof] = both((low) => diffusionOps(n, low), 1, DEFAULT_LAG, { work: n, wireMemory: memory });
  // Work wires of one iteration are taken up again by the next: keep an iteration's worth of
  // templates, so that the cancellations at those seams stay inside the window. With one
  // iteration, the diffusion's tree still takes the wires the oracle freed last, the k-th AND
  // the k-th last freed (an AND's opening H cancels the closing H of the uncompute that freed
  // the wire): the reach is from the oldest of those frees to the end of the diffusion (a million
  // clauses: the default window fell short, the whole run was kept, 1.6 GB).
  // The window is whole from the first instance (eagerLag: a growing one is still short when the
  // second iteration starts). Everything is kept instead when the window's ring (twice the window)
  // would hold the whole run, or when the reach exceeds the longest window (it would fall short,
  // then keep everything anyway).
  const since = (r: EngineResult): number => {
    const need = Math.max(0, n - 2);
    const at = r.freedAt;
    return at === undefined || need > at.length ? r.instances : need === 0 ? 0 : r.instances - at[at.length - need]!;
  };
  // The diffusion's ANDs come in its first half (H and X layers, the tree; then its undo and the
  // H layer again).
  const reach = iterations <= 1 ? Math.max(since(oct), since(otof)) + Math.ceil(Math.max(dct.instances, dtof.instances) / 2) + n : 2 * (oct.instances + dct.instances);
  const total = iterations * (oct.instances + dct.instances) + 4 * n + 64;
  const window = 2 ** Math.ceil(Math.log2(reach + DEFAULT_LAG));
  const keepAll = 2 * window >= total || window > MAX_LAG;
  const [wct, wtof] = both((low, ids, p) => searchOps(n, ops, iterations, true, low, ids, p), iterations * oracleWeight, keepAll ? Infinity : window, keepAll ? { ...sizing, ring: total } : { ...sizing, eagerLag: true });
  let oracle = part(oct, otof);
  let diffusion = part(dct, dtof);
  let whole = part(wct, wtof);
  if (!oracle[1] && oct.instances <= BUILD_LIMIT) oracle = builtPart(logical(), uncompute);
  const recorded = (emit: (sink: LogicalRecorder, ids: VirtualIds) => void): Circuit => {
    const rec = new LogicalRecorder(n, n, 0);
    emit(rec, new VirtualIds(n));
    return rec.finish();
  };
  if (!diffusion[1] && dct.instances <= BUILD_LIMIT) diffusion = builtPart(recorded((sink) => diffusionOps(n, sink)), uncompute);
  if (!whole[1] && wct.instances <= BUILD_LIMIT) whole = builtPart(recorded((sink, ids) => searchOps(n, ops, iterations, true, sink, ids)), uncompute);
  const c = whole[0];
  return {
    strategy, uncompute, iterations, oracle: oracle[0], diffusion: diffusion[0], circuit: c, expected_runs: runs,
    expected_t_count: c.t_count * runs, expected_toffoli_count: c.toffoli_count * runs, expected_depth: c.depth * runs,
    exact: oracle[1] && diffusion[1] && whole[1],
  };
}

/** The oracle plan the cost options ask for (structure on and a full register by default, as compileOracle). */
function planOf(cnf: Cnf, options: CostOptions): OraclePlan {
  return planOracle(cnf, options.register ?? "full", options.structure ?? true);
}

/** A logical phase oracle over search qubits 0..n-1, replayed as a stream (structured oracles). */
function replayOps(logical: Circuit, n: number): OracleOps {
  const last = lastUses(logical);
  return (sink, ids, progress) => replayLogical(logical, n, sink, ids, last, progress);
}

export type { EngineResult } from "./engine.js";
