/**
 * 3-vectors and 3×3 rotation matrices (row-major, element (r, c) at index r * 3 + c) for the closed-form inverse
 * kinematics. The `At` kernels read and write at offsets inside larger buffers and allocate nothing; the others
 * return new arrays and are meant for set-up code only.
 */

export type Vec3 = [number, number, number];

export const dot = (a: ArrayLike<number>, b: ArrayLike<number>) => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
export const cross = (a: ArrayLike<number>, b: ArrayLike<number>): Vec3 => [
  a[1]! * b[2]! - a[2]! * b[1]!,
  a[2]! * b[0]! - a[0]! * b[2]!,
  a[0]! * b[1]! - a[1]! * b[0]!,
];
export const norm = (a: ArrayLike<number>) => Math.hypot(a[0]!, a[1]!, a[2]!);
/** R·x for a row-major 3×3. */
export const mulRv = (r: ArrayLike<number>, x: ArrayLike<number>): Vec3 => [
  r[0]! * x[0]! + r[1]! * x[1]! + r[2]! * x[2]!,
  r[3]! * x[0]! + r[4]! * x[1]! + r[5]! * x[2]!,
  r[6]! * x[0]! + r[7]! * x[1]! + r[8]! * x[2]!,
];
/** Rᵀ·x. */
export const mulRtv = (r: ArrayLike<number>, x: ArrayLike<number>): Vec3 => [
  r[0]! * x[0]! + r[3]! * x[1]! + r[6]! * x[2]!,
  r[1]! * x[0]! + r[4]! * x[1]! + r[7]! * x[2]!,
  r[2]! * x[0]! + r[5]! * x[1]! + r[8]! * x[2]!,
];
export function mul3(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  const out = new Float64Array(9);
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++)
      out[i * 3 + j] = a[i * 3]! * b[j]! + a[i * 3 + 1]! * b[3 + j]! + a[i * 3 + 2]! * b[6 + j]!;
  return out;
}
export function transpose3(a: ArrayLike<number>): Float64Array {
  return Float64Array.from([a[0]!, a[3]!, a[6]!, a[1]!, a[4]!, a[7]!, a[2]!, a[5]!, a[8]!]);
}

/** Writes the rotation by `angle` about unit `a` (Rodrigues) into out[o..o+8]. */
export function rotInto(out: Float64Array, o: number, a: ArrayLike<number>, angle: number): void {
  rotCsInto(out, o, a, Math.cos(angle), Math.sin(angle));
}

/** rotInto from the angle's cosine c and sine s (callers that have them without trigonometry). */
export function rotCsInto(out: Float64Array, o: number, a: ArrayLike<number>, c: number, s: number): void {
  const v = 1 - c,
    x = a[0]!,
    y = a[1]!,
    z = a[2]!;
  out[o] = c + x * x * v;
  out[o + 1] = x * y * v - z * s;
  out[o + 2] = x * z * v + y * s;
  out[o + 3] = y * x * v + z * s;
  out[o + 4] = c + y * y * v;
  out[o + 5] = y * z * v - x * s;
  out[o + 6] = z * x * v - y * s;
  out[o + 7] = z * y * v + x * s;
  out[o + 8] = c + z * z * v;
}

/** In-place out[o..o+8] = A·B, with A at a[ao..] and B at b[bo..] (3×3 row-major); out must not alias A or B. */
export function mul3At(
  out: Float64Array,
  o: number,
  a: ArrayLike<number>,
  ao: number,
  b: ArrayLike<number>,
  bo: number,
): void {
  for (let i = 0; i < 3; i++) {
    const a0 = a[ao + i * 3]!,
      a1 = a[ao + i * 3 + 1]!,
      a2 = a[ao + i * 3 + 2]!;
    for (let j = 0; j < 3; j++) out[o + i * 3 + j] = a0 * b[bo + j]! + a1 * b[bo + 3 + j]! + a2 * b[bo + 6 + j]!;
  }
}

/** out[o..o+2] = R·x (R row-major 3×3 at r[ro..], x at x[xo..]). */
export function mulRvAt(
  out: Float64Array,
  o: number,
  r: ArrayLike<number>,
  ro: number,
  x: ArrayLike<number>,
  xo: number,
): void {
  const x0 = x[xo]!,
    x1 = x[xo + 1]!,
    x2 = x[xo + 2]!;
  out[o] = r[ro]! * x0 + r[ro + 1]! * x1 + r[ro + 2]! * x2;
  out[o + 1] = r[ro + 3]! * x0 + r[ro + 4]! * x1 + r[ro + 5]! * x2;
  out[o + 2] = r[ro + 6]! * x0 + r[ro + 7]! * x1 + r[ro + 8]! * x2;
}
/** out[o..o+2] = Rᵀ·x. */
export function mulRtvAt(
  out: Float64Array,
  o: number,
  r: ArrayLike<number>,
  ro: number,
  x: ArrayLike<number>,
  xo: number,
): void {
  const x0 = x[xo]!,
    x1 = x[xo + 1]!,
    x2 = x[xo + 2]!;
  out[o] = r[ro]! * x0 + r[ro + 3]! * x1 + r[ro + 6]! * x2;
  out[o + 1] = r[ro + 1]! * x0 + r[ro + 4]! * x1 + r[ro + 7]! * x2;
  out[o + 2] = r[ro + 2]! * x0 + r[ro + 5]! * x1 + r[ro + 8]! * x2;
}

/**
 * Paden–Kahan subproblem 1: the angle θ with Rot(ω, θ)·p = q (directions through the origin), from the components
 * perpendicular to ω; NaN when p has none (p ∥ ω).
 */
export function subproblem1(
  w: ArrayLike<number>,
  px: number,
  py: number,
  pz: number,
  qx: number,
  qy: number,
  qz: number,
  tiny: number,
): number {
  const wp = w[0]! * px + w[1]! * py + w[2]! * pz,
    wq = w[0]! * qx + w[1]! * qy + w[2]! * qz;
  const ax = px - wp * w[0]!,
    ay = py - wp * w[1]!,
    az = pz - wp * w[2]!;
  const bx = qx - wq * w[0]!,
    by = qy - wq * w[1]!,
    bz = qz - wq * w[2]!;
  if (ax * ax + ay * ay + az * az < tiny * tiny || bx * bx + by * by + bz * bz < tiny * tiny) return NaN;
  const cx = ay * bz - az * by,
    cy = az * bx - ax * bz,
    cz = ax * by - ay * bx;
  return Math.atan2(w[0]! * cx + w[1]! * cy + w[2]! * cz, ax * bx + ay * by + az * bz);
}
