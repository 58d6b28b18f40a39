/**
 * Marching squares (src/core/geometry/isolines.ts) against closed forms: a disc (area πR², vertex radii bounded by
 * the linear-interpolation error of a quadratic), a square level set whose vertices are worked by hand, a linear
 * field (linear interpolation of a linear function is exact), and a periodic band.
 */
import { describe, expect, it } from "vitest";
import { isolineRings } from "../../../src/core/geometry/isolines";
import { expectClose } from "../../helpers/expectClose";

type Field = (i: number, j: number) => number;

function fullSource(nx: number, jMin: number, jMax: number, value: Field, periodicX = false) {
  return {
    nx,
    jMin,
    jMax,
    periodicX,
    cells: (_j: number, out: number[]) => {
      out.push(periodicX ? 0 : -1, nx - 1);
    },
    value,
  };
}

/** Shoelace signed area (Gauss's area formula), positive for counter-clockwise rings with y up. */
function signedArea(ring: ArrayLike<number>): number {
  let s = 0;
  const n = ring.length / 2;
  for (let k = 0; k < n; k++) {
    const m = (k + 1) % n;
    s += ring[2 * k]! * ring[2 * m + 1]! - ring[2 * m]! * ring[2 * k + 1]!;
  }
  return s / 2;
}

describe("isolineRings: disc", () => {
  const R = 20,
    c = 32;
  const disc: Field = (i, j) => R * R - (i - c) ** 2 - (j - c) ** 2;
  const rings = isolineRings(fullSource(65, 0, 64, disc));

  it("gives one counter-clockwise ring whose area is close to πR²", () => {
    expect(rings.length).toBe(1);
    const a = signedArea(rings[0]!);
    expect(a).toBeGreaterThan(0); // inside on the left ⇒ counter-clockwise (module contract, y up)
    // closed form, with a hand bound: every vertex lies in R² − 1/4 ≤ r² ≤ R² (next test) and every edge lies in one
    // cell (length ≤ √2), so the ring lies inside the disc of radius R and encloses the disc of radius
    // √(R² − 1/4 − (√2/2)²) = √(R² − 3/4): π(R² − 3/4) ≤ area ≤ πR².
    expect(a).toBeLessThanOrEqual(Math.PI * R * R);
    expect(a).toBeGreaterThanOrEqual(Math.PI * (R * R - 0.75));
  });

  it("puts every vertex within the interpolation-error annulus of the circle", () => {
    // Hand bound: along a grid edge f = R² − r² has second derivative −2, so its linear interpolant on a unit edge
    // lies below f by at most (2/2)·(1/2)·(1/2) = 1/4. At an interpolated zero, 0 ≤ f_true ≤ 1/4, hence
    // R² − 1/4 ≤ r² ≤ R².
    const ring = rings[0]!;
    expect(ring.length).toBeGreaterThan(40);
    for (let k = 0; k < ring.length; k += 2) {
      const r2 = (ring[k]! - c) ** 2 + (ring[k + 1]! - c) ** 2;
      expect(r2).toBeLessThanOrEqual(R * R + 1e-9);
      expect(r2).toBeGreaterThanOrEqual(R * R - 0.25 - 1e-9);
    }
  });

  it("annulus: an outer counter-clockwise and an inner clockwise ring, net area π(R² − r²)", () => {
    const r = 8;
    const annulus: Field = (i, j) => {
      const d2 = (i - c) ** 2 + (j - c) ** 2;
      return Math.min(R * R - d2, d2 - r * r);
    };
    const rs = isolineRings(fullSource(65, 0, 64, annulus));
    expect(rs.length).toBe(2);
    const areas = rs.map(signedArea).sort((p, q) => p - q);
    expect(areas[0]).toBeLessThan(0); // hole boundary: inside (the ring) on the left ⇒ clockwise
    expect(areas[1]).toBeGreaterThan(0);
    // closed form: annulus area π(R² − r²)
    const net = areas[0]! + areas[1]!;
    expect(Math.abs(net - Math.PI * (R * R - r * r)) / (Math.PI * (R * R - r * r))).toBeLessThan(0.01);
  });
});

describe("isolineRings: hand-worked square level set", () => {
  // f = 2.5 − max(|i − 5|, |j − 5|): on every crossed grid edge f is linear (|i − 5| or |j − 5| dominates on the
  // whole unit edge), so the crossings are exactly at ±2.5 from the centre. Corner cells (e.g. nodes (7,7) inside,
  // (8,7), (8,8), (7,8) outside) cut the corner by the segment (7.5, 7) → (7, 7.5).
  const f: Field = (i, j) => 2.5 - Math.max(Math.abs(i - 5), Math.abs(j - 5));
  const rings = isolineRings(fullSource(11, 0, 10, f));

  it("gives the 5 × 5 square less four corner triangles of area 1/8: 25 − 1/2", () => {
    expect(rings.length).toBe(1);
    // hand-worked: 5·5 − 4·(½·½·½) = 24.5
    expectClose(signedArea(rings[0]!), 24.5, 1e-12, "square area");
  });

  it("has exactly the hand-listed vertex set", () => {
    const got = new Set<string>();
    const ring = rings[0]!;
    for (let k = 0; k < ring.length; k += 2) got.add(`${ring[k]},${ring[k + 1]}`);
    // hand-worked: five crossings on each side, x = 2.5 / 7.5 on rows 3 … 7 and y = 2.5 / 7.5 on columns 3 … 7
    // (the ones on rows/columns 3 and 7 are the ends of the corner cuts, e.g. (7.5, 7) and (7, 7.5))
    const want = new Set<string>();
    for (let t = 3; t <= 7; t++) {
      want.add(`2.5,${t}`);
      want.add(`7.5,${t}`);
      want.add(`${t},2.5`);
      want.add(`${t},7.5`);
    }
    expect(got).toEqual(want);
    expect(ring.length / 2).toBe(want.size); // open ring: no repeated point
  });

  it("a source that lists only the cells near the boundary gives the same ring", () => {
    const sparse = {
      ...fullSource(11, 0, 10, f),
      cells: (j: number, out: number[]) => {
        if (j < 2 || j > 7) return;
        if (j === 2 || j === 7) out.push(2, 7);
        else out.push(7, 7, 2, 2); // unsorted ranges, as the contract allows
      },
    };
    const rs = isolineRings(sparse);
    expect(rs.length).toBe(1);
    expectClose(signedArea(rs[0]!), 24.5, 1e-12, "square area from sparse cells");
  });
});

describe("isolineRings: linear field", () => {
  // Linear interpolation of a linear function along an edge is exact, so every crossing strictly inside the grid
  // lies on the line 0.371 + 0.21·x − 0.13·y = 0. No node is on the line (371 + 210i − 130j is odd), so no segment
  // is degenerate.
  const f: Field = (i, j) => 0.371 + 0.21 * i - 0.13 * j;
  const nx = 20,
    jMax = 30;
  const rings = isolineRings(fullSource(nx, 0, jMax, f));

  it("puts every interior crossing on the line", () => {
    expect(rings.length).toBe(1);
    let onLine = 0;
    const ring = rings[0]!;
    for (let k = 0; k < ring.length; k += 2) {
      const x = ring[k]!,
        y = ring[k + 1]!;
      if (x > 0 && x < nx - 1 && y > 0 && y < jMax) {
        expectClose(f(x, y), 0, 1e-12, `f at (${x}, ${y})`);
        onLine++;
      }
    }
    // the line y = (0.371 + 0.21x)/0.13 crosses columns 0 … 16 inside the rows, about 1.6 + 1 crossings each
    expect(onLine).toBeGreaterThan(20);
  });

  it("the inside (f > 0) is on the left of the ring", () => {
    // Walk each segment; its left normal (−dy, dx) points towards increasing f: ∇f = (0.21, −0.13).
    const ring = rings[0]!;
    const n = ring.length / 2;
    for (let k = 0; k < n; k++) {
      const m = (k + 1) % n;
      const x0 = ring[2 * k]!,
        y0 = ring[2 * k + 1]!,
        x1 = ring[2 * m]!,
        y1 = ring[2 * m + 1]!;
      const inside = (p: number, q: number) => p > 0 && p < nx - 1 && q > 0 && q < jMax;
      if (!inside(x0, y0) || !inside(x1, y1)) continue;
      const dx = x1 - x0,
        dy = y1 - y0;
      expect(-dy * 0.21 + dx * -0.13).toBeGreaterThan(0);
    }
  });
});

describe("isolineRings: periodic in x", () => {
  // f = 2.5 − |j − 5| does not depend on i: a band around the cylinder, bounded by the rows y = 2.5 and y = 7.5
  // (exact: linear on every crossed vertical edge).
  const f: Field = (_i, j) => 2.5 - Math.abs(j - 5);

  it("periodic: two rings, one on each row of the band, each spanning the full period", () => {
    const nx = 12;
    const rings = isolineRings(fullSource(nx, 0, 10, f, true));
    expect(rings.length).toBe(2);
    const ys = rings.map((r) => {
      const set = new Set<number>();
      for (let k = 1; k < r.length; k += 2) set.add(r[k]!);
      return [...set];
    });
    expect(ys.map((s) => s.length)).toEqual([1, 1]);
    expect(ys.flat().sort((p, q) => p - q)).toEqual([2.5, 7.5]);
    for (const r of rings) expect(r.length / 2).toBe(nx); // one crossing on each column of the period
  });

  it("not periodic: one closed ring around the band", () => {
    const rings = isolineRings(fullSource(12, 0, 10, f, false));
    expect(rings.length).toBe(1);
    expect(signedArea(rings[0]!)).toBeGreaterThan(0);
  });
});

describe("isolineRings: edge cases", () => {
  it("rejects a non-integer or non-positive column count", () => {
    expect(() => isolineRings(fullSource(0, 0, 3, () => 1))).toThrow(RangeError);
    expect(() => isolineRings(fullSource(2.5, 0, 3, () => 1))).toThrow(RangeError);
  });

  it("returns nothing for an empty row range or an empty field", () => {
    expect(isolineRings(fullSource(5, 3, 2, () => 1))).toEqual([]);
    expect(isolineRings(fullSource(5, 0, 4, () => -1))).toEqual([]);
  });

  it("a single inside node gives a diamond of area 1/2 (hand-worked: midpoints at ±½ from the node)", () => {
    // value 1 at (2, 2), −1 elsewhere: every crossing is at the middle of the edge
    const rings = isolineRings(fullSource(5, 0, 4, (i, j) => (i === 2 && j === 2 ? 1 : -1)));
    expect(rings.length).toBe(1);
    expectClose(signedArea(rings[0]!), 0.5, 1e-12, "diamond area");
  });
});
