/**
 * Following a linear move of a cell: the tool point moves on the straight line between two targets while its
 * orientation turns uniformly about one axis (slerp), and the joints follow by continuation from a chosen start
 * solution.
 *
 * Method: the path is cut into evenly spaced stages (one per PATH_STAGE_MM of travel or PATH_STAGE_DEG of turn,
 * whichever gives more, within [MIN_STAGES, MAX_STAGES]), graded at both ends (stageFractions). From one accepted point to the next, a secant predictor
 * and the damped Gauss–Newton solver (kinematics/inverse.ts) on the flange pose; a step whose largest joint change
 * exceeds MAX_JOINT_STEP_RAD, or that fails to converge, is halved (at most MAX_HALVINGS times). The solver runs on
 * the chain with its ranges opened, so a joint that leaves its range is reported where it does instead of looking
 * like the end of reach; the caller checks the ranges on the followed path (firstRangeViolation), so one path
 * serves every whole-turn variant of its start. Problems, at the first point where they appear:
 * - "singularity": the inverse condition of the tool-point Jacobian (σ_min/σ_max with linear rows divided by the
 *   characteristic length, as on the sheets) falls below PATH_SINGULAR_INVERSE_CONDITION, or, for six joints, det J
 *   changes sign between neighbouring points (the path crosses a singular pose between them);
 * - "branch-change": at the smallest step the joints still jump by more than JUMP_RAD (no continuous solution);
 * - "out-of-reach": at the smallest step the solver finds no solution.
 * The caller checks that the arrival is the chosen end solution.
 *
 * @see Allgower & Georg, Introduction to Numerical Continuation Methods, ch. 2 (predictor–corrector) [from memory];
 *   Shoemake, "Animating rotation with quaternion curves", SIGGRAPH 1985 (slerp) [from memory]
 */
import { withOpenRanges, type Chain } from "../../kinematics/chain";
import {
  createScratch,
  forwardInto,
  jacobianInto,
  toolPointInto,
  type KinematicsScratch,
} from "../../kinematics/forward";
import { createIkScratch, solveIkInto, type IkOptions, type IkScratch } from "../../kinematics/inverse";
import { determinantInPlace } from "../../math/linsolve";
import { rotationAxisAngleInto } from "../../math/mat4";
import { rotationErrorInto } from "../../math/so3";
import {
  createSingularityScratch,
  scaledInverseCondition,
  SINGULAR_INVERSE_CONDITION,
  type SingularityScratch,
} from "../../measures/singularity";

export const PATH_STAGE_MM = 10;
export const PATH_STAGE_DEG = 3;
export const MIN_STAGES = 24;
export const MAX_STAGES = 200;
export const MAX_JOINT_STEP_RAD = (3 * Math.PI) / 180;
export const JUMP_RAD = 0.3;
/**
 * Inverse condition below which a followed pose counts as singular: the joint rates there are about a thousand times
 * those of a well-conditioned pose, so the line can only be followed at a crawl. Passing closer to a singular pose
 * than the sheets' 0.01 is allowed (the timing slows the move down there); crossing one is not.
 */
export const PATH_SINGULAR_INVERSE_CONDITION = 1e-3;
const MAX_HALVINGS = 10;

const FOLLOW_IK: IkOptions = { maxIterations: 20, toleranceM: 1e-8, toleranceRad: 1e-7, task: "full" };

export type PathProblemKind = "out-of-reach" | "singularity" | "joint-limit" | "branch-change";

export interface PathProblem {
  readonly kind: PathProblemKind;
  /** Share of the path where it appears, 0–1. */
  readonly fraction: number;
  /** Tool point there, base frame, m. */
  readonly positionM: [number, number, number];
  /** Driven joint concerned (joint-limit), else -1. */
  readonly joint: number;
}

export interface FollowResult {
  readonly problem: PathProblem | null;
  /** Path parameter per stage: tool-point travel (m) or, when the tool point does not move, the turn (rad). */
  readonly s: Float64Array;
  /** Driven joints per stage, SI, stages × m row-major (up to the problem when there is one). */
  readonly q: Float64Array;
  readonly stages: number;
  /** Stages filled in `q` (all of them without a problem). */
  readonly completed: number;
  /** Tool-point travel per unit s (1 when s is the travel, 0 when the tool point stays put). */
  readonly toolSpeedPerUnitS: number;
  /** Joints on arrival (null with a problem). */
  readonly qEnd: Float64Array | null;
  /** Smallest inverse condition met. */
  readonly minInverseCondition: number;
}

export interface FollowContext {
  readonly chain: Chain;
  readonly open: Chain;
  readonly ik: IkScratch;
  readonly kin: KinematicsScratch;
  readonly sing: SingularityScratch;
  readonly jac: Float64Array;
  readonly det: Float64Array;
  readonly target: Float64Array;
  readonly rot: Float64Array;
  readonly omega: Float64Array;
  readonly rt: Float64Array;
  readonly point: Float64Array;
}

export function createFollowContext(chain: Chain): FollowContext {
  const m = chain.drivenCount;
  const open = withOpenRanges(chain);
  return {
    chain,
    open,
    ik: createIkScratch(open),
    kin: createScratch(chain),
    sing: createSingularityScratch(m),
    jac: new Float64Array(6 * m),
    det: new Float64Array(36),
    target: new Float64Array(16),
    rot: new Float64Array(16),
    omega: new Float64Array(3),
    rt: new Float64Array(9),
    point: new Float64Array(3),
  };
}

/** A linear move: tool-point poses (base frame, row-major 4×4, m) and the tool point in the flange frame. */
export interface LinearMove {
  readonly fromTcp: Float64Array;
  readonly toTcp: Float64Array;
  readonly tcpInFlange: Float64Array;
}

interface Geometry {
  readonly lengthM: number;
  readonly angleRad: number;
  readonly axis: [number, number, number];
}

function geometryOf(ctx: FollowContext, move: LinearMove): Geometry {
  const a = move.fromTcp,
    b = move.toTcp;
  const lengthM = Math.hypot(b[3]! - a[3]!, b[7]! - a[7]!, b[11]! - a[11]!);
  const w = rotationErrorInto(ctx.omega, 0, b, 4, a);
  const angleRad = Math.hypot(w[0]!, w[1]!, w[2]!);
  const axis: [number, number, number] =
    angleRad > 1e-12 ? [w[0]! / angleRad, w[1]! / angleRad, w[2]! / angleRad] : [0, 0, 1];
  return { lengthM, angleRad, axis };
}

/** The tool point at path fraction f of a linear move, base frame, m. */
export function linePositionM(move: LinearMove, f: number): [number, number, number] {
  const a = move.fromTcp,
    b = move.toTcp;
  return [0, 1, 2].map((i) => a[4 * i + 3]! + f * (b[4 * i + 3]! - a[4 * i + 3]!)) as [number, number, number];
}

/** Flange target at path fraction f into ctx.target: tool pose T(f) (lerp, slerp) times the inverse tool offset. */
function flangeTargetAt(ctx: FollowContext, move: LinearMove, g: Geometry, f: number): Float64Array {
  const a = move.fromTcp,
    b = move.toTcp,
    e = move.tcpInFlange,
    t = ctx.target;
  const r = rotationAxisAngleInto(ctx.rot, g.axis[0], g.axis[1], g.axis[2], f * g.angleRad);
  // R_tool = R(f)·R_a; R_flange = R_tool · R_eᵀ; p_flange = p_tool − R_flange · t_e.
  const rt = ctx.rt;
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++)
      rt[3 * i + j] = r[4 * i]! * a[j]! + r[4 * i + 1]! * a[4 + j]! + r[4 * i + 2]! * a[8 + j]!;
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++)
      t[4 * i + j] = rt[3 * i]! * e[4 * j]! + rt[3 * i + 1]! * e[4 * j + 1]! + rt[3 * i + 2]! * e[4 * j + 2]!;
  }
  for (let i = 0; i < 3; i++) {
    const p = a[4 * i + 3]! + f * (b[4 * i + 3]! - a[4 * i + 3]!);
    t[4 * i + 3] = p - (t[4 * i]! * e[3]! + t[4 * i + 1]! * e[7]! + t[4 * i + 2]! * e[11]!);
  }
  t[12] = 0;
  t[13] = 0;
  t[14] = 0;
  t[15] = 1;
  return t;
}

/** Number of stages for a move (see the module notes). */
export function stageCount(lengthM: number, angleRad: number): number {
  const byLength = Math.ceil((lengthM * 1000) / PATH_STAGE_MM),
    byAngle = Math.ceil((angleRad * 180) / Math.PI / PATH_STAGE_DEG);
  return Math.min(MAX_STAGES, Math.max(MIN_STAGES, byLength, byAngle)) + 1;
}

/** Stages graded at both ends by END_GRADING (see stageFractions). */
export const END_GRADING = [1 / 256, 1 / 64, 1 / 16, 1 / 4] as const;

/**
 * Path fractions of the stages: `count` evenly spaced ones, plus, inside the first and the last interval, stages at
 * END_GRADING of it. A move starts and ends at rest, where the timing is set by the acceleration over a short stretch:
 * the time-optimal timing's discretisation error (first order in the stage length) is largest there, and the graded
 * stages bring it down without more stages along the whole path.
 */
export function stageFractions(count: number): number[] {
  const e = 1 / (count - 1);
  const head = END_GRADING.map((g) => g * e);
  const middle = Array.from({ length: count }, (_, k) => k * e);
  const tail = [...head].reverse().map((h) => 1 - h);
  return [0, ...head, ...middle.slice(1, -1), ...tail, 1];
}

interface Probe {
  cond: number;
  det: number;
}

/** Inverse condition and (six joints) det J of the tool-point Jacobian at q. */
function probe(ctx: FollowContext, move: LinearMove, q: Float64Array, out: Probe): void {
  const chain = ctx.chain,
    m = chain.drivenCount,
    e = move.tcpInFlange;
  forwardInto(chain, q, ctx.kin);
  const p = toolPointInto(ctx.point, ctx.kin, e[3]!, e[7]!, e[11]!);
  jacobianInto(ctx.jac, chain, ctx.kin, p[0]!, p[1]!, p[2]!);
  out.cond = scaledInverseCondition(ctx.jac, m, chain.characteristicLengthM, ctx.sing);
  if (m === 6) {
    ctx.det.set(ctx.jac);
    out.det = determinantInPlace(ctx.det, 6);
  } else out.det = NaN;
}

/**
 * First stage (of the `completed` ones) where path q + offset leaves a joint range, with the joint, or null. The
 * follower runs without ranges so that one followed path serves every whole-turn variant of its start.
 */
export function firstRangeViolation(
  chain: Chain,
  r: FollowResult,
  offset: ArrayLike<number>,
): { stage: number; joint: number } | null {
  const m = chain.drivenCount;
  for (let k = 0; k < r.completed; k++)
    for (let i = 0; i < m; i++) {
      const v = r.q[k * m + i]! + offset[i]!;
      if (v < chain.lowerSi[i]! - 1e-9 || v > chain.upperSi[i]! + 1e-9) return { stage: k, joint: i };
    }
  return null;
}

/**
 * Follows the linear move from the driven joints `qStart` (a solution at its start). See the module notes.
 */
export function followLinear(ctx: FollowContext, move: LinearMove, qStart: ArrayLike<number>): FollowResult {
  const chain = ctx.chain,
    m = chain.drivenCount;
  const g = geometryOf(ctx, move);
  const fractions = stageFractions(stageCount(g.lengthM, g.angleRad));
  const n = fractions.length;
  const moves = g.lengthM > 1e-9;
  const span = moves ? g.lengthM : g.angleRad;
  const s = new Float64Array(n);
  const q = new Float64Array(n * m);
  for (let k = 0; k < n; k++) s[k] = span * fractions[k]!;
  const cur = Float64Array.from(qStart),
    prev = Float64Array.from(qStart),
    trial = new Float64Array(m);
  q.set(cur, 0);
  const pr: Probe = { cond: 0, det: 0 };
  probe(ctx, move, cur, pr);
  let minCond = pr.cond,
    lastDet = pr.det;
  let fCur = 0,
    fPrev = 0,
    completed = 1;
  const problemAt = (kind: PathProblemKind, f: number, joint = -1): FollowResult => {
    return {
      problem: { kind, fraction: f, positionM: linePositionM(move, f), joint },
      s,
      q,
      stages: n,
      completed,
      toolSpeedPerUnitS: moves ? 1 : 0,
      qEnd: null,
      minInverseCondition: minCond,
    };
  };
  for (let k = 1; k < n; k++) {
    const fGoal = fractions[k]!;
    let step = fGoal - fCur,
      halvings = 0;
    while (fCur < fGoal - 1e-15) {
      const fNext = Math.min(fGoal, fCur + step);
      // Secant predictor from the last two accepted points.
      const scale = fCur > fPrev ? (fNext - fCur) / (fCur - fPrev) : 0;
      for (let i = 0; i < m; i++) trial[i] = cur[i]! + scale * (cur[i]! - prev[i]!);
      const ok = solveIkInto(trial, ctx.open, flangeTargetAt(ctx, move, g, fNext), trial, ctx.ik, FOLLOW_IK);
      let jump = 0;
      for (let i = 0; i < m; i++) jump = Math.max(jump, Math.abs(trial[i]! - cur[i]!));
      if (!ok || jump > MAX_JOINT_STEP_RAD) {
        if (halvings >= MAX_HALVINGS) {
          if (ok) return problemAt(jump > JUMP_RAD ? "branch-change" : "singularity", fNext);
          return problemAt(minCond < 2 * SINGULAR_INVERSE_CONDITION ? "singularity" : "out-of-reach", fNext);
        }
        step /= 2;
        halvings++;
        continue;
      }
      prev.set(cur);
      cur.set(trial);
      fPrev = fCur;
      fCur = fNext;
      probe(ctx, move, cur, pr);
      minCond = Math.min(minCond, pr.cond);
      if (pr.cond < PATH_SINGULAR_INVERSE_CONDITION || (m === 6 && pr.det * lastDet < 0))
        return problemAt("singularity", fCur);
      lastDet = pr.det;
      if (halvings > 0 && jump < MAX_JOINT_STEP_RAD / 4) {
        step *= 2;
        halvings--;
      }
    }
    q.set(cur, k * m);
    completed = k + 1;
  }
  return {
    problem: null,
    s,
    q,
    stages: n,
    completed: n,
    toolSpeedPerUnitS: moves ? 1 : 0,
    qEnd: Float64Array.from(cur),
    minInverseCondition: minCond,
  };
}
