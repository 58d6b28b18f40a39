/**
 * Closed-form inverse kinematics of six-revolute arms with a spherical wrist (the last three axes meet in the wrist
 * centre point), for any chain form (dh, mdh, frames), shoulder and elbow offsets and integer couplings
 * (q_kin = G·q_driven + offset with G integer, e.g. a J3 measured from the horizontal).
 *
 * Pieper's decoupling: the flange pose fixes the wrist centre p_w = T_target · w_flange, which depends on the first
 * three joints only. With P(q) = F₀·M₁(q₁)·F₁·M₂(q₂)·F₂·M₃(q₃)·u (u: the wrist centre in the frame M₃ acts in), the
 * rotation about axis 2 keeps two quantities of the point x₁ = F₁⁻¹·M₁⁻¹·F₀⁻¹·p_w: its distance from axis 2's
 * origin and its component along axis 2. Both are sinusoids in q₁ on one side and in q₃ on the other:
 *
 *   A₁ cos q₃ + B₁ sin q₃ + C₁ = D₁ cos q₁ + E₁ sin q₁ + H₁      (squared distance)
 *   A₂ cos q₃ + B₂ sin q₃ + C₂ = D₂ cos q₁ + E₂ sin q₁ + H₂      (component along axis 2)
 *
 * When one side's coefficient rows are linearly dependent (axes 2 ∥ 3, the common case, or axis 2 meeting axis 1),
 * a combination of the two equations holds one unknown only and each unknown follows from a ± arccos (two
 * shoulder and two elbow branches). Otherwise the pair reduces to one equation in q₁ (a quartic in tan(q₁/2)),
 * solved by sampling its sign and bisection. q₂ then follows from a rotation taking one vector onto another
 * (Paden–Kahan subproblem 1). The wrist: Rot(a₄,q₄)·Rot(b₅,q₅)·Rot(b₆,q₆) = W, solved by subproblem 2 (two
 * solutions: wrist flip) and subproblem 1.
 * Joint numbers in this comment are 1-based; the code uses 0-based kinematic indices.
 *
 * Every solution is checked by forward kinematics of the whole chain (positions to 1 µm, orientation to 1e-5) and
 * brought into the joint ranges by whole turns; solutions outside the ranges are dropped.
 * @see Pieper, D. L. (1968), The kinematics of manipulators under computer control, PhD thesis, Stanford [from memory]
 * @see Murray, Li & Sastry (1994), A Mathematical Introduction to Robotic Manipulation, §3.2 (Paden–Kahan
 *   subproblems 1 and 2) [from memory]
 * @see Siciliano et al. (2009), Robotics: Modelling, Planning and Control, §2.12 (kinematic decoupling) [from memory]
 */
import type { Chain } from "./chain";
import { createScratch, forwardInto, wristCentreInto, type KinematicsScratch } from "./forward";
import {
  cross,
  dot,
  mul3,
  mul3At,
  mulRtvAt,
  mulRv,
  mulRtv,
  mulRvAt,
  norm,
  rotInto,
  subproblem1,
  transpose3,
  type Vec3,
} from "../math/mat3";
export { wrapNear } from "../math/angles";
import { couplesDrivenJoints, drivenInRangeInto, keepSolutionsInto } from "./closedFormKeep";
export { RANGE_MARGIN_RAD } from "./closedFormKeep";
import { orthoParallelKinInto, orthoParallelOf, type OrthoParallelIk } from "./orthoParallel";

/** Largest number of solutions of a 6R arm with a spherical wrist: 4 for the position × 2 for the wrist. */
export const MAX_CLOSED_FORM_SOLUTIONS = 8;

/** Result of {@link solveSphericalWristInto} when the pose is degenerate (a family of solutions): use a numeric solver. */
export const DEGENERATE = -1;

export interface SphericalWristIk {
  readonly chain: Chain;
  /** How the position equations are solved. */
  readonly mode: "elbow-first-q1" | "q3-first" | "scan";
  // Chain form (rotations 3×3 row-major, translations), axes.
  readonly r: Float64Array[];
  readonly t: Vec3[];
  readonly axis: Vec3[];
  /** Wrist centre in the flange frame and in the frame joint 2 (0-based) acts in, m. */
  readonly wInFlange: Vec3;
  readonly u: Vec3;
  /** q₃-side coefficients (0-based q2): A₁, B₁, C₁, A₂, B₂, C₂. */
  readonly k2: Float64Array;
  /** Combination factor of the dependent side (λ or μ). */
  readonly factor: number;
  /** Wrist: Q = (R_F4·R_F5·R_F6)ᵀ, b4 = R_F4·a4, b5 = R_F4·R_F5·a5, e5 ⟂ b5. */
  readonly q: Float64Array;
  readonly b4: Vec3;
  readonly b5: Vec3;
  readonly e5: Vec3;
  /** Scale for degeneracy tests, m. */
  readonly lengthM: number;
  /** Constants of the per-target coefficients: c1 = R_F1·a1, |t1|², t1·a0, c1·a0, c1·t1; wrist a3×b4, its square, a3·b4, b4·b5. */
  readonly c1: Vec3;
  readonly t1Sq: number;
  readonly t1a0: number;
  readonly c1a0: number;
  readonly c1t1: number;
  readonly n: Vec3;
  readonly nn: number;
  readonly cw: number;
  readonly b4b5: number;
  readonly kin: KinematicsScratch;
  readonly q6: Float64Array;
  /** Work buffers. */
  readonly work: Float64Array;
  readonly kinSol: Float64Array;
  /** Whether a driven joint is read against another (closedFormKeep.ts couplesDrivenJoints). */
  readonly coupled: boolean;
  /** The ortho-parallel solver (orthoParallel.ts) where the chain is of that class: the same solutions, faster. */
  readonly orthoParallel: OrthoParallelIk | null;
  /** State of a first-solution solve by the ortho-parallel solver, and its per-branch step (no closure per call). */
  readonly firstOnly: FirstOnlyState;
}

interface FirstOnlyState {
  out: Float64Array | null;
  outOffset: number;
  target: ArrayLike<number> | null;
  repair: ((q: Float64Array) => boolean) | undefined;
  kept: number;
  readonly onBranch: (from: number, count: number) => boolean;
}

/** The per-branch keep step of a first-solution solve, bound to its solver once. */
function firstOnlyState(ik: () => SphericalWristIk): FirstOnlyState {
  const f: FirstOnlyState = {
    out: null,
    outOffset: 0,
    target: null,
    repair: undefined,
    kept: 0,
    onBranch: (from, count) => {
      const s = ik();
      f.kept = keepSolutionsInto(f.out!, f.outOffset, s, f.target!, count, s.orthoParallel!.check, f.repair, from, 1);
      return f.kept > 0;
    },
  };
  return f;
}

/** Set when a root was taken at (or rounded onto) a double root: its solutions are then checked by forward kinematics. */
let nearTangent = false;

/**
 * Solutions θ of a·cos θ + b·sin θ = c in (−π, π], written to out[o], out[o+1]; returns their count (0, 1 or 2).
 * −1 when a = b = 0 (no dependence on θ).
 */
function sinusoidRoots(out: Float64Array, o: number, a: number, b: number, c: number, tiny: number): number {
  const r = Math.sqrt(a * a + b * b);
  if (r <= tiny) return -1;
  const x = c / r;
  if (x > 1 + 1e-12 || x < -1 - 1e-12) return 0;
  if (x > 1 - 1e-9 || x < -1 + 1e-9) nearTangent = true;
  const phi = Math.atan2(b, a),
    d = Math.acos(Math.min(1, Math.max(-1, x)));
  out[o] = phi + d;
  if (d < 1e-12) return 1;
  out[o + 1] = phi - d;
  return 2;
}

/**
 * Prepares the closed-form solver for a chain, or returns null when it does not apply (not six revolute driven
 * joints without passive ones, no spherical wrist on the last three axes, non-integer coupling, or a geometry none
 * of the reductions covers). Callers then use the numeric solver (inverse.ts).
 */
export function sphericalWristIk(chain: Chain): SphericalWristIk | null {
  const n = chain.jointCount;
  if (n !== 6 || chain.drivenCount !== 6) return null;
  for (let i = 0; i < 6; i++) if (chain.isPrismatic[i] || chain.drivenJoint[i] !== i) return null;
  const w = chain.wrist;
  if (!w || w.basis !== "spherical" || w.axes.length !== 3 || w.axes[0] !== 3 || w.axes[1] !== 4 || w.axes[2] !== 5)
    return null;
  const g = chain.couplingGain;
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j < 6; j++) {
      const v = g[i * 6 + j]!;
      if (Math.abs(v - Math.round(v)) > 1e-12 || (j > i && v !== 0) || (j === i && v !== 1)) return null;
    }
  }
  const L = chain.characteristicLengthM;
  const r: Float64Array[] = [],
    t: Vec3[] = [],
    axis: Vec3[] = [];
  for (let i = 0; i <= 6; i++) {
    const f = chain.fixed.subarray(16 * i, 16 * i + 16);
    r.push(Float64Array.from([f[0]!, f[1]!, f[2]!, f[4]!, f[5]!, f[6]!, f[8]!, f[9]!, f[10]!]));
    t.push([f[3]!, f[7]!, f[11]!]);
  }
  for (let i = 0; i < 6; i++)
    axis.push([chain.axisLocal[3 * i]!, chain.axisLocal[3 * i + 1]!, chain.axisLocal[3 * i + 2]!]);

  // Wrist centre in the flange frame and in the frame joint 2 acts in, from the home pose.
  const kin = createScratch(chain);
  forwardInto(chain, new Float64Array(6), kin);
  const pw = new Float64Array(3);
  wristCentreInto(pw, chain, kin);
  const fl = kin.flange,
    mf = kin.motionFrames;
  const rel = (frame: ArrayLike<number>, o: number): Vec3 => {
    const dx = pw[0]! - frame[o + 3]!,
      dy = pw[1]! - frame[o + 7]!,
      dz = pw[2]! - frame[o + 11]!;
    return [
      frame[o]! * dx + frame[o + 4]! * dy + frame[o + 8]! * dz,
      frame[o + 1]! * dx + frame[o + 5]! * dy + frame[o + 9]! * dz,
      frame[o + 2]! * dx + frame[o + 6]! * dy + frame[o + 10]! * dz,
    ];
  };
  const wInFlange = rel(fl, 0);
  const u3 = rel(mf, 16 * 3); // on axis 3, so unchanged by its motion
  const ru3 = mulRv(r[3]!, u3);
  const u: Vec3 = [ru3[0] + t[3]![0], ru3[1] + t[3]![1], ru3[2] + t[3]![2]];

  // q2-side coefficients. v(q2) = R_F2·Rot(a2,q2)·u + t_F2 in the frame joint 1 acts in.
  const a2 = axis[2]!,
    uPar = dot(a2, u),
    uPerp: Vec3 = [u[0] - uPar * a2[0], u[1] - uPar * a2[1], u[2] - uPar * a2[2]],
    aXu = cross(a2, u);
  const wv = mulRtv(r[2]!, t[2]!),
    bv = mulRtv(r[2]!, axis[1]!);
  const A1 = 2 * dot(wv, uPerp),
    B1 = 2 * dot(wv, aXu),
    C1 = dot(u, u) + dot(t[2]!, t[2]!) + 2 * uPar * dot(wv, a2);
  const A2 = dot(bv, uPerp),
    B2 = dot(bv, aXu),
    C2 = uPar * dot(bv, a2) + dot(axis[1]!, t[2]!);
  const k2 = Float64Array.from([A1, B1, C1, A2, B2, C2]);
  // q0-side direction vectors (in the plane ⟂ a0): d1 = −2·t1⊥, d2 = (R_F1·a1)⊥.
  const a0 = axis[0]!,
    t1 = t[1]!,
    c1 = mulRv(r[1]!, axis[1]!);
  const perp = (x: Vec3): Vec3 => {
    const k = dot(a0, x);
    return [x[0] - k * a0[0], x[1] - k * a0[1], x[2] - k * a0[2]];
  };
  const d1 = perp([-2 * t1[0], -2 * t1[1], -2 * t1[2]]),
    d2 = perp(c1);
  const n1 = Math.hypot(A1, B1),
    n2 = Math.hypot(A2, B2);
  if (n1 < 1e-9 * L * L) return null; // wrist centre on axis 2: no elbow equation
  let mode: SphericalWristIk["mode"];
  let factor = 0;
  const lambda = (A1 * A2 + B1 * B2) / (n1 * n1);
  const q2Dependent = n2 < 1e-9 * L || Math.abs(A1 * B2 - A2 * B1) < 1e-9 * n1 * n2;
  const dq0: Vec3 = [d2[0] - lambda * d1[0], d2[1] - lambda * d1[1], d2[2] - lambda * d1[2]];
  if (q2Dependent && norm(dq0) > 1e-9) {
    mode = "elbow-first-q1";
    factor = lambda;
  } else if (
    ENABLE_UNVERIFIED_REDUCTIONS &&
    norm(d2) > 1e-9 &&
    norm(cross(d1, d2)) < 1e-9 * Math.max(norm(d1), 1e-300) * norm(d2)
  ) {
    mode = "q3-first";
    factor = dot(d1, d2) / dot(d2, d2);
  } else if (ENABLE_UNVERIFIED_REDUCTIONS && !q2Dependent) {
    mode = "scan";
  } else {
    return null;
  }

  // Wrist.
  const rf456 = mul3(mul3(r[4]!, r[5]!), r[6]!);
  const b4 = mulRv(r[4]!, axis[4]!),
    b5 = mulRv(mul3(r[4]!, r[5]!), axis[5]!);
  const a3 = axis[3]!;
  if (norm(cross(a3, b4)) < 1e-6 || norm(cross(b4, b5)) < 1e-6) return null;
  // A unit vector perpendicular to b5.
  const seedVec: Vec3 = Math.abs(b5[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const e5raw = cross(b5, seedVec),
    e5n = norm(e5raw);
  const e5: Vec3 = [e5raw[0] / e5n, e5raw[1] / e5n, e5raw[2] / e5n];
  const solver: SphericalWristIk = {
    coupled: couplesDrivenJoints(chain),
    orthoParallel: orthoParallelOf(chain, wInFlange),
    firstOnly: firstOnlyState(() => solver),
    chain,
    mode,
    r,
    t,
    axis,
    wInFlange,
    u,
    k2,
    factor,
    q: transpose3(rf456),
    b4,
    b5,
    e5,
    lengthM: L,
    kin,
    c1,
    t1Sq: dot(t1, t1),
    t1a0: dot(t1, a0),
    c1a0: dot(c1, a0),
    c1t1: dot(c1, t1),
    n: cross(a3, b4),
    nn: dot(cross(a3, b4), cross(a3, b4)),
    cw: dot(a3, b4),
    b4b5: dot(b4, b5),
    work: new Float64Array(96),
    kinSol: new Float64Array(MAX_CLOSED_FORM_SOLUTIONS * 6),
    q6: new Float64Array(6),
  };
  return solver;
}

/**
 * The "q3-first" reduction and the general scan are written but not yet verified: the scan misses or mislocates
 * roots on random general chains (closedForm.test.ts). Until fixed, those geometries return null from
 * sphericalWristIk and use the numeric solver; only the verified reduction (axes 2 and 3 parallel, or any chain
 * whose q₃-side rows are dependent) is used.
 */
const ENABLE_UNVERIFIED_REDUCTIONS = false;

/** Number of samples of the q₁ scan (general geometry only). */
const SCAN_SAMPLES = 180;

// Offsets into the work buffer.
const W_Q0 = 0,
  W_Q2 = 4,
  W_ROOTS = 8,
  W_P0 = 16,
  W_X = 19,
  W_Y = 22,
  W_V = 25,
  W_QV = 28,
  W_E = 31,
  W_F = 34;
const W_RA = 40,
  W_ROT = 49,
  W_TMP = 58,
  W_WP = 67,
  W_CS = 82,
  /** q₁-side coefficients of the target: D₁, E₁, H₁, D₂, E₂, H₂. */
  W_K = 84;

/** Set when a wrist solution lies near the wrist-singular pose: the solutions are then checked by forward kinematics. */
let wristNearSingular = false;

/**
 * Every inverse-kinematics solution for the flange pose `baseFromFlangeTarget` (row-major 4×4, m), as driven joint
 * values (rad, m = 6 per solution) inside the joint ranges, each revolute joint taken by whole turns to the value
 * nearest to 0 within its range. Writes `out` (at least 8·6 long) and returns the number of solutions, or
 * {@link DEGENERATE} when the pose lies on a family of solutions (wrist centre on axis 1 or 2, axes 4 and 6 in
 * line), where the caller should fall back to a numeric solver. Allocates nothing.
 * A solution ≤ RANGE_MARGIN_RAD beyond a limit is put onto it, kept if it meets the target or `repairNearLimit(q)` does.
 * Steps: the target's coefficients, the position branches (q0, q2), per branch q1 and the wrist (kinematic joint
 * values into ik.kinSol), then the driven values inside the ranges. With `firstOnly`, it returns as soon as a
 * branch gives a solution within the ranges (1 or 2 solutions; a reachability test needs no more).
 * @example the forward kinematics of any pose within the ranges, solved back, gives that pose among the solutions
 *   (test/core/kinematics/closedForm.test.ts).
 */
export function solveSphericalWristInto(
  out: Float64Array,
  ik: SphericalWristIk,
  baseFromFlangeTarget: ArrayLike<number>,
  outOffset = 0,
  repairNearLimit?: (q: Float64Array) => boolean,
  firstOnly = false,
): number {
  const T = baseFromFlangeTarget;
  const op = ik.orthoParallel;
  if (op) {
    // firstOnly: each branch's pair is kept as it comes (ik.first, made once per solver), and the first kept one
    // ends the solve.
    const f = ik.firstOnly;
    f.out = out;
    f.outOffset = outOffset;
    f.target = T;
    f.repair = repairNearLimit;
    f.kept = 0;
    const count = orthoParallelKinInto(op, T, ik.kinSol, ik, firstOnly ? f.onBranch : null);
    f.target = null;
    f.out = null;
    if (count < 0) return DEGENERATE;
    // Away from double roots and the wrist-singular pose (op.check) its roots lie ≥ 3e-5 rad apart: distinct.
    return firstOnly
      ? f.kept
      : keepSolutionsInto(out, outOffset, ik, T, count, op.check, repairNearLimit, 0, Infinity, !op.check);
  }
  nearTangent = false;
  wristNearSingular = false;
  const tiny = 1e-9 * ik.lengthM,
    w = ik.work;
  if (!targetCoefficientsInto(ik, T, tiny)) return DEGENERATE;
  // Position branches: pairs (q0, q2) in w[W_Q0..] and w[W_Q2..].
  const pairs =
    ik.mode === "elbow-first-q1"
      ? elbowFirstPairs(ik, tiny)
      : ik.mode === "q3-first"
        ? q3FirstPairs(ik, tiny)
        : scanPairs(ik);
  if (pairs < 0) return DEGENERATE;
  // q1 per pair, then the wrist; kinematic solutions into kinSol.
  let count = 0;
  for (let p = 0; p < pairs; p++) {
    const q0 = w[W_Q0 + p]!,
      q2 = w[W_Q2 + p]!;
    const q1 = shoulderAngle(ik, q0, q2, tiny);
    if (Number.isNaN(q1)) return DEGENERATE;
    const from = count;
    if (firstOnly && !branchInRange(ik, from, q0, q1, q2)) continue;
    wristTargetInto(ik, T, q0, q1, q2);
    count = wristSolutionsInto(ik, q0, q1, q2, count);
    if (count < 0) return DEGENERATE;
    const kept = firstOnly
      ? keepSolutionsInto(out, outOffset, ik, T, count, nearTangent || wristNearSingular, repairNearLimit, from)
      : 0;
    if (kept > 0) return kept;
  }
  // Exact roots satisfy the decoupled equations and so the pose; double roots (edge of reach), the scanned
  // general case and a wrist near a singular pose are checked by forward kinematics of the whole chain.
  const check = nearTangent || ik.mode === "scan" || wristNearSingular;
  return keepSolutionsInto(out, outOffset, ik, T, count, check, repairNearLimit);
}

/**
 * The wrist centre of target T in the frame joint 0 acts in (w[W_P0..]) and the q0-side coefficients of the two
 * position equations (w[W_K..]); false when the wrist centre lies on axis 0 (a family of solutions).
 */
function targetCoefficientsInto(ik: SphericalWristIk, T: ArrayLike<number>, tiny: number): boolean {
  const w = ik.work,
    wf = ik.wInFlange;
  // Wrist centre in the base frame, then in the frame joint 0 acts in: p0 = F0⁻¹·p_w.
  const t0 = ik.t[0]!;
  w[W_F] = T[0]! * wf[0] + T[1]! * wf[1] + T[2]! * wf[2] + T[3]! - t0[0];
  w[W_F + 1] = T[4]! * wf[0] + T[5]! * wf[1] + T[6]! * wf[2] + T[7]! - t0[1];
  w[W_F + 2] = T[8]! * wf[0] + T[9]! * wf[1] + T[10]! * wf[2] + T[11]! - t0[2];
  mulRtvAt(w, W_P0, ik.r[0]!, 0, w, W_F);
  const p0x = w[W_P0]!,
    p0y = w[W_P0 + 1]!,
    p0z = w[W_P0 + 2]!;
  const a0 = ik.axis[0]!,
    t1 = ik.t[1]!,
    c1 = ik.c1;
  const pPar = a0[0] * p0x + a0[1] * p0y + a0[2] * p0z;
  const ppx = p0x - pPar * a0[0],
    ppy = p0y - pPar * a0[1],
    ppz = p0z - pPar * a0[2];
  const axx = a0[1] * p0z - a0[2] * p0y,
    axy = a0[2] * p0x - a0[0] * p0z,
    axz = a0[0] * p0y - a0[1] * p0x;
  if (ppx * ppx + ppy * ppy + ppz * ppz < tiny * tiny) return false;
  w[W_K] = -2 * (t1[0] * ppx + t1[1] * ppy + t1[2] * ppz); // D1
  w[W_K + 1] = 2 * (t1[0] * axx + t1[1] * axy + t1[2] * axz); // E1
  w[W_K + 2] = p0x * p0x + p0y * p0y + p0z * p0z + ik.t1Sq - 2 * pPar * ik.t1a0; // H1
  w[W_K + 3] = c1[0] * ppx + c1[1] * ppy + c1[2] * ppz; // D2
  w[W_K + 4] = -(c1[0] * axx + c1[1] * axy + c1[2] * axz); // E2
  w[W_K + 5] = pPar * ik.c1a0 - ik.c1t1; // H2
  return true;
}

/** Mode "elbow-first-q1": q0 from the combined equation, then q2 from the distance one; the pair count or DEGENERATE. */
function elbowFirstPairs(ik: SphericalWristIk, tiny: number): number {
  const w = ik.work,
    k2 = ik.k2,
    l = ik.factor;
  const A1 = k2[0]!,
    B1 = k2[1]!,
    C1 = k2[2]!,
    C2 = k2[5]!;
  const D1 = w[W_K]!,
    E1 = w[W_K + 1]!,
    H1 = w[W_K + 2]!,
    D2 = w[W_K + 3]!,
    E2 = w[W_K + 4]!,
    H2 = w[W_K + 5]!;
  let pairs = 0;
  const nq0 = sinusoidRoots(w, W_ROOTS, D2 - l * D1, E2 - l * E1, C2 - l * C1 - (H2 - l * H1), tiny);
  if (nq0 < 0) return DEGENERATE;
  for (let i = 0; i < nq0; i++) {
    const q0 = w[W_ROOTS + i]!;
    const nq2 = sinusoidRoots(
      w,
      W_ROOTS + 4,
      A1,
      B1,
      D1 * Math.cos(q0) + E1 * Math.sin(q0) + H1 - C1,
      tiny * ik.lengthM,
    );
    for (let k = 0; k < nq2 && pairs < 4; k++, pairs++) {
      w[W_Q0 + pairs] = q0;
      w[W_Q2 + pairs] = w[W_ROOTS + 4 + k]!;
    }
  }
  return pairs;
}

/** Mode "q3-first": q2 from the combined equation, then q0 from the axial one; the pair count or DEGENERATE. */
function q3FirstPairs(ik: SphericalWristIk, tiny: number): number {
  const w = ik.work,
    k2 = ik.k2,
    f = ik.factor;
  const A1 = k2[0]!,
    B1 = k2[1]!,
    C1 = k2[2]!,
    A2 = k2[3]!,
    B2 = k2[4]!,
    C2 = k2[5]!;
  const H1 = w[W_K + 2]!,
    D2 = w[W_K + 3]!,
    E2 = w[W_K + 4]!,
    H2 = w[W_K + 5]!;
  let pairs = 0;
  const nq2 = sinusoidRoots(w, W_ROOTS, A1 - f * A2, B1 - f * B2, H1 - f * H2 - (C1 - f * C2), tiny * ik.lengthM);
  if (nq2 < 0) return DEGENERATE;
  for (let i = 0; i < nq2; i++) {
    const q2 = w[W_ROOTS + i]!;
    const nq0 = sinusoidRoots(w, W_ROOTS + 4, D2, E2, A2 * Math.cos(q2) + B2 * Math.sin(q2) + C2 - H2, tiny);
    if (nq0 < 0) return DEGENERATE;
    for (let k = 0; k < nq0 && pairs < 4; k++, pairs++) {
      w[W_Q0 + pairs] = w[W_ROOTS + 4 + k]!;
      w[W_Q2 + pairs] = q2;
    }
  }
  return pairs;
}

/**
 * Mode "scan" (general geometry):
 * [A1 B1; A2 B2]·(cos q2, sin q2) = (D1 cos q0 + E1 sin q0 + H1 − C1, D2 cos q0 + E2 sin q0 + H2 − C2);
 * h(q0) = cos² + sin² − 1 = 0 (a quartic in tan(q0/2): at most four roots). Returns the pair count.
 */
function scanPairs(ik: SphericalWristIk): number {
  const w = ik.work,
    k2 = ik.k2;
  let pairs = 0;
  const det = k2[0]! * k2[4]! - k2[3]! * k2[1]!; // A1·B2 − A2·B1
  const step = (2 * Math.PI) / SCAN_SAMPLES;
  let qa = -Math.PI,
    ha = scanResidual(ik, qa, det);
  for (let i = 1; i <= SCAN_SAMPLES && pairs < 4; i++) {
    const qb = -Math.PI + i * step,
      hb = scanResidual(ik, qb, det);
    if (ha === 0 || ha < 0 !== hb < 0) {
      // Bisection to machine precision (h changes sign in [qa, qb]).
      let lo = qa,
        hi = qb,
        hlo = ha;
      for (let it = 0; it < 60 && hi - lo > 1e-15; it++) {
        const mid = 0.5 * (lo + hi),
          hm = scanResidual(ik, mid, det);
        if (hm < 0 === hlo < 0 && hm !== 0) {
          lo = mid;
          hlo = hm;
        } else hi = mid;
      }
      const q0 = 0.5 * (lo + hi);
      scanResidual(ik, q0, det);
      w[W_Q0 + pairs] = q0;
      w[W_Q2 + pairs] = Math.atan2(w[W_CS + 1]!, w[W_CS]!);
      pairs++;
    }
    qa = qb;
    ha = hb;
  }
  return pairs;
}

/** q1 of the branch (q0, q2) by subproblem 1; NaN when the wrist centre lies on axis 1 (a family of solutions). */
function shoulderAngle(ik: SphericalWristIk, q0: number, q2: number, tiny: number): number {
  const w = ik.work,
    t1 = ik.t[1]!,
    t2 = ik.t[2]!;
  // x1 = R_F1ᵀ·(Rot(a0, −q0)·p0 − t1); v = R_F2·Rot(a2, q2)·u + t2.
  rotInto(w, W_ROT, ik.axis[0]!, -q0);
  mulRvAt(w, W_Y, w, W_ROT, w, W_P0);
  w[W_Y] = w[W_Y]! - t1[0];
  w[W_Y + 1] = w[W_Y + 1]! - t1[1];
  w[W_Y + 2] = w[W_Y + 2]! - t1[2];
  mulRtvAt(w, W_X, ik.r[1]!, 0, w, W_Y);
  rotInto(w, W_ROT, ik.axis[2]!, q2);
  mulRvAt(w, W_Y, w, W_ROT, ik.u, 0);
  mulRvAt(w, W_V, ik.r[2]!, 0, w, W_Y);
  return subproblem1(
    ik.axis[1]!,
    w[W_V]! + t2[0],
    w[W_V + 1]! + t2[1],
    w[W_V + 2]! + t2[2],
    w[W_X]!,
    w[W_X + 1]!,
    w[W_X + 2]!,
    tiny,
  );
}

/** The rotation the wrist must make, W' = R_Aᵀ·R_target·Q with R_A = R_F0·Rot0·R_F1·Rot1·R_F2·Rot2·R_F3, into w[W_WP..]. */
function wristTargetInto(ik: SphericalWristIk, T: ArrayLike<number>, q0: number, q1: number, q2: number): void {
  const w = ik.work;
  for (let i = 0; i < 9; i++) w[W_RA + i] = ik.r[0]![i]!;
  for (let i = 0; i < 3; i++) {
    rotInto(w, W_ROT, ik.axis[i]!, i === 0 ? q0 : i === 1 ? q1 : q2);
    mul3At(w, W_TMP, w, W_RA, w, W_ROT);
    mul3At(w, W_RA, w, W_TMP, ik.r[i + 1]!, 0);
  }
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++)
      w[W_TMP + i * 3 + j] = w[W_RA + i]! * T[j]! + w[W_RA + 3 + i]! * T[4 + j]! + w[W_RA + 6 + i]! * T[8 + j]!;
  }
  mul3At(w, W_WP, w, W_TMP, ik.q, 0);
}

/**
 * The wrist angles q3, q4, q5 for W' (w[W_WP..]): up to two solutions (wrist flip), appended with q0..q2 to
 * ik.kinSol after the first `count`. Returns the new count, or DEGENERATE when axes 4 and 6 are in line.
 */
function wristSolutionsInto(ik: SphericalWristIk, q0: number, q1: number, q2: number, count: number): number {
  const w = ik.work,
    kinSol = ik.kinSol,
    a3 = ik.axis[3]!,
    b4 = ik.b4,
    b5 = ik.b5,
    e5 = ik.e5,
    n = ik.n;
  // Subproblem 2: Rot(a3, q3)·Rot(b4, q4)·b5 = W'·b5 = qv.
  mulRvAt(w, W_QV, w, W_WP, b5, 0);
  const qvx = w[W_QV]!,
    qvy = w[W_QV + 1]!,
    qvz = w[W_QV + 2]!;
  const cw = ik.cw,
    a3q = a3[0] * qvx + a3[1] * qvy + a3[2] * qvz,
    b4p = ik.b4b5;
  const den = cw * cw - 1;
  const alpha = (cw * b4p - a3q) / den,
    beta = (cw * a3q - b4p) / den;
  const gamma2 = (1 - alpha * alpha - beta * beta - 2 * alpha * beta * cw) / ik.nn;
  if (gamma2 < -1e-9) return count;
  const gamma = Math.sqrt(Math.max(0, gamma2));
  if (gamma2 < 1e-9) wristNearSingular = true;
  mulRvAt(w, W_E, w, W_WP, e5, 0);
  for (let sgn = 0; sgn < 2; sgn++) {
    if (sgn === 1 && gamma < 1e-12) break;
    const gs = sgn === 0 ? gamma : -gamma;
    const zx = alpha * a3[0] + beta * b4[0] + gs * n[0],
      zy = alpha * a3[1] + beta * b4[1] + gs * n[1],
      zz = alpha * a3[2] + beta * b4[2] + gs * n[2];
    const q4 = subproblem1(b4, b5[0], b5[1], b5[2], zx, zy, zz, 1e-9);
    const q3 = subproblem1(a3, zx, zy, zz, qvx, qvy, qvz, 1e-9);
    // Axes 4 and 6 in line: q3 and q5 share one degree of freedom.
    if (Number.isNaN(q3) || Number.isNaN(q4)) return DEGENERATE;
    // Rot(b5, q5) = Rot(b4, q4)ᵀ·Rot(a3, q3)ᵀ·W'; from its action on e5.
    rotInto(w, W_ROT, a3, -q3);
    mulRvAt(w, W_Y, w, W_ROT, w, W_E);
    rotInto(w, W_ROT, b4, -q4);
    mulRvAt(w, W_X, w, W_ROT, w, W_Y);
    const q5 = subproblem1(b5, e5[0], e5[1], e5[2], w[W_X]!, w[W_X + 1]!, w[W_X + 2]!, 1e-9);
    if (Number.isNaN(q5) || count >= MAX_CLOSED_FORM_SOLUTIONS) continue;
    const o = count * 6;
    kinSol[o] = q0;
    kinSol[o + 1] = q1;
    kinSol[o + 2] = q2;
    kinSol[o + 3] = q3;
    kinSol[o + 4] = q4;
    kinSol[o + 5] = q5;
    count++;
  }
  return count;
}

/** Whether position branch (q0, q1, q2) lies within the ranges of joints 1–3 (checked in kinSol slot s). */
function branchInRange(ik: SphericalWristIk, s: number, q0: number, q1: number, q2: number): boolean {
  ik.kinSol[s * 6] = q0;
  ik.kinSol[s * 6 + 1] = q1;
  ik.kinSol[s * 6 + 2] = q2;
  return drivenInRangeInto(ik.q6, ik.chain, ik.kinSol, s, 3, ik.coupled);
}

/** h(q0) of the general reduction from the coefficients in ik.k2 and w[W_K..]; writes cos q2, sin q2 (unnormalised) to w[W_CS], w[W_CS + 1]. */
function scanResidual(ik: SphericalWristIk, q0: number, det: number): number {
  const w = ik.work,
    k2 = ik.k2;
  const cq = Math.cos(q0),
    sq = Math.sin(q0);
  // D1 cos q0 + E1 sin q0 + (H1 − C1), D2 cos q0 + E2 sin q0 + (H2 − C2).
  const y1 = w[W_K]! * cq + w[W_K + 1]! * sq + (w[W_K + 2]! - k2[2]!),
    y2 = w[W_K + 3]! * cq + w[W_K + 4]! * sq + (w[W_K + 5]! - k2[5]!);
  const c = (k2[4]! * y1 - k2[1]! * y2) / det,
    s = (k2[0]! * y2 - k2[3]! * y1) / det;
  w[W_CS] = c;
  w[W_CS + 1] = s;
  return c * c + s * s - 1;
}
