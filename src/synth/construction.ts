/**
 * Constructions by name, with their parameters in the name, so that a cost front, a resource
 * report and the command line all say which circuit they mean:
 *
 *   wide                 every clause bit held until the mark (wide.ts)
 *   lean                 a counter of violated clauses (lean.ts)
 *   blocks-B1xB2x...     blocked.ts: B1 clauses per level-1 block, B2 level-1 blocks per level-2
 *                        block, ...; e.g. blocks-6 (one level), blocks-4x3 (two levels)
 *   fanout-U             wide with fan-out copies: every holder of a variable read by at most U
 *                        clauses (fanout-1: every reading its own copy; logarithmic T-depth)
 *   blocks-B-held-H      the first H clauses held as in wide, the others in blocks (between the two)
 *   blocks-...-fanout-U  blocks whose level-1 blocks (and held clauses) copy their variables likewise
 */
import type { Circuit } from "../ir/circuit.js";
import { synthesizeBlocked, type BlockPlan } from "./blocked.js";
import type { OracleKind } from "./common.js";
import { synthesizeLean } from "./lean.js";
import type { OraclePlan } from "./plan.js";
import type { SimplifiedCnf } from "./simplify.js";
import { structuredShape, synthesizeStructured, synthesizeStructuredBlocked } from "./structured.js";
import { synthesizeWide } from "./wide.js";

/** A construction: `wide`, `lean`, or a blocked plan (block sizes bottom-up, fan-out). */
export type Construction =
  | { readonly family: "wide" }
  | { readonly family: "lean" }
  | { readonly family: "blocks"; readonly plan: BlockPlan };

/** The families of constructions, as the resource report names them. */
export type ConstructionFamily = "wide" | "lean" | "blocks" | "fanout";

/** Largest block size, held count and fan-out a name may carry (nine digits), and most levels. */
export const MAX_BLOCK = 999_999_999;
export const MAX_LEVELS = 8;

/** The name of a construction (parsed back by {@link parseConstruction}). */
export function constructionName(c: Construction): string {
  if (c.family !== "blocks") return c.family;
  const { sizes, fanout } = c.plan;
  const held = c.plan.held ?? 0;
  if (sizes.length === 0) return fanout > 0 ? `fanout-${fanout}` : "wide";
  return `blocks-${sizes.join("x")}${held > 0 ? `-held-${held}` : ""}${fanout > 0 ? `-fanout-${fanout}` : ""}`;
}

/** The family a construction belongs to. */
export function constructionFamily(c: Construction): ConstructionFamily {
  if (c.family !== "blocks") return c.family;
  return c.plan.sizes.length === 0 ? (c.plan.fanout > 0 ? "fanout" : "wide") : "blocks";
}

/**
 * Reads a construction name; returns a message saying what is wrong instead when it is not one.
 * Block sizes are at least 2 (a block of one is no block), fan-outs at least 1.
 */
export function parseConstruction(name: string): Construction | string {
  if (name === "wide") return { family: "wide" };
  if (name === "lean") return { family: "lean" };
  const m = /^(?:blocks-(\d{1,9}(?:x\d{1,9})*)(?:-held-(\d{1,9}))?)?(?:(?:^|-)fanout-(\d{1,9}))?$/.exec(name);
  if (m === null || name === "" || (m[1] === undefined && m[3] === undefined)) {
    return `'${name}' is not a construction name (wide, lean, blocks-B1xB2..., blocks-B-held-H, fanout-U, or blocks-...-fanout-U, e.g. blocks-6 or blocks-4x3-fanout-1)`;
  }
  const sizes = m[1] === undefined ? [] : m[1].split("x").map(Number);
  const held = m[2] === undefined ? 0 : Number(m[2]);
  const fanout = m[3] === undefined ? 0 : Number(m[3]);
  if (sizes.length > MAX_LEVELS) return `'${name}' has ${sizes.length} levels of blocks; at most ${MAX_LEVELS}`;
  if (sizes.some((s) => s < 2 || s > MAX_BLOCK)) return `'${name}': block sizes are whole numbers in 2..${MAX_BLOCK}`;
  if (m[2] !== undefined && (held < 1 || held > MAX_BLOCK)) return `'${name}': the held clauses are a whole number in 1..${MAX_BLOCK}`;
  if (m[3] !== undefined && (fanout < 1 || fanout > MAX_BLOCK)) return `'${name}': the fan-out is a whole number in 1..${MAX_BLOCK}`;
  return { family: "blocks", plan: { sizes, fanout, held } };
}

/** Synthesizes a construction's logical oracle. */
export function synthesizeConstruction(f: SimplifiedCnf, kind: OracleKind, c: Construction): Circuit {
  switch (c.family) {
    case "wide":
      return synthesizeWide(f, kind);
    case "lean":
      return synthesizeLean(f, kind);
    case "blocks":
      // Plain wide by its own synthesis: it writes straight into the builder, for huge formulas.
      return c.plan.sizes.length === 0 && c.plan.fanout === 0 ? synthesizeWide(f, kind) : synthesizeBlocked(f, kind, c.plan);
  }
}

/**
 * A construction's logical oracle for an oracle plan (synth/plan.ts): over the plan's clauses
 * when it has no structure; else wide and lean by the structured synthesis, and the blocked and
 * fan-out constructions by conjoining the structure's checks (definitions, parities, groups,
 * remaining clauses) in blocks, with the computed definitions of a free register around them.
 */
export function synthesizePlanned(plan: OraclePlan, kind: OracleKind, c: Construction): Circuit {
  if (plan.structured === null) return synthesizeConstruction(plan.clauses, kind, c);
  if (c.family !== "blocks") return synthesizeStructured(plan.structured, kind, c.family);
  if (c.plan.sizes.length === 0 && c.plan.fanout === 0) return synthesizeStructured(plan.structured, kind, "wide");
  return synthesizeStructuredBlocked(plan.structured, kind, c.plan);
}

/**
 * What the candidate constructions of a plan are chosen by: the checks conjoined (clauses, or
 * the structure's checks), the most reads of one qubit, and all reads.
 */
export function planShape(plan: OraclePlan): { m: number; reads: number; literals: number } {
  if (plan.structured !== null) return structuredShape(plan.structured);
  const f = plan.clauses;
  const m = f.unsat ? 0 : f.clauseStart.length - 1;
  const count = new Int32Array(f.variables + 1);
  let reads = 0;
  for (const l of f.lits) reads = Math.max(reads, ++count[Math.abs(l)]!);
  return { m, reads, literals: f.lits.length };
}
