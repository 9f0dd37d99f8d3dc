/**
 * Tseitin encoding of the cone of one literal of the graph into CNF (Tseitin 1968): one variable
 * per node in the cone, the clauses that tie it to its operands (a XOR node to the two literals
 * it was first built from, so a long chain of updates stays linear), and a unit clause asserting
 * the literal. Satisfying assignments of the CNF are exactly the inputs (with the nodes' values) that
 * make the literal true.
 */
import type { Cnf } from "../cnf/cnf.js";
import { AND, INPUT, XOR, XOR2, type Graph } from "./graph.js";

/** The CNF and where each input of the cone went. */
export interface Encoding {
  readonly cnf: Cnf;
  /** Input nodes of the cone and their CNF variables (parallel arrays). */
  readonly inputNodes: Int32Array;
  readonly inputVars: Int32Array;
}

export function encodeCone(g: Graph, root: number): Encoding {
  const varOf = new Int32Array(g.size);
  let vars = 0;
  const lits: number[] = [];
  const starts: number[] = [0];
  const inputNodes: number[] = [];
  const inputVars: number[] = [];
  const clause = (...ls: number[]): void => {
    for (const l of ls) lits.push(l);
    starts.push(lits.length);
  };
  const L = (lit: number): number => ((lit & 1) === 1 ? -varOf[lit >>> 1]! : varOf[lit >>> 1]!);
  // Iterative post-order DFS: a node gets its variable after all its operands have theirs.
  const stack: number[] = [root >>> 1];
  while (stack.length > 0) {
    const n = stack[stack.length - 1]!;
    if (varOf[n] !== 0) {
      stack.pop();
      continue;
    }
    const kind = g.kind(n);
    if (kind === INPUT) {
      varOf[n] = ++vars;
      inputNodes.push(n);
      inputVars.push(vars);
      stack.pop();
      continue;
    }
    const ops = operandsFor(g, n);
    let ready = true;
    for (let i = 0; i < ops.length; i++) {
      if (varOf[ops[i]! >>> 1] === 0) {
        stack.push(ops[i]! >>> 1);
        ready = false;
      }
    }
    if (!ready) continue;
    stack.pop();
    const v = ++vars;
    varOf[n] = v;
    if (kind === AND) {
      const long: number[] = [v];
      for (let i = 0; i < ops.length; i++) {
        clause(-v, L(ops[i]!));
        long.push(-L(ops[i]!));
      }
      clause(...long);
    } else if (kind === XOR || kind === XOR2) {
      // A chain of 2-input XORs; the last one is the node itself.
      let acc = L(ops[0]!);
      for (let i = 1; i < ops.length; i++) {
        const t = i === ops.length - 1 ? v : ++vars;
        const b = L(ops[i]!);
        clause(-t, acc, b);
        clause(-t, -acc, -b);
        clause(t, -acc, b);
        clause(t, acc, -b);
        acc = t;
      }
    } else throw new Error(`tseitin: node ${n} of kind ${kind} in a cone`);
  }
  clause(L(root));
  return {
    cnf: { variables: vars, lits: Int32Array.from(lits), clauseStart: Uint32Array.from(starts) },
    inputNodes: Int32Array.from(inputNodes),
    inputVars: Int32Array.from(inputVars),
  };
}

/** The size of {@link encodeCone}'s CNF without building it: variables and clauses. */
export function coneSize(g: Graph, root: number): { variables: number; clauses: number } {
  const seen = new Uint8Array(g.size);
  let variables = 0;
  let clauses = 1;
  const stack: number[] = [root >>> 1];
  while (stack.length > 0) {
    const n = stack.pop()!;
    if (seen[n] === 1) continue;
    seen[n] = 1;
    const kind = g.kind(n);
    variables++;
    if (kind === INPUT) continue;
    const ops = operandsFor(g, n);
    if (kind === AND) clauses += ops.length + 1;
    else {
      variables += ops.length - 2;
      clauses += 4 * (ops.length - 1);
    }
    for (let i = 0; i < ops.length; i++) if (seen[ops[i]! >>> 1] === 0) stack.push(ops[i]! >>> 1);
  }
  return { variables, clauses };
}

/** The operands a node is encoded over: an AND's operands, a XOR's derivation (two literals). */
export function operandsFor(g: Graph, n: number): ArrayLike<number> {
  if (g.kind(n) === AND) return g.operands(n);
  return g.derivation(n) ?? g.operands(n);
}
