/**
 * Verification and figures of a solution as it leaves the flood queue: forward kinematics and Jacobian once, the
 * guaranteed straight-line speed and det J from them, and the check of a continuation solve's trusted last step
 * (corrected by VERIFY_IK when it misses the tolerance).
 */
import { ikSeedPoseInto, solveIkInto, taskErrorInto, withinIkTolerance } from "../../kinematics/inverse";
import { wristTwinInto } from "../../kinematics/wristFlip";
import { determinantInPlace } from "../../math/linsolve";
import { guaranteedFromRates, guaranteedLineSpeed } from "../../measures/speed";
import { orthoLineRatesInto } from "../../kinematics/orthoParallelRates";
import { nearSingular, refineAlongNullMotion } from "./refine";
import { taskMatrixInto } from "./taskMatrix";
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
 * Leaves its forward kinematics and Jacobian in run.seedPose (run.poseReady; not for an exact closed-form solution,
 * whose figures come from the decoupled joint rates). Returns whether run.tangentB holds the sheet's tangent
 * B (the speed figure's by-product; none at a singular pose, where the figure is 0).
 */
export function verifyAndFigure(run: MapRun, cell: number, slot: number, from: number): boolean {
  const { chain, qSeed, qFix, popTarget, K } = run;
  const fromIdx = cell * K + slot;
  // A closed-form cell holds exact solutions: nothing to check, and none sits off its singular pose (refine.ts).
  const exact = run.closedContinuation && run.closedCount![cell]! >= 0;
  if (exact && run.rates) return closedFigures(run, fromIdx, qSeed, run.rates);
  run.poseReady = true;
  slotFigures(run, cell, slot, qSeed);
  // The check of a trusted last step (CONTINUATION_IK), from the forward kinematics just done.
  if (!exact) setTargetInto(run, popTarget, cell);
  if (
    !exact &&
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
  // Near a singular pose the solver's tolerance leaves the solution off the target's pose along the null motion
  // (refine.ts): marked here, where the Jacobian is at hand, and refined once the flood is over.
  if (
    !exact &&
    run.nullStep &&
    nearSingular(run.nullStep, run.seedPose.jacobian, run.seedPose.flange, run.detVal[fromIdx]!)
  )
    run.singularMark[fromIdx] = 1;
  // B, the joint rates per unit tool velocity at constant orientation, is the speed figure's by-product (none
  // at a singular pose, where the figure is 0): the tangent of the solution sheet along the plane.
  if (run.usePredictor && run.guaranteedVal[fromIdx]! > 0) {
    run.tangentB.set(run.sp.b);
    return true;
  }
  return false;
}

/**
 * verifyAndFigure for an exact solution of the ortho-parallel class: the figures from the decoupled joint rates
 * (kinematics/orthoParallelRates.ts: no forward kinematics, no 6 × 6 solve); run.seedPose is not set
 * (run.poseReady false). Returns whether run.tangentB holds B.
 */
function closedFigures(run: MapRun, idx: number, q: Float64Array, rates: NonNullable<MapRun["rates"]>): boolean {
  run.poseReady = false;
  const ok = orthoLineRatesInto(rates.ik, run.chain, q, rates.scratch);
  const g = ok ? guaranteedFromRates(rates.scratch.b, 6, run.chain.maxSpeedSi) : 0;
  run.guaranteedVal[idx] = g;
  run.detVal[idx] = rates.scratch.det / run.lengthCubed;
  if (run.usePredictor && g > 0) {
    run.tangentB.set(rates.scratch.b);
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

/**
 * After the flood: every solution verification marked near singular, and its wrist-flip twin (which took its figures
 * without verification), is stepped along its own null motion onto the pose its cell's target asks for
 * (refine.ts), and its figures recomputed; det J keeps the flood's sign. Done after the flood so the continuation,
 * and with it every other cell, stays as it was.
 */
export function refineNearSingular(run: MapRun): void {
  const { K, singularMark, nullStep, twinSlot, flip } = run;
  if (!nullStep) return;
  for (let idx = 0; idx < singularMark.length; idx++) {
    const cell = Math.floor(idx / K);
    const twin = flip ? twinSlot[idx]! : -1;
    if (singularMark[idx] || (twin >= 0 && singularMark[cell * K + twin])) refineSolution(run, cell, idx - cell * K);
  }
}

/** refineNearSingular for one solution (cell, slot). */
function refineSolution(run: MapRun, cell: number, slot: number): void {
  const { chain, m, K, nullStep, seedPose, popTarget } = run;
  const idx = cell * K + slot;
  const from = solAt(run, idx);
  const q = run.qFix;
  q.set(run.pool.subarray(from, from + m));
  ikSeedPoseInto(seedPose, chain, q, run.popKin);
  setTargetInto(run, popTarget, cell);
  const detScaled = run.detVal[idx]!;
  if (
    !refineAlongNullMotion(nullStep!, q, seedPose.jacobian, seedPose.flange, detScaled, popTarget, run.task === "axis")
  )
    return;
  run.pool.set(q, from);
  slotFigures(run, cell, slot, q);
  // The sign of det J stays the flood's: on the singular pose it is rounding noise, and a flipped sign would draw
  // loci through squares the sheet does not cross. Same sign: the smaller value places the locus closer to it.
  if (!(run.detVal[idx]! * detScaled > 0)) run.detVal[idx] = detScaled;
}
