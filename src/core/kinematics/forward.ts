import type { Chain } from "./chain";
import { mul4AtInto, mul4Into, rotationAxisAngleInto, translationInto, transformPointInto } from "../math/mat4";

/** Preallocated buffers for one chain. Made once per analysis; the hot kernels allocate nothing. */
export interface KinematicsScratch {
  /** Kinematic joint values, rad or m (n). */
  readonly qKin: Float64Array;
  /** Base-frame pose of each motion frame just after Mᵢ, 16n. Joint axis i passes through its origin. */
  readonly motionFrames: Float64Array;
  /** baseFromFlange, 16. */
  readonly flange: Float64Array;
  /** Work buffers. */
  readonly acc: Float64Array;
  readonly tmp: Float64Array;
  readonly step: Float64Array;
  /** Jacobian with respect to the kinematic joints, 6n (row-major 6 × n). */
  readonly jKin: Float64Array;
}

export function createScratch(chain: Chain): KinematicsScratch {
  const n = chain.jointCount;
  return {
    qKin: new Float64Array(n),
    motionFrames: new Float64Array(16 * n),
    flange: new Float64Array(16),
    acc: new Float64Array(16),
    tmp: new Float64Array(16),
    step: new Float64Array(16),
    jKin: new Float64Array(6 * n),
  };
}

/** Kinematic joint values from driven ones: q_kin = G · q_driven + offset. Writes scratch.qKin. */
export function kinematicJointsInto(out: Float64Array, chain: Chain, qDriven: ArrayLike<number>): Float64Array {
  const n = chain.jointCount, m = chain.drivenCount, g = chain.couplingGain;
  for (let i = 0; i < n; i++) {
    let v = chain.couplingOffset[i]!;
    for (let j = 0; j < m; j++) {
      const gij = g[i * m + j]!;
      if (gij !== 0) v += gij * qDriven[j]!;
    }
    out[i] = v;
  }
  return out;
}

/**
 * Forward kinematics: fills scratch.motionFrames (every joint's motion frame in the base frame) and
 * scratch.flange (baseFromFlange), metres. Allocates nothing.
 * @param qDriven driven joint values, rad (revolute) or m (prismatic)
 * @see Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, ch. 3 (forward kinematics by products of
 *   homogeneous transforms)
 * @example planar 2R with a1 = 0.4 m, a2 = 0.3 m at q = (0, π/2): flange at (0.4, 0.3, 0) m
 */
export function forwardInto(chain: Chain, qDriven: ArrayLike<number>, s: KinematicsScratch): Float64Array {
  const n = chain.jointCount;
  const q = kinematicJointsInto(s.qKin, chain, qDriven);
  const fixed = chain.fixed, axes = chain.axisLocal, frames = s.motionFrames;
  const acc = s.acc, step = s.step;
  for (let k = 0; k < 16; k++) acc[k] = fixed[k]!;
  for (let i = 0; i < n; i++) {
    const ax = axes[3 * i]!, ay = axes[3 * i + 1]!, az = axes[3 * i + 2]!, qi = q[i]!;
    const o = 16 * i;
    if (ax === 0 && ay === 0 && az === 1) {
      // Motion about/along local z (every DH joint): only columns 0, 1 (rotation) or 3 (translation) change.
      if (chain.isPrismatic[i]) {
        for (let r = 0; r < 3; r++) {
          frames[o + r * 4] = acc[r * 4]!;
          frames[o + r * 4 + 1] = acc[r * 4 + 1]!;
          frames[o + r * 4 + 2] = acc[r * 4 + 2]!;
          frames[o + r * 4 + 3] = acc[r * 4 + 3]! + qi * acc[r * 4 + 2]!;
        }
      } else {
        const c = Math.cos(qi), sn = Math.sin(qi);
        for (let r = 0; r < 3; r++) {
          const c0 = acc[r * 4]!, c1 = acc[r * 4 + 1]!;
          frames[o + r * 4] = c * c0 + sn * c1;
          frames[o + r * 4 + 1] = c * c1 - sn * c0;
          frames[o + r * 4 + 2] = acc[r * 4 + 2]!;
          frames[o + r * 4 + 3] = acc[r * 4 + 3]!;
        }
      }
      frames[o + 12] = 0;
      frames[o + 13] = 0;
      frames[o + 14] = 0;
      frames[o + 15] = 1;
    } else {
      if (chain.isPrismatic[i]) translationInto(step, ax * qi, ay * qi, az * qi);
      else rotationAxisAngleInto(step, ax, ay, az, qi);
      mul4AtInto(frames, o, acc, 0, step, 0);
    }
    mul4AtInto(acc, 0, frames, o, fixed, 16 * (i + 1));
  }
  s.flange.set(s.acc);
  return s.flange;
}

/** Base-frame pose of link frame i (after forwardInto): motionFrames[i] · linkFromMotion[i]. */
export function linkFrameInto(out: Float64Array, chain: Chain, s: KinematicsScratch, i: number): Float64Array {
  return mul4AtInto(out, 0, s.motionFrames, 16 * i, chain.linkFromMotion, 16 * i);
}

/** Writes the tool point p = baseFromFlange · pInFlangeM into out[0..2] (after forwardInto). */
export function toolPointInto(out: Float64Array, s: KinematicsScratch, xInFlangeM: number, yInFlangeM: number, zInFlangeM: number): Float64Array {
  return transformPointInto(out, 0, s.flange, xInFlangeM, yInFlangeM, zInFlangeM);
}

/** Writes the wrist centre point in the base frame into out[0..2] (after forwardInto). False when the arm has none. */
export function wristCentreInto(out: Float64Array, chain: Chain, s: KinematicsScratch): boolean {
  const w = chain.wrist;
  if (!w) return false;
  linkFrameInto(s.tmp, chain, s, w.joint);
  transformPointInto(out, 0, s.tmp, w.pointInLinkM[0]!, w.pointInLinkM[1]!, w.pointInLinkM[2]!);
  return true;
}

/**
 * Geometric Jacobian of the point (px, py, pz) (base frame, m) with respect to the driven joints, after forwardInto.
 * Writes `out` as 6 × m row-major; rows (vx, vy, vz, ωx, ωy, ωz) in the base frame; linear rows in m/s per rad/s
 * (or per m/s for prismatic joints), angular rows in rad/s per rad/s. Kinematic column i is [zᵢ × (p − oᵢ); zᵢ]
 * (revolute) or [zᵢ; 0] (prismatic); coupling is applied by the chain rule, J = J_kin · G.
 * @see Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, ch. 4 (the geometric Jacobian)
 * @example planar 2R (a1 = 0.4 m, a2 = 0.3 m) at q = (0, π/2), p = tip (0.4, 0.3, 0):
 *   column 0 = (−0.3, 0.4, 0, 0, 0, 1), column 1 = (−0.3, 0, 0, 0, 0, 1)
 */
export function jacobianInto(out: Float64Array, chain: Chain, s: KinematicsScratch, px: number, py: number, pz: number): Float64Array {
  const n = chain.jointCount, m = chain.drivenCount, jk = s.jKin, frames = s.motionFrames, axes = chain.axisLocal;
  for (let i = 0; i < n; i++) {
    const f = 16 * i;
    const ax = axes[3 * i]!, ay = axes[3 * i + 1]!, az = axes[3 * i + 2]!;
    const zx = frames[f]! * ax + frames[f + 1]! * ay + frames[f + 2]! * az;
    const zy = frames[f + 4]! * ax + frames[f + 5]! * ay + frames[f + 6]! * az;
    const zz = frames[f + 8]! * ax + frames[f + 9]! * ay + frames[f + 10]! * az;
    if (chain.isPrismatic[i]) {
      jk[i] = zx;
      jk[n + i] = zy;
      jk[2 * n + i] = zz;
      jk[3 * n + i] = 0;
      jk[4 * n + i] = 0;
      jk[5 * n + i] = 0;
    } else {
      const rx = px - frames[f + 3]!, ry = py - frames[f + 7]!, rz = pz - frames[f + 11]!;
      jk[i] = zy * rz - zz * ry;
      jk[n + i] = zz * rx - zx * rz;
      jk[2 * n + i] = zx * ry - zy * rx;
      jk[3 * n + i] = zx;
      jk[4 * n + i] = zy;
      jk[5 * n + i] = zz;
    }
  }
  const g = chain.couplingGain;
  out.fill(0, 0, 6 * m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < m; j++) {
      const gij = g[i * m + j]!;
      if (gij === 0) continue;
      for (let r = 0; r < 6; r++) out[r * m + j] = out[r * m + j]! + jk[r * n + i]! * gij;
    }
  }
  return out;
}
