/**
 * Tests of src/core/analysis/speedMap/loci.ts (traceSingularityLoci) on synthetic sheets whose det field is given in
 * closed form, so the zero set is known exactly: marching squares interpolates linearly along cell edges, which is
 * exact for a field linear in r and z (Lorensen & Cline 1987 [from memory]).
 */
import { describe, expect, it } from "vitest";
import { traceSingularityLoci } from "../../../../src/core/analysis/speedMap/loci";
import type { SheetData } from "../../../../src/core/analysis/speedMap/types";

/** One sheet with one slot per cell on an nx × ny grid (10 mm, origin 0), det(r, z) from `field`. */
function sheetOf(nx: number, ny: number, field: (rMm: number, zMm: number) => number): SheetData {
  const cells = nx * ny;
  const det = new Float64Array(cells);
  for (let iy = 0; iy < ny; iy++) for (let ix = 0; ix < nx; ix++) det[ix + iy * nx] = field(10 * ix, 10 * iy);
  return {
    grid: { nx, ny, rMinMm: 0, zMinMm: 0, stepMm: 10 },
    slots: 1,
    count: new Uint8Array(cells).fill(1),
    sheet: new Int32Array(cells),
    det,
    joints: new Float64Array(cells),
    jointsAt: Int32Array.from({ length: cells }, (_, i) => i),
    m: 1,
    maxCornerJump: 0.6,
    kindAt: () => "elbow",
  };
}

describe("traceSingularityLoci", () => {
  it("a det field linear in r (det = r − 15 mm) gives the straight line r = 15 mm over the grid's height", () => {
    const loci = traceSingularityLoci(sheetOf(4, 4, (r) => r - 15));
    expect(loci.map((l) => l.kind)).toEqual(["elbow"]);
    const points = loci[0]!.polylinesMm.flat();
    // Closed form: the zero set of r − 15 is the vertical line r = 15, z ∈ [0, 30] (the grid's extent).
    for (const [r] of points) expect(r).toBeCloseTo(15, 12);
    const zs = points.map((p) => p[1]);
    expect(Math.min(...zs)).toBe(0);
    expect(Math.max(...zs)).toBe(30);
    expect(loci[0]!.polylinesMm).toHaveLength(1);
  });

  it("a diagonal field det = (r + z) − 25 mm gives points on the line r + z = 25", () => {
    const loci = traceSingularityLoci(sheetOf(5, 5, (r, z) => r + z - 25));
    const points = loci.flatMap((l) => l.polylinesMm.flat());
    expect(points.length).toBeGreaterThan(2);
    for (const [r, z] of points) expect(r + z).toBeCloseTo(25, 12);
  });

  it("a field that only touches zero at nodes (det = |r − 10| ≥ 0) has no crossing and no locus", () => {
    expect(traceSingularityLoci(sheetOf(4, 4, (r) => Math.abs(r - 10)))).toEqual([]);
  });

  it("corners on different sheets are not joined: no locus across a sheet boundary", () => {
    const data = sheetOf(4, 4, (r) => r - 15);
    const sheet = Int32Array.from({ length: 16 }, (_, i) => (i % 4 < 2 ? 0 : 1));
    expect(traceSingularityLoci({ ...data, sheet })).toEqual([]);
  });
});
