import { describe, expect, it } from "vitest";
import { nodeChartResult } from "../../src/charts/cellMarks";
import { cellLayoutChart } from "../../src/charts/cellLayoutChart";
import { attr, elements, expectAccessible, texts } from "./helpers";

const chart = nodeChartResult(
  cellLayoutChart({
    id: "top",
    title: "Cell, top view",
    axes: { x: "cell x", y: "cell y" },
    caption: "Test caption.",
    targets: [
      { name: "pick", p: [1000, 0] },
      { name: "above pick", p: [1000, 0] },
      { name: "place", p: [1000, 800] },
    ],
    segments: [
      { a: [1000, 800], b: [1000, 0], motion: "joint", step: 1 },
      { a: [1000, 0], b: [1000, 0], motion: "linear", step: 2 },
    ],
    bases: [
      {
        key: "a",
        label: "Arm A",
        shortLabel: "A",
        p: [0, 0],
        series: 0,
        outline: { kind: "circle", c: [0, 0], rMm: 1200 },
      },
      {
        key: "b",
        label: "Arm B",
        shortLabel: "B",
        p: [0, 0],
        series: 1,
        outline: { kind: "span", x: [-500, 500], y: 0 },
      },
    ],
  }),
);

/** Centre of a target × (path "Mx y l10 10M…"). */
function crossCentre(tag: string): [number, number] {
  const m = /M(-?[\d.]+) (-?[\d.]+)l10 10/.exec(attr(tag, "d")!)!;
  return [Number(m[1]) + 5, Number(m[2]) + 5];
}

describe("cellLayoutChart", () => {
  it("is accessible, with both axes in mm", () => {
    expectAccessible(chart.svg, expect);
    expect(texts(chart.svg, "axis-label")).toEqual(["cell x (mm)", "cell y (mm)"]);
  });

  it("draws to scale: a millimetre is as long across as up, and the reach circle has the same scale", () => {
    const crosses = elements(chart.svg, "path", "cell-target").map(crossCentre);
    // pick (1000, 0) and place (1000, 800): 800 mm apart along y.
    const pxPerMmY = Math.abs(crosses[1]![1] - crosses[0]![1]) / 800;
    const circle = elements(chart.svg, "circle", "cell-reach")[0]!;
    // Base at (0, 0) and pick at (1000, 0): 1000 mm along x.
    const pxPerMmX = Math.abs(crosses[0]![0] - Number(attr(circle, "cx"))) / 1000;
    expect(pxPerMmX).toBeCloseTo(pxPerMmY, 2);
    expect(Number(attr(circle, "r")) / 1200).toBeCloseTo(pxPerMmX, 2);
  });

  it("groups coinciding targets and bases under one label each", () => {
    expect(elements(chart.svg, "path", "cell-target")).toHaveLength(2);
    expect(texts(chart.svg, "cell-target-label").sort()).toEqual(["pick, above pick", "place"]);
    expect(texts(chart.svg, "cell-base-label")).toEqual(["A, B"]);
    expect(elements(chart.svg, "rect", "cell-base")).toHaveLength(2);
  });

  it("draws joint moves and linear moves with their own classes, and a span with end ticks", () => {
    // The legend draws one sample of each as well (class legend-line, no step).
    const moves = (cls: string) => elements(chart.svg, "line", cls).filter((l) => attr(l, "data-step") !== null);
    expect(moves("cell-joint").map((l) => attr(l, "data-step"))).toEqual(["1"]);
    expect(moves("cell-linear").map((l) => attr(l, "data-step"))).toEqual(["2"]);
    const span = elements(chart.svg, "path", "cell-reach")[0]!;
    expect(attr(span, "data-arm")).toBe("b");
    expect(attr(span, "d")).toMatch(/^M[\d.]+ [\d.]+H[\d.]+M[\d.]+ [\d.]+v8M[\d.]+ [\d.]+v8$/);
  });
});

describe("cellLayoutChart spans", () => {
  it("cuts a span longer than the drawing at its edges, with no end tick there, and does not widen the drawing", () => {
    const side = nodeChartResult(
      cellLayoutChart({
        id: "side",
        title: "Cell, side view",
        axes: { x: "cell x", y: "height, cell z" },
        caption: "Test.",
        floor: true,
        targets: [{ name: "pick", p: [1000, 500] }],
        segments: [],
        bases: [
          {
            key: "a",
            label: "A",
            shortLabel: "A",
            p: [0, 0],
            series: 0,
            outline: { kind: "span", x: [-90_000, 800], y: 0 },
          },
        ],
      }),
    );
    const d = attr(elements(side.svg, "path", "cell-reach")[0]!, "d")!;
    // One tick (the right end at 800 mm lies inside); the left end runs to the plot's edge.
    expect(d.match(/v8/g)).toHaveLength(1);
    const ticks = texts(side.svg, "tick-label").map((t) => Number(t.replace(/,/g, "").replace("\u2212", "-")));
    expect(Math.min(...ticks)).toBeGreaterThan(-5000);
  });
});
