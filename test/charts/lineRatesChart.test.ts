/**
 * The joint-rate chart of the straight-line check: one path per joint through the given points, the limit rule at
 * ratio 1, the bottleneck marker where the data puts it, out-of-reach shading, values above the scale held at the
 * top edge, no style attribute, text escaped; the node tree and the string say the same.
 */
import { describe, expect, it } from "vitest";
import {
  lineRatesChart,
  lineRatesChartNode,
  svgNodeToString,
  type LineRatesChartInput,
  type SvgNode,
} from "../../src/charts/lineRatesChart";
import { attr, elements, pathPoints, texts } from "./helpers";

const input: LineRatesChartInput = {
  id: "lr-test",
  title: "Arm <A> & co: line",
  lengthMm: 400,
  speedMmPerS: 500,
  positionsMm: [0, 100, 200, 300, 400],
  series: [
    { joint: "J1", values: [0.2, 0.4, 0.8, 0.4, 0.2] },
    { joint: "J2", values: [0.1, null, 0.3, 0.3, 0.1] },
  ],
  bottleneck: { positionMm: 200, jointIndex: 0, rateRatio: 0.8, label: "bottleneck J1" },
  gapsMm: [],
  feasibleMmPerS: 625,
};

describe("lineRatesChart", () => {
  const chart = lineRatesChart(input, "Caption.");
  const svg = chart.svg;

  it("draws one path per joint, broken where a value is missing", () => {
    const paths = elements(svg, "path", "lr-joint");
    expect(paths.map((p) => attr(p, "data-joint"))).toEqual(["J1", "J2"]);
    expect(attr(paths[0]!, "class")).toBe("lr-joint lr-joint-0");
    const j1 = pathPoints(attr(paths[0]!, "d")!);
    expect(j1).toHaveLength(5);
    // x increases evenly (equal sample spacing), and the peak (0.8) is the highest point (smallest y).
    const dx = j1.map((p, i) => (i ? p[0] - j1[i - 1]![0] : 0)).slice(1);
    for (const d of dx) expect(d).toBeCloseTo(dx[0]!, 0);
    expect(Math.min(...j1.map((p) => p[1]))).toBe(j1[2]![1]);
    expect((attr(paths[1]!, "d")!.match(/M/g) ?? []).length).toBe(2);
  });

  it("puts the limit rule at ratio 1 and the bottleneck marker at its sample", () => {
    const limit = elements(svg, "line", "lr-limit").filter((l) => !attr(l, "class")!.includes("legend-line"));
    expect(limit).toHaveLength(1);
    const j1 = pathPoints(attr(elements(svg, "path", "lr-joint-0")[0]!, "d")!);
    const [c] = elements(svg, "circle", "lr-bottleneck");
    expect(Number(attr(c!, "cx"))).toBeCloseTo(j1[2]![0], 0);
    expect(Number(attr(c!, "cy"))).toBeCloseTo(j1[2]![1], 0);
    // y of ratio 1 vs ratio 0.8 and 0.4 (linear axis: equal steps in ratio, equal steps in px).
    const y1 = Number(attr(limit[0]!, "y1")),
      y08 = j1[2]![1],
      y04 = j1[1]![1];
    expect((y04 - y08) / 0.4).toBeCloseTo((y08 - y1) / 0.2, 0);
    expect(texts(svg, "mark-label")).toContain("bottleneck J1");
  });

  it("labels both axes with units and escapes text; no style attribute", () => {
    expect(texts(svg, "axis-label")).toEqual(["distance along the line (mm)", "needed rate at 500 mm/s (× limit)"]);
    expect(svg).toContain("Arm &lt;A&gt; &amp; co: line");
    expect(svg).not.toMatch(/\sstyle=/);
    expect(svg).toContain('role="img"');
    expect(chart.caption).toBe("Caption.");
  });

  it("holds values above the scale at the top edge and says so; shades out-of-reach stretches", () => {
    const tall = lineRatesChart(
      {
        ...input,
        series: [{ joint: "J1", values: [0.5, 9, 40, 9, 0.5] }],
        bottleneck: { positionMm: 200, jointIndex: 0, rateRatio: 40, label: "bottleneck J1" },
        gapsMm: [[300, 400]],
      },
      "",
    ).svg;
    const pts = pathPoints(attr(elements(tall, "path", "lr-joint-0")[0]!, "d")!);
    expect(pts[1]![1]).toBe(pts[2]![1]);
    expect(texts(tall, "mark-label").some((t) => t.includes("off the scale"))).toBe(true);
    expect(elements(tall, "rect", "lr-gap")).toHaveLength(1);
  });

  it("svgNodeToString writes a hand-made tree as the SVG written out by hand (escaped text and attributes, nesting)", () => {
    // Expected string written by hand from the XML rules (five specials escaped; no children: self-closing).
    const tree: SvgNode = {
      tag: "g",
      attrs: { class: "a&b", "data-x": 1.234, hidden: false },
      children: [
        { tag: "path", attrs: { d: "M0,0L1,1" } },
        { tag: "text", attrs: { x: 2 }, text: 'Arm <A> & "co"' },
        { tag: "title", attrs: {}, text: "x < y" },
      ],
    };
    expect(svgNodeToString(tree)).toBe(
      '<g class="a&amp;b" data-x="1.23"><path d="M0,0L1,1"/><text x="2">Arm &lt;A&gt; &amp; &quot;co&quot;</text>' +
        "<title>x &lt; y</title></g>",
    );
  });

  it("the node tree the browser draws holds the chart's data unescaped: one path per joint, the title as typed", () => {
    // The browser turns the tree into elements with d3's .text() / .attr() (which escape), so the tree itself must
    // carry raw text; walked here without svgNodeToString.
    const node: SvgNode = lineRatesChartNode(input);
    expect(node.tag).toBe("svg");
    const all: SvgNode[] = [];
    const walk = (n: SvgNode) => {
      all.push(n);
      for (const c of n.children ?? []) walk(c);
    };
    walk(node);
    const joints = all.filter(
      (n) =>
        n.tag === "path" &&
        String(n.attrs.class ?? "")
          .split(" ")
          .includes("lr-joint"),
    );
    expect(joints.map((n) => n.attrs["data-joint"])).toEqual(["J1", "J2"]);
    expect(all.some((n) => n.text === "Arm <A> & co: line")).toBe(true);
    expect(all.some((n) => (n.text ?? "").includes("&amp;"))).toBe(false);
    // J1's path through the tree has the five samples of the data, its peak (0.8) highest.
    const j1 = pathPoints(String(joints[0]!.attrs.d));
    expect(j1).toHaveLength(5);
    expect(Math.min(...j1.map((p) => p[1]))).toBe(j1[2]![1]);
  });

  it("rejects what it cannot draw", () => {
    expect(() => lineRatesChartNode({ ...input, lengthMm: 0 })).toThrow(RangeError);
    expect(() => lineRatesChartNode({ ...input, series: [{ joint: "J1", values: [1] }] })).toThrow(RangeError);
    expect(() => lineRatesChartNode({ ...input, id: "1 bad" })).toThrow(RangeError);
  });
});
