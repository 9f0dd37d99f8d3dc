/** The success probability of a Grover search against the number of iterations, as an SVG plot. */
import { successAfter } from "../search/plan.js";
import { el, svgDocument } from "./svg.js";

const STYLE = [
  ".paper{fill:#fbfaf6}",
  ".axis{stroke:#333;stroke-width:1.2}",
  ".grid{stroke:#d9d4c7;stroke-width:0.8}",
  ".curve{fill:none;stroke:#1f3f68;stroke-width:1.6}",
  ".point{fill:#1f3f68}",
  ".chosen{stroke:#b5542b;stroke-width:1.4;stroke-dasharray:5 3}",
  ".chosen-point{fill:#b5542b}",
  "text{font-family:'DejaVu Sans',sans-serif;fill:#1b1b1b;font-size:11px}",
  ".tick{text-anchor:middle}",
  ".ytick{text-anchor:end}",
  ".title{font-size:13px}",
  ".axis-label{text-anchor:start}",
].join("");

/**
 * Plots sin^2((2j + 1) theta) for j = 0..last with a marker on every whole j and the chosen k.
 *
 * @example
 * ```ts
 * const svg = plotSuccessSvg(Math.asin(Math.sqrt(1 / 64)), 6, "one solution in 64");
 * ```
 */
export function plotSuccessSvg(theta: number, chosen: number, title: string, last = Math.max(4, 2 * chosen + 2)): string {
  const W = 640;
  const H = 360;
  const left = 56;
  const right = 20;
  const top = 48;
  const bottom = 44;
  const px = (j: number): number => left + (j / last) * (W - left - right);
  const py = (p: number): number => top + (1 - p) * (H - top - bottom);
  const body: string[] = [el("text", { x: left, y: 22, class: "title" }, title)];
  for (let i = 0; i <= 4; i++) {
    const p = i / 4;
    body.push(el("line", { x1: left, y1: py(p), x2: W - right, y2: py(p), class: "grid" }));
    body.push(el("text", { x: left - 6, y: py(p) + 4, class: "ytick" }, p.toFixed(2)));
  }
  const step = Math.max(1, Math.ceil(last / 12));
  for (let j = 0; j <= last; j += step) body.push(el("text", { x: px(j), y: H - bottom + 16, class: "tick" }, String(j)));
  body.push(el("line", { x1: left, y1: top, x2: left, y2: H - bottom, class: "axis" }));
  body.push(el("line", { x1: left, y1: H - bottom, x2: W - right, y2: H - bottom, class: "axis" }));
  body.push(el("text", { x: (left + W - right) / 2, y: H - 8, class: "tick" }, "Grover iterations j"));
  body.push(el("text", { x: 8, y: top - 14, class: "axis-label" }, "P(success)"));
  const samples = Math.max(200, last * 20);
  const pts: string[] = [];
  for (let i = 0; i <= samples; i++) {
    const j = (i / samples) * last;
    pts.push(`${px(j).toFixed(1)},${py(successAfter(theta, j)).toFixed(1)}`);
  }
  body.push(el("polyline", { points: pts.join(" "), class: "curve" }));
  for (let j = 0; j <= last; j++) {
    body.push(el("circle", { cx: px(j), cy: py(successAfter(theta, j)), r: j === chosen ? 5 : 3, class: j === chosen ? "chosen-point" : "point" }));
  }
  body.push(el("line", { x1: px(chosen), y1: top, x2: px(chosen), y2: H - bottom, class: "chosen" }));
  body.push(el("text", { x: px(chosen) + 6, y: top + 12 }, `k = ${chosen}, P = ${successAfter(theta, chosen).toFixed(4)}`));
  return svgDocument(W, H, title, STYLE, body);
}
