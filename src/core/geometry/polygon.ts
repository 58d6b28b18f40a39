/**
 * Plain polygons in mm, GeoJSON style (RFC 7946 §3.1.6): a polygon is an outer ring plus holes; every ring is
 * closed (its first point repeated at the end); outer rings run counter-clockwise and holes clockwise in the
 * view's own axes (horizontal to the right, vertical up).
 */

/** A point [horizontal, vertical] in mm. */
export type PointMm = readonly [number, number];
/** A closed ring: the first point is repeated at the end. */
export type RingMm = readonly PointMm[];

export interface PolygonMm {
  readonly outer: RingMm;
  readonly holes: readonly RingMm[];
}

/** Twice the signed area (shoelace) of an open flat ring [x0, y0, x1, y1, …]; positive when counter-clockwise. */
function flatRingArea2(ring: ArrayLike<number>): number {
  const n = ring.length >> 1;
  let sum = 0;
  for (let k = 0, p = n - 1; k < n; p = k++) sum += ring[2 * p]! * ring[2 * k + 1]! - ring[2 * k]! * ring[2 * p + 1]!;
  return sum;
}

/** Signed area of a closed ring (mm²); positive when counter-clockwise. @example ringArea([[0,0],[1,0],[1,1],[0,0]]) // 0.5 */
function ringArea(ring: RingMm): number {
  let sum = 0;
  for (let k = 1; k < ring.length; k++) sum += ring[k - 1]![0] * ring[k]![1] - ring[k]![0] * ring[k - 1]![1];
  return sum / 2;
}

/** Area of polygons (outer minus holes), mm². */
export function polygonsArea(polygons: readonly PolygonMm[]): number {
  let sum = 0;
  for (const p of polygons) {
    sum += Math.abs(ringArea(p.outer));
    for (const h of p.holes) sum -= Math.abs(ringArea(h));
  }
  return sum;
}

/** Even–odd point-in-ring test (crossing number) for a closed ring. */
export function pointInRing(x: number, y: number, ring: RingMm): boolean {
  let inside = false;
  for (let k = 1; k < ring.length; k++) {
    const [x0, y0] = ring[k - 1]!;
    const [x1, y1] = ring[k]!;
    if (y0 > y !== y1 > y && x < x0 + ((y - y0) * (x1 - x0)) / (y1 - y0)) inside = !inside;
  }
  return inside;
}

/** True when (x, y) is inside one of the polygons (inside its outer ring and outside its holes). */
export function pointInPolygons(x: number, y: number, polygons: readonly PolygonMm[]): boolean {
  for (const p of polygons) {
    if (!pointInRing(x, y, p.outer)) continue;
    if (!p.holes.some((h) => pointInRing(x, y, h))) return true;
  }
  return false;
}

/**
 * Douglas–Peucker simplification of an open flat ring (closed implicitly), keeping every point farther than
 * `epsilon` from the simplified outline. The two points farthest apart anchor the ring. Allocates its result.
 * @see Douglas & Peucker, The Canadian Cartographer 10(2), 1973 [from memory]
 */
export function simplifyFlatRing(ring: Float64Array, epsilon: number): Float64Array {
  const n = ring.length >> 1;
  if (n <= 4 || !(epsilon > 0)) return ring;
  // anchor: point 0 and the point farthest from it
  let far = 0,
    farD = -1;
  for (let k = 1; k < n; k++) {
    const d = (ring[2 * k]! - ring[0]!) ** 2 + (ring[2 * k + 1]! - ring[1]!) ** 2;
    if (d > farD) {
      farD = d;
      far = k;
    }
  }
  const keep = new Uint8Array(n);
  keep[0] = 1;
  keep[far] = 1;
  const stack: number[] = [0, far, far, n];
  const eps2 = epsilon * epsilon;
  while (stack.length > 0) {
    const hiIdx = stack.pop()!;
    const loIdx = stack.pop()!;
    if (hiIdx - loIdx < 2) continue;
    const ax = ring[2 * loIdx]!,
      ay = ring[2 * loIdx + 1]!;
    const hm = hiIdx % n;
    const bx = ring[2 * hm]!,
      by = ring[2 * hm + 1]!;
    const dx = bx - ax,
      dy = by - ay,
      len2 = dx * dx + dy * dy;
    let best = -1,
      bestD = eps2;
    for (let k = loIdx + 1; k < hiIdx; k++) {
      const px = ring[2 * k]! - ax,
        py = ring[2 * k + 1]! - ay;
      let d: number;
      if (len2 === 0) d = px * px + py * py;
      else {
        const t = Math.max(0, Math.min(1, (px * dx + py * dy) / len2));
        d = (px - t * dx) ** 2 + (py - t * dy) ** 2;
      }
      if (d > bestD) {
        bestD = d;
        best = k;
      }
    }
    if (best >= 0) {
      keep[best] = 1;
      stack.push(loIdx, best, best, hiIdx);
    }
  }
  let count = 0;
  for (let k = 0; k < n; k++) count += keep[k]!;
  if (count < 3) {
    // a ring thinner than epsilon: keep its point farthest from the anchor chord, so it stays a ring
    const ax = ring[0]!,
      ay = ring[1]!,
      dx = ring[2 * far]! - ax,
      dy = ring[2 * far + 1]! - ay;
    let best = -1,
      bestD = -1;
    for (let k = 1; k < n; k++) {
      if (k === far) continue;
      const d = Math.abs(dx * (ring[2 * k + 1]! - ay) - dy * (ring[2 * k]! - ax));
      if (d > bestD) {
        bestD = d;
        best = k;
      }
    }
    if (best >= 0) {
      keep[best] = 1;
      count++;
    }
  }
  const out = new Float64Array(2 * count);
  for (let k = 0, o = 0; k < n; k++) {
    if (!keep[k]) continue;
    out[o++] = ring[2 * k]!;
    out[o++] = ring[2 * k + 1]!;
  }
  return out;
}

function toRing(flat: Float64Array, reverse: boolean): PointMm[] {
  const n = flat.length >> 1;
  const out: PointMm[] = [];
  for (let k = 0; k < n; k++) {
    const i = reverse ? n - 1 - k : k;
    out.push([flat[2 * i]!, flat[2 * i + 1]!]);
  }
  out.push(out[0]!);
  return out;
}

function flatPointInRing(x: number, y: number, ring: Float64Array): boolean {
  const n = ring.length >> 1;
  let inside = false;
  for (let k = 0, p = n - 1; k < n; p = k++) {
    const x0 = ring[2 * p]!,
      y0 = ring[2 * p + 1]!,
      x1 = ring[2 * k]!,
      y1 = ring[2 * k + 1]!;
    if (y0 > y !== y1 > y && x < x0 + ((y - y0) * (x1 - x0)) / (y1 - y0)) inside = !inside;
  }
  return inside;
}

/**
 * Width of a flat ring as 2 · area / perimeter (mm): the width of a long strip, the radius of a disc. A pocket left
 * between two sampled slices is a thin sliver however long, so its width, not its bounding box, tells it from a
 * real hole.
 */
function flatRingWidth(ring: Float64Array, areaMm2: number): number {
  const n = ring.length >> 1;
  let perimeter = 0;
  for (let k = 0, p = n - 1; k < n; p = k++)
    perimeter += Math.hypot(ring[2 * k]! - ring[2 * p]!, ring[2 * k + 1]! - ring[2 * p + 1]!);
  return perimeter > 0 ? (2 * areaMm2) / perimeter : 0;
}

/**
 * Groups rings that have the inside on their left (outer rings counter-clockwise, holes clockwise) into polygons:
 * each hole goes to the smallest outer ring that contains it. Holes with |area| below `minAreaMm2` are dropped, and
 * holes narrower than `minHoleMm` (2 · area / perimeter; filling a hole errs on the outside). Outer rings are
 * kept whatever their size: dropping one would lose points the region holds (a thin strip, or a point that does not
 * move at all, outlines as a sliver). `filled`, when given, gains the area of every hole dropped (mm²), so a caller
 * can state the area of the set as drawn; `keepNarrowHole`, when given, keeps a hole narrower than `minHoleMm` (not
 * one below `minAreaMm2`) for which it returns true.
 */
export function assemblePolygons(
  rings: readonly Float64Array[],
  minAreaMm2: number,
  minHoleMm = 0,
  filled?: { areaMm2: number },
  keepNarrowHole?: (ring: Float64Array, widthMm: number) => boolean,
): PolygonMm[] {
  const outers: { ring: Float64Array; area: number; holes: Float64Array[] }[] = [];
  const holes: Float64Array[] = [];
  for (const r of rings) {
    if (r.length < 6) continue;
    const a2 = flatRingArea2(r);
    if (a2 > 0) outers.push({ ring: r, area: a2 / 2, holes: [] });
    else if (a2 < 0) {
      const w = -a2 / 2 >= minAreaMm2 ? flatRingWidth(r, -a2 / 2) : -1;
      if (w >= minHoleMm || (w >= 0 && keepNarrowHole?.(r, w))) holes.push(r);
      else if (filled) filled.areaMm2 -= a2 / 2;
    }
  }
  outers.sort((p, q) => p.area - q.area);
  for (const h of holes) {
    // a point just inside the hole's first edge would be safest; a vertex of the hole lies strictly inside its outer
    // ring because rings from one contour set do not cross
    const x = h[0]!,
      y = h[1]!;
    const owner = outers.find((o) => flatPointInRing(x, y, o.ring));
    if (owner) owner.holes.push(h);
  }
  outers.sort((p, q) => q.area - p.area);
  return outers.map((o) => ({ outer: toRing(o.ring, false), holes: o.holes.map((h) => toRing(h, false)) }));
}
