/**
 * 4×4 homogeneous transforms as row-major Float64Array(16): element (r, c) at index r * 4 + c.
 * Kernels ending in `Into` write into `out`, return it, and allocate nothing.
 * Naming: `aFromB` maps coordinates in frame b into frame a, so products read right to left.
 */

export function mat4(): Float64Array {
  return identity4Into(new Float64Array(16));
}

export function identity4Into(out: Float64Array): Float64Array {
  out.fill(0);
  out[0] = 1;
  out[5] = 1;
  out[10] = 1;
  out[15] = 1;
  return out;
}

/** out = a · b. `out` may alias neither a nor b. */
export function mul4Into(out: Float64Array, a: Float64Array, b: Float64Array): Float64Array {
  for (let r = 0; r < 3; r++) {
    const a0 = a[r * 4]!,
      a1 = a[r * 4 + 1]!,
      a2 = a[r * 4 + 2]!,
      a3 = a[r * 4 + 3]!;
    out[r * 4] = a0 * b[0]! + a1 * b[4]! + a2 * b[8]!;
    out[r * 4 + 1] = a0 * b[1]! + a1 * b[5]! + a2 * b[9]!;
    out[r * 4 + 2] = a0 * b[2]! + a1 * b[6]! + a2 * b[10]!;
    out[r * 4 + 3] = a0 * b[3]! + a1 * b[7]! + a2 * b[11]! + a3;
  }
  out[12] = 0;
  out[13] = 0;
  out[14] = 0;
  out[15] = 1;
  return out;
}

/** Rotation by `angleRad` about the unit axis (x, y, z) through the origin (Rodrigues' formula). */
export function rotationAxisAngleInto(
  out: Float64Array,
  x: number,
  y: number,
  z: number,
  angleRad: number,
): Float64Array {
  const c = Math.cos(angleRad),
    s = Math.sin(angleRad),
    t = 1 - c;
  out[0] = t * x * x + c;
  out[1] = t * x * y - s * z;
  out[2] = t * x * z + s * y;
  out[3] = 0;
  out[4] = t * x * y + s * z;
  out[5] = t * y * y + c;
  out[6] = t * y * z - s * x;
  out[7] = 0;
  out[8] = t * x * z - s * y;
  out[9] = t * y * z + s * x;
  out[10] = t * z * z + c;
  out[11] = 0;
  out[12] = 0;
  out[13] = 0;
  out[14] = 0;
  out[15] = 1;
  return out;
}

/** Pure translation by (x, y, z) along the unit axis scaled by `distance`. */
export function translationInto(out: Float64Array, x: number, y: number, z: number): Float64Array {
  identity4Into(out);
  out[3] = x;
  out[7] = y;
  out[11] = z;
  return out;
}

/**
 * Pose from a translation and roll-pitch-yaw angles as URDF defines them:
 * R = Rz(yaw)·Ry(pitch)·Rx(roll) about fixed axes.
 */
export function fromXyzRpyInto(
  out: Float64Array,
  x: number,
  y: number,
  z: number,
  rollRad: number,
  pitchRad: number,
  yawRad: number,
): Float64Array {
  const cr = Math.cos(rollRad),
    sr = Math.sin(rollRad);
  const cp = Math.cos(pitchRad),
    sp = Math.sin(pitchRad);
  const cy = Math.cos(yawRad),
    sy = Math.sin(yawRad);
  out[0] = cy * cp;
  out[1] = cy * sp * sr - sy * cr;
  out[2] = cy * sp * cr + sy * sr;
  out[3] = x;
  out[4] = sy * cp;
  out[5] = sy * sp * sr + cy * cr;
  out[6] = sy * sp * cr - cy * sr;
  out[7] = y;
  out[8] = -sp;
  out[9] = cp * sr;
  out[10] = cp * cr;
  out[11] = z;
  out[12] = 0;
  out[13] = 0;
  out[14] = 0;
  out[15] = 1;
  return out;
}

/**
 * Roll-pitch-yaw (URDF, R = Rz(yaw)·Ry(pitch)·Rx(roll)) of the rotation block of `t`, in rad, written into out[0..2].
 * At pitch = ±90° (gimbal lock) roll is set to 0 and yaw carries the whole rotation about z.
 */
export function rpyOfInto(out: Float64Array | number[], t: Float64Array): Float64Array | number[] {
  const r20 = t[8]!;
  if (Math.abs(r20) < 1 - 1e-12) {
    out[0] = Math.atan2(t[9]!, t[10]!);
    out[1] = Math.asin(-r20);
    out[2] = Math.atan2(t[4]!, t[0]!);
  } else {
    out[0] = 0;
    out[1] = r20 < 0 ? Math.PI / 2 : -Math.PI / 2;
    out[2] = Math.atan2(-t[1]!, t[5]!);
  }
  return out;
}

/** Inverse of a rigid transform: [Rᵀ, −Rᵀp]. */
export function invertRigidInto(out: Float64Array, t: Float64Array): Float64Array {
  const px = t[3]!,
    py = t[7]!,
    pz = t[11]!;
  for (let r = 0; r < 3; r++) {
    for (let c = 0; c < 3; c++) out[r * 4 + c] = t[c * 4 + r]!;
  }
  out[3] = -(out[0]! * px + out[1]! * py + out[2]! * pz);
  out[7] = -(out[4]! * px + out[5]! * py + out[6]! * pz);
  out[11] = -(out[8]! * px + out[9]! * py + out[10]! * pz);
  out[12] = 0;
  out[13] = 0;
  out[14] = 0;
  out[15] = 1;
  return out;
}

/** Writes t · (x, y, z, 1) into out[offset..offset+2]. */
export function transformPointInto(
  out: Float64Array,
  offset: number,
  t: Float64Array,
  x: number,
  y: number,
  z: number,
): Float64Array {
  out[offset] = t[0]! * x + t[1]! * y + t[2]! * z + t[3]!;
  out[offset + 1] = t[4]! * x + t[5]! * y + t[6]! * z + t[7]!;
  out[offset + 2] = t[8]! * x + t[9]! * y + t[10]! * z + t[11]!;
  return out;
}

/**
 * out[o..o+15] = a[ao..ao+15] · b[bo..bo+15] for rigid transforms (bottom row 0 0 0 1), with offsets so callers
 * can address matrices packed in one array without creating views. `out` must not overlap the inputs' ranges.
 */
export function mul4AtInto(
  out: Float64Array,
  o: number,
  a: Float64Array,
  ao: number,
  b: Float64Array,
  bo: number,
): Float64Array {
  const b0 = b[bo]!,
    b1 = b[bo + 1]!,
    b2 = b[bo + 2]!,
    b3 = b[bo + 3]!;
  const b4 = b[bo + 4]!,
    b5 = b[bo + 5]!,
    b6 = b[bo + 6]!,
    b7 = b[bo + 7]!;
  const b8 = b[bo + 8]!,
    b9 = b[bo + 9]!,
    b10 = b[bo + 10]!,
    b11 = b[bo + 11]!;
  for (let r = 0; r < 3; r++) {
    const i = ao + r * 4;
    const a0 = a[i]!,
      a1 = a[i + 1]!,
      a2 = a[i + 2]!,
      a3 = a[i + 3]!;
    const k = o + r * 4;
    out[k] = a0 * b0 + a1 * b4 + a2 * b8;
    out[k + 1] = a0 * b1 + a1 * b5 + a2 * b9;
    out[k + 2] = a0 * b2 + a1 * b6 + a2 * b10;
    out[k + 3] = a0 * b3 + a1 * b7 + a2 * b11 + a3;
  }
  out[o + 12] = 0;
  out[o + 13] = 0;
  out[o + 14] = 0;
  out[o + 15] = 1;
  return out;
}
