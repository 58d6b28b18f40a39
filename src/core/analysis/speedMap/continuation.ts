/**
 * Continuation (flood fill) of the speed maps: every solution leaving the queue is verified and given its figures
 * (verify.ts), then solved into its four neighbouring cells from a first-order predictor q + B·Δp (B being the
 * speed figure's joint rates per unit tool velocity) or, near a singularity, from the solution itself. Solutions
 * reached without a large joint jump join one sheet (union-find).
 */
import { ikSeedPoseInto, solveIkInto } from "../../kinematics/inverse";
import {
  closedAt,
  find,
  MAX_CONTINUATION_JUMP_RAD,
  nearestClosedInto,
  pairTwin,
  PREDICTOR_MAX_STEP_RAD,
  push,
  setTargetInto,
  solAt,
  storeClosed,
  storeQ,
  union,
  unionTwins,
  type MapRun,
} from "./state";
import { verifyAndFigure } from "./verify";

/** q + B·Δp for the plane step in direction d (+r, −r, +z, −z) into out; false when the step is long (near a singularity). */
function predictInto(run: MapRun, out: Float64Array, d: number, q: Float64Array): boolean {
  const { m, tangentB } = run;
  const dp = run.planeStep[d]!,
    dx = dp[0]!,
    dy = dp[1]!,
    dz = dp[2]!;
  for (let i = 0; i < m; i++) {
    const v = tangentB[3 * i]! * dx + tangentB[3 * i + 1]! * dy + tangentB[3 * i + 2]! * dz;
    if (!(Math.abs(v) < PREDICTOR_MAX_STEP_RAD)) return false;
    out[i] = q[i]! + v;
  }
  return true;
}

/** Empties the queue: each solution taken from it is continued into its neighbouring cells. */
export function flood(run: MapRun): void {
  const { chain, m, K, grid, count, queue, qSeed, qTry, guaranteedVal, detVal, flip, twinSlot } = run;
  const { nx, ny } = grid;
  while (run.head < run.tail) {
    const cell = queue[run.head++]!,
      slot = queue[run.head++]!;
    const ix = cell % nx,
      iy = (cell - ix) / nx;
    const fromIdx = cell * K + slot;
    const from = solAt(run, fromIdx);
    for (let i = 0; i < m; i++) qSeed[i] = run.pool[from + i]!;
    // A twin takes its figures from its partner (same guaranteed speed, det J negated), once the partner has them.
    const partner = flip ? twinSlot[fromIdx]! : -1;
    let poseReady = false,
      tangentReady = false;
    if (partner >= 0 && !Number.isNaN(guaranteedVal[cell * K + partner]!)) {
      guaranteedVal[fromIdx] = guaranteedVal[cell * K + partner]!;
      detVal[fromIdx] = -detVal[cell * K + partner]!;
    } else {
      tangentReady = verifyAndFigure(run, cell, slot, from);
      poseReady = run.poseReady;
    }
    for (let d = 0; d < 4; d++) {
      const jx = ix + (d === 0 ? 1 : d === 1 ? -1 : 0),
        jy = iy + (d === 2 ? 1 : d === 3 ? -1 : 0);
      if (jx < 0 || jy < 0 || jx >= nx || jy >= ny) continue;
      const next = jx + jy * nx;
      const held = count[next]!;
      if (held >= K) continue;
      const root = find(run, fromIdx);
      let mine = false;
      for (let k = 0; k < held; k++) if (find(run, next * K + k) === root) mine = true;
      if (mine) continue;
      const nClosed = run.closedContinuation ? closedAt(run, next) : -1;
      let closedIdx = -1;
      if (nClosed >= 0) {
        closedIdx = nearestClosedInto(run, qTry, next, nClosed, qSeed);
        if (closedIdx < 0) continue;
      } else {
        setTargetInto(run, run.target, next);
        // First-order predictor q + B·Δp: where the solver's first (damped) step from q would go, without
        // solving for it. The solve from the seed pose remains for poses without B and as the fallback.
        if (!(
          tangentReady &&
          predictInto(run, run.qPred, d, qSeed) &&
          solveIkInto(qTry, chain, run.target, run.qPred, run.ik, run.continuationIk)
        )) {
          if (!poseReady) {
            ikSeedPoseInto(run.seedPose, chain, qSeed, run.popKin);
            poseReady = true;
          }
          if (!solveIkInto(qTry, chain, run.target, qSeed, run.ik, run.continuationIk, run.seedPose)) continue;
        }
      }
      // A large joint jump means the solver left the sheet (it landed on another branch near a singularity):
      // keep the solution, but do not join the sheets.
      let jump = 0;
      for (let i = 0; i < m; i++) jump = Math.max(jump, Math.abs(qTry[i]! - qSeed[i]!));
      const continuous = jump < MAX_CONTINUATION_JUMP_RAD;
      const s2 = closedIdx >= 0 ? storeClosed(run, next, closedIdx, qTry) : storeQ(run, next, qTry);
      if (s2 >= 0) {
        if (continuous) union(run, fromIdx, next * K + s2);
        push(run, next, s2);
        if (flip && pairTwin(run, next, s2) >= 0 && continuous) unionTwins(run, fromIdx, next * K + s2);
      } else if (run.lastEqual >= 0 && continuous) {
        const equal = run.lastEqual;
        union(run, fromIdx, next * K + equal);
        if (flip && pairTwin(run, next, equal) >= 0) unionTwins(run, fromIdx, next * K + equal);
      }
    }
  }
}
