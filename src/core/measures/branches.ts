/**
 * Names of inverse-kinematics branches (arm postures that put the tool at the same pose), from the geometry of
 * the pose itself, so the names mean the same thing on every arm:
 * - shoulder: "front" when the wrist centre (or flange) lies on the same side of axis 1 as at the arm's zero pose,
 *   "back" when the arm reaches over to the other side;
 * - elbow: "up" when the elbow (the origin of axis 3) lies above the line from the shoulder (axis 2) to the wrist
 *   centre, "down" below it; for arms whose first two axes are parallel (SCARA) "left"/"right" seen from above;
 * - wrist: the side of the middle wrist joint, from the sign of det[z₄ z₅ z₆] ("wrist +" / "wrist −").
 */
import type { Chain } from "../kinematics/chain";
import type { KinematicsScratch } from "../kinematics/forward";

export interface BranchFrame {
  /** Driven-joint kinematic indices used: axis 1, axis 2, axis 3, wrist axes. */
  readonly a1: number;
  readonly a2: number;
  readonly a3: number;
  readonly wrist: readonly number[];
  /** Sign of the shoulder quantity at the zero pose (+1 or −1). */
  readonly frontSign: number;
  /** "up" direction of the base frame (opposite gravity for the primary mounting). */
  readonly up: readonly [number, number, number];
  readonly scara: boolean;
}

function axisAt(s: KinematicsScratch, chain: Chain, k: number, out: number[]): void {
  const f = 16 * k,
    fr = s.motionFrames,
    a = chain.axisLocal;
  out[0] = fr[f]! * a[3 * k]! + fr[f + 1]! * a[3 * k + 1]! + fr[f + 2]! * a[3 * k + 2]!;
  out[1] = fr[f + 4]! * a[3 * k]! + fr[f + 5]! * a[3 * k + 1]! + fr[f + 6]! * a[3 * k + 2]!;
  out[2] = fr[f + 8]! * a[3 * k]! + fr[f + 9]! * a[3 * k + 1]! + fr[f + 10]! * a[3 * k + 2]!;
}

const z1 = [0, 0, 0],
  z2 = [0, 0, 0],
  z3 = [0, 0, 0];

/** Signed shoulder quantity (z₁ × z₂)·(c − o₁) for the current pose in `s`. */
function shoulderQuantity(
  chain: Chain,
  s: KinematicsScratch,
  f: Pick<BranchFrame, "a1" | "a2">,
  cx: number,
  cy: number,
  cz: number,
): number {
  axisAt(s, chain, f.a1, z1);
  axisAt(s, chain, f.a2, z2);
  const o = 16 * f.a1,
    fr = s.motionFrames;
  const nx = z1[1]! * z2[2]! - z1[2]! * z2[1]!,
    ny = z1[2]! * z2[0]! - z1[0]! * z2[2]!,
    nz = z1[0]! * z2[1]! - z1[1]! * z2[0]!;
  return nx * (cx - fr[o + 3]!) + ny * (cy - fr[o + 7]!) + nz * (cz - fr[o + 11]!);
}

/**
 * Prepares branch naming for a chain; `zeroPoseScratch` must hold forward kinematics at the zero pose and
 * (cx, cy, cz) the wrist centre (or flange) there.
 */
export function branchFrame(
  chain: Chain,
  zeroPoseScratch: KinematicsScratch,
  c: readonly number[],
  up: readonly [number, number, number],
): BranchFrame | null {
  const driven = Array.from(chain.drivenJoint);
  const revolute = driven.filter((k) => !chain.isPrismatic[k]);
  if (driven.length < 2 || chain.isPrismatic[driven[0]!] || revolute.length < 2) return null;
  const a1 = driven[0]!,
    a2 = revolute[1]!,
    a3 = revolute[2] ?? -1;
  axisAt(zeroPoseScratch, chain, a1, z1);
  axisAt(zeroPoseScratch, chain, a2, z2);
  const parallel = Math.abs(z1[0]! * z2[0]! + z1[1]! * z2[1]! + z1[2]! * z2[2]!) > 1 - 1e-9;
  const wrist = chain.wrist ? [...chain.wrist.axes] : chain.drivenCount >= 6 ? revolute.slice(-3) : [];
  const s0 = parallel ? 1 : shoulderQuantity(chain, zeroPoseScratch, { a1, a2 }, c[0]!, c[1]!, c[2]!);
  return { a1, a2, a3, wrist: wrist.length === 3 ? wrist : [], frontSign: s0 < 0 ? -1 : 1, up, scara: parallel };
}

/** Branch code (bit 0 shoulder back, bit 1 elbow down/right, bit 2 wrist −) of the pose in `s`; c = wrist centre or flange. */
export function branchCode(
  chain: Chain,
  s: KinematicsScratch,
  f: BranchFrame,
  cx: number,
  cy: number,
  cz: number,
): number {
  const fr = s.motionFrames;
  let code = 0;
  if (f.scara) {
    // Elbow left/right seen along axis 1: sign of z₁·((o₂ − o₁) × (c − o₂)).
    axisAt(s, chain, f.a1, z1);
    const o1 = 16 * f.a1,
      o2 = 16 * f.a2;
    const ux = fr[o2 + 3]! - fr[o1 + 3]!,
      uy = fr[o2 + 7]! - fr[o1 + 7]!,
      uz = fr[o2 + 11]! - fr[o1 + 11]!;
    const vx = cx - fr[o2 + 3]!,
      vy = cy - fr[o2 + 7]!,
      vz = cz - fr[o2 + 11]!;
    const side = z1[0]! * (uy * vz - uz * vy) + z1[1]! * (uz * vx - ux * vz) + z1[2]! * (ux * vy - uy * vx);
    if (side < 0) code |= 2;
    return code;
  }
  if (shoulderQuantity(chain, s, f, cx, cy, cz) * f.frontSign < 0) code |= 1;
  if (f.a3 >= 0) {
    const o2 = 16 * f.a2,
      o3 = 16 * f.a3;
    const nx = cx - fr[o2 + 3]!,
      ny = cy - fr[o2 + 7]!,
      nz = cz - fr[o2 + 11]!;
    const nn = Math.hypot(nx, ny, nz) || 1;
    const ex = fr[o3 + 3]! - fr[o2 + 3]!,
      ey = fr[o3 + 7]! - fr[o2 + 7]!,
      ez = fr[o3 + 11]! - fr[o2 + 11]!;
    const along = (ex * nx + ey * ny + ez * nz) / nn;
    const px = ex - (along * nx) / nn,
      py = ey - (along * ny) / nn,
      pz = ez - (along * nz) / nn;
    if (px * f.up[0] + py * f.up[1] + pz * f.up[2] < 0) code |= 2;
  }
  if (f.wrist.length === 3) {
    axisAt(s, chain, f.wrist[0]!, z1);
    axisAt(s, chain, f.wrist[1]!, z2);
    axisAt(s, chain, f.wrist[2]!, z3);
    const det =
      z1[0]! * (z2[1]! * z3[2]! - z2[2]! * z3[1]!) -
      z1[1]! * (z2[0]! * z3[2]! - z2[2]! * z3[0]!) +
      z1[2]! * (z2[0]! * z3[1]! - z2[1]! * z3[0]!);
    if (det < 0) code |= 4;
  }
  return code;
}

export function branchName(f: BranchFrame | null, code: number): string {
  if (!f) return "single";
  if (f.scara) return code & 2 ? "elbow right" : "elbow left";
  const parts = [code & 1 ? "back" : "front"];
  if (f.a3 >= 0) parts.push(code & 2 ? "elbow down" : "elbow up");
  if (f.wrist.length === 3) parts.push(code & 4 ? "wrist −" : "wrist +");
  return parts.join(", ");
}
