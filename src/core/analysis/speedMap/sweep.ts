/**
 * Joint-space sweep of the speed maps: islands of solutions that neither a discovery cell nor the flood reaches
 * (short sheets cut off by joint limits near the base, sheets that cross axis 1 with a half turn of axis 1) are
 * found from seeded random joint values within the ranges. Each sample is turned about axis 1 into the plane (on
 * either side of the axis); when its tool direction lies within a cone about the reference direction and the cell
 * nearest its flange is not full, inverse kinematics from it snaps it to that cell, and a solution on a new sheet
 * floods it (continuation.ts). Before the sweep, discoverAlongAxis seeds the columns at r ≤ 0 directly (samples
 * rarely land there). Deterministic: the samples come from the seeded generator. Test: sweep.test.ts (the issue's
 * reproductions, Monte Carlo coverage). Maps solved in closed form (ortho-parallel class) skip both: discoverFamilies
 * solves the cells the closed form leaves (a family of solutions on axis 1) directly.
 */
import { createScratch, forwardInto } from "../../kinematics/forward";
import { couplesDrivenJoints, keepSolutionsInto, type KeepContext } from "../../kinematics/closedFormKeep";
import { orthoParallelFamilyInto, orthoParallelKinInto } from "../../kinematics/orthoParallel";
import { solveIkInto } from "../../kinematics/inverse";
import { mulberry32 } from "../../math/random";
import { flood } from "./continuation";
import {
  MAX_CONTINUATION_JUMP_RAD,
  pairTwin,
  push,
  setTargetInto,
  solAt,
  solvedInClosedForm,
  storeQ,
  type MapRun,
} from "./state";

/** Largest angle between a sample's tool direction and the reference one for the sample to be snapped, rad. */
export const SWEEP_CONE_RAD = (20 * Math.PI) / 180;
/** Rows between the axis-column discovery cells, and the seeds tried at each. */
const AXIS_EVERY_ROWS = 5;
const AXIS_SEEDS = 8;
/** Snaps tried at one empty cell before the sweep gives it up. */
const SWEEP_TRIES_PER_CELL = 2;

/** Rotates the vector (x, y, z) about unit axis u by angle φ (Rodrigues) into out[0..2]. */
function rotateInto(out: number[], u: readonly number[], phi: number, x: number, y: number, z: number): void {
  const c = Math.cos(phi),
    s = Math.sin(phi);
  const ux = u[0]!,
    uy = u[1]!,
    uz = u[2]!;
  const d = (ux * x + uy * y + uz * z) * (1 - c);
  out[0] = x * c + (uy * z - uz * y) * s + ux * d;
  out[1] = y * c + (uz * x - ux * z) * s + uy * d;
  out[2] = z * c + (ux * y - uy * x) * s + uz * d;
}

/** Whether q lies within a continuation step of a solution held at `cell` (revolute joints by whole turns). */
function nearHeld(run: MapRun, cell: number, q: Float64Array): boolean {
  const { K, m, wraps, pool } = run;
  for (let k = 0; k < run.count[cell]!; k++) {
    const base = solAt(run, cell * K + k);
    let jump = 0;
    for (let i = 0; i < m && jump < MAX_CONTINUATION_JUMP_RAD; i++) {
      let d = Math.abs(pool[base + i]! - q[i]!);
      if (wraps[i]) d = Math.abs(d - 2 * Math.PI * Math.round(d / (2 * Math.PI)));
      jump = Math.max(jump, d);
    }
    if (jump < MAX_CONTINUATION_JUMP_RAD) return true;
  }
  return false;
}

/** `v` moved by whole turns into [lo, hi]; NaN when no such value exists. */
function intoRange(v: number, lo: number, hi: number): number {
  const turn = 2 * Math.PI;
  let w = v - turn * Math.ceil((v - hi) / turn);
  if (w < lo) return NaN;
  if (w - turn >= lo && Math.abs(w - turn) < Math.abs(w)) w -= turn;
  return w;
}

/**
 * Sense of axis 1 against the plane's `up`: +1 when increasing the first driven joint turns the arm
 * counterclockwise about `up`, −1 the other way; 0 when axis 1 is prismatic (the sweep is then skipped).
 */
function axisSense(run: MapRun): number {
  const { chain, plane } = run;
  if (chain.isPrismatic[chain.drivenJoint[0]!]) return 0;
  // A point off axis 1 moved by a small turn of joint 1: its velocity against up × (p − o).
  const q = new Float64Array(run.m);
  for (let i = 0; i < run.m; i++) q[i] = 0.5 * (Math.max(chain.lowerSi[i]!, -3) + Math.min(chain.upperSi[i]!, 3));
  let best = 0;
  for (let attempt = 0; attempt < 8 && best === 0; attempt++) {
    q[1 % run.m] = q[1 % run.m]! + 0.1 * attempt;
    // forwardInto returns the scratch's flange: the first position is copied before the second call.
    const t0 = forwardInto(chain, q, run.kin);
    const p0 = [t0[3]!, t0[7]!, t0[11]!];
    const p = [p0[0]! - plane.o[0]!, p0[1]! - plane.o[1]!, p0[2]! - plane.o[2]!];
    q[0] = q[0]! + 1e-4;
    const t1 = forwardInto(chain, q, run.kin);
    q[0] = q[0]! - 1e-4;
    const v = [t1[3]! - p0[0]!, t1[7]! - p0[1]!, t1[11]! - p0[2]!];
    const u = plane.up;
    const w = [u[1]! * p[2]! - u[2]! * p[1]!, u[2]! * p[0]! - u[0]! * p[2]!, u[0]! * p[1]! - u[1]! * p[0]!];
    const dot = v[0]! * w[0]! + v[1]! * w[1]! + v[2]! * w[2]!;
    if (Math.hypot(w[0]!, w[1]!, w[2]!) > 1e-3) best = Math.sign(dot);
  }
  return best;
}

/**
 * The sweep: `options.jointSamples` seeded samples (none when 0 or absent). An empty cell is tried up to
 * SWEEP_TRIES_PER_CELL times, a held one once and on redundant arms only, and a solution found there is kept only when it is not within a
 * continuation step of one held already (a new sheet, not a point of a known one). Each new solution floods its
 * sheet into every cell it reaches, filled or not; the output keeps the best branch per cell, so a held figure
 * only changes when a better branch is found.
 */
export function sweepJointSpace(run: MapRun): void {
  const samples = run.options.jointSamples ?? 0;
  const sense = samples > 0 ? axisSense(run) : 0;
  if (sense === 0) return;
  const { chain, m, qTry, grid, plane, count, target } = run;
  const { nx, ny, rMinMm, zMinMm, stepMm } = grid;
  const tries = run.ws.u8("sweepTries", run.cells);
  tries.fill(0);
  const rnd = mulberry32(run.options.seed ^ (run.orientation === "down" ? 0x5a17 : 0x3c29));
  const cosCone = Math.cos(SWEEP_CONE_RAD);
  // The reference tool direction (every cell's target has the same orientation).
  const tz = [target[2]!, target[6]!, target[10]!];
  const up = plane.up,
    rad = plane.radial;
  const side = [
    up[1]! * rad[2]! - up[2]! * rad[1]!,
    up[2]! * rad[0]! - up[0]! * rad[2]!,
    up[0]! * rad[1]! - up[1]! * rad[0]!,
  ];
  const dir = [0, 0, 0];
  const q = new Float64Array(m);
  // Held cells are snapped to on redundant arms only: there the flood follows one path through the self-motion and
  // leaves better points of it (and the sheets beyond) unvisited; a six-axis arm's sheets are found from empty cells.
  const redundant = m > 6;
  for (let n = 0; n < samples; n++) {
    for (let i = 0; i < m; i++) {
      const lo = Math.max(chain.lowerSi[i]!, -2 * Math.PI),
        hi = Math.min(chain.upperSi[i]!, 2 * Math.PI);
      // Every other sample puts some joints exactly at a limit: islands pinned against limits are found too.
      const u = rnd();
      q[i] = n % 2 === 1 && u < 0.15 ? lo : n % 2 === 1 && u > 0.85 ? hi : lo + (hi - lo) * rnd();
    }
    const t = forwardInto(chain, q, run.kin);
    const px = t[3]! - plane.o[0]!,
      py = t[7]! - plane.o[1]!,
      pz = t[11]! - plane.o[2]!;
    const a = px * rad[0]! + py * rad[1]! + pz * rad[2]!,
      b = px * side[0]! + py * side[1]! + pz * side[2]!;
    const d = Math.hypot(a, b),
      heading = Math.atan2(b, a);
    const zMm = (t[3]! * up[0]! + t[7]! * up[1]! + t[11]! * up[2]!) * 1000;
    const iy = Math.round((zMm - zMinMm) / stepMm);
    if (iy < 0 || iy >= ny) continue;
    // Onto +radial (r = d), and onto −radial (r = −d) where the grid has columns behind the axis.
    for (let c = 0; c < 2; c++) {
      const rMm = (c === 0 ? d : -d) * 1000;
      const ix = Math.round((rMm - rMinMm) / stepMm);
      if (ix < 0 || ix >= nx || (c === 1 && d === 0)) continue;
      const cell = ix + iy * nx;
      if (solvedInClosedForm(run, cell)) continue;
      const held = count[cell]!;
      if (held >= run.K || (held > 0 && !redundant) || tries[cell]! >= (held > 0 ? 1 : SWEEP_TRIES_PER_CELL)) continue;
      const phi = c === 0 ? -heading : Math.PI - heading;
      rotateInto(dir, up, phi, t[2]!, t[6]!, t[10]!);
      if (dir[0]! * tz[0]! + dir[1]! * tz[1]! + dir[2]! * tz[2]! < cosCone) continue;
      const q1 = intoRange(q[0]! + sense * phi, chain.lowerSi[0]!, chain.upperSi[0]!);
      if (Number.isNaN(q1)) continue;
      tries[cell] = tries[cell]! + 1;
      qTry.set(q);
      qTry[0] = q1;
      setTargetInto(run, target, cell);
      if (!solveIkInto(qTry, chain, target, qTry, run.ik, run.discoveryIk)) continue;
      if (held > 0 && nearHeld(run, cell, qTry)) break;
      const slot = storeQ(run, cell, qTry);
      if (slot >= 0) {
        push(run, cell, slot);
        pairTwin(run, cell, slot);
        flood(run);
      }
      break;
    }
  }
}

/**
 * Discovery along axis 1: the columns at r ≤ 0, at every AXIS_EVERY_ROWS-th row, from AXIS_SEEDS seeded random joint
 * values (every other one with some joints at a limit) at each empty cell. Sheets break where the flange passes
 * axis 1 (joint 1 turns fast there, the continuation's joint jump is large), so the columns behind the axis are
 * islands the flood from r > 0 does not enter; along the axis a solution floods its column.
 */
export function discoverAlongAxis(run: MapRun): void {
  const { chain, m, qTry, grid, count, target } = run;
  const { nx, ny, rMinMm, stepMm } = grid;
  const columns = Math.min(nx - 1, Math.floor(-rMinMm / stepMm));
  const rnd = mulberry32(run.options.seed ^ (run.orientation === "down" ? 0x4e1d : 0x1b93));
  for (let ix = 0; ix <= columns; ix++) {
    for (let iy = ix % AXIS_EVERY_ROWS; iy < ny; iy += AXIS_EVERY_ROWS) {
      const cell = ix + iy * nx;
      if (solvedInClosedForm(run, cell)) continue;
      for (let t = 0; t < AXIS_SEEDS && count[cell]! === 0; t++) {
        for (let i = 0; i < m; i++) {
          const lo = Math.max(chain.lowerSi[i]!, -Math.PI),
            hi = Math.min(chain.upperSi[i]!, Math.PI);
          const u = rnd();
          qTry[i] = t % 2 === 1 && u < 0.15 ? lo : t % 2 === 1 && u > 0.85 ? hi : lo + (hi - lo) * rnd();
        }
        setTargetInto(run, target, cell);
        if (!solveIkInto(qTry, chain, target, qTry, run.ik, run.discoveryIk)) continue;
        const slot = storeQ(run, cell, qTry);
        if (slot >= 0) {
          push(run, cell, slot);
          pairTwin(run, cell, slot);
          flood(run);
        }
      }
    }
  }
}

/** Values of joint 1 tried on a family of solutions (discoverFamilies), spread over its range: 10° apart over a turn. */
export const FAMILY_SAMPLES = 37;

/**
 * Closed form: the cells the closed form could not solve because they lie on a family of solutions (the wrist
 * centre on axis 1, where every θ₁ is one; ortho-parallel chains only) are seeded with the family's members at
 * FAMILY_SAMPLES values of θ₁ spread over joint 1's range, those within the ranges stored and flooded as the sweep's
 * are. At the other degenerate cells (isolated nodes on a wrist-singular curve) the branches whose wrist is not
 * singular are solved in closed form, the singular one entered by the continuation from the closed-form
 * neighbours. Returns true when it ran (the random searches then have nothing to find), false when it does not
 * apply.
 */
export function discoverFamilies(run: MapRun): boolean {
  const { chain, m, closed, closedCount } = run;
  const op = closed?.orthoParallel;
  if (!run.closedContinuation || !op || !closedCount || run.options.discoverEveryCell === false) return false;
  const ctx: KeepContext = {
    chain,
    kinSol: new Float64Array(FAMILY_SAMPLES * 4 * 6),
    q6: new Float64Array(6),
    kin: createScratch(chain),
    coupled: couplesDrivenJoints(chain),
  };
  const kept = new Float64Array(FAMILY_SAMPLES * 4 * 6);
  const lo = Math.max(chain.lowerSi[0]!, -Math.PI) + chain.couplingOffset[0]!,
    hi = Math.min(chain.upperSi[0]!, Math.PI) + chain.couplingOffset[0]!;
  for (let cell = 0; cell < run.cells; cell++) {
    if (closedCount[cell]! >= 0) continue;
    setTargetInto(run, run.closedTarget, cell);
    let n = orthoParallelFamilyInto(op, run.closedTarget, ctx.kinSol, FAMILY_SAMPLES, lo, hi, ctx);
    // Not on axis 1: a branch's wrist is singular there (a node on a wrist-singular curve); the other branches are
    // solved in closed form here, the singular one reached by the continuation from the neighbours.
    if (n < 0) n = orthoParallelKinInto(op, run.closedTarget, ctx.kinSol, ctx, null, true);
    if (n < 0) continue;
    const k = keepSolutionsInto(kept, 0, ctx, run.closedTarget, n, op.check, run.repairNearLimit);
    for (let s = 0; s < k; s++) {
      run.qTry.set(kept.subarray(s * m, s * m + m));
      const slot = storeQ(run, cell, run.qTry);
      if (slot >= 0) {
        push(run, cell, slot);
        pairTwin(run, cell, slot);
        flood(run);
      }
    }
  }
  return true;
}
