/**
 * Reference Jacobian by central finite differences of a pose function (CHECKS C11).
 *
 * - linear part, column i: (p(q + h eᵢ) − p(q − h eᵢ)) / 2h;
 * - angular part, column i: with D = R(q + h eᵢ) · R(q − h eᵢ)ᵀ, vee((D − Dᵀ)/2) / 2h.
 *
 * D is the rotation that carries the pose at q − h eᵢ to the one at q + h eᵢ, expressed in the base frame, so its
 * axis-angle vector is ≈ 2h ω (base frame). The vee of the skew part is sin(|2hω|)·axis, i.e. 2h ω + O(h³).
 * Truncation error is O(h²), round-off O(ε/h); the best step is about ε^(1/3) ≈ 6e-6 (Nocedal & Wright, Numerical
 * Optimization, 2nd ed., §8.1 [from memory]). CHECKS C11 recommends h = 1e-6 and a tolerance of 1e-7 at metre scale.
 */

/** Pose of the reference point in the base frame as a row-major 4×4 (m). May return a reused buffer. */
export type PoseFunction = (q: Float64Array) => ArrayLike<number>;

export const DEFAULT_FD_STEP = 1e-6;

/**
 * 6 × n row-major finite-difference Jacobian, rows (vx, vy, vz, ωx, ωy, ωz) in the base frame (the same layout as
 * jacobianInto). Independent of src/core: it only evaluates `pose`.
 */
export function finiteDifferenceJacobian(pose: PoseFunction, q: ArrayLike<number>, h = DEFAULT_FD_STEP): Float64Array {
  const n = q.length;
  const out = new Float64Array(6 * n);
  const qp = Float64Array.from(q),
    qm = Float64Array.from(q);
  for (let i = 0; i < n; i++) {
    qp.set(q);
    qm.set(q);
    qp[i] = qp[i]! + h;
    qm[i] = qm[i]! - h;
    const tp = Array.from(pose(qp)); // copy: the pose function may reuse its buffer
    const tm = Array.from(pose(qm));
    // Linear part: central difference of the position column.
    out[0 * n + i] = (tp[3]! - tm[3]!) / (2 * h);
    out[1 * n + i] = (tp[7]! - tm[7]!) / (2 * h);
    out[2 * n + i] = (tp[11]! - tm[11]!) / (2 * h);
    // Angular part: D = Rp · Rmᵀ, D(r, c) = Σ_k Rp(r, k) · Rm(c, k).
    const d = (r: number, c: number): number =>
      tp[r * 4]! * tm[c * 4]! + tp[r * 4 + 1]! * tm[c * 4 + 1]! + tp[r * 4 + 2]! * tm[c * 4 + 2]!;
    // vee of the skew part (D − Dᵀ)/2: (S(2,1), S(0,2), S(1,0)).
    out[3 * n + i] = (d(2, 1) - d(1, 2)) / 2 / (2 * h);
    out[4 * n + i] = (d(0, 2) - d(2, 0)) / 2 / (2 * h);
    out[5 * n + i] = (d(1, 0) - d(0, 1)) / 2 / (2 * h);
  }
  return out;
}
