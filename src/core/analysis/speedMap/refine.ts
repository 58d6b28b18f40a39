/**
 * Refinement of a solution that sits near a singular pose: a step along the null motion that takes it onto the pose
 * the inverse kinematics meant.
 *
 * Why. Near a singular pose q* the tool error grows only with the square of a step δ along the null motion n
 * (J·n ≈ 0): e(q* + δn) ≈ ½·C·δ², C = (∂²T/∂q²)(n, n). The solver stops once |e| ≤ tol (1e-6 m), so a solution may
 * sit δ ≈ √(2·tol/|C|) off q*: 0.004 rad for |C| ≈ 0.12 m/rad² (brandmoor-lyra-c12, tool down, r = 90 mm: q5 = π
 * exactly, q1 and q6 both 0.004 rad from ±π/2 along the null motion J1 + J6). The figures are first order in δ
 * (the guaranteed speed r(q) changes by (dr/dq·n)·δ, a few hundred mm/s per rad there), so the stored figure reads
 * 1–2 mm/s where the pose the target asks for has about 0.03 mm/s. Storing 0 below the bound (dr/dq·n)·√(2·tol/|C|)
 * would also zero cells whose small figure is real and needs C and dr/dq per cell anyway; the step below removes the
 * error instead, and costs three forward kinematics per iteration on the few cells near a singular pose only.
 *
 * How. With the null motion n (right singular vector of σ_min of the scaled square task Jacobian), the task error
 * along q + t·n is fitted by a parabola from three samples, e(t) ≈ A + B·t + C·t² (central differences, step h). Along
 * a null motion the error is, to second order, C·(t − t₀)² with a double root t₀ (A ∥ B ∥ C), whose vertex
 * t₀ = −(B·C)/(2·C·C) is where the error vanishes; the step is taken when it lowers the error and keeps the joints in
 * their ranges, and repeated with h shrinking to the last step (the fit is exact for a parabola; the cubic term
 * limits each iteration to O(h²)). Rows are weighted as the scaled Jacobian is: position in m, rotation × L.
 * @see Nocedal & Wright, Numerical Optimization, 2nd ed., §3.5 (interpolation in a line search) [from memory]
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto } from "../../kinematics/forward";
import { taskErrorInto } from "../../kinematics/inverse";
import { createSvdScratch, svdInto } from "../../math/svd";
import { taskMatrixInto } from "./taskMatrix";

/** Inverse condition (σ_min/σ_max of the scaled square task Jacobian) below which a solution is refined. */
export const REFINE_INVERSE_CONDITION = 0.01;
/** Iterations of the null-motion step; each shrinks the remaining offset by about its own square. */
const REFINE_ITERATIONS = 4;
/** Largest step taken along the null motion, rad (or m): far larger than any offset the tolerance allows. */
const REFINE_MAX_STEP = 0.05;

/**
 * Smallest curvature |C| of the task error along the null motion (m/rad², rotation rows × L) the step acts on: at
 * h = 1e-3 rad it moves the samples by 1e-9 m, far above the rounding of the forward kinematics (1e-15 m).
 */
const MIN_CURVATURE_M = 1e-3;
/** A step is kept only when it at least halves the task error (a quarter of its square) (else the model does not hold there). */
const MIN_GAIN = 1;

export interface NullStepScratch {
  readonly chain: Chain;
  readonly m: number;
  readonly kin: ReturnType<typeof createScratch>;
  readonly j: Float64Array;
  readonly task: Float64Array;
  readonly sv: Float64Array;
  readonly v: Float64Array;
  readonly svd: ReturnType<typeof createSvdScratch>;
  readonly n: Float64Array;
  readonly qt: Float64Array;
  readonly e: Float64Array[];
}

/** Scratch for refineAlongNullMotion; null for chains without a square task Jacobian (m other than 4 or 6). */
export function createNullStepScratch(chain: Chain): NullStepScratch | null {
  const m = chain.drivenCount;
  if (m !== 4 && m !== 6) return null;
  return {
    chain,
    m,
    kin: createScratch(chain),
    j: new Float64Array(6 * m),
    task: new Float64Array(m * m),
    sv: new Float64Array(m),
    v: new Float64Array(m * m),
    svd: createSvdScratch(m, m),
    n: new Float64Array(m),
    qt: new Float64Array(m),
    e: [0, 1, 2].map(() => new Float64Array(6)),
  };
}

/** Weighted squared norm of a task error (position m; rotation × L). */
function errorNorm2(e: Float64Array, lengthM: number): number {
  const l2 = lengthM * lengthM;
  return e[0]! * e[0]! + e[1]! * e[1]! + e[2]! * e[2]! + l2 * (e[3]! * e[3]! + e[4]! * e[4]! + e[5]! * e[5]!);
}

/** Task error of q + t·n at the goal into `out`. */
function errorAlong(
  s: NullStepScratch,
  q: Float64Array,
  t: number,
  goal: ArrayLike<number>,
  axisOnly: boolean,
  out: Float64Array,
): Float64Array {
  for (let i = 0; i < s.m; i++) s.qt[i] = q[i]! + t * s.n[i]!;
  return taskErrorInto(out, goal, forwardInto(s.chain, s.qt, s.kin), axisOnly);
}

/**
 * Whether the pose with this Jacobian and flange pose is near singular: inverse condition of its scaled square task
 * Jacobian T below REFINE_INVERSE_CONDITION (c). `detScaled` is det T: by the inequality of arithmetic and geometric
 * means the other m − 1 singular values have Π ≤ (‖T‖_F²/(m − 1))^((m−1)/2), and σ_min < c·σ_max ≤ c·‖T‖_F, so a pose
 * with |det T| ≥ c·‖T‖_F·(‖T‖_F²/(m − 1))^((m−1)/2) is not near singular and costs no
 * SVD. Leaves the singular vectors in s.v when it is.
 */
export function nearSingular(
  s: NullStepScratch,
  jacobian: ArrayLike<number>,
  baseFromFlange: Float64Array,
  detScaled: number,
): boolean {
  const m = s.m;
  taskMatrixInto(s.task, jacobian, m, s.chain.characteristicLengthM, baseFromFlange);
  let frob2 = 0;
  for (let i = 0; i < m * m; i++) frob2 += s.task[i]! * s.task[i]!;
  const bound = REFINE_INVERSE_CONDITION * Math.sqrt(frob2) * (frob2 / (m - 1)) ** ((m - 1) / 2);
  if (!(Math.abs(detScaled) < bound)) return false;
  svdInto(s.sv, s.v, s.task, m, m, s.svd);
  return s.sv[m - 1]! < REFINE_INVERSE_CONDITION * s.sv[0]!;
}

/**
 * Refines q (in place), a near-singular solution for `goal` with this Jacobian, flange pose and scaled task
 * determinant, by steps along its null motion onto the pose the goal asks for (module comment). Returns whether q
 * changed.
 */
export function refineAlongNullMotion(
  s: NullStepScratch,
  q: Float64Array,
  jacobian: ArrayLike<number>,
  baseFromFlange: Float64Array,
  detScaled: number,
  goal: ArrayLike<number>,
  axisOnly: boolean,
): boolean {
  const { chain, m, e } = s;
  const lengthM = chain.characteristicLengthM;
  if (!nearSingular(s, jacobian, baseFromFlange, detScaled)) return false;
  for (let i = 0; i < m; i++) s.n[i] = s.v[i * m + m - 1]!;
  let changed = false;
  let h = 1e-3;
  let now = errorNorm2(errorAlong(s, q, 0, goal, axisOnly, e[1]!), lengthM);
  for (let it = 0; it < REFINE_ITERATIONS && now > 0; it++) {
    const e0 = errorAlong(s, q, -h, goal, axisOnly, e[0]!),
      e1 = errorAlong(s, q, 0, goal, axisOnly, e[1]!),
      e2 = errorAlong(s, q, h, goal, axisOnly, e[2]!);
    // e(t) ≈ A + B t + C t²: B = (e2 − e0)/(2h), C = (e2 − 2e1 + e0)/(2h²); the vertex t₀ = −(B·C)/(2 C·C).
    let bc = 0,
      cc = 0;
    for (let r = 0; r < 6; r++) {
      const w = r < 3 ? 1 : lengthM * lengthM;
      const b = (e2[r]! - e0[r]!) / (2 * h),
        c = (e2[r]! - 2 * e1[r]! + e0[r]!) / (2 * h * h);
      bc += w * b * c;
      cc += w * c * c;
    }
    // No curvature to resolve (a wrist singularity's null motion, J4 against J6, keeps the pose to every order: the
    // target does not pin the solution along it, and nothing is to be gained).
    if (!(Math.sqrt(cc) >= MIN_CURVATURE_M)) break;
    const t0 = -bc / (2 * cc);
    if (!(Math.abs(t0) <= REFINE_MAX_STEP)) break;
    const after = errorNorm2(errorAlong(s, q, t0, goal, axisOnly, e[0]!), lengthM);
    let inRange = true;
    for (let i = 0; i < m; i++) if (s.qt[i]! < chain.lowerSi[i]! || s.qt[i]! > chain.upperSi[i]!) inRange = false;
    if (!(after <= MIN_GAIN * now) || !inRange) break;
    q.set(s.qt);
    now = after;
    changed = true;
    h = Math.max(Math.abs(t0), 1e-5);
  }
  return changed;
}
