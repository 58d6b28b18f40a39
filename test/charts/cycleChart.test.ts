import { describe, expect, it } from "vitest";
import { cycleChart } from "../../src/charts/cycleChart";
import { attr, elements, expectAccessible, texts } from "./helpers";

describe("cycleChart", () => {
  const moves = [
    { from: "A", to: "A up", timeS: 0.1, limitingJoint: "J2" },
    { from: "A up", to: "B up", timeS: 0.4, limitingJoint: "J1" },
    { from: "B up", to: "B", timeS: 0.1, limitingJoint: "J2" },
  ];
  const chart = cycleChart({
    id: "cycle-moves",
    armName: "Demo",
    moves,
    totalS: 0.6,
    pathText: "up 25 mm, across 300 mm, down 25 mm and back",
  });

  it("is accessible, with the time axis in seconds and the assumptions in the caption", () => {
    expectAccessible(chart.svg, expect);
    expect(texts(chart.svg, "axis-label")).toEqual(["time per move (s)"]);
    expect(chart.title).toBe("Demo: standard cycle, 0.6 s");
    expect(chart.caption).toMatch(/trapezoidal/);
    expect(chart.caption).toMatch(/no blending/);
  });

  it("draws one bar per move, lengths proportional to time, the across move marked", () => {
    const bars = elements(chart.svg, "rect", "cycle-bar");
    expect(bars).toHaveLength(3);
    const w = bars.map((b) => Number(attr(b, "width")));
    expect(w[1]! / w[0]!).toBeCloseTo(4, 1);
    expect(attr(bars[1]!, "class")).toBe("cycle-bar across");
    expect(texts(chart.svg, "bar-label")).toContain("0.4 s, J1");
  });
});
