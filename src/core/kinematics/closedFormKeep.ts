/**
 * The last step of the closed-form solvers (closedForm.ts, orthoParallel.ts): kinematic joint solutions turned into
 * driven values inside the joint ranges (whole turns, or onto a limit within RANGE_MARGIN_RAD), checked by forward
 * kinematics where the solver asks for it, without repeats.
 */
import type { Chain } from "./chain";
import { forwardInto, type KinematicsScratch } from "./forward";
import { sameModuloTurns, wrapNear } from "../math/angles";

/** What keepSolutionsInto needs of a solver: the chain, its kinematic solutions (6 each) and scratch. */
export interface KeepContext {
  readonly chain: Chain;
  readonly kinSol: Float64Array;
  readonly q6: Float64Array;
  readonly kin: KinematicsScratch;
  /** couplesDrivenJoints(chain), found once. */
  readonly coupled: boolean;
}

/**
 * Driven values of kinematic solutions `from`..`count` − 1 in ctx.kinSol, inside the ranges, checked by forward
 * kinematics when `check`, without repeats, written to out from `outOffset`; returns how many were kept (at most
 * `limit`). `distinct`: the solver guarantees its solutions differ by more than the repeat tolerance (1e-6 rad).
 */
export function keepSolutionsInto(
  out: Float64Array,
  outOffset: number,
  ctx: KeepContext,
  T: ArrayLike<number>,
  count: number,
  check: boolean,
  repairNearLimit: ((q: Float64Array) => boolean) | undefined,
  from = 0,
  limit = Infinity,
  distinct = false,
): number {
  let kept = 0;
  const q = ctx.q6;
  for (let s = from; s < count && kept < limit; s++) {
    if (!drivenInRangeInto(q, ctx.chain, ctx.kinSol, s, 6, ctx.coupled)) continue;
    if (clampedOntoLimit ? !reachesTarget(ctx, q, T) && !repairNearLimit?.(q) : check && !reachesTarget(ctx, q, T))
      continue;
    // Distinct modulo whole turns (double roots at the edge of reach come out twice); a solver that vouches for
    // distinct solutions (`distinct`) is taken at its word unless a value was put onto a limit.
    if ((!distinct || clampedOntoLimit) && isRepeat(out, outOffset, kept, q)) continue;
    const o = outOffset + kept * 6;
    for (let i = 0; i < 6; i++) out[o + i] = q[i]!;
    kept++;
  }
  return kept;
}

/** How far beyond a limit a solution may lie and be put onto it (then checked); clampedOntoLimit: one was. */
export const RANGE_MARGIN_RAD = 1e-3;
let clampedOntoLimit = false;

/**
 * Driven values q_d = G⁻¹·(q_kin − offset) (G unit lower triangular, integer) of kinematic solution `s` into q, taken
 * into the ranges by whole turns (or onto a limit); false when a joint cannot be brought inside its range. `coupled`
 * false (couplesDrivenJoints) skips the terms below G's diagonal, all zero then.
 */
export function drivenInRangeInto(
  q: Float64Array,
  chain: Chain,
  kinSol: Float64Array,
  s: number,
  joints = 6,
  coupled = true,
): boolean {
  const g = chain.couplingGain,
    off = chain.couplingOffset,
    lo = chain.lowerSi,
    hi = chain.upperSi;
  let inRange = true;
  for (let i = 0; i < joints; i++) {
    let v = kinSol[s * 6 + i]! - off[i]!;
    if (coupled)
      for (let j = 0; j < i; j++) {
        const gij = g[i * 6 + j]!;
        if (gij !== 0) v -= gij * q[j]!;
      }
    q[i] = v;
  }
  clampedOntoLimit = false;
  for (let i = 0; i < joints && inRange; i++) {
    // Within the range and half a turn of 0: what wrapNear gives (−0 made +0), without its divisions.
    const u = q[i]!;
    let v = u >= lo[i]! && u <= hi[i]! && Math.abs(u) < Math.PI ? u + 0 : wrapNear(u, 0, lo[i]!, hi[i]!);
    if (Number.isNaN(v)) {
      v = Math.min(hi[i]!, Math.max(lo[i]!, wrapNear(q[i]!, 0, lo[i]! - RANGE_MARGIN_RAD, hi[i]! + RANGE_MARGIN_RAD)));
      clampedOntoLimit ||= !Number.isNaN(v);
    }
    if (Number.isNaN(v)) inRange = false;
    else q[i] = v;
  }
  return inRange;
}

/** Whether G (6 × 6, unit lower triangular here) has an entry below its diagonal (a joint read against another). */
export function couplesDrivenJoints(chain: Chain): boolean {
  const g = chain.couplingGain;
  for (let i = 0; i < 6; i++) for (let j = 0; j < i; j++) if (g[i * 6 + j] !== 0) return true;
  return false;
}

/** Whether the flange at driven values q lies on target T (position to 1 µm, rotation entries to 1e-5). */
function reachesTarget(ctx: KeepContext, q: Float64Array, T: ArrayLike<number>): boolean {
  const f = forwardInto(ctx.chain, q, ctx.kin);
  const ex = f[3]! - T[3]!,
    ey = f[7]! - T[7]!,
    ez = f[11]! - T[11]!,
    ep = Math.sqrt(ex * ex + ey * ey + ez * ez);
  let er = 0;
  for (let rr = 0; rr < 3; rr++)
    for (let cc = 0; cc < 3; cc++) er = Math.max(er, Math.abs(f[rr * 4 + cc]! - T[rr * 4 + cc]!));
  return !(ep > 1e-6 || er > 1e-5);
}

/** Whether q equals one of the first `kept` solutions in out modulo whole turns. */
function isRepeat(out: Float64Array, outOffset: number, kept: number, q: Float64Array): boolean {
  for (let k = 0; k < kept; k++) if (sameModuloTurns(out, outOffset + k * 6, q, 0, 6, 1e-6)) return true;
  return false;
}
