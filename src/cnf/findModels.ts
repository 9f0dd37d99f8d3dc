/**
 * Satisfying assignments for sampled verification, found by a complete method: the CDCL solver
 * of solve.ts, with each model found blocked to reach the next (at most `max` of them). Unlike a
 * local search it also proves that there is none, and it reaches the single model of formulas
 * built to have one (SATLIB's aim-*-yes1 family).
 */
import type { Cnf } from "./cnf.js";
import { CdclSolver, type SolveStatus } from "./solve.js";

/** What {@link findModels} found. */
export interface ModelSearch {
  /** "sat" when a model was found, "unsat" when the solver proved there is none, "unknown" when its budget ran out first. */
  readonly status: SolveStatus;
  /** Distinct models, each 0/1 per variable (index v - 1). */
  readonly models: Uint8Array[];
  /** True when these are all the models there are (the search proved no further one exists). */
  readonly all: boolean;
  /** Conflicts the solver spent. */
  readonly conflicts: number;
}

/** Options of {@link findModels}. */
export interface ModelSearchOptions {
  /** Seed of the solver's initial phases (default 1): different seeds lead to different models. */
  readonly seed?: number;
  /** Conflicts the solver may spend in all (default 1,000,000). */
  readonly conflictLimit?: number;
}

/** The default conflict budget: SATLIB's planning formulas (bw_large.d, logistics.d) need far fewer. */
export const DEFAULT_CONFLICT_LIMIT = 1_000_000;

/** Up to `max` distinct models of `cnf`, or a proof that it has none. */
export function findModels(cnf: Cnf, max: number, opts: ModelSearchOptions = {}): ModelSearch {
  const solver = new CdclSolver(cnf.variables, opts.seed ?? 1);
  const limit = opts.conflictLimit ?? DEFAULT_CONFLICT_LIMIT;
  const models: Uint8Array[] = [];
  if (!solver.addCnf(cnf)) return { status: "unsat", models, all: true, conflicts: 0 };
  while (models.length < max) {
    const status = solver.solve(Math.max(0, limit - solver.conflicts));
    if (status === "unknown") {
      return { status: models.length > 0 ? "sat" : "unknown", models, all: false, conflicts: solver.conflicts };
    }
    if (status === "unsat") return { status: models.length > 0 ? "sat" : "unsat", models, all: true, conflicts: solver.conflicts };
    models.push(solver.model());
    if (!solver.blockModel()) return { status: "sat", models, all: true, conflicts: solver.conflicts };
  }
  return { status: "sat", models, all: false, conflicts: solver.conflicts };
}
