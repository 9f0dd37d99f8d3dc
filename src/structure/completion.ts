/**
 * How a value of an oracle's search register completes to an assignment of every declared
 * variable. A full register holds every variable (the completion is the value itself); a free
 * register holds only the variables left free after unit propagation and structure recovery, and
 * the rest follow from them by a fixed rule (see {@link Completion}).
 */
import type { Definition } from "./index.js";

/**
 * The rule that completes a register value to an assignment of variables 1..`variables`:
 *  1. every variable starts at 0;
 *  2. search qubit i gives its value to variable `register[i]`;
 *  3. each literal of `fixed` is made true (unit propagation forced it in every model);
 *  4. each definition, in order, sets its variable to its function of the values so far
 *     (its inputs are register variables, fixed ones or variables defined earlier);
 *  5. every other variable stays 0: it occurs in no clause that the fixed literals leave open,
 *     so its value cannot matter.
 * A register value is marked by the oracle exactly when its completion is a model of the formula,
 * which is exactly when some model extends it (the defined variables have one value each that
 * satisfies their clauses, and the fixed ones have one value in every model). The variables of
 * rule 5 take any value in a model, so the formula has (marked register values) x
 * 2^(variables - register - fixed - definitions) models: a search over the register plans with
 * M = models / 2^(that exponent).
 */
export interface Completion {
  /** Declared variables of the formula. */
  readonly variables: number;
  /** The DIMACS variable held by each search qubit, in order (1..n for a full register). */
  readonly register: Int32Array;
  /** DIMACS literals made true by unit propagation, ascending by variable (empty for a full register). */
  readonly fixed: Int32Array;
  /** Definitions computed in this order (empty for a full register). */
  readonly definitions: readonly Definition[];
}

/** The completion of a full register over `n` variables: register[i] = i + 1 and nothing else. */
export function fullCompletion(n: number): Completion {
  const register = new Int32Array(n);
  for (let i = 0; i < n; i++) register[i] = i + 1;
  return { variables: n, register, fixed: new Int32Array(0), definitions: [] };
}

/** True when the completion is the identity (a full register: every variable is a search qubit). */
export function isFullCompletion(c: Completion): boolean {
  if (c.register.length !== c.variables || c.fixed.length > 0 || c.definitions.length > 0) return false;
  for (let i = 0; i < c.register.length; i++) if (c.register[i] !== i + 1) return false;
  return true;
}

/**
 * Completes a register value (`value[i]` is search qubit i) to an assignment of every declared
 * variable by the rule of {@link Completion}. Returns 0/1 per variable, index v - 1 for variable v.
 *
 * @example
 * ```ts
 * // Register [2], variable 1 fixed true, variable 3 = 1 AND 2.
 * const c = { variables: 3, register: Int32Array.of(2), fixed: Int32Array.of(1), definitions: [{ variable: 3, kind: "and", inputs: [1, 2] }] };
 * completeAssignment(c, [1]); // Uint8Array [1, 1, 1]
 * ```
 */
export function completeAssignment(c: Completion, value: ArrayLike<0 | 1 | boolean | number>): Uint8Array {
  if (value.length !== c.register.length) {
    throw new RangeError(`register value has ${value.length} bits; the register has ${c.register.length} qubits`);
  }
  const out = new Uint8Array(c.variables);
  for (let i = 0; i < c.register.length; i++) out[c.register[i]! - 1] = value[i] ? 1 : 0;
  for (let i = 0; i < c.fixed.length; i++) {
    const l = c.fixed[i]!;
    out[Math.abs(l) - 1] = l > 0 ? 1 : 0;
  }
  const at = (l: number): number => (l > 0 ? out[l - 1]! : 1 - out[-l - 1]!);
  for (const d of c.definitions) {
    let r = 0;
    switch (d.kind) {
      case "equiv":
        r = at(d.inputs[0]!);
        break;
      case "not":
        r = 1 - at(d.inputs[0]!);
        break;
      case "and":
        r = 1;
        for (const l of d.inputs) r &= at(l);
        break;
      case "or":
        for (const l of d.inputs) r |= at(l);
        break;
      case "xor":
      case "xnor":
        r = d.kind === "xnor" ? 1 : 0;
        for (const l of d.inputs) r ^= at(l);
        break;
    }
    out[d.variable - 1] = r;
  }
  return out;
}
