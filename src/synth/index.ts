/** Synthesis: a simplified formula to a logical oracle circuit, by the chosen strategy. */
import type { Cnf } from "../cnf/cnf.js";
import type { Circuit } from "../ir/circuit.js";
import type { OracleKind } from "./common.js";
import { synthesizeLean } from "./lean.js";
import { synthesizeReference } from "./reference.js";
import { simplify, type SimplifiedCnf, type SimplifyReport } from "./simplify.js";
import { synthesizeWide } from "./wide.js";
import type { OraclePlan } from "./plan.js";
import { synthesizeStructured } from "./structured.js";

export type { OracleKind } from "./common.js";
export type { SimplifiedCnf, SimplifyReport } from "./simplify.js";
export { simplify } from "./simplify.js";
export type { OraclePlan, RegisterMode, StructureSummary, StructuredFormula } from "./plan.js";
export { planOracle, sharingPlans } from "./plan.js";
export { synthesizeStructured } from "./structured.js";
export type { Construction, ConstructionFamily } from "./construction.js";
export { constructionFamily, constructionName, parseConstruction, planShape, synthesizeConstruction, synthesizePlanned } from "./construction.js";

/** How clauses become gates: `wide` keeps every clause bit (fewest T), `lean` counts violated clauses (fewest qubits). */
export type Strategy = "wide" | "lean";
/** Strategies including `textbook`, the reference construction of cost tables. */
export type AnyStrategy = Strategy | "textbook";

export const STRATEGIES: readonly Strategy[] = ["wide", "lean"];

export function synthesize(f: SimplifiedCnf, kind: OracleKind, strategy: AnyStrategy): Circuit {
  switch (strategy) {
    case "wide":
      return synthesizeWide(f, kind);
    case "lean":
      return synthesizeLean(f, kind);
    case "textbook":
      return synthesizeReference(f, kind);
  }
}

/** Simplifies and synthesizes in one step. */
/**
 * The logical oracle of a plan (synth/plan.ts): the structured construction when structure was
 * recovered, else the strategy's clause construction over the plan's clauses. The textbook
 * reference is always the clause construction.
 */
export function synthesizePlan(plan: OraclePlan, kind: OracleKind, strategy: AnyStrategy): Circuit {
  if (plan.structured === null || strategy === "textbook") return synthesize(plan.clauses, kind, strategy);
  return synthesizeStructured(plan.structured, kind, strategy);
}

export function synthesizeCnf(cnf: Cnf, kind: OracleKind, strategy: AnyStrategy): { circuit: Circuit; simplified: SimplifiedCnf; report: SimplifyReport } {
  const simplified = simplify(cnf);
  return { circuit: synthesize(simplified, kind, strategy), simplified, report: simplified.report };
}
