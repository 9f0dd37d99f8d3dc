/**
 * The expected function of a free-register oracle (see structure/completion.ts): a register value
 * is marked exactly when its completion is a model. Built over the register's literals: register
 * variables are the inputs, variables fixed by unit propagation constants, defined variables their
 * definitions in order, every other variable 0; the formula's clauses are then taken over those.
 */
import type { Cnf } from "../cnf/cnf.js";
import { evaluate } from "../cnf/evaluate.js";
import { completeAssignment, type Completion } from "../structure/completion.js";
import type { ExpectedFunction, FunctionBuilder } from "./index.js";

/** The projection a free-register oracle marks, for {@link proveOracle}'s `expected` option. */
export function expectedOfCompletion(cnf: Cnf, completion: Completion): ExpectedFunction {
  return {
    inputs: completion.register.length,
    build(b: FunctionBuilder, inputs: Int32Array, cuts: number[]): number {
      const lit = new Int32Array(completion.variables).fill(b.FALSE);
      for (let i = 0; i < completion.register.length; i++) lit[completion.register[i]! - 1] = inputs[i]!;
      for (const l of completion.fixed) lit[Math.abs(l) - 1] = l > 0 ? b.TRUE : b.FALSE;
      const of = (l: number): number => (l > 0 ? lit[l - 1]! : b.not(lit[-l - 1]!));
      for (const d of completion.definitions) {
        const ins = d.inputs.map(of);
        let r: number;
        switch (d.kind) {
          case "equiv": r = ins[0]!; break;
          case "not": r = b.not(ins[0]!); break;
          case "and": r = b.and(ins); break;
          case "or": r = b.or(ins); break;
          case "xor":
          case "xnor":
            r = d.kind === "xnor" ? b.TRUE : b.FALSE;
            for (const x of ins) r = b.xor(r, x);
            break;
        }
        lit[d.variable - 1] = r;
      }
      const ok: number[] = [];
      const violated: number[] = [];
      for (let i = 0; i + 1 < cnf.clauseStart.length; i++) {
        violated.length = 0;
        for (let k = cnf.clauseStart[i]!; k < cnf.clauseStart[i + 1]!; k++) violated.push(b.not(of(cnf.lits[k]!)));
        const v = b.and(violated);
        // The clause nodes are the cut points of the BDD step, as for the plain formula.
        if (v > 1) cuts.push(v >>> 1);
        ok.push(b.not(v));
      }
      return b.and(ok);
    },
    evaluate(inputs: readonly boolean[]): boolean {
      return evaluate(cnf, completeAssignment(completion, inputs));
    },
  };
}
