/**
 * Tool-speed maps on a side-view grid: for each cell of the vertical plane through axis 1 (distance from axis 1
 * against height, mm), the arm is put at that flange position with a reference tool orientation by inverse
 * kinematics, on every branch found; the best branch per cell (highest guaranteed straight-line speed) is kept
 * and named. Per cell: guaranteed straight-line speed at constant orientation, maximum tool speed, scaled inverse
 * condition, the sign of det J (square Jacobians) and the branch.
 *
 * Symmetry: a rotation about a vertical axis 1 turns every figure with it, so the maps are drawn against the
 * distance from axis 1 (r ≥ 0) and hold at every J1 heading. The TCP is the flange centre (no tool).
 * Reference orientations: "down" = flange z along gravity of the primary mounting, flange x pointing away from
 * axis 1; "outward" = flange z pointing away from axis 1, flange x down. Arms with fewer than six driven joints
 * get "down" only, with the rotation about the tool axis left free.
 */
import type { Chain } from "../kinematics/chain";
import { createScratch, forwardInto, jacobianInto, wristCentreInto } from "../kinematics/forward";
import {
  createIkScratch,
  createIkSeedPose,
  holdsFullOrientation,
  ikSeedPoseInto,
  solveIkInto,
  taskErrorInto,
  withinIkTolerance,
  type IkOptions,
} from "../kinematics/inverse";
import {
  MAX_CLOSED_FORM_SOLUTIONS,
  solveSphericalWristInto,
  sphericalWristIk,
  wrapNear,
} from "../kinematics/closedForm";
import { createSpeedScratch, guaranteedLineSpeed, maxToolSpeed } from "./speed";
import { createSingularityScratch, scaledInverseCondition, scaledSingularValues } from "./singularity";
import { createSvdScratch, svdInto } from "../math/svd";
import { branchCode, branchFrame, branchName, type BranchFrame } from "./branches";
import { mulberry32 } from "../math/random";
import { classifyNullVector, decoupledWristColumns, jointRoles } from "./singularity";
import { traceSingularityLoci, type SingularityLocus } from "./loci";
import { wristFlipOf, wristTwinInto } from "../kinematics/wristFlip";

export type ReferenceOrientation = "down" | "outward";

/** Regular grid in the side-view plane; value(ix, iy) = values[ix + iy * nx] at r = rMinMm + ix·step, z = zMinMm + iy·step. */
export interface Grid2 {
  readonly nx: number;
  readonly ny: number;
  readonly rMinMm: number;
  readonly zMinMm: number;
  readonly stepMm: number;
}

export interface ToolSpeedMap {
  readonly orientation: ReferenceOrientation;
  readonly grid: Grid2;
  /** Guaranteed straight-line speed, mm/s; NaN where the pose cannot be reached. */
  readonly guaranteedMmPerS: Float64Array;
  /** Maximum tool speed, mm/s; NaN where unreachable. */
  readonly maxMmPerS: Float64Array;
  /**
   * σ_min/σ_max of the Jacobian with linear rows divided by the length scale; NaN where unreachable, and off the
   * nodes kept when `conditionMaxColumns` is set.
   */
  readonly inverseCondition: Float64Array;
  /** Sign of det J of the best branch (square Jacobians; 0 otherwise or unreachable). */
  readonly detSign: Int8Array;
  /** Index into `branchNames` of the kept branch; −1 where unreachable. */
  readonly branch: Int8Array;
  readonly branchNames: readonly string[];
  /** Driven joint values of the kept branch, rad or m, m per cell (NaN where unreachable). */
  readonly joints: Float64Array;
  readonly reachableCells: number;
  /** Zero crossings of det J along continuous solution sheets, by kind (square task Jacobians only). */
  readonly loci: readonly SingularityLocus[];
}

export interface SpeedMapOptions {
  readonly stepMm: number;
  /** Plane bounds, mm; computed from sampled poses when absent. */
  readonly boundsMm?: { readonly rMax: number; readonly zMin: number; readonly zMax: number } | undefined;
  /** Gravity direction in the base frame (primary mounting). */
  readonly gravity: readonly [number, number, number];
  /** Cells between discovery points (where IK is started from many seeds). */
  readonly discoveryEveryCells: number;
  readonly discoverySeeds: number;
  /** Solutions kept per cell. */
  readonly maxBranches: number;
  readonly seed: number;
  /**
   * Closed-form inverse kinematics (six revolute joints with a spherical wrist), where it applies: true for every
   * cell (discovery and continuation); "discovery" for the discovery cells only, the continuation staying
   * numeric; false (default) keeps the numeric solver everywhere.
   */
  readonly closedForm?: boolean | "discovery";
  /** With closed form: look for solutions at every cell, not only at discovery cells (default true). */
  readonly discoverEveryCell?: boolean;
  /**
   * Wrist-flip twins (default true): on arms whose wrist flip is a symmetry of the chain (kinematics/wristFlip.ts),
   * every solution's twin is stored beside it without solving, with its figures taken from the solution's (same
   * guaranteed speed, det J negated). false solves every solution numerically (for tests).
   */
  readonly wristTwins?: boolean;
  /**
   * When set, the inverse condition is computed on every k-th column and row only, k = ⌈nx / conditionMaxColumns⌉
   * (the nodes a coarser output grid keeps; NaN elsewhere). Default: every cell.
   */
  readonly conditionMaxColumns?: number;
}

export const DEFAULT_SPEED_MAP: SpeedMapOptions = {
  stepMm: 10,
  gravity: [0, 0, -1],
  discoveryEveryCells: 20,
  discoverySeeds: 24,
  maxBranches: 8,
  seed: 20261202,
};

/** Largest joint change between neighbouring cells still taken as one continuous solution, rad (or m). */
const MAX_CONTINUATION_JUMP_RAD = 0.3;
/** Longest joint change the continuation predictor may make; beyond it (close to a singularity) the damped solver starts. */
const PREDICTOR_MAX_STEP_RAD = 0.03;
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

/** The plane: origin on axis 1, radial and up unit vectors in the base frame. */
interface Plane {
  readonly o: readonly number[];
  readonly radial: readonly number[];
  readonly up: readonly number[];
}

function sidePlane(chain: Chain, gravity: readonly number[]): Plane {
  const s = createScratch(chain);
  forwardInto(chain, new Float64Array(chain.drivenCount), s);
  const k = chain.drivenJoint[0]!;
  const up = [-gravity[0]!, -gravity[1]!, -gravity[2]!];
  if (!chain.isPrismatic[k]) {
    const f = 16 * k,
      fr = s.motionFrames,
      a = chain.axisLocal;
    let zx = fr[f]! * a[3 * k]! + fr[f + 1]! * a[3 * k + 1]! + fr[f + 2]! * a[3 * k + 2]!;
    let zy = fr[f + 4]! * a[3 * k]! + fr[f + 5]! * a[3 * k + 1]! + fr[f + 6]! * a[3 * k + 2]!;
    let zz = fr[f + 8]! * a[3 * k]! + fr[f + 9]! * a[3 * k + 1]! + fr[f + 10]! * a[3 * k + 2]!;
    // Axis 1 oriented along base +z (or +x if horizontal), so "height" grows upward on a floor arm.
    const sign = Math.abs(zz) > 1e-9 ? Math.sign(zz) : Math.sign(zx) || 1;
    zx *= sign;
    zy *= sign;
    zz *= sign;
    // Radial: base x made perpendicular to axis 1 (or base y when x is along the axis).
    let rx = 1 - zx * zx,
      ry = -zx * zy,
      rz = -zx * zz;
    if (Math.hypot(rx, ry, rz) < 1e-6) {
      rx = -zy * zx;
      ry = 1 - zy * zy;
      rz = -zy * zz;
    }
    const rn = Math.hypot(rx, ry, rz);
    const ox = fr[f + 3]!,
      oy = fr[f + 7]!,
      oz = fr[f + 11]!;
    // Point of axis 1 nearest the base origin.
    const t = -(ox * zx + oy * zy + oz * zz);
    return { o: [ox + t * zx, oy + t * zy, oz + t * zz], radial: [rx / rn, ry / rn, rz / rn], up: [zx, zy, zz] };
  }
  // First axis prismatic (gantry): the base x–z plane.
  return { o: [0, 0, 0], radial: [1, 0, 0], up: [0, 0, 1] };
}

/** Rough plane bounds (mm) from seeded random poses within the joint limits, with a margin. */
function sampledBounds(chain: Chain, plane: Plane, seed: number): { rMax: number; zMin: number; zMax: number } {
  const rnd = mulberry32(seed);
  const s = createScratch(chain),
    q = new Float64Array(chain.drivenCount);
  let rMax = 0,
    zMin = Infinity,
    zMax = -Infinity;
  for (let n = 0; n < 6000; n++) {
    for (let i = 0; i < q.length; i++) {
      const lo = Math.max(chain.lowerSi[i]!, -Math.PI),
        hi = Math.min(chain.upperSi[i]!, Math.PI);
      q[i] = lo + (hi - lo) * rnd();
    }
    const t = forwardInto(chain, q, s);
    const dx = t[3]! - plane.o[0]!,
      dy = t[7]! - plane.o[1]!,
      dz = t[11]! - plane.o[2]!;
    const h = dx * plane.up[0]! + dy * plane.up[1]! + dz * plane.up[2]!;
    const r = Math.hypot(dx - h * plane.up[0]!, dy - h * plane.up[1]!, dz - h * plane.up[2]!);
    const z = t[3]! * plane.up[0]! + t[7]! * plane.up[1]! + t[11]! * plane.up[2]!;
    rMax = Math.max(rMax, r);
    zMin = Math.min(zMin, z);
    zMax = Math.max(zMax, z);
  }
  const margin = 0.06 * Math.max(rMax, zMax - zMin);
  return { rMax: (rMax + margin) * 1000, zMin: (zMin - margin) * 1000, zMax: (zMax + margin) * 1000 };
}

/** Target flange pose (row-major 4×4, m) for a cell. */
function targetInto(
  out: Float64Array,
  plane: Plane,
  rM: number,
  zM: number,
  orientation: ReferenceOrientation,
  gravity: readonly number[],
  outwardSign: number,
): Float64Array {
  const up = plane.up,
    rad = plane.radial;
  let xx: number, xy: number, xz: number, zx: number, zy: number, zz: number;
  const ox = rad[0]! * outwardSign,
    oy = rad[1]! * outwardSign,
    oz = rad[2]! * outwardSign;
  if (orientation === "down") {
    zx = gravity[0]!;
    zy = gravity[1]!;
    zz = gravity[2]!;
    // x: outward made perpendicular to z.
    const d = ox * zx + oy * zy + oz * zz;
    xx = ox - d * zx;
    xy = oy - d * zy;
    xz = oz - d * zz;
    let n = Math.hypot(xx, xy, xz);
    if (n < 1e-9) {
      xx = up[0]!;
      xy = up[1]!;
      xz = up[2]!;
      n = 1;
    }
    xx /= n;
    xy /= n;
    xz /= n;
  } else {
    zx = ox;
    zy = oy;
    zz = oz;
    const d = gravity[0]! * zx + gravity[1]! * zy + gravity[2]! * zz;
    xx = gravity[0]! - d * zx;
    xy = gravity[1]! - d * zy;
    xz = gravity[2]! - d * zz;
    let n = Math.hypot(xx, xy, xz);
    if (n < 1e-9) {
      xx = -up[0]!;
      xy = -up[1]!;
      xz = -up[2]!;
      n = 1;
    }
    xx /= n;
    xy /= n;
    xz /= n;
  }
  const yx = zy * xz - zz * xy,
    yy = zz * xx - zx * xz,
    yz = zx * xy - zy * xx;
  out[0] = xx;
  out[1] = yx;
  out[2] = zx;
  out[4] = xy;
  out[5] = yy;
  out[6] = zy;
  out[8] = xz;
  out[9] = yz;
  out[10] = zz;
  out[12] = 0;
  out[13] = 0;
  out[14] = 0;
  out[15] = 1;
  return targetPositionInto(out, plane, rM, zM);
}

/** The position column of a cell's target (out[3], out[7], out[11]): axis-1 point + r·radial, then the height
 * measured along `up` from the base origin. Every cell of a map has the same orientation; only this changes. */
function targetPositionInto(out: Float64Array, plane: Plane, rM: number, zM: number): Float64Array {
  const up = plane.up,
    rad = plane.radial;
  const px0 = plane.o[0]! + rM * rad[0]!,
    py0 = plane.o[1]! + rM * rad[1]!,
    pz0 = plane.o[2]! + rM * rad[2]!;
  const h0 = px0 * up[0]! + py0 * up[1]! + pz0 * up[2]!;
  out[3] = px0 + (zM - h0) * up[0]!;
  out[7] = py0 + (zM - h0) * up[1]!;
  out[11] = pz0 + (zM - h0) * up[2]!;
  return out;
}

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

/** Orientations an arm gets maps for. */
export function referenceOrientations(chain: Chain): ReferenceOrientation[] {
  return chain.drivenCount >= 6 ? ["down", "outward"] : ["down"];
}

/**
 * Computes the tool-speed map of one reference orientation.
 * @see module comment for definitions; DOMAIN: guaranteed straight-line speed and maximum tool speed
 */
export function toolSpeedMap(
  chain: Chain,
  orientation: ReferenceOrientation,
  options: SpeedMapOptions = DEFAULT_SPEED_MAP,
  workspace?: SpeedMapWorkspace,
): ToolSpeedMap {
  const m = chain.drivenCount;
  const plane = sidePlane(chain, options.gravity);
  const bounds = options.boundsMm ?? sampledBounds(chain, plane, options.seed);
  const step = options.stepMm;
  if (!(step > 0)) throw new RangeError(`invalid stepMm: ${step}`);
  const zMinMm = Math.floor(bounds.zMin / step) * step;
  // Two columns behind axis 1 so a locus on the axis (shoulder singularity) is crossed, not touched.
  const rMinMm = -2 * step;
  const nx = Math.max(1, Math.ceil((bounds.rMax - rMinMm) / step) + 1);
  const ny = Math.max(1, Math.ceil((bounds.zMax - zMinMm) / step) + 1);
  const cells = nx * ny,
    K = options.maxBranches;
  const grid: Grid2 = { nx, ny, rMinMm, zMinMm, stepMm: step };
  // Arms with fewer than six joints that can still turn the tool about its axis (SCARA, palletizer, gantry with a
  // rotary axis) hold the full reference orientation; otherwise only the tool axis (rotation about it free).
  const task: "full" | "axis" = holdsFullOrientation(chain, mulberry32(options.seed ^ 0x51f3)) ? "full" : "axis";
  const continuationIk: IkOptions = { ...CONTINUATION_IK, task };
  const verifyIk: IkOptions = { ...VERIFY_IK, task };
  const discoveryIk: IkOptions = { ...DISCOVERY_IK, task };

  const ws = workspace ?? createSpeedMapWorkspace();
  // Solutions: appended to a pool in the order found (most cells hold far fewer than K: a cells × K × m array was
  // mostly empty, tens of MB for a large arm); at[cell·K + slot] is the solution's index in the pool.
  let pool = ws.f64("pool", 2 * cells * m);
  let pooled = 0;
  const at = ws.i32("at", cells * K);
  const count = ws.u8("count", cells);
  count.fill(0);
  // Continuation thread that found each solution: a thread does not revisit a cell it already holds.
  // Sheets: solutions joined by continuation (union-find over cell·K + slot). Within a sheet the solution varies
  // continuously from cell to cell, so a sign change of det J between neighbours is a singular crossing.
  const parent = ws.i32("parent", cells * K);
  for (let i = 0; i < parent.length; i++) parent[i] = i;
  const find = (i: number): number => {
    while (parent[i] !== i) {
      parent[i] = parent[parent[i]!]!;
      i = parent[i]!;
    }
    return i;
  };
  const union = (a: number, b: number) => {
    const ra = find(a),
      rb = find(b);
    if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
  };
  let lastEqual = -1;
  const target = new Float64Array(16);
  const ik = createIkScratch(chain);
  const qTry = new Float64Array(m);
  const qSeed = new Float64Array(m);
  const kin = createScratch(chain);

  // Branch naming frame from the zero pose.
  forwardInto(chain, new Float64Array(m), kin);
  const c0 = new Float64Array(3);
  if (!wristCentreInto(c0, chain, kin)) c0.set([kin.flange[3]!, kin.flange[7]!, kin.flange[11]!]);
  const up: [number, number, number] = [plane.up[0]!, plane.up[1]!, plane.up[2]!];
  const frame: BranchFrame | null = branchFrame(chain, kin, Array.from(c0), up);

  // Closed-form inverse kinematics where the chain allows it (six revolute joints, spherical wrist): every solution
  // of a cell solved once and cached; continuation then takes the cached solution nearest to the neighbour's (by
  // whole turns), as the numeric continuation would converge to it. Degenerate cells (a family of solutions: wrist
  // centre on axis 1, axes 4 and 6 in line) and other arms use the numeric solver.
  const closedMode = options.closedForm ?? false;
  const closed = task === "full" && closedMode !== false ? sphericalWristIk(chain) : null;
  const closedContinuation = closedMode === true;
  const closedSol = closed ? new Float64Array(cells * MAX_CLOSED_FORM_SOLUTIONS * m) : null;
  const closedCount = closed ? new Int8Array(cells).fill(-2) : null;
  const closedTarget = new Float64Array(16);
  /** Number of closed-form solutions at a cell (solved on first use); −1 when degenerate or not available. */
  const closedAt = (cell: number): number => {
    if (!closed || !closedCount || !closedSol) return -1;
    let c = closedCount[cell]!;
    if (c === -2) {
      const ix = cell % nx,
        iy = (cell - ix) / nx;
      targetInto(
        closedTarget,
        plane,
        (grid.rMinMm + ix * step) / 1000,
        (zMinMm + iy * step) / 1000,
        orientation,
        options.gravity,
        1,
      );
      c = solveSphericalWristInto(closedSol, closed, closedTarget, cell * MAX_CLOSED_FORM_SOLUTIONS * m);
      closedCount[cell] = c;
    }
    return c;
  };
  /** The closed-form solution at `cell` nearest to `seed` (largest joint difference, revolute joints by whole turns) into `out`. */
  const nearestClosedInto = (out: Float64Array, cell: number, n: number, seed: Float64Array): boolean => {
    let bestJump = Infinity,
      best = -1;
    const sols = closedSol!;
    for (let k = 0; k < n; k++) {
      const off = (cell * MAX_CLOSED_FORM_SOLUTIONS + k) * m;
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
    if (best < 0) return false;
    const off = (cell * MAX_CLOSED_FORM_SOLUTIONS + best) * m;
    for (let i = 0; i < m; i++) {
      const v = sols[off + i]!,
        s = seed[i]!;
      out[i] = Math.abs(v - s) <= Math.PI || !wraps[i] ? v : wrapNear(v, s, chain.lowerSi[i]!, chain.upperSi[i]!);
    }
    return true;
  };

  // Every cell's target has the same orientation: it is computed once; setTarget only moves the position.
  const setTarget = (cell: number) => setTargetInto(target, cell);
  const setTargetInto = (out: Float64Array, cell: number) => {
    const ix = cell % nx,
      iy = (cell - ix) / nx;
    targetPositionInto(out, plane, (grid.rMinMm + ix * step) / 1000, (zMinMm + iy * step) / 1000);
  };
  targetInto(target, plane, 0, 0, orientation, options.gravity, 1);
  const popTarget = Float64Array.from(target);
  // Revolute driven joints: values 2π apart are the same arm posture (e.g. q1 = ±180° on the back side of an arm
  // whose J1 range is ±180°); they must not take two of the K slots, or real branches find no room.
  const wraps = Uint8Array.from(chain.drivenJoint, (k) => (chain.isPrismatic[k] ? 0 : 1));
  /** Stores q at `cell` unless an equal solution (revolute joints compared modulo 2π) is there; returns the slot or −1. */
  const storeQ = (cell: number, q: Float64Array): number => {
    const n = count[cell]!;
    lastEqual = -1;
    for (let k = 0; k < n; k++) {
      let same = true;
      const base = at[cell * K + k]! * m;
      for (let i = 0; i < m; i++) {
        let d = Math.abs(pool[base + i]! - q[i]!);
        if (wraps[i]) d = Math.abs(d - 2 * Math.PI * Math.round(d / (2 * Math.PI)));
        if (d > 1e-4) {
          same = false;
          break;
        }
      }
      if (same) {
        lastEqual = k;
        return -1;
      }
    }
    if (n >= K) return -1;
    if ((pooled + 1) * m > pool.length) {
      const old = pool;
      pool = ws.f64("pool", Math.ceil(1.5 * (pooled + 1)) * m);
      pool.set(old.subarray(0, pooled * m));
    }
    at[cell * K + n] = pooled;
    for (let i = 0; i < m; i++) pool[pooled * m + i] = q[i]!;
    pooled++;
    count[cell] = n + 1;
    return n;
  };
  /** Offset in the pool of solution (cell·K + slot). */
  const solAt = (idx: number) => at[idx]! * m;
  const store = (cell: number): number => storeQ(cell, qTry);

  // Wrist-flip twins: twinSlot[cell·K + slot] = the slot of the solution's twin in the same cell, −1 when none.
  // Six driven joints only: a redundant arm's solutions are not isolated, and its twins would take the slots that
  // solutions elsewhere in its self-motion need.
  const flip = task === "full" && m === 6 && options.wristTwins !== false ? wristFlipOf(chain) : null;
  const twinSlot = ws.i8("twinSlot", flip ? cells * K : 0);
  twinSlot.fill(-1);
  const qTwin = new Float64Array(m);
  /**
   * Pairs solution (cell, slot) with its twin: stores the twin (queued like any new solution) unless it is out of
   * range, already there or the cell is full. Returns the twin's slot or −1.
   */
  const pairTwin = (cell: number, slot: number): number => {
    if (!flip) return -1;
    const idx = cell * K + slot;
    if (twinSlot[idx]! >= 0) return twinSlot[idx]!;
    if (!wristTwinInto(qTwin, pool, flip, chain, solAt(idx))) return -1;
    const stored = storeQ(cell, qTwin);
    const t = stored >= 0 ? stored : lastEqual;
    if (t < 0 || twinSlot[cell * K + t]! >= 0) return -1;
    twinSlot[idx] = t;
    twinSlot[cell * K + t] = slot;
    if (stored >= 0) push(cell, stored);
    return t;
  };
  /** Joins the twins of two joined solutions when they are continuous too (the ± half turns may differ). */
  const unionTwins = (a: number, b: number) => {
    const ca = (a / K) | 0,
      cb = (b / K) | 0;
    const ta = twinSlot[a]!,
      tb = twinSlot[b]!;
    if (ta < 0 || tb < 0) return;
    const oa = solAt(ca * K + ta),
      ob = solAt(cb * K + tb);
    let jump = 0;
    for (let i = 0; i < m; i++) jump = Math.max(jump, Math.abs(pool[oa + i]! - pool[ob + i]!));
    if (jump < MAX_CONTINUATION_JUMP_RAD) union(ca * K + ta, cb * K + tb);
  };

  // Per solution (cell·K + slot): guaranteed straight-line speed (m/s) and det J (square task Jacobians), computed
  // when the solution leaves the queue from the forward kinematics and Jacobian its continuation solves start from.
  const guaranteedVal = ws.f64("guaranteedVal", cells * K);
  const detVal = ws.f64("detVal", cells * K);
  guaranteedVal.fill(NaN);
  detVal.fill(NaN);
  const sp = createSpeedScratch(m);
  const detWork = new Float64Array(36);
  const lengthCubed = chain.characteristicLengthM ** 3;
  const seedPose = createIkSeedPose(chain);
  const popKin = createScratch(chain);
  /** Forward kinematics and Jacobian of solution (cell, slot) = q into seedPose, and its figures into guaranteedVal, detVal. */
  const slotFigures = (cell: number, slot: number, q: Float64Array) => {
    const idx = cell * K + slot;
    ikSeedPoseInto(seedPose, chain, q, popKin);
    const jac = seedPose.jacobian;
    guaranteedVal[idx] = guaranteedLineSpeed(jac, m, chain.maxSpeedSi, sp);
    // det J from the LU the speed figure just made (m = 6); the 4-row task determinant otherwise.
    detVal[idx] =
      m === 6
        ? sp.lastDet / lengthCubed
        : taskDeterminant(jac, m, chain.characteristicLengthM, seedPose.flange, detWork);
  };

  const qFix = new Float64Array(m);
  const poseError = new Float64Array(6);
  /** Whether flange pose t meets the continuation tolerances at the target (the solver's own error measure). */
  const withinTolerance = (t: Float64Array, goal: Float64Array): boolean =>
    withinIkTolerance(taskErrorInto(poseError, goal, t, task === "axis"), continuationIk);

  // Continuation predictor (see flood): plane steps in the base frame, m: +r, −r, +z, −z.
  // Not for redundant arms: there the predictor's minimum-norm tangent and the damped solver's step move along the
  // self-motion differently, and the map follows the path taken.
  const usePredictor = m <= 6;
  const tangentB = new Float64Array(3 * m);
  const qPred = new Float64Array(m);
  const planeStep = [0, 1, 2, 3].map((d) => {
    const v = d < 2 ? plane.radial : plane.up,
      sign = d % 2 === 0 ? 1 : -1;
    return Float64Array.from([0, 1, 2], (i) => (sign * step * v[i]!) / 1000);
  });
  /** q + B·Δp for the step in direction d into out; false when the step is long (near a singularity). */
  const predictInto = (out: Float64Array, d: number, q: Float64Array): boolean => {
    const dp = planeStep[d]!,
      dx = dp[0]!,
      dy = dp[1]!,
      dz = dp[2]!;
    for (let i = 0; i < m; i++) {
      const v = tangentB[3 * i]! * dx + tangentB[3 * i + 1]! * dy + tangentB[3 * i + 2]! * dz;
      if (!(Math.abs(v) < PREDICTOR_MAX_STEP_RAD)) return false;
      out[i] = q[i]! + v;
    }
    return true;
  };

  // Flood fill: queue of (cell, slot).
  const queue = ws.i32("queue", cells * K * 2);
  let head = 0,
    tail = 0;
  const push = (cell: number, slot: number) => {
    queue[tail++] = cell;
    queue[tail++] = slot;
  };
  const flood = () => {
    while (head < tail) {
      const cell = queue[head++]!,
        slot = queue[head++]!;
      const ix = cell % nx,
        iy = (cell - ix) / nx;
      const fromIdx = cell * K + slot;
      const from = solAt(fromIdx);
      for (let i = 0; i < m; i++) qSeed[i] = pool[from + i]!;
      // A twin takes its figures from its partner (same guaranteed speed, det J negated), once the partner has them.
      const partner = flip ? twinSlot[fromIdx]! : -1;
      let poseReady = false,
        tangentReady = false;
      if (partner >= 0 && !Number.isNaN(guaranteedVal[cell * K + partner]!)) {
        guaranteedVal[fromIdx] = guaranteedVal[cell * K + partner]!;
        detVal[fromIdx] = -detVal[cell * K + partner]!;
      } else {
        slotFigures(cell, slot, qSeed);
        poseReady = true;
        // The check of a trusted last step (CONTINUATION_IK), from the forward kinematics just done.
        setTargetInto(popTarget, cell);
        if (
          !withinTolerance(seedPose.flange, popTarget) &&
          solveIkInto(qFix, chain, popTarget, qSeed, ik, verifyIk, seedPose)
        ) {
          pool.set(qFix, from);
          qSeed.set(qFix);
          slotFigures(cell, slot, qSeed);
          const twin = flip ? twinSlot[fromIdx]! : -1;
          if (twin >= 0 && wristTwinInto(qTwin, pool, flip!, chain, from)) pool.set(qTwin, solAt(cell * K + twin));
        }
        // B, the joint rates per unit tool velocity at constant orientation, is the speed figure's by-product (none
        // at a singular pose, where the figure is 0): the tangent of the solution sheet along the plane.
        if (usePredictor && guaranteedVal[fromIdx]! > 0) {
          tangentB.set(sp.b);
          tangentReady = true;
        }
      }
      for (let d = 0; d < 4; d++) {
        const jx = ix + (d === 0 ? 1 : d === 1 ? -1 : 0),
          jy = iy + (d === 2 ? 1 : d === 3 ? -1 : 0);
        if (jx < 0 || jy < 0 || jx >= nx || jy >= ny) continue;
        const next = jx + jy * nx;
        const held = count[next]!;
        if (held >= K) continue;
        const root = find(fromIdx);
        let mine = false;
        for (let k = 0; k < held; k++) if (find(next * K + k) === root) mine = true;
        if (mine) continue;
        const nClosed = closedContinuation ? closedAt(next) : -1;
        if (nClosed >= 0) {
          if (!nearestClosedInto(qTry, next, nClosed, qSeed)) continue;
        } else {
          setTarget(next);
          // First-order predictor q + B·Δp: where the solver's first (damped) step from q would go, without
          // solving for it. The solve from the seed pose remains for poses without B and as the fallback.
          if (!(
            tangentReady &&
            predictInto(qPred, d, qSeed) &&
            solveIkInto(qTry, chain, target, qPred, ik, continuationIk)
          )) {
            if (!poseReady) {
              ikSeedPoseInto(seedPose, chain, qSeed, popKin);
              poseReady = true;
            }
            if (!solveIkInto(qTry, chain, target, qSeed, ik, continuationIk, seedPose)) continue;
          }
        }
        // A large joint jump means the solver left the sheet (it landed on another branch near a singularity):
        // keep the solution, but do not join the sheets.
        let jump = 0;
        for (let i = 0; i < m; i++) jump = Math.max(jump, Math.abs(qTry[i]! - qSeed[i]!));
        const continuous = jump < MAX_CONTINUATION_JUMP_RAD;
        const s2 = store(next);
        if (s2 >= 0) {
          if (continuous) union(fromIdx, next * K + s2);
          push(next, s2);
          if (flip && pairTwin(next, s2) >= 0 && continuous) unionTwins(fromIdx, next * K + s2);
        } else if (lastEqual >= 0 && continuous) {
          const equal = lastEqual;
          union(fromIdx, next * K + equal);
          if (flip && pairTwin(next, equal) >= 0) unionTwins(fromIdx, next * K + equal);
        }
      }
    }
  };

  /** Stores every closed-form solution of a cell not held yet and floods from it; false when not available there. */
  const discoverClosed = (cell: number): boolean => {
    const n = closedAt(cell);
    if (n < 0) return false;
    for (let k = 0; k < n; k++) {
      const off = (cell * MAX_CLOSED_FORM_SOLUTIONS + k) * m;
      for (let i = 0; i < m; i++) qTry[i] = closedSol![off + i]!;
      const slot = store(cell);
      if (slot >= 0) {
        push(cell, slot);
        pairTwin(cell, slot);
        flood();
      }
    }
    return true;
  };

  // Discovery at spaced cells, from seeded random joint values (every solution in closed form); each new solution
  // floods the grid.
  const rnd = mulberry32(options.seed ^ (orientation === "down" ? 0x9e37 : 0x7f4a));
  const every = Math.max(1, options.discoveryEveryCells);
  for (let iy = Math.floor(every / 2); iy < ny; iy += every) {
    for (let ix = Math.floor(every / 2); ix < nx; ix += every) {
      const cell = ix + iy * nx;
      if (discoverClosed(cell)) continue;
      for (let t = 0; t < options.discoverySeeds; t++) {
        // Every seed sets the target again: the flood from the previous seed's solution aimed it at other cells.
        setTarget(cell);
        for (let i = 0; i < m; i++) {
          const lo = Math.max(chain.lowerSi[i]!, -Math.PI),
            hi = Math.min(chain.upperSi[i]!, Math.PI);
          // Every other seed puts some joints exactly at a limit: branches that exist only in a thin band next to
          // a limit (a wrist joint at ±180°) are found too.
          const u = rnd();
          qTry[i] = t % 2 === 1 && u < 0.15 ? lo : t % 2 === 1 && u > 0.85 ? hi : lo + (hi - lo) * rnd();
        }
        if (!solveIkInto(qTry, chain, target, qTry, ik, discoveryIk)) continue;
        const slot = store(cell);
        if (slot >= 0) {
          push(cell, slot);
          pairTwin(cell, slot);
          flood();
        }
      }
    }
  }

  // Closed form: branches the flood did not reach from the discovery cells (cut off by joint limits or by
  // degenerate cells) are found at every cell.
  if (closed && closedContinuation && options.discoverEveryCell !== false)
    for (let cell = 0; cell < cells; cell++) discoverClosed(cell);

  // Figures per cell: best branch by guaranteed speed.
  const guaranteed = new Float64Array(cells).fill(NaN);
  const maxSpeed = new Float64Array(cells).fill(NaN);
  const invCond = new Float64Array(cells).fill(NaN);
  // The inverse condition (a singular value decomposition per cell) only on the nodes a caller keeps.
  const conditionEvery = Math.max(1, Math.ceil(nx / (options.conditionMaxColumns ?? Infinity)));
  const detSign = new Int8Array(cells);
  const branch = new Int8Array(cells).fill(-1);
  const joints = new Float64Array(cells * m).fill(NaN);
  const j = new Float64Array(6 * m);
  const sg = createSingularityScratch(m);
  const codes: number[] = [];
  const c = new Float64Array(3);
  const bestJ = new Float64Array(6 * m);
  /** Jacobian of solution (cell, slot) into `out` (forward kinematics into kin). */
  const slotJacobianInto = (out: Float64Array, cell: number, slot: number) => {
    const off = solAt(cell * K + slot);
    const t = forwardInto(chain, pool.subarray(off, off + m), kin);
    jacobianInto(out, chain, kin, t[3]!, t[7]!, t[11]!);
  };
  let reachable = 0;
  for (let cell = 0; cell < cells; cell++) {
    const n = count[cell]!;
    if (n === 0) continue;
    reachable++;
    let best = -1,
      bestG = -1,
      bestJReady = false;
    for (let k = 0; k < n; k++) {
      // Every stored solution went through the queue; computed here only if one had not.
      if (Number.isNaN(guaranteedVal[cell * K + k]!))
        slotFigures(cell, k, pool.subarray(solAt(cell * K + k), solAt(cell * K + k) + m));
      const g = guaranteedVal[cell * K + k]!;
      if (g > bestG + 1e-12 || best < 0) {
        best = k;
        bestG = g;
        bestJReady = false;
      } else if (flip && twinSlot[cell * K + k] === best) {
        // The best one's twin: the same figures (see pairTwin); the first stored is kept.
      } else if (Math.abs(g - bestG) <= 1e-12) {
        // Tie (both singular, or equal): prefer the larger maximum speed.
        if (!bestJReady) slotJacobianInto(bestJ, cell, best);
        bestJReady = true;
        slotJacobianInto(j, cell, k);
        const vNew = maxToolSpeed(j, m, chain.maxSpeedSi, sp),
          vOld = maxToolSpeed(bestJ, m, chain.maxSpeedSi, sp);
        if (vNew > vOld) {
          best = k;
          bestJ.set(j);
        }
      }
    }
    const off = solAt(cell * K + best);
    const q = pool.subarray(off, off + m);
    const t = forwardInto(chain, q, kin);
    if (!bestJReady) jacobianInto(bestJ, chain, kin, t[3]!, t[7]!, t[11]!);
    const bestMax = maxToolSpeed(bestJ, m, chain.maxSpeedSi, sp);
    guaranteed[cell] = bestG * 1000;
    maxSpeed[cell] = bestMax * 1000;
    const cx = cell % nx;
    if (cx % conditionEvery === 0 && ((cell - cx) / nx) % conditionEvery === 0)
      invCond[cell] = scaledInverseCondition(bestJ, m, chain.characteristicLengthM, sg);
    const dBest = detVal[cell * K + best]!;
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
  const sheet = ws.i32("sheet", cells * K);
  for (let i = 0; i < cells * K; i++) sheet[i] = find(i);
  const roles = jointRoles(chain);
  const decoupled = decoupledWristColumns(chain);
  const labeller = decoupled ? createDecoupledLabeller(chain, decoupled) : null;
  const loci = traceSingularityLoci({
    grid,
    slots: K,
    count,
    sheet,
    det: detVal,
    joints: pool,
    jointsAt: at,
    m,
    maxCornerJump: 2 * MAX_CONTINUATION_JUMP_RAD,
    kindAt: (cellsAt, slotsAt, near) => {
      if (labeller)
        return labeller((c) =>
          pool.subarray(solAt(cellsAt[c]! * K + slotsAt[c]!), solAt(cellsAt[c]! * K + slotsAt[c]!) + m),
        );
      const off = solAt(cellsAt[near]! * K + slotsAt[near]!);
      const t = forwardInto(chain, pool.subarray(off, off + m), kin);
      jacobianInto(j, chain, kin, t[3]!, t[7]!, t[11]!);
      scaledSingularValues(j, m, chain.characteristicLengthM, sg);
      return classifyNullVector(sg.v, m, Math.min(6, m) - 1, roles);
    },
  });
  return {
    orientation,
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

/**
 * Labels a det J sign change inside a grid square for a decoupled arm (CHECKS C4: det J = det J11 · det J22 with J
 * taken at the wrist centre, J11 = linear rows × arm columns, J22 = angular rows × wrist columns). The factor whose
 * sign differs between the corners is the one crossing zero: J22 → wrist (axes 4 and 6 in line); J11 → shoulder
 * when the null vector of J11 at the corner nearest to singular is mostly joint 1 (the wrist centre on axis 1),
 * elbow otherwise (joints 2 and 3). Labelling by the σ_min vector of the full J instead mislabels crossings near a
 * second, uncrossed singularity (that σ belongs to the other one) and shoulder crossings whose wrist compensation
 * is large.
 * When the second and third arm axes are parallel (the usual elbow), det J11 = c₁·(c₂ × c₃) factors exactly: c₂ and
 * c₃ (the linear columns of those joints) are both perpendicular to the common axis direction z₂, so c₂ × c₃ = e·z₂
 * and det J11 = (c₁·z₂)·e. The elbow factor e vanishes when c₂ ∥ c₃ (wrist centre in the plane of axes 2 and 3),
 * the shoulder factor c₁·z₂ when joint 1 moves the wrist centre along z₂ only or not at all (on axis 1, or on the
 * cylinder of the lateral shoulder offset). The factor that changes sign across the square names the crossing;
 * this stays right where both sets come close (an arm stretched up along axis 1), where the smallest singular
 * vector of J11 mixes the two. Otherwise, and when both or neither factor changes sign, the null vector decides.
 * @see Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, §4.9 (det J11 of an elbow manipulator as a
 *   product of an elbow term and a shoulder term) [from memory]
 */
function createDecoupledLabeller(
  chain: Chain,
  cols: { arm: number[]; wrist: number[] },
): (cornerJoints: (corner: number) => Float64Array) => "wrist" | "shoulder" | "elbow" {
  const kin = createScratch(chain);
  const j = new Float64Array(36),
    w = new Float64Array(3),
    block = new Float64Array(9);
  const sv = new Float64Array(3),
    v = new Float64Array(9),
    svd = createSvdScratch(3, 3);
  const det11 = [0, 0, 0, 0],
    det22 = [0, 0, 0, 0],
    shoulderF = [0, 0, 0, 0],
    elbowF = [0, 0, 0, 0];
  let parallel23: boolean | null = null;
  const det3 = (b: Float64Array) =>
    b[0]! * (b[4]! * b[8]! - b[5]! * b[7]!) -
    b[1]! * (b[3]! * b[8]! - b[5]! * b[6]!) +
    b[2]! * (b[3]! * b[7]! - b[4]! * b[6]!);
  const fill = (rowOffset: number, columns: number[], scale: number) => {
    for (let r = 0; r < 3; r++)
      for (let c = 0; c < 3; c++) block[r * 3 + c] = j[(rowOffset + r) * 6 + columns[c]!]! * scale;
  };
  return (cornerJoints) => {
    let near = 0;
    for (let c = 0; c < 4; c++) {
      forwardInto(chain, cornerJoints(c), kin);
      wristCentreInto(w, chain, kin);
      jacobianInto(j, chain, kin, w[0]!, w[1]!, w[2]!);
      fill(3, cols.wrist, 1);
      det22[c] = det3(block);
      fill(0, cols.arm, 1 / chain.characteristicLengthM);
      det11[c] = det3(block);
      if (Math.abs(det11[c]!) < Math.abs(det11[near]!)) near = c;
      // Factors of det J11 (columns of `block`: c₁, c₂, c₃ scaled; z₂ from the angular rows of the second arm column).
      const a2 = cols.arm[1]!,
        a3 = cols.arm[2]!;
      const zx = j[18 + a2]!,
        zy = j[24 + a2]!,
        zz = j[30 + a2]!;
      if (parallel23 === null) {
        const ux = j[18 + a3]!,
          uy = j[24 + a3]!,
          uz = j[30 + a3]!;
        parallel23 = Math.hypot(zy * uz - zz * uy, zz * ux - zx * uz, zx * uy - zy * ux) < 1e-9;
      }
      shoulderF[c] = block[0]! * zx + block[3]! * zy + block[6]! * zz;
      const ex = block[4]! * block[8]! - block[7]! * block[5]!,
        ey = block[7]! * block[2]! - block[1]! * block[8]!,
        ez = block[1]! * block[5]! - block[4]! * block[2]!;
      elbowF[c] = ex * zx + ey * zy + ez * zz;
    }
    const changes = (d: number[]) => d.some((x) => x > 0) && d.some((x) => x < 0);
    if (changes(det22) || !changes(det11)) return "wrist";
    if (parallel23) {
      const s = changes(shoulderF),
        e = changes(elbowF);
      if (s && !e) return "shoulder";
      if (e && !s) return "elbow";
    }
    forwardInto(chain, cornerJoints(near), kin);
    wristCentreInto(w, chain, kin);
    jacobianInto(j, chain, kin, w[0]!, w[1]!, w[2]!);
    fill(0, cols.arm, 1 / chain.characteristicLengthM);
    svdInto(sv, v, block, 3, 3, svd);
    // Null vector of J11 = column 2 of V; share of joint 1 (the first arm column).
    const a = v[2]! * v[2]!;
    return a > 0.5 ? "shoulder" : "elbow";
  };
}

/** Determinant of a k × k row-major matrix in `work` (overwritten) by LU with partial pivoting. */
export function determinantInPlace(work: Float64Array, k: number): number {
  let det = 1;
  for (let c = 0; c < k; c++) {
    let p = c,
      best = Math.abs(work[c * k + c]!);
    for (let r = c + 1; r < k; r++) {
      const v = Math.abs(work[r * k + c]!);
      if (v > best) {
        best = v;
        p = r;
      }
    }
    if (best === 0) return 0;
    if (p !== c) {
      det = -det;
      for (let i = 0; i < k; i++) {
        const t = work[c * k + i]!;
        work[c * k + i] = work[p * k + i]!;
        work[p * k + i] = t;
      }
    }
    const piv = work[c * k + c]!;
    det *= piv;
    for (let r = c + 1; r < k; r++) {
      const f = work[r * k + c]! / piv;
      for (let i = c; i < k; i++) work[r * k + i] = work[r * k + i]! - f * work[c * k + i]!;
    }
  }
  return det;
}

/**
 * Determinant of the square task Jacobian with linear rows divided by `lengthM` (dimensionless): the 6 × 6 J for
 * six driven joints; for four, the rows (vx, vy, vz, ω·z_tool) (the tool keeps its axis). NaN otherwise.
 */
export function taskDeterminant(
  j: ArrayLike<number>,
  m: number,
  lengthM: number,
  baseFromFlange: Float64Array,
  work: Float64Array,
): number {
  if (m === 6) {
    for (let i = 0; i < 18; i++) work[i] = j[i]! / lengthM;
    for (let i = 18; i < 36; i++) work[i] = j[i]!;
    return determinantInPlace(work, 6);
  }
  if (m === 4) {
    for (let i = 0; i < 12; i++) work[i] = j[i]! / lengthM;
    const tx = baseFromFlange[2]!,
      ty = baseFromFlange[6]!,
      tz = baseFromFlange[10]!;
    for (let c = 0; c < 4; c++) work[12 + c] = j[12 + c]! * tx + j[16 + c]! * ty + j[20 + c]! * tz;
    return determinantInPlace(work, 4);
  }
  return NaN;
}
