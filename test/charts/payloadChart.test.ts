import { describe, expect, it } from "vitest";
import { payloadChart, type PayloadRowData } from "../../src/charts/payloadChart";
import { attr, elements, expectAccessible, pathPoints, subpaths, texts } from "./helpers";

const rows: PayloadRowData[] = [];
for (const offsetMm of [0, 100, 200]) {
  for (const reachMm of [100, 200, 300, 400]) {
    const payloadKg = reachMm === 300 && offsetMm === 200 ? 0 : Math.min(10, 12 - reachMm / 100 - offsetMm / 100);
    rows.push({
      reachMm,
      offsetMm,
      payloadKg,
      limitedBy:
        reachMm === 300 && offsetMm === 200 ? "unreachable" : payloadKg >= 10 ? "rated-payload" : "joint-rating",
    });
  }
}

describe("payloadChart", () => {
  const chart = payloadChart({
    id: "payload-floor",
    armName: "Demo",
    mountingLabel: "floor",
    rows,
    ratedPayloadKg: 10,
    basisText: "Computed.",
  });

  it("is accessible, with axis labels and units and a caption that says static", () => {
    expectAccessible(chart.svg, expect);
    expect(texts(chart.svg, "chart-title")).toEqual(["Demo: payload at reach, floor mounting"]);
    expect(texts(chart.svg, "axis-label")).toEqual(["flange centre distance from axis 1 (mm)", "payload (kg)"]);
    expect(chart.caption).toMatch(/^Computed\. /);
    expect(chart.caption).toMatch(/Static holding only: excludes acceleration/);
  });

  it("draws one line per CG offset, each its own series class, and breaks a line at an unreachable row", () => {
    const lines = elements(chart.svg, "path", "series");
    expect(lines.map((l) => attr(l, "data-offset-mm"))).toEqual(["0", "100", "200"]);
    expect(lines.map((l) => attr(l, "class"))).toEqual(["series series-0", "series series-1", "series series-2"]);
    expect(subpaths(attr(lines[2]!, "d")!)).toBe(2);
    expect(texts(chart.svg, "legend-label")).toEqual([
      "CG offset 0 mm",
      "CG offset 100 mm",
      "CG offset 200 mm",
      "rated payload 10 kg",
    ]);
  });

  it("maps payloads to pixels on one linear scale, the rated line at 10 kg", () => {
    const rated = elements(chart.svg, "line", "rated-line")[0]!;
    const yRated = Number(attr(rated, "y1"));
    const zero = pathPoints(attr(elements(chart.svg, "path", "series-0")[0]!, "d")!);
    // offset 0: 10, 10, 9, 8 kg at 100…400 mm
    expect(zero[0]![1]).toBeCloseTo(yRated, 1);
    const kgPerPx = (zero[3]![1] - zero[0]![1]) / 2;
    expect(zero[2]![1] - zero[0]![1]).toBeCloseTo(kgPerPx, 0); // path coordinates carry one decimal
    expect(zero[1]![0] - zero[0]![0]).toBeCloseTo(zero[3]![0] - zero[2]![0], 1);
  });
});
