import { describe, expect, it } from "vitest";
import { speedBandIndex, speedEdgeLabel, speedMapChart } from "../../src/charts/speedMapChart";
import { SPEED_BANDS_M_PER_S } from "../../src/charts/theme";
import { attr, bounds, elements, expectAccessible, pathPoints, texts } from "./helpers";

// 4 × 2 cells of 100 mm: speeds 0.1, 0.6, 1.2 m/s and one unreachable cell per row.
const grid = { nx: 4, ny: 2, rMinMm: 100, zMinMm: 0, stepMm: 100 };
const values = [100, 600, 1200, null, 100, 600, 1200, null];

describe("speedMapChart", () => {
  const chart = speedMapChart({
    id: "speed-down",
    armName: "Demo",
    orientationLabel: "tool pointing down",
    orientationShort: "tool down",
    layout: "revolute-base",
    grid,
    guaranteedMmPerS: values,
    shareAtLeast1: 1 / 3,
  });

  it("is an accessible chart with title, axis labels in mm and a labelled scale in m/s", () => {
    expectAccessible(chart.svg, expect);
    expect(texts(chart.svg, "chart-title")).toEqual(["Demo: guaranteed line speed, tool down"]);
    expect(texts(chart.svg, "axis-label")).toEqual(["distance from axis 1, r (mm)", "height along axis 1, z (mm)"]);
    expect(texts(chart.svg, "legend-title")).toEqual(["guaranteed straight-line speed (m/s)"]);
    const scaleLabels = texts(chart.svg, "tick-label").slice(-SPEED_BANDS_M_PER_S.length - 1);
    expect(scaleLabels).toEqual([...SPEED_BANDS_M_PER_S.map(speedEdgeLabel), "and above"]);
    expect(chart.description).toContain("33.3 % of the reached cells allow at least 1 m/s");
    expect(chart.caption).toMatch(/best inverse-kinematics branch per cell/);
    expect(chart.caption).toMatch(/Flange centre as the tool point/);
  });

  it("draws one filled path per band that has cells, coloured by class, nested from slow to fast", () => {
    const bands = elements(chart.svg, "path", "speed-band");
    expect(bands.map((b) => attr(b, "data-band-m-per-s"))).toEqual(["0", "0.25", "0.5", "0.75", "1"]);
    expect(bands.map((b) => attr(b, "class"))).toEqual([0, 1, 2, 3, 4].map((i) => `speed-band speed-band-${i}`));
  });

  it("leaves the unreachable column blank: bands are clipped to the reached cells, which end at r = 350 mm", () => {
    const clip = chart.svg.match(/<clipPath id="speed-down-reached"><path d="([^"]+)"/)![1]!;
    const px = bounds(pathPoints(clip));
    const axis = elements(chart.svg, "path", "tick");
    expect(axis.length).toBeGreaterThan(0);
    // Reached cells: nodes at 100, 200, 300 mm → borders at 50 and 350 mm; the mapped area runs to 450 mm.
    const mapped = elements(chart.svg, "rect", "mapped-area")[0]!;
    const mx = Number(attr(mapped, "x"));
    const mw = Number(attr(mapped, "width"));
    const pxPerMm = mw / 400;
    expect(px[0]).toBeCloseTo(mx, 0);
    expect(px[1]).toBeCloseTo(mx + 300 * pxPerMm, 0);
    expect(elements(chart.svg, "g", "speed-bands")[0]).toContain('clip-path="url(#speed-down-reached)"');
  });

  it("puts speeds in fixed bands", () => {
    expect(speedBandIndex(null)).toBe(-1);
    expect(speedBandIndex(0)).toBe(0);
    expect(speedBandIndex(999)).toBe(3);
    expect(speedBandIndex(1000)).toBe(4);
    expect(speedBandIndex(5000)).toBe(SPEED_BANDS_M_PER_S.length - 1);
  });
});
