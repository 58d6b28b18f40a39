/**
 * Output of the speed maps: per cell, the best branch (highest guaranteed straight-line speed; ties by the larger
 * maximum tool speed) and its figures, branch name and joints; then the singularity loci along the sheets.
 */
import { forwardInto, jacobianInto, wristCentreInto } from "../../kinematics/forward";
import { branchCode, branchName } from "../../measures/branches";
import { createSingularityScratch, scaledInverseCondition } from "../../measures/singularity";
import { maxToolSpeed } from "../../measures/speed";
import { locusLabeller } from "./labels";
import { traceSingularityLoci } from "./loci";
import { find, MAX_CONTINUATION_JUMP_RAD, solAt, type MapRun } from "./state";
import type { ToolSpeedMap } from "./types";
import { slotFigures } from "./verify";

/** Scratch of the best-branch choice: the best solution's Jacobian (when `ready`) and a candidate's. */
interface BestScratch {
  readonly bestJ: Float64Array;
  readonly j: Float64Array;
  ready: boolean;
  /** The best solution's maximum tool speed, m/s, from b.bestJ (valid when `ready`). */
  bestV: number;
  /** The best solution's guaranteed speed, m/s. */
  bestG: number;
}

/** The joints at pool offset `off`, copied into run.qFix (no view allocated per call). */
function slotJoints(run: MapRun, off: number): Float64Array {
  const q = run.qFix,
    pool = run.pool;
  for (let i = 0; i < run.m; i++) q[i] = pool[off + i]!;
  return q;
}

/** Branch code of solution (cell, slot) (measures/branches.ts; forward kinematics into run.kin); 0 without a frame. */
function slotBranchCode(run: MapRun, cell: number, slot: number): number {
  if (!run.frame) return 0;
  const off = solAt(run, cell * run.K + slot);
  const t = forwardInto(run.chain, slotJoints(run, off), run.kin);
  const c = run.branchCentre;
  if (!wristCentreInto(c, run.chain, run.kin)) {
    c[0] = t[3]!;
    c[1] = t[7]!;
    c[2] = t[11]!;
  }
  return branchCode(run.chain, run.kin, run.frame, c[0]!, c[1]!, c[2]!);
}

/** Jacobian of solution (cell, slot) into `out` (forward kinematics into run.kin). */
function slotJacobianInto(run: MapRun, out: Float64Array, cell: number, slot: number): void {
  const off = solAt(run, cell * run.K + slot);
  const t = forwardInto(run.chain, slotJoints(run, off), run.kin);
  jacobianInto(out, run.chain, run.kin, t[3]!, t[7]!, t[11]!);
}

/**
 * Two figures closer than this count as equal, m/s (0.1 mm/s: the resolution the maps publish, and above the spread
 * the solver tolerance leaves in a figure, so a numeric and a closed-form solution of one branch tie).
 */
export const FIGURE_TIE_M_PER_S = 1e-4;

/**
 * Slot of the best of the n solutions at `cell`: the highest guaranteed speed; among equal ones (within
 * FIGURE_TIE_M_PER_S) the larger maximum speed, then the one with det J > 0 (a wrist-flip twin has the same figures and
 * the opposite sign), then the lower branch code; the first stored only when all of these agree. b.ready tells whether b.bestJ holds its Jacobian, b.bestG its figure.
 */
function bestSlot(run: MapRun, cell: number, n: number, b: BestScratch): number {
  const { chain, m, K, guaranteedVal, detVal, flip, twinSlot, sp } = run;
  let best = -1,
    bestG = -1;
  b.ready = false;
  for (let k = 0; k < n; k++) {
    // Every stored solution went through the queue; computed here only if one had not.
    if (Number.isNaN(guaranteedVal[cell * K + k]!))
      slotFigures(run, cell, k, run.pool.subarray(solAt(run, cell * K + k), solAt(run, cell * K + k) + m));
    const g = guaranteedVal[cell * K + k]!;
    if (best < 0 || g > bestG + FIGURE_TIE_M_PER_S) {
      best = k;
      bestG = g;
      b.ready = false;
      continue;
    }
    if (g < bestG - FIGURE_TIE_M_PER_S) continue;
    // A tie. The best one's twin has the same maximum speed (see pairTwin); others are compared.
    let better = 0,
      vNew = NaN;
    if (!(flip && twinSlot[cell * K + k] === best)) {
      if (!b.ready) {
        slotJacobianInto(run, b.bestJ, cell, best);
        b.bestV = maxToolSpeed(b.bestJ, m, chain.maxSpeedSi, sp);
        b.ready = true;
      }
      slotJacobianInto(run, b.j, cell, k);
      vNew = maxToolSpeed(b.j, m, chain.maxSpeedSi, sp);
      const vOld = b.bestV;
      better = vNew > vOld + FIGURE_TIE_M_PER_S ? 1 : vNew < vOld - FIGURE_TIE_M_PER_S ? -1 : 0;
    }
    if (better === 0) {
      const dNew = detVal[cell * K + k]! > 0,
        dOld = detVal[cell * K + best]! > 0;
      // det J > 0 first; then the lower branch code (a property of the posture, not of the order solutions came in).
      better = dNew !== dOld ? (dNew ? 1 : -1) : slotBranchCode(run, cell, k) < slotBranchCode(run, cell, best) ? 1 : 0;
    }
    if (better > 0) {
      const twin = flip && twinSlot[cell * K + k] === best;
      if (b.ready && !twin) {
        b.bestJ.set(b.j);
        b.bestV = vNew;
      }
      b.ready = b.ready && !twin;
      best = k;
      bestG = g;
    }
  }
  b.bestG = bestG;
  return best;
}

/** The map's per-cell arrays and loci from a finished run. */
export function mapOutput(run: MapRun): ToolSpeedMap {
  const { chain, m, K, cells, grid, count, kin, frame } = run;
  const nx = grid.nx;
  // Figures per cell: best branch by guaranteed speed.
  const guaranteed = new Float64Array(cells).fill(NaN);
  const maxSpeed = new Float64Array(cells).fill(NaN);
  const invCond = new Float64Array(cells).fill(NaN);
  // The inverse condition (a singular value decomposition per cell) only on the nodes a caller keeps.
  const conditionEvery = Math.max(1, Math.ceil(nx / (run.options.conditionMaxColumns ?? Infinity)));
  const detSign = new Int8Array(cells);
  const branch = new Int8Array(cells).fill(-1);
  const joints = new Float64Array(cells * m).fill(NaN);
  const sg = createSingularityScratch(m);
  const codes: number[] = [];
  const c = new Float64Array(3);
  const b: BestScratch = {
    bestJ: new Float64Array(6 * m),
    j: new Float64Array(6 * m),
    ready: false,
    bestV: NaN,
    bestG: -1,
  };
  let reachable = 0;
  for (let cell = 0; cell < cells; cell++) {
    const n = count[cell]!;
    if (n === 0) continue;
    reachable++;
    const best = bestSlot(run, cell, n, b);
    const off = solAt(run, cell * K + best);
    const q = slotJoints(run, off);
    const t = forwardInto(chain, q, kin);
    if (!b.ready) jacobianInto(b.bestJ, chain, kin, t[3]!, t[7]!, t[11]!);
    // The figure from the same Jacobian when the tie comparison already computed it.
    const bestMax = b.ready ? b.bestV : maxToolSpeed(b.bestJ, m, chain.maxSpeedSi, run.sp);
    guaranteed[cell] = b.bestG * 1000;
    maxSpeed[cell] = bestMax * 1000;
    const cx = cell % nx;
    if (cx % conditionEvery === 0 && ((cell - cx) / nx) % conditionEvery === 0)
      invCond[cell] = scaledInverseCondition(b.bestJ, m, chain.characteristicLengthM, sg);
    const dBest = run.detVal[cell * K + best]!;
    detSign[cell] = Number.isFinite(dBest) ? (dBest > 0 ? 1 : dBest < 0 ? -1 : 0) : 0;
    joints.set(q, cell * m);
    if (!wristCentreInto(c, chain, kin)) {
      c[0] = t[3]!;
      c[1] = t[7]!;
      c[2] = t[11]!;
    }
    const code = frame ? branchCode(chain, kin, frame, c[0]!, c[1]!, c[2]!) : 0;
    let idx = codes.indexOf(code);
    if (idx < 0) {
      codes.push(code);
      idx = codes.length - 1;
    }
    branch[cell] = idx;
  }
  const sheet = run.ws.i32("sheet", cells * K);
  for (let i = 0; i < cells * K; i++) sheet[i] = find(run, i);
  const loci = traceSingularityLoci({
    grid,
    slots: K,
    count,
    sheet,
    det: run.detVal,
    joints: run.pool,
    jointsAt: run.at,
    m,
    maxCornerJump: 2 * MAX_CONTINUATION_JUMP_RAD,
    kindAt: locusLabeller(run),
  });
  return {
    orientation: run.orientation,
    grid,
    loci,
    guaranteedMmPerS: guaranteed,
    maxMmPerS: maxSpeed,
    inverseCondition: invCond,
    detSign,
    branch,
    branchNames: codes.map((code) => branchName(frame, code)),
    joints,
    reachableCells: reachable,
  };
}
