/**
 * The state of one speed-map run and its solution store: solutions appended to a pool per (cell, slot), sheets
 * joined by union-find, wrist-flip twins, the closed-form cache and the flood queue. The steps (discovery.ts,
 * continuation.ts, verify.ts, output.ts) read and write it through the functions here.
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto, wristCentreInto, type KinematicsScratch } from "../../kinematics/forward";
import {
  createIkScratch,
  createIkSeedPose,
  holdsFullOrientation,
  solveIkInto,
  type IkOptions,
  type IkScratch,
  type IkSeedPose,
} from "../../kinematics/inverse";
import {
  MAX_CLOSED_FORM_SOLUTIONS,
  solveSphericalWristInto,
  sphericalWristIk,
  wrapNear,
  type SphericalWristIk,
} from "../../kinematics/closedForm";
import { wristFlipOf, wristTwinInto, type WristFlip } from "../../kinematics/wristFlip";
import type { OrthoParallelIk } from "../../kinematics/orthoParallel";
import { createOrthoRatesScratch, type OrthoRatesScratch } from "../../kinematics/orthoParallelRates";
import { mulberry32 } from "../../math/random";
import type { Grid2 } from "../../geometry/grid";
import { branchFrame, type BranchFrame } from "../../measures/branches";
import { createSpeedScratch, type SpeedScratch } from "../../measures/speed";
import { createNullStepScratch, type NullStepScratch } from "./refine";
import { mapGrid, sampledBounds, sidePlane, targetInto, targetPositionInto, type Plane } from "./plane";
import type { ReferenceOrientation, SpeedMapOptions } from "./types";

/** Largest joint change between neighbouring cells still taken as one continuous solution, rad (or m). */
export const MAX_CONTINUATION_JUMP_RAD = 0.3;
/** Longest joint change the continuation predictor may make; beyond it (close to a singularity) the damped solver starts. */
export const PREDICTOR_MAX_STEP_RAD = 0.03;
/**
 * Continuation solves: a last short Newton step from an error below 1 mm is taken without checking it (the error
 * left is of the order of L·‖Δq‖² < 1e-6 m); every solution is checked when it leaves the queue, where its forward
 * kinematics is computed anyway, and corrected by VERIFY_IK if it misses the tolerance.
 */
const CONTINUATION_IK: IkOptions = {
  maxIterations: 12,
  toleranceM: 1e-6,
  toleranceRad: 1e-5,
  trustFinalStepBelowM: 1e-3,
};
const VERIFY_IK: IkOptions = { maxIterations: 12, toleranceM: 1e-6, toleranceRad: 1e-5 };
const DISCOVERY_IK: IkOptions = { maxIterations: 60, toleranceM: 1e-7, toleranceRad: 1e-6 };

/**
 * Work arrays of toolSpeedMap (solutions, sheets, queue: tens of MB for a large arm), kept between the maps of one
 * arm so the second map neither allocates them again nor touches fresh memory. The arrays a map returns are never
 * taken from here. Each view is the first `length` entries of a buffer that only grows; contents are not cleared.
 */
export interface SpeedMapWorkspace {
  f64(name: string, length: number): Float64Array;
  i32(name: string, length: number): Int32Array;
  i8(name: string, length: number): Int8Array;
  u8(name: string, length: number): Uint8Array;
}

export function createSpeedMapWorkspace(): SpeedMapWorkspace {
  const buffers = new Map<string, ArrayBuffer>();
  const bytes = (name: string, size: number): ArrayBuffer => {
    let b = buffers.get(name);
    if (!b || b.byteLength < size) {
      b = new ArrayBuffer(size);
      buffers.set(name, b);
    }
    return b;
  };
  return {
    f64: (name, length) => new Float64Array(bytes(name, 8 * length), 0, length),
    i32: (name, length) => new Int32Array(bytes(name, 4 * length), 0, length),
    i8: (name, length) => new Int8Array(bytes(name, length), 0, length),
    u8: (name, length) => new Uint8Array(bytes(name, length), 0, length),
  };
}

/** Everything one map run shares between its steps. Fields without `readonly` change as the run goes. */
export interface MapRun {
  readonly chain: Chain;
  readonly orientation: ReferenceOrientation;
  readonly options: SpeedMapOptions;
  /** Driven joints, slots per cell, cells. */
  readonly m: number;
  readonly K: number;
  readonly cells: number;
  readonly grid: Grid2;
  readonly plane: Plane;
  /** "full": the reference orientation is held; "axis": only the tool axis (rotation about it free). */
  readonly task: "full" | "axis";
  readonly continuationIk: IkOptions;
  readonly verifyIk: IkOptions;
  readonly discoveryIk: IkOptions;
  readonly ws: SpeedMapWorkspace;
  /** Solutions in the order found, m values each; at[cell·K + slot] is the index in the pool. */
  pool: Float64Array;
  pooled: number;
  readonly at: Int32Array;
  readonly count: Uint8Array;
  /** Sheets: union-find over cell·K + slot. */
  readonly parent: Int32Array;
  /** Slot of the equal solution the last storeQ found, −1 when none. */
  lastEqual: number;
  readonly target: Float64Array;
  readonly popTarget: Float64Array;
  readonly ik: IkScratch;
  readonly qTry: Float64Array;
  readonly qSeed: Float64Array;
  readonly qFix: Float64Array;
  readonly qTwin: Float64Array;
  readonly kin: KinematicsScratch;
  readonly popKin: KinematicsScratch;
  readonly seedPose: IkSeedPose;
  readonly frame: BranchFrame | null;
  /** Scratch of a branch code's wrist centre. */
  readonly branchCentre: Float64Array;
  readonly closed: SphericalWristIk | null;
  /** Every cell is solved in closed form and continued from those solutions (closedForm true or "auto"). */
  readonly closedContinuation: boolean;
  /** Closed-form solutions, m values each, appended per cell as solved; closedFirst[cell] = the cell's first one. */
  closedSol: Float64Array | null;
  closedPooled: number;
  readonly closedFirst: Int32Array;
  /** closedSlot[cell·8 + k]: the slot closed-form solution k of the cell is stored in, −1 before (storeClosed). */
  readonly closedSlot: Int8Array;
  readonly closedCount: Int8Array | null;
  readonly closedTarget: Float64Array;
  /** Decoupled joint rates of the ortho-parallel class (closed form only): the figures of exact solutions. */
  readonly rates: { readonly ik: OrthoParallelIk; readonly scratch: OrthoRatesScratch } | null;
  /** Whether run.seedPose holds the forward kinematics and Jacobian of the solution verifyAndFigure last took. */
  poseReady: boolean;
  /** A solution just beyond a joint limit, solved numerically from the limit onto closedTarget (closedAt). */
  readonly repairNearLimit: (q: Float64Array) => boolean;
  /** 1 for revolute driven joints (values 2π apart are the same posture). */
  readonly wraps: Uint8Array;
  readonly flip: WristFlip | null;
  /** twinSlot[cell·K + slot] = the slot of the solution's twin in the same cell, −1 when none. */
  readonly twinSlot: Int8Array;
  /** Per solution: guaranteed straight-line speed (m/s) and scaled det J (square task Jacobians). */
  readonly guaranteedVal: Float64Array;
  readonly detVal: Float64Array;
  readonly sp: SpeedScratch;
  readonly detWork: Float64Array;
  readonly lengthCubed: number;
  readonly poseError: Float64Array;
  /** Scratch of the null-motion refinement near singular poses (refine.ts); null without a square task Jacobian. */
  readonly nullStep: NullStepScratch | null;
  /** Per solution: 1 when verification found it near a singular pose (refined after the flood, refine.ts). */
  readonly singularMark: Uint8Array;
  readonly usePredictor: boolean;
  readonly tangentB: Float64Array;
  readonly qPred: Float64Array;
  /** Plane steps in the base frame, m: +r, −r, +z, −z. */
  readonly planeStep: Float64Array[];
  /** Flood queue of (cell, slot). */
  readonly queue: Int32Array;
  head: number;
  tail: number;
}

/** Sets up a run: plane, grid, task, the solution store (from the workspace) and the scratch of every step. */
export function createMapRun(
  chain: Chain,
  orientation: ReferenceOrientation,
  options: SpeedMapOptions,
  workspace: SpeedMapWorkspace | undefined,
): MapRun {
  const m = chain.drivenCount;
  const plane = sidePlane(chain, options.gravity);
  const bounds = options.boundsMm ?? sampledBounds(chain, plane, options.seed);
  const grid = mapGrid(bounds, options.stepMm);
  const cells = grid.nx * grid.ny,
    K = options.maxBranches;
  // Arms with fewer than six joints that can still turn the tool about its axis (SCARA, palletizer, gantry with a
  // rotary axis) hold the full reference orientation; otherwise only the tool axis (rotation about it free).
  const task: "full" | "axis" = holdsFullOrientation(chain, mulberry32(options.seed ^ 0x51f3)) ? "full" : "axis";
  const ws = workspace ?? createSpeedMapWorkspace();
  // Solutions: appended to a pool in the order found (most cells hold far fewer than K: a cells × K × m array was
  // mostly empty, tens of MB for a large arm); at[cell·K + slot] is the solution's index in the pool.
  const count = ws.u8("count", cells);
  count.fill(0);
  // Sheets: solutions joined by continuation (union-find over cell·K + slot). Within a sheet the solution varies
  // continuously from cell to cell, so a sign change of det J between neighbours is a singular crossing.
  const parent = ws.i32("parent", cells * K);
  for (let i = 0; i < parent.length; i++) parent[i] = i;
  const kin = createScratch(chain);
  // Branch naming frame from the zero pose.
  forwardInto(chain, new Float64Array(m), kin);
  const c0 = new Float64Array(3);
  if (!wristCentreInto(c0, chain, kin)) c0.set([kin.flange[3]!, kin.flange[7]!, kin.flange[11]!]);
  const up: [number, number, number] = [plane.up[0]!, plane.up[1]!, plane.up[2]!];
  // Closed-form inverse kinematics where the chain allows it (six revolute joints, spherical wrist): every solution
  // of a cell solved once and cached; continuation then takes the cached solution nearest to the neighbour's (by
  // whole turns), as the numeric continuation would converge to it. Degenerate cells (a family of solutions: wrist
  // centre on axis 1, axes 4 and 6 in line) and other arms use the numeric solver.
  const closedOption = options.closedForm ?? "auto";
  const candidate = task === "full" && closedOption !== false ? sphericalWristIk(chain) : null;
  const closedMode = closedOption === "auto" ? (candidate?.orthoParallel ? true : false) : closedOption;
  const closed = closedMode !== false ? candidate : null;
  // Every cell's target has the same orientation: it is computed once; setTarget only moves the position.
  const target = new Float64Array(16);
  targetInto(target, plane, 0, 0, orientation, options.gravity, 1);
  // Wrist-flip twins. Six driven joints only: a redundant arm's solutions are not isolated, and its twins would take
  // the slots that solutions elsewhere in its self-motion need.
  const flip = task === "full" && m === 6 && options.wristTwins !== false ? wristFlipOf(chain) : null;
  const twinSlot = ws.i8("twinSlot", flip ? cells * K : 0);
  twinSlot.fill(-1);
  // Per solution (cell·K + slot): figures computed when the solution leaves the queue, from the forward kinematics
  // and Jacobian its continuation solves start from.
  const guaranteedVal = ws.f64("guaranteedVal", cells * K);
  const detVal = ws.f64("detVal", cells * K);
  guaranteedVal.fill(NaN);
  detVal.fill(NaN);
  const step = options.stepMm;
  const ik = createIkScratch(chain),
    verifyIk: IkOptions = { ...VERIFY_IK, task },
    closedTarget = Float64Array.from(target);
  return {
    chain,
    orientation,
    options,
    m,
    K,
    cells,
    grid,
    plane,
    task,
    continuationIk: { ...CONTINUATION_IK, task },
    verifyIk,
    discoveryIk: { ...DISCOVERY_IK, task },
    ws,
    pool: ws.f64("pool", 2 * cells * m),
    pooled: 0,
    at: ws.i32("at", cells * K),
    count,
    parent,
    lastEqual: -1,
    target,
    popTarget: Float64Array.from(target),
    ik,
    qTry: new Float64Array(m),
    qSeed: new Float64Array(m),
    qFix: new Float64Array(m),
    qTwin: new Float64Array(m),
    kin,
    popKin: createScratch(chain),
    seedPose: createIkSeedPose(chain),
    frame: branchFrame(chain, kin, Array.from(c0), up),
    branchCentre: new Float64Array(3),
    closed,
    closedContinuation: closedMode === true,
    // Most cells hold far fewer than 8 solutions (none beyond the reach): a pool from the workspace, grown as needed.
    closedSol: closed ? ws.f64("closedSol", Math.max(cells, 1024) * m) : null,
    closedPooled: 0,
    closedFirst: ws.i32("closedFirst", closed ? cells : 0),
    closedSlot: ws.i8("closedSlot", closed ? cells * MAX_CLOSED_FORM_SOLUTIONS : 0).fill(-1),
    closedCount: closed ? ws.i8("closedCount", cells).fill(-2) : null,
    closedTarget,
    rates:
      closed?.orthoParallel && closedMode === true && m === 6
        ? { ik: closed.orthoParallel, scratch: createOrthoRatesScratch() }
        : null,
    poseReady: false,
    // A solution just beyond a joint limit is solved numerically from the limit with the verification tolerance:
    // the numeric path keeps the poses that solver reaches there (joint on its limit, pose error within tolerance).
    repairNearLimit: (q: Float64Array) => solveIkInto(q, chain, closedTarget, q, ik, verifyIk),
    // Revolute driven joints: values 2π apart are the same arm posture (e.g. q1 = ±180° on the back side of an arm
    // whose J1 range is ±180°); they must not take two of the K slots, or real branches find no room.
    wraps: Uint8Array.from(chain.drivenJoint, (k) => (chain.isPrismatic[k] ? 0 : 1)),
    flip,
    twinSlot,
    guaranteedVal,
    detVal,
    sp: createSpeedScratch(m),
    detWork: new Float64Array(36),
    lengthCubed: chain.characteristicLengthM ** 3,
    poseError: new Float64Array(6),
    nullStep: createNullStepScratch(chain),
    singularMark: ws.u8("singularMark", cells * K).fill(0),
    // Not for redundant arms: there the predictor's minimum-norm tangent and the damped solver's step move along the
    // self-motion differently, and the map follows the path taken.
    usePredictor: m <= 6,
    tangentB: new Float64Array(3 * m),
    qPred: new Float64Array(m),
    planeStep: [0, 1, 2, 3].map((d) => {
      const v = d < 2 ? plane.radial : plane.up,
        sign = d % 2 === 0 ? 1 : -1;
      return Float64Array.from([0, 1, 2], (i) => (sign * step * v[i]!) / 1000);
    }),
    queue: ws.i32("queue", cells * K * 2),
    head: 0,
    tail: 0,
  };
}

export function find(run: MapRun, i: number): number {
  const parent = run.parent;
  while (parent[i] !== i) {
    parent[i] = parent[parent[i]!]!;
    i = parent[i]!;
  }
  return i;
}

export function union(run: MapRun, a: number, b: number): void {
  const ra = find(run, a),
    rb = find(run, b);
  if (ra !== rb) run.parent[Math.max(ra, rb)] = Math.min(ra, rb);
}

/** Offset in the pool of solution (cell·K + slot). */
export function solAt(run: MapRun, idx: number): number {
  return run.at[idx]! * run.m;
}

export function push(run: MapRun, cell: number, slot: number): void {
  run.queue[run.tail++] = cell;
  run.queue[run.tail++] = slot;
}

/** Moves `out`'s position column to the target of `cell` (the orientation stays). */
export function setTargetInto(run: MapRun, out: Float64Array, cell: number): void {
  const { grid } = run;
  const ix = cell % grid.nx,
    iy = (cell - ix) / grid.nx;
  targetPositionInto(out, run.plane, (grid.rMinMm + ix * grid.stepMm) / 1000, (grid.zMinMm + iy * grid.stepMm) / 1000);
}

/** Stores q at `cell` unless an equal solution (revolute joints compared modulo 2π) is there; returns the slot or −1. */
export function storeQ(run: MapRun, cell: number, q: Float64Array): number {
  const { count, at, K, m, wraps } = run;
  const n = count[cell]!;
  run.lastEqual = -1;
  for (let k = 0; k < n; k++) {
    let same = true;
    const base = at[cell * K + k]! * m;
    for (let i = 0; i < m; i++) {
      let d = Math.abs(run.pool[base + i]! - q[i]!);
      if (wraps[i]) d = Math.abs(d - 2 * Math.PI * Math.round(d / (2 * Math.PI)));
      if (d > 1e-4) {
        same = false;
        break;
      }
    }
    if (same) {
      run.lastEqual = k;
      return -1;
    }
  }
  if (n >= K) return -1;
  if ((run.pooled + 1) * m > run.pool.length) {
    const old = run.pool;
    run.pool = run.ws.f64("pool", Math.ceil(1.5 * (run.pooled + 1)) * m);
    run.pool.set(old.subarray(0, run.pooled * m));
  }
  at[cell * K + n] = run.pooled;
  for (let i = 0; i < m; i++) run.pool[run.pooled * m + i] = q[i]!;
  run.pooled++;
  count[cell] = n + 1;
  return n;
}

/**
 * Pairs solution (cell, slot) with its twin: stores the twin (queued like any new solution) unless it is out of
 * range, already there or the cell is full. Returns the twin's slot or −1.
 */
export function pairTwin(run: MapRun, cell: number, slot: number): number {
  const { flip, twinSlot, K } = run;
  if (!flip) return -1;
  const idx = cell * K + slot;
  if (twinSlot[idx]! >= 0) return twinSlot[idx]!;
  if (!wristTwinInto(run.qTwin, run.pool, flip, run.chain, solAt(run, idx))) return -1;
  const stored = storeQ(run, cell, run.qTwin);
  const t = stored >= 0 ? stored : run.lastEqual;
  if (t < 0 || twinSlot[cell * K + t]! >= 0) return -1;
  twinSlot[idx] = t;
  twinSlot[cell * K + t] = slot;
  if (stored >= 0) push(run, cell, stored);
  return t;
}

/** Joins the twins of two joined solutions when they are continuous too (the ± half turns may differ). */
export function unionTwins(run: MapRun, a: number, b: number): void {
  const { K, m, twinSlot, pool } = run;
  const ca = (a / K) | 0,
    cb = (b / K) | 0;
  const ta = twinSlot[a]!,
    tb = twinSlot[b]!;
  if (ta < 0 || tb < 0) return;
  const oa = solAt(run, ca * K + ta),
    ob = solAt(run, cb * K + tb);
  let jump = 0;
  for (let i = 0; i < m; i++) jump = Math.max(jump, Math.abs(pool[oa + i]! - pool[ob + i]!));
  if (jump < MAX_CONTINUATION_JUMP_RAD) union(run, ca * K + ta, cb * K + tb);
}

/** Number of closed-form solutions at a cell (solved on first use); −1 when degenerate or not available. */
export function closedAt(run: MapRun, cell: number): number {
  const { closed, closedCount, closedSol, m } = run;
  if (!closed || !closedCount || !closedSol) return -1;
  let c = closedCount[cell]!;
  if (c === -2) {
    // The orientation is every cell's (closedTarget starts as a copy of target); only the position moves.
    setTargetInto(run, run.closedTarget, cell);
    closedRoom(run, MAX_CLOSED_FORM_SOLUTIONS);
    c = solveSphericalWristInto(run.closedSol!, closed, run.closedTarget, run.closedPooled * m, run.repairNearLimit);
    run.closedFirst[cell] = run.closedPooled;
    if (c > 0) run.closedPooled += c;
    closedCount[cell] = c;
  }
  return c;
}

/** Room in the closed-form pool for `n` more solutions. */
function closedRoom(run: MapRun, n: number): void {
  const m = run.m,
    old = run.closedSol!;
  if ((run.closedPooled + n) * m <= old.length) return;
  run.closedSol = run.ws.f64("closedSol", Math.ceil(1.5 * (run.closedPooled + n)) * m);
  run.closedSol.set(old.subarray(0, run.closedPooled * m));
}

/** Whether `cell` was solved in closed form with every-cell discovery on (it then holds every solution in range). */
export function solvedInClosedForm(run: MapRun, cell: number): boolean {
  return run.closedContinuation && run.options.discoverEveryCell !== false && run.closedCount![cell]! >= 0;
}

/**
 * The closed-form solution at `cell` nearest to `seed` (largest joint difference, revolute joints by whole turns) into
 * `out`; returns its index among the cell's closed-form solutions, −1 when there is none.
 */
export function nearestClosedInto(run: MapRun, out: Float64Array, cell: number, n: number, seed: Float64Array): number {
  const { m, wraps, chain } = run;
  let bestJump = Infinity,
    best = -1;
  const sols = run.closedSol!;
  for (let k = 0; k < n; k++) {
    const off = (run.closedFirst[cell]! + k) * m;
    let jump = 0;
    for (let i = 0; i < m && jump < bestJump; i++) {
      const v = sols[off + i]!,
        s = seed[i]!;
      // In range and within half a turn of the seed needs no wrapping (the usual case).
      const d = Math.abs(v - s);
      jump = Math.max(
        jump,
        d <= Math.PI || !wraps[i] ? d : Math.abs(wrapNear(v, s, chain.lowerSi[i]!, chain.upperSi[i]!) - s),
      );
    }
    if (jump < bestJump) {
      bestJump = jump;
      best = k;
    }
  }
  if (best < 0) return -1;
  const off = (run.closedFirst[cell]! + best) * m;
  for (let i = 0; i < m; i++) {
    const v = sols[off + i]!,
      s = seed[i]!;
    out[i] = Math.abs(v - s) <= Math.PI || !wraps[i] ? v : wrapNear(v, s, chain.lowerSi[i]!, chain.upperSi[i]!);
  }
  return best;
}

/**
 * storeQ for closed-form solution `k` of `cell` (in q): the slot it was stored in before is remembered
 * (run.closedSlot), so a second arrival costs no comparison; returns as storeQ does (the slot, or −1 with
 * run.lastEqual set).
 */
export function storeClosed(run: MapRun, cell: number, k: number, q: Float64Array): number {
  const at = cell * MAX_CLOSED_FORM_SOLUTIONS + k;
  const known = run.closedSlot[at]!;
  if (known >= 0) {
    run.lastEqual = known;
    return -1;
  }
  const slot = storeQ(run, cell, q);
  run.closedSlot[at] = slot >= 0 ? slot : run.lastEqual;
  return slot;
}
