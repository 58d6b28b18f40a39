/**
 * Numerical inverse kinematics by damped least squares (Levenberg–Marquardt), for any chain.
 * Task: the flange pose (position + full orientation) for arms with six or more driven joints; position + tool
 * axis (flange z) for arms with fewer, whose rotation about the tool axis is left free.
 * Orientation error rows are multiplied by the chain's characteristic length so both blocks are in metres.
 * Damping λ² = ‖e‖² + 1e-12 shrinks to zero at the solution (quadratic convergence) and keeps steps bounded
 * near singularities.
 * @see Nakamura & Hanafusa 1986; Wampler 1986 (damped least squares) [from memory];
 *   Siciliano et al., Robotics: Modelling, Planning and Control, §3.7 (inverse kinematics algorithms) [from memory]
 */
import type { Chain } from "./chain";
import { createScratch, forwardInto, jacobianInto, type KinematicsScratch } from "./forward";
import { choleskySolveInPlace, solveInPlace } from "../math/linsolve";
import { rotationErrorInto } from "../math/so3";

export interface IkScratch {
  readonly kin: KinematicsScratch;
  /** Task Jacobian: the 6 × m Jacobian with its angular rows multiplied by the characteristic length. */
  readonly task: Float64Array;
  readonly e: Float64Array;
  readonly a: Float64Array;
  readonly x: Float64Array;
  readonly q: Float64Array;
  readonly y: Float64Array;
  /** Last damped step, m. */
  readonly dq: Float64Array;
  /** Diagonal and right-hand side of a linear system, for the fallback of solveSpd. */
  readonly backup: Float64Array;
}

export function createIkScratch(chain: Chain): IkScratch {
  const m = chain.drivenCount;
  return {
    kin: createScratch(chain),
    task: new Float64Array(6 * m),
    e: new Float64Array(6),
    a: new Float64Array(Math.max(36, m * m)),
    x: new Float64Array(m),
    q: new Float64Array(m),
    y: new Float64Array(6),
    dq: new Float64Array(m),
    backup: new Float64Array(2 * Math.max(6, m)),
  };
}

export interface IkOptions {
  readonly maxIterations: number;
  /** Position tolerance, m. */
  readonly toleranceM: number;
  /** Orientation tolerance, rad. */
  readonly toleranceRad: number;
  /**
   * When the error (m, orientation scaled by the length) is already below this, take one last undamped-enough step
   * and stop without checking it: Newton's quadratic convergence makes the next error far below the tolerance.
   * Steps longer than 1e-3 rad (near a singularity) are checked all the same. 0 turns it off.
   */
  readonly trustFinalStepBelowM?: number;
  /**
   * "full": position and the whole orientation; "axis": position and the tool axis only (rotation about the tool
   * axis left free). Default: full for six or more driven joints, axis otherwise.
   */
  readonly task?: "full" | "axis";
  /**
   * The solve stops as stalled (a joint limit, out of reach) when, after four iterations, an iteration leaves more
   * than this share of the previous error (squared). Default 0.25, right for starts near a solution (continuation);
   * starts far away (finding every solution of a target) converge slowly at first and need a value nearer 1.
   */
  readonly stallRatio?: number;
}

/** Longest joint step (rad or m) still taken without checking it (trustFinalStepBelowM). */
const TRUSTED_STEP_RAD = 1e-3;

export const DEFAULT_IK: IkOptions = { maxIterations: 40, toleranceM: 1e-7, toleranceRad: 1e-6 };

/**
 * Forward kinematics already done at a seed, for solves that start from it (a continuation tries the same seed on
 * up to four neighbouring cells): the first iteration takes the flange pose, the Jacobian and the undamped normal
 * matrix from here instead of computing them again. The solve gives the same result to the bit either way.
 * Fill with ikSeedPoseInto.
 */
export interface IkSeedPose {
  /** Driven joints the pose belongs to. */
  readonly q: Float64Array;
  /** baseFromFlange at q, 16. */
  readonly flange: Float64Array;
  /** Geometric Jacobian at q (flange centre), 6 × m. */
  readonly jacobian: Float64Array;
  /** TᵀT (m ≤ 6) or TTᵀ (m > 6) of the task Jacobian at q, without damping; valid when normalReady. */
  readonly normal: Float64Array;
  normalReady: boolean;
}

export function createIkSeedPose(chain: Chain): IkSeedPose {
  const m = chain.drivenCount;
  return {
    q: new Float64Array(m),
    flange: new Float64Array(16),
    jacobian: new Float64Array(6 * m),
    normal: new Float64Array(Math.max(36, m * m)),
    normalReady: false,
  };
}

/** Forward kinematics and the flange-centre Jacobian at `q` into `pose` (kin is work space). */
export function ikSeedPoseInto(
  pose: IkSeedPose,
  chain: Chain,
  q: ArrayLike<number>,
  kin: KinematicsScratch,
): IkSeedPose {
  const m = chain.drivenCount;
  for (let i = 0; i < m; i++) pose.q[i] = q[i]!;
  const t = forwardInto(chain, pose.q, kin);
  jacobianInto(pose.jacobian, chain, kin, t[3]!, t[7]!, t[11]!);
  for (let i = 0; i < 16; i++) pose.flange[i] = t[i]!;
  pose.normalReady = false;
  return pose;
}

/**
 * The solver's error of flange pose t against the target (both row-major 4×4, m): e[0..2] the position error (m),
 * e[3..5] the rotation vector taking t's orientation onto the target's, or, with axisOnly, the one turning t's tool
 * axis onto the target's (z × z_t, unit length when more than 90° away).
 */
export function taskErrorInto(
  e: Float64Array,
  target: ArrayLike<number>,
  t: ArrayLike<number>,
  axisOnly: boolean,
): Float64Array {
  e[0] = target[3]! - t[3]!;
  e[1] = target[7]! - t[7]!;
  e[2] = target[11]! - t[11]!;
  if (axisOnly) {
    // ω that turns the current tool axis onto the target axis: z × z_t (small-angle form, exact direction).
    const zx = t[2]!,
      zy = t[6]!,
      zz = t[10]!;
    const tx = target[2]!,
      ty = target[6]!,
      tz = target[10]!;
    e[3] = zy * tz - zz * ty;
    e[4] = zz * tx - zx * tz;
    e[5] = zx * ty - zy * tx;
    if (zx * tx + zy * ty + zz * tz < 0) {
      // More than 90° away: push along any perpendicular.
      const n = Math.hypot(e[3]!, e[4]!, e[5]!) || 1;
      e[3] = e[3]! / n;
      e[4] = e[4]! / n;
      e[5] = e[5]! / n;
    }
  } else {
    rotationErrorInto(e, 3, target, 4, t);
  }
  return e;
}

/** Whether an error from taskErrorInto meets the options' position and orientation tolerances. */
export function withinIkTolerance(e: Float64Array, options: IkOptions): boolean {
  return (
    e[0]! * e[0]! + e[1]! * e[1]! + e[2]! * e[2]! <= options.toleranceM * options.toleranceM &&
    e[3]! * e[3]! + e[4]! * e[4]! + e[5]! * e[5]! <= options.toleranceRad * options.toleranceRad
  );
}

/**
 * Solves for driven joints that put the flange at `baseFromFlangeTarget` (row-major 4×4, m), starting from `seed`,
 * keeping every joint inside its range. Writes the solution into `qOut` (may alias `seed`) and returns whether it
 * converged. Allocates nothing.
 */
export function solveIkInto(
  qOut: Float64Array,
  chain: Chain,
  baseFromFlangeTarget: ArrayLike<number>,
  seed: ArrayLike<number>,
  s: IkScratch,
  options: IkOptions = DEFAULT_IK,
  seedPose?: IkSeedPose,
): boolean {
  const m = chain.drivenCount,
    q = s.q,
    e = s.e,
    task = s.task;
  const lengthM = chain.characteristicLengthM;
  const axisOnly = options.task ? options.task === "axis" : m < 6;
  for (let i = 0; i < m; i++) q[i] = Math.min(chain.upperSi[i]!, Math.max(chain.lowerSi[i]!, seed[i]!));
  // The seed pose serves the first iteration only when it belongs to exactly these joints (signed zeros included).
  let pose = seedPose;
  if (seedPose) for (let i = 0; i < m; i++) if (!Object.is(seedPose.q[i], q[i])) pose = undefined;
  const stallRatio = options.stallRatio ?? 0.25;
  const tol2p = options.toleranceM * options.toleranceM,
    tol2r = options.toleranceRad * options.toleranceRad;
  let converged = false;
  let previous = Infinity;
  for (let it = 0; it <= options.maxIterations; it++) {
    const seeded = it === 0 ? pose : undefined;
    const t = seeded ? seeded.flange : forwardInto(chain, q, s.kin);
    taskErrorInto(e, baseFromFlangeTarget, t, axisOnly);
    const ep2 = e[0]! * e[0]! + e[1]! * e[1]! + e[2]! * e[2]!;
    const er2 = e[3]! * e[3]! + e[4]! * e[4]! + e[5]! * e[5]!;
    if (ep2 <= tol2p && er2 <= tol2r) {
      converged = true;
      break;
    }
    if (it === options.maxIterations) break;
    // Stalled (a joint limit or out of reach): the error no longer shrinks by a useful factor.
    const err = ep2 + er2 * lengthM * lengthM;
    if (it >= 4 && err > stallRatio * previous) break;
    previous = err;
    if (seeded) task.set(seeded.jacobian);
    else jacobianInto(task, chain, s.kin, t[3]!, t[7]!, t[11]!);
    for (let i = 3 * m; i < 6 * m; i++) task[i] = task[i]! * lengthM;
    const lambda2 = ep2 + er2 * lengthM * lengthM + 1e-12;
    // Active set: a joint at a limit whose step would push it further out is held, and the step is recomputed
    // without it; otherwise clamping would stall the solver against the limit.
    let stepOk = true;
    let held = false;
    for (let pass = 0; pass <= m; pass++) {
      // The seed's normal matrix holds for the first pass (no joint held yet).
      if (!dampedStepInto(s, chain, e, lambda2, lengthM, pass === 0 ? seeded : undefined)) {
        stepOk = false;
        break;
      }
      const dq = s.dq;
      let changed = false;
      for (let i = 0; i < m; i++) {
        const outward = (q[i]! <= chain.lowerSi[i]! && dq[i]! < 0) || (q[i]! >= chain.upperSi[i]! && dq[i]! > 0);
        if (!outward) continue;
        let active = false;
        for (let r = 0; r < 6; r++) if (task[r * m + i] !== 0) active = true;
        if (!active) continue;
        for (let r = 0; r < 6; r++) task[r * m + i] = 0;
        changed = true;
        held = true;
      }
      if (!changed || pass === m) {
        for (let i = 0; i < m; i++) {
          const v = q[i]! + dq[i]!;
          if (v < chain.lowerSi[i]! || v > chain.upperSi[i]!) held = true;
          q[i] = Math.min(chain.upperSi[i]!, Math.max(chain.lowerSi[i]!, v));
        }
        break;
      }
    }
    if (!stepOk) break;
    const trust = options.trustFinalStepBelowM ?? 0;
    if (!held && err < trust * trust) {
      // Only a short step is trusted: the error it leaves is of the order of L·‖Δq‖², below 1e-6 m for
      // ‖Δq‖ < 1e-3 rad. Near a singularity a small error can take a long step, whose result must be checked.
      let longest = 0;
      for (let i = 0; i < m; i++) longest = Math.max(longest, Math.abs(s.dq[i]!));
      if (longest < TRUSTED_STEP_RAD) {
        converged = true;
        break;
      }
    }
  }
  for (let i = 0; i < m; i++) qOut[i] = q[i]!;
  return converged;
}

/**
 * Solves the damped normal equations (symmetric, positive definite for λ² > 0) by Cholesky; when rounding makes a
 * pivot non-positive (λ² tiny against a rank-deficient matrix), by elimination with pivoting from a saved copy.
 */
function solveSpd(a: Float64Array, x: Float64Array, n: number, backup: Float64Array): boolean {
  // The factorization overwrites the diagonal and the lower triangle only: the upper triangle still holds the
  // matrix, so the diagonal and the right-hand side are all a retry needs.
  for (let i = 0; i < n; i++) {
    backup[i] = a[i * n + i]!;
    backup[n + i] = x[i]!;
  }
  if (choleskySolveInPlace(a, x, n)) return true;
  for (let i = 0; i < n; i++) {
    a[i * n + i] = backup[i]!;
    x[i] = backup[n + i]!;
    for (let j = 0; j < i; j++) a[i * n + j] = a[j * n + i]!;
  }
  return solveInPlace(a, x, n);
}

/**
 * One damped least-squares step from the task Jacobian in s.task (orientation rows already scaled by lengthM) and
 * the error e: Δq = Tᵀ(TTᵀ + λ²I)⁻¹e for redundant arms, (TᵀT + λ²I)⁻¹Tᵀe otherwise. Writes s.dq. With `cache`,
 * the undamped normal matrix of this task is taken from it, or computed and kept there.
 */
function dampedStepInto(
  s: IkScratch,
  chain: Chain,
  e: Float64Array,
  lambda2: number,
  lengthM: number,
  cache?: IkSeedPose,
): boolean {
  const m = chain.drivenCount,
    a = s.a,
    x = s.x,
    task = s.task,
    dq = s.dq;
  const cached = cache !== undefined && cache.normalReady,
    normal = cache?.normal;
  if (cache) cache.normalReady = true;
  if (m > 6) {
    const y = s.y;
    for (let r = 0; r < 6; r++) {
      for (let c = r; c < 6; c++) {
        let v: number;
        if (cached) v = normal![r * 6 + c]!;
        else {
          v = 0;
          for (let k = 0; k < m; k++) v += task[r * m + k]! * task[c * m + k]!;
          if (normal) normal[r * 6 + c] = v;
        }
        a[r * 6 + c] = v + (r === c ? lambda2 : 0);
        a[c * 6 + r] = v + (r === c ? lambda2 : 0);
      }
      y[r] = r < 3 ? e[r]! : e[r]! * lengthM;
    }
    if (!solveSpd(a, y, 6, s.backup)) return false;
    for (let i = 0; i < m; i++) {
      let v = 0;
      for (let k = 0; k < 6; k++) v += task[k * m + i]! * y[k]!;
      dq[i] = v;
    }
    return true;
  }
  // The six task rows written out (sums in row order, as a loop over them would add).
  const m2 = 2 * m,
    m3 = 3 * m,
    m4 = 4 * m,
    m5 = 5 * m;
  for (let r = 0; r < m; r++) {
    const t0 = task[r]!,
      t1 = task[m + r]!,
      t2 = task[m2 + r]!,
      t3 = task[m3 + r]!,
      t4 = task[m4 + r]!,
      t5 = task[m5 + r]!;
    for (let c = r; c < m; c++) {
      let v: number;
      if (cached) v = normal![r * m + c]!;
      else {
        v =
          0 +
          t0 * task[c]! +
          t1 * task[m + c]! +
          t2 * task[m2 + c]! +
          t3 * task[m3 + c]! +
          t4 * task[m4 + c]! +
          t5 * task[m5 + c]!;
        if (normal) normal[r * m + c] = v;
      }
      a[r * m + c] = v + (r === c ? lambda2 : 0);
      a[c * m + r] = v + (r === c ? lambda2 : 0);
    }
    x[r] =
      0 + t0 * e[0]! + t1 * e[1]! + t2 * e[2]! + t3 * e[3]! * lengthM + t4 * e[4]! * lengthM + t5 * e[5]! * lengthM;
  }
  if (!solveSpd(a, x, m, s.backup)) return false;
  for (let i = 0; i < m; i++) dq[i] = x[i]!;
  return true;
}

/**
 * Whether an arm with fewer than six driven joints can still hold a full tool orientation in its reachable poses
 * (a SCARA or palletizer turns its tool about a fixed vertical axis): at a few seeded random poses, a target turned
 * 0.5 rad about the tool axis is solved with the full task. Arms with six or more joints: true.
 */
export function holdsFullOrientation(chain: Chain, random: () => number): boolean {
  const m = chain.drivenCount;
  if (m >= 6) return true;
  const s = createIkScratch(chain);
  const q = new Float64Array(m),
    out = new Float64Array(m),
    target = new Float64Array(16);
  let ok = 0;
  const tries = 5;
  for (let t = 0; t < tries; t++) {
    for (let i = 0; i < m; i++) {
      const lo = Math.max(chain.lowerSi[i]!, -Math.PI),
        hi = Math.min(chain.upperSi[i]!, Math.PI);
      q[i] = lo + (0.25 + 0.5 * random()) * (hi - lo);
    }
    const f = forwardInto(chain, q, s.kin);
    // target = f · Rz(0.5): the same point and tool axis, turned about the tool axis.
    const c = Math.cos(0.5),
      sn = Math.sin(0.5);
    for (let r = 0; r < 3; r++) {
      const a = f[r * 4]!,
        b = f[r * 4 + 1]!;
      target[r * 4] = c * a + sn * b;
      target[r * 4 + 1] = -sn * a + c * b;
      target[r * 4 + 2] = f[r * 4 + 2]!;
      target[r * 4 + 3] = f[r * 4 + 3]!;
    }
    target[15] = 1;
    if (solveIkInto(out, chain, target, q, s, { ...DEFAULT_IK, task: "full" })) ok++;
  }
  return ok * 2 > tries;
}
