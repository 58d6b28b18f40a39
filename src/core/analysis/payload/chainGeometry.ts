/**
 * Chain geometry shared by the payload input (wrist levers) and the at-reach search (joint roles): joint axes in the
 * base frame at a posture, the home pose, uncoupled joints and the trailing flange-spin joints. Not in hot loops.
 */
import type { Chain } from "../../kinematics/chain";
import type { KinematicsScratch } from "../../kinematics/forward";

/** Distance (m) under which points count as on an axis, and the sine under which axes count as parallel. */
export const ON_AXIS_M = 1e-6;
export const PARALLEL_SIN = 1e-9;

export function dot3(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
}
export function cross3(a: readonly number[], b: readonly number[]): number[] {
  return [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
}
export function norm3(a: readonly number[]): number {
  return Math.hypot(a[0]!, a[1]!, a[2]!);
}
export function distanceToLine(p: ArrayLike<number>, o: readonly number[], w: readonly number[]): number {
  return norm3(cross3([p[0]! - o[0]!, p[1]! - o[1]!, p[2]! - o[2]!], w));
}
/** Point of line (o, w) nearest to line (p, z); both directions unit. */
export function nearestPointOnLine(
  o: readonly number[],
  w: readonly number[],
  p: readonly number[],
  z: readonly number[],
): number[] {
  const r = [p[0]! - o[0]!, p[1]! - o[1]!, p[2]! - o[2]!];
  const b = dot3(w, z),
    denom = 1 - b * b;
  const t = denom < 1e-12 ? dot3(r, w) : (dot3(r, w) - b * dot3(r, z)) / denom;
  return [o[0]! + t * w[0]!, o[1]! + t * w[1]!, o[2]! + t * w[2]!];
}

/** Origin and unit axis (base frame) of kinematic joint k after forwardInto. */
export function axisInBase(chain: Chain, s: KinematicsScratch, k: number): { o: number[]; w: number[] } {
  const fr = s.motionFrames,
    f = 16 * k,
    a = chain.axisLocal;
  const ax = a[3 * k]!,
    ay = a[3 * k + 1]!,
    az = a[3 * k + 2]!;
  return {
    o: [fr[f + 3]!, fr[f + 7]!, fr[f + 11]!],
    w: [
      fr[f]! * ax + fr[f + 1]! * ay + fr[f + 2]! * az,
      fr[f + 4]! * ax + fr[f + 5]! * ay + fr[f + 6]! * az,
      fr[f + 8]! * ax + fr[f + 9]! * ay + fr[f + 10]! * az,
    ],
  };
}

/** q_driven = 0, clamped into the limits (mid-range when 0 lies outside). */
export function homePose(chain: Chain): Float64Array {
  const q = new Float64Array(chain.drivenCount);
  for (let j = 0; j < chain.drivenCount; j++) q[j] = holdValue(chain, j);
  return q;
}
export function holdValue(chain: Chain, j: number): number {
  const lo = chain.lowerSi[j]!,
    hi = chain.upperSi[j]!;
  if (0 >= lo && 0 <= hi) return 0;
  return Number.isFinite(lo) && Number.isFinite(hi) ? (lo + hi) / 2 : Number.isFinite(lo) ? lo : hi;
}

/** True when driven joint j moves kinematic joint k alone, with gain 1, and nothing else follows it. */
export function isUncoupled(chain: Chain, j: number): boolean {
  const m = chain.drivenCount,
    k = chain.drivenJoint[j]!,
    g = chain.couplingGain;
  for (let i = 0; i < chain.jointCount; i++) if (g[i * m + j]! !== (i === k ? 1 : 0)) return false;
  for (let c = 0; c < m; c++) if (c !== j && g[k * m + c]! !== 0) return false;
  return true;
}

/**
 * Kinematic indices of the trailing "flange spin" joints: uncoupled driven revolute joints at the end of the chain
 * whose axis is the flange axis (they turn the tool about its own axis and move no CG that lies on it).
 * Expects forwardInto at the home pose in `s`.
 */
export function flangeSpinSet(chain: Chain, s: KinematicsScratch): Set<number> {
  const out = new Set<number>();
  const f = s.flange,
    zf = [f[2]!, f[6]!, f[10]!],
    pf = [f[3]!, f[7]!, f[11]!];
  for (let k = chain.jointCount - 1; k >= 0; k--) {
    const j = chain.drivenJoint.indexOf(k);
    if (j < 0 || chain.isPrismatic[k] || !isUncoupled(chain, j)) break;
    const { o, w } = axisInBase(chain, s, k);
    if (norm3(cross3(w, zf)) > PARALLEL_SIN || distanceToLine(pf, o, w) > ON_AXIS_M) break;
    out.add(k);
  }
  return out;
}
