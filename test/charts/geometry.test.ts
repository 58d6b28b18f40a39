import { scaleLinear } from "d3-scale";
import { describe, expect, it } from "vitest";
import {
  dilateGrid,
  gridBands,
  polygonsPath,
  polylinesPath,
  presentRegion,
  simplifyPolyline,
  simplifyRing,
} from "../../src/charts/geometry";
import { bounds, pathPoints, subpaths } from "./helpers";

describe("simplification", () => {
  it("drops points closer than the tolerance to the line and keeps the ends", () => {
    expect(
      simplifyPolyline(
        [
          [0, 0],
          [1, 0.01],
          [2, 0],
        ],
        0.1,
      ),
    ).toEqual([
      [0, 0],
      [2, 0],
    ]);
    expect(
      simplifyPolyline(
        [
          [0, 0],
          [1, 1],
          [2, 0],
        ],
        0.1,
      ),
    ).toEqual([
      [0, 0],
      [1, 1],
      [2, 0],
    ]);
  });
  it("keeps the corners of a closed square with extra points on its sides", () => {
    const ring: [number, number][] = [
      [0, 0],
      [5, 0],
      [10, 0],
      [10, 5],
      [10, 10],
      [5, 10],
      [0, 10],
      [0, 5],
      [0, 0],
    ];
    const s = simplifyRing(ring, 0.1);
    expect(s).toHaveLength(4);
    expect(bounds(s)).toEqual([0, 10, 0, 10]);
  });
});

describe("paths", () => {
  const x = scaleLinear([0, 100], [0, 200]);
  const y = scaleLinear([0, 100], [200, 0]);
  it("writes each ring of a polygon as a closed subpath in pixels", () => {
    const d = polygonsPath(
      [
        {
          outer: [
            [0, 0],
            [100, 0],
            [100, 100],
            [0, 100],
            [0, 0],
          ],
          holes: [
            [
              [25, 25],
              [25, 75],
              [75, 75],
              [75, 25],
              [25, 25],
            ],
          ],
        },
      ],
      x,
      y,
    );
    expect(subpaths(d)).toBe(2);
    expect((d.match(/Z/g) ?? []).length).toBe(2);
    expect(bounds(pathPoints(d))).toEqual([0, 200, 0, 200]);
  });
  it("writes polylines with one decimal at most", () => {
    const d = polylinesPath(
      [
        [
          [0, 0],
          [33.333, 33.333],
        ],
        [
          [50, 50],
          [60, 60],
        ],
      ],
      x,
      y,
    );
    expect(subpaths(d)).toBe(2);
    expect(d).toContain("66.7");
    expect(d).not.toMatch(/\d\.\d\d/);
  });
});

describe("gridBands", () => {
  const grid = { nx: 3, ny: 3, rMinMm: 0, zMinMm: 0, stepMm: 10 };
  it("outlines the valid cells on their borders (nodes at r = rMin + ix·step), corners cut", () => {
    const lone = presentRegion(grid, [null, null, null, null, 5, null, null, null, null]);
    expect(lone).toHaveLength(1);
    expect(bounds(lone[0]!.outer)).toEqual([5, 15, 5, 15]);
    const block = presentRegion(grid, [null, null, null, null, 5, 5, null, 5, 5]);
    expect(bounds(block[0]!.outer)).toEqual([5, 25, 5, 25]); // nodes at 10 and 20 mm: borders at 5 and 25 mm, also at the grid edge
  });
  it("spreads values one cell into the null neighbours (mean of the valid 8-neighbours)", () => {
    const out = dilateGrid({ nx: 3, ny: 1, rMinMm: 0, zMinMm: 0, stepMm: 10 }, [null, 4, null]);
    expect(out).toEqual([4, 4, 4]);
    const two = dilateGrid({ nx: 3, ny: 1, rMinMm: 0, zMinMm: 0, stepMm: 10 }, [2, null, 6]);
    expect(two).toEqual([2, 4, 6]);
  });
  it("puts a band edge between cell centres by linear interpolation", () => {
    const values = [0, 10, 20, 0, 10, 20, 0, 10, 20];
    const [band] = gridBands(grid, values, [15]);
    const [x0, x1] = bounds(band!.polygons[0]!.outer);
    expect(x0).toBeCloseTo(15, 9); // halfway between the nodes at 10 mm (value 10) and 20 mm (value 20)
    expect(x1).toBeCloseTo(25, 9); // the last column's square ends half a step past its node
  });
  it("rejects a value array of the wrong length", () => {
    expect(() => gridBands(grid, [1, 2], [0])).toThrow(RangeError);
  });
});
