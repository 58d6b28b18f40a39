import { describe, expect, it } from "vitest";
import { loadDiagramChart } from "../../src/charts/loadDiagramChart";
import { attr, bounds, elements, expectAccessible, pathPoints, texts } from "./helpers";

// Quarter circles of radius L = M / (m·g): 10 N·m gives 204 mm for 5 kg and 102 mm for 10 kg.
const arc = (radiusMm: number) =>
  Array.from({ length: 13 }, (_, i) => {
    const t = (i / 12) * (Math.PI / 2);
    return [radiusMm * Math.cos(t), radiusMm * Math.sin(t)] as const;
  });

describe("loadDiagramChart", () => {
  const chart = loadDiagramChart({
    id: "load-diagram",
    armName: "Demo",
    ratedPayloadKg: 10,
    curves: [
      { massKg: 5, fractionOfRated: 0.5, pointsMm: arc(204), openEnded: false },
      { massKg: 10, fractionOfRated: 1, pointsMm: arc(102), openEnded: false },
      { massKg: 20, fractionOfRated: 2, pointsMm: [], openEnded: false },
    ],
  });

  it("is accessible, with CG offset axes in mm and a caption naming the ratings used", () => {
    expectAccessible(chart.svg, expect);
    expect(texts(chart.svg, "axis-label")).toEqual([
      "CG offset across the flange axis, Lxy (mm)",
      "CG offset along the flange axis, Lz (mm)",
    ]);
    expect(chart.caption).toMatch(/M ≥ m·g·L/);
    expect(chart.description).toMatch(/Not allowed even at zero offset: 20 kg/);
  });

  it("draws one path per mass, heaviest first, each with its own line style, and labels it", () => {
    const lines = elements(chart.svg, "path", "series");
    expect(lines.map((l) => attr(l, "data-mass-kg"))).toEqual(["10", "5"]);
    expect(texts(chart.svg, "legend-label")).toEqual(["10 kg (rated)", "5 kg (50 %)"]);
    expect(texts(chart.svg, "series-label")).toEqual(["10 kg", "5 kg"]);
  });

  it("keeps one scale on both axes: the quarter circles stay round", () => {
    const five = pathPoints(attr(elements(chart.svg, "path", "series-1")[0]!, "d")!);
    const [x0, x1, y0, y1] = bounds(five);
    expect(x1 - x0).toBeCloseTo(y1 - y0, 0);
  });
});
