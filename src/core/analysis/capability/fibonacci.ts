/**
 * Directions spread evenly over the unit sphere: the spherical Fibonacci lattice. Point k of n sits at height
 * z_k = 1 − (2k + 1)/n (the midpoints of n bands of equal height, hence of equal area by Archimedes' hat-box
 * theorem) and turns by the golden angle π(3 − √5) from one point to the next, so each point stands for an area of
 * about 4π/n and no two bands line up.
 * @see González, Á. (2010), Measurement of areas on a sphere using Fibonacci and latitude–longitude lattices,
 *   Mathematical Geosciences 42, 49–64 [from memory]
 */

/** The golden angle, rad: π(3 − √5) ≈ 2.39996 (137.5°). */
export const GOLDEN_ANGLE_RAD = Math.PI * (3 - Math.sqrt(5));

/**
 * The n unit vectors of the spherical Fibonacci lattice, 3n numbers (x, y, z per point), z falling from near +1 to
 * near −1 (neither pole is a point).
 * @example fibonacciSphere(2) // (±0.866, 0, ±0.5): z = 1 − 1/2 = 0.5 at azimuth 0, z = −0.5 at the golden angle
 */
export function fibonacciSphere(n: number): Float64Array {
  if (!(Number.isInteger(n) && n >= 1)) throw new RangeError(`invalid direction count: ${n}`);
  const out = new Float64Array(3 * n);
  for (let k = 0; k < n; k++) {
    const z = 1 - (2 * k + 1) / n;
    const rho = Math.sqrt(Math.max(0, 1 - z * z));
    const phi = k * GOLDEN_ANGLE_RAD;
    out[3 * k] = rho * Math.cos(phi);
    out[3 * k + 1] = rho * Math.sin(phi);
    out[3 * k + 2] = z;
  }
  return out;
}

/**
 * The `k` nearest other directions of each direction (largest dot product), n·k indices. Used as continuation
 * neighbours over the sphere; O(n²) once per map.
 */
export function directionNeighbours(directions: Float64Array, k: number): Int32Array {
  const n = directions.length / 3;
  const kk = Math.min(k, n - 1);
  const out = new Int32Array(n * kk);
  const best = new Float64Array(kk);
  for (let i = 0; i < n; i++) {
    best.fill(-Infinity);
    const o = i * kk;
    for (let j = 0; j < n; j++) {
      if (j === i) continue;
      const d =
        directions[3 * i]! * directions[3 * j]! +
        directions[3 * i + 1]! * directions[3 * j + 1]! +
        directions[3 * i + 2]! * directions[3 * j + 2]!;
      if (d <= best[kk - 1]!) continue;
      // Insertion into the sorted list of the kk best so far.
      let p = kk - 1;
      while (p > 0 && best[p - 1]! < d) {
        best[p] = best[p - 1]!;
        out[o + p] = out[o + p - 1]!;
        p--;
      }
      best[p] = d;
      out[o + p] = j;
    }
  }
  return out;
}
