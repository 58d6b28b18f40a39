import { describe, expect, it } from "vitest";
import { nodeChartResult } from "../../src/charts/cellMarks";
import { cellTimeChart, type CellTimeRow } from "../../src/charts/cellTimeChart";
import { attr, elements, expectAccessible, texts } from "./helpers";

const row: CellTimeRow = {
  key: "a",
  label: "Arm A",
  cycleTimeS: 2.5,
  moves: [
    { step: 1, from: "p", to: "q", motion: "joint", timeS: 1, dwellS: 0.5 },
    { step: 2, from: "q", to: "p", motion: "linear", timeS: 1, dwellS: 0 },
  ],
};
const bad: CellTimeRow = {
  key: "b",
  label: "Arm B",
  cycleTimeS: null,
  moves: [
    { step: 1, from: "p", to: "q", motion: "joint", timeS: 0.7, dwellS: 0 },
    { step: 2, from: "q", to: "p", motion: "linear", timeS: null, dwellS: 0 },
  ],
};

describe("cellTimeChart", () => {
  const chart = nodeChartResult(cellTimeChart({ id: "t", title: "Cycle by move", rows: [row, bad], maxCycleS: 3 }));

  it("is accessible, with a time axis in seconds and the kinematic assumptions in the caption", () => {
    expectAccessible(chart.svg, expect);
    expect(texts(chart.svg, "axis-label")).toEqual(["time from the start of the loop (s)"]);
    expect(chart.caption).toMatch(/no payload dynamics, no blending of corners/);
    expect(chart.caption).toMatch(/lower bound/);
  });

  it("stacks each move and its dwell end to end, lengths proportional to the seconds", () => {
    const rects = elements(chart.svg, "rect").filter((r) => attr(r, "data-step") !== null);
    expect(rects.map((r) => `${attr(r, "data-step")}:${attr(r, "data-kind")}:${attr(r, "class")}`)).toEqual([
      "1:move:ct-move ct-joint",
      "1:dwell:ct-dwell",
      "2:move:ct-move ct-linear",
    ]);
    const x = rects.map((r) => Number(attr(r, "x")));
    const w = rects.map((r) => Number(attr(r, "width")));
    // Move 1 (1 s), dwell (0.5 s), move 2 (1 s): widths 2 : 1 : 2, each segment starting where the last ended.
    const pxPerS = w[0]!;
    expect(w[1]! / pxPerS).toBeCloseTo(0.5, 2);
    expect(w[2]! / pxPerS).toBeCloseTo(1, 2);
    expect(x[1]!).toBeCloseTo(x[0]! + w[0]!, 1);
    expect(x[2]!).toBeCloseTo(x[1]! + w[1]!, 1);
    // The required cycle (3 s) is drawn 3 s from the start of the bar.
    const limit = elements(chart.svg, "line", "ct-limit")[0]!;
    expect((Number(attr(limit, "x1")) - x[0]!) / pxPerS).toBeCloseTo(3, 2);
    expect(texts(chart.svg, "ct-total")).toEqual(["2.5 s"]);
  });

  it("says which steps cannot be done instead of drawing a bar, and names each row", () => {
    expect(texts(chart.svg, "mark-label")).toEqual(["no cycle time: step 2 cannot be done"]);
    expect(texts(chart.svg, "bar-label").slice(0, 2)).toEqual(["Arm A", "2.5 s"]);
    expect(chart.description).toContain("Arm B: no cycle time");
  });

  it("leaves the row name out when it draws one arm, and the limit out when none is required", () => {
    const one = nodeChartResult(cellTimeChart({ id: "t1", title: "A", rows: [row], maxCycleS: null }));
    expect(texts(one.svg, "bar-label")).toEqual(["2.5 s"]);
    expect(elements(one.svg, "line", "ct-limit")).toEqual([]);
  });
});
