/**
 * Straight-line check: can the arm move its tool centre point (TCP) along a straight line at one constant tool
 * orientation and a commanded speed, and where does it struggle?
 *
 * Method (all SI inside; the result is in mm, deg, mm/s):
 * - The line p(s) = start + s·u (0 ≤ s ≤ length, u a unit vector) is followed by inverse kinematics by
 *   continuation: from an accepted point, a tangent predictor q + (dq/ds)·Δs, then a damped Gauss–Newton corrector
 *   on the TCP pose. The step is adaptive: it is halved while the largest joint change between neighbouring points
 *   exceeds `maxJointStepRad`, or the inverse condition falls by more than half (down to 1/64 of the sample
 *   spacing), and it grows again after easy steps. The corrector never clamps to the joint ranges, so a range
 *   violation is reported where it happens instead of being hidden as "out of reach".
 * - Task: the full pose (position and orientation) whenever the arm can hold it, also with fewer than six driven
 *   joints (SCARA, palletizer, gantry with a C axis: their tool turns about one axis, which holds "down"); the
 *   tool axis only (rotation about it free) for an arm with fewer than six joints that cannot hold the full
 *   orientation at the start. `orientationHeld` says which.
 * - Rates: q̇ = B·v with v = u·speed at zero angular velocity (B: the linear block of J⁻¹, lineRatesInto in
 *   speed.ts; the minimum-norm rates for redundant arms; least squares with an exactness check for arms with fewer
 *   than six joints). rateRatioᵢ = |q̇ᵢ| / q̇maxᵢ. The largest constant speed the line allows is
 *   commanded / max over the line and the joints of rateRatioᵢ (the ratios scale with the speed, so the figure does
 *   not depend on the commanded speed); it is 0 when a point is out of reach, when the joints must jump (no
 *   continuous solution), or at a pose where the motion needs unbounded rates. Where J cannot be inverted but the
 *   motion is still possible (a line crossing a singular pose exactly), the minimum-norm rates are used.
 * - Every accepted continuation point (the samples and the adaptive steps between them) counts for the bottleneck,
 *   the nearest singularity, branch changes and range violations; the bottleneck and the nearest singularity are
 *   then refined by a golden-section search between the neighbouring points, so a narrow peak between samples is
 *   not missed. `samples` and `speedProfile` are reported at the evenly spaced sample fractions only.
 * - Branch changes: the branch name (branches.ts: front/back, elbow up/down, wrist +/−) differs between
 *   neighbouring points, or a joint changes by more than `jumpRad` between points only `minStepM` apart (a jump:
 *   no continuous solution nearby). `continuous` tells which. A line that crosses a wrist singularity exactly has
 *   q5 changing sign: the wrist changes branch without a jump ("wrist flip", continuous).
 * - Out of reach: the corrector fails even at the minimum step; the interval is closed where a solution is found
 *   again (searched at the following samples from the last solution and from seeded starts, then located by
 *   continuation backwards).
 *
 * Default start branch ("best run"): every distinct IK solution at the start (one per branch name, inside the
 * joint ranges when it can be, the one nearest the zero pose for each name) is followed along the whole line, and
 * the run kept is the one with the fewest problems (joint jumps plus range violations), then the highest feasible
 * constant speed, then the start nearest the arm's zero pose. Why: Armdex answers whether the arm can do this
 * line, and an integrator teaches the start point in whichever posture works, so each arm is credited with its
 * best posture instead of an arbitrary one; the other starts are listed (`startBranches`) and `startJointsSi`
 * picks the solution nearest given joints instead.
 *
 * @see Siciliano et al., Robotics: Modelling, Planning and Control, §3.5 (inverse differential kinematics) and
 *   §3.7 (inverse kinematics algorithms) [from memory]; Allgower & Georg, Introduction to Numerical Continuation
 *   Methods, ch. 2 (predictor–corrector) [from memory]; Kiefer, Proc. AMS 4(3), 1953 (golden-section search)
 *   [from memory]; DOMAIN.md "Speed" (guaranteed straight-line speed) and "Singularities"
 */
import { solveInPlace } from "../math/linsolve";
import { rotationErrorInto } from "../math/so3";
import type { Chain } from "../kinematics/chain";
import {
  createScratch,
  forwardInto,
  jacobianInto,
  toolPointInto,
  wristCentreInto,
  type KinematicsScratch,
} from "../kinematics/forward";
import { createIkScratch, solveIkInto, type IkOptions, type IkScratch } from "../kinematics/inverse";
import { fromXyzRpyInto } from "../math/mat4";
import { mToMm, radToDeg } from "../units";
import { branchCode, branchFrame, branchName, type BranchFrame } from "../measures/branches";
import { mulberry32 } from "../math/random";
import {
  classifyNullVector,
  createSingularityScratch,
  jointRoles,
  scaledSingularValues,
  SINGULAR_INVERSE_CONDITION,
  type JointRoles,
  type SingularityKind,
  type SingularityScratch,
} from "../measures/singularity";
import { createSpeedScratch, lineRatesInto, type SpeedScratch } from "../measures/speed";

// ---------------------------------------------------------------------------------------------------------------
// Input, options, result

export interface LineCheckInput {
  /** Start of the TCP line in the base frame, m (3 values). */
  readonly startM: ArrayLike<number>;
  /** End of the TCP line in the base frame, m (3 values). */
  readonly endM: ArrayLike<number>;
  /**
   * The constant tool orientation baseFromTool: 3×3 (9 values) or 4×4 (16 values, translation ignored), row-major.
   * The tool frame is the flange frame moved to the TCP, so this is also the flange rotation.
   * Helpers: referenceToolRotation ("down", "outward"), rpyToolRotation (roll, pitch, yaw).
   */
  readonly baseFromToolRotation: ArrayLike<number>;
  /** Commanded TCP speed along the line, m/s (> 0). */
  readonly speedMPerS: number;
  /** TCP in the flange frame, m (default: the flange origin). */
  readonly toolInFlangeM?: ArrayLike<number> | undefined;
  /** Driven joints, rad or m: start on the IK solution nearest to these instead of the default rule. */
  readonly startJointsSi?: ArrayLike<number> | undefined;
}

export interface LineCheckOptions {
  /** Evenly spaced sample points reported, including both ends (≥ 2). */
  readonly samples: number;
  /** Gravity direction in the base frame (primary mounting); names elbow up/down. */
  readonly gravity: readonly [number, number, number];
  /** Largest joint change between neighbouring continuation points before the step is halved, rad (prismatic: m / characteristic length). */
  readonly maxJointStepRad: number;
  /** A joint change larger than this between points `minStepM` apart is a jump (no continuous solution), rad. */
  readonly jumpRad: number;
  /** Smallest continuation step, m. */
  readonly minStepM: number;
  /** Seeded random starts (besides the zero pose) used to find the IK solutions at the start. */
  readonly discoverySeeds: number;
  readonly seed: number;
  /** Start solutions followed at most (one per branch name). */
  readonly maxBranches: number;
}

export const DEFAULT_LINE_CHECK: LineCheckOptions = {
  samples: 101,
  gravity: [0, 0, -1],
  maxJointStepRad: (2 * Math.PI) / 180,
  jumpRad: 0.3,
  minStepM: 1e-6,
  discoverySeeds: 24,
  seed: 20260601,
  maxBranches: 8,
};

export type LineSingularityKind = Exclude<SingularityKind, "none">;

export interface LineSample {
  readonly fraction: number;
  /** Target TCP position, mm. */
  readonly positionMm: number[];
  readonly reachable: boolean;
  readonly branch: string | null;
  /** Driven joints, deg (revolute) or mm (prismatic); null when out of reach. */
  readonly jointsDeg: number[] | null;
  /** Joint rates needed at the commanded speed, deg/s or mm/s, signed; null when out of reach or exactly singular. */
  readonly jointRatesDegPerS: number[] | null;
  /** |q̇ᵢ| / q̇maxᵢ at the commanded speed (> 1: the joint cannot keep up); null entries for joints without a speed limit. */
  readonly rateRatios: (number | null)[] | null;
  /** Largest speed the arm could hold here (commanded / max rate ratio), mm/s; 0 when out of reach or singular;
   * null when no joint with a speed limit moves. */
  readonly localSpeedMmPerS: number | null;
  /** Smallest singular value of the Jacobian with linear rows divided by the characteristic length, 1/rad. */
  readonly sigmaMinScaled: number | null;
  /** σ_min / σ_max of that scaled Jacobian: 1 isotropic, 0 singular. */
  readonly inverseCondition: number | null;
  /** Kind of the nearest singular pose, from the joint motion that moves the tool least (singularity.ts). */
  readonly singularityKind: LineSingularityKind | null;
}

export interface LineBranchChange {
  readonly fraction: number;
  readonly positionMm: number[];
  readonly from: string;
  readonly to: string;
  /** "wrist flip", "elbow", "shoulder", "multiple" (names differ in several parts) or "jump" (joints only). */
  readonly kind: string;
  /** True when the joints moved continuously (the line crossed a singular pose); false for a jump. */
  readonly continuous: boolean;
  /** True when the change happens across an out-of-reach interval. */
  readonly acrossGap: boolean;
  /** Joint change between the two points, deg or mm. */
  readonly jointChangeDeg: number[];
}

export interface LineOutOfReach {
  readonly fromFraction: number;
  readonly toFraction: number;
  readonly fromPositionMm: number[];
  readonly toPositionMm: number[];
}

export interface LineJointLimitViolation {
  readonly joint: string;
  readonly jointIndex: number;
  readonly bound: "lower" | "upper";
  /** The violated limit and the furthest value reached, in `unit`. */
  readonly limitValue: number;
  readonly extremeValue: number;
  readonly unit: "deg" | "mm";
  readonly fromFraction: number;
  readonly toFraction: number;
  readonly fromPositionMm: number[];
  readonly toPositionMm: number[];
}

export interface LineStartBranch {
  readonly branch: string;
  readonly startJointsDeg: number[];
  readonly feasibleConstantSpeedMmPerS: number | null;
  readonly jumps: number;
  readonly jointLimitViolations: number;
  readonly chosen: boolean;
}

export interface LineCheckResult {
  readonly lengthMm: number;
  readonly speedMmPerS: number;
  readonly direction: number[];
  readonly orientationHeld: "full" | "tool axis";
  readonly jointNames: string[];
  readonly jointUnits: ("deg" | "mm")[];
  readonly startRule: "best run" | "nearest start joints";
  readonly startBranch: LineStartBranch | null;
  readonly startBranches: LineStartBranch[];
  /** Largest constant TCP speed the whole line allows, mm/s (0 if a point is out of reach or exactly singular;
   * null when no joint with a speed limit moves). */
  readonly feasibleConstantSpeedMmPerS: number | null;
  /** True when the commanded speed is within it. */
  readonly commandedSpeedFeasible: boolean;
  readonly bottleneck: {
    readonly joint: string | null;
    readonly jointIndex: number | null;
    readonly positionMm: number[];
    readonly fraction: number;
    /** Rate ratio of that joint at the commanded speed (null when unbounded). */
    readonly rateRatio: number | null;
    /** What limits the speed: a joint's rate; a point out of reach; a joint jump (no continuous solution: the arm
     * must stop and reconfigure); a pose where the motion needs unbounded rates. */
    readonly reason: "joint rate" | "out of reach" | "jump" | "singular";
  } | null;
  readonly nearestSingularity: {
    readonly kind: LineSingularityKind;
    readonly positionMm: number[];
    readonly fraction: number;
    readonly inverseCondition: number;
    readonly sigmaMinScaled: number;
    /** inverseCondition below SINGULAR_INVERSE_CONDITION. */
    readonly singular: boolean;
  } | null;
  readonly branchChanges: LineBranchChange[];
  readonly outOfReach: LineOutOfReach[];
  readonly jointLimitViolations: LineJointLimitViolation[];
  readonly jointsWithoutSpeedLimit: string[];
  /** Per sample: the largest speed the arm could hold there if the controller may slow down locally, mm/s. */
  readonly speedProfile: { readonly fraction: number; readonly speedMmPerS: number | null }[];
  readonly samples: LineSample[];
  /** Continuation points accepted on the reported run (samples plus adaptive steps). */
  readonly evaluatedPoints: number;
}

// ---------------------------------------------------------------------------------------------------------------
// Orientation helpers

export type LineReferenceOrientation = "down" | "outward";

function normalise3(v: number[]): boolean {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  if (!(n > 1e-9)) return false;
  v[0] = v[0]! / n;
  v[1] = v[1]! / n;
  v[2] = v[2]! / n;
  return true;
}

/** v minus its component along the unit vector a. */
function reject3(v: readonly number[], a: readonly number[]): number[] {
  const d = v[0]! * a[0]! + v[1]! * a[1]! + v[2]! * a[2]!;
  return [v[0]! - d * a[0]!, v[1]! - d * a[1]!, v[2]! - d * a[2]!];
}

/** A unit vector perpendicular to the unit vector z: the base axis least aligned with it, made perpendicular. */
function anyPerpendicular(z: readonly number[]): number[] {
  const ax = Math.abs(z[0]!),
    ay = Math.abs(z[1]!),
    az = Math.abs(z[2]!);
  const e = ax <= ay && ax <= az ? [1, 0, 0] : ay <= az ? [0, 1, 0] : [0, 0, 1];
  const x = reject3(e, z);
  normalise3(x);
  return x;
}

/** Row-major 3×3 with columns x, y = z × x, z. */
function rotationFromXz(x: readonly number[], z: readonly number[]): Float64Array {
  const y = [z[1]! * x[2]! - z[2]! * x[1]!, z[2]! * x[0]! - z[0]! * x[2]!, z[0]! * x[1]! - z[1]! * x[0]!];
  return Float64Array.from([x[0]!, y[0]!, z[0]!, x[1]!, y[1]!, z[1]!, x[2]!, y[2]!, z[2]!]);
}

/**
 * Unit vector from axis 1 towards `pointM`, perpendicular to axis 1 (axis 1 as at the zero pose). Falls back to
 * base x made perpendicular to axis 1 when the point is on the axis; for an arm whose first joint is prismatic
 * (gantry), base x made perpendicular to `up`.
 */
export function outwardDirection(chain: Chain, pointM: ArrayLike<number>, up: readonly number[]): number[] {
  const k = chain.drivenJoint[0]!;
  if (chain.isPrismatic[k]) {
    const x = reject3([1, 0, 0], up);
    return normalise3(x) ? x : anyPerpendicular(up);
  }
  const s = createScratch(chain);
  forwardInto(chain, new Float64Array(chain.drivenCount), s);
  const f = 16 * k,
    fr = s.motionFrames,
    a = chain.axisLocal;
  const z = [
    fr[f]! * a[3 * k]! + fr[f + 1]! * a[3 * k + 1]! + fr[f + 2]! * a[3 * k + 2]!,
    fr[f + 4]! * a[3 * k]! + fr[f + 5]! * a[3 * k + 1]! + fr[f + 6]! * a[3 * k + 2]!,
    fr[f + 8]! * a[3 * k]! + fr[f + 9]! * a[3 * k + 1]! + fr[f + 10]! * a[3 * k + 2]!,
  ];
  const r = reject3([pointM[0]! - fr[f + 3]!, pointM[1]! - fr[f + 7]!, pointM[2]! - fr[f + 11]!], z);
  if (normalise3(r)) return r;
  const x = reject3([1, 0, 0], z);
  return normalise3(x) ? x : anyPerpendicular(z);
}

/**
 * Rotation baseFromTool (row-major 3×3) of a named reference orientation at `pointM` (the line's start), as the
 * speed maps define them (speedMap.ts): "down" = tool z along gravity, tool x pointing away from axis 1;
 * "outward" = tool z pointing away from axis 1 (perpendicular to it), tool x as close to gravity as possible.
 * @param gravity unit gravity direction in the base frame (mounting.ts gravityDirectionInBase)
 * @example referenceToolRotation(chain, "down", [1, 0, 0.5], [0, 0, -1]) // floor arm with axis 1 along z:
 *   rows (1, 0, 0), (0, −1, 0), (0, 0, −1)
 */
export function referenceToolRotation(
  chain: Chain,
  name: LineReferenceOrientation,
  pointM: ArrayLike<number>,
  gravity: readonly number[],
): Float64Array {
  if (name !== "down" && name !== "outward") throw new RangeError(`invalid orientation: ${String(name)}`);
  const g = [gravity[0]!, gravity[1]!, gravity[2]!];
  if (!normalise3(g)) throw new RangeError(`invalid gravity: ${Array.from(gravity).join(",")}`);
  const up = [-g[0]!, -g[1]!, -g[2]!];
  const out = outwardDirection(chain, pointM, up);
  if (name === "down") {
    const x = reject3(out, g);
    return rotationFromXz(normalise3(x) ? x : anyPerpendicular(g), g);
  }
  const x = reject3(g, out);
  return rotationFromXz(normalise3(x) ? x : anyPerpendicular(out), out);
}

/**
 * Rotation baseFromTool (row-major 3×3) from roll, pitch, yaw as URDF defines them: R = Rz(yaw)·Ry(pitch)·Rx(roll),
 * fixed axes.
 * @example rpyToolRotation(Math.PI, 0, 0) // tool z pointing down: rows (1, 0, 0), (0, −1, 0), (0, 0, −1)
 */
export function rpyToolRotation(rollRad: number, pitchRad: number, yawRad: number): Float64Array {
  if (![rollRad, pitchRad, yawRad].every(Number.isFinite))
    throw new RangeError(`invalid rpy: ${rollRad},${pitchRad},${yawRad}`);
  const t = fromXyzRpyInto(new Float64Array(16), 0, 0, 0, rollRad, pitchRad, yawRad);
  return Float64Array.from([t[0]!, t[1]!, t[2]!, t[4]!, t[5]!, t[6]!, t[8]!, t[9]!, t[10]!]);
}

// ---------------------------------------------------------------------------------------------------------------
// Internal state (SI). One context per lineCheck call; every buffer is made once.

const KINDS: readonly LineSingularityKind[] = ["wrist", "shoulder", "elbow", "other"];
const TOL_M = 1e-10;
const TOL_RAD = 1e-10;
const CONTINUATION_ITERATIONS = 30;
const POLISH_ITERATIONS = 80;
const DISCOVERY_IK: IkOptions = { maxIterations: 80, toleranceM: 1e-7, toleranceRad: 1e-6 };
/** Relative residual above which a least-squares rate solution is not an exact one (the motion is impossible). */
const RATE_RESIDUAL = 1e-7;
const GOLDEN_ITERATIONS = 40;

/** One accepted (or trial) continuation point. Mutable fields, reused; never allocated per step. */
interface Point {
  s: number;
  readonly q: Float64Array;
  /** Joint rates per unit TCP speed, rad/s (or m/s) per m/s. */
  readonly rate: Float64Array;
  ratesOk: boolean;
  /** max over joints with a limit of |rateᵢ| / q̇maxᵢ per unit speed (s/m); Infinity when the rates are unbounded. */
  maxRatio: number;
  argJoint: number;
  inverseCondition: number;
  sigmaMin: number;
  kind: number;
  code: number;
}

function createPoint(m: number): Point {
  return {
    s: 0,
    q: new Float64Array(m),
    rate: new Float64Array(m),
    ratesOk: false,
    maxRatio: 0,
    argJoint: -1,
    inverseCondition: 0,
    sigmaMin: 0,
    kind: 0,
    code: 0,
  };
}

function copyPoint(dst: Point, src: Point): void {
  dst.s = src.s;
  dst.q.set(src.q);
  dst.rate.set(src.rate);
  dst.ratesOk = src.ratesOk;
  dst.maxRatio = src.maxRatio;
  dst.argJoint = src.argJoint;
  dst.inverseCondition = src.inverseCondition;
  dst.sigmaMin = src.sigmaMin;
  dst.kind = src.kind;
  dst.code = src.code;
}

interface Context {
  readonly chain: Chain;
  readonly m: number;
  readonly lengthScaleM: number;
  readonly options: LineCheckOptions;
  readonly startM: Float64Array;
  readonly dir: Float64Array;
  readonly lengthM: number;
  readonly spacingM: number;
  readonly rot: Float64Array;
  readonly tool: Float64Array;
  /** 6 rows (full pose) or 5 (position + tool axis). */
  rows: number;
  readonly kin: KinematicsScratch;
  readonly ik: IkScratch;
  readonly j: Float64Array;
  readonly task: Float64Array;
  readonly e: Float64Array;
  readonly a: Float64Array;
  readonly x: Float64Array;
  readonly y: Float64Array;
  /** Corrector step. */
  readonly dq: Float64Array;
  readonly tcp: Float64Array;
  readonly c: Float64Array;
  readonly target: Float64Array;
  readonly speed: SpeedScratch;
  readonly sing: SingularityScratch;
  readonly roles: JointRoles;
  readonly frame: BranchFrame | null;
  /** Trial points. */
  readonly trial: Point;
  readonly probe: Point;
}

function createContext(chain: Chain, input: LineCheckInput, options: LineCheckOptions): Context {
  const m = chain.drivenCount;
  const startM = Float64Array.from([input.startM[0]!, input.startM[1]!, input.startM[2]!]);
  const d = [input.endM[0]! - startM[0]!, input.endM[1]! - startM[1]!, input.endM[2]! - startM[2]!];
  const lengthM = Math.hypot(d[0]!, d[1]!, d[2]!);
  const r = input.baseFromToolRotation;
  const rot =
    r.length === 16
      ? Float64Array.from([r[0]!, r[1]!, r[2]!, r[4]!, r[5]!, r[6]!, r[8]!, r[9]!, r[10]!])
      : Float64Array.from(Array.from({ length: 9 }, (_, i) => r[i]!));
  const tool = Float64Array.from([
    input.toolInFlangeM?.[0] ?? 0,
    input.toolInFlangeM?.[1] ?? 0,
    input.toolInFlangeM?.[2] ?? 0,
  ]);
  const kin = createScratch(chain);
  forwardInto(chain, new Float64Array(m), kin);
  const c0 = new Float64Array(3);
  if (!wristCentreInto(c0, chain, kin)) c0.set([kin.flange[3]!, kin.flange[7]!, kin.flange[11]!]);
  const g = options.gravity;
  const frame = branchFrame(chain, kin, Array.from(c0), [-g[0], -g[1], -g[2]]);
  const k = Math.max(6, m);
  return {
    chain,
    m,
    lengthScaleM: chain.characteristicLengthM,
    options,
    startM,
    dir: Float64Array.from(d.map((v) => v / lengthM)),
    lengthM,
    spacingM: lengthM / (options.samples - 1),
    rot,
    tool,
    rows: 6,
    kin,
    ik: createIkScratch(chain),
    j: new Float64Array(6 * m),
    task: new Float64Array(6 * m),
    e: new Float64Array(6),
    a: new Float64Array(k * k),
    x: new Float64Array(k),
    y: new Float64Array(k),
    dq: new Float64Array(m),
    tcp: new Float64Array(3),
    c: new Float64Array(3),
    target: new Float64Array(16),
    speed: createSpeedScratch(m),
    sing: createSingularityScratch(m),
    roles: jointRoles(chain),
    frame,
    trial: createPoint(m),
    probe: createPoint(m),
  };
}

/**
 * Task rows of the Jacobian in ctx.j into ctx.task (rows × m): the linear rows, then the angular rows times the
 * characteristic length (all of them for the full pose; their components along the target tool x and y axes for
 * the tool-axis task).
 */
function buildTask(ctx: Context): void {
  const m = ctx.m,
    j = ctx.j,
    t = ctx.task,
    L = ctx.lengthScaleM,
    r = ctx.rot;
  for (let i = 0; i < 3 * m; i++) t[i] = j[i]!;
  if (ctx.rows === 6) {
    for (let i = 3 * m; i < 6 * m; i++) t[i] = j[i]! * L;
    return;
  }
  for (let c = 0; c < m; c++) {
    const wx = j[3 * m + c]!,
      wy = j[4 * m + c]!,
      wz = j[5 * m + c]!;
    t[3 * m + c] = L * (r[0]! * wx + r[3]! * wy + r[6]! * wz);
    t[4 * m + c] = L * (r[1]! * wx + r[4]! * wy + r[7]! * wz);
  }
}

/**
 * out = T⁺·b for the task in ctx.task and the right-hand side in ctx.y (rows values), damped by lambda2:
 * Tᵀ(TTᵀ + λ²I)⁻¹b when m ≥ rows (minimum norm), (TᵀT + λ²I)⁻¹Tᵀb otherwise (least squares).
 */
function taskSolveInto(ctx: Context, out: Float64Array, lambda2: number): boolean {
  const m = ctx.m,
    k = ctx.rows,
    t = ctx.task,
    a = ctx.a,
    x = ctx.x,
    y = ctx.y;
  if (m >= k) {
    for (let r = 0; r < k; r++) {
      for (let c = r; c < k; c++) {
        let v = 0;
        for (let i = 0; i < m; i++) v += t[r * m + i]! * t[c * m + i]!;
        a[r * k + c] = v + (r === c ? lambda2 : 0);
        a[c * k + r] = v + (r === c ? lambda2 : 0);
      }
      x[r] = y[r]!;
    }
    if (!solveInPlace(a, x, k, 1e-15)) return false;
    for (let i = 0; i < m; i++) {
      let v = 0;
      for (let r = 0; r < k; r++) v += t[r * m + i]! * x[r]!;
      out[i] = v;
    }
    return true;
  }
  for (let r = 0; r < m; r++) {
    for (let c = r; c < m; c++) {
      let v = 0;
      for (let i = 0; i < k; i++) v += t[i * m + r]! * t[i * m + c]!;
      a[r * m + c] = v + (r === c ? lambda2 : 0);
      a[c * m + r] = v + (r === c ? lambda2 : 0);
    }
    let v = 0;
    for (let i = 0; i < k; i++) v += t[i * m + r]! * y[i]!;
    x[r] = v;
  }
  if (!solveInPlace(a, x, m, 1e-15)) return false;
  for (let i = 0; i < m; i++) out[i] = x[i]!;
  return true;
}

/** Orientation error ω (rad, base frame) with exp([ω])·R_current = R_target, or the tool-axis error; into e[3..5]. */
function orientationErrorInto(ctx: Context, f: Float64Array): void {
  const e = ctx.e,
    r = ctx.rot;
  if (ctx.rows === 5) {
    const zx = f[2]!,
      zy = f[6]!,
      zz = f[10]!,
      tx = r[2]!,
      ty = r[5]!,
      tz = r[8]!;
    let ex = zy * tz - zz * ty,
      ey = zz * tx - zx * tz,
      ez = zx * ty - zy * tx;
    if (zx * tx + zy * ty + zz * tz < 0) {
      const n = Math.hypot(ex, ey, ez);
      if (n > 0) {
        ex /= n;
        ey /= n;
        ez /= n;
      } else {
        ex = r[0]!;
        ey = r[3]!;
        ez = r[6]!;
      }
    }
    e[3] = ex;
    e[4] = ey;
    e[5] = ez;
    return;
  }
  rotationErrorInto(e, 3, r, 3, f);
}

/**
 * Damped Gauss–Newton on the TCP pose at line position s, from q (updated in place; no joint clamping). On success
 * the kinematics scratch, ctx.tcp and ctx.j hold the converged pose. Allocates nothing.
 */
function correct(ctx: Context, q: Float64Array, s: number, maxIterations: number): boolean {
  const chain = ctx.chain,
    m = ctx.m,
    e = ctx.e,
    L = ctx.lengthScaleM,
    y = ctx.y,
    tool = ctx.tool;
  const px = ctx.startM[0]! + s * ctx.dir[0]!,
    py = ctx.startM[1]! + s * ctx.dir[1]!,
    pz = ctx.startM[2]! + s * ctx.dir[2]!;
  let previous = Infinity;
  for (let it = 0; it <= maxIterations; it++) {
    const f = forwardInto(chain, q, ctx.kin);
    toolPointInto(ctx.tcp, ctx.kin, tool[0]!, tool[1]!, tool[2]!);
    e[0] = px - ctx.tcp[0]!;
    e[1] = py - ctx.tcp[1]!;
    e[2] = pz - ctx.tcp[2]!;
    orientationErrorInto(ctx, f);
    const ep2 = e[0]! * e[0]! + e[1]! * e[1]! + e[2]! * e[2]!;
    const er2 = e[3]! * e[3]! + e[4]! * e[4]! + e[5]! * e[5]!;
    jacobianInto(ctx.j, chain, ctx.kin, ctx.tcp[0]!, ctx.tcp[1]!, ctx.tcp[2]!);
    if (ep2 <= TOL_M * TOL_M && er2 <= TOL_RAD * TOL_RAD) return true;
    if (it === maxIterations) return false;
    const err = ep2 + er2 * L * L;
    // Stalled: out of reach (or far from a solution); a converging run shrinks the error every few iterations.
    if (it >= 6 && err > 0.9 * previous) return false;
    previous = Math.min(previous, err);
    buildTask(ctx);
    y[0] = e[0]!;
    y[1] = e[1]!;
    y[2] = e[2]!;
    if (ctx.rows === 6) {
      y[3] = e[3]! * L;
      y[4] = e[4]! * L;
      y[5] = e[5]! * L;
    } else {
      const r = ctx.rot;
      y[3] = L * (r[0]! * e[3]! + r[3]! * e[4]! + r[6]! * e[5]!);
      y[4] = L * (r[1]! * e[3]! + r[4]! * e[4]! + r[7]! * e[5]!);
    }
    const dq = ctx.dq;
    if (!taskSolveInto(ctx, dq, err + 1e-14)) return false;
    for (let i = 0; i < m; i++) q[i] = q[i]! + dq[i]!;
  }
  return false;
}

/** Joint rates per unit TCP speed along the line at the converged pose in ctx (J in ctx.j) into out. */
function ratesInto(ctx: Context, out: Float64Array): boolean {
  const m = ctx.m,
    d = ctx.dir;
  if (ctx.rows === 6 && m >= 6) {
    if (!lineRatesInto(ctx.j, m, ctx.speed)) return false;
    const b = ctx.speed.b;
    for (let i = 0; i < m; i++) out[i] = b[i * 3]! * d[0]! + b[i * 3 + 1]! * d[1]! + b[i * 3 + 2]! * d[2]!;
    return true;
  }
  // Fewer than six joints (or the tool-axis task): solve T q̇ = [u; 0] and check that it is solved exactly.
  buildTask(ctx);
  const y = ctx.y,
    k = ctx.rows,
    t = ctx.task;
  for (let r = 0; r < k; r++) y[r] = r < 3 ? d[r]! : 0;
  if (!taskSolveInto(ctx, out, 0)) return false;
  let res = 0;
  for (let r = 0; r < k; r++) {
    let v = -(r < 3 ? d[r]! : 0);
    for (let i = 0; i < m; i++) v += t[r * m + i]! * out[i]!;
    res += v * v;
  }
  return Math.sqrt(res) <= RATE_RESIDUAL;
}

/**
 * Fallback at a pose where J cannot be inverted (after scaledSingularValues): the minimum-norm rates
 * q̇ = Σ vᵢ (J_s vᵢ)ᵀ b / σᵢ² over the singular values above 1e-9 σ_max of the scaled Jacobian J_s, accepted only
 * when they produce the motion (relative residual ≤ 1e-6). A line that crosses a singular pose exactly, where the
 * motion is still possible (q5 passing through zero), keeps finite rates; a motion the pose cannot make stays
 * unbounded.
 */
function pseudoRatesInto(ctx: Context, out: Float64Array): boolean {
  if (ctx.rows !== 6) return false;
  const m = ctx.m,
    k = Math.min(6, m),
    sc = ctx.sing.scaled,
    sv = ctx.sing.sv,
    v = ctx.sing.v,
    d = ctx.dir,
    L = ctx.lengthScaleM;
  out.fill(0);
  const tol = 1e-9 * sv[0]!;
  for (let i = 0; i < k; i++) {
    const si = sv[i]!;
    if (!(si > tol)) continue;
    let g = 0;
    for (let r = 0; r < 3; r++) {
      let jv = 0;
      for (let c = 0; c < m; c++) jv += sc[r * m + c]! * v[c * m + i]!;
      g += (jv * d[r]!) / L;
    }
    const f = g / (si * si);
    for (let c = 0; c < m; c++) out[c] = out[c]! + v[c * m + i]! * f;
  }
  let res = 0;
  for (let r = 0; r < 6; r++) {
    let x = r < 3 ? -d[r]! / L : 0;
    for (let c = 0; c < m; c++) x += sc[r * m + c]! * out[c]!;
    res += x * x;
  }
  return Math.sqrt(res) <= 1e-6 / L;
}

/** Fills the figures of point p (rates, ratios, singular values, kind, branch) at the converged pose in ctx. */
function evaluate(ctx: Context, p: Point): void {
  const chain = ctx.chain,
    m = ctx.m;
  p.inverseCondition = scaledSingularValues(ctx.j, m, ctx.lengthScaleM, ctx.sing);
  p.ratesOk = ratesInto(ctx, p.rate) || pseudoRatesInto(ctx, p.rate);
  let best = 0,
    arg = -1;
  if (p.ratesOk) {
    for (let i = 0; i < m; i++) {
      const w = chain.maxSpeedSi[i]!;
      if (!(w > 0)) continue;
      const r = Math.abs(p.rate[i]!) / w;
      if (r > best || arg < 0) {
        best = r;
        arg = i;
      }
    }
  } else {
    best = Infinity;
  }
  p.maxRatio = best;
  p.argJoint = arg;
  const col = Math.min(6, m) - 1;
  p.sigmaMin = ctx.sing.sv[col]!;
  p.kind = KINDS.indexOf(classifyNullVector(ctx.sing.v, m, col, ctx.roles));
  if (ctx.frame) {
    if (!wristCentreInto(ctx.c, chain, ctx.kin)) {
      ctx.c[0] = ctx.kin.flange[3]!;
      ctx.c[1] = ctx.kin.flange[7]!;
      ctx.c[2] = ctx.kin.flange[11]!;
    }
    p.code = branchCode(chain, ctx.kin, ctx.frame, ctx.c[0]!, ctx.c[1]!, ctx.c[2]!);
  } else {
    p.code = 0;
  }
}

/** Largest joint change from a to b, rad (prismatic joints in characteristic lengths). */
function jointChange(ctx: Context, a: Float64Array, b: Float64Array): number {
  let best = 0;
  for (let i = 0; i < ctx.m; i++) {
    const k = ctx.chain.drivenJoint[i]!;
    const d = Math.abs(b[i]! - a[i]!) / (ctx.chain.isPrismatic[k] ? ctx.lengthScaleM : 1);
    if (d > best) best = d;
  }
  return best;
}

// ---------------------------------------------------------------------------------------------------------------
// One run: the line followed from one start solution.

interface Event {
  readonly fromS: number;
  toS: number;
  readonly fromCode: number;
  toCode: number;
  readonly continuous: boolean;
  readonly acrossGap: boolean;
  /** Joints before the change, and the change (after − before). */
  readonly fromQ: Float64Array;
  readonly dq: Float64Array;
}

interface Violation {
  readonly joint: number;
  readonly upper: boolean;
  readonly fromS: number;
  toS: number;
  extreme: number;
}

interface Run {
  readonly samplesOk: Uint8Array;
  readonly samplesRatesOk: Uint8Array;
  readonly sampleQ: Float64Array;
  readonly sampleRate: Float64Array;
  readonly sampleInv: Float64Array;
  readonly sampleSigma: Float64Array;
  readonly sampleKind: Int8Array;
  readonly sampleCode: Int16Array;
  readonly events: Event[];
  readonly gaps: { fromS: number; toS: number }[];
  readonly violations: Violation[];
  readonly open: (Violation | null)[];
  readonly startQ: Float64Array;
  startCode: number;
  /** Worst rate ratio and smallest inverse condition, with their neighbouring line positions. */
  readonly worst: Point;
  worstLo: number;
  worstHi: number;
  worstPending: boolean;
  readonly nearest: Point;
  nearestLo: number;
  nearestHi: number;
  nearestPending: boolean;
  anyPoint: boolean;
  evaluated: number;
  /** Current continuation step, m. */
  h: number;
  jumps: number;
}

function createRun(ctx: Context): Run {
  const n = ctx.options.samples,
    m = ctx.m;
  return {
    samplesOk: new Uint8Array(n),
    samplesRatesOk: new Uint8Array(n),
    sampleQ: new Float64Array(n * m),
    sampleRate: new Float64Array(n * m),
    sampleInv: new Float64Array(n),
    sampleSigma: new Float64Array(n),
    sampleKind: new Int8Array(n),
    sampleCode: new Int16Array(n),
    events: [],
    gaps: [],
    violations: [],
    open: new Array<Violation | null>(m).fill(null),
    startQ: new Float64Array(m),
    startCode: 0,
    worst: createPoint(m),
    worstLo: 0,
    worstHi: 0,
    worstPending: false,
    nearest: createPoint(m),
    nearestLo: 0,
    nearestHi: 0,
    nearestPending: false,
    anyPoint: false,
    evaluated: 0,
    h: ctx.spacingM,
    jumps: 0,
  };
}

function storeSample(ctx: Context, run: Run, k: number, p: Point): void {
  const m = ctx.m;
  run.samplesOk[k] = 1;
  run.samplesRatesOk[k] = p.ratesOk ? 1 : 0;
  run.sampleQ.set(p.q, k * m);
  run.sampleRate.set(p.rate, k * m);
  run.sampleInv[k] = p.inverseCondition;
  run.sampleSigma[k] = p.sigmaMin;
  run.sampleKind[k] = p.kind;
  run.sampleCode[k] = p.code;
}

/** Range bookkeeping of one accepted point (prev → p; prev null at a (re)start). */
function trackLimits(ctx: Context, run: Run, prev: Point | null, p: Point): void {
  const chain = ctx.chain;
  for (let i = 0; i < ctx.m; i++) {
    const lo = chain.lowerSi[i]!,
      hi = chain.upperSi[i]!,
      v = p.q[i]!;
    const upper = v > hi + 1e-9,
      lower = v < lo - 1e-9;
    const open = run.open[i]!;
    if (open) {
      if ((open.upper && upper) || (!open.upper && lower)) {
        open.toS = p.s;
        if (open.upper ? v > open.extreme : v < open.extreme) open.extreme = v;
        continue;
      }
      // Leaves the range violation: the crossing by linear interpolation between the two points.
      const bound = open.upper ? hi : lo;
      const pv = prev ? prev.q[i]! : v;
      open.toS = prev && pv !== v ? prev.s + ((bound - pv) / (v - pv)) * (p.s - prev.s) : p.s;
      run.open[i] = null;
    }
    if (upper || lower) {
      const bound = upper ? hi : lo;
      const pv = prev ? prev.q[i]! : v;
      const fromS = prev && pv !== v ? prev.s + ((bound - pv) / (v - pv)) * (p.s - prev.s) : p.s;
      const viol: Violation = { joint: i, upper, fromS, toS: p.s, extreme: v };
      run.violations.push(viol);
      run.open[i] = viol;
    }
  }
}

function closeLimits(run: Run): void {
  run.open.fill(null);
}

/** Aggregates of one accepted point; prev is the previous accepted point (null at a start or after a gap). */
function accept(ctx: Context, run: Run, prev: Point | null, p: Point, jump: boolean, acrossGap: boolean): void {
  run.evaluated++;
  if (run.worstPending) {
    run.worstHi = jump || acrossGap ? run.worst.s : p.s;
    run.worstPending = false;
  }
  if (run.nearestPending) {
    run.nearestHi = jump || acrossGap ? run.nearest.s : p.s;
    run.nearestPending = false;
  }
  if (!run.anyPoint || p.maxRatio > run.worst.maxRatio) {
    copyPoint(run.worst, p);
    run.worstLo = prev && !jump && !acrossGap ? prev.s : p.s;
    run.worstHi = p.s;
    run.worstPending = true;
  }
  if (!run.anyPoint || p.inverseCondition < run.nearest.inverseCondition) {
    copyPoint(run.nearest, p);
    run.nearestLo = prev && !jump && !acrossGap ? prev.s : p.s;
    run.nearestHi = p.s;
    run.nearestPending = true;
  }
  run.anyPoint = true;
  if (prev && (jump || prev.code !== p.code)) {
    const last = run.events[run.events.length - 1];
    if (
      jump &&
      last &&
      !last.continuous &&
      !last.acrossGap &&
      !acrossGap &&
      Math.abs(prev.s - last.toS) <= 16 * ctx.options.minStepM
    ) {
      // Jumps a few minimum steps apart are one flip (a joint turning by more than jumpRad in several steps).
      last.toS = p.s;
      last.toCode = p.code;
      for (let i = 0; i < ctx.m; i++) last.dq[i] = p.q[i]! - last.fromQ[i]!;
    } else {
      // An event is rare: allocating here is outside the per-step path.
      const dq = new Float64Array(ctx.m);
      for (let i = 0; i < ctx.m; i++) dq[i] = p.q[i]! - prev.q[i]!;
      run.events.push({
        fromS: prev.s,
        toS: p.s,
        fromCode: prev.code,
        toCode: p.code,
        continuous: !jump,
        acrossGap,
        fromQ: Float64Array.from(prev.q),
        dq,
      });
      if (jump) run.jumps++;
    }
  }
  trackLimits(ctx, run, acrossGap ? null : prev, p);
}

type WalkStatus = "done" | "lost";

/**
 * Continuation from `cur` (a converged, evaluated point; moved along in place) to line position sTo, forwards or
 * backwards. With `record`, every accepted point goes into the run's aggregates. "lost": the corrector failed at
 * the minimum step; `cur` is then the last reachable point.
 */
function walk(ctx: Context, run: Run, cur: Point, sTo: number, record: boolean): WalkStatus {
  const o = ctx.options,
    next = ctx.trial,
    m = ctx.m;
  const sign = sTo >= cur.s ? 1 : -1;
  let h = Math.min(run.h, ctx.spacingM);
  while (cur.s !== sTo) {
    const remaining = Math.abs(sTo - cur.s);
    const step = Math.min(h, remaining);
    const sNext = step >= remaining ? sTo : cur.s + sign * step;
    // Tangent predictor (skipped when it would move a joint by more than a few allowed steps).
    let predicted = 0;
    const ds = sNext - cur.s;
    if (cur.ratesOk) for (let i = 0; i < m; i++) predicted = Math.max(predicted, Math.abs(cur.rate[i]! * ds));
    const usePredictor = cur.ratesOk && predicted <= 4 * o.maxJointStepRad;
    for (let i = 0; i < m; i++) next.q[i] = cur.q[i]! + (usePredictor ? cur.rate[i]! * ds : 0);
    const ok = correct(ctx, next.q, sNext, CONTINUATION_ITERATIONS);
    let change = Infinity,
      conditionDrop = false;
    if (ok) {
      next.s = sNext;
      evaluate(ctx, next);
      change = jointChange(ctx, cur.q, next.q);
      conditionDrop = next.inverseCondition < 0.5 * cur.inverseCondition && step > ctx.spacingM / 64;
    }
    const atMin = step <= o.minStepM;
    if (!(ok && change <= o.maxJointStepRad && !conditionDrop) && !atMin) {
      h = Math.max(step / 2, o.minStepM);
      continue;
    }
    if (!ok) {
      // At the minimum step: from the last joints with more iterations, then from seeded starts (the nearest
      // solution to the last joints). Only when nothing is found is the point out of reach.
      const c = nearestSolution(ctx, sNext, cur.q);
      if (!c) {
        run.h = h;
        return "lost";
      }
      copyPoint(next, c);
      change = jointChange(ctx, cur.q, next.q);
    } else if (change > o.jumpRad) {
      // A jump at the minimum step: make sure no solution nearer the last joints exists.
      const c = nearestSolution(ctx, sNext, cur.q);
      if (c && jointChange(ctx, cur.q, c.q) < change) {
        copyPoint(next, c);
        change = jointChange(ctx, cur.q, next.q);
      }
    }
    const jump = change > o.jumpRad;
    if (record) accept(ctx, run, cur, next, jump, false);
    copyPoint(cur, next);
    if (change < o.maxJointStepRad / 2 && !conditionDrop) h = Math.min(2 * h, ctx.spacingM);
  }
  run.h = h;
  return "done";
}

/** Converges `p.q` at line position s and evaluates it; false when the corrector fails. */
function solveAt(ctx: Context, p: Point, s: number, iterations: number): boolean {
  if (!correct(ctx, p.q, s, iterations)) return false;
  p.s = s;
  evaluate(ctx, p);
  return true;
}

/** Flange target (row-major 4×4) of line position s: rotation R, position p(s) − R·tool. */
function flangeTargetInto(ctx: Context, s: number): Float64Array {
  const t = ctx.target,
    r = ctx.rot,
    tool = ctx.tool;
  for (let row = 0; row < 3; row++) {
    t[row * 4] = r[row * 3]!;
    t[row * 4 + 1] = r[row * 3 + 1]!;
    t[row * 4 + 2] = r[row * 3 + 2]!;
    t[row * 4 + 3] =
      ctx.startM[row]! +
      s * ctx.dir[row]! -
      (r[row * 3]! * tool[0]! + r[row * 3 + 1]! * tool[1]! + r[row * 3 + 2]! * tool[2]!);
  }
  t[12] = 0;
  t[13] = 0;
  t[14] = 0;
  t[15] = 1;
  return t;
}

/** Brings revolute joints to the value 2π·k away nearest `reference`, inside the joint range when one exists. */
function wrapJoints(ctx: Context, q: Float64Array, reference: ArrayLike<number> | null): void {
  const chain = ctx.chain;
  for (let i = 0; i < ctx.m; i++) {
    if (chain.isPrismatic[chain.drivenJoint[i]!]) continue;
    const ref = reference ? reference[i]! : 0;
    const lo = chain.lowerSi[i]!,
      hi = chain.upperSi[i]!;
    let v = q[i]! - 2 * Math.PI * Math.round((q[i]! - ref) / (2 * Math.PI));
    if (v > hi + 1e-9 && v - 2 * Math.PI >= lo - 1e-9) v -= 2 * Math.PI;
    else if (v < lo - 1e-9 && v + 2 * Math.PI <= hi + 1e-9) v += 2 * Math.PI;
    q[i] = v;
  }
}

function insideRange(ctx: Context, q: Float64Array): boolean {
  for (let i = 0; i < ctx.m; i++)
    if (q[i]! < ctx.chain.lowerSi[i]! - 1e-9 || q[i]! > ctx.chain.upperSi[i]! + 1e-9) return false;
  return true;
}

function distance2(ctx: Context, a: ArrayLike<number>, b: ArrayLike<number> | null): number {
  let d = 0;
  for (let i = 0; i < ctx.m; i++) {
    const k = ctx.chain.drivenJoint[i]!;
    const v = (a[i]! - (b ? b[i]! : 0)) / (ctx.chain.isPrismatic[k] ? ctx.lengthScaleM : 1);
    d += v * v;
  }
  return d;
}

/**
 * IK solutions at line position s from the zero pose, the extra seeds and seeded random starts (solveIkInto inside
 * the joint ranges, then polished by the corrector): one per branch code, preferring in-range solutions, then the
 * one nearest `reference` (the zero pose when null). Allocates (not a per-step path).
 */
function discover(
  ctx: Context,
  s: number,
  extraSeeds: readonly ArrayLike<number>[],
  reference: ArrayLike<number> | null,
): Point[] {
  const chain = ctx.chain,
    m = ctx.m,
    o = ctx.options;
  const rnd = mulberry32(o.seed ^ Math.round(s * 1e6));
  const seeds: Float64Array[] = [
    new Float64Array(m),
    ...extraSeeds.map((q) => Float64Array.from({ length: m }, (_, i) => q[i]!)),
  ];
  for (let n = 0; n < o.discoverySeeds; n++) {
    const q = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      const k = chain.drivenJoint[i]!;
      const span = chain.isPrismatic[k] ? ctx.lengthScaleM : Math.PI;
      const lo = Math.max(chain.lowerSi[i]!, -span),
        hi = Math.min(chain.upperSi[i]!, span);
      q[i] = lo + (hi - lo) * rnd();
    }
    seeds.push(q);
  }
  const target = flangeTargetInto(ctx, s);
  const byCode = new Map<number, { p: Point; inside: boolean; d: number }>();
  const q = new Float64Array(m);
  for (const seed of seeds) {
    solveIkInto(q, chain, target, seed, ctx.ik, DISCOVERY_IK);
    const p = createPoint(m);
    p.q.set(q);
    if (!solveAt(ctx, p, s, POLISH_ITERATIONS)) continue;
    wrapJoints(ctx, p.q, reference);
    if (!solveAt(ctx, p, s, POLISH_ITERATIONS)) continue;
    const inside = insideRange(ctx, p.q),
      d = distance2(ctx, p.q, reference);
    const held = byCode.get(p.code);
    if (!held || (inside && !held.inside) || (inside === held.inside && d < held.d - 1e-12))
      byCode.set(p.code, { p, inside, d });
  }
  return [...byCode.values()].sort((a, b) => Number(b.inside) - Number(a.inside) || a.d - b.d).map((v) => v.p);
}

/** The IK solution at s nearest to q (from q itself, then from seeded starts), or null. Allocates (rare path). */
function nearestSolution(ctx: Context, s: number, q: Float64Array): Point | null {
  const p = createPoint(ctx.m);
  p.q.set(q);
  if (solveAt(ctx, p, s, POLISH_ITERATIONS)) return p;
  let best: Point | null = null,
    bestD = Infinity;
  for (const c of discover(ctx, s, [q], q)) {
    const d = distance2(ctx, c.q, q);
    if (d < bestD) {
      bestD = d;
      best = c;
    }
  }
  return best;
}

/** Position on the line at s, mm. */
function positionMm(ctx: Context, s: number): number[] {
  return [0, 1, 2].map((r) => mToMm(ctx.startM[r]! + s * ctx.dir[r]!));
}

/** Golden-section search of the objective over [lo, hi] near point p (refined in place when better). */
function refine(ctx: Context, p: Point, lo: number, hi: number, objective: (pt: Point) => number): void {
  if (!(hi > lo) || !Number.isFinite(objective(p))) return;
  const probe = ctx.probe,
    best = ctx.trial,
    base = p.s;
  copyPoint(best, p);
  let bestValue = objective(p);
  const at = (s: number): number => {
    for (let i = 0; i < ctx.m; i++) probe.q[i] = p.q[i]! + (p.ratesOk ? p.rate[i]! * (s - base) : 0);
    if (!solveAt(ctx, probe, s, CONTINUATION_ITERATIONS)) return -Infinity;
    if (jointChange(ctx, p.q, probe.q) > ctx.options.jumpRad || probe.code !== p.code) return -Infinity;
    const v = objective(probe);
    if (v > bestValue) {
      bestValue = v;
      copyPoint(best, probe);
    }
    return v;
  };
  const phi = (Math.sqrt(5) - 1) / 2;
  let a = lo,
    b = hi;
  let c = b - phi * (b - a),
    d = a + phi * (b - a);
  let fc = at(c),
    fd = at(d);
  for (let it = 0; it < GOLDEN_ITERATIONS; it++) {
    if (fc >= fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - phi * (b - a);
      fc = at(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + phi * (b - a);
      fd = at(d);
    }
  }
  if (bestValue > objective(p)) copyPoint(p, best);
}

/** Follows the whole line from a start solution found at sample k0 (earlier samples out of reach). */
function runLine(ctx: Context, start: Point, k0: number): Run {
  const run = createRun(ctx),
    n = ctx.options.samples,
    L = ctx.lengthM;
  const sampleS = (k: number) => (k === n - 1 ? L : (k * L) / (n - 1));
  const cur = createPoint(ctx.m);
  copyPoint(cur, start);
  run.startQ.set(start.q);
  run.startCode = start.code;
  if (k0 > 0) {
    // Out of reach from the line's start: locate the boundary backwards from the first reachable sample.
    const status = walk(ctx, run, cur, 0, false);
    if (status === "lost") run.gaps.push({ fromS: 0, toS: cur.s });
  }
  accept(ctx, run, null, cur, false, false);
  let k = 0;
  while (k < n && sampleS(k) < cur.s) k++;
  if (k < n && sampleS(k) === cur.s) storeSample(ctx, run, k++, cur);
  const last = createPoint(ctx.m);
  let previousGapFrom = NaN;
  while (k < n) {
    const sk = sampleS(k);
    if (walk(ctx, run, cur, sk, true) === "done") {
      storeSample(ctx, run, k++, cur);
      continue;
    }
    // Lost at cur: search for a solution again at the following samples.
    const gapFrom = cur.s;
    copyPoint(last, cur);
    closeLimits(run);
    let found: Point | null = null;
    for (let k2 = k; k2 < n && !found; k2++) found = nearestSolution(ctx, sampleS(k2), last.q);
    if (!found) {
      run.gaps.push({ fromS: gapFrom, toS: L });
      break;
    }
    // Back from the solution found towards the point lost: the re-entry boundary, or no gap at all (the branch
    // folded back at a singular pose and another branch goes on: a jump). A second loss at the same place is
    // taken as a gap up to the solution found, so the loop always advances.
    const repeated = gapFrom === previousGapFrom;
    previousGapFrom = gapFrom;
    const back = repeated ? "lost" : walk(ctx, run, found, gapFrom, false);
    if (back === "lost") {
      run.gaps.push({ fromS: gapFrom, toS: found.s });
      accept(ctx, run, last, found, false, true);
    } else {
      accept(ctx, run, last, found, jointChange(ctx, last.q, found.q) > ctx.options.jumpRad, false);
    }
    copyPoint(cur, found);
    while (k < n && sampleS(k) < cur.s) k++;
    if (k < n && sampleS(k) === cur.s) storeSample(ctx, run, k++, cur);
  }
  // Refine the bottleneck (largest rate ratio) and the nearest singularity between their neighbouring points.
  if (run.anyPoint) {
    if (run.worstPending) run.worstHi = run.worst.s;
    if (run.nearestPending) run.nearestHi = run.nearest.s;
    refine(ctx, run.worst, Math.min(run.worstLo, run.worstHi), Math.max(run.worstLo, run.worstHi), (pt) => pt.maxRatio);
    refine(
      ctx,
      run.nearest,
      Math.min(run.nearestLo, run.nearestHi),
      Math.max(run.nearestLo, run.nearestHi),
      (pt) => -pt.inverseCondition,
    );
  }
  return run;
}

/** Feasible constant speed of a run, m/s. */
function feasibleSpeed(run: Run): number {
  if (run.gaps.length > 0 || run.jumps > 0 || !run.anyPoint) return 0;
  const r = run.worst.maxRatio;
  return r === Infinity ? 0 : r > 0 ? 1 / r : Infinity;
}

// ---------------------------------------------------------------------------------------------------------------
// Public entry point

/**
 * Checks one straight TCP line at constant tool orientation and commanded speed (see the module comment).
 * @param chain compiled chain (SI)
 * @param input line in the base frame (m), orientation, speed (m/s), tool offset (m), optional start joints
 * @returns plain data in mm, deg (mm for prismatic joints), mm/s; key names are the contract of `armdex line`
 * @throws RangeError on invalid input (non-finite or zero-length line, speed ≤ 0, a rotation that is not one,
 *   wrong joint count, samples < 2)
 * @example planar 3R (a = 0.5, 0.4, 0.1 m; q̇max = 90, 120, 180 °/s), line (0.3, 0.5, 0) → (0.8, −0.1, 0) m at tool
 *   angle 0.3 rad (rpyToolRotation(0, 0, 0.3)), 0.5 m/s, elbow-positive start: feasibleConstantSpeedMmPerS ≈ 697.6,
 *   bottleneck j1 at fraction ≈ 0.41 (the test in test/core/analysis/line.test.ts checks this against the closed
 *   form minᵢ q̇maxᵢ / |(J⁻¹u)ᵢ| minimised over the line)
 */
export function lineCheck(
  chain: Chain,
  input: LineCheckInput,
  options: Partial<LineCheckOptions> = {},
): LineCheckResult {
  const o: LineCheckOptions = { ...DEFAULT_LINE_CHECK, ...options };
  const m = chain.drivenCount;
  const finite3 = (v: ArrayLike<number> | undefined) =>
    !!v && v.length === 3 && [0, 1, 2].every((i) => Number.isFinite(v[i]));
  if (!finite3(input.startM)) throw new RangeError(`invalid startM: ${Array.from(input.startM ?? []).join(",")}`);
  if (!finite3(input.endM)) throw new RangeError(`invalid endM: ${Array.from(input.endM ?? []).join(",")}`);
  if (input.toolInFlangeM !== undefined && !finite3(input.toolInFlangeM))
    throw new RangeError(`invalid toolInFlangeM: ${Array.from(input.toolInFlangeM).join(",")}`);
  if (!(input.speedMPerS > 0) || !Number.isFinite(input.speedMPerS))
    throw new RangeError(`invalid speedMPerS: ${input.speedMPerS}`);
  if (!Number.isInteger(o.samples) || o.samples < 2) throw new RangeError(`invalid samples: ${o.samples}`);
  if (!(o.minStepM > 0) || !(o.maxJointStepRad > 0) || !(o.jumpRad > o.maxJointStepRad))
    throw new RangeError(`invalid step options: ${o.minStepM}, ${o.maxJointStepRad}, ${o.jumpRad}`);
  const r = input.baseFromToolRotation;
  if (r.length !== 9 && r.length !== 16) throw new RangeError(`invalid rotation: ${r.length} values, expected 9 or 16`);
  {
    const k = r.length === 16 ? 4 : 3;
    for (let a = 0; a < 3; a++) {
      for (let b = 0; b < 3; b++) {
        let dot = 0;
        for (let c = 0; c < 3; c++) dot += r[c * k + a]! * r[c * k + b]!;
        if (!(Math.abs(dot - (a === b ? 1 : 0)) <= 1e-6)) throw new RangeError("invalid rotation: not orthonormal");
      }
    }
    const det =
      r[0]! * (r[k + 1]! * r[2 * k + 2]! - r[k + 2]! * r[2 * k + 1]!) -
      r[1]! * (r[k]! * r[2 * k + 2]! - r[k + 2]! * r[2 * k]!) +
      r[2]! * (r[k]! * r[2 * k + 1]! - r[k + 1]! * r[2 * k]!);
    if (!(det > 0)) throw new RangeError("invalid rotation: a reflection");
  }
  const startJoints = input.startJointsSi;
  if (startJoints !== undefined && (startJoints.length !== m || !Array.from(startJoints).every(Number.isFinite))) {
    throw new RangeError(`invalid startJointsSi: ${Array.from(startJoints).join(",")}, expected ${m} values`);
  }
  const ctx = createContext(chain, input, o);
  if (!(ctx.lengthM > 0)) throw new RangeError("invalid line: start and end are the same point");

  const n = o.samples,
    L = ctx.lengthM;
  const sampleS = (k: number) => (k === n - 1 ? L : (k * L) / (n - 1));
  const reference = startJoints ? Float64Array.from(startJoints) : null;
  const extra = reference ? [reference] : [];

  // Start solutions at the first reachable sample; the full pose first, the tool axis for short chains.
  let candidates: Point[] = [];
  let k0 = 0;
  const modes = m < 6 ? [6, 5] : [6];
  for (const rows of modes) {
    ctx.rows = rows;
    for (k0 = 0; k0 < n; k0++) {
      candidates = discover(ctx, sampleS(k0), extra, reference);
      if (candidates.length > 0) break;
    }
    if (candidates.length > 0) break;
  }
  if (candidates.length === 0) ctx.rows = 6;

  let chosen: Run | null = null;
  const runs: { run: Run; feasible: number; problems: number; d: number }[] = [];
  if (reference && candidates.length > 0) {
    let best = candidates[0]!;
    for (const c of candidates) if (distance2(ctx, c.q, reference) < distance2(ctx, best.q, reference)) best = c;
    candidates = [best];
  }
  for (const c of candidates.slice(0, o.maxBranches)) {
    const run = runLine(ctx, c, k0);
    runs.push({
      run,
      feasible: feasibleSpeed(run),
      problems: run.jumps + run.violations.length,
      d: distance2(ctx, c.q, null),
    });
  }
  const ranked = [...runs].sort((a, b) => {
    if (a.problems !== b.problems) return a.problems - b.problems;
    const fa = a.feasible,
      fb = b.feasible;
    const close = Number.isFinite(fa) && Number.isFinite(fb) && Math.abs(fa - fb) <= 1e-9 * Math.max(fa, fb);
    if (fa !== fb && !close) return fb > fa ? 1 : -1;
    return a.d - b.d;
  });
  chosen = ranked[0]?.run ?? null;

  // ---- Output (mm, deg, mm/s) -------------------------------------------------------------------------------
  const speed = input.speedMPerS;
  const names = Array.from(chain.drivenJoint, (k) => chain.jointNames[k]!);
  const prismatic = Array.from(chain.drivenJoint, (k) => chain.isPrismatic[k] === 1);
  const units = prismatic.map((p) => (p ? "mm" : "deg") as "deg" | "mm");
  const toOut = (i: number, v: number) => (prismatic[i] ? mToMm(v) : radToDeg(v));
  const codeName = (code: number) => branchName(ctx.frame, code);
  const summary = (x: { run: Run; feasible: number }): LineStartBranch => ({
    branch: codeName(x.run.startCode),
    startJointsDeg: Array.from(x.run.startQ, (v, i) => toOut(i, v)),
    feasibleConstantSpeedMmPerS: Number.isFinite(x.feasible) ? mToMm(x.feasible) : null,
    jumps: x.run.jumps,
    jointLimitViolations: x.run.violations.length,
    chosen: x.run === chosen,
  });
  const startBranches = runs.map(summary);
  const startBranch = startBranches.find((b) => b.chosen) ?? null;

  const samples: LineSample[] = [];
  const speedProfile: { fraction: number; speedMmPerS: number | null }[] = [];
  for (let k = 0; k < n; k++) {
    const s = sampleS(k),
      fraction = s / L;
    const ok = chosen !== null && chosen.samplesOk[k] === 1;
    if (!ok || !chosen) {
      samples.push({
        fraction,
        positionMm: positionMm(ctx, s),
        reachable: false,
        branch: null,
        jointsDeg: null,
        jointRatesDegPerS: null,
        rateRatios: null,
        localSpeedMmPerS: 0,
        sigmaMinScaled: null,
        inverseCondition: null,
        singularityKind: null,
      });
      speedProfile.push({ fraction, speedMmPerS: 0 });
      continue;
    }
    const q = Array.from(chosen.sampleQ.subarray(k * m, k * m + m), (v, i) => toOut(i, v));
    const ratesOk = chosen.samplesRatesOk[k] === 1;
    const rates = ratesOk
      ? Array.from(chosen.sampleRate.subarray(k * m, k * m + m), (v, i) => toOut(i, v * speed))
      : null;
    const ratios = ratesOk
      ? Array.from(chosen.sampleRate.subarray(k * m, k * m + m), (v, i) =>
          chain.maxSpeedSi[i]! > 0 ? (Math.abs(v) * speed) / chain.maxSpeedSi[i]! : null,
        )
      : null;
    let maxRatio = 0;
    if (ratios) for (const x of ratios) if (x !== null && x > maxRatio) maxRatio = x;
    const local = !ratesOk ? 0 : maxRatio > 0 ? mToMm(speed / maxRatio) : null;
    samples.push({
      fraction,
      positionMm: positionMm(ctx, s),
      reachable: true,
      branch: codeName(chosen.sampleCode[k]!),
      jointsDeg: q,
      jointRatesDegPerS: rates,
      rateRatios: ratios,
      localSpeedMmPerS: local,
      sigmaMinScaled: chosen.sampleSigma[k]!,
      inverseCondition: chosen.sampleInv[k]!,
      singularityKind: KINDS[chosen.sampleKind[k]!]!,
    });
    speedProfile.push({ fraction, speedMmPerS: local });
  }

  const feasible = chosen ? feasibleSpeed(chosen) : 0;
  let bottleneck: LineCheckResult["bottleneck"] = null;
  if (chosen && chosen.gaps.length > 0) {
    const g = chosen.gaps[0]!;
    const s = g.fromS === 0 ? g.toS : g.fromS;
    bottleneck = {
      joint: null,
      jointIndex: null,
      positionMm: positionMm(ctx, s),
      fraction: s / L,
      rateRatio: null,
      reason: "out of reach",
    };
  } else if (chosen && chosen.jumps > 0) {
    const e = chosen.events.find((x) => !x.continuous && !x.acrossGap)!;
    let arg = 0;
    for (let i = 1; i < m; i++) if (Math.abs(e.dq[i]!) > Math.abs(e.dq[arg]!)) arg = i;
    const sM = (e.fromS + e.toS) / 2;
    bottleneck = {
      joint: names[arg]!,
      jointIndex: arg,
      positionMm: positionMm(ctx, sM),
      fraction: sM / L,
      rateRatio: null,
      reason: "jump",
    };
  } else if (chosen && chosen.anyPoint) {
    const w = chosen.worst;
    const unbounded = w.maxRatio === Infinity;
    bottleneck = {
      joint: w.argJoint >= 0 ? names[w.argJoint]! : null,
      jointIndex: w.argJoint >= 0 ? w.argJoint : null,
      positionMm: positionMm(ctx, w.s),
      fraction: w.s / L,
      rateRatio: unbounded ? null : w.maxRatio * speed,
      reason: unbounded ? "singular" : "joint rate",
    };
  }
  let nearestSingularity: LineCheckResult["nearestSingularity"] = null;
  if (chosen && chosen.anyPoint) {
    const p = chosen.nearest;
    nearestSingularity = {
      kind: KINDS[p.kind]!,
      positionMm: positionMm(ctx, p.s),
      fraction: p.s / L,
      inverseCondition: p.inverseCondition,
      sigmaMinScaled: p.sigmaMin,
      singular: p.inverseCondition < SINGULAR_INVERSE_CONDITION,
    };
  }
  const branchChanges: LineBranchChange[] = chosen
    ? chosen.events.map((e) => {
        const from = codeName(e.fromCode),
          to = codeName(e.toCode);
        const sM = (e.fromS + e.toS) / 2;
        return {
          fraction: sM / L,
          positionMm: positionMm(ctx, sM),
          from,
          to,
          kind: changeKind(ctx, e),
          continuous: e.continuous,
          acrossGap: e.acrossGap,
          jointChangeDeg: Array.from(e.dq, (v, i) => toOut(i, v)),
        };
      })
    : [];
  const outOfReach: LineOutOfReach[] = chosen
    ? chosen.gaps.map((g) => ({
        fromFraction: g.fromS / L,
        toFraction: g.toS / L,
        fromPositionMm: positionMm(ctx, g.fromS),
        toPositionMm: positionMm(ctx, g.toS),
      }))
    : [{ fromFraction: 0, toFraction: 1, fromPositionMm: positionMm(ctx, 0), toPositionMm: positionMm(ctx, L) }];
  const jointLimitViolations: LineJointLimitViolation[] = chosen
    ? chosen.violations.map((v) => ({
        joint: names[v.joint]!,
        jointIndex: v.joint,
        bound: v.upper ? "upper" : "lower",
        limitValue: toOut(v.joint, v.upper ? chain.upperSi[v.joint]! : chain.lowerSi[v.joint]!),
        extremeValue: toOut(v.joint, v.extreme),
        unit: units[v.joint]!,
        fromFraction: v.fromS / L,
        toFraction: v.toS / L,
        fromPositionMm: positionMm(ctx, v.fromS),
        toPositionMm: positionMm(ctx, v.toS),
      }))
    : [];
  return {
    lengthMm: mToMm(L),
    speedMmPerS: mToMm(speed),
    direction: Array.from(ctx.dir),
    orientationHeld: ctx.rows === 6 ? "full" : "tool axis",
    jointNames: names,
    jointUnits: units,
    startRule: reference ? "nearest start joints" : "best run",
    startBranch,
    startBranches,
    feasibleConstantSpeedMmPerS: Number.isFinite(feasible) ? mToMm(feasible) : null,
    commandedSpeedFeasible: feasible >= speed * (1 - 1e-12),
    bottleneck,
    nearestSingularity,
    branchChanges,
    outOfReach,
    jointLimitViolations,
    jointsWithoutSpeedLimit: names.filter((_, i) => !(chain.maxSpeedSi[i]! > 0)),
    speedProfile,
    samples,
    evaluatedPoints: chosen ? chosen.evaluated : 0,
  };
}

/** Kind of a branch change: from the parts of the branch name that changed, or from the joints that jumped. */
function changeKind(ctx: Context, e: Event): string {
  const bits = e.fromCode ^ e.toCode;
  if (bits === 4) return "wrist flip";
  if (bits === 2) return "elbow";
  if (bits === 1) return "shoulder";
  if (bits !== 0) return "multiple";
  // Same name, joints jumped: which joints moved by more than the jump threshold.
  let wrist = false,
    axis1 = false,
    arm = false;
  for (let i = 0; i < ctx.m; i++) {
    if (Math.abs(e.dq[i]!) <= ctx.options.jumpRad) continue;
    if (i === ctx.roles.axis1) axis1 = true;
    else if (ctx.roles.wrist.includes(i)) wrist = true;
    else arm = true;
  }
  if (wrist && !axis1 && !arm) return "wrist flip";
  if (axis1 && !arm) return "shoulder";
  if (arm) return "elbow";
  return "jump";
}
