/**
 * Synchronised point-to-point joint move: every driven joint on a trapezoidal (or triangular) velocity profile,
 * rest to rest, all joints starting and stopping together. The move lasts as long as the slowest joint; the others
 * are slowed to match (only the time is reported here, not their stretched profiles).
 *
 * One joint, distance d, speed v, acceleration a: t = d/v + v/a when d ≥ v²/a (trapezoid), else t = 2·√(d/a)
 * (triangle) — trapezoidTimeS of the standard cycle, reused.
 * @see Biagiotti & Melchiorri, Trajectory Planning for Automatic Machines and Robots, Springer 2008, ch. 3
 *   [from memory: chapter]; CHECKS C17
 */
import { trapezoidTimeS } from "../cycle/cycle";

/**
 * Where an arm file gives no joint acceleration, a cell study assumes the joint reaches its full speed in this time
 * (issue 12; many arms do in 0.2–0.4 s: common practice, no source). The standard cycle keeps its own value
 * (cycle.ts DEFAULT_TIME_TO_TOP_SPEED_S).
 */
export const CELL_TIME_TO_TOP_SPEED_S = 0.25;

/**
 * The acceleration limit of each joint, SI: `maxAccelSi[i]` where it is finite, else full speed `maxSpeedSi[i]`
 * reached in `timeToTopSpeedS` (a = v / t). Writes `out` and returns it; `assumed[i]` is set to true where the value
 * was assumed. The assumption uses the joint's full speed, whatever speed scale a move applies.
 * @example effectiveAccelInto(new Float64Array(2), [2, 3], [20, NaN], 0.25, flags) // [20, 12], flags [false, true]
 */
export function effectiveAccelInto(
  out: Float64Array,
  maxSpeedSi: ArrayLike<number>,
  maxAccelSi: ArrayLike<number>,
  timeToTopSpeedS: number,
  assumed: boolean[],
): Float64Array {
  if (!(timeToTopSpeedS > 0) || !Number.isFinite(timeToTopSpeedS))
    throw new RangeError(`invalid time to top speed: ${timeToTopSpeedS} s (expected a finite number > 0)`);
  for (let i = 0; i < maxSpeedSi.length; i++) {
    const given = maxAccelSi[i]!;
    const isAssumed = Number.isNaN(given);
    assumed[i] = isAssumed;
    out[i] = isAssumed ? maxSpeedSi[i]! / timeToTopSpeedS : given;
  }
  return out;
}

export interface JointMoveTime {
  /** Duration of the synchronised move, s (0 when no joint moves). */
  readonly timeS: number;
  /** Index of the joint whose own profile takes longest (the first such on a tie); −1 when no joint moves. */
  readonly limitingJoint: number;
  /** Per joint: true where the acceleration was assumed (the arm file gives none). */
  readonly accelAssumed: readonly boolean[];
  /** True when the limiting joint's acceleration was assumed (the figure should say so). */
  readonly limitingAccelAssumed: boolean;
  /** Per joint: the time its own fastest profile would take, s (the slowest sets `timeS`). */
  readonly jointTimesS: Float64Array;
}

/**
 * Time of a synchronised point-to-point joint move.
 *
 * - `distanceSi[i]`: |Δq| of driven joint i (rad or m; the sign is ignored);
 * - `maxSpeedSi[i]` > 0, `maxAccelSi[i]` > 0 or NaN (assumed: full speed in `assumedTimeToTopSpeedS`);
 * - `speedScale` in (0, 1] (a step's speedPercent / 100) scales every joint's speed, not its acceleration. This
 *   follows the common reading of a speed override (common practice, no source) and the wording
 *   ("speedPercent scales joint speeds"); it keeps the figure a lower bound, since a controller that also scales
 *   acceleration can only be slower. An assumed acceleration is the joint's full speed over the time to top speed.
 * @example jointMoveTime([0.3, 0.025], [2, 2], [20, 20]) // { timeS: 0.25, limitingJoint: 0, … } (CHECKS C17)
 */
export function jointMoveTime(
  distanceSi: ArrayLike<number>,
  maxSpeedSi: ArrayLike<number>,
  maxAccelSi: ArrayLike<number>,
  speedScale = 1,
  assumedTimeToTopSpeedS = CELL_TIME_TO_TOP_SPEED_S,
): JointMoveTime {
  const m = distanceSi.length;
  if (maxSpeedSi.length !== m || maxAccelSi.length !== m)
    throw new RangeError(
      `joint move: ${m} distances but ${maxSpeedSi.length} speed and ${maxAccelSi.length} acceleration limits`,
    );
  if (!(speedScale > 0 && speedScale <= 1))
    throw new RangeError(`joint move: invalid speed scale ${speedScale} (expected a number in (0, 1])`);
  const accelAssumed: boolean[] = new Array<boolean>(m).fill(false);
  const accel = effectiveAccelInto(new Float64Array(m), maxSpeedSi, maxAccelSi, assumedTimeToTopSpeedS, accelAssumed);
  const jointTimesS = new Float64Array(m);
  let timeS = 0,
    limitingJoint = -1;
  for (let i = 0; i < m; i++) {
    const d = distanceSi[i]!;
    if (!Number.isFinite(d)) throw new RangeError(`joint move: joint ${i + 1} distance ${d} is not finite`);
    const t = trapezoidTimeS(d, maxSpeedSi[i]! * speedScale, accel[i]!);
    jointTimesS[i] = t;
    if (t > timeS) {
      timeS = t;
      limitingJoint = i;
    }
  }
  return {
    timeS,
    limitingJoint,
    accelAssumed,
    limitingAccelAssumed: limitingJoint >= 0 && accelAssumed[limitingJoint]!,
    jointTimesS,
  };
}
