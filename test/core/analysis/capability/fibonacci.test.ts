/**
 * The spherical Fibonacci lattice (fibonacci.ts): points on the unit sphere, spread near-evenly.
 * Checks against facts outside the code:
 * - Archimedes' hat-box theorem: the band a ≤ z ≤ b covers (b − a)/2 of the sphere's area; the lattice's heights
 *   z_k = 1 − (2k+1)/n are the midpoints of n equal bands, so a band about the z axis holds (b − a)·n/2 points to
 *   within one at each edge.
 * - Symmetry: each of the 8 octants is 1/8 of the sphere; a near-equal-area set gives each about n/8 points.
 * - The golden angle π(3 − √5) = 2π(1 − 1/φ), φ = (1 + √5)/2 (the definition of the golden angle).
 */
import { describe, expect, it } from "vitest";
import {
  directionNeighbours,
  fibonacciSphere,
  GOLDEN_ANGLE_RAD,
} from "../../../../src/core/analysis/capability/fibonacci";
import { expectClose } from "../../../helpers/expectClose";

describe("fibonacciSphere", () => {
  it("fibonacciSphere(n) puts n unit vectors on the sphere, heights 1 − (2k+1)/n, turning by the golden angle", () => {
    const phi = (1 + Math.sqrt(5)) / 2;
    // Golden angle from its definition: the smaller arc when a turn is cut in the golden ratio.
    expectClose(GOLDEN_ANGLE_RAD, 2 * Math.PI * (1 - 1 / phi), 1e-15, "golden angle");
    const n = 128;
    const d = fibonacciSphere(n);
    expect(d.length).toBe(3 * n);
    for (let k = 0; k < n; k++) {
      expectClose(Math.hypot(d[3 * k]!, d[3 * k + 1]!, d[3 * k + 2]!), 1, 1e-15, `|n_${k}|`);
      expectClose(d[3 * k + 2]!, 1 - (2 * k + 1) / n, 1e-15, `z_${k}`);
    }
    // Successive azimuths differ by the golden angle (mod 2π).
    for (let k = 1; k < 20; k++) {
      const dphi = Math.atan2(d[3 * k + 1]!, d[3 * k]!) - Math.atan2(d[3 * k - 2]!, d[3 * k - 3]!);
      const wrapped = dphi - 2 * Math.PI * Math.round((dphi - GOLDEN_ANGLE_RAD) / (2 * Math.PI));
      expectClose(wrapped, GOLDEN_ANGLE_RAD, 1e-12, `azimuth step ${k}`);
    }
  });

  it("fibonacciSphere(n): each of the 8 octants holds n/8 points within log₂ n (n = 100, 128, 400, 1000, 5000)", () => {
    // Bound: the equator is a band edge (exact to one point by the hat-box argument above); within a hemisphere the
    // azimuths k·γ mod 2π (γ the golden angle) form a Kronecker sequence in the golden ratio, whose discrepancy is
    // O(log M / M) for M points (Kuipers & Niederreiter, Uniform Distribution of Sequences, 1974, ch. 2 [from
    // memory]), so a quarter turn of azimuths holds M/4 points to within O(log M). log₂ n is that order with a
    // constant of 1; a clustered set (all points on a few meridians) is off by a share of n and fails.
    for (const n of [100, 128, 400, 1000, 5000]) {
      const d = fibonacciSphere(n);
      const counts = new Array<number>(8).fill(0);
      for (let k = 0; k < n; k++) {
        const o = (d[3 * k]! >= 0 ? 1 : 0) + (d[3 * k + 1]! >= 0 ? 2 : 0) + (d[3 * k + 2]! >= 0 ? 4 : 0);
        counts[o]!++;
      }
      expect(counts.reduce((a, b) => a + b, 0)).toBe(n);
      for (let o = 0; o < 8; o++)
        expect(Math.abs(counts[o]! - n / 8), `n = ${n}, octant ${o}: ${counts[o]}`).toBeLessThanOrEqual(Math.log2(n));
    }
  });

  it("fibonacciSphere(n): a band a ≤ z ≤ b holds (b − a)·n/2 points within 1 per edge (hat-box theorem)", () => {
    const n = 200;
    const d = fibonacciSphere(n);
    for (const [a, b] of [
      [-1, 1],
      [0, 1],
      [-0.3, 0.45],
      [0.9, 1],
      [-0.77, -0.2],
    ] as const) {
      let count = 0;
      for (let k = 0; k < n; k++) if (d[3 * k + 2]! >= a && d[3 * k + 2]! <= b) count++;
      expect(Math.abs(count - ((b - a) * n) / 2), `band [${a}, ${b}]`).toBeLessThanOrEqual(2);
    }
  });

  it("rejects a direction count that is not a positive integer", () => {
    expect(() => fibonacciSphere(0)).toThrow(RangeError);
    expect(() => fibonacciSphere(2.5)).toThrow(/invalid direction count/);
  });
});

describe("directionNeighbours", () => {
  it("directionNeighbours(dirs, 6) lists each direction's 6 nearest others, nearest first (against a full sort)", () => {
    const dirs = fibonacciSphere(100);
    const nb = directionNeighbours(dirs, 6);
    for (let i = 0; i < 100; i++) {
      const dots = Array.from({ length: 100 }, (_, j) => ({
        j,
        dot: dirs[3 * i]! * dirs[3 * j]! + dirs[3 * i + 1]! * dirs[3 * j + 1]! + dirs[3 * i + 2]! * dirs[3 * j + 2]!,
      }))
        .filter((e) => e.j !== i)
        .sort((x, y) => y.dot - x.dot);
      for (let r = 0; r < 6; r++)
        expectClose(dots.find((e) => e.j === nb[i * 6 + r])!.dot, dots[r]!.dot, 1e-15, `${i}/${r}`);
    }
  });
});
