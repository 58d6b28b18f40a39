import { describe, expect, it } from "vitest";
import { nodeChartResult } from "../../src/charts/cellMarks";
import { feasibleRunsPath, placementMapChart } from "../../src/charts/placementMapChart";
import { attr, elements, expectAccessible, texts } from "./helpers";

const grid = {
  gridMm: 50,
  xMm: [0, 50, 100, 150],
  yMm: [0, 50],
  feasible: [
    [1, 1, 0, 1],
    [0, 1, 1, 1],
  ] as (0 | 1)[][],
};

describe("feasibleRunsPath", () => {
  it("draws one rectangle per run of feasible positions in a row, each position a grid square centred on it", () => {
    const r = feasibleRunsPath(
      grid,
      (v) => v,
      (v) => -v,
    );
    // Row y = 0: columns 0–1 and column 3; row y = 50: columns 1–3. 3 runs, 6 positions.
    expect(r.runs).toBe(3);
    expect(r.cells).toBe(6);
    // The first run spans x from 0 − 25 to 50 + 25 mm, y from −25 to 25 mm (y drawn downwards here).
    expect(r.d.startsWith("M-25 -25H75V25H-25Z")).toBe(true);
  });
});

describe("placementMapChart", () => {
  const base = {
    id: "pm",
    title: "Arm A: where the base can stand",
    ...grid,
    targets: [{ name: "pick", p: [600, 0] as const }],
    current: [0, 0] as const,
    caption: "Test.",
  };

  it("is accessible, in mm on both axes, and counts the feasible positions it shades", () => {
    const chart = nodeChartResult(placementMapChart({ ...base, best: [100, 50] }));
    expectAccessible(chart.svg, expect);
    expect(texts(chart.svg, "axis-label")).toEqual(["base x, cell frame (mm)", "base y, cell frame (mm)"]);
    expect(attr(elements(chart.svg, "path", "pm-feasible")[0]!, "data-cells")).toBe("6");
    // 6 positions of 50 × 50 mm = 0.015 m².
    expect(chart.description).toContain("6 feasible base positions on a 50 mm grid (0.02 m²)");
    expect(elements(chart.svg, "circle", "pm-current")).toHaveLength(1);
    expect(elements(chart.svg, "path", "pm-best")).toHaveLength(1);
    expect(texts(chart.svg, "mark-label")).toEqual(expect.arrayContaining(["today", "fastest", "pick"]));
  });

  it("says so when no position is feasible, and draws no fastest mark without one", () => {
    const chart = nodeChartResult(placementMapChart({ ...base, xMm: [], yMm: [], feasible: [], best: null }));
    expect(texts(chart.svg, "mark-label")).toContain("no base position on this plane reaches every target");
    expect(elements(chart.svg, "path", "pm-feasible")).toEqual([]);
    expect(elements(chart.svg, "path", "pm-best")).toEqual([]);
  });
});
