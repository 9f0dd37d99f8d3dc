/** The optimizer's passes by name, and the default pipeline. Every pass is a pure Circuit -> Circuit. */
import type { Circuit } from "../ir/circuit.js";
import { cancelInverses } from "./cancelInverses.js";
import { dropIdentities } from "./dropIdentities.js";
import { foldXPolarity } from "./foldXPolarity.js";
import { mergePhases } from "./mergePhases.js";

export interface Pass {
  readonly name: string;
  readonly description: string;
  readonly run: (c: Circuit) => Circuit;
}

export const PASSES: Readonly<Record<string, Pass>> = {
  "cancel-inverses": { name: "cancel-inverses", description: "remove a gate and an earlier inverse, through commuting gates", run: cancelInverses },
  "fold-x-polarity": { name: "fold-x-polarity", description: "fold X conjugations of controls into control polarity", run: foldXPolarity },
  "merge-phases": { name: "merge-phases", description: "merge runs of T/S/Z phase gates into the shortest sequence", run: mergePhases },
  "drop-identities": { name: "drop-identities", description: "drop gates that do nothing and merge global phases", run: dropIdentities },
};

/** The default optimizer pipeline. cancel-inverses runs again after folding and merging expose new pairs. */
export const DEFAULT_PIPELINE: readonly string[] = ["cancel-inverses", "fold-x-polarity", "merge-phases", "cancel-inverses", "drop-identities"];
