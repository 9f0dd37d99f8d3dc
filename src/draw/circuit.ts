/**
 * Circuit diagrams as SVG, in the usual notation of the trade: one wire per qubit with its
 * register label, a filled dot for a control on |1>, an open dot for a control on |0>, a circled
 * plus for an X target, boxes for single-qubit gates, a meter for a measurement, and a double
 * line for the classical outcome bits. Gates are placed in columns as early as their wires allow.
 */
import { GATE_KINDS } from "../ir/kinds.js";
import { negated, operands, qubitOf, type Circuit } from "../ir/circuit.js";
import { el, svgDocument } from "./svg.js";

/** Largest circuit worth drawing. */
export const DRAW_LIMITS: {
  /** Most gates drawn. */
  readonly gates: number;
  /** Most qubits drawn. */
  readonly qubits: number;
} = { gates: 400, qubits: 48 };

const COL = 42;
const ROW = 34;
const LEFT = 78;
const TOP = 40;

const STYLE = [
  ".paper{fill:#fbfaf6}",
  ".wire{stroke:#6b6b6b;stroke-width:1.2}",
  ".cwire{stroke:#6b6b6b;stroke-width:1}",
  ".link{stroke:#1f3f68;stroke-width:1.6}",
  ".clink{stroke:#1f3f68;stroke-width:1;stroke-dasharray:3 2}",
  ".ctrl-on{fill:#1f3f68}",
  ".ctrl-off{fill:#fbfaf6;stroke:#1f3f68;stroke-width:1.6}",
  ".target{fill:#fbfaf6;stroke:#1f3f68;stroke-width:1.6}",
  ".box{fill:#efe7d3;stroke:#1f3f68;stroke-width:1.4}",
  ".meter{fill:#e3ecf5;stroke:#1f3f68;stroke-width:1.4}",
  ".arc{fill:none;stroke:#1f3f68;stroke-width:1.3}",
  "text{font-family:'DejaVu Sans Mono',monospace;fill:#1b1b1b}",
  ".label{font-size:12px}",
  ".gate{font-size:12px;text-anchor:middle;dominant-baseline:central}",
  ".note{font-size:9px;text-anchor:middle;fill:#555}",
  ".title{font-size:12px;fill:#444}",
].join("");

const BOX_LABEL: Record<string, string> = { y: "Y", z: "Z", h: "H", s: "S", sdg: "S†", t: "T", tdg: "T†" };

/** Why a circuit is too large to draw, or null. */
export function drawProblem(c: Circuit): string | null {
  if (c.gates > DRAW_LIMITS.gates || c.qubits > DRAW_LIMITS.qubits) {
    return `the circuit has ${c.qubits} qubit${c.qubits === 1 ? "" : "s"} and ${c.gates} gate${c.gates === 1 ? "" : "s"}; diagrams stay readable up to ${DRAW_LIMITS.qubits} qubits and ${DRAW_LIMITS.gates} gates`;
  }
  return null;
}

/**
 * Draws a circuit as an SVG document.
 *
 * @example
 * ```ts
 * const svg = drawCircuitSvg(compileOracle(cnf, { basis: "mcx" }).circuit, "allotment-pair");
 * ```
 */
export function drawCircuitSvg(c: Circuit, title: string): string {
  const problem = drawProblem(c);
  if (problem !== null) throw new Error(problem);
  const hasClassical = c.clbits > 0;
  const cY = TOP + c.qubits * ROW + 8; // the classical wire
  const y = (q: number): number => TOP + q * ROW + ROW / 2;
  const next = new Int32Array(c.qubits + 1); // next free column per wire (index qubits = classical)
  const shapes: string[] = [];
  let columns = 0;
  for (let g = 0; g < c.gates; g++) {
    const kind = GATE_KINDS[c.kind[g]!]!;
    const ops = operands(c, g);
    const qs = kind === "gphase" ? [] : Array.from(kind === "measure" ? ops.subarray(0, 1) : ops, qubitOf);
    const lo = qs.length ? Math.min(...qs) : 0;
    const hi = qs.length ? Math.max(...qs) : 0;
    const classical = kind === "measure" || c.cond[g]! >= 0;
    const top = lo;
    const bottom = classical ? c.qubits : hi;
    let col = 0;
    for (let q = top; q <= bottom; q++) col = Math.max(col, next[q]!);
    for (let q = top; q <= bottom; q++) next[q] = col + 1;
    columns = Math.max(columns, col + 1);
    shapes.push(...gateShapes(c, g, kind, ops, LEFT + col * COL + COL / 2, y, cY));
  }
  const width = LEFT + Math.max(1, columns) * COL + 24;
  const height = (hasClassical ? cY + 22 : TOP + c.qubits * ROW) + 12;
  const wires: string[] = [];
  const name = (q: number): string => {
    const r = c.registers.find((x) => q >= x.start && q < x.start + x.size)!;
    return `${r.name}[${q - r.start}]`;
  };
  for (let q = 0; q < c.qubits; q++) {
    wires.push(el("line", { x1: LEFT - 8, y1: y(q), x2: width - 12, y2: y(q), class: "wire" }));
    wires.push(el("text", { x: 8, y: y(q) + 4, class: "label" }, name(q)));
  }
  if (hasClassical) {
    for (const dy of [-1.5, 1.5]) wires.push(el("line", { x1: LEFT - 8, y1: cY + dy, x2: width - 12, y2: cY + dy, class: "cwire" }));
    wires.push(el("text", { x: 8, y: cY + 4, class: "label" }, `outcome/${c.clbits}`));
  }
  const header = el("text", { x: 8, y: 20, class: "title" }, title);
  return svgDocument(width, height, title, STYLE, [header, ...wires, ...shapes]);
}

function gateShapes(c: Circuit, g: number, kind: string, ops: Int32Array, x: number, y: (q: number) => number, cY: number): string[] {
  const out: string[] = [];
  const cond = c.cond[g]!;
  const dot = (op: number): string => el("circle", { cx: x, cy: y(qubitOf(op)), r: negated(op) ? 4.5 : 4.5, class: negated(op) ? "ctrl-off" : "ctrl-on" });
  const plus = (q: number): string[] => [
    el("circle", { cx: x, cy: y(q), r: 10, class: "target" }),
    el("line", { x1: x - 10, y1: y(q), x2: x + 10, y2: y(q), class: "link" }),
    el("line", { x1: x, y1: y(q) - 10, x2: x, y2: y(q) + 10, class: "link" }),
  ];
  const box = (q: number, label: string): string[] => [
    el("rect", { x: x - 13, y: y(q) - 12, width: 26, height: 24, rx: 3, class: "box" }),
    el("text", { x, y: y(q), class: "gate" }, label),
  ];
  const link = (qs: number[]): void => {
    if (qs.length > 1) out.push(el("line", { x1: x, y1: y(Math.min(...qs)), x2: x, y2: y(Math.max(...qs)), class: "link" }));
  };
  const qs = Array.from(ops, qubitOf);
  if (cond >= 0) {
    const q = Math.max(...(kind === "gphase" ? [0] : qs));
    out.push(el("line", { x1: x, y1: y(q), x2: x, y2: cY, class: "clink" }));
    out.push(el("circle", { cx: x, cy: cY, r: 3.5, class: "ctrl-on" }));
    out.push(el("text", { x, y: cY + 14, class: "note" }, `if ${cond}`));
  }
  switch (kind) {
    case "x":
      out.push(...plus(qs[0]!));
      break;
    case "cx": case "ccx": case "mcx": case "and": case "unand": {
      link(qs);
      for (const op of Array.from(ops).slice(0, -1)) out.push(kind === "cx" || kind === "ccx" ? el("circle", { cx: x, cy: y(qubitOf(op)), r: 4.5, class: "ctrl-on" }) : dot(op));
      out.push(...plus(qs[qs.length - 1]!));
      if (kind === "and" || kind === "unand") out.push(el("text", { x, y: y(qs[qs.length - 1]!) - 15, class: "note" }, kind === "and" ? "and" : "and†"));
      break;
    }
    case "cz":
      link(qs);
      for (const q of qs) out.push(el("circle", { cx: x, cy: y(q), r: 4.5, class: "ctrl-on" }));
      break;
    case "mcz":
      link(qs);
      for (const op of ops) out.push(dot(op));
      if (qs.length === 1) out.push(el("text", { x, y: y(qs[0]!) - 12, class: "note" }, "Z"));
      break;
    case "measure": {
      const q = qs[0]!;
      out.push(el("rect", { x: x - 13, y: y(q) - 12, width: 26, height: 24, rx: 3, class: "meter" }));
      out.push(el("path", { d: `M ${x - 8} ${y(q) + 5} A 8 8 0 0 1 ${x + 8} ${y(q) + 5}`, class: "arc" }));
      out.push(el("line", { x1: x, y1: y(q) + 5, x2: x + 6, y2: y(q) - 7, class: "link" }));
      out.push(el("line", { x1: x, y1: y(q) + 12, x2: x, y2: cY, class: "clink" }));
      out.push(el("text", { x: x + 8, y: cY - 5, class: "note" }, String(ops[1])));
      break;
    }
    case "reset":
      out.push(...box(qs[0]!, "|0⟩"));
      break;
    case "gphase":
      out.push(el("text", { x, y: TOP - 6, class: "note" }, `phase ${["0", "π/4", "π/2", "3π/4", "π", "5π/4", "3π/2", "7π/4"][ops[0]! % 8]}`));
      break;
    default:
      out.push(...box(qs[0]!, BOX_LABEL[kind] ?? kind));
  }
  return out;
}
