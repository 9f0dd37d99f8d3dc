/**
 * The search register as the commands present it (issue 9): which variables it holds, how a
 * measured value completes to a model, and the formula whose model count is M over it. Shared by
 * plan, search, draw, oracle, cost and forecast.
 */
import {
  completeModel, evaluate, reduceSearch, registerOf, type Cnf, type Oracle, type RegisterMode, type RegisterPlan,
  type StructureSummary,
} from "../internal.js";
import { plural, UserError } from "./io.js";

/** Full registers are listed in JSON up to this many qubits (beyond, `register` is null: vars[v-1] is v). */
const LIST_FULL_UP_TO = 1 << 20;

/** How a measured register value becomes a model, in words (README and JSON say the same). */
export const COMPLETION_RULE =
  "a measured register value completes to a model: each register variable takes its measured bit (outcome[i] is variable register[i]); " +
  "variables fixed by unit propagation take their forced value; defined variables are computed from their definitions in the order listed; " +
  "every other variable occurs in no clause left open and may take any value (0 chosen). The completion is a model exactly when the oracle marks the value.";

/** The register a search (or a free-register oracle) works on. */
export interface SearchProblem {
  /** `full` or `free`. */
  readonly mode: RegisterMode;
  /** Whether structure recovery was used. */
  readonly structure: boolean;
  /** Search qubits. */
  readonly n: number;
  /** Declared variables of the formula. */
  readonly variables: number;
  /** The register and its completion (free register only: a full register is 1..n). */
  readonly plan: RegisterPlan | undefined;
  /**
   * The formula whose model count is M over the register: the formula itself for a full register;
   * for a free one, the formula left by unit propagation over the variables still in clauses, whose
   * models correspond one to one to the register values that extend to a model (each defined
   * variable has one value that satisfies its clauses).
   */
  readonly counted: Cnf;
}

/** The register of `cnf` for the given options (no synthesis). */
export function searchProblem(cnf: Cnf, o: { register: RegisterMode; structure: boolean }): SearchProblem {
  if (o.register === "full") return { mode: "full", structure: o.structure, n: cnf.variables, variables: cnf.variables, plan: undefined, counted: cnf };
  const plan = registerOf(cnf, { register: "free", structure: o.structure });
  return { mode: "free", structure: o.structure, n: plan.register.length, variables: cnf.variables, plan, counted: reduceSearch(cnf).cnf };
}

/** The register of a compiled oracle, as a SearchProblem (what registerText and registerJson take). */
export function problemOfOracle(cnf: Cnf, o: Pick<Oracle, "options" | "register" | "completion" | "structure">): SearchProblem {
  const { register, structure } = o.options;
  if (register === "full") return { mode: "full", structure, n: cnf.variables, variables: cnf.variables, plan: undefined, counted: cnf };
  return {
    mode: "free", structure, n: o.register.length, variables: cnf.variables,
    plan: { register: o.register, completion: o.completion, structure: o.structure }, counted: reduceSearch(cnf).cnf,
  };
}

/** What structure recovery gave, in words. */
export function structureText(s: StructureSummary | null): string {
  if (s === null) return "recovery off (--no-structure): the clause construction";
  if (!s.used) return "none recovered: the clause construction";
  return `${plural(s.definitions, "definition")}, ${plural(s.parities, "parity constraint")}, ${plural(s.groups, "one-hot group")}, ${plural(s.remainingClauses, "remaining clause")}`;
}

/** What structure recovery gave, as JSON (null when recovery was off). */
export function structureJson(s: StructureSummary | null) {
  if (s === null) return null;
  return { used: s.used, definitions: s.definitions, parities: s.parities, groups: s.groups, remaining_clauses: s.remainingClauses, remaining_literals: s.remainingLiterals };
}

/** "1 clause", "2 clauses". */

/** "1 2 3", or (unless `all`) the first 48 and how many more. */
function listText(vs: ArrayLike<number>, all: boolean): string {
  const shown = Array.from({ length: all ? vs.length : Math.min(vs.length, vs.length > 64 ? 48 : 64) }, (_, i) => vs[i]!);
  return vs.length > shown.length ? `${shown.join(" ")} ... (${vs.length - shown.length} more; --json lists all)` : shown.join(" ") || "(none)";
}

/** Variables that are neither in the register, nor fixed, nor defined: step 5 of the completion (0 chosen). */
function others(p: SearchProblem): number {
  const c = p.plan!.completion;
  return p.variables - p.n - c.fixed.length - c.definitions.length;
}

/** One line for people: what the register holds and where the other variables come from (`all`: every variable listed). */
export function registerText(p: SearchProblem, all = false): string {
  if (p.mode === "full") return `full (every declared variable: vars[v-1] is variable v${p.structure ? "" : "; structure recovery off"})`;
  const c = p.plan!.completion;
  const parts = [
    `${c.fixed.length} fixed by unit propagation`,
    ...(p.structure ? [`${c.definitions.length} defined`] : []),
    `${others(p)} in no open clause`,
  ];
  return `free (vars[i] is variable ${listText(p.plan!.register, all)}; of ${p.variables}: ${parts.join(", ")}${p.structure ? "" : "; structure recovery off"})`;
}

/** The register fields of a JSON document (snake_case). */
export function registerJson(p: SearchProblem) {
  if (p.mode === "full") {
    return {
      register_mode: "full" as const,
      structure: p.structure,
      register: p.n <= LIST_FULL_UP_TO ? Array.from({ length: p.n }, (_, i) => i + 1) : null,
      completion: null,
    };
  }
  const c = p.plan!.completion;
  return {
    register_mode: "free" as const,
    structure: p.structure,
    register: Array.from(p.plan!.register),
    completion: {
      rule: COMPLETION_RULE,
      fixed: Array.from(c.fixed, (l) => ({ variable: Math.abs(l), value: l > 0 })),
      definitions: c.definitions.map((d) => ({ variable: d.variable, kind: d.kind, inputs: [...d.inputs] })),
      other_variables: others(p),
    },
  };
}

/** Parses a measured register value: n characters 0/1, outcome[0] first. */
export function parseRegisterValue(raw: string, n: number, command: string): Uint8Array {
  if (!/^[01]*$/.test(raw) || raw.length !== n) {
    throw new UserError(`clausegate ${command}: error: --complete expects ${plural(n, "bit")} (0 or 1, outcome[0] first) per value but got '${raw}'; hint: give the measured outcome of the ${plural(n, "search qubit")}, e.g. ${"0".repeat(Math.min(n, 8))}${n > 8 ? "..." : ""}`);
  }
  return Uint8Array.from(raw, (ch) => (ch === "1" ? 1 : 0));
}

/** The completion of a register value, and whether it is a model. */
export function completeValue(cnf: Cnf, p: SearchProblem, value: ArrayLike<number>): { model: Uint8Array; satisfies: boolean } {
  const model = p.plan ? completeModel(p.plan, value as ArrayLike<0 | 1>) : Uint8Array.from(value);
  return { model, satisfies: evaluate(cnf, model) };
}

/** An assignment as a DIMACS value line: "v 1 -2 3 0". */
export function modelLine(model: Uint8Array): string {
  const parts = new Array<string>(model.length);
  for (let v = 0; v < model.length; v++) parts[v] = model[v] ? String(v + 1) : String(-(v + 1));
  return `v ${parts.join(" ")}${model.length ? " " : ""}0`;
}

/** Bits as a string, outcome[0] first. */
export const bitsText = (value: ArrayLike<number>): string => Array.from(value, (b) => (b ? "1" : "0")).join("");
