/**
 * Standard pick-and-place cycle estimate: up 25 mm, across 300 mm, down 25 mm and back (STANDARD_CYCLE_MOVES; common
 * practice, no source), at a stated reference location, tool pointing down. Each of the six moves is a point-to-point joint
 * move between inverse-kinematics solutions, every joint on a trapezoidal (or triangular) velocity profile within
 * its speed and acceleration limits, all joints finishing together (the slowest sets the time). No blending and no
 * dwell: a lower bound under these assumptions, not a maker's cycle time.
 * @see Biagiotti & Melchiorri, Trajectory Planning for Automatic Machines and Robots, §3.2 (trapezoidal profile)
 *   [from memory]; CHECKS C17
 */
import type { Chain } from "../../kinematics/chain";
import { createIkScratch, solveIkInto } from "../../kinematics/inverse";

/**
 * The standard cycle's moves (common practice, no source): up `upMm`, across `acrossMm`, down `upMm` and back. The
 * one place these numbers live: the analysis, the pages and the charts read them from here.
 */
export const STANDARD_CYCLE_MOVES: { readonly upMm: number; readonly acrossMm: number } = { upMm: 25, acrossMm: 300 };

/** When a file gives no acceleration: the joint reaches its top speed in this time (common practice, no source). */
export const DEFAULT_TIME_TO_TOP_SPEED_S = 0.4;

/**
 * Rest-to-rest time over distance d with speed limit v and acceleration limit a:
 * d/v + v/a when d ≥ v²/a (trapezoid), else 2·sqrt(d/a) (triangle).
 * @example trapezoidTimeS(0.3, 2, 20) // 0.25; trapezoidTimeS(0.025, 2, 20) // 0.0707107 (CHECKS C17)
 */
export function trapezoidTimeS(distance: number, speedLimit: number, accelLimit: number): number {
  const d = Math.abs(distance);
  if (d === 0) return 0;
  if (!(speedLimit > 0) || !(accelLimit > 0))
    throw new RangeError(`invalid limits: speed ${speedLimit}, acceleration ${accelLimit}`);
  return d >= (speedLimit * speedLimit) / accelLimit
    ? d / speedLimit + speedLimit / accelLimit
    : 2 * Math.sqrt(d / accelLimit);
}

export interface CycleLocation {
  /** Centre of the across move: distance from axis 1 and height, mm, in the side plane. */
  readonly rMm: number;
  readonly zMm: number;
}

export interface CycleResult {
  readonly standardCycleS: number | null;
  /** Name of the joint that sets the time of the longest move. */
  readonly limitingJoint: string | null;
  readonly location: CycleLocation | null;
  readonly moves: readonly {
    readonly from: string;
    readonly to: string;
    readonly timeS: number;
    readonly limitingJoint: string;
  }[];
  readonly assumptions: readonly string[];
  /** Why there is no cycle time (absent when there is one). */
  readonly failure?: CycleFailure;
}

/** start-unreachable: the start point at the location's reach; point-unreachable: the named cycle point. */
export interface CycleFailure {
  readonly reason: "start-unreachable" | "point-unreachable" | "no-location";
  readonly point: string | null;
}

export interface CycleOptions {
  readonly upMm: number;
  readonly acrossMm: number;
  /** Driven-joint names, for the output. */
  readonly jointNames: readonly string[];
}

/**
 * Estimates the standard cycle at `location`. `seed` is a joint solution near the location (tool down) and
 * `targetPose(lateralMm, rMm, zMm, upMm, out)` writes the target flange pose (row-major 4×4, m): the side-plane
 * point (rMm, zMm) moved sideways by lateralMm and upward (against gravity) by upMm.
 */
export function standardCycle(
  chain: Chain,
  location: CycleLocation,
  seed: ArrayLike<number>,
  targetPose: (lateralMm: number, rMm: number, zMm: number, upMm: number, out: Float64Array) => Float64Array,
  options: CycleOptions,
): CycleResult {
  const m = chain.drivenCount;
  const half = options.acrossMm / 2;
  const points = [
    { name: "A", lat: -half, dz: 0 },
    { name: "A up", lat: -half, dz: options.upMm },
    { name: "B up", lat: half, dz: options.upMm },
    { name: "B", lat: half, dz: 0 },
  ];
  const ik = createIkScratch(chain);
  const target = new Float64Array(16);
  const solutions: Float64Array[] = [];
  let q = Float64Array.from(seed);
  // Walk from the seed to A in small steps so the solution stays on the seed's branch.
  const steps = 12;
  for (let s = 1; s <= steps; s++) {
    targetPose((points[0]!.lat * s) / steps, location.rMm, location.zMm, 0, target);
    const next = new Float64Array(m);
    if (!solveIkInto(next, chain, target, q, ik)) return failed({ reason: "start-unreachable", point: null });
    q = next;
  }
  for (const p of points) {
    targetPose(p.lat, location.rMm, location.zMm, p.dz, target);
    const next = new Float64Array(m);
    if (!solveIkInto(next, chain, target, q, ik)) return failed({ reason: "point-unreachable", point: p.name });
    solutions.push(next);
    q = next;
  }
  const speed = chain.maxSpeedSi,
    accel = chain.maxAccelSi;
  const moves: { from: string; to: string; timeS: number; limitingJoint: string }[] = [];
  let total = 0;
  const legs: [number, number][] = [
    [0, 1],
    [1, 2],
    [2, 3],
    [3, 2],
    [2, 1],
    [1, 0],
  ];
  for (const [a, b] of legs) {
    let worst = 0,
      limiting = 0;
    for (let i = 0; i < m; i++) {
      const v = speed[i]!;
      const acc = Number.isFinite(accel[i]!) ? accel[i]! : v / DEFAULT_TIME_TO_TOP_SPEED_S;
      const t = trapezoidTimeS(solutions[b]![i]! - solutions[a]![i]!, v, acc);
      if (t > worst) {
        worst = t;
        limiting = i;
      }
    }
    total += worst;
    moves.push({
      from: points[a]!.name,
      to: points[b]!.name,
      timeS: worst,
      limitingJoint: options.jointNames[limiting] ?? `joint ${limiting + 1}`,
    });
  }
  const longest = moves.reduce((x, y) => (y.timeS > x.timeS ? y : x));
  return {
    standardCycleS: total,
    limitingJoint: longest.limitingJoint,
    location,
    moves,
    assumptions: ASSUMPTIONS(chain),
  };

  function failed(failure: CycleFailure): CycleResult {
    return { standardCycleS: null, limitingJoint: null, location, moves: [], assumptions: ASSUMPTIONS(chain), failure };
  }
}

function ASSUMPTIONS(chain: Chain): string[] {
  const { upMm, acrossMm } = STANDARD_CYCLE_MOVES;
  const missing = Array.from(chain.maxAccelSi).some((a) => !Number.isFinite(a));
  return [
    `Cycle: up ${upMm} mm, across ${acrossMm} mm, down ${upMm} mm and back (common practice, no source); no dwell, no blending.`,
    "Each move is a point-to-point joint move; every joint follows a trapezoidal speed profile within its speed and acceleration limits; all joints finish together.",
    "Tool pointing down, flange centre as the tool point, no payload dynamics: a lower bound under these assumptions, not a maker's cycle time.",
    ...(missing
      ? [
          `Joints without an acceleration in the file are assumed to reach top speed in ${DEFAULT_TIME_TO_TOP_SPEED_S} s.`,
        ]
      : []),
  ];
}
