/**
 * Unit conversions. The only place conversion factors live: files use mm, deg, deg/s, kg, N·m;
 * the core computes in SI (m, rad, s, kg, N·m) and converts once, at the edge.
 */

/** Standard gravity, m/s² (3rd CGPM 1901; BIPM SI Brochure). */
export const STANDARD_GRAVITY_M_PER_S2 = 9.80665;

const DEG_PER_RAD = 180 / Math.PI;
const RAD_PER_DEG = Math.PI / 180;

/** @example degToRad(180) // Math.PI */
export function degToRad(deg: number): number {
  return deg * RAD_PER_DEG;
}

/** @example radToDeg(Math.PI / 2) // 90 */
export function radToDeg(rad: number): number {
  return rad * DEG_PER_RAD;
}

/** @example mmToM(1500) // 1.5 */
export function mmToM(mm: number): number {
  return mm / 1000;
}

/** @example mToMm(0.25) // 250 */
export function mToMm(m: number): number {
  return m * 1000;
}
