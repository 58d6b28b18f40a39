/**
 * Joint rates at constant orientation for the ortho-parallel class (orthoParallel.ts), from the decoupled Jacobian
 * about the wrist centre instead of the full 6 × 6 solve: with the tool frame not turning (ω = 0) every point of the
 * flange moves as the wrist centre does, so
 *   v = A·q̇₁₋₃ (A: the wrist centre's velocity per turn of joints 1–3, columns wᵢ × (P − pᵢ)),
 *   0 = Ω·q̇₁₋₃ + C·q̇₄₋₆ (Ω = [w₁ w₂ w₃], C = [w₄ w₅ w₆]: the joint axes now),
 * so B = [A⁻¹; −C⁻¹·Ω·A⁻¹] (joint rates per unit tool velocity, the block measures/speed.ts takes from J⁻¹), and
 * det J = det A · det C (J about the wrist centre is block lower triangular; moving the reference point to the flange
 * multiplies J by a unit-determinant matrix). The axes follow from the product of exponentials: w₂ = Rot(d₁,θ₁)·d₂,
 * the wrist axes turned by R_arm = Rot(d₁,θ₁)·Rot(d₂,θ₂ ± θ₃).
 * @see Siciliano et al. (2009), Robotics: Modelling, Planning and Control, §3.4 (kinematic decoupling of the
 *   Jacobian) [from memory]; Murray, Li & Sastry (1994), §3.2 (product of exponentials) [from memory]
 */
import type { Chain } from "./chain";
import type { OrthoParallelIk } from "./orthoParallel";
import { rotInto } from "../math/mat3";

/** Pivot share below which A or C counts as singular (the 6 × 6 solve's LINE_RATES_REL_TOL, measures/speed.ts). */
const SINGULAR_REL = 1e-13;

export interface OrthoRatesScratch {
  /** Kinematic joint values. */
  readonly th: Float64Array;
  /** Rotations R₁, R₂, R₂₃, R₄, R₅ (row-major 3×3 each). */
  readonly r: Float64Array;
  /** Vectors: 3 each (see orthoLineRatesInto). */
  readonly v: Float64Array;
  /** B (6 × 3, row-major: joint rates per unit tool velocity) after a call. */
  readonly b: Float64Array;
  /** det J after a call (0 at a singular pose). */
  det: number;
}

export function createOrthoRatesScratch(): OrthoRatesScratch {
  return {
    th: new Float64Array(6),
    r: new Float64Array(45),
    v: new Float64Array(3 * 24),
    b: new Float64Array(18),
    det: NaN,
  };
}

/** v[o..o+3) = R·x for R at r[ro..ro+9), x at xs[xo..xo+3) (o may equal xo only when xs ≠ v). */
function mul(v: Float64Array, o: number, r: Float64Array, ro: number, xs: ArrayLike<number>, xo: number): void {
  const x0 = xs[xo]!,
    x1 = xs[xo + 1]!,
    x2 = xs[xo + 2]!;
  v[o] = r[ro]! * x0 + r[ro + 1]! * x1 + r[ro + 2]! * x2;
  v[o + 1] = r[ro + 3]! * x0 + r[ro + 4]! * x1 + r[ro + 5]! * x2;
  v[o + 2] = r[ro + 6]! * x0 + r[ro + 7]! * x1 + r[ro + 8]! * x2;
}

/** v[o..o+3) = a × b for a at v[ao], b at v[bo]. */
function crossAt(v: Float64Array, o: number, ao: number, bo: number): void {
  const ax = v[ao]!,
    ay = v[ao + 1]!,
    az = v[ao + 2]!,
    bx = v[bo]!,
    by = v[bo + 1]!,
    bz = v[bo + 2]!;
  v[o] = ay * bz - az * by;
  v[o + 1] = az * bx - ax * bz;
  v[o + 2] = ax * by - ay * bx;
}

const dotAt = (v: Float64Array, a: number, b: number) => v[a]! * v[b]! + v[a + 1]! * v[b + 1]! + v[a + 2]! * v[b + 2]!;

// Rotation slots and vector slots (3 numbers each).
const R1 = 0,
  R2 = 9,
  R23 = 18,
  R4 = 27,
  R5 = 36;
const E3 = 0, // p₃' − p₁ before R₁: R₂(p₃ − p₂) + (p₂ − p₁)
  PW = 3, // P − p₁
  P2 = 6, // p₂' − p₁
  P3 = 9, // p₃' − p₁
  W1 = 12,
  W2 = 15,
  W3 = 18,
  A1 = 21,
  A2 = 24,
  A3 = 27,
  W4 = 30,
  W5 = 33,
  W6 = 36,
  T = 39,
  U = 42,
  K23 = 45,
  K31 = 48,
  K12 = 51,
  C23 = 54,
  C31 = 57,
  C12 = 60,
  OC = 63;

/**
 * The joint axes and points at driven joint values q into s.v: A's columns, the axes w₁…w₆, and the cross products
 * of A's and C's columns (A⁻¹ and C⁻¹ rows times their determinants). Returns det A; det C is v[W4]·v[K23].
 */
function decoupledInto(ik: OrthoParallelIk, chain: Chain, q: ArrayLike<number>, s: OrthoRatesScratch): number {
  const th = s.th,
    g = chain.couplingGain,
    off = chain.couplingOffset,
    r = s.r,
    v = s.v;
  for (let i = 0; i < 6; i++) {
    let x = off[i]!;
    for (let j = 0; j <= i; j++) {
      const gij = g[i * 6 + j]!;
      if (gij !== 0) x += gij * q[j]!;
    }
    th[i] = x;
  }
  rotInto(r, R1, ik.d1, th[0]!);
  rotInto(r, R2, ik.d2, th[1]!);
  rotInto(r, R23, ik.d2, th[1]! + ik.s3 * th[2]!);
  rotInto(r, R4, ik.d4, th[3]!);
  rotInto(r, R5, ik.d5, th[4]!);
  // P − p₁ = R₁(R₂₃(w₀ − p₃) + R₂(p₃ − p₂) + p₂ − p₁), p₂' − p₁ = R₁(p₂ − p₁), p₃' − p₁ = R₁(R₂(p₃ − p₂) + p₂ − p₁).
  mul(v, E3, r, R2, ik.p32, 0);
  for (let i = 0; i < 3; i++) v[E3 + i] = v[E3 + i]! + ik.p21[i]!;
  mul(v, T, r, R23, ik.wp3, 0);
  for (let i = 0; i < 3; i++) v[T + i] = v[T + i]! + v[E3 + i]!;
  mul(v, PW, r, R1, v, T);
  mul(v, P2, r, R1, ik.p21, 0);
  mul(v, P3, r, R1, v, E3);
  // Axes now: w₁ = d₁, w₂ = R₁d₂, w₃ = ±w₂; wrist axes through R_arm = R₁·R₂₃.
  for (let i = 0; i < 3; i++) v[W1 + i] = ik.d1[i]!;
  mul(v, W2, r, R1, ik.d2, 0);
  for (let i = 0; i < 3; i++) v[W3 + i] = ik.s3 * v[W2 + i]!;
  mul(v, T, r, R23, ik.d4, 0);
  mul(v, W4, r, R1, v, T);
  mul(v, T, r, R4, ik.d5, 0);
  mul(v, U, r, R23, v, T);
  mul(v, W5, r, R1, v, U);
  mul(v, T, r, R5, ik.d6, 0);
  mul(v, U, r, R4, v, T);
  mul(v, T, r, R23, v, U);
  mul(v, W6, r, R1, v, T);
  // A's columns wᵢ × (P − pᵢ').
  crossAt(v, A1, W1, PW);
  for (let i = 0; i < 3; i++) v[T + i] = v[PW + i]! - v[P2 + i]!;
  crossAt(v, A2, W2, T);
  for (let i = 0; i < 3; i++) v[T + i] = v[PW + i]! - v[P3 + i]!;
  crossAt(v, A3, W3, T);
  // A⁻¹ rows (a₂ × a₃, a₃ × a₁, a₁ × a₂)/det A; C⁻¹ likewise.
  crossAt(v, C23, A2, A3);
  crossAt(v, C31, A3, A1);
  crossAt(v, C12, A1, A2);
  crossAt(v, K23, W5, W6);
  crossAt(v, K31, W6, W4);
  crossAt(v, K12, W4, W5);
  return dotAt(v, A1, C23);
}

/** det J (flange rows v, ω; driven joints) at q from the decoupled form: det A·det C. Allocates nothing. */
export function orthoDet(ik: OrthoParallelIk, chain: Chain, q: ArrayLike<number>, s: OrthoRatesScratch): number {
  const detA = decoupledInto(ik, chain, q, s);
  return detA * dotAt(s.v, W4, K23);
}

/**
 * B and det J at driven joint values q (rad) into s.b, s.det; false at a singular pose (A or C without a pivot above
 * SINGULAR_REL of its scale: B is then not written, det is 0). Allocates nothing.
 */
export function orthoLineRatesInto(
  ik: OrthoParallelIk,
  chain: Chain,
  q: ArrayLike<number>,
  s: OrthoRatesScratch,
): boolean {
  const v = s.v,
    g = chain.couplingGain;
  const detA = decoupledInto(ik, chain, q, s),
    detC = dotAt(v, W4, K23);
  const scaleA = Math.max(Math.sqrt(dotAt(v, A1, A1)), Math.sqrt(dotAt(v, A2, A2)), Math.sqrt(dotAt(v, A3, A3)));
  if (!(Math.abs(detA) > SINGULAR_REL * scaleA * scaleA * scaleA) || !(Math.abs(detC) > SINGULAR_REL)) {
    s.det = 0;
    return false;
  }
  s.det = detA * detC;
  const b = s.b;
  for (let c = 0; c < 3; c++) {
    b[c] = v[C23 + c]! / detA;
    b[3 + c] = v[C31 + c]! / detA;
    b[6 + c] = v[C12 + c]! / detA;
  }
  // Wrist rows: −C⁻¹·(Ω·A⁻¹); column c of Ω·A⁻¹ is w₁·B[0][c] + w₂·B[1][c] + w₃·B[2][c].
  for (let c = 0; c < 3; c++) {
    for (let i = 0; i < 3; i++) v[OC + i] = v[W1 + i]! * b[c]! + v[W2 + i]! * b[3 + c]! + v[W3 + i]! * b[6 + c]!;
    b[9 + c] = -dotAt(v, K23, OC) / detC;
    b[12 + c] = -dotAt(v, K31, OC) / detC;
    b[15 + c] = -dotAt(v, K12, OC) / detC;
  }
  // Driven joints: B_driven = G⁻¹·B (G unit lower triangular).
  for (let i = 1; i < 6; i++)
    for (let j = 0; j < i; j++) {
      const gij = g[i * 6 + j]!;
      if (gij !== 0) for (let c = 0; c < 3; c++) b[i * 3 + c] = b[i * 3 + c]! - gij * b[j * 3 + c]!;
    }
  return true;
}
