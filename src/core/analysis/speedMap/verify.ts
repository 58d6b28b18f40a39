/**
 * Verification and figures of a solution as it leaves the flood queue: forward kinematics and Jacobian once, the
 * guaranteed straight-line speed and det J from them, and the check of a continuation solve's trusted last step
 * (corrected by VERIFY_IK when it misses the tolerance).
 */
import { ikSeedPoseInto, solveIkInto, taskErrorInto, withinIkTolerance } from "../../kinematics/inverse";
import { wristTwinInto } from "../../kinematics/wristFlip";
import { determinantInPlace } from "../../math/linsolve";
import { guaranteedLineSpeed } from "../../measures/speed";
import { setTargetInto, solAt, type MapRun } from "./state";

/** Forward kinematics and Jacobian of solution (cell, slot) = q into seedPose, and its figures into guaranteedVal, detVal. */
export function slotFigures(run: MapRun, cell: number, slot: number, q: Float64Array): void {
  const { chain, m, seedPose, sp } = run;
  const idx = cell * run.K + slot;
  ikSeedPoseInto(seedPose, chain, q, run.popKin);
  const jac = seedPose.jacobian;
  run.guaranteedVal[idx] = guaranteedLineSpeed(jac, m, chain.maxSpeedSi, sp);
  // det J from the LU the speed figure just made (m = 6); the 4-row task determinant otherwise.
  run.detVal[idx] =
    m === 6
      ? sp.lastDet / run.lengthCubed
      : taskDeterminant(jac, m, chain.characteristicLengthM, seedPose.flange, run.detWork);
}

/** Whether flange pose t meets the continuation tolerances at the target (the solver's own error measure). */
function withinTolerance(run: MapRun, t: Float64Array, goal: Float64Array): boolean {
  return withinIkTolerance(taskErrorInto(run.poseError, goal, t, run.task === "axis"), run.continuationIk);
}

/**
 * Figures of the solution (cell, slot) held in run.qSeed, which sits at pool offset `from`, after checking that it
 * reaches its cell's target (a trusted last step, CONTINUATION_IK) and correcting it (with its twin) if not.
 * Leaves its forward kinematics and Jacobian in run.seedPose. Returns whether run.tangentB holds the sheet's tangent
 * B (the speed figure's by-product; none at a singular pose, where the figure is 0).
 */
export function verifyAndFigure(run: MapRun, cell: number, slot: number, from: number): boolean {
  const { chain, qSeed, qFix, popTarget, K } = run;
  const fromIdx = cell * K + slot;
  slotFigures(run, cell, slot, qSeed);
  // The check of a trusted last step (CONTINUATION_IK), from the forward kinematics just done.
  setTargetInto(run, popTarget, cell);
  if (
    !withinTolerance(run, run.seedPose.flange, popTarget) &&
    solveIkInto(qFix, chain, popTarget, qSeed, run.ik, run.verifyIk, run.seedPose)
  ) {
    run.pool.set(qFix, from);
    qSeed.set(qFix);
    slotFigures(run, cell, slot, qSeed);
    const twin = run.flip ? run.twinSlot[fromIdx]! : -1;
    if (twin >= 0 && wristTwinInto(run.qTwin, run.pool, run.flip!, chain, from))
      run.pool.set(run.qTwin, solAt(run, cell * K + twin));
  }
  // B, the joint rates per unit tool velocity at constant orientation, is the speed figure's by-product (none
  // at a singular pose, where the figure is 0): the tangent of the solution sheet along the plane.
  if (run.usePredictor && run.guaranteedVal[fromIdx]! > 0) {
    run.tangentB.set(run.sp.b);
    return true;
  }
  return false;
}

/**
 * The square task Jacobian with linear rows divided by `lengthM` into `out` (m × m, row-major): the 6 × 6 J for six
 * driven joints; for four, the rows (vx, vy, vz, ω·z_tool) (the tool keeps its axis). False for other m.
 */
export function taskMatrixInto(
  out: Float64Array,
  j: ArrayLike<number>,
  m: number,
  lengthM: number,
  baseFromFlange: Float64Array,
): boolean {
  if (m === 6) {
    for (let i = 0; i < 18; i++) out[i] = j[i]! / lengthM;
    for (let i = 18; i < 36; i++) out[i] = j[i]!;
    return true;
  }
  if (m === 4) {
    for (let i = 0; i < 12; i++) out[i] = j[i]! / lengthM;
    const tx = baseFromFlange[2]!,
      ty = baseFromFlange[6]!,
      tz = baseFromFlange[10]!;
    for (let c = 0; c < 4; c++) out[12 + c] = j[12 + c]! * tx + j[16 + c]! * ty + j[20 + c]! * tz;
    return true;
  }
  return false;
}

/** Determinant of the square task Jacobian of taskMatrixInto (dimensionless; `work` is overwritten). NaN for other m. */
export function taskDeterminant(
  j: ArrayLike<number>,
  m: number,
  lengthM: number,
  baseFromFlange: Float64Array,
  work: Float64Array,
): number {
  return taskMatrixInto(work, j, m, lengthM, baseFromFlange) ? determinantInPlace(work, m) : NaN;
}
