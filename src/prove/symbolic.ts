/**
 * Symbolic simulation of a circuit over Boolean functions of its inputs (graph.ts), with the
 * phase kept as a polynomial over Z8 (units of pi/4) and Hadamards handled as path sums.
 *
 * Classical gates act on wires: X complements, a (multi-)controlled X XORs the AND of its
 * controls into the target. Diagonal gates add to the phase: Z, CZ and multi-controlled Z add
 * 4 x (the AND of their qubits), S adds 2 x wire, T adds 1 x wire, a global phase its angle.
 * The phase is a sum of (coefficient, monomial) over Z8; a monomial is a node. A wire that holds
 * an XOR is expanded before a phase of coefficient other than 4 is added to it, by
 *   a1 XOR ... XOR ak = sum over non-empty S of (-2)^(|S|-1) prod(S)   (terms with |S| >= 4 vanish mod 8),
 * so that phases of parities (the T layers of the Clifford+T gadgets) cancel term by term.
 *
 * A Hadamard on a wire holding v introduces a path variable y (the state becomes a sum over y of
 * (-1)^(v y) |y> / sqrt 2), the "sum over paths" of Amy 2018 ("Towards large-scale functional
 * verification of universal quantum circuits"). Path variables are summed out by the rule used
 * there: when a Hadamard hits a wire that holds exactly y, y occurs on no other wire, and every
 * phase term containing y is 4 y M_j, then the sum over y of (-1)^(y (M + y')) forces the new
 * path variable y' to equal M = XOR_j M_j: the wire gets M and y disappears (the two factors
 * 1/sqrt 2 and the factor 2 of the sum cancel). Every Clifford+T gadget of the lowering closes
 * this way, also where the optimizer cancelled a Hadamard pair at the seam of two gadgets.
 * Whether y's terms have that shape depends on the atoms they are written over (a XOR b as one
 * atom, or a and b apart); before giving up, the sum-out writes them again over the atoms a
 * merged parity was built from (`regroup`), the same polynomial, and tries once more.
 *
 * Measurements: an H immediately followed by a measurement of the same qubit is an X-basis
 * measurement: the outcome c is a fresh input, the phase gains 4 (v AND c) and the wire holds c;
 * each outcome has probability 1/2 whatever the input. A measurement of a wire holding a path
 * variable fixes it to the outcome. A reset of a wire holding an outcome or a constant clears it.
 * Gidney's measured uncomputation (H, measure, if (c) CZ on the AND's inputs, reset) therefore
 * leaves exactly the phase 4 c (v XOR AND(inputs)), which is zero when the wire held the AND:
 * it is the AND's inverse, as Gidney 2018 shows, and anything else is a mismatch.
 *
 * Temporary ANDs (logical level): `and` must find its target at 0 and `unand` must find it
 * holding the AND; each adds that condition to the obligations.
 */
import { GATE_KINDS, K, PHASE_EIGHTHS } from "../ir/kinds.js";
import type { Circuit } from "../ir/circuit.js";
import { AND, FALSE, Graph, INPUT, OUTCOME, PATH, TARGET, TRUE, VAR, XOR } from "./graph.js";

/** One measurement or reset, in circuit order: the literal of its outcome. */
export interface OutcomeEvent {
  readonly gate: number;
  readonly literal: number;
  /** True for the measurement of an X-basis measurement (H then measure). */
  readonly xBasis: boolean;
}

/** The state after running a circuit symbolically. */
export interface SymbolicState {
  readonly graph: Graph;
  /** Each qubit's final value. */
  readonly wires: Int32Array;
  /** Literals of the search variables x1..xn (positive input literals). */
  readonly vars: Int32Array;
  /** Literal of the target's initial value (flag oracles), else -1. */
  readonly target: number;
  /** The phase: monomial node -> coefficient (1..7, units of pi/4). */
  readonly phase: Map<number, number>;
  /** The constant part of the phase (a global phase), 0..7. */
  readonly phaseConstant: number;
  /** Literals that must be false for every input (temporary-AND preconditions). */
  readonly obligations: number[];
  /** Measurements and resets in order. */
  readonly events: OutcomeEvent[];
}

/** Why a circuit could not be simulated symbolically (gate index and reason). */
export interface Unsupported {
  readonly gate: number;
  readonly reason: string;
}

/** A parity: the constant c XOR the atoms (literals, sorted, no node twice). */
interface Form {
  readonly atoms: readonly number[];
  readonly c: number;
}

/** The form of a single literal. */
function atom(v: number): Form {
  return v <= 1 ? { atoms: [], c: v } : { atoms: [v], c: 0 };
}

/**
 * A form complemented (an X gate): a single atom is complemented itself, so that the atom stays
 * the literal the wire's value is (NOT a rather than 1 XOR a); a parity gets the constant 1.
 */
function flip(f: Form): Form {
  return f.atoms.length === 1 ? { atoms: [f.atoms[0]! ^ 1], c: f.c } : { atoms: f.atoms, c: f.c ^ 1 };
}

/** The XOR of two forms (a literal and its complement cancel to the constant 1). */
function xorForms(a: Form, b: Form): Form {
  const out: number[] = [];
  let c = a.c ^ b.c;
  let i = 0;
  let j = 0;
  const x = a.atoms;
  const y = b.atoms;
  while (i < x.length || j < y.length) {
    const u = i < x.length ? x[i]! : 0x7fffffff;
    const v = j < y.length ? y[j]! : 0x7fffffff;
    let l: number;
    if (u < v) {
        l = u;
        i++;
      }
    else if (v < u) {
        l = v;
        j++;
      }
    else {
      i++;
      j++;
      continue;
    }
    if (out.length > 0 && out[out.length - 1] === (l ^ 1)) {
      out.pop();
      c ^= 1;
    } else out.push(l);
  }
  return { atoms: out, c };
}

/** Largest XOR whose phase of coefficient other than 4 is expanded (cubic in its operands). */
const EXPAND_CAP = 16;
/**
 * Work a reduction may spend: per gate, plus a base (the reductions that succeed on the lean
 * counter at 200 variables and 800 clauses spend some 7 per gate).
 */
const WORK_PER_GATE = 64;
const WORK_BASE = 1_000_000;
/**
 * Graph effort a reduction may spend (Graph.effort: operands read while building ANDs): an open
 * path variable can make every AND huge while adding few phase terms. Common practice: a generous
 * multiple of the circuit size, far above what the reductions that close spend.
 */
const EFFORT_PER_GATE = 1024;
const EFFORT_BASE = 20_000_000;
/** Thrown inside a gate whose expansion passes the effort limit; caught by SymbolicRun.run. */
const EXHAUSTED = new Error("symbolic run: effort limit reached");
/** Largest merged parity `regroup` opens inside a path variable's terms, and most terms it writes. */
const REGROUP_ARITY = 8;
const REGROUP_TERMS = 4096;
/** A merged parity `regroup` does not open (see `collapse`). */
const NOT_OPENED: Form = { atoms: [], c: 0 };

/**
 * How the path-sum reduction writes its terms. Every choice is exact (it only picks the atoms the
 * phase polynomial is written over); they differ in which optimized seams they reduce, so the
 * prover tries them in turn (`REDUCTIONS`).
 */
export interface Reduction {
  /** Merge a qubit's classical form of several atoms into its value (see `collapse`). */
  readonly collapse: boolean;
  /** Largest parity expanded inside a product with a path variable (0: none; see `expand`). */
  readonly productCap: number;
  /** Expand a complemented path-free factor of a product with a path variable (see `expand`). */
  readonly complements: boolean;
}

/** The reductions the prover tries, in order (measured on the lean counter, DEVELOPERS.md). */
export const REDUCTIONS: readonly Reduction[] = [
  { collapse: true, productCap: 0, complements: false },
  { collapse: true, productCap: 2, complements: true },
  { collapse: false, productCap: 2, complements: true },
  { collapse: false, productCap: 0, complements: false }, // the reduction as first written
];

export class SymbolicRun {
  readonly g = new Graph();
  readonly wires: Int32Array;
  readonly vars: Int32Array;
  readonly target: number;
  readonly phase = new Map<number, number>();
  phaseConstant = 0;
  readonly obligations: number[] = [];
  readonly events: OutcomeEvent[] = [];
  private readonly clbits: Int32Array;
  /** Monomials with a path variable that entered the phase (may be stale: check `phase`). */
  private readonly pathTerms = new Set<number>();
  /** Qubits whose value depends on a path variable. */
  private readonly pathWires = new Set<number>();
  /** Path variables not yet summed out or measured. */
  private readonly livePaths = new Set<number>();
  /**
   * While path variables are open: the affine form of each qubit changed since (absent: its
   * value as one atom). Phases on parities are expanded over these atoms, the values the
   * parity was built from, rather than over the graph's flattened operands: a Toffoli on a
   * counter bit q then expands over q itself, and sums out to AND nodes over the wires'
   * values, as the classical circuit has them.
   */
  private readonly forms = new Map<number, Form>();
  /**
   * XOR nodes that `collapse` made atoms of (the parities `expand` and `regroup` open inside
   * products), each with the atoms it was merged from: node = XOR(atoms) XOR c.
   */
  private readonly merged = new Map<number, Form>();
  private paths = 0;
  private outcomes = 0;
  /** Exponent e of the amplitude factor 2^(-e/2) so far, and the number of measurements. */
  halves = 0;
  measurements = 0;
  /** Phase terms added and graph nodes visited so far (the reduction's work, see `run`). */
  work = 0;
  /** True when `run` stopped early, its work out of proportion to the circuit. */
  exhausted = false;
  /** The run's graph-effort limit (see run). */
  private effortCap = Infinity;
  /**
   * The first Hadamard that met a path variable it could not sum out: its gate, and the
   * path-free factors of that variable's phase terms (the values a wrong gadget's phase depends
   * on, where simulation should look first). Null while every such Hadamard closed.
   */
  stuckAt: { readonly gate: number; readonly stray: number; readonly factors: readonly number[] } | null = null;
  /** The gate `run` is at. */
  private at = 0;

  constructor(private readonly c: Circuit, searchSize: number, targetQubit: number, private readonly reduction: Reduction = REDUCTIONS[0]!) {
    this.wires = new Int32Array(c.qubits);
    this.vars = new Int32Array(searchSize);
    for (let v = 0; v < searchSize; v++) this.wires[v] = this.vars[v] = this.g.input(VAR, v);
    this.target = targetQubit >= 0 ? this.g.input(TARGET, 0) : -1;
    if (targetQubit >= 0) this.wires[targetQubit] = this.target;
    this.clbits = new Int32Array(c.clbits); // all FALSE: classical bits start at 0
  }

  /** Runs every gate; returns null, or why a gate could not be simulated. */
  run(): Unsupported | null {
    // The work limits are checked between gates and, through effortCap, inside the expansion of
    // one gate's phase terms: a wrong circuit's open paths can make a single gate run for minutes
    // (a CNOT put twice in a blocks-6 gadget at 60 variables: 100 s in one gate, twice).
    try {
      return this.runGates();
    } catch (e) {
      if (e !== EXHAUSTED) throw e;
      this.exhausted = true;
      return null;
    } finally {
      this.effortCap = Infinity;
    }
  }

  private runGates(): Unsupported | null {
    const c = this.c;
    const kinds = GATE_KINDS;
    const ctl: number[] = [];
    const limit = WORK_PER_GATE * c.gates + WORK_BASE;
    const effortLimit = EFFORT_PER_GATE * c.gates + EFFORT_BASE;
    this.effortCap = effortLimit;
    for (let g = 0; g < c.gates; g++) {
      if (this.work > limit || this.g.effort > effortLimit) {
        // This reduction grows out of proportion here (another may not): stop it.
        this.exhausted = true;
        return null;
      }
      const name = kinds[c.kind[g]!]!;
      this.at = g;
      const s = c.opStart[g]!;
      const e = c.opStart[g + 1]!;
      const cond = c.cond[g]! >= 0 ? this.clbits[c.cond[g]!]! : TRUE;
      const w = this.wires;
      const lit = (op: number): number => w[op >>> 1]! ^ (op & 1);
      const open = this.livePaths.size > 0;
      switch (name) {
        case "x": case "cx": case "ccx": case "mcx": {
          ctl.length = 0;
          for (let p = s; p < e - 1; p++) ctl.push(lit(c.ops[p]!));
          ctl.push(cond);
          const t = c.ops[e - 1]! >>> 1;
          const fire = this.g.and(ctl);
          const v = this.g.xor(w[t]!, fire);
          if (!open) this.setWire(t, v);
          else if (cond === TRUE && e - s <= 2) {
            // Linear (X, CNOT): the target's form is the XOR of the forms.
            const f = this.formOf(t);
            this.setWire(t, v, e - s === 1 ? flip(f) : xorForms(f, this.formOf(c.ops[s]! >>> 1, c.ops[s]! & 1)));
            if (this.g.hasPath(v)) this.rebase(t);
          } else this.setWire(t, v, xorForms(this.formOf(t), atom(fire)));
          break;
        }
        case "z": case "cz": case "mcz": {
          if (open) {
            const factors: Form[] = [];
            for (let p = s; p < e; p++) factors.push(this.formOf(c.ops[p]! >>> 1, c.ops[p]! & 1));
            if (this.phaseOfProduct(factors, cond)) break;
          }
          ctl.length = 0;
          for (let p = s; p < e; p++) ctl.push(lit(c.ops[p]!));
          ctl.push(cond);
          this.addPhase(4, this.g.and(ctl));
          break;
        }
        case "s": case "sdg": case "t": case "tdg": {
          const k = PHASE_EIGHTHS[name]!;
          const q = c.ops[s]! >>> 1;
          if (!open || !this.phaseOfForm(k, this.formOf(q), cond)) this.addPhaseAnd(k, w[q]!, cond);
          break;
        }
        case "y": {
          // Y = i X Z: Y|v> = i (-1)^v |NOT v>.
          const q = c.ops[s]! >>> 1;
          this.addPhase(2, cond);
          if (!open || !this.phaseOfProduct([this.formOf(q)], cond)) this.addPhase(4, this.g.and2(w[q]!, cond));
          const f = this.formOf(q);
          this.setWire(q, this.g.xor(w[q]!, cond), open ? xorForms(f, atom(cond)) : undefined);
          break;
        }
        case "gphase":
          this.addPhase(c.ops[s]!, cond);
          break;
        case "and": case "unand": {
          if (cond !== TRUE) return { gate: g, reason: "a conditioned temporary AND" };
          ctl.length = 0;
          for (let p = s; p < e - 1; p++) ctl.push(lit(c.ops[p]!));
          const t = c.ops[e - 1]! >>> 1;
          const v = this.g.and(ctl);
          const before = w[t]!;
          // and: the target must be 0; unand: it must hold the AND. Either way it ends XORed with it.
          this.obligations.push(name === "and" ? before : this.g.xor(before, v));
          this.setWire(t, this.g.xor(before, v), open ? xorForms(this.formOf(t), atom(v)) : undefined);
          break;
        }
        case "h": {
          if (cond !== TRUE) return { gate: g, reason: "a conditioned Hadamard" };
          const q = c.ops[s]! >>> 1;
          if (g + 1 < c.gates && c.kind[g + 1] === K.measure && c.ops[c.opStart[g + 1]!]! >>> 1 === q && c.cond[g + 1]! < 0) {
            this.xMeasure(g + 1, q, c.ops[c.opStart[g + 1]! + 1]!);
            g++;
          } else this.hadamard(q);
          break;
        }
        case "measure": {
          if (cond !== TRUE) return { gate: g, reason: "a conditioned measurement" };
          const q = c.ops[s]! >>> 1;
          const out = this.settle(g, q);
          if (out === null) return { gate: g, reason: `a measurement of qubit ${q}, whose value depends on the input` };
          this.clbits[c.ops[s + 1]!] = out;
          this.setWire(q, out);
          break;
        }
        case "reset": {
          if (cond !== TRUE) return { gate: g, reason: "a conditioned reset" };
          const q = c.ops[s]! >>> 1;
          if (this.settle(g, q) === null) return { gate: g, reason: `a reset of qubit ${q}, whose value depends on the input` };
          this.setWire(q, FALSE);
          break;
        }
        default: {
          const never: never = name;
          return { gate: g, reason: `unknown gate ${String(never)}` };
        }
      }
    }
    return null;
  }

  /** Path variables still present (not summed out or measured). */
  openPaths(): boolean {
    if (this.pathWires.size > 0) return true;
    for (const m of this.pathTerms) if (this.phase.has(m)) return true;
    return false;
  }

  state(): SymbolicState {
    return {
      graph: this.g, wires: this.wires, vars: this.vars, target: this.target, phase: this.phase,
      phaseConstant: this.phaseConstant & 7, obligations: this.obligations, events: this.events,
    };
  }

  // ---- wires and phases ----------------------------------------------------------------------

  /**
   * Sets qubit q's value; while path variables are open, also its affine form (default: the
   * value itself as one atom).
   */
  private setWire(q: number, v: number, form?: Form): void {
    this.wires[q] = v;
    if (this.g.hasPath(v)) this.pathWires.add(q);
    else if (this.pathWires.size > 0) this.pathWires.delete(q);
    if (this.livePaths.size > 0) this.forms.set(q, form === undefined ? atom(v) : this.reduction.collapse ? this.collapse(form) : form);
    else if (this.forms.size > 0) this.forms.clear();
  }

  /**
   * The form with its path-free atoms merged into one atom, their XOR in the graph (hashed, so
   * the same function built the same way is the same node). Any grouping of the atoms is exact
   * (the expansions hold for Boolean atoms); this one makes a qubit's classical part its
   * classical value, as the unoptimized gadget sees it: where the optimizer cancelled a CNOT
   * pair or a H H pair at the seam of two gadgets, the wire's form otherwise keeps the atoms of
   * the earlier gadget, the products over them come out as XORs of ANDs instead of the AND of
   * the values, and the +-2 phase terms that should cancel across the seam land on different
   * nodes.
   */
  private collapse(f: Form): Form {
    const g = this.g;
    let classical = 0;
    for (const a of f.atoms) if (!g.hasPath(a)) classical++;
    if (classical < 2 || classical < f.atoms.length) return f;
    let v = FALSE;
    const paths: number[] = [];
    for (const a of f.atoms) {
      if (g.hasPath(a)) paths.push(a);
      else v = g.xor(v, a);
    }
    // The first merge of a node from older atoms is kept: then no atom was merged from the node
    // itself (regroup opens one level, and the levels never loop).
    const n = v >>> 1;
    if (v > 1 && g.kind(n) === XOR && !this.merged.has(n)) this.merged.set(n, f.atoms.every((a) => a >>> 1 < n) ? { atoms: f.atoms, c: v & 1 } : NOT_OPENED);
    return xorForms({ atoms: paths, c: f.c }, atom(v));
  }

  /** Qubit q's affine form (complemented when `negated` is 1). */
  private formOf(q: number, negated = 0): Form {
    const f = this.forms.get(q) ?? atom(this.wires[q]!);
    return negated === 0 ? f : flip(f);
  }

  /**
   * Adds k x cond x (the parity of form f), expanded over the form's atoms. False (nothing
   * added) when the form has too many atoms to expand.
   */
  private phaseOfForm(k: number, f: Form, cond: number): boolean {
    const n = f.atoms.length;
    if (n > EXPAND_CAP) return false;
    k &= 7;
    if (f.c === 1) {
      // k (1 XOR p) = k - k p
      this.addPhase(k, cond);
      k = (8 - k) & 7;
    }
    const g = this.g;
    const a = f.atoms;
    for (let i = 0; i < n; i++) {
      this.addPhase(k, g.and2(a[i]!, cond));
      for (let j = i + 1; j < n; j++) {
        const ij = g.and2(a[i]!, a[j]!);
        this.addPhase((k * 6) & 7, g.and2(ij, cond)); // -2k
        if (k & 1) for (let l = j + 1; l < n; l++) this.addPhase(4, g.and([ij, a[l]!, cond])); // 4k = 4 for odd k
      }
    }
    return true;
  }

  /**
   * Adds 4 x cond x (the product of the parities of the forms): over GF(2), the XOR of the
   * products of one atom (or the constant) from each form. False (nothing added) when that has
   * too many terms.
   */
  private phaseOfProduct(forms: readonly Form[], cond: number): boolean {
    const g = this.g;
    let terms = new Set<number>([TRUE]);
    for (const f of forms) {
      const next = new Set<number>();
      const toggle = (m: number): void => {
        if (m === FALSE) return;
        if (next.has(m)) next.delete(m);
        else next.add(m);
      };
      for (const t of terms) {
        if (f.c === 1) toggle(t);
        for (const a of f.atoms) toggle(g.and2(t, a));
      }
      terms = next;
      if (terms.size > 256) return false;
    }
    for (const t of terms) this.addPhase(4, g.and2(t, cond));
    return true;
  }

  /** Adds k x (v AND cond) to the phase. */
  private addPhaseAnd(k: number, v: number, cond: number): void {
    if (cond === TRUE) this.addPhase(k, v);
    else if (cond !== FALSE) {
      // cond AND (a1 XOR ... XOR ak): expand the parity first, then multiply every term by cond.
      const terms = new Map<number, number>();
      let constant = 0;
      this.expand(k, v, (kk, m) => {
        if (m === TRUE) constant += kk;
        else terms.set(m, ((terms.get(m) ?? 0) + kk) & 7);
      });
      this.addPhase(constant, cond);
      for (const [m, kk] of terms) this.addPhase(kk, this.g.and2(m, cond));
    }
  }

  /** Adds k x lit (lit a Boolean function, k in units of pi/4) to the phase polynomial. */
  addPhase(k: number, lit: number): void {
    this.expand(k, lit, (kk, m) => {
      if (m === TRUE) this.phaseConstant = (this.phaseConstant + kk) & 7;
      else this.addTerm(kk, m >>> 1);
    });
  }

  /**
   * Calls `emit(k', m)` with terms whose sum is k x lit, each m TRUE or an uncomplemented
   * monomial literal: complements become 1 - v, parities are expanded, a complemented path
   * variable inside an AND is expanded too (NOT y AND M = M - y AND M), so that path variables
   * only ever occur uncomplemented in monomials.
   */
  private expand(k: number, lit: number, emit: (k: number, m: number) => void): void {
    if (this.g.effort > this.effortCap) throw EXHAUSTED;
    k &= 7;
    if (k === 0 || lit === FALSE) return;
    if (lit === TRUE) return emit(k, TRUE);
    const g = this.g;
    if ((lit & 1) === 1) {
      emit(k, TRUE);
      k = (8 - k) & 7;
      lit ^= 1;
    }
    const node = lit >>> 1;
    const kind = g.kind(node);
    if (kind === XOR) {
      const ops = Array.from(g.operands(node));
      if (k === 4) {
        for (const o of ops) this.expand(4, o, emit);
        return;
      }
      if (ops.length <= EXPAND_CAP) {
        const n = ops.length;
        for (let i = 0; i < n; i++) {
          this.expand(k, ops[i]!, emit);
          for (let j = i + 1; j < n; j++) {
            this.expand((k * 6) & 7, g.and2(ops[i]!, ops[j]!), emit); // -2k
            if (k & 1) for (let l = j + 1; l < n; l++) this.expand(4, g.and([ops[i]!, ops[j]!, ops[l]!]), emit); // 4k = 4 for odd k
          }
        }
        return;
      }
    } else if (kind === AND && g.hasPath(lit)) {
      const ops = g.operands(node);
      for (let i = 0; i < ops.length; i++) {
        const o = ops[i]!;
        if ((o & 1) === 1 && g.kind(o >>> 1) === INPUT && g.role(o >>> 1) === PATH) {
          const rest = Array.from(ops).filter((_, j) => j !== i);
          const m = g.and(rest);
          this.expand(k, m, emit);
          this.expand((8 - k) & 7, g.and2(m, o ^ 1), emit);
          return;
        }
      }
      if ((k & 3) !== 0) {
        // A parity inside a product with a path variable, at a coefficient other than 4: expanded
        // as at the top level (rest AND (a1 XOR ... XOR an) = sum over non-empty S of
        // (-2)^(|S|-1) rest prod(S)), so that the terms of a path variable are written over the
        // same atoms however the parity was grouped (a XOR b as one value in a 7-T Toffoli, or
        // a and b apart) and cancel term by term before it is summed out.
        if (this.reduction.complements) {
          for (let i = 0; i < ops.length; i++) {
            const o = ops[i]!;
            if ((o & 1) === 0 || g.hasPath(o) || (this.reduction.collapse && !this.merged.has(o >>> 1))) continue;
            // rest AND NOT p = rest - rest AND p (p path-free)
            const rest = g.and(Array.from(ops).filter((_, j) => j !== i));
            this.expand(k, rest, emit);
            this.expand((8 - k) & 7, g.and2(rest, o ^ 1), emit);
            return;
          }
        }
        for (let i = 0; i < ops.length; i++) {
          const o = ops[i]!;
          if (g.kind(o >>> 1) !== XOR || g.arity(o >>> 1) > this.reduction.productCap || (this.reduction.collapse && !this.merged.has(o >>> 1))) continue;
          const rest = g.and(Array.from(ops).filter((_, j) => j !== i));
          if ((o & 1) === 1) {
            // rest AND NOT p = rest - rest AND p
            this.expand(k, rest, emit);
            this.expand((8 - k) & 7, g.and2(rest, o ^ 1), emit);
            return;
          }
          const xs = Array.from(g.operands(o >>> 1));
          const n = xs.length;
          for (let a = 0; a < n; a++) {
            this.expand(k, g.and2(rest, xs[a]!), emit);
            for (let b = a + 1; b < n; b++) {
              const ab = g.and([rest, xs[a]!, xs[b]!]);
              this.expand((k * 6) & 7, ab, emit); // -2k
              if (k & 1) for (let c = b + 1; c < n; c++) this.expand(4, g.and2(ab, xs[c]!), emit); // 4k = 4 for odd k
            }
          }
          return;
        }
      }
    }
    emit(k, lit);
  }

  private addTerm(k: number, node: number): void {
    this.work++;
    const v = ((this.phase.get(node) ?? 0) + k) & 7;
    if (v === 0) this.phase.delete(node);
    else {
      if (this.g.hasPath(node << 1)) this.pathTerms.add(node);
      this.phase.set(node, v);
    }
  }

  // ---- Hadamards, path variables, measurements -----------------------------------------------

  private hadamard(q: number): void {
    const g = this.g;
    const v = this.wires[q]!;
    this.halves++;
    const y = v >>> 1;
    if (v > 1 && g.kind(y) === INPUT && g.role(y) === PATH) {
      const m = this.sumOut(q, y);
      if (m !== null) {
        this.halves -= 2;
        this.livePaths.delete(y);
        this.setWire(q, m);
        if (v & 1) this.addPhase(4, m); // (-1)^((1 + y) y') = (-1)^y' (-1)^(y y')
        return;
      }
      if (this.stuckAt === null) this.stuckAt = { gate: this.at, ...this.strayOf(y) };
    }
    const fresh = g.input(PATH, this.paths++);
    const form = this.formOf(q);
    this.livePaths.add(fresh >>> 1);
    if (!this.phaseOfProduct([form, atom(fresh)], TRUE)) this.addPhase(4, g.and2(v, fresh));
    this.setWire(q, fresh);
  }

  /**
   * What keeps y from summing out: `stray`, true where y's phase terms of coefficient other
   * than 0 mod 4 (k y R_j, R_j free of path variables) add up to other than 0 mod 4 (there the
   * sum over y does not reduce to a condition on y's partner: the amplitude is wrong); and the
   * distinct path-free operands of all of y's terms (at most 8).
   */
  private strayOf(y: number): { stray: number; factors: number[] } {
    const g = this.g;
    const factors: number[] = [];
    let s0 = FALSE;
    let s1 = FALSE;
    for (const m of this.pathTerms) {
      const k = this.phase.get(m);
      if (k === undefined || !this.contains(m << 1, y)) continue;
      let rest = TRUE;
      if (m !== y) {
        if (g.kind(m) !== AND) continue;
        const ops = Array.from(g.operands(m)).filter((o) => o !== y << 1);
        for (const o of ops) if (o > 1 && !g.hasPath(o) && !factors.includes(o) && factors.length < 8) factors.push(o);
        if (ops.some((o) => g.hasPath(o))) continue;
        rest = g.and(ops);
      }
      // Two-bit sum mod 4 of (k mod 4) x rest.
      const a0 = k & 1 ? rest : FALSE;
      const a1 = k & 2 ? rest : FALSE;
      const c0 = g.and2(s0, a0);
      s0 = g.xor(s0, a0);
      s1 = g.xor(g.xor(s1, a1), c0);
    }
    return { stray: g.or([s0, s1]), factors };
  }

  /**
   * If path variable y (held by qubit q) occurs on no other wire and only in phase terms 4 y M_j
   * (and, when `linear` is given, k y with any k on the monomial y itself), removes those terms
   * and returns XOR_j M_j, setting linear.k to k mod 4 after taking 4 y (if k >= 4) as M = 1.
   * When y's terms are not of that shape as written (and no `linear`), they are written again
   * with collapse's merged parities opened (`regroup`, exact) and tried once more. Else null,
   * and nothing changed.
   */
  private sumOut(q: number, y: number, linear?: { k: number }): number | null {
    for (const w of this.pathWires) if (w !== q && this.contains(this.wires[w]!, y)) return null;
    for (const m of this.pathTerms) if (!this.phase.has(m)) this.pathTerms.delete(m);
    const terms = new Map<number, number>();
    for (const m of this.pathTerms) if (this.contains(m << 1, y)) terms.set(m, this.phase.get(m)!);
    let r = this.gather(y, terms);
    if (r === null && linear === undefined) {
      const again = this.regroup(y, terms);
      if (again !== null) r = this.gather(y, again);
    }
    if (r === null || (linear === undefined && r.k !== 0)) return null;
    // Every term of y is summed out, however it was written: the old ones go.
    for (const m of terms.keys()) this.phase.delete(m);
    if (linear !== undefined) linear.k = r.k;
    return r.sum;
  }

  /**
   * y's terms (monomial node -> coefficient) as 4 y M_j and k y: XOR_j M_j (with 4 y counted
   * as M = 1) and k mod 4. Null when some term is not of that shape.
   */
  private gather(y: number, terms: ReadonlyMap<number, number>): { sum: number; k: number } | null {
    const g = this.g;
    const yl = y << 1;
    let sum = FALSE;
    let lk = 0;
    for (const [m, k] of terms) {
      let rest: number;
      if (m === y) {
        rest = TRUE;
        lk = k & 3;
        if ((k & 4) === 0) continue;
      } else if (g.kind(m) === AND) {
        const ops = Array.from(g.operands(m));
        const at = ops.indexOf(yl);
        if (at < 0) return null;
        ops.splice(at, 1);
        rest = g.and(ops);
        if (this.contains(rest, y)) return null;
        if (k !== 4) return null;
      } else return null;
      sum = g.xor(sum, rest);
    }
    return { sum, k: lk };
  }

  /**
   * y's terms written again with `collapse`'s merged parities opened: each factor P that collapse
   * merged from atoms a1..an (P = a1 XOR ... XOR an, n at most REGROUP_ARITY) is expanded,
   *   rest AND (a1 XOR ... XOR an) = sum over non-empty S of (-2)^(|S|-1) rest prod(S)
   * (rest AND NOT P = rest - rest AND P first): the same polynomial over other atoms. Only the
   * top merged parities are opened, those no other merged factor of y's terms was built from, so
   * that an atom stays one atom in every term. This is the flag oracle's marking Toffoli: the
   * target's path variable meets the control a twice, once as a and once inside b XOR a, the
   * parity the gadget's CNOT left on the other control (b a counter bit or an AND of them), and
   * its +-2 terms cancel only over a and b apart. Null when there is nothing to open or the terms
   * grow past REGROUP_TERMS.
   */
  private regroup(y: number, terms: ReadonlyMap<number, number>): Map<number, number> | null {
    const g = this.g;
    const seen = new Set<number>();
    for (const m of terms.keys()) if (m !== y && g.kind(m) === AND) for (const o of g.operands(m)) seen.add(o);
    // An atom is in sight when it is a factor of y's terms, or an AND all of whose operands are.
    const inSight = (a: number): boolean => seen.has(a) || ((a & 1) === 0 && g.kind(a >>> 1) === AND && g.operands(a >>> 1).every((o) => seen.has(o)));
    const factors = new Set<number>();
    for (const o of seen) {
      const f = this.merged.get(o >>> 1);
      if (f !== undefined && f !== NOT_OPENED && f.atoms.length <= REGROUP_ARITY && !g.hasPath(o) && f.atoms.some(inSight)) factors.add(o >>> 1);
    }
    const inner = new Set<number>();
    for (const n of factors) for (const a of this.merged.get(n)!.atoms) inner.add(a >>> 1);
    const top = new Set<number>();
    for (const n of factors) if (!inner.has(n)) top.add(n);
    if (top.size === 0) return null;
    const out = new Map<number, number>();
    let overflow = false;
    const split = (k: number, ops: number[]): void => {
      k &= 7;
      if (k === 0 || overflow) return;
      for (let i = 0; i < ops.length; i++) {
        const o = ops[i]!;
        if (!top.has(o >>> 1)) continue;
        const from = this.merged.get(o >>> 1)!;
        const rest = ops.filter((_, j) => j !== i);
        if ((from.c ^ (o & 1)) === 1) {
          // k rest (1 XOR P) = k rest - k rest P
          split(k, rest);
          k = 8 - k;
        }
        const xs = from.atoms;
        const n = xs.length;
        for (let a = 0; a < n; a++) {
          split(k, [...rest, xs[a]!]);
          for (let b = a + 1; b < n; b++) {
            split(k * 6, [...rest, xs[a]!, xs[b]!]); // -2k
            if (k & 1) for (let c = b + 1; c < n; c++) split(4, [...rest, xs[a]!, xs[b]!, xs[c]!]); // 4k = 4 for odd k
          }
        }
        return;
      }
      const lit = g.and(ops);
      if (lit === FALSE) return;
      // y is an uncomplemented operand: the product is y or an uncomplemented AND.
      const m = lit >>> 1;
      const v = ((out.get(m) ?? 0) + k) & 7;
      if (v === 0) out.delete(m);
      else out.set(m, v);
      if (out.size > REGROUP_TERMS) overflow = true;
    };
    for (const [m, k] of terms) split(k, m === y || g.kind(m) !== AND ? [m << 1] : Array.from(g.operands(m)));
    return overflow ? null : out;
  }

  /**
   * Where the optimizer cancelled the H H (and T Tdg, and CNOT) pairs at the seam of two gadgets
   * on one wire, the first gadget's path variable runs on into the second, and its phase terms
   * mix with the second's over different atoms. When qubit q holds y XOR R, R path-free, and y
   * occurs elsewhere only in phase terms 4 y M_j and k y, the path sum is rewritten by renaming
   * y to a fresh y' with the terms 4 y M_j gathered into one, 4 y' (XOR_j M_j) (4a + 4b = 4 (a
   * XOR b) mod 8), and k y kept as k y': the same sum term for term, so exact whatever R is (it
   * is the identity U T^-j H H T^j U^-1, U: q ^= R, inserted at the seam, in the terms of Amy
   * 2018's reduction rules). The wire's form then starts afresh from y' XOR R. Nothing happens
   * unless y can be gathered so.
   */
  private rebase(q: number): void {
    const g = this.g;
    const f = this.forms.get(q);
    if (f === undefined) return;
    let y = -1;
    const rest: number[] = [];
    for (const a of f.atoms) {
      if (!g.hasPath(a)) rest.push(a);
      else if (y >= 0 || (a & 1) !== 0 || g.kind(a >>> 1) !== INPUT || g.role(a >>> 1) !== PATH) return;
      else y = a >>> 1;
    }
    if (y < 0) return;
    const linear = { k: 0 };
    const m = this.sumOut(q, y, linear);
    if (m === null) return;
    this.livePaths.delete(y);
    const fresh = g.input(PATH, this.paths++);
    this.livePaths.add(fresh >>> 1);
    if (!this.phaseOfProduct([atom(m), atom(fresh)], TRUE)) this.addPhase(4, g.and2(m, fresh));
    this.addPhase(linear.k, fresh);
    const form = xorForms(atom(fresh), { atoms: rest, c: f.c });
    let v = form.c === 1 ? TRUE : FALSE;
    for (const a of form.atoms) v = g.xor(v, a);
    this.setWire(q, v, form);
  }

  /** True when literal `lit` depends on path variable node y. */
  private contains(lit: number, y: number): boolean {
    const g = this.g;
    if (!g.hasPath(lit)) return false;
    const stack = [lit >>> 1];
    const seen = new Set<number>();
    while (stack.length > 0) {
      const n = stack.pop()!;
      this.work++;
      if (n === y) return true;
      if (seen.has(n) || g.kind(n) === INPUT) continue;
      seen.add(n);
      for (const o of g.operands(n)) if (g.hasPath(o)) stack.push(o >>> 1);
    }
    return false;
  }

  /** H then measurement of qubit q into classical bit `bit` (gate `g` is the measurement). */
  private xMeasure(g: number, q: number, bit: number): void {
    const c = this.g.input(OUTCOME, this.outcomes++);
    this.halves++;
    this.measurements++;
    this.addPhase(4, this.g.and2(this.wires[q]!, c));
    this.events.push({ gate: g, literal: c, xBasis: true });
    this.clbits[bit] = c;
    this.setWire(q, c);
  }

  /**
   * The outcome of measuring qubit q (a measurement or a reset) as a literal: a constant or an
   * outcome stays; a path variable becomes a fresh outcome; anything else (a value that depends
   * on the input: measuring it would collapse a superposition of inputs) gives null.
   */
  private settle(gate: number, q: number): number | null {
    const g = this.g;
    const v = this.wires[q]!;
    const node = v >>> 1;
    if (v <= 1 || (g.kind(node) === INPUT && g.role(node) === OUTCOME)) {
      this.events.push({ gate, literal: v, xBasis: false });
      return v;
    }
    if (g.kind(node) === INPUT && g.role(node) === PATH) {
      const c = g.input(OUTCOME, this.outcomes++);
      this.measurements++;
      this.livePaths.delete(node);
      this.substitute(node, c ^ (v & 1));
      this.events.push({ gate, literal: c, xBasis: false });
      return c;
    }
    return null;
  }

  /** Replaces path variable y by literal `by` on every wire and in every phase term. */
  private substitute(y: number, by: number): void {
    const g = this.g;
    const memo = new Map<number, number>();
    const rebuild = (lit: number): number => {
      const n = lit >>> 1;
      if (!g.hasPath(lit)) return lit;
      let r = memo.get(n);
      if (r === undefined) {
        const kind = g.kind(n);
        if (kind === INPUT) r = n === y ? by : n << 1;
        else {
          const ops = Array.from(g.operands(n), rebuild);
          r = kind === AND ? g.and(ops) : g.xorAll(ops);
        }
        memo.set(n, r);
      }
      return r ^ (lit & 1);
    };
    for (const q of [...this.pathWires]) this.setWire(q, rebuild(this.wires[q]!));
    const terms = [...this.pathTerms].filter((m) => this.phase.has(m));
    this.pathTerms.clear();
    for (const m of terms) {
      const k = this.phase.get(m)!;
      if (!this.contains(m << 1, y)) {
        this.pathTerms.add(m);
        continue;
      }
      this.phase.delete(m);
      this.addPhase(k, rebuild(m << 1));
    }
  }
}

export { FALSE, TRUE };
