import { describe, expect, it } from "vitest";
import { singularityChart } from "../../src/charts/singularityChart";
import { attr, elements, expectAccessible, pathPoints, subpaths, texts } from "./helpers";

const grid = { nx: 10, ny: 10, rMinMm: 0, zMinMm: 0, stepMm: 100 };
const reached = Array.from({ length: 100 }, () => 1 as number | null);
const inverseCondition = Array.from({ length: 100 }, (_, i) => (i % 10 === 5 ? 0.01 : 0.1) as number | null);

describe("singularityChart", () => {
  const chart = singularityChart({
    id: "singularity-down",
    armName: "Demo",
    orientationLabel: "tool pointing down",
    orientationShort: "tool down",
    layout: "revolute-base",
    grid,
    reached,
    inverseCondition,
    loci: [
      {
        kind: "wrist",
        polylinesMm: [
          [
            [500, 0],
            [500, 900],
          ],
          [
            [600, 0],
            [600, 300],
          ],
        ],
      },
      {
        kind: "shoulder",
        polylinesMm: [
          [
            [0, 0],
            [0, 900],
          ],
        ],
      },
      {
        kind: "elbow",
        polylinesMm: [
          [
            [0, 450],
            [900, 450],
          ],
        ],
      },
      {
        kind: "twist",
        polylinesMm: [
          [
            [100, 100],
            [800, 800],
          ],
        ],
      },
    ],
    lengthScaleMm: 900,
  });

  it("is accessible, with title, axis labels in mm and a caption stating its assumptions", () => {
    expectAccessible(chart.svg, expect);
    expect(texts(chart.svg, "chart-title")).toEqual(["Demo: singularities, tool down"]);
    expect(texts(chart.svg, "axis-label")).toEqual(["distance from axis 1, r (mm)", "height along axis 1, z (mm)"]);
    expect(chart.caption).toMatch(/900 mm/);
    expect(chart.caption).toMatch(/best branch per cell/);
  });

  it("draws one path per locus kind, each with its own class; unknown kinds count as other", () => {
    const loci = elements(chart.svg, "path", "locus");
    expect(loci.map((l) => attr(l, "data-kind"))).toEqual(["wrist", "shoulder", "elbow", "other"]);
    expect(loci.map((l) => attr(l, "class"))).toEqual([
      "locus locus-wrist",
      "locus locus-shoulder",
      "locus locus-elbow",
      "locus locus-other",
    ]);
    expect(subpaths(attr(loci[0]!, "d")!)).toBe(2);
  });

  it("draws the wrist locus at r = 500 mm: halfway across the mapped area", () => {
    const mapped = elements(chart.svg, "rect", "mapped-area")[0]!;
    const x0 = Number(attr(mapped, "x"));
    const w = Number(attr(mapped, "width"));
    const wrist = pathPoints(attr(elements(chart.svg, "path", "locus-wrist")[0]!, "d")!);
    // mapped area: −50 … 950 mm
    expect(wrist[0]![0]).toBeCloseTo(x0 + (550 / 1000) * w, 0);
  });

  it("lists every kind drawn in the legend, with the hatched near-singular cells and axis 1", () => {
    const labels = texts(chart.svg, "legend-label");
    expect(labels[0]).toBe("reached with the tool pointing down");
    expect(labels[1]).toMatch(/^near a singularity/);
    expect(labels.slice(2)).toEqual([
      "wrist (axes 4 and 6 in line)",
      "shoulder (wrist centre or flange over axis 1)",
      "elbow (upper arm and forearm in line)",
      "other",
      "axis 1",
    ]);
    expect(elements(chart.svg, "path", "near-singular")[0]).toContain('fill="url(#singularity-down-hatch)"');
  });

  it("says so when no locus lies inside the region", () => {
    const none = singularityChart({
      id: "s2",
      armName: "Demo",
      orientationLabel: "tool pointing down",
      orientationShort: "tool down",
      layout: "revolute-base",
      grid,
      reached,
      loci: [],
    });
    expect(elements(none.svg, "path", "locus")).toHaveLength(0);
    expect(texts(none.svg, "mark-label")).toContain("no singular loci inside the reached region");
    expect(none.description).toMatch(/No singular loci/);
  });
});
