/**
 * Whether a run follows the line, and the constant speed it allows. The rule: a start branch that cannot follow the
 * whole line within reach, within every joint range and without a jump (no continuous solution) has no feasible
 * speed (0); a pose needing unbounded joint rates gives 0 as well. Only a branch that follows the line has the
 * speed its joint rates allow, max over the line of the rate ratios (see lineCheck.ts).
 */
import type { Context } from "./context";
import type { Run } from "./record";
import type { LineNotFollowedReason } from "./types";

/** Why a run does not follow the line, where (line position s, m) and which joint (index or −1); null when it does. */
export interface RunVerdict {
  readonly reason: LineNotFollowedReason;
  readonly s: number;
  readonly joint: number;
}

/**
 * The first reason that applies, in the order out of reach, jump, joint limit, singular (the order of the
 * bottleneck): out of reach at the first gap's inner end, a jump at the middle of the first jump (the joint that
 * jumps most), a joint limit where the first violation starts, singular at the worst point.
 */
export function runVerdict(ctx: Context, run: Run): RunVerdict | null {
  if (!run.anyPoint) return { reason: "out of reach", s: 0, joint: -1 };
  if (run.gaps.length > 0) {
    const g = run.gaps[0]!;
    return { reason: "out of reach", s: g.fromS === 0 ? g.toS : g.fromS, joint: -1 };
  }
  if (run.jumps > 0) {
    const e = run.events.find((x) => !x.continuous && !x.acrossGap)!;
    let arg = 0;
    for (let i = 1; i < ctx.m; i++) if (Math.abs(e.dq[i]!) > Math.abs(e.dq[arg]!)) arg = i;
    return { reason: "jump", s: (e.fromS + e.toS) / 2, joint: arg };
  }
  if (run.violations.length > 0) {
    let first = run.violations[0]!;
    for (const v of run.violations) if (v.fromS < first.fromS) first = v;
    return { reason: "joint limit", s: first.fromS, joint: first.joint };
  }
  if (run.worst.maxRatio === Infinity) return { reason: "singular", s: run.worst.s, joint: run.worst.argJoint };
  return null;
}

/**
 * Constant speed the joint rates of a run allow, m/s, whether or not it follows the line (0 at a gap, a jump or an
 * unbounded rate; Infinity when no joint with a speed limit moves). Used only to rank runs that do not follow it.
 */
export function rateLimitedSpeed(run: Run): number {
  if (run.gaps.length > 0 || run.jumps > 0 || !run.anyPoint) return 0;
  const r = run.worst.maxRatio;
  return r === Infinity ? 0 : r > 0 ? 1 / r : Infinity;
}

/** Feasible constant speed of a run, m/s: 0 unless it follows the whole line (runVerdict null). */
export function feasibleSpeed(ctx: Context, run: Run): number {
  return runVerdict(ctx, run) ? 0 : rateLimitedSpeed(run);
}

/** True when a branch change (codes before and after) is the wrist centre passing axis 1 continuously. */
export function passesAxis1(fromCode: number, toCode: number, continuous: boolean): boolean {
  return continuous && ((fromCode ^ toCode) & 1) === 1;
}
