/**
 * The raster-to-polygon steps of the workspace envelope on hand-made inputs with known answers: the outline of a
 * RowCover keeps every interval (coverOutline.ts), the scanline fill keeps the parts of a region that lie between
 * two row lines (sliceCover.ts) (polygon assembly: test/core/geometry/polygon.test.ts). Each case was a stage where the property tests (test/fuzz) saw reachable points fall out of the
 * side view. Containment is checked with the winding-number test and edge distance of test/fuzz/properties.ts,
 * written independently of src/core/geometry/polygon.ts.
 */
import { describe, expect, it } from "vitest";
import { coverRings } from "../../../../src/core/analysis/envelope/coverOutline";
import { RowCover } from "../../../../src/core/analysis/envelope/rowCover";
import { addTriangles } from "../../../../src/core/analysis/envelope/sliceCover";
import { SliceScratch } from "../../../../src/core/analysis/envelope/sliceScratch";
import { distanceToBoundary, windingNumber } from "../../../fuzz/properties";

type Ring = [number, number][];

/** Flat open ring → closed point ring. */
function closed(flat: Float64Array): Ring {
  const out: Ring = [];
  for (let k = 0; k < flat.length; k += 2) out.push([flat[k]!, flat[k + 1]!]);
  out.push(out[0]!);
  return out;
}

/** Inside the union of the rings (non-zero total winding), or within `slackMm` of one of their edges. */
function covered(x: number, y: number, rings: readonly Ring[], slackMm: number): boolean {
  let w = 0;
  for (const r of rings) w += windingNumber(x, y, r);
  if (w !== 0) return true;
  return (
    distanceToBoundary(
      x,
      y,
      rings.map((r) => ({ outer: r, holes: [] })),
    ) <= slackMm
  );
}

describe("coverRings", () => {
  it("outlines intervals narrower than the node spacing, and a single point, instead of dropping them", () => {
    // Rows 10 mm apart, nodes 10 mm apart along x. Before the fix an interval with no node strictly inside it lay
    // between two nodes of negative value and had no outline at all (property tests: a thin part of the region, or
    // a point that does not move, vanished from the side view).
    const cover = new RowCover(0, 10);
    cover.add(0, 3.2, 3.9);
    cover.add(3, 100, 100);
    cover.add(6, 41, 47);
    const rings = coverRings(cover, 10).map(closed);
    expect(rings.length).toBeGreaterThanOrEqual(3);
    // closed form: the intervals themselves (end points lie on the outline, so 1e-9 mm of slack)
    for (const [x, y] of [
      [3.2, 0],
      [3.55, 0],
      [3.9, 0],
      [100, 30],
      [41, 60],
      [44, 60],
      [47, 60],
    ] as const) {
      expect(covered(x, y, rings, 1e-9), `(${x}, ${y})`).toBe(true);
    }
  });

  it("still places the outline of a wide interval exactly at its ends along the row", () => {
    // A 3-row block [20, 180] × rows 0…2: along each row the crossings are exact (the interval ends).
    const cover = new RowCover(0, 10);
    for (let j = 0; j <= 2; j++) cover.add(j, 20, 180);
    const rings = coverRings(cover, 7).map(closed);
    expect(rings).toHaveLength(1);
    for (const [x, y] of rings[0]!) {
      if (y === 10) expect(Math.min(Math.abs(x - 20), Math.abs(x - 180))).toBeLessThan(1e-9);
    }
  });
});

describe("addTriangles (scanline fill)", () => {
  it("keeps a thin triangle lying between two row lines", () => {
    // Rows at y = 0 and 10 mm; the triangle (0, 1), (100, 9), (100, 9.5) crosses no row line, so filling rows by
    // their sections left nothing. Every point of the region must now be within half a row (5 mm) of the outline's
    // interior: the band of each row holds the region's part within it.
    const cover = new RowCover(0, 10);
    const tri = Float64Array.of(0, 1, 0, 100, 9, 0, 100, 9.5, 0);
    addTriangles(cover, tri, 1, false, new SliceScratch());
    const rings = coverRings(cover, 10).map(closed);
    expect(rings.length).toBeGreaterThan(0);
    // closed form: points of the triangle by barycentric coordinates
    for (let a = 0; a <= 10; a++) {
      for (let b = 0; a + b <= 10; b++) {
        const c = 10 - a - b;
        const x = (a * 0 + b * 100 + c * 100) / 10,
          y = (a * 1 + b * 9 + c * 9.5) / 10;
        expect(covered(x, y, rings, 5 + 1e-9), `(${x.toFixed(1)}, ${y.toFixed(2)})`).toBe(true);
      }
    }
  });

  it("keeps a thin slanted strip connected across rows", () => {
    // A strip 1 mm wide from (0, 0) to (400, 95) (two triangles): its row sections are 1 mm × 400/95 long pieces
    // 42 mm apart from row to row, which the outline drew as separate specks; points midway between rows were
    // 20 mm and more outside. Now every point of the strip is within half a row of the outline (closed form: the
    // strip's own points).
    const cover = new RowCover(0, 10);
    const tris = Float64Array.of(0, 0, 0, 400, 95, 0, 400, 96, 0, 0, 0, 0, 400, 96, 0, 0, 1, 0);
    addTriangles(cover, tris, 2, false, new SliceScratch());
    const rings = coverRings(cover, 7).map(closed);
    for (let t = 0; t <= 200; t++) {
      const x = 2 * t,
        y = (95 * x) / 400 + 0.5;
      expect(covered(x, y, rings, 5 + 1e-9), `(${x}, ${y.toFixed(2)})`).toBe(true);
    }
  });
});
