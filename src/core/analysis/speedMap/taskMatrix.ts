/** The square task Jacobian of the speed maps (det J, null motions), shared by verify.ts, refine.ts and labels.ts. */

/**
 * The square task Jacobian with linear rows divided by `lengthM` into `out` (m × m, row-major): the 6 × 6 J for six
 * driven joints; for four, the rows (vx, vy, vz, ω·z_tool) (the tool keeps its axis). False for other m.
 */
export function taskMatrixInto(
  out: Float64Array,
  j: ArrayLike<number>,
  m: number,
  lengthM: number,
  baseFromFlange: Float64Array,
): boolean {
  if (m === 6) {
    for (let i = 0; i < 18; i++) out[i] = j[i]! / lengthM;
    for (let i = 18; i < 36; i++) out[i] = j[i]!;
    return true;
  }
  if (m === 4) {
    for (let i = 0; i < 12; i++) out[i] = j[i]! / lengthM;
    const tx = baseFromFlange[2]!,
      ty = baseFromFlange[6]!,
      tz = baseFromFlange[10]!;
    for (let c = 0; c < 4; c++) out[12 + c] = j[12 + c]! * tx + j[16 + c]! * ty + j[20 + c]! * tz;
    return true;
  }
  return false;
}
