/**
 * Shared fixtures of the straight-line check tests (test/core/analysis/line/): the invented planar 3R with its
 * closed forms (CHECKS C1, C3, C13) and the generic 6R of CHECKS §0 with the independent mathjs DH product.
 */
import { compileChain, type ArmKinematicsInput } from "../../../../src/core";
import type { LineCheckResult } from "../../../../src/core/analysis/line";
import { dhFrameReference, flat4, generic6rDh, GENERIC_6R_SI } from "../../../helpers/testArms";

export const DEG = Math.PI / 180;

// ---------------------------------------------------------------------------------------------------------------
// Planar 3R and its closed forms.

export const A1 = 0.5,
  A2 = 0.4,
  A3 = 0.1;
export const W3R = [90 * DEG, 120 * DEG, 180 * DEG]; // rad/s

export function planar3r(rangeJ1Deg?: [number, number]): ArmKinematicsInput {
  const joint = (i: number, aMm: number, speed: number) => ({
    name: `j${i + 1}`,
    kind: "revolute" as const,
    dh: { aMm, alphaDeg: 0, dMm: 0, thetaDeg: 0 },
    maxSpeedDegPerS: speed,
    ...(i === 0 && rangeJ1Deg ? { rangeDeg: rangeJ1Deg } : {}),
  });
  return {
    convention: "dh",
    joints: [joint(0, 500, 90), joint(1, 400, 120), joint(2, 100, 180)],
    flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
  };
}
export const CHAIN_3R = compileChain(planar3r());

/** Closed-form IK of the planar 3R at TCP (x, y) and tool angle φ: law of cosines for the wrist point (2R). */
export function ik3r(x: number, y: number, phi: number, elbow: 1 | -1): number[] {
  const wx = x - A3 * Math.cos(phi),
    wy = y - A3 * Math.sin(phi);
  const c2 = (wx * wx + wy * wy - A1 * A1 - A2 * A2) / (2 * A1 * A2);
  const q2 = elbow * Math.acos(c2);
  const q1 = Math.atan2(wy, wx) - Math.atan2(A2 * Math.sin(q2), A1 + A2 * Math.cos(q2));
  return [q1, q2, phi - q1 - q2];
}

/**
 * Joint rates per unit TCP velocity u = (ux, uy) at constant φ: [q̇1, q̇2] = J2R⁻¹ u with the CHECKS C1 Jacobian
 * J = [[−a1s1 − a2s12, −a2s12], [a1c1 + a2c12, a2c12]], det J = a1a2 s2, inverse by the 2×2 adjugate; q̇3 = −(q̇1 + q̇2).
 */
export function rates3r(q: readonly number[], ux: number, uy: number): number[] {
  const s1 = Math.sin(q[0]!),
    c1 = Math.cos(q[0]!),
    s12 = Math.sin(q[0]! + q[1]!),
    c12 = Math.cos(q[0]! + q[1]!);
  const det = A1 * A2 * Math.sin(q[1]!);
  const q1 = (A2 * c12 * ux + A2 * s12 * uy) / det;
  const q2 = ((-A1 * c1 - A2 * c12) * ux + (-A1 * s1 - A2 * s12) * uy) / det;
  return [q1, q2, -(q1 + q2)];
}

/** Closed-form speed bound at one point: minᵢ q̇maxᵢ / |(J⁻¹u)ᵢ| (CHECKS C13 along the one direction u), m/s; and its joint. */
export function bound3r(q: readonly number[], ux: number, uy: number): { speed: number; joint: number } {
  const r = rates3r(q, ux, uy);
  let speed = Infinity,
    joint = -1;
  r.forEach((v, i) => {
    const b = W3R[i]! / Math.abs(v);
    if (b < speed) {
      speed = b;
      joint = i;
    }
  });
  return { speed, joint };
}

// ---------------------------------------------------------------------------------------------------------------
// Generic 6R (CHECKS §0).

export const CHAIN_6R = compileChain(generic6rDh());

/** TCP position (m) and rotation (row-major 3×3) of the generic 6R from the independent mathjs DH product. */
export function pose6r(q: readonly number[]): { p: number[]; r: number[] } {
  const t = flat4(dhFrameReference(GENERIC_6R_SI.rows, q));
  return { p: [t[3]!, t[7]!, t[11]!], r: [t[0]!, t[1]!, t[2]!, t[4]!, t[5]!, t[6]!, t[8]!, t[9]!, t[10]!] };
}

/** Largest |rate| of driven joint i over the samples, and the sample it occurs at. */
export function peakRate(r: LineCheckResult, i: number): { value: number; sample: number } {
  let value = 0,
    sample = -1;
  r.samples.forEach((s, k) => {
    const v = Math.abs(s.jointRatesDegPerS?.[i] ?? 0);
    if (v > value) {
      value = v;
      sample = k;
    }
  });
  return { value, sample };
}
