import type { Chain } from "./chain";
import { mul4AtInto, translationInto, transformPointInto } from "../math/mat4";

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
  /** The non-zero entries of G by row (kinematic joint i: entries rowStart[i] … rowStart[i + 1] − 1, driven columns ascending). */
  readonly rowStart: Int32Array;
  readonly rowDriven: Int32Array;
  readonly rowGain: Float64Array;
  /** The non-zero entries of G by column (driven joint j: entries colStart[j] … colStart[j + 1] − 1, kinematic rows ascending). */
  readonly colStart: Int32Array;
  readonly colJoint: Int32Array;
  readonly colGain: Float64Array;
  /** G is the identity (every joint driven, no coupling): the Jacobian columns are the kinematic ones. */
  readonly uncoupled: boolean;
}

export function createScratch(chain: Chain): KinematicsScratch {
  const n = chain.jointCount,
    m = chain.drivenCount,
    g = chain.couplingGain;
  // G is sparse (mostly one 1 per row): its non-zero entries, listed in the order the dense loops visit them, so the
  // sums below add the same terms in the same order.
  let nonZero = 0;
  for (let i = 0; i < n * m; i++) if (g[i] !== 0) nonZero++;
  const rowStart = new Int32Array(n + 1),
    rowDriven = new Int32Array(nonZero),
    rowGain = new Float64Array(nonZero);
  const colStart = new Int32Array(m + 1),
    colJoint = new Int32Array(nonZero),
    colGain = new Float64Array(nonZero);
  let p = 0;
  for (let i = 0; i < n; i++) {
    rowStart[i] = p;
    for (let j = 0; j < m; j++) {
      if (g[i * m + j] === 0) continue;
      rowDriven[p] = j;
      rowGain[p++] = g[i * m + j]!;
    }
  }
  rowStart[n] = p;
  p = 0;
  for (let j = 0; j < m; j++) {
    colStart[j] = p;
    for (let i = 0; i < n; i++) {
      if (g[i * m + j] === 0) continue;
      colJoint[p] = i;
      colGain[p++] = g[i * m + j]!;
    }
  }
  colStart[m] = p;
  let uncoupled = n === m;
  for (let i = 0; i < n && uncoupled; i++)
    for (let j = 0; j < m; j++) if (g[i * m + j] !== (i === j ? 1 : 0)) uncoupled = false;
  return {
    qKin: new Float64Array(n),
    motionFrames: new Float64Array(16 * n),
    flange: new Float64Array(16),
    acc: new Float64Array(16),
    tmp: new Float64Array(16),
    step: new Float64Array(16),
    jKin: new Float64Array(6 * n),
    rowStart,
    rowDriven,
    rowGain,
    colStart,
    colJoint,
    colGain,
    uncoupled,
  };
}

/** Kinematic joint values from driven ones: q_kin = G · q_driven + offset. Writes scratch.qKin. */
export function kinematicJointsInto(out: Float64Array, chain: Chain, qDriven: ArrayLike<number>): Float64Array {
  const n = chain.jointCount,
    m = chain.drivenCount,
    g = chain.couplingGain;
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
  // q_kin = G · q_driven + offset over the non-zero entries of G (kinematicJointsInto, term for term).
  const q = s.qKin,
    offset = chain.couplingOffset,
    rowStart = s.rowStart,
    rowDriven = s.rowDriven,
    rowGain = s.rowGain;
  for (let i = 0; i < n; i++) {
    let v = offset[i]!;
    for (let p = rowStart[i]!, end = rowStart[i + 1]!; p < end; p++) v += rowGain[p]! * qDriven[rowDriven[p]!]!;
    q[i] = v;
  }
  const fixed = chain.fixed,
    axes = chain.axisLocal,
    frames = s.motionFrames;
  const acc = s.acc,
    step = s.step;
  for (let k = 0; k < 16; k++) acc[k] = fixed[k]!;
  for (let i = 0; i < n; i++) {
    const ax = axes[3 * i]!,
      ay = axes[3 * i + 1]!,
      az = axes[3 * i + 2]!,
      qi = q[i]!;
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
        const c = Math.cos(qi),
          sn = Math.sin(qi);
        for (let r = 0; r < 3; r++) {
          const c0 = acc[r * 4]!,
            c1 = acc[r * 4 + 1]!;
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
    } else if (chain.isPrismatic[i]) {
      translationInto(step, ax * qi, ay * qi, az * qi);
      mul4AtInto(frames, o, acc, 0, step, 0);
    } else {
      // acc · R(axis, qi): rotationAxisAngleInto then mul4AtInto, term for term, without the step matrix.
      const c = Math.cos(qi),
        sn = Math.sin(qi),
        t = 1 - c;
      const r00 = t * ax * ax + c,
        r01 = t * ax * ay - sn * az,
        r02 = t * ax * az + sn * ay;
      const r10 = t * ax * ay + sn * az,
        r11 = t * ay * ay + c,
        r12 = t * ay * az - sn * ax;
      const r20 = t * ax * az - sn * ay,
        r21 = t * ay * az + sn * ax,
        r22 = t * az * az + c;
      for (let r = 0; r < 3; r++) {
        const a0 = acc[r * 4]!,
          a1 = acc[r * 4 + 1]!,
          a2 = acc[r * 4 + 2]!,
          a3 = acc[r * 4 + 3]!;
        const k = o + r * 4;
        frames[k] = a0 * r00 + a1 * r10 + a2 * r20;
        frames[k + 1] = a0 * r01 + a1 * r11 + a2 * r21;
        frames[k + 2] = a0 * r02 + a1 * r12 + a2 * r22;
        frames[k + 3] = a0 * 0 + a1 * 0 + a2 * 0 + a3;
      }
      frames[o + 12] = 0;
      frames[o + 13] = 0;
      frames[o + 14] = 0;
      frames[o + 15] = 1;
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
export function toolPointInto(
  out: Float64Array,
  s: KinematicsScratch,
  xInFlangeM: number,
  yInFlangeM: number,
  zInFlangeM: number,
): Float64Array {
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
export function jacobianInto(
  out: Float64Array,
  chain: Chain,
  s: KinematicsScratch,
  px: number,
  py: number,
  pz: number,
): Float64Array {
  const n = chain.jointCount,
    m = chain.drivenCount,
    frames = s.motionFrames,
    axes = chain.axisLocal;
  const jk = s.jKin;
  // Without coupling J = J_kin, written into `out` beside J_kin. `+ 0` keeps what the chain rule below gives
  // (0 + x·1, which turns −0 into +0), so both paths agree to the bit.
  const direct = s.uncoupled;
  for (let i = 0; i < n; i++) {
    const f = 16 * i;
    const ax = axes[3 * i]!,
      ay = axes[3 * i + 1]!,
      az = axes[3 * i + 2]!;
    const zx = frames[f]! * ax + frames[f + 1]! * ay + frames[f + 2]! * az;
    const zy = frames[f + 4]! * ax + frames[f + 5]! * ay + frames[f + 6]! * az;
    const zz = frames[f + 8]! * ax + frames[f + 9]! * ay + frames[f + 10]! * az;
    let v0: number, v1: number, v2: number, w0: number, w1: number, w2: number;
    if (chain.isPrismatic[i]) {
      v0 = zx;
      v1 = zy;
      v2 = zz;
      w0 = 0;
      w1 = 0;
      w2 = 0;
    } else {
      const rx = px - frames[f + 3]!,
        ry = py - frames[f + 7]!,
        rz = pz - frames[f + 11]!;
      v0 = zy * rz - zz * ry;
      v1 = zz * rx - zx * rz;
      v2 = zx * ry - zy * rx;
      w0 = zx;
      w1 = zy;
      w2 = zz;
    }
    jk[i] = v0;
    jk[n + i] = v1;
    jk[2 * n + i] = v2;
    jk[3 * n + i] = w0;
    jk[4 * n + i] = w1;
    jk[5 * n + i] = w2;
    if (direct) {
      out[i] = v0 + 0;
      out[n + i] = v1 + 0;
      out[2 * n + i] = v2 + 0;
      out[3 * n + i] = w0 + 0;
      out[4 * n + i] = w1 + 0;
      out[5 * n + i] = w2 + 0;
    }
  }
  if (direct) return out;
  // J = J_kin · G over the non-zero entries of G, kinematic rows ascending per column.
  const colStart = s.colStart,
    colJoint = s.colJoint,
    colGain = s.colGain;
  for (let j = 0; j < m; j++) {
    const start = colStart[j]!,
      end = colStart[j + 1]!;
    for (let r = 0; r < 6; r++) {
      let v = 0;
      for (let p = start; p < end; p++) v = v + jk[r * n + colJoint[p]!]! * colGain[p]!;
      out[r * m + j] = v;
    }
  }
  return out;
}
