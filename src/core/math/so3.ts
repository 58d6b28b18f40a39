/**
 * Rotation error as an axis-angle vector: ω with exp([ω]) = R_target · R_currentᵀ (the log map), robust at a half
 * turn. Written out element by element: no closures or allocation in the solvers' hot loops.
 * @see Lynch & Park, Modern Robotics, §3.2.3.3 (matrix logarithm of rotations) [from memory]
 * @param out    receives ωx, ωy, ωz at out[o..o+2], rad
 * @param target R_target, row-major with row stride `stride` (3 for a 3×3, 4 for a 4×4 pose)
 * @param current a row-major 4×4 pose whose rotation block is R_current
 */
export function rotationErrorInto(
  out: Float64Array,
  o: number,
  target: ArrayLike<number>,
  stride: number,
  current: ArrayLike<number>,
): Float64Array {
  const t = current,
    s1 = stride,
    s2 = 2 * stride;
  const t0 = target[0]!,
    t1 = target[1]!,
    t2 = target[2]!;
  const t4 = target[s1]!,
    t5 = target[s1 + 1]!,
    t6 = target[s1 + 2]!;
  const t8 = target[s2]!,
    t9 = target[s2 + 1]!,
    t10 = target[s2 + 2]!;
  const r00 = t0 * t[0]! + t1 * t[1]! + t2 * t[2]!,
    r01 = t0 * t[4]! + t1 * t[5]! + t2 * t[6]!,
    r02 = t0 * t[8]! + t1 * t[9]! + t2 * t[10]!;
  const r10 = t4 * t[0]! + t5 * t[1]! + t6 * t[2]!,
    r11 = t4 * t[4]! + t5 * t[5]! + t6 * t[6]!,
    r12 = t4 * t[8]! + t5 * t[9]! + t6 * t[10]!;
  const r20 = t8 * t[0]! + t9 * t[1]! + t10 * t[2]!,
    r21 = t8 * t[4]! + t9 * t[5]! + t10 * t[6]!,
    r22 = t8 * t[8]! + t9 * t[9]! + t10 * t[10]!;
  const vx = (r21 - r12) / 2,
    vy = (r02 - r20) / 2,
    vz = (r10 - r01) / 2;
  // |v| ≤ 1: sqrt of the sum of squares cannot overflow (and is several times faster than Math.hypot).
  const sinA = Math.sqrt(vx * vx + vy * vy + vz * vz);
  const cosA = (r00 + r11 + r22 - 1) / 2;
  if (sinA > 1e-9) {
    // θ/sin θ = 1 + θ²/6 + 7θ⁴/360 + …; with θ = asin(s) for θ < 90°, θ/s = 1 + s²/6 + 3s⁴/40 + …, so below s = 1e-4
    // the first two terms are exact to double precision and atan2 is not needed (the usual case in a solver's
    // last iterations).
    const f = sinA < 1e-4 && cosA > 0 ? 1 + (sinA * sinA) / 6 : Math.atan2(sinA, cosA) / sinA;
    out[o] = vx * f;
    out[o + 1] = vy * f;
    out[o + 2] = vz * f;
  } else if (cosA > 0) {
    out[o] = vx;
    out[o + 1] = vy;
    out[o + 2] = vz;
  } else {
    // Half turn: the axis from the diagonal of (R_err + I) / 2 = k kᵀ.
    const kx = Math.sqrt(Math.max(0, (r00 + 1) / 2)),
      ky = Math.sqrt(Math.max(0, (r11 + 1) / 2)),
      kz = Math.sqrt(Math.max(0, (r22 + 1) / 2));
    let ax = kx,
      ay = ky,
      az = kz;
    if (kx >= ky && kx >= kz) {
      ay = Math.sign(r01 + r10) * ky;
      az = Math.sign(r02 + r20) * kz;
    } else if (ky >= kz) {
      ax = Math.sign(r01 + r10) * kx;
      az = Math.sign(r12 + r21) * kz;
    } else {
      ax = Math.sign(r02 + r20) * kx;
      ay = Math.sign(r12 + r21) * ky;
    }
    out[o] = Math.PI * ax;
    out[o + 1] = Math.PI * ay;
    out[o + 2] = Math.PI * az;
  }
  return out;
}
