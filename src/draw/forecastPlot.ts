/**
 * Expected time to a solution against the number of variables, for a family of formulas: the
 * quantum estimates (two regimes) and the classical times on a log scale, each with its fitted
 * line extended beyond the data, and the crossover marked where a quantum line drops below the
 * classical one. Plain numbers in; the forecast itself is computed elsewhere.
 */
import { el, svgDocument } from "./svg.js";

/** One series of the plot. */
export interface ForecastPlotSeries {
  /** Legend text. */
  readonly label: string;
  /** Colour and marker: the two quantum regimes, classical brute force, or a solver's measured times. */
  readonly role: "quantum" | "quantum-one-factory" | "classical" | "solver";
  /** Measured or estimated points (seconds > 0; others are left out). */
  readonly points: readonly {
    /** Number of variables (x). */
    readonly variables: number;
    /** Expected seconds (y, log scale). */
    readonly seconds: number;
  }[];
  /** A fitted line log10(seconds) = intercept + slope x variables, drawn dashed across the plot. */
  readonly fit?: {
    /** log10(seconds) at 0 variables. */
    readonly intercept: number;
    /** Decades per variable. */
    readonly slope: number;
  };
}

/** A marked crossing of two fitted lines. */
export interface ForecastPlotCrossover {
  /** Label beside the marker. */
  readonly label: string;
  /** Where the lines cross. */
  readonly variables: number;
  /** log10(seconds) there. */
  readonly log10Seconds: number;
}

/** Everything the plot shows. */
export interface ForecastPlotInput {
  /** Title line. */
  readonly title: string;
  /** The series. */
  readonly series: readonly ForecastPlotSeries[];
  /** Crossovers to mark (those beyond the plotted range are listed in the notes only). */
  readonly crossovers: readonly ForecastPlotCrossover[];
  /** Lines of text under the plot: that it is a model, the fits, the main assumptions. */
  readonly notes: readonly string[];
}

const STYLE = [
  ".paper{fill:#fbfaf6}",
  ".axis{stroke:#333;stroke-width:1.2}",
  ".grid{stroke:#d9d4c7;stroke-width:0.8}",
  ".ref{stroke:#b9b2a0;stroke-width:0.8;stroke-dasharray:2 3}",
  ".line-quantum{fill:none;stroke:#1f3f68;stroke-width:1.6}",
  ".line-quantum-one-factory{fill:none;stroke:#5d8a4a;stroke-width:1.6}",
  ".line-classical{fill:none;stroke:#b5542b;stroke-width:1.6}",
  ".line-solver{fill:none;stroke:#7a4c8c;stroke-width:1.6}",
  ".fit{stroke-dasharray:6 4;stroke-width:1.2}",
  ".point-quantum{fill:#1f3f68}",
  ".point-quantum-one-factory{fill:#5d8a4a}",
  ".point-classical{fill:#b5542b}",
  ".point-solver{fill:#7a4c8c}",
  ".crossover{stroke:#1b1b1b;stroke-width:1.2;stroke-dasharray:4 3}",
  ".crossover-point{fill:#fbfaf6;stroke:#1b1b1b;stroke-width:1.6}",
  "text{font-family:'DejaVu Sans',sans-serif;fill:#1b1b1b;font-size:11px}",
  ".tick{text-anchor:middle}",
  ".ytick{text-anchor:end}",
  ".reflabel{text-anchor:end;fill:#8a826f;font-size:10px}",
  ".title{font-size:13px}",
  ".note{font-size:10.5px;fill:#444}",
].join("");

const YEAR = 365.25 * 86400;
const REFERENCES: readonly [number, string][] = [
  [1e-6, "1 us"],
  [1e-3, "1 ms"],
  [1, "1 s"],
  [3600, "1 hour"],
  [86400, "1 day"],
  [YEAR, "1 year"],
  [1.38e10 * YEAR, "age of the universe"],
];

/** A decade label: 1e-6 s, 0.01 s, 1 s, 1000 s, 1e+9 s. */
function decade(k: number): string {
  return k >= -2 && k <= 3 ? `${10 ** k} s` : `1e${k > 0 ? "+" : ""}${k} s`;
}

/** Splits a note into lines of at most `width` characters at spaces. */
function wrap(text: string, width: number): string[] {
  const lines: string[] = [];
  let line = "";
  for (const word of text.split(" ")) {
    if (line !== "" && line.length + 1 + word.length > width) {
      lines.push(line);
      line = word;
    } else line = line === "" ? word : `${line} ${word}`;
  }
  if (line !== "") lines.push(line);
  return lines;
}

/**
 * Draws the forecast plot as an SVG document.
 *
 * @example
 * ```ts
 * const svg = plotForecastSvg({
 *   title: "random 3-SAT family",
 *   series: [{ label: "classical brute force", role: "classical", points: [{ variables: 10, seconds: 1e-6 }, { variables: 20, seconds: 1e-3 }] }],
 *   crossovers: [],
 *   notes: ["a model, not a measurement"],
 * });
 * ```
 */
export function plotForecastSvg(input: ForecastPlotInput): string {
  const W = 760;
  const left = 70;
  const right = 24;
  // Legend rows under the title, then the plot area, then the notes (wrapped).
  const top = 44 + input.series.length * 15 + 22;
  const plotH = top + 340;
  const bottom = 48;
  const notes = input.notes.flatMap((n) => wrap(n, 118));
  const H = plotH + notes.length * 15 + 12;
  const points = input.series.flatMap((s) => s.points.filter((p) => p.seconds > 0 && Number.isFinite(p.seconds)));
  const xsData = points.map((p) => p.variables);
  let xMin = xsData.length ? Math.min(...xsData) : 0;
  let xMax = xsData.length ? Math.max(...xsData) : 1;
  // Extend the x range to show a crossover, but not past eight times the largest size.
  const reach = Math.max(xMax * 8, xMax + 8);
  for (const c of input.crossovers) if (c.variables > xMax && c.variables <= reach) xMax = c.variables * 1.08;
  if (xMax - xMin < 2) {
    xMin = Math.max(0, xMin - 1);
    xMax = xMax + 1;
  }
  const shown = input.crossovers.filter((c) => c.variables >= xMin && c.variables <= xMax);
  const ys: number[] = points.map((p) => Math.log10(p.seconds));
  for (const s of input.series) if (s.fit) ys.push(s.fit.intercept + s.fit.slope * xMin, s.fit.intercept + s.fit.slope * xMax);
  for (const c of shown) ys.push(c.log10Seconds);
  const finite = ys.filter(Number.isFinite);
  let yLo = finite.length ? Math.floor(Math.min(...finite) - 0.3) : -1;
  let yHi = finite.length ? Math.ceil(Math.max(...finite) + 0.3) : 1;
  if (yHi - yLo < 2) {
    yLo -= 1;
    yHi += 1;
  }
  const px = (x: number): number => left + ((x - xMin) / (xMax - xMin)) * (W - left - right);
  const py = (y: number): number => top + (1 - (y - yLo) / (yHi - yLo)) * (plotH - top - bottom);
  const body: string[] = [el("text", { x: left, y: 22, class: "title" }, input.title)];

  const every = Math.max(1, Math.ceil((yHi - yLo) / 12));
  for (let k = Math.ceil(yLo / every) * every; k <= yHi; k += every) {
    body.push(el("line", { x1: left, y1: py(k), x2: W - right, y2: py(k), class: "grid" }));
    body.push(el("text", { x: left - 6, y: py(k) + 4, class: "ytick" }, decade(k)));
  }
  for (const [s, name] of REFERENCES) {
    const y = Math.log10(s);
    if (y <= yLo || y >= yHi) continue;
    body.push(el("line", { x1: left, y1: py(y), x2: W - right, y2: py(y), class: "ref" }));
    body.push(el("text", { x: W - right - 4, y: py(y) - 3, class: "reflabel" }, name));
  }
  const xStep = Math.max(1, Math.ceil((xMax - xMin) / 12));
  for (let x = Math.ceil(xMin / xStep) * xStep; x <= xMax; x += xStep) body.push(el("text", { x: px(x), y: plotH - bottom + 16, class: "tick" }, String(x)));
  body.push(el("line", { x1: left, y1: top, x2: left, y2: plotH - bottom, class: "axis" }));
  body.push(el("line", { x1: left, y1: plotH - bottom, x2: W - right, y2: plotH - bottom, class: "axis" }));
  body.push(el("text", { x: (left + W - right) / 2, y: plotH - 10, class: "tick" }, "variables (search register qubits)"));
  body.push(el("text", { x: 8, y: top - 8 }, "expected seconds to a solution (log scale)"));

  input.series.forEach((s, i) => {
    const pts = s.points.filter((p) => p.seconds > 0 && Number.isFinite(p.seconds)).sort((a, b) => a.variables - b.variables);
    // The y range already covers the fitted lines at both ends of the x range.
    if (s.fit) body.push(el("line", { x1: px(xMin), y1: py(s.fit.intercept + s.fit.slope * xMin), x2: px(xMax), y2: py(s.fit.intercept + s.fit.slope * xMax), class: `line-${s.role} fit` }));
    if (pts.length > 1) body.push(el("polyline", { points: pts.map((p) => `${px(p.variables).toFixed(1)},${py(Math.log10(p.seconds)).toFixed(1)}`).join(" "), class: `line-${s.role}` }));
    for (const p of pts) body.push(el("circle", { cx: px(p.variables), cy: py(Math.log10(p.seconds)), r: 3.5, class: `point-${s.role}` }));
    const ly = 44 + i * 15;
    const lx = left;
    body.push(el("circle", { cx: lx + 5, cy: ly - 4, r: 4, class: `point-${s.role}` }));
    body.push(el("text", { x: lx + 14, y: ly }, `${s.label}${s.fit ? " (dashed: fitted line)" : ""}`));
  });
  shown.forEach((c, i) => {
    body.push(el("line", { x1: px(c.variables), y1: top, x2: px(c.variables), y2: plotH - bottom, class: "crossover" }));
    body.push(el("circle", { cx: px(c.variables), cy: py(c.log10Seconds), r: 5, class: "crossover-point" }));
    const toLeft = px(c.variables) > W - 300;
    // Labels step down so that two crossovers close together stay readable.
    body.push(el("text", { x: px(c.variables) + (toLeft ? -6 : 6), y: top + 12 + i * 14, ...(toLeft ? { "text-anchor": "end" } : {}) }, c.label));
  });
  notes.forEach((line, i) => body.push(el("text", { x: 12, y: plotH + 14 + i * 15, class: "note" }, line)));
  return svgDocument(W, H, input.title, STYLE, body);
}
