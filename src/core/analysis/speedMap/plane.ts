/**
 * Grid and plane setup of the speed maps: the side-view plane through axis 1, its bounds from sampled poses, the
 * grid over it, and the target flange pose of a cell.
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto } from "../../kinematics/forward";
import { mulberry32 } from "../../math/random";
import type { Grid2 } from "../../geometry/grid";
import { referenceAxesInto, type ReferenceOrientation } from "../../kinematics/toolOrientation";

/** The plane: origin on axis 1, radial and up unit vectors in the base frame. */
export interface Plane {
  readonly o: readonly number[];
  readonly radial: readonly number[];
  readonly up: readonly number[];
}

export function sidePlane(chain: Chain, gravity: readonly number[]): Plane {
  const s = createScratch(chain);
  forwardInto(chain, new Float64Array(chain.drivenCount), s);
  const k = chain.drivenJoint[0]!;
  if (!chain.isPrismatic[k]) {
    const f = 16 * k,
      fr = s.motionFrames,
      a = chain.axisLocal;
    let zx = fr[f]! * a[3 * k]! + fr[f + 1]! * a[3 * k + 1]! + fr[f + 2]! * a[3 * k + 2]!;
    let zy = fr[f + 4]! * a[3 * k]! + fr[f + 5]! * a[3 * k + 1]! + fr[f + 6]! * a[3 * k + 2]!;
    let zz = fr[f + 8]! * a[3 * k]! + fr[f + 9]! * a[3 * k + 1]! + fr[f + 10]! * a[3 * k + 2]!;
    // Axis 1 oriented along base +z (or +x if horizontal), so "height" grows upward on a floor arm.
    const sign = Math.abs(zz) > 1e-9 ? Math.sign(zz) : Math.sign(zx) || 1;
    zx *= sign;
    zy *= sign;
    zz *= sign;
    // Radial: base x made perpendicular to axis 1 (or base y when x is along the axis).
    let rx = 1 - zx * zx,
      ry = -zx * zy,
      rz = -zx * zz;
    if (Math.hypot(rx, ry, rz) < 1e-6) {
      rx = -zy * zx;
      ry = 1 - zy * zy;
      rz = -zy * zz;
    }
    const rn = Math.hypot(rx, ry, rz);
    const ox = fr[f + 3]!,
      oy = fr[f + 7]!,
      oz = fr[f + 11]!;
    // Point of axis 1 nearest the base origin.
    const t = -(ox * zx + oy * zy + oz * zz);
    return { o: [ox + t * zx, oy + t * zy, oz + t * zz], radial: [rx / rn, ry / rn, rz / rn], up: [zx, zy, zz] };
  }
  // First axis prismatic (gantry): the base x–z plane.
  return { o: [0, 0, 0], radial: [1, 0, 0], up: [0, 0, 1] };
}

/** Rough plane bounds (mm) from seeded random poses within the joint limits, with a margin. */
export function sampledBounds(chain: Chain, plane: Plane, seed: number): { rMax: number; zMin: number; zMax: number } {
  const rnd = mulberry32(seed);
  const s = createScratch(chain),
    q = new Float64Array(chain.drivenCount);
  let rMax = 0,
    zMin = Infinity,
    zMax = -Infinity;
  for (let n = 0; n < 6000; n++) {
    for (let i = 0; i < q.length; i++) {
      const lo = Math.max(chain.lowerSi[i]!, -Math.PI),
        hi = Math.min(chain.upperSi[i]!, Math.PI);
      q[i] = lo + (hi - lo) * rnd();
    }
    const t = forwardInto(chain, q, s);
    const dx = t[3]! - plane.o[0]!,
      dy = t[7]! - plane.o[1]!,
      dz = t[11]! - plane.o[2]!;
    const h = dx * plane.up[0]! + dy * plane.up[1]! + dz * plane.up[2]!;
    const r = Math.hypot(dx - h * plane.up[0]!, dy - h * plane.up[1]!, dz - h * plane.up[2]!);
    const z = t[3]! * plane.up[0]! + t[7]! * plane.up[1]! + t[11]! * plane.up[2]!;
    rMax = Math.max(rMax, r);
    zMin = Math.min(zMin, z);
    zMax = Math.max(zMax, z);
  }
  const margin = 0.06 * Math.max(rMax, zMax - zMin);
  return { rMax: (rMax + margin) * 1000, zMin: (zMin - margin) * 1000, zMax: (zMax + margin) * 1000 };
}

/**
 * Target flange pose (row-major 4×4, m) for a cell. "Outward" is +radial·outwardSign, the same for every cell: at
 * r < 0 (the columns behind axis 1) it points towards axis 1, not away from it, so the targets are continuous
 * across the axis (a line through axis 1 at one orientation); the methods page says so.
 */
export function targetInto(
  out: Float64Array,
  plane: Plane,
  rM: number,
  zM: number,
  orientation: ReferenceOrientation,
  gravity: readonly number[],
  outwardSign: number,
): Float64Array {
  const rad = plane.radial;
  const outward = outwardSign === 1 ? rad : [rad[0]! * outwardSign, rad[1]! * outwardSign, rad[2]! * outwardSign];
  referenceAxesInto(out, orientation, outward, gravity, 4);
  out[12] = 0;
  out[13] = 0;
  out[14] = 0;
  out[15] = 1;
  return targetPositionInto(out, plane, rM, zM);
}

/** The position column of a cell's target (out[3], out[7], out[11]): axis-1 point + r·radial, then the height
 * measured along `up` from the base origin. Every cell of a map has the same orientation; only this changes. */
export function targetPositionInto(out: Float64Array, plane: Plane, rM: number, zM: number): Float64Array {
  const up = plane.up,
    rad = plane.radial;
  const px0 = plane.o[0]! + rM * rad[0]!,
    py0 = plane.o[1]! + rM * rad[1]!,
    pz0 = plane.o[2]! + rM * rad[2]!;
  const h0 = px0 * up[0]! + py0 * up[1]! + pz0 * up[2]!;
  out[3] = px0 + (zM - h0) * up[0]!;
  out[7] = py0 + (zM - h0) * up[1]!;
  out[11] = pz0 + (zM - h0) * up[2]!;
  return out;
}

/** The map grid over the plane bounds (mm) at `stepMm`. */
export function mapGrid(bounds: { rMax: number; zMin: number; zMax: number }, step: number): Grid2 {
  if (!(step > 0)) throw new RangeError(`invalid stepMm: ${step}`);
  const zMinMm = Math.floor(bounds.zMin / step) * step;
  // Two columns behind axis 1 so a locus on the axis (shoulder singularity) is crossed, not touched.
  const rMinMm = -2 * step;
  const nx = Math.max(1, Math.ceil((bounds.rMax - rMinMm) / step) + 1);
  const ny = Math.max(1, Math.ceil((bounds.zMax - zMinMm) / step) + 1);
  return { nx, ny, rMinMm, zMinMm, stepMm: step };
}
