/**
 * The surface-code part of the physical model: how often a logical qubit fails per code cycle at a
 * given physical error rate and code distance, the smallest odd distance that keeps a computation
 * within its error budget, and the physical qubits of one logical patch.
 *
 * Both published scalings have the form p_L(p, d) = A (p / p_th)^((d + 1) / 2): the logical error
 * per logical qubit per code cycle falls by a factor p_th / p for every 2 added to the distance.
 */

/** A published logical-error scaling p_L(p, d) = prefactor x (p / threshold)^((d + 1) / 2). */
export interface LogicalErrorModel {
  /** Our short name for it (`fowler-gidney-2018` or `fowler-2012`). */
  readonly name: string;
  /** The prefactor A. */
  readonly prefactor: number;
  /** The threshold p_th. */
  readonly threshold: number;
  /** Authors and year, for short mentions. */
  readonly citation: string;
  /** Where the constants come from. */
  readonly source: string;
}

/**
 * The two published scalings we offer. Fowler & Gidney 2018 is the default because Litinski's
 * distillation table (factories.ts), which the model also uses, was computed with it.
 *
 * @example
 * ```ts
 * LOGICAL_ERROR_MODELS["fowler-2012"].threshold; // 0.0057
 * ```
 */
export const LOGICAL_ERROR_MODELS: {
  /** p_L = 0.1 (100 p)^((d+1)/2). */
  readonly "fowler-gidney-2018": LogicalErrorModel;
  /** p_L = 0.03 (p / 0.0057)^((d+1)/2). */
  readonly "fowler-2012": LogicalErrorModel;
} = {
  "fowler-gidney-2018": {
    name: "fowler-gidney-2018",
    prefactor: 0.1,
    threshold: 0.01,
    citation: "Fowler & Gidney 2018",
    source:
      "Fowler & Gidney 2018, \"Low overhead quantum computation using lattice surgery\" (arXiv:1808.06709): p_L = 0.1 (100 p)^((d+1)/2) per qubit per code cycle; the scaling Litinski 2019 (Quantum 3:205) computes his distillation table with",
  },
  "fowler-2012": {
    name: "fowler-2012",
    prefactor: 0.03,
    threshold: 0.0057,
    citation: "Fowler, Mariantoni, Martinis & Cleland 2012",
    source:
      "Fowler, Mariantoni, Martinis & Cleland 2012, \"Surface codes: towards practical large-scale quantum computation\" (PRA 86:032324): P_L ~ 0.03 (p / p_th)^((d+1)/2) with p_th ~ 0.57%",
  },
};

/** The names of {@link LOGICAL_ERROR_MODELS}. */
export type LogicalErrorModelName = keyof typeof LOGICAL_ERROR_MODELS;

/**
 * Logical error per logical qubit per code cycle: A (p / p_th)^((d + 1) / 2).
 *
 * @example
 * ```ts
 * logicalErrorRate(LOGICAL_ERROR_MODELS["fowler-gidney-2018"], 1e-3, 17); // 1e-10
 * ```
 */
export function logicalErrorRate(model: LogicalErrorModel, physicalErrorRate: number, distance: number): number {
  return model.prefactor * (physicalErrorRate / model.threshold) ** ((distance + 1) / 2);
}

/**
 * Physical qubits of one logical patch of distance d: 2 d^2 (a rotated surface-code patch has d^2
 * data and d^2 - 1 measurement qubits; rounded up, common practice).
 *
 * @example
 * ```ts
 * patchQubits(17); // 578
 * ```
 */
export function patchQubits(distance: number): number {
  return 2 * distance * distance;
}

/**
 * Largest code distance the model considers; beyond it the estimate is refused.
 *
 * @example
 * ```ts
 * codeDistanceFor(LOGICAL_ERROR_MODELS["fowler-gidney-2018"], 0.0099, 1e30, 1e-9) === undefined; // true: d would pass MAX_CODE_DISTANCE
 * ```
 */
export const MAX_CODE_DISTANCE = 9999;

/**
 * The smallest odd distance d >= 3 with patchCycles x p_L(p, d) <= budget, where patchCycles is
 * the number of logical patches times the code cycles they live through. Undefined when the
 * physical error rate is not below the threshold or d would exceed {@link MAX_CODE_DISTANCE}.
 *
 * @example
 * ```ts
 * // 100 patches for a million cycles, a failure budget of 0.005, p = 1e-3: d = 19
 * codeDistanceFor(LOGICAL_ERROR_MODELS["fowler-gidney-2018"], 1e-3, 1e8, 0.005); // 19
 * ```
 */
export function codeDistanceFor(model: LogicalErrorModel, physicalErrorRate: number, patchCycles: number, budget: number): number | undefined {
  const ratio = physicalErrorRate / model.threshold;
  if (!(ratio > 0 && ratio < 1) || !(budget > 0) || !(patchCycles >= 0) || !Number.isFinite(patchCycles)) return undefined;
  if (patchCycles === 0) return 3;
  // Solve A r^((d+1)/2) patchCycles <= budget in logarithms (patchCycles may be 1e150), then
  // step over the float rounding with the exact test.
  const need = Math.log(budget / (patchCycles * model.prefactor)) / Math.log(ratio);
  let d = Math.max(3, 2 * Math.ceil(need) - 1);
  if (d % 2 === 0) d++;
  while (d > 3 && patchCycles * logicalErrorRate(model, physicalErrorRate, d - 2) <= budget) d -= 2;
  while (d <= MAX_CODE_DISTANCE && patchCycles * logicalErrorRate(model, physicalErrorRate, d) > budget) d += 2;
  return d <= MAX_CODE_DISTANCE ? d : undefined;
}
