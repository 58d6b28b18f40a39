/**
 * The capability map's grid and targets. Nodes sit at whole multiples of the grid spacing in the side view of the
 * speed maps and the envelope: r = distance from axis 1 (0, g, 2g, … past the flange reach), z = height along
 * axis 1. Values belong to the nodes (each stands for the g × g square centred on it), as on the speed maps.
 * A node is solved at azimuth 0 of the speed maps' plane (speedMap/plane.ts), joint 1 free within its range; it is
 * inside the envelope when the flange side view (drawn at joint 1 = 0, r signed) holds (r, z) or (−r, z), i.e.
 * when the flange reaches that distance and height in front of axis 1 or over its back.
 */
import { targetPositionInto, type Plane } from "../speedMap/plane";
import type { CapabilityEnvelope } from "./types";

export interface CapabilityNodes {
  readonly gridMm: number;
  readonly rMm: readonly number[];
  readonly zMm: readonly number[];
  /** 1 where the node is inside the flange envelope, row-major (rows follow zMm). */
  readonly inside: Uint8Array;
  /** Base-frame target position per node, m (3 per node; NaN outside). */
  readonly positionsM: Float64Array;
}

/** The node grid over the flange envelope and each inside node's target position in the base frame (`plane`: sidePlane). */
export function capabilityNodes(plane: Plane, envelope: CapabilityEnvelope, gridMm: number): CapabilityNodes {
  if (!(gridMm > 0)) throw new RangeError(`invalid gridMm: ${gridMm}`);
  const nx = Math.max(1, Math.ceil(envelope.maxReachMm / gridMm) + 1);
  const z0 = Math.floor(envelope.minHeightMm / gridMm),
    z1 = Math.ceil(envelope.maxHeightMm / gridMm);
  const rMm = Array.from({ length: nx }, (_, i) => i * gridMm);
  const zMm = Array.from({ length: Math.max(1, z1 - z0 + 1) }, (_, j) => (z0 + j) * gridMm);
  const inside = new Uint8Array(nx * zMm.length);
  const positionsM = new Float64Array(3 * inside.length).fill(NaN);
  const t = new Float64Array(16);
  for (let iy = 0; iy < zMm.length; iy++) {
    const z = zMm[iy]!;
    const rows = envelope.side.map((p) => ({ outer: crossingsAt(z, [p.outer]), holes: crossingsAt(z, p.holes) }));
    const within = (r: number) => rows.some((p) => rightOf(p.outer, r) % 2 === 1 && rightOf(p.holes, r) % 2 === 0);
    for (let ix = 0; ix < nx; ix++) {
      const r = rMm[ix]!;
      if (!within(r) && !within(-r)) continue;
      const node = ix + iy * nx;
      inside[node] = 1;
      targetPositionInto(t, plane, r / 1000, z / 1000);
      positionsM[3 * node] = t[3]!;
      positionsM[3 * node + 1] = t[7]!;
      positionsM[3 * node + 2] = t[11]!;
    }
  }
  return { gridMm, rMm, zMm, inside, positionsM };
}

/**
 * The horizontal positions where closed rings cross the line at height y, by the rule of the even–odd test
 * (geometry/polygon.ts pointInRing: an edge counts when its ends lie on either side of y, one strictly above).
 * A point (x, y) is inside a ring exactly when an odd number of them lie to its right (rightOf).
 */
function crossingsAt(y: number, rings: readonly (readonly (readonly [number, number])[])[]): number[] {
  const out: number[] = [];
  for (const ring of rings)
    for (let k = 1; k < ring.length; k++) {
      const [x0, y0] = ring[k - 1]!;
      const [x1, y1] = ring[k]!;
      if (y0 > y !== y1 > y) out.push(x0 + ((y - y0) * (x1 - x0)) / (y1 - y0));
    }
  return out;
}

/** How many of the crossings lie strictly to the right of x. */
function rightOf(crossings: readonly number[], x: number): number {
  let n = 0;
  for (const c of crossings) if (x < c) n++;
  return n;
}

/**
 * The target flange pose (row-major 4×4, m) with tool axis z = direction k of `dirs`, turned by `rollRad` about it,
 * at the position (px, py, pz), m. At roll 0, flange x is the base axis least aligned with z, made perpendicular
 * to it; y = z × x. Allocates nothing.
 */
export function directionPoseInto(
  out: Float64Array,
  dirs: Float64Array,
  k: number,
  rollRad: number,
  px: number,
  py: number,
  pz: number,
): Float64Array {
  const zx = dirs[3 * k]!,
    zy = dirs[3 * k + 1]!,
    zz = dirs[3 * k + 2]!;
  const ax = Math.abs(zx),
    ay = Math.abs(zy),
    az = Math.abs(zz);
  // e = the base axis least aligned with z; x0 = e − (e·z) z, normalised.
  let x0x = 0,
    x0y = 0,
    x0z = 0;
  if (ax <= ay && ax <= az) x0x = 1;
  else if (ay <= az) x0y = 1;
  else x0z = 1;
  const d = x0x * zx + x0y * zy + x0z * zz;
  x0x -= d * zx;
  x0y -= d * zy;
  x0z -= d * zz;
  const nrm = Math.hypot(x0x, x0y, x0z);
  x0x /= nrm;
  x0y /= nrm;
  x0z /= nrm;
  // y0 = z × x0; x = cos ψ x0 + sin ψ y0; y = z × x.
  const y0x = zy * x0z - zz * x0y,
    y0y = zz * x0x - zx * x0z,
    y0z = zx * x0y - zy * x0x;
  const c = Math.cos(rollRad),
    s = Math.sin(rollRad);
  const xx = c * x0x + s * y0x,
    xy = c * x0y + s * y0y,
    xz = c * x0z + s * y0z;
  out[0] = xx;
  out[4] = xy;
  out[8] = xz;
  out[1] = zy * xz - zz * xy;
  out[5] = zz * xx - zx * xz;
  out[9] = zx * xy - zy * xx;
  out[2] = zx;
  out[6] = zy;
  out[10] = zz;
  out[3] = px;
  out[7] = py;
  out[11] = pz;
  out[12] = 0;
  out[13] = 0;
  out[14] = 0;
  out[15] = 1;
  return out;
}
