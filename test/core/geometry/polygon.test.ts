/**
 * Polygon assembly and simplification on hand-made rings with known answers: assemblePolygons never drops an outer
 * ring and drops only narrow holes; simplifyFlatRing keeps a ring a ring. (These were stages where the property tests
 * in test/fuzz saw reachable points fall out of the envelope's side view.)
 */
import { describe, expect, it } from "vitest";
import { assemblePolygons, polygonsArea, simplifyFlatRing } from "../../../src/core/geometry/polygon";

describe("assemblePolygons and simplifyFlatRing", () => {
  const square = (x0: number, y0: number, s: number, ccw = true) =>
    ccw
      ? Float64Array.of(x0, y0, x0 + s, y0, x0 + s, y0 + s, x0, y0 + s)
      : Float64Array.of(x0, y0, x0, y0 + s, x0 + s, y0 + s, x0 + s, y0);

  it("keeps an outer ring below the area threshold (dropping it would lose reachable points)", () => {
    const polygons = assemblePolygons([square(0, 0, 1)], 9);
    expect(polygons).toHaveLength(1);
    // elementary geometry: a 1 mm square has 1 mm²
    expect(polygonsArea(polygons)).toBeCloseTo(1, 12);
  });

  it("drops holes narrower than minHoleMm (by 2·area/perimeter), however long, and keeps wide ones", () => {
    // 500 mm square; a 2 mm × 300 mm sliver hole (width 2·600/604 ≈ 1.99 mm) and a 50 mm square hole (width 25 mm)
    const sliver = Float64Array.of(100, 100, 100, 102, 400, 102, 400, 100);
    const polygons = assemblePolygons([square(0, 0, 500), sliver, square(200, 300, 50, false)], 1, 10);
    expect(polygons).toHaveLength(1);
    expect(polygons[0]!.holes).toHaveLength(1);
    // elementary geometry: 500² − 50² mm²
    expect(polygonsArea(polygons)).toBeCloseTo(500 * 500 - 50 * 50, 6);
  });

  it("reports the area of the holes it fills, so the set as drawn has a known area", () => {
    // elementary geometry: the 2 mm × 300 mm sliver hole has 600 mm²; the 50 mm square hole is kept
    const sliver = Float64Array.of(100, 100, 100, 102, 400, 102, 400, 100);
    const filled = { areaMm2: 0 };
    assemblePolygons([square(0, 0, 500), sliver, square(200, 300, 50, false)], 1, 10, filled);
    expect(filled.areaMm2).toBeCloseTo(600, 9);
  });

  it("keeps at least three points of a ring thinner than the simplification distance", () => {
    // a 0.5 mm thick sliver 100 mm long, simplified with epsilon 2 mm: Douglas–Peucker alone keeps its two anchors
    const flat = Float64Array.of(0, 0, 25, 0.1, 50, 0.2, 75, 0.3, 100, 0.4, 100, 0.9, 50, 0.7, 0, 0.5);
    const out = simplifyFlatRing(flat, 2);
    expect(out.length / 2).toBeGreaterThanOrEqual(3);
  });
});
