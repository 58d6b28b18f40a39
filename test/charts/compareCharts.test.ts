/**
 * Side-by-side overlay charts (src/charts/compareCharts.ts): one outline per arm with its own line style, a legend
 * entry per arm, one scale on both axes (a 1000 mm square is as many pixels wide as high: equal aspect, checked on
 * the path's own coordinates), payload curves placed by the axis ticks' own positions (linear map through two tick
 * marks, worked by hand), accessible name and description present.
 */
import { describe, expect, it } from "vitest";
import { envelopeOverlayNode, payloadOverlayNode } from "../../src/charts/compareCharts";
import { svgNodeToString } from "../../src/charts/nodes";
import { attr, elements, pathPoints, texts } from "./helpers";

const square = (a: number, b: number) =>
  [
    [a, a],
    [b, a],
    [b, b],
    [a, b],
    [a, a],
  ] as [number, number][];

describe("envelopeOverlayNode", () => {
  const svg = svgNodeToString(
    envelopeOverlayNode({
      id: "cmp-env",
      pointWords: "wrist centre point",
      arms: [
        { id: "a", name: "Arm A", polygons: [{ outer: square(0, 1000), holes: [] }] },
        { id: "b", name: "Arm B", polygons: [{ outer: square(200, 600), holes: [] }] },
        {
          id: "c",
          name: "Arm C",
          polygons: [{ outer: square(-300, 300), holes: [] }],
          note: "(flange centre: no WCP)",
        },
      ],
      band: { rMm: [100, 400], zMm: [100, 300] },
    }),
  );

  it("draws one path per arm, each with its own series class, and a legend entry per arm", () => {
    const paths = elements(svg, "path", "env-overlay");
    expect(paths.map((p) => attr(p, "data-arm"))).toEqual(["a", "b", "c"]);
    expect(new Set(paths.map((p) => attr(p, "class"))).size).toBe(3);
    expect(elements(svg, "g", "legend-item").filter((g) => attr(g, "data-key") !== null)).toHaveLength(3);
    expect(texts(svg, "legend-label")).toContain("Arm C (flange centre: no WCP)");
    expect(elements(svg, "rect", "need-band").filter((t) => !attr(t, "class")!.includes("legend-swatch"))).toHaveLength(
      1,
    );
    expect(attr(elements(svg, "svg")[0]!, "aria-label")).toBe("Reach envelopes, side view: wrist centre point");
  });

  it("keeps one scale on both axes: the 1000 mm square is square in pixels", () => {
    const pts = pathPoints(attr(elements(svg, "path", "env-overlay")[0]!, "d")!);
    const xs = pts.map((p) => p[0]),
      ys = pts.map((p) => p[1]);
    const w = Math.max(...xs) - Math.min(...xs),
      h = Math.max(...ys) - Math.min(...ys);
    expect(w).toBeGreaterThan(100);
    expect(Math.abs(w - h)).toBeLessThan(0.3); // path coordinates carry one decimal
  });

  it("refuses more arms than line styles", () => {
    const arm = { id: "x", name: "X", polygons: [{ outer: square(0, 1), holes: [] }] };
    expect(() => envelopeOverlayNode({ id: "e", pointWords: "x", arms: Array(7).fill(arm) })).toThrow(RangeError);
  });
});

describe("payloadOverlayNode", () => {
  it("places the rows by the axis scale and breaks the line where a row is out of reach", () => {
    const svg = svgNodeToString(
      payloadOverlayNode({
        id: "cmp-pay",
        offsetMm: 0,
        arms: [
          { id: "a", name: "A", reachMm: [100, 200, 300, 400], payloadKg: [8, 6, null, 4] },
          { id: "b", name: "B", reachMm: [100, 200], payloadKg: [5, 5] },
        ],
        needKg: 7,
      }),
    );
    const paths = elements(svg, "path", "series");
    expect(paths.map((p) => attr(p, "data-arm"))).toEqual(["a", "b"]);
    const d = attr(paths[0]!, "d")!;
    // A null row splits the path into two subpaths (two M commands).
    expect(d.match(/M/g)).toHaveLength(2);
    // Tick positions give the scale: x of the "0" and "400" ticks (bottom axis), y of "0" and "8" (left axis).
    const tickX = (label: string) => {
      const m = svg.match(
        new RegExp(`<text class="tick-label" x="([\\d.]+)" y="[\\d.]+" text-anchor="middle">${label}</text>`),
      );
      return Number(m![1]);
    };
    const tickY = (label: string) => {
      const m = svg.match(
        new RegExp(`<text class="tick-label" x="[\\d.]+" y="([\\d.]+)" text-anchor="end">${label}</text>`),
      );
      return Number(m![1]) - 4; // labels sit 4 px below their tick
    };
    const x = (mm: number) => tickX("0") + ((tickX("400") - tickX("0")) * mm) / 400;
    const y = (kg: number) => tickY("0") + ((tickY("8") - tickY("0")) * kg) / 8;
    const first = pathPoints(d)[0]!;
    expect(first[0]).toBeCloseTo(x(100), 0);
    expect(first[1]).toBeCloseTo(y(8), 0);
    expect(elements(svg, "line", "need-rule").filter((t) => !attr(t, "class")!.includes("legend-line"))).toHaveLength(
      1,
    );
    expect(texts(svg, "legend-label")).toContain("needed 7 kg");
  });
});
