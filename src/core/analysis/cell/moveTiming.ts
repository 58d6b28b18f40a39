/**
 * Move times of a cell study for one arm: a joint move between two solutions (jointMove.ts) and a followed linear
 * move (timeOptimal.ts), each with what sets its time in words ("J2 speed", "J3 acceleration", "tool speed").
 */
import type { Chain } from "../../kinematics/chain";
import { mToMm } from "../../units";
import { jointMoveTime } from "./jointMove";
import type { FollowResult } from "./pathFollow";
import { createTimeOptimalScratch, timeOptimal, type TimeOptimalScratch } from "./timeOptimal";

export interface JointMoveDetail {
  readonly timeS: number;
  readonly limitedBy: string | null;
}

export interface LinearMoveDetail {
  /** Rest-to-rest time, s; null when the timing finds the path blocked (the speed must drop to zero inside it). */
  readonly timeS: number | null;
  readonly limitedBy: string | null;
  /** Largest tool-point speed on the move, mm/s (null when the tool point does not move). */
  readonly peakToolSpeedMmPerS: number | null;
  /** Where the timing finds the path blocked, as a share of it (null when it is not). */
  readonly blockedAtFraction: number | null;
  /** Smallest inverse condition of the tool-point Jacobian met on the move. */
  readonly minInverseCondition: number;
}

function name(chain: Chain, i: number): string {
  return chain.jointNames[chain.drivenJoint[i]!]!;
}

/**
 * Synchronised joint move from a to b at `speedScale` of every joint's speed: the slowest joint's trapezoid (or
 * triangle) sets the time; it is "speed"-limited when it cruises at its (scaled) top speed for at least as long as it
 * speeds up and slows down, else "acceleration"-limited.
 */
export function timeJointMove(
  chain: Chain,
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  speedScale: number,
): JointMoveDetail {
  const m = chain.drivenCount;
  const d = new Float64Array(m);
  for (let i = 0; i < m; i++) d[i] = Math.abs(b[i]! - a[i]!);
  const t = jointMoveTime(d, chain.maxSpeedSi, chain.maxAccelSi, speedScale);
  if (t.limitingJoint < 0) return { timeS: t.timeS, limitedBy: null };
  const k = t.limitingJoint;
  // As for linear moves: the limit that holds over the larger share of the time. On a trapezoid T = d/v + v/a the
  // cruise lasts d/v − v/a = 2d/v − T and the ramps the rest; a triangle (2d/v < T) never cruises.
  const v = chain.maxSpeedSi[k]! * speedScale;
  const cruiseS = Math.max(0, (2 * d[k]!) / v - t.timeS),
    rampS = t.timeS - cruiseS;
  return { timeS: t.timeS, limitedBy: `${name(chain, k)} ${cruiseS >= rampS ? "speed" : "acceleration"}` };
}

const scratchByChain = new WeakMap<Chain, TimeOptimalScratch>();

/** Time-optimal timing of a followed linear move under the joint limits and the tool-speed cap (m/s, Infinity: none). */
export function timeLinearMove(chain: Chain, follow: FollowResult, capMPerS: number): LinearMoveDetail {
  let scratch = scratchByChain.get(chain);
  if (!scratch) {
    scratch = createTimeOptimalScratch();
    scratchByChain.set(chain, scratch);
  }
  const n = follow.stages;
  // A move to the pose it starts at (same position and orientation) takes no time.
  const base = { minInverseCondition: follow.minInverseCondition, blockedAtFraction: null };
  if (!(follow.s[n - 1]! > 0)) return { ...base, timeS: 0, limitedBy: null, peakToolSpeedMmPerS: null };
  const capped = Number.isFinite(capMPerS) && follow.toolSpeedPerUnitS > 0;
  const r = timeOptimal(
    {
      s: follow.s,
      q: follow.q,
      maxSpeedSi: chain.maxSpeedSi,
      maxAccelSi: chain.maxAccelSi,
      toolSpeedCap: capped
        ? { capMPerS, toolSpeedPerUnitS: new Float64Array(n).fill(follow.toolSpeedPerUnitS) }
        : undefined,
    },
    scratch,
  );
  if (!r.feasible || !Number.isFinite(r.timeS))
    return {
      ...base,
      timeS: null,
      limitedBy: null,
      peakToolSpeedMmPerS: null,
      blockedAtFraction: r.blockedAt ? r.blockedAt.s / follow.s[n - 1]! : null,
    };
  const l = r.limitedBy;
  const limitedBy = !l
    ? null
    : l.kind === "tool-speed"
      ? `tool speed ${Number(mToMm(capMPerS).toFixed(0))} mm/s`
      : `${name(chain, l.joint!)} ${l.kind}`;
  let peak: number | null = null;
  if (follow.toolSpeedPerUnitS > 0) {
    peak = 0;
    for (let k = 0; k < n; k++) {
      const v = r.sDotProfile[k]!;
      if (Number.isFinite(v)) peak = Math.max(peak, v * follow.toolSpeedPerUnitS);
    }
    peak = Number(mToMm(peak).toFixed(1));
  }
  return { ...base, timeS: r.timeS, limitedBy, peakToolSpeedMmPerS: peak };
}
