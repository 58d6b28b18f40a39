/**
 * capabilityMapChart on a hand-made grid whose bands, clip region and outline positions follow from the grid by hand:
 * nodes at r = 0, 100, 200, 300 mm (cells ±50 mm around them), shares 5 %, 35 %, 35 % and one cell outside the
 * envelope per row.
 */
import { describe, expect, it } from "vitest";
import { capabilityBandIndex, capabilityEdgeLabel, capabilityMapChart } from "../../src/charts/capabilityMapChart";
import { CAPABILITY_BANDS } from "../../src/charts/theme";
import { attr, bounds, elements, expectAccessible, pathPoints, texts } from "./helpers";

const grid = { nx: 4, ny: 2, rMinMm: 0, zMinMm: 0, stepMm: 100 };
const share = [0.05, 0.35, 0.35, null, 0.05, 0.35, 0.35, null];
// Tool down reached at the first two columns only (a finer grid, as the speed maps have).
const downGrid = { nx: 8, ny: 4, rMinMm: 0, zMinMm: 0, stepMm: 50 };
const downReached = Array.from({ length: 32 }, (_, i) => (i % 8 < 3 ? 500 : null));

describe("capabilityMapChart", () => {
  const chart = capabilityMapChart({
    id: "capability",
    armName: "Demo",
    grid,
    share,
    directions: 128,
    toolDown: { grid: downGrid, reached: downReached },
    areaShareAtLeastHalf: 0,
  });

  it("is an accessible chart with title, axis labels in mm and a labelled scale in percent", () => {
    expectAccessible(chart.svg, expect);
    expect(texts(chart.svg, "chart-title")).toEqual(["Demo: share of tool directions reached"]);
    expect(texts(chart.svg, "axis-label")).toEqual(["distance from axis 1, r (mm)", "height along axis 1, z (mm)"]);
    expect(texts(chart.svg, "legend-title")).toEqual(["share of tool directions reached (%)"]);
    const scaleLabels = texts(chart.svg, "tick-label").slice(-CAPABILITY_BANDS.length - 1);
    expect(scaleLabels).toEqual(["0", "10", "20", "30", "40", "50", "60", "70", "80", "90", "and above"]);
    expect(chart.description).toContain("share of 128 tool directions");
    expect(chart.description).toContain("0 % of the envelope's cells are reached from at least half");
    expect(chart.caption).toMatch(/pick from above needs the tool pointing down, one from the side a horizontal tool/);
    expect(chart.caption).toMatch(/30 % means 30 % of all directions/);
    expect(chart.caption).toMatch(/does not say whether that direction is among those reached/);
  });

  it("draws one filled path per band that has cells: 0, 10, 20 and 30 %", () => {
    const bands = elements(chart.svg, "path", "capability-band");
    expect(bands.map((b) => attr(b, "data-band-percent"))).toEqual(["0", "10", "20", "30"]);
    expect(bands.map((b) => attr(b, "class"))).toEqual([0, 1, 2, 3].map((i) => `capability-band capability-band-${i}`));
  });

  it("clips the bands to the envelope's cells, which end at r = 250 mm; the tool-down outline ends at r = 125 mm", () => {
    const mapped = elements(chart.svg, "rect", "mapped-area")[0]!;
    const mx = Number(attr(mapped, "x")),
      mw = Number(attr(mapped, "width"));
    // Mapped area: −50 … 350 mm (400 mm wide).
    const pxPerMm = mw / 400;
    const clip = chart.svg.match(/<clipPath id="capability-inside"><path d="([^"]+)"/)![1]!;
    const px = bounds(pathPoints(clip));
    expect(px[0]).toBeCloseTo(mx, 0);
    expect(px[1]).toBeCloseTo(mx + 300 * pxPerMm, 0);
    // Tool down: nodes at 0, 50, 100 mm of the 50 mm grid → border at 125 mm.
    const outline = attr(elements(chart.svg, "path", "tool-down-outline")[0]!, "d")!;
    const ox = bounds(pathPoints(outline));
    expect(ox[1]).toBeCloseTo(mx + 175 * pxPerMm, 0);
    expect(texts(chart.svg, "legend-label")).toContain("reached with the tool pointing down");
    // Axis 1 at r = 0 (besides its legend sample).
    const axis = elements(chart.svg, "line", "axis1").filter((t) => !attr(t, "class")!.includes("legend-line"));
    expect(axis).toHaveLength(1);
    expect(Number(attr(axis[0]!, "x1"))).toBeCloseTo(mx + 50 * pxPerMm, 0);
  });

  it("puts shares in fixed bands of 10 %, a count over the directions on its edge in the upper band", () => {
    expect(capabilityBandIndex(null)).toBe(-1);
    expect(capabilityBandIndex(0)).toBe(0);
    expect(capabilityBandIndex(63 / 128)).toBe(4);
    expect(capabilityBandIndex(64 / 128)).toBe(5);
    expect(capabilityBandIndex(1)).toBe(9);
    expect(capabilityEdgeLabel(0.3)).toBe("30");
  });

  it("without a tool-down region: no outline and a caption that says the share names no direction", () => {
    const plain = capabilityMapChart({ id: "capability", armName: "Demo", grid, share, directions: 128 });
    expect(elements(plain.svg, "path", "tool-down-outline")).toHaveLength(0);
    expect(plain.caption).toMatch(/does not say which directions those are/);
  });
});
