/**
 * Per-pose tool-speed figures from the Jacobian and the joint-rate box |q̇ᵢ| ≤ q̇maxᵢ. Allocation-free kernels.
 *
 * Guaranteed straight-line speed at constant orientation: with q̇ = B·v the joint rates that move the tool point at
 * linear velocity v with zero angular velocity (B: m × 3, the linear block of J⁻¹; of the minimum-norm
 * pseudo-inverse Jᵀ(JJᵀ)⁻¹ for redundant arms; of (JᵀJ)⁻¹Jᵀ for arms with fewer than six joints when the
 * constant-orientation motion is possible in every direction), every direction reaches
 *   r = minᵢ q̇maxᵢ / ‖row i of B‖.
 * Maximum tool speed: the largest ‖J_v q̇‖ over the box, attained at a vertex of the box (a convex function's
 * maximum over a polytope), orientation free.
 * @see Boyd & Vandenberghe, Convex Optimization, §8.5.1 (Chebyshev centre of a polyhedron) [from memory];
 *   Kokkinis & Paden 1989 and Bicchi et al. 1995 (velocity polytopes) [from memory]
 */
import { solveInPlace } from "../math/linsolve";

/** Pivots below this share of the largest entry count as singular in the joint-rate solves. */
const LINE_RATES_REL_TOL = 1e-13;

export interface SpeedScratch {
  readonly m: number;
  /** System matrix, up to 6 × 6 (or m × m). */
  readonly a: Float64Array;
  /** Right-hand sides / solution, up to max(6, m) × 3. */
  readonly x: Float64Array;
  /** B, m × 3 row-major. */
  readonly b: Float64Array;
  /** Vertex sum. */
  readonly sum: Float64Array;
  /** det J of the last square (m = 6) solve by lineRatesInto, a by-product of its LU; NaN otherwise. */
  lastDet: number;
}

export function createSpeedScratch(m: number): SpeedScratch {
  const k = Math.max(6, m);
  return {
    m,
    a: new Float64Array(k * k),
    x: new Float64Array(k * 3),
    b: new Float64Array(m * 3),
    sum: new Float64Array(3),
    lastDet: NaN,
  };
}

/**
 * lineRatesInto for six joints: solveInPlace (math/linsolve.ts, three right-hand sides) written out for 6 × 6 with the
 * right-hand side E = [I₃; 0] (the same pivots, operations and rounding, so the same B to the bit; det J as a by-product), about twice as fast: the speed maps call it
 * once per solution. Writes B into s.b and det J into s.lastDet (0 when singular).
 */
function lineRates6Into(j: ArrayLike<number>, s: SpeedScratch): boolean {
  const a = s.a,
    x = s.b;
  let scale = 0;
  for (let i = 0; i < 36; i++) {
    const v = j[i]!;
    a[i] = v;
    scale = Math.max(scale, Math.abs(v));
  }
  for (let i = 0; i < 18; i++) x[i] = 0;
  x[0] = 1;
  x[4] = 1;
  x[8] = 1;
  s.lastDet = 0;
  if (!(scale > 0)) return false;
  const tol = LINE_RATES_REL_TOL * scale;
  let product = 1;
  for (let c = 0; c < 6; c++) {
    let p = c,
      best = Math.abs(a[c * 6 + c]!);
    for (let r = c + 1; r < 6; r++) {
      const v = Math.abs(a[r * 6 + c]!);
      if (v > best) {
        best = v;
        p = r;
      }
    }
    if (!(best > tol)) return false;
    const c3 = c * 3;
    if (p !== c) {
      // Columns left of c are not read again: only the active part of the rows is swapped.
      for (let k = c; k < 6; k++) {
        const t = a[c * 6 + k]!;
        a[c * 6 + k] = a[p * 6 + k]!;
        a[p * 6 + k] = t;
      }
      const p3 = p * 3;
      let t = x[c3]!;
      x[c3] = x[p3]!;
      x[p3] = t;
      t = x[c3 + 1]!;
      x[c3 + 1] = x[p3 + 1]!;
      x[p3 + 1] = t;
      t = x[c3 + 2]!;
      x[c3 + 2] = x[p3 + 2]!;
      x[p3 + 2] = t;
    }
    const piv = a[c * 6 + c]!;
    product *= p !== c ? -piv : piv;
    const x0 = x[c3]!,
      x1 = x[c3 + 1]!,
      x2 = x[c3 + 2]!;
    for (let r = c + 1; r < 6; r++) {
      const f = a[r * 6 + c]! / piv;
      if (f === 0) continue;
      for (let k = c + 1; k < 6; k++) a[r * 6 + k] = a[r * 6 + k]! - f * a[c * 6 + k]!;
      x[r * 3] = x[r * 3]! - f * x0;
      x[r * 3 + 1] = x[r * 3 + 1]! - f * x1;
      x[r * 3 + 2] = x[r * 3 + 2]! - f * x2;
    }
  }
  s.lastDet = product;
  for (let c = 5; c >= 0; c--) {
    const piv = a[c * 6 + c]!;
    let v0 = x[c * 3]!,
      v1 = x[c * 3 + 1]!,
      v2 = x[c * 3 + 2]!;
    for (let r = c + 1; r < 6; r++) {
      const ar = a[c * 6 + r]!;
      v0 -= ar * x[r * 3]!;
      v1 -= ar * x[r * 3 + 1]!;
      v2 -= ar * x[r * 3 + 2]!;
    }
    x[c * 3] = v0 / piv;
    x[c * 3 + 1] = v1 / piv;
    x[c * 3 + 2] = v2 / piv;
  }
  return true;
}

/**
 * Writes B = the joint rates per unit linear tool velocity at zero angular velocity (m × 3, rad/s per m/s) into
 * s.b. Returns false at a singular pose, or when constant-orientation motion is not possible in every direction.
 * @param j 6 × m Jacobian, rows (vx, vy, vz, ωx, ωy, ωz), SI
 */
export function lineRatesInto(j: ArrayLike<number>, m: number, s: SpeedScratch): boolean {
  const a = s.a,
    x = s.x,
    b = s.b;
  s.lastDet = NaN;
  if (m === 6) return lineRates6Into(j, s);
  if (m > 6) {
    // B = Jᵀ (J Jᵀ)⁻¹ E with E = [I₃; 0]: the minimum-norm joint rates.
    for (let r = 0; r < 6; r++) {
      for (let c = r; c < 6; c++) {
        let v = 0;
        for (let k = 0; k < m; k++) v += j[r * m + k]! * j[c * m + k]!;
        a[r * 6 + c] = v;
        a[c * 6 + r] = v;
      }
    }
    x.fill(0, 0, 18);
    x[0] = 1;
    x[4] = 1;
    x[8] = 1;
    if (!solveInPlace(a, x, 6, LINE_RATES_REL_TOL, 3)) return false;
    for (let k = 0; k < m; k++) {
      for (let c = 0; c < 3; c++) {
        let v = 0;
        for (let r = 0; r < 6; r++) v += j[r * m + k]! * x[r * 3 + c]!;
        b[k * 3 + c] = v;
      }
    }
    // J J ᵀ squares the condition number: near a rank drop the solve passes its pivot test with a wrong answer,
    // so check J·B = E as for m < 6 (found by the random-arm property tests: B gave 30 % wrong tool velocities)
    return residualOk(j, m, b);
  }
  // m < 6: least squares (JᵀJ) B = Jᵀ E, then check that J·B = E (the motion is possible at all).
  for (let r = 0; r < m; r++) {
    for (let c = r; c < m; c++) {
      let v = 0;
      for (let k = 0; k < 6; k++) v += j[k * m + r]! * j[k * m + c]!;
      a[r * m + c] = v;
      a[c * m + r] = v;
    }
    for (let c = 0; c < 3; c++) x[r * 3 + c] = j[c * m + r]!;
  }
  if (!solveInPlace(a, x, m, LINE_RATES_REL_TOL, 3)) return false;
  for (let i = 0; i < m * 3; i++) b[i] = x[i]!;
  return residualOk(j, m, b);
}

/** True when J·B = E = [I₃; 0] within 1e-7 (the joint rates B really move the tool point at constant orientation). */
function residualOk(j: ArrayLike<number>, m: number, b: Float64Array): boolean {
  for (let r = 0; r < 6; r++) {
    for (let c = 0; c < 3; c++) {
      let v = 0;
      for (let k = 0; k < m; k++) v += j[r * m + k]! * b[k * 3 + c]!;
      if (Math.abs(v - (r === c ? 1 : 0)) > 1e-7) return false;
    }
  }
  return true;
}

/**
 * Guaranteed straight-line speed at constant orientation, m/s: minᵢ q̇maxᵢ / ‖Bᵢ‖ (0 at a singular pose).
 * @param maxRate joint-rate limits of the driven joints, rad/s or m/s
 * @example 2R planar (1 m, 1 m) at q = (0, 90°) with limits (1, 1) rad/s has r = 1/√2 m/s in the plane (CHECKS C12)
 */
export function guaranteedLineSpeed(
  j: ArrayLike<number>,
  m: number,
  maxRate: ArrayLike<number>,
  s: SpeedScratch,
): number {
  if (!lineRatesInto(j, m, s)) return 0;
  return guaranteedFromRates(s.b, m, maxRate);
}

/**
 * The guaranteed straight-line speed from B (m × 3, joint rates per unit tool velocity at constant orientation, as
 * lineRatesInto writes it): minᵢ q̇maxᵢ / ‖Bᵢ‖ over the non-zero rows (0 when none).
 */
export function guaranteedFromRates(b: ArrayLike<number>, m: number, maxRate: ArrayLike<number>): number {
  // Math.hypot is several times slower than sqrt(x² + y² + z²), which is within a few ulp of it: a first pass with
  // the latter finds the rows that can hold the minimum (ratio within 1e-9 of the smallest), and only those get
  // hypot. The result is the same minimum, to the bit, as over every row. Rows whose squares could under- or
  // overflow, and non-finite ratios, take the plain loop.
  let approx = Infinity;
  for (let i = 0; i < m; i++) {
    const x = b[i * 3]!,
      y = b[i * 3 + 1]!,
      z = b[i * 3 + 2]!;
    const n2 = x * x + y * y + z * z;
    if (n2 === 0 && x === 0 && y === 0 && z === 0) continue;
    const ratio = maxRate[i]! / Math.sqrt(n2);
    if (!(n2 > 1e-280 && n2 < 1e280 && Number.isFinite(ratio))) return rowMinimum(b, m, maxRate, Infinity);
    if (ratio < approx) approx = ratio;
  }
  return rowMinimum(b, m, maxRate, approx * (1 + 1e-9));
}

/** minᵢ q̇maxᵢ / ‖Bᵢ‖ over the non-zero rows whose sqrt-norm ratio is at most `threshold` (0 when none). */
function rowMinimum(b: ArrayLike<number>, m: number, maxRate: ArrayLike<number>, threshold: number): number {
  let best = Infinity;
  for (let i = 0; i < m; i++) {
    const x = b[i * 3]!,
      y = b[i * 3 + 1]!,
      z = b[i * 3 + 2]!;
    if (threshold !== Infinity && !(maxRate[i]! / Math.sqrt(x * x + y * y + z * z) <= threshold)) continue;
    const n = Math.hypot(x, y, z);
    if (n > 0) best = Math.min(best, maxRate[i]! / n);
  }
  return Number.isFinite(best) ? best : 0;
}

/**
 * Maximum tool-point speed over the joint-rate box, m/s: max over sign vectors s of ‖Σ sᵢ q̇maxᵢ J_v,i‖, enumerated
 * in Gray-code order (one column update per vertex; half the vertices by central symmetry).
 */
export function maxToolSpeed(j: ArrayLike<number>, m: number, maxRate: ArrayLike<number>, s: SpeedScratch): number {
  const sum = s.sum;
  sum[0] = 0;
  sum[1] = 0;
  sum[2] = 0;
  for (let i = 0; i < m; i++) {
    const w = maxRate[i]!;
    sum[0] = sum[0]! + w * j[i]!;
    sum[1] = sum[1]! + w * j[m + i]!;
    sum[2] = sum[2]! + w * j[2 * m + i]!;
  }
  let best = sum[0]! * sum[0]! + sum[1]! * sum[1]! + sum[2]! * sum[2]!;
  let signs = 0; // bit i set = column i negative
  const count = m > 0 ? 1 << (m - 1) : 0;
  for (let k = 1; k < count; k++) {
    let bit = 0;
    while (((k >> bit) & 1) === 0) bit++;
    const negative = (signs >> bit) & 1;
    const f = (negative ? 2 : -2) * maxRate[bit]!;
    sum[0] = sum[0]! + f * j[bit]!;
    sum[1] = sum[1]! + f * j[m + bit]!;
    sum[2] = sum[2]! + f * j[2 * m + bit]!;
    signs ^= 1 << bit;
    const v = sum[0]! * sum[0]! + sum[1]! * sum[1]! + sum[2]! * sum[2]!;
    if (v > best) best = v;
  }
  return Math.sqrt(best);
}
