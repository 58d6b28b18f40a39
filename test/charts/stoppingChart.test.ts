/**
 * The stopping chart (src/charts/stoppingChart.ts): accessible, axes titled with their units, one row of a distance
 * and a time panel per stop category, one marker per declared point in each panel, and markers placed by linear
 * scales: a linear map keeps ratios of differences, so (x₂ − x₁)/(x₃ − x₁) = (s₂ − s₁)/(s₃ − s₁) for speeds s and
 * likewise for the values on y (an affine-map identity, checked without reading the scales). Invented points.
 */
import { describe, expect, it } from "vitest";
import { stoppingChart, stoppingSeries, type StoppingPointData } from "../../src/charts/stoppingChart";
import { attr, elements, expectAccessible, texts } from "./helpers";

const p = (
  stopCategory: number,
  speedPercent: number,
  extensionPercent: number,
  payloadPercent: number,
  distanceDeg: number,
  timeS: number,
): StoppingPointData => ({ stopCategory, speedPercent, extensionPercent, payloadPercent, distanceDeg, timeS });

const points = [
  p(0, 100, 100, 100, 40, 0.5),
  p(0, 100, 33, 100, 28, 0.42),
  p(1, 33, 100, 100, 8, 0.35),
  p(1, 66, 100, 100, 22, 0.48),
  p(1, 100, 100, 100, 45, 0.62),
];
const chart = stoppingChart({ id: "stop-j1", armName: "Demo", joint: "J1", points });

/** Where a marker is placed (its <use> x and y). */
function translate(tag: string): [number, number] {
  return [Number(attr(tag, "x")), Number(attr(tag, "y"))];
}

describe("stoppingChart", () => {
  it("is accessible, says it is declared data, and titles each axis with its unit", () => {
    expectAccessible(chart.svg, expect);
    expect(chart.title).toBe("Demo: stopping data of J1, as declared");
    expect(chart.caption).toMatch(/declares/);
    expect(chart.caption).toMatch(/not computed/);
    const labels = texts(chart.svg, "axis-label");
    expect(labels.filter((l) => l === "stopping distance (deg)")).toHaveLength(2);
    expect(labels.filter((l) => l === "stopping time (s)")).toHaveLength(2);
    expect(labels.filter((l) => l === "speed at the stop (% of max.)")).toHaveLength(4);
    expect(texts(chart.svg, "panel-title")).toEqual(["Stop category 0", "Stop category 1"]);
    // Every declared value is in the description, for readers who cannot see the chart.
    expect(chart.description).toContain("category 1, 66 % speed, 100 % extension, 100 % payload: 22 deg in 0.48 s");
  });

  it("has one legend entry and one line style per extension and payload", () => {
    expect(stoppingSeries(points)).toEqual([
      { extensionPercent: 33, payloadPercent: 100 },
      { extensionPercent: 100, payloadPercent: 100 },
    ]);
    expect(texts(chart.svg, "legend-label")).toEqual([
      "extension 33 %, payload 100 %",
      "extension 100 %, payload 100 %",
    ]);
    // Only category 1 has a series with two points or more: one line in its distance panel, one in its time panel.
    expect(elements(chart.svg, "path", "series", "series-1")).toHaveLength(2);
    expect(elements(chart.svg, "path", "series", "series-0")).toHaveLength(0);
  });

  it("draws one marker per point and panel, placed by linear scales", () => {
    const markers = elements(chart.svg, "use", "stop-point");
    expect(markers).toHaveLength(points.length * 2);
    for (const measure of ["distanceDeg", "timeS"] as const) {
      const own = markers.filter(
        (m) =>
          attr(m, "class")!.includes(measure === "distanceDeg" ? "distance" : "time") &&
          attr(m, "class")!.includes("point-1"),
      );
      const cat1 = own.filter(
        (m) =>
          Number(attr(m, "data-speed-percent")) < 100 ||
          Number(attr(m, "data-value")) === (measure === "timeS" ? 0.62 : 45),
      );
      expect(cat1).toHaveLength(3);
      const xy = cat1.map(translate);
      const speeds = cat1.map((m) => Number(attr(m, "data-speed-percent")));
      const values = cat1.map((m) => Number(attr(m, "data-value")));
      // Affine maps keep ratios of differences (tolerance: coordinates are written with 1 decimal, ±0.05 px).
      const rx = (xy[1]![0] - xy[0]![0]) / (xy[2]![0] - xy[0]![0]);
      expect(rx).toBeCloseTo((speeds[1]! - speeds[0]!) / (speeds[2]! - speeds[0]!), 2);
      const ry = (xy[1]![1] - xy[0]![1]) / (xy[2]![1] - xy[0]![1]);
      expect(ry).toBeCloseTo((values[1]! - values[0]!) / (values[2]! - values[0]!), 2);
      // Larger values sit higher (smaller y).
      expect(xy[2]![1]).toBeLessThan(xy[0]![1]);
    }
  });

  it("uses the same y scale in both rows: a value sits at the same height above its panel's base", () => {
    // Category 0 at 100 % speed, extension 100 %: 40 deg; category 1 at 100 % speed: 45 deg. Both rows have the
    // same panel height and domain, so (base − y) / value is the same in both rows.
    const dist = elements(chart.svg, "use", "stop-point").filter(
      (m) => attr(m, "class")!.includes("distance") && attr(m, "class")!.includes("point-1"),
    );
    const at = (v: number) => translate(dist.find((m) => Number(attr(m, "data-value")) === v)!);
    const ticks = elements(chart.svg, "line", "domain");
    // Base lines of the panels (horizontal domain lines): y1 == y2.
    const bases = [
      ...new Set(ticks.filter((t) => attr(t, "y1") === attr(t, "y2")).map((t) => Number(attr(t, "y1")))),
    ].sort((a, b) => a - b);
    expect(bases).toHaveLength(2);
    const k0 = (bases[0]! - at(40)[1]) / 40;
    const k1 = (bases[1]! - at(45)[1]) / 45;
    expect(k0).toBeCloseTo(k1, 2);
  });
});
