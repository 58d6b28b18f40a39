import { describe, expect, it } from "vitest";
import { envelopeChart } from "../../src/charts/envelopeChart";
import { attr, bounds, elements, expectAccessible, pathPoints, texts } from "./helpers";

const square = (x0: number, x1: number, y0: number, y1: number) => ({
  outer: [
    [x0, y0],
    [x1, y0],
    [x1, y1],
    [x0, y1],
    [x0, y0],
  ] as [number, number][],
  holes: [],
});

describe("envelopeChart, side view", () => {
  const chart = envelopeChart({
    id: "env-side",
    armName: "Demo <7>",
    view: "side",
    layout: "revolute-base",
    wcp: [square(100, 500, 0, 400)],
    flange: [square(-200, 600, -100, 500)],
    statedReachMm: 500,
  });

  it("is an accessible SVG with its title, axis labels in mm and a caption", () => {
    expectAccessible(chart.svg, expect);
    expect(chart.title).toBe("Demo <7>: reach envelope, side view");
    expect(texts(chart.svg, "chart-title")).toEqual(["Demo <7>: reach envelope, side view"]);
    expect(texts(chart.svg, "axis-label")).toEqual(["distance from axis 1, r (mm)", "height along axis 1, z (mm)"]);
    expect(chart.caption).toMatch(/joint limits honoured/);
    expect(chart.svg).toContain("Demo &lt;7&gt;");
  });

  it("draws both axes at one scale: 400 mm of WCP width and 400 mm of height are the same length", () => {
    const wcp = pathPoints(attr(elements(chart.svg, "path", "env-wcp")[0]!, "d")!);
    const [x0, x1, y0, y1] = bounds(wcp);
    expect(x1 - x0).toBeCloseTo(y1 - y0, 0);
  });

  it("marks axis 1 at r = 0 and the stated reach at r = 500 mm", () => {
    const wcp = pathPoints(attr(elements(chart.svg, "path", "env-wcp")[0]!, "d")!);
    const [px100, px500] = [bounds(wcp)[0], bounds(wcp)[1]];
    const pxPerMm = (px500 - px100) / 400;
    const axis = elements(chart.svg, "line", "axis1")[0]!;
    expect(Number(attr(axis, "x1"))).toBeCloseTo(px100 - 100 * pxPerMm, 0);
    const stated = elements(chart.svg, "line", "stated-reach")[0]!;
    expect(Number(attr(stated, "x1"))).toBeCloseTo(px500, 0);
    expect(texts(chart.svg, "legend-label")).toEqual([
      "wrist centre point (WCP)",
      "flange centre",
      "axis 1",
      "stated reach 500 mm",
    ]);
  });
});

describe("envelopeChart, top view and other layouts", () => {
  it("draws the stated reach as a circle about axis 1 in the top view", () => {
    const chart = envelopeChart({
      id: "env-top",
      armName: "Demo",
      view: "top",
      layout: "revolute-base",
      wcp: null,
      flange: [square(-500, 500, -500, 500)],
      statedReachMm: 400,
      axis1TopMm: [0, 0],
    });
    expectAccessible(chart.svg, expect);
    const flange = pathPoints(attr(elements(chart.svg, "path", "env-flange")[0]!, "d")!);
    const [x0, x1] = bounds(flange);
    const circle = elements(chart.svg, "circle", "stated-reach")[0]!;
    expect(Number(attr(circle, "r"))).toBeCloseTo(((x1 - x0) / 1000) * 400, 0);
    expect(texts(chart.svg, "axis-label")).toEqual(["base x (mm)", "base y (mm)"]);
  });

  it("draws no axis 1 and no stated reach for a gantry", () => {
    const chart = envelopeChart({
      id: "g",
      armName: "Gantry",
      view: "side",
      layout: "prismatic-base",
      wcp: null,
      flange: [square(0, 3000, 500, 1500)],
      statedReachMm: 3000,
    });
    expect(elements(chart.svg, "line", "axis1")).toHaveLength(0);
    expect(elements(chart.svg, "line", "stated-reach")).toHaveLength(0);
    expect(texts(chart.svg, "axis-label")).toEqual(["base x (mm)", "height, base z (mm)"]);
  });
});
