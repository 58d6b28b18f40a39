import { scaleLinear } from "d3-scale";
import { describe, expect, it } from "vitest";
import { axisBottomSvg, axisLeftSvg, axisTitle, tickDecimals, ticksOf } from "../../src/charts/axes";
import { equalScale } from "../../src/charts/layout";
import { elements, attr, texts } from "./helpers";

const area = { left: 50, top: 20, width: 400, height: 200 };

describe("axes", () => {
  it("titles an axis with its unit", () => {
    expect(axisTitle("height z", "mm")).toBe("height z (mm)");
    const svg = axisBottomSvg(scaleLinear([0, 1000], [50, 450]), area, { label: "reach", unit: "mm" });
    expect(texts(svg, "axis-label")).toEqual(["reach (mm)"]);
  });

  it("puts each tick where the scale maps its value, with a formatted label", () => {
    const x = scaleLinear([0, 1000], [50, 450]);
    const svg = axisBottomSvg(x, area, { label: "reach", unit: "mm", ticks: 5 });
    expect(texts(svg, "tick-label")).toEqual(["0", "200", "400", "600", "800", "1,000"]);
    // The tick marks are one path: a 5 px downward stroke at each tick's x.
    const marks = attr(elements(svg, "path", "tick")[0]!, "d")!;
    expect([...marks.matchAll(/M([\d.]+) ([\d.]+)v5/g)].map((m) => Number(m[1]))).toEqual([
      50, 130, 210, 290, 370, 450,
    ]);
    // Without `grid`, no grid path; with it, one vertical line per tick across the plot.
    expect(elements(svg, "path", "grid-line")).toEqual([]);
    const grid = axisBottomSvg(x, area, { label: "reach", unit: "mm", ticks: 5, grid: true });
    const lines = [...attr(elements(grid, "path", "grid-line")[0]!, "d")!.matchAll(/M([\d.]+) ([\d.]+)V([\d.]+)/g)];
    expect(lines.map((m) => Number(m[1]))).toEqual([50, 130, 210, 290, 370, 450]);
    expect(lines.every((m) => Number(m[2]) === area.top && Number(m[3]) === area.top + area.height)).toBe(true);
  });

  it("labels decimals when the step needs them, with a true minus sign", () => {
    expect(tickDecimals([0, 1], 5)).toBe(1);
    expect(tickDecimals([0, 2000], 5)).toBe(0);
    expect(ticksOf(scaleLinear([-0.5, 0.5], [0, 1]), 4).map((t) => t.text)).toEqual([
      "\u22120.4",
      "\u22120.2",
      "0",
      "0.2",
      "0.4",
    ]);
  });

  it("turns the left axis title to read upward", () => {
    const svg = axisLeftSvg(scaleLinear([0, 10], [220, 20]), area, { label: "payload", unit: "kg" });
    const title = elements(svg, "text", "axis-label")[0]!;
    expect(attr(title, "transform")).toMatch(/^rotate\(-90 /);
    expect(texts(svg, "axis-label")).toEqual(["payload (kg)"]);
  });
});

describe("equalScale", () => {
  const margins = { top: 10, right: 10, bottom: 10, left: 10 };
  it("draws one millimetre the same length on both axes", () => {
    const l = equalScale([0, 1000], [0, 500], {
      widthPx: 520,
      maxHeightPx: 2000,
      minHeightPx: 100,
      margins,
      padShare: 0,
    });
    expect(l.pxPerUnit).toBeCloseTo(0.5, 12);
    expect(l.x(1000) - l.x(0)).toBeCloseTo(500, 9);
    expect(l.y(0) - l.y(500)).toBeCloseTo(250, 9);
    expect(l.heightPx).toBeCloseTo(270, 9);
  });
  it("fits tall data to the height limit and widens x about its centre", () => {
    const l = equalScale([0, 100], [0, 1000], {
      widthPx: 520,
      maxHeightPx: 520,
      minHeightPx: 100,
      margins,
      padShare: 0,
    });
    expect(l.pxPerUnit).toBeCloseTo(0.5, 12);
    expect(l.x(50)).toBeCloseTo(10 + 250, 9); // centre of the data at the centre of the plot
    expect(l.y(1000)).toBeCloseTo(10, 9);
  });
  it("narrows the chart to the data down to minWidthPx", () => {
    const l = equalScale([0, 100], [0, 1000], {
      widthPx: 520,
      maxHeightPx: 520,
      minHeightPx: 100,
      margins,
      padShare: 0,
      minWidthPx: 200,
    });
    expect(l.widthPx).toBe(200);
    expect(l.pxPerUnit).toBeCloseTo(0.5, 12);
  });
});
