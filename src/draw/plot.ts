/** The success probability of a Grover search against the number of iterations, as an SVG plot. */
import type { BigCount } from "../search/exact.js";
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

/** Most whole j marked with a dot; beyond it only the chosen k is marked. */
const MAX_MARKERS = 64;
/** Points of the sampled curve, whatever the range of j. */
const MAX_SAMPLES = 2000;
/** Above this k the axis is labelled in units of k (0, k/2, k, 3k/2, 2k). */
const PLAIN_AXIS_UP_TO = 1_000_000;

/** Options of {@link plotSuccessSvg}. */
export interface PlotOptions {
  /** Last j on the axis (default 2k + 2, at least 4). Only used while k is at most 1,000,000. */
  readonly last?: number;
  /** The success probability at k, as planned (default: computed in double precision). */
  readonly successProbability?: number;
}

/**
 * Plots sin^2((2j + 1) theta) against j up to about 2k, marking every whole j while there are at
 * most 64 and always the chosen k. The curve is sampled at no more than 2000 points whatever k
 * is; above k = 1,000,000 the axis counts in units of k and the curve is sin^2(2t k theta + theta)
 * for t = j/k, with k theta taken as pi/4 when theta underflows a double (the difference is below
 * theta, invisible at any scale the plot has).
 *
 * @example
 * ```ts
 * const svg = plotSuccessSvg(Math.asin(Math.sqrt(1 / 64)), 6, "one solution in 64");
 * ```
 */
export function plotSuccessSvg(theta: number, chosen: number | bigint | BigCount, title: string, options: PlotOptions = {}): string {
  const k = typeof chosen === "object" ? (chosen.exact !== undefined ? Number(chosen.exact) : 2 ** chosen.log2) : Number(chosen);
  const kLabel = typeof chosen === "object" ? (chosen.exact !== undefined ? String(chosen.exact) : `about 2^${Number(chosen.log2.toFixed(3))}`) : String(chosen);
  const scaled = !(k <= PLAIN_AXIS_UP_TO);
  // x runs over j, or over t = j / k when scaled.
  const last = scaled ? 2 : (options.last ?? Math.max(4, 2 * k + 2));
  const kTheta = scaled ? (Number.isFinite(k * theta) && k * theta > 0 ? k * theta : Math.PI / 4) : 0;
  const p = (x: number): number => {
    if (!scaled) return successAfter(theta, x);
    const s = Math.sin(2 * x * kTheta + theta);
    return s * s;
  };
  const W = 640;
  const H = 360;
  const left = 56;
  const right = 20;
  const top = 48;
  const bottom = 44;
  const px = (x: number): number => left + (x / last) * (W - left - right);
  const py = (q: number): number => top + (1 - q) * (H - top - bottom);
  const body: string[] = [el("text", { x: left, y: 22, class: "title" }, title)];
  for (let i = 0; i <= 4; i++) {
    const q = i / 4;
    body.push(el("line", { x1: left, y1: py(q), x2: W - right, y2: py(q), class: "grid" }));
    body.push(el("text", { x: left - 6, y: py(q) + 4, class: "ytick" }, q.toFixed(2)));
  }
  if (scaled) {
    for (const [x, label] of [[0, "0"], [0.5, "k/2"], [1, "k"], [1.5, "3k/2"], [2, "2k"]] as const) body.push(el("text", { x: px(x), y: H - bottom + 16, class: "tick" }, label));
  } else {
    const step = Math.max(1, Math.ceil(last / 12));
    for (let j = 0; j <= last; j += step) body.push(el("text", { x: px(j), y: H - bottom + 16, class: "tick" }, String(j)));
  }
  body.push(el("line", { x1: left, y1: top, x2: left, y2: H - bottom, class: "axis" }));
  body.push(el("line", { x1: left, y1: H - bottom, x2: W - right, y2: H - bottom, class: "axis" }));
  body.push(el("text", { x: (left + W - right) / 2, y: H - 8, class: "tick" }, scaled ? `Grover iterations j (in units of k = ${kLabel})` : "Grover iterations j"));
  body.push(el("text", { x: 8, y: top - 14, class: "axis-label" }, "P(success)"));
  const samples = scaled ? MAX_SAMPLES : Math.min(MAX_SAMPLES, Math.max(200, last * 20));
  const pts: string[] = [];
  for (let i = 0; i <= samples; i++) {
    const x = (i / samples) * last;
    pts.push(`${px(x).toFixed(1)},${py(p(x)).toFixed(1)}`);
  }
  body.push(el("polyline", { points: pts.join(" "), class: "curve" }));
  const xk = scaled ? 1 : k;
  if (!scaled && last <= MAX_MARKERS) {
    for (let j = 0; j <= last; j++) if (j !== k) body.push(el("circle", { cx: px(j), cy: py(p(j)), r: 3, class: "point" }));
  }
  const pk = options.successProbability ?? p(xk);
  body.push(el("circle", { cx: px(xk), cy: py(pk), r: 5, class: "chosen-point" }));
  body.push(el("line", { x1: px(xk), y1: top, x2: px(xk), y2: H - bottom, class: "chosen" }));
  body.push(el("text", { x: px(xk) + 6, y: top + 12 }, `k = ${kLabel}, P = ${pk.toFixed(4)}`));
  return svgDocument(W, H, title, STYLE, body);
}
