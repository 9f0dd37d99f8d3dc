// The success-probability plot: bounded size whatever k is, and the curve of BBHT 1998
// (sin^2((2j+1) theta)) where the chosen k sits at the first maximum.
import { describe, expect, it } from "vitest";
import { planSearch, plotSuccessSvg } from "../helpers/lib.js";
import { checkXml, countClass } from "../helpers/xml.js";

const points = (svg: string): number[][] => svg.match(/points="([^"]*)"/)![1]!.split(" ").map((p) => p.split(",").map(Number));

describe("plotSuccessSvg", () => {
  it("marks every whole j for a small k", () => {
    const svg = plotSuccessSvg(Math.asin(Math.sqrt(1 / 64)), 6, "one solution in 64");
    expect(checkXml(svg).ok).toBe(true);
    expect(countClass(svg, "point")).toBe(14); // j = 0..14 but the chosen one
    expect(countClass(svg, "chosen-point")).toBe(1);
  });
  it("samples a bounded curve for k = 2^60-ish and beyond 2^1024, never an array of k points", () => {
    for (const n of [120, 5000]) {
      const p = planSearch(n, 1);
      const svg = plotSuccessSvg(p.theta, p.iterations!, `n = ${n}`, { successProbability: p.successProbability });
      expect(checkXml(svg).ok).toBe(true);
      expect(svg.length).toBeLessThan(40_000);
      expect(countClass(svg, "point")).toBe(0);
      expect(countClass(svg, "chosen-point")).toBe(1);
      const pts = points(svg);
      expect(pts.length).toBeLessThanOrEqual(2001);
      // The curve starts at P ~ 0 (bottom), peaks near k (x = half the axis) and returns to ~0 at 2k.
      const ys = pts.map((q) => q[1]!);
      const top = Math.min(...ys);
      const bottom = Math.max(...ys);
      expect(ys[0]).toBeCloseTo(bottom, 0);
      const peak = pts[ys.indexOf(top)]![0]!;
      expect(Math.abs(peak - (pts[0]![0]! + pts.at(-1)![0]!) / 2)).toBeLessThan(5);
      expect(svg).toContain("in units of k");
    }
  });
});
