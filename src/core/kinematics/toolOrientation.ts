/**
 * Reference tool orientations: the rotation baseFromTool of a named reference orientation ("down", "outward") at a
 * point, and a rotation from roll, pitch, yaw. Used by the straight-line check (analysis/line) and its callers.
 * @see Modern Robotics §3.2.1 (rotation matrices: columns are the tool axes in the base frame) [from memory];
 *   URDF specification, <origin rpy> (fixed-axis roll, pitch, yaw)
 */
import type { Chain } from "./chain";
import { createScratch, forwardInto } from "./forward";
import { fromXyzRpyInto } from "../math/mat4";

/** The named reference orientations: tool z along gravity ("down") or pointing away from axis 1 ("outward"). */
export type ReferenceOrientation = "down" | "outward";

function normalise3(v: number[]): boolean {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  if (!(n > 1e-9)) return false;
  v[0] = v[0]! / n;
  v[1] = v[1]! / n;
  v[2] = v[2]! / n;
  return true;
}

/** v minus its component along the unit vector a. */
function reject3(v: readonly number[], a: readonly number[]): number[] {
  const d = v[0]! * a[0]! + v[1]! * a[1]! + v[2]! * a[2]!;
  return [v[0]! - d * a[0]!, v[1]! - d * a[1]!, v[2]! - d * a[2]!];
}

/** A unit vector perpendicular to the unit vector z: the base axis least aligned with it, made perpendicular. */
function anyPerpendicular(z: readonly number[]): number[] {
  const ax = Math.abs(z[0]!),
    ay = Math.abs(z[1]!),
    az = Math.abs(z[2]!);
  const e = ax <= ay && ax <= az ? [1, 0, 0] : ay <= az ? [0, 1, 0] : [0, 0, 1];
  const x = reject3(e, z);
  normalise3(x);
  return x;
}

/**
 * The one builder of the reference tool orientations: writes the rotation baseFromTool of "down" (tool z along
 * gravity, tool x towards `outward` made perpendicular to it) or "outward" (tool z along `outward`, tool x towards
 * gravity made perpendicular to it) into `out`, row-major with `rowStride` 3 (a 3×3) or 4 (the rotation block of a
 * 4×4 pose); y = z × x. Where the two directions are parallel, x is the base axis least aligned with z, made
 * perpendicular. Allocates nothing: the speed maps call it for every cell.
 * @param outward unit direction pointing away from axis 1 (base frame)
 * @param gravity unit gravity direction (base frame)
 * @example referenceAxesInto(new Float64Array(9), "down", [1, 0, 0], [0, 0, -1], 3)
 *   // rows (1, 0, 0), (0, −1, 0), (0, 0, −1): tool z down, tool x along base x
 */
export function referenceAxesInto(
  out: Float64Array,
  name: ReferenceOrientation,
  outward: ArrayLike<number>,
  gravity: ArrayLike<number>,
  rowStride: 3 | 4,
): Float64Array {
  const down = name === "down";
  // z: the tool axis; t: the direction tool x leans towards.
  const zx = down ? gravity[0]! : outward[0]!,
    zy = down ? gravity[1]! : outward[1]!,
    zz = down ? gravity[2]! : outward[2]!;
  const tx = down ? outward[0]! : gravity[0]!,
    ty = down ? outward[1]! : gravity[1]!,
    tz = down ? outward[2]! : gravity[2]!;
  const d = tx * zx + ty * zy + tz * zz;
  let xx = tx - d * zx,
    xy = ty - d * zy,
    xz = tz - d * zz;
  let n = Math.hypot(xx, xy, xz);
  if (!(n > 1e-9)) {
    // Parallel: the base axis least aligned with z, made perpendicular to it.
    const ax = Math.abs(zx),
      ay = Math.abs(zy),
      az = Math.abs(zz);
    const ex = ax <= ay && ax <= az ? 1 : 0,
      ey = ex === 0 && ay <= az ? 1 : 0,
      ez = ex === 0 && ey === 0 ? 1 : 0;
    const e = ex * zx + ey * zy + ez * zz;
    xx = ex - e * zx;
    xy = ey - e * zy;
    xz = ez - e * zz;
    n = Math.hypot(xx, xy, xz);
  }
  xx /= n;
  xy /= n;
  xz /= n;
  const r = rowStride;
  out[0] = xx;
  out[1] = zy * xz - zz * xy;
  out[2] = zx;
  out[r] = xy;
  out[r + 1] = zz * xx - zx * xz;
  out[r + 2] = zy;
  out[2 * r] = xz;
  out[2 * r + 1] = zx * xy - zy * xx;
  out[2 * r + 2] = zz;
  return out;
}

/**
 * Unit vector from axis 1 towards `pointM`, perpendicular to axis 1 (axis 1 as at the zero pose). Falls back to
 * base x made perpendicular to axis 1 when the point is on the axis; for an arm whose first joint is prismatic
 * (gantry), base x made perpendicular to `up`.
 */
export function outwardDirection(chain: Chain, pointM: ArrayLike<number>, up: readonly number[]): number[] {
  const k = chain.drivenJoint[0]!;
  if (chain.isPrismatic[k]) {
    const x = reject3([1, 0, 0], up);
    return normalise3(x) ? x : anyPerpendicular(up);
  }
  const s = createScratch(chain);
  forwardInto(chain, new Float64Array(chain.drivenCount), s);
  const f = 16 * k,
    fr = s.motionFrames,
    a = chain.axisLocal;
  const z = [
    fr[f]! * a[3 * k]! + fr[f + 1]! * a[3 * k + 1]! + fr[f + 2]! * a[3 * k + 2]!,
    fr[f + 4]! * a[3 * k]! + fr[f + 5]! * a[3 * k + 1]! + fr[f + 6]! * a[3 * k + 2]!,
    fr[f + 8]! * a[3 * k]! + fr[f + 9]! * a[3 * k + 1]! + fr[f + 10]! * a[3 * k + 2]!,
  ];
  const r = reject3([pointM[0]! - fr[f + 3]!, pointM[1]! - fr[f + 7]!, pointM[2]! - fr[f + 11]!], z);
  if (normalise3(r)) return r;
  const x = reject3([1, 0, 0], z);
  return normalise3(x) ? x : anyPerpendicular(z);
}

/**
 * Rotation baseFromTool (row-major 3×3) of a named reference orientation at `pointM` (the line's start), as the
 * speed maps define them (speedMap.ts): "down" = tool z along gravity, tool x pointing away from axis 1;
 * "outward" = tool z pointing away from axis 1 (perpendicular to it), tool x as close to gravity as possible.
 * @param gravity unit gravity direction in the base frame (mounting.ts gravityDirectionInBase)
 * @example referenceToolRotation(chain, "down", [1, 0, 0.5], [0, 0, -1]) // floor arm with axis 1 along z:
 *   rows (1, 0, 0), (0, −1, 0), (0, 0, −1)
 */
export function referenceToolRotation(
  chain: Chain,
  name: ReferenceOrientation,
  pointM: ArrayLike<number>,
  gravity: readonly number[],
): Float64Array {
  if (name !== "down" && name !== "outward") throw new RangeError(`invalid orientation: ${String(name)}`);
  const g = [gravity[0]!, gravity[1]!, gravity[2]!];
  if (!normalise3(g)) throw new RangeError(`invalid gravity: ${Array.from(gravity).join(",")}`);
  const up = [-g[0]!, -g[1]!, -g[2]!];
  return referenceAxesInto(new Float64Array(9), name, outwardDirection(chain, pointM, up), g, 3);
}

/**
 * Rotation baseFromTool (row-major 3×3) from roll, pitch, yaw as URDF defines them: R = Rz(yaw)·Ry(pitch)·Rx(roll),
 * fixed axes.
 * @example rpyToolRotation(Math.PI, 0, 0) // tool z pointing down: rows (1, 0, 0), (0, −1, 0), (0, 0, −1)
 */
export function rpyToolRotation(rollRad: number, pitchRad: number, yawRad: number): Float64Array {
  if (![rollRad, pitchRad, yawRad].every(Number.isFinite))
    throw new RangeError(`invalid rpy: ${rollRad},${pitchRad},${yawRad}`);
  const t = fromXyzRpyInto(new Float64Array(16), 0, 0, 0, rollRad, pitchRad, yawRad);
  return Float64Array.from([t[0]!, t[1]!, t[2]!, t[4]!, t[5]!, t[6]!, t[8]!, t[9]!, t[10]!]);
}
