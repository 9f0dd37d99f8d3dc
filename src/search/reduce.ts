/**
 * Search-register reduction lives in cnf/reduce.ts (synthesis needs it for the free register, and
 * synth/ sits upstream of search/); re-exported here for the modules that import it from search/.
 */
export type { Reduction, VariableRange } from "../cnf/reduce.js";
export { freeVariables, occurringVariables, reduceSearch } from "../cnf/reduce.js";
