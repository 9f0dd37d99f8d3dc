/**
 * The cost front as an SVG plot: T-count (upper panel) and T-depth (lower panel) against qubits,
 * all three on log scales; every counted construction a faint dot, the non-dominated ones joined,
 * and the reference constructions (wide, lean, textbook) marked and labelled. Plain numbers in.
 */
import { el, svgDocument } from "./svg.js";

/** A plotted construction. */
export interface FrontPlotPoint {
  /** Qubits (x). */
  readonly qubits: number;
  /** T gates (upper panel's y). */
  readonly t_count: number;
  /** T-depth (lower panel's y). */
  readonly t_depth: number;
}

/** Everything the plot shows. */
export interface FrontPlotInput {
  /** Title line. */
  readonly title: string;
  /** The non-dominated points. */
  readonly points: readonly FrontPlotPoint[];
  /** Every construction counted (faint). */
  readonly candidates: readonly FrontPlotPoint[];
  /** Marked and labelled constructions. */
  readonly references: readonly (FrontPlotPoint & { readonly label: string })[];
}

const STYLE = [
  ".paper{fill:#fbfaf6}",
  ".axis{stroke:#333;stroke-width:1.2}",
  ".grid{stroke:#d9d4c7;stroke-width:0.8}",
  ".cand{fill:#b9b2a0}",
  ".front{fill:none;stroke:#1f3f68;stroke-width:1.4}",
  ".front-point{fill:#1f3f68}",
  ".ref{fill:none;stroke:#b5542b;stroke-width:1.6}",
  ".ref-label{fill:#b5542b;font-size:11px}",
  "text{font-family:'DejaVu Sans',sans-serif;fill:#1b1b1b;font-size:11px}",
  ".tick{text-anchor:middle}",
  ".ytick{text-anchor:end}",
  ".title{font-size:13px}",
].join("");

/** Log-scale ticks at 1, 2 and 5 times powers of ten within [lo, hi]. */
function ticks(lo: number, hi: number): number[] {
  const out: number[] = [];
  for (let e = Math.floor(Math.log10(lo)); e <= Math.ceil(Math.log10(hi)); e++) {
    for (const m of [1, 2, 5]) {
      const v = m * 10 ** e;
      if (v >= lo && v <= hi) out.push(v);
    }
  }
  return out;
}

/** A range padded by a tenth of a decade each side (a single value gets a decade around it). */
function range(values: readonly number[]): [number, number] {
  const ok = values.filter((v) => v > 0 && Number.isFinite(v));
  if (ok.length === 0) return [1, 10];
  let lo = Math.log10(Math.min(...ok));
  let hi = Math.log10(Math.max(...ok));
  if (hi - lo < 0.5) {
    const mid = (lo + hi) / 2;
    lo = mid - 0.5;
    hi = mid + 0.5;
  }
  return [10 ** (lo - 0.1), 10 ** (hi + 0.1)];
}

const label = (v: number): string => (v >= 1e6 ? `${v / 1e6}M` : v >= 1e3 ? `${v / 1e3}k` : String(v));

/**
 * Plots a cost front.
 *
 * @example
 * ```ts
 * const svg = plotFrontSvg({ title: "front", points: front.points, candidates: front.candidates, references: [] });
 * ```
 */
export function plotFrontSvg(input: FrontPlotInput): string {
  const W = 720;
  const panelH = 260;
  const left = 70;
  const right = 120;
  const top = 44;
  const gap = 56;
  const all = [...input.candidates, ...input.points, ...input.references];
  const [x0, x1] = range(all.map((p) => p.qubits));
  const px = (q: number): number => left + ((Math.log10(q) - Math.log10(x0)) / (Math.log10(x1) - Math.log10(x0))) * (W - left - right);
  const body: string[] = [el("text", { x: left, y: 22, class: "title" }, input.title)];
  const panels: [string, (p: FrontPlotPoint) => number][] = [["T-count", (p) => p.t_count], ["T-depth", (p) => p.t_depth]];
  panels.forEach(([name, y], i) => {
    const ptop = top + i * (panelH + gap);
    const pbottom = ptop + panelH;
    const [y0, y1] = range(all.map(y));
    const py = (v: number): number => pbottom - ((Math.log10(Math.max(v, y0)) - Math.log10(y0)) / (Math.log10(y1) - Math.log10(y0))) * panelH;
    for (const v of ticks(y0, y1)) {
      body.push(el("line", { x1: left, y1: py(v), x2: W - right, y2: py(v), class: "grid" }));
      body.push(el("text", { x: left - 6, y: py(v) + 4, class: "ytick" }, label(v)));
    }
    for (const v of ticks(x0, x1)) {
      body.push(el("line", { x1: px(v), y1: ptop, x2: px(v), y2: pbottom, class: "grid" }));
      body.push(el("text", { x: px(v), y: pbottom + 16, class: "tick" }, label(v)));
    }
    body.push(el("line", { x1: left, y1: ptop, x2: left, y2: pbottom, class: "axis" }));
    body.push(el("line", { x1: left, y1: pbottom, x2: W - right, y2: pbottom, class: "axis" }));
    body.push(el("text", { x: left, y: ptop - 6 }, `${name} (log scale)`));
    body.push(el("text", { x: (left + W - right) / 2, y: pbottom + 32, class: "tick" }, "qubits (log scale)"));
    for (const p of input.candidates) body.push(el("circle", { cx: px(p.qubits), cy: py(y(p)), r: 2, class: "cand" }));
    // The best of each panel's figure so far, as qubits grow: a staircase through the front.
    const sorted = [...input.points].sort((a, b) => a.qubits - b.qubits);
    const stairs: string[] = [];
    let best = Infinity;
    for (const p of sorted) {
      const v = y(p);
      if (v >= best) continue;
      if (best !== Infinity) stairs.push(`${px(p.qubits).toFixed(1)},${py(best).toFixed(1)}`);
      stairs.push(`${px(p.qubits).toFixed(1)},${py(v).toFixed(1)}`);
      best = v;
    }
    if (stairs.length > 1) body.push(el("polyline", { points: stairs.join(" "), class: "front" }));
    for (const p of input.points) body.push(el("circle", { cx: px(p.qubits), cy: py(y(p)), r: 3, class: "front-point" }));
    for (const r of input.references) {
      body.push(el("circle", { cx: px(r.qubits), cy: py(y(r)), r: 6, class: "ref" }));
      body.push(el("text", { x: px(r.qubits) + 8, y: py(y(r)) - 6, class: "ref-label" }, r.label));
    }
  });
  const legendY = top + 2 * panelH + gap + 48;
  body.push(el("circle", { cx: left + 4, cy: legendY - 4, r: 3, class: "front-point" }));
  body.push(el("text", { x: left + 12, y: legendY }, "not dominated (qubits, T-count, T-depth)"));
  body.push(el("circle", { cx: left + 284, cy: legendY - 4, r: 2, class: "cand" }));
  body.push(el("text", { x: left + 292, y: legendY }, "other constructions"));
  body.push(el("circle", { cx: left + 434, cy: legendY - 4, r: 6, class: "ref" }));
  body.push(el("text", { x: left + 444, y: legendY }, "references"));
  return svgDocument(W, legendY + 16, input.title, STYLE, body);
}
