/**
 * The wrist flip of a spherical wrist as a symmetry of the chain: turning the first wrist joint by half a turn,
 * mirroring the middle one about its singular value and turning the last one by half a turn,
 *
 *   T(q) = (q₁ … q_{m−3}, q_a + π, c − q_b, q_c + π),
 *
 * gives the same flange pose for every q (the second wrist axis reversed, the wrist bent the other way). So every
 * inverse-kinematics solution has a twin, known without solving, and since FK(T(q)) = FK(q) for all q, the chain
 * rule gives J(T(q)) = J(q) · D with D = diag(1, …, 1, −1, 1): the twin's Jacobian is the original's with the middle
 * wrist column negated. Everything the speed maps take from J follows: the rows of J⁻¹ (or of the minimum-norm
 * inverse J⁺ = Jᵀ(JJᵀ)⁻¹ of a redundant arm) change sign only in row b, so the guaranteed line speed is the same;
 * the joint-rate box is symmetric, so the maximum tool speed is the same; singular values are the same; det J
 * changes sign.
 *
 * Which chains have it is decided numerically, not from the chain form: the reflection value c comes from where
 * the first and last wrist axes line up (det[ω_a ω_b ω_c] = 0, a sinusoid in q_b), and the symmetry is then checked
 * by forward kinematics and Jacobians at spread-out poses. Chains with offset or non-orthogonal wrists, couplings
 * that break the pattern, or prismatic wrist joints fail the check and get no twin.
 * @see Siciliano et al. (2009), Robotics: Modelling, Planning and Control, §2.12.2 (the two wrist solutions
 *   (ϑ₄, ϑ₅, ϑ₆) and (ϑ₄ + π, −ϑ₅, ϑ₆ + π) of a spherical wrist) [from memory]
 */
import type { Chain } from "./chain";
import { createScratch, forwardInto, jacobianInto } from "./forward";

export interface WristFlip {
  /** Driven indices of the three wrist joints (the last three). */
  readonly a: number;
  readonly b: number;
  readonly c: number;
  /** Reflection value of joint b, rad in (−π, π]: q_b' = centre − q_b (twice the singular value of q_b). */
  readonly centreRad: number;
}

const TWO_PI = 2 * Math.PI;
/** Check tolerances: positions relative to the chain's length, rotations and Jacobian entries absolute. */
const CHECK_POSES = 8;
const CHECK_TOLERANCE = 1e-9;

/** det[ω_a ω_b ω_c] of the driven Jacobian's angular rows at q. */
function wristDet(j: Float64Array, m: number, a: number, b: number, c: number): number {
  const w = (row: number, col: number) => j[(3 + row) * m + col]!;
  return (
    w(0, a) * (w(1, b) * w(2, c) - w(2, b) * w(1, c)) -
    w(1, a) * (w(0, b) * w(2, c) - w(2, b) * w(0, c)) +
    w(2, a) * (w(0, b) * w(1, c) - w(1, b) * w(0, c))
  );
}

/**
 * The wrist flip of `chain`, or null when the chain has none (fewer than six driven joints, prismatic wrist
 * joints, or the symmetry fails the check).
 */
export function wristFlipOf(chain: Chain): WristFlip | null {
  const m = chain.drivenCount;
  if (m < 6) return null;
  const a = m - 3,
    b = m - 2,
    c = m - 1;
  for (const i of [a, b, c]) {
    for (let k = 0; k < chain.jointCount; k++)
      if (chain.couplingGain[k * m + i] !== 0 && chain.isPrismatic[k]) return null;
  }
  const kin = createScratch(chain);
  const j = new Float64Array(6 * m);
  const q = new Float64Array(m);
  // Spread-out check poses (a fixed low-discrepancy pattern; no randomness needed).
  const poseInto = (out: Float64Array, n: number) => {
    for (let i = 0; i < m; i++) {
      const k = chain.drivenJoint[i]!;
      const u = ((n + 1) * 0.6180339887498949 + (i + 1) * 0.7548776662466927) % 1;
      if (chain.isPrismatic[k]) {
        const lo = chain.lowerSi[i]!,
          hi = chain.upperSi[i]!;
        out[i] = Number.isFinite(lo) && Number.isFinite(hi) ? lo + (hi - lo) * u : u;
      } else out[i] = -Math.PI + TWO_PI * u;
    }
  };
  // Reflection value from det[ω_a ω_b ω_c](q_b) = A cos q_b + B sin q_b + C at four quarter turns.
  poseInto(q, 0);
  const f: number[] = [];
  for (let s = 0; s < 4; s++) {
    q[b] = (s * Math.PI) / 2;
    const t = forwardInto(chain, q, kin);
    jacobianInto(j, chain, kin, t[3]!, t[7]!, t[11]!);
    f.push(wristDet(j, m, a, b, c));
  }
  const A = (f[0]! - f[2]!) / 2,
    B = (f[1]! - f[3]!) / 2;
  if (Math.hypot(A, B) < 1e-6) return null;
  // A cos x + B sin x = R cos(x − φ) is zero at x₀ = φ + π/2; the reflection value is 2x₀ (mod 2π).
  let centre = 2 * Math.atan2(B, A) + Math.PI;
  centre -= TWO_PI * Math.round(centre / TWO_PI);
  if (centre <= -Math.PI) centre += TWO_PI;
  const flip: WristFlip = { a, b, c, centreRad: centre };
  // The check: FK(T(q)) = FK(q) and J(T(q)) = J(q)·D at spread-out poses (joint limits ignored).
  const lengthM = Math.max(chain.characteristicLengthM, 1e-3);
  const qt = new Float64Array(m),
    t0 = new Float64Array(16),
    j0 = new Float64Array(6 * m);
  for (let n = 1; n <= CHECK_POSES; n++) {
    poseInto(q, n);
    t0.set(forwardInto(chain, q, kin));
    jacobianInto(j0, chain, kin, t0[3]!, t0[7]!, t0[11]!);
    qt.set(q);
    qt[a] = q[a]! + Math.PI;
    qt[b] = centre - q[b]!;
    qt[c] = q[c]! + Math.PI;
    const t1 = forwardInto(chain, qt, kin);
    for (let r = 0; r < 12; r++) {
      const scale = r % 4 === 3 ? lengthM : 1;
      if (!(Math.abs(t1[r]! - t0[r]!) <= CHECK_TOLERANCE * scale)) return null;
    }
    jacobianInto(j, chain, kin, t1[3]!, t1[7]!, t1[11]!);
    for (let r = 0; r < 6; r++) {
      const scale = r < 3 ? lengthM : 1;
      for (let col = 0; col < m; col++) {
        const expected = col === b ? -j0[r * m + col]! : j0[r * m + col]!;
        if (!(Math.abs(j[r * m + col]! - expected) <= CHECK_TOLERANCE * scale)) return null;
      }
    }
  }
  return flip;
}

/** Brings revolute value v into [lo, hi] by whole turns; NaN when no turn of it lies there. */
function intoRange(v: number, lo: number, hi: number): number {
  if (v > hi) v -= TWO_PI * Math.ceil((v - hi) / TWO_PI);
  else if (v < lo) v += TWO_PI * Math.ceil((lo - v) / TWO_PI);
  return v >= lo && v <= hi ? v : NaN;
}

/**
 * Writes the twin of q (q[offset … offset + m − 1]) into `out` (may not alias q): q_a + π (or − π when + π is past the upper limit), the mirrored
 * q_b and q_c ± π likewise, all brought into the joint ranges by whole turns. False when the twin lies outside the
 * ranges.
 */
export function wristTwinInto(
  out: Float64Array,
  q: ArrayLike<number>,
  flip: WristFlip,
  chain: Chain,
  offset = 0,
): boolean {
  const m = chain.drivenCount;
  for (let i = 0; i < m; i++) out[i] = q[offset + i]!;
  const { a, b, c } = flip;
  const qa = out[a]!,
    qb = out[b]!,
    qc = out[c]!;
  const va = intoRange(
    qa + Math.PI <= chain.upperSi[a]! ? qa + Math.PI : qa - Math.PI,
    chain.lowerSi[a]!,
    chain.upperSi[a]!,
  );
  const vb = intoRange(flip.centreRad - qb, chain.lowerSi[b]!, chain.upperSi[b]!);
  const vc = intoRange(
    qc + Math.PI <= chain.upperSi[c]! ? qc + Math.PI : qc - Math.PI,
    chain.lowerSi[c]!,
    chain.upperSi[c]!,
  );
  if (Number.isNaN(va) || Number.isNaN(vb) || Number.isNaN(vc)) return false;
  out[a] = va;
  out[b] = vb;
  out[c] = vc;
  return true;
}
