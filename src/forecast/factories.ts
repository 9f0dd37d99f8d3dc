/**
 * Magic-state factories: published 15-to-1 distillation protocols and the rule that picks one.
 *
 * Every T gate of the Clifford+T circuit consumes one magic state. The rows below are operating
 * points of Litinski 2019, "Magic state distillation: not as costly as you think" (Quantum 3:205,
 * Table 1): for a stated physical error rate, the physical qubits a factory occupies, the code
 * cycles it takes per output state (rejected attempts included) and the output state's error.
 * Litinski computed the output errors numerically with the Fowler & Gidney 2018 logical-error
 * scaling; they are data here, not something we recompute. We keep the protocols that output one
 * state per run (one-level 15-to-1 and 15-to-1 fed by 15-to-1); his 20-to-4 rows output four
 * states per run and are left out so that one rule gives every factory's rate.
 *
 * The figures were recalled from the paper and checked against two independent transcriptions of
 * Table 1 in public research code; the one-level rows are also checked against Litinski's own
 * formulas (see {@link fifteenToOneQubits}), in test/forecast/factories.test.ts.
 */

/** One distillation protocol at one physical error rate. */
export interface DistillationProtocol {
  /** Litinski's name: (15-to-1)_{dX,dZ,dm}, or (15-to-1)^k_{...} x (15-to-1)_{...} for two levels. */
  readonly name: string;
  /** The physical error rate the row was computed for. */
  readonly physicalErrorRate: number;
  /** Error of an output magic state. */
  readonly outputError: number;
  /** Physical qubits of one factory. */
  readonly qubits: number;
  /** Code cycles per output state, rejected attempts included. */
  readonly codeCycles: number;
}

/**
 * Where {@link DISTILLATION_PROTOCOLS} comes from.
 *
 * @example
 * ```ts
 * `${DISTILLATION_PROTOCOLS[0]!.name} (${DISTILLATION_SOURCE})`;
 * ```
 */
export const DISTILLATION_SOURCE = "Litinski 2019, \"Magic state distillation: not as costly as you think\", Quantum 3:205, Table 1";

/**
 * The protocols the model chooses from (Litinski 2019, Table 1; rows with one output state per run).
 *
 * @example
 * ```ts
 * DISTILLATION_PROTOCOLS.filter((r) => r.physicalErrorRate === 1e-3).map((r) => r.outputError); // [4.5e-8, 2.7e-12, 3.3e-14, 4.5e-20]
 * ```
 */
export const DISTILLATION_PROTOCOLS: readonly DistillationProtocol[] = [
  { name: "(15-to-1)_{7,3,3}", physicalErrorRate: 1e-4, outputError: 4.4e-8, qubits: 810, codeCycles: 18.1 },
  { name: "(15-to-1)_{9,3,3}", physicalErrorRate: 1e-4, outputError: 9.3e-10, qubits: 1150, codeCycles: 18.1 },
  { name: "(15-to-1)_{11,5,5}", physicalErrorRate: 1e-4, outputError: 1.9e-11, qubits: 2070, codeCycles: 30.0 },
  { name: "(15-to-1)^4_{9,3,3} x (15-to-1)_{25,9,9}", physicalErrorRate: 1e-4, outputError: 6.3e-25, qubits: 18600, codeCycles: 67.8 },
  { name: "(15-to-1)_{17,7,7}", physicalErrorRate: 1e-3, outputError: 4.5e-8, qubits: 4620, codeCycles: 42.6 },
  { name: "(15-to-1)^6_{11,5,5} x (15-to-1)_{25,11,11}", physicalErrorRate: 1e-3, outputError: 2.7e-12, qubits: 30700, codeCycles: 82.5 },
  { name: "(15-to-1)^6_{13,5,5} x (15-to-1)_{29,11,13}", physicalErrorRate: 1e-3, outputError: 3.3e-14, qubits: 39100, codeCycles: 97.5 },
  { name: "(15-to-1)^6_{17,7,7} x (15-to-1)_{41,17,17}", physicalErrorRate: 1e-3, outputError: 4.5e-20, qubits: 73400, codeCycles: 128 },
];

/**
 * Physical qubits of Litinski's one-level (15-to-1)_{dX,dZ,dm} protocol: 2 (dX + 4 dZ) 3 dX + 4 dm
 * (Litinski 2019, Quantum 3:205, the protocol's space cost).
 *
 * @example
 * ```ts
 * fifteenToOneQubits(17, 7, 7); // 4618: Table 1 gives 4,620
 * ```
 */
export function fifteenToOneQubits(dX: number, dZ: number, dm: number): number {
  return 2 * (dX + 4 * dZ) * 3 * dX + 4 * dm;
}

/**
 * Code cycles per output state of the one-level protocol: 6 dm per attempt, divided by the
 * probability that the attempt is accepted (Litinski 2019, Quantum 3:205, the protocol's time cost).
 *
 * @example
 * ```ts
 * fifteenToOneCycles(7, 0.014); // 42.6
 * ```
 */
export function fifteenToOneCycles(dm: number, rejection: number): number {
  return (6 * dm) / (1 - rejection);
}

/** The outcome of choosing a protocol: one, or why none fits. */
export type ProtocolChoice =
  | {
      /** A protocol was chosen. */
      readonly ok: true;
      /** The chosen row. */
      readonly protocol: DistillationProtocol;
      /** How it was chosen, in words (for the assumptions list). */
      readonly rule: string;
    }
  | {
      /** No protocol fits. */
      readonly ok: false;
      /** Why no row fits. */
      readonly reason: string;
      /** What to change. */
      readonly hint: string;
    };

/**
 * Highest physical error rate the table covers.
 *
 * @example
 * ```ts
 * MAX_TABULATED_ERROR_RATE; // 0.001
 * ```
 */
export const MAX_TABULATED_ERROR_RATE = Math.max(...DISTILLATION_PROTOCOLS.map((r) => r.physicalErrorRate));

/**
 * Picks the protocol for a physical error rate p and a needed output error per state.
 *
 * Rule: a row computed for a physical error rate at or above p is admissible (a factory that works
 * on noisier hardware works at least as well on quieter hardware, so between and below the
 * tabulated rates the choice is conservative; nothing is interpolated). Above the highest
 * tabulated rate (1e-3) there is no row and the choice is refused. Among the admissible rows
 * whose output error is at most the need, the one with the smallest space-time cost per state
 * (qubits x code cycles, Litinski's own figure of merit) wins; fewer qubits break a tie.
 *
 * @example
 * ```ts
 * const c = chooseDistillation(1e-3, 1e-9);
 * if (c.ok) c.protocol.name; // "(15-to-1)^6_{11,5,5} x (15-to-1)_{25,11,11}"
 * ```
 */
export function chooseDistillation(physicalErrorRate: number, neededOutputError: number): ProtocolChoice {
  const rule =
    "rows computed for a physical error rate at or above the machine's are admissible (conservative, no interpolation); " +
    "the admissible row with output error at or below the need and the smallest qubits x cycles per state is chosen";
  if (!(physicalErrorRate > 0) || physicalErrorRate > MAX_TABULATED_ERROR_RATE) {
    return {
      ok: false,
      reason: `the physical error rate ${physicalErrorRate} is above the distillation table's highest rate (${MAX_TABULATED_ERROR_RATE}; ${DISTILLATION_SOURCE}); the model does not extrapolate`,
      hint: `give --error-rate ${MAX_TABULATED_ERROR_RATE} or lower`,
    };
  }
  const admissible = DISTILLATION_PROTOCOLS.filter((r) => r.physicalErrorRate >= physicalErrorRate);
  const fit = admissible.filter((r) => r.outputError <= neededOutputError);
  if (fit.length === 0) {
    const best = admissible.reduce((a, b) => (b.outputError < a.outputError ? b : a));
    return {
      ok: false,
      reason: `the search consumes so many magic states that each must fail with probability at most ${neededOutputError.toPrecision(2)}; the best tabulated protocol at this error rate, ${best.name}, gives ${best.outputError} (${DISTILLATION_SOURCE})`,
      hint: "a lower --error-rate or a looser --failure-budget may bring it within the table",
    };
  }
  const cost = (r: DistillationProtocol): number => r.qubits * r.codeCycles;
  const protocol = fit.reduce((a, b) => (cost(b) < cost(a) || (cost(b) === cost(a) && b.qubits < a.qubits) ? b : a));
  return { ok: true, protocol, rule };
}
