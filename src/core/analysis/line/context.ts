/**
 * Internal state of one straight-line check (SI): the continuation point, the context holding every buffer (made
 * once per lineCheck call), and the pose corrector (damped Gauss–Newton on the TCP pose, no joint clamping).
 * @see Siciliano et al., Robotics: Modelling, Planning and Control, §3.7 (inverse kinematics algorithms) [from
 *   memory]; Allgower & Georg, Introduction to Numerical Continuation Methods, ch. 2 (predictor–corrector) [from memory]
 */
import { solveInPlace } from "../../math/linsolve";
import { rotationErrorInto } from "../../math/so3";
import type { Chain } from "../../kinematics/chain";
import {
  createScratch,
  forwardInto,
  jacobianInto,
  toolPointInto,
  wristCentreInto,
  type KinematicsScratch,
} from "../../kinematics/forward";
import { createIkScratch, type IkOptions, type IkScratch } from "../../kinematics/inverse";
import { branchFrame, type BranchFrame } from "../../measures/branches";
import {
  createSingularityScratch,
  jointRoles,
  type JointRoles,
  type SingularityScratch,
} from "../../measures/singularity";
import { createSpeedScratch, type SpeedScratch } from "../../measures/speed";
import type { LineCheckInput, LineCheckOptions, LineSingularityKind } from "./types";

export const KINDS: readonly LineSingularityKind[] = ["wrist", "shoulder", "elbow", "other"];
const TOL_M = 1e-10;
const TOL_RAD = 1e-10;
export const CONTINUATION_ITERATIONS = 30;
export const POLISH_ITERATIONS = 80;
export const DISCOVERY_IK: IkOptions = { maxIterations: 80, toleranceM: 1e-7, toleranceRad: 1e-6 };
/** Relative residual above which a least-squares rate solution is not an exact one (the motion is impossible). */
export const RATE_RESIDUAL = 1e-7;
export const GOLDEN_ITERATIONS = 40;

/** One accepted (or trial) continuation point. Mutable fields, reused; never allocated per step. */
export interface Point {
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

export function createPoint(m: number): Point {
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

export function copyPoint(dst: Point, src: Point): void {
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

export interface Context {
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

export function createContext(chain: Chain, input: LineCheckInput, options: LineCheckOptions): Context {
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
export function buildTask(ctx: Context): void {
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
export function taskSolveInto(ctx: Context, out: Float64Array, lambda2: number): boolean {
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
export function correct(ctx: Context, q: Float64Array, s: number, maxIterations: number): boolean {
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
