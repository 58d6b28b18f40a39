/**
 * sliceRows (segment + flush) on hand-made outlines: every row j must hold the projection onto the row of the
 * region's part within its band |y − y_j| ≤ dy/2 (module doc). References: a rectangle worked by hand, and for
 * random convex polygons the band projection computed independently by Sutherland–Hodgman clipping (Sutherland &
 * Hodgman, CACM 17(1), 1974) of the polygon to the band, whose x-extent is the projection of a convex set.
 */
import { describe, expect, it } from "vitest";
import { RowCover } from "../../../../src/core/analysis/envelope/rowCover";
import { flush, segment } from "../../../../src/core/analysis/envelope/sliceRows";
import { SliceScratch } from "../../../../src/core/analysis/envelope/sliceScratch";
import { expectClose } from "../../../helpers/expectClose";
import { mulberry32, uniform } from "../../../helpers/prng";

type Pt = [number, number];

/** Feeds the closed outline pts (multiplicity m per edge) into the scratch and flushes it into the cover. */
function fill(cover: RowCover, outlines: { pts: Pt[]; m: number }[], s = new SliceScratch()): RowCover {
  for (const { pts, m } of outlines) {
    const px = Float64Array.from(pts.map((p) => p[0])),
      py = Float64Array.from(pts.map((p) => p[1]));
    for (let i = 0; i < pts.length; i++) segment(s, cover, px, py, i, (i + 1) % pts.length, m);
  }
  flush(s, cover);
  return cover;
}

function rowsOf(cover: RowCover): Map<number, number[]> {
  const out = new Map<number, number[]>();
  for (let j = cover.jMin; j <= cover.jMax; j++) {
    const n = cover.lengthOf(j);
    if (n > 0) out.set(j, Array.from(cover.valuesOf(j).subarray(0, n)));
  }
  return out;
}

/** Intervals [s0, e0, s1, e1, …] with gaps narrower than gapMm merged. */
function closed(row: number[], gapMm: number): number[] {
  const out: number[] = [];
  for (let k = 0; k < row.length; k += 2) {
    if (out.length > 0 && row[k]! - out[out.length - 1]! < gapMm) out[out.length - 1] = row[k + 1]!;
    else out.push(row[k]!, row[k + 1]!);
  }
  return out;
}

/** Sutherland–Hodgman clip of a polygon by the half-plane sign·(y − c) ≤ 0. */
function clipY(poly: Pt[], c: number, sign: 1 | -1): Pt[] {
  const out: Pt[] = [];
  for (let k = 0; k < poly.length; k++) {
    const p = poly[k]!,
      q = poly[(k + 1) % poly.length]!;
    const fp = sign * (p[1] - c),
      fq = sign * (q[1] - c);
    if (fp <= 0) out.push(p);
    if ((fp < 0 && fq > 0) || (fp > 0 && fq < 0)) {
      const t = fp / (fp - fq);
      out.push([p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])]);
    }
  }
  return out;
}

/** x-extent of a convex polygon within the band of row j (null when it misses the band). */
function bandProjection(poly: Pt[], y0: number, dy: number, j: number): [number, number] | null {
  const yj = y0 + j * dy;
  const clipped = clipY(clipY(poly, yj + dy / 2, 1), yj - dy / 2, -1);
  if (clipped.length === 0) return null;
  const xs = clipped.map((p) => p[0]);
  return [Math.min(...xs), Math.max(...xs)];
}

describe("sliceRows: band projections", () => {
  it("a rectangle [10, 50] × [3, 27] with dy = 10 fills rows 0 … 3 with [10, 50] (hand-worked)", () => {
    const rect: Pt[] = [
      [10, 3],
      [50, 3],
      [50, 27],
      [10, 27],
    ];
    const got = rowsOf(fill(new RowCover(0, 10), [{ pts: rect, m: 1 }]));
    // bands [−5, 5], [5, 15], [15, 25], [25, 35] all meet y ∈ [3, 27]; band [−15, −5] and [35, 45] do not
    expect([...got.keys()]).toEqual([0, 1, 2, 3]);
    for (const v of got.values()) expectClose(v, [10, 50], 1e-12, "row");
  });

  it("random convex polygons (counter-clockwise) agree with the clipped band projection", () => {
    const rand = mulberry32(23);
    for (let trial = 0; trial < 200; trial++) {
      // convex polygon: points on an ellipse at sorted random angles (counter-clockwise)
      const n = 3 + Math.floor(uniform(rand, 0, 6));
      const cx = uniform(rand, -100, 100),
        cy = uniform(rand, -100, 100),
        rx = uniform(rand, 1, 80),
        ry = uniform(rand, 1, 80);
      const angles = Array.from({ length: n }, () => uniform(rand, 0, 2 * Math.PI)).sort((a, b) => a - b);
      const poly: Pt[] = angles.map((t) => [cx + rx * Math.cos(t), cy + ry * Math.sin(t)]);
      const y0 = uniform(rand, -5, 5),
        dy = uniform(rand, 2, 15);
      const got = rowsOf(fill(new RowCover(y0, dy), [{ pts: poly, m: 1 }]));
      const ys = poly.map((p) => p[1]);
      const jLo = Math.floor((Math.min(...ys) - y0) / dy) - 1,
        jHi = Math.ceil((Math.max(...ys) - y0) / dy) + 1;
      for (let j = jLo; j <= jHi; j++) {
        const want = bandProjection(poly, y0, dy, j);
        const row = got.get(j);
        if (want === null || want[1] - want[0] < 1e-9) {
          // a band touched only at a point may or may not keep it; no interval may be wider than that
          if (row) expect(row[row.length - 1]! - row[0]!).toBeLessThan(1e-6);
          continue;
        }
        expect(row, `trial ${trial} row ${j}`).toBeDefined();
        // marks of two segments meeting at a vertex may leave a gap of a few ulps between them (the envelope closes
        // such gaps, RowCover.closeGaps); merged at 1e-9 mm
        expectClose(closed(row!, 1e-9), want, 1e-9, `trial ${trial} row ${j}`);
      }
      for (const j of got.keys()) expect(j >= jLo && j <= jHi).toBe(true);
    }
  });

  it("a clockwise outline given with multiplicity −1 fills like the counter-clockwise one", () => {
    const tri: Pt[] = [
      [0, 0],
      [40, 12],
      [5, 33],
    ];
    const cw = [...tri].reverse();
    const reversed = rowsOf(fill(new RowCover(0, 7), [{ pts: cw, m: -1 }]));
    for (let j = -1; j <= 6; j++) {
      const want = bandProjection(tri, 0, 7, j);
      // same reference as for counter-clockwise outlines: the clipped band projection
      if (want) expectClose(closed(reversed.get(j) ?? [], 1e-9), want, 1e-9, `row ${j}`);
      else expect(reversed.has(j)).toBe(false);
    }
  });

  it("two overlapping rectangles in one flush give their union; a hole inside a rectangle cancels its winding", () => {
    const a: Pt[] = [
      [0, 2],
      [30, 2],
      [30, 18],
      [0, 18],
    ];
    const b: Pt[] = [
      [20, 2],
      [60, 2],
      [60, 18],
      [20, 18],
    ];
    // union of [0, 30] and [20, 60] on rows 0 … 2 (bands [−5, 5], [5, 15], [15, 25] meet y ∈ [2, 18])
    const union = rowsOf(
      fill(new RowCover(0, 10), [
        { pts: a, m: 1 },
        { pts: b, m: 1 },
      ]),
    );
    expect([...union.keys()]).toEqual([0, 1, 2]);
    for (const v of union.values()) expectClose(v, [0, 60], 1e-12, "union");
    // a clockwise hole x ∈ [25, 40] spanning y ∈ [−10, 40] (beyond every band) cuts b
    const hole: Pt[] = [
      [25, -10],
      [25, 40],
      [40, 40],
      [40, -10],
    ];
    const cut = rowsOf(
      fill(new RowCover(0, 10), [
        { pts: b, m: 1 },
        { pts: hole, m: 1 },
      ]),
    );
    // row 1 (band [5, 15], no end point of any edge in it, so no band marks): winding numbers by hand, +1 on
    // [20, 25) and (40, 60], 0 on (25, 40)
    expectClose(cut.get(1)!, [20, 25, 40, 60], 1e-12, "b minus hole, row 1");
  });

  it("adds to what the cover held: the union with earlier intervals", () => {
    const cover = new RowCover(0, 10);
    for (let j = 0; j <= 2; j++) cover.add(j, -20, 5);
    cover.add(1, 100, 120);
    const s = new SliceScratch();
    s.openWindow(cover, 0, 2);
    const rect: Pt[] = [
      [0, 2],
      [30, 2],
      [30, 18],
      [0, 18],
    ];
    const got = rowsOf(fill(cover, [{ pts: rect, m: 1 }], s));
    // hand-merged: [−20, 5] ∪ [0, 30] = [−20, 30]; row 1 keeps [100, 120]
    expectClose(got.get(0)!, [-20, 30], 1e-12, "row 0");
    expectClose(got.get(1)!, [-20, 30, 100, 120], 1e-12, "row 1");
    expectClose(got.get(2)!, [-20, 30], 1e-12, "row 2");
  });
});
