/**
 * Geometry for charts: polygons and polylines in data units → SVG path data in pixels (d3-shape, one decimal),
 * simplified at a pixel tolerance so an arm sheet stays light; filled bands of a row-major grid (d3-contour).
 */
import { contours } from "d3-contour";
import { line } from "d3-shape";
import type { ScaleLinear } from "d3-scale";

/** A point [horizontal, vertical] in data units (mm). */
export type PointData = readonly [number, number];

/** A polygon: outer ring and holes, rings closed or open (GeoJSON style; the same shape as the core's PolygonMm). */
export interface PolygonData {
  readonly outer: readonly PointData[];
  readonly holes: readonly (readonly PointData[])[];
}

/** A regular grid: value(ix, iy) = values[ix + iy·nx] at (x0 + ix·step, y0 + iy·step). */
export interface GridData {
  readonly nx: number;
  readonly ny: number;
  readonly rMinMm: number;
  readonly zMinMm: number;
  readonly stepMm: number;
}

/** Pixel tolerance for path simplification: a tenth of a typical stroke width is invisible. */
export const SIMPLIFY_PX = 0.35;

function perpendicularDistance2(p: PointData, a: PointData, b: PointData): number {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const len2 = dx * dx + dy * dy;
  if (len2 === 0) return (p[0] - a[0]) ** 2 + (p[1] - a[1]) ** 2;
  const t = Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2));
  return (p[0] - a[0] - t * dx) ** 2 + (p[1] - a[1] - t * dy) ** 2;
}

/**
 * Douglas–Peucker simplification of an open polyline; keeps both ends and every point farther than `tolerance`
 * from the simplified line. Iterative (no recursion depth limit).
 * @see Douglas & Peucker, The Canadian Cartographer 10(2), 1973
 * @example simplifyPolyline([[0, 0], [1, 0.01], [2, 0]], 0.1) // [[0, 0], [2, 0]]
 */
export function simplifyPolyline(points: readonly PointData[], tolerance: number): PointData[] {
  const n = points.length;
  if (n <= 2 || !(tolerance > 0)) return points.slice();
  const keep = new Uint8Array(n);
  keep[0] = 1;
  keep[n - 1] = 1;
  const tol2 = tolerance * tolerance;
  const stack: [number, number][] = [[0, n - 1]];
  while (stack.length > 0) {
    const [i0, i1] = stack.pop()!;
    let far = -1;
    let farD = tol2;
    for (let i = i0 + 1; i < i1; i++) {
      const d = perpendicularDistance2(points[i]!, points[i0]!, points[i1]!);
      if (d > farD) {
        farD = d;
        far = i;
      }
    }
    if (far >= 0) {
      keep[far] = 1;
      stack.push([i0, far], [far, i1]);
    }
  }
  const out: PointData[] = [];
  for (let i = 0; i < n; i++) if (keep[i]) out.push(points[i]!);
  return out;
}

/** A ring simplified: split at its first point and the point farthest from it, each half simplified. */
export function simplifyRing(ring: readonly PointData[], tolerance: number): PointData[] {
  let pts = ring.slice();
  const first = pts[0];
  const last = pts[pts.length - 1];
  if (first && last && pts.length > 1 && first[0] === last[0] && first[1] === last[1]) pts = pts.slice(0, -1);
  if (pts.length <= 4) return pts;
  let far = 0;
  let farD = -1;
  for (let i = 1; i < pts.length; i++) {
    const d = (pts[i]![0] - pts[0]![0]) ** 2 + (pts[i]![1] - pts[0]![1]) ** 2;
    if (d > farD) {
      farD = d;
      far = i;
    }
  }
  const a = simplifyPolyline(pts.slice(0, far + 1), tolerance);
  const b = simplifyPolyline([...pts.slice(far), pts[0]!], tolerance);
  return [...a, ...b.slice(1, -1)];
}

const pathLine = line<PointData>(
  (p) => p[0],
  (p) => p[1],
).digits(1);

function toPx(
  points: readonly PointData[],
  x: ScaleLinear<number, number>,
  y: ScaleLinear<number, number>,
): PointData[] {
  return points.map((p) => [x(p[0]), y(p[1])] as const);
}

/** Path data of polygons (outer rings and holes, each closed with Z); fill with fill-rule evenodd. */
export function polygonsPath(
  polygons: readonly PolygonData[],
  x: ScaleLinear<number, number>,
  y: ScaleLinear<number, number>,
  tolerancePx = SIMPLIFY_PX,
): string {
  let d = "";
  for (const polygon of polygons) {
    for (const ring of [polygon.outer, ...polygon.holes]) {
      const px = simplifyRing(toPx(ring, x, y), tolerancePx);
      if (px.length < 3) continue;
      d += `${pathLine(px) ?? ""}Z`;
    }
  }
  return d;
}

/** Path data of open polylines (data units), one subpath each. */
export function polylinesPath(
  polylines: readonly (readonly PointData[])[],
  x: ScaleLinear<number, number>,
  y: ScaleLinear<number, number>,
  tolerancePx = SIMPLIFY_PX,
): string {
  let d = "";
  for (const pl of polylines) {
    if (pl.length < 2) continue;
    d += pathLine(simplifyPolyline(toPx(pl, x, y), tolerancePx)) ?? "";
  }
  return d;
}

/** Bounding box [[xMin, xMax], [yMin, yMax]] of polygons' outer rings; null when empty. */
export function polygonsExtent(polygons: readonly PolygonData[]): [[number, number], [number, number]] | null {
  let x0 = Infinity,
    x1 = -Infinity,
    y0 = Infinity,
    y1 = -Infinity;
  for (const p of polygons) {
    for (const [px, py] of p.outer) {
      if (px < x0) x0 = px;
      if (px > x1) x1 = px;
      if (py < y0) y0 = py;
      if (py > y1) y1 = py;
    }
  }
  return x0 <= x1
    ? [
        [x0, x1],
        [y0, y1],
      ]
    : null;
}

/**
 * Regions of a grid where value ≥ threshold, for each threshold, as polygons in data units (d3-contour, linear
 * interpolation between cell centres; value i + j·nx sits at the node (rMin + i·step, zMin + j·step)). Null cells count
 * as below every threshold, and d3-contour puts the edge toward them through the last valid centre: use
 * `presentRegion` for the outline of the valid cells and `dilateGrid` before contouring values that are clipped to it.
 */
export function gridBands(
  grid: GridData,
  values: readonly (number | null)[],
  thresholds: readonly number[],
): { threshold: number; polygons: PolygonData[] }[] {
  const { nx, ny, rMinMm, zMinMm, stepMm } = grid;
  if (values.length !== nx * ny) throw new RangeError(`invalid grid: ${values.length} values for ${nx}×${ny}`);
  const numeric = values.map((v) => (v === null ? NaN : v));
  // d3-contour samples value i + j·nx at (i + 0.5, j + 0.5) in grid units.
  const toData = (p: number[]): PointData => [rMinMm + (p[0]! - 0.5) * stepMm, zMinMm + (p[1]! - 0.5) * stepMm];
  const generator = contours().size([nx, ny]).thresholds(thresholds.slice());
  return generator(numeric).map((mp) => ({
    threshold: mp.value,
    polygons: mp.coordinates.map((rings) => ({
      outer: (rings[0] ?? []).map(toData),
      holes: rings.slice(1).map((r) => r.map(toData)),
    })),
  }));
}

/** 1 where a cell has a value, 0 where it is null. */
export function presenceMask(values: readonly (number | null)[]): number[] {
  return values.map((v) => (v === null || !Number.isFinite(v) ? 0 : 1));
}

/**
 * The region of the cells that have a value: d3-contour of the 0/1 mask at 0.5, so every edge between a valid and a
 * null cell lies on the cell border (halfway between the two nodes) and convex corners are cut diagonally.
 * @example presentRegion({ nx: 3, ny: 3, rMinMm: 0, zMinMm: 0, stepMm: 10 }, [null, null, null, null, 1, null, null, null, null])
 *   // one diamond with corners at (5, 10), (10, 5), (15, 10), (10, 15)
 */
export function presentRegion(grid: GridData, values: readonly (number | null)[]): PolygonData[] {
  return gridBands(grid, presenceMask(values), [0.5])[0]?.polygons ?? [];
}

/**
 * One ring of null cells around the valid ones takes the mean of its valid 8-neighbours, so contours of the values run
 * out past the valid cells' borders; clip them to `presentRegion` afterwards. Allocates its result.
 */
export function dilateGrid(grid: GridData, values: readonly (number | null)[]): (number | null)[] {
  const { nx, ny } = grid;
  const out = values.slice();
  for (let iy = 0; iy < ny; iy++) {
    for (let ix = 0; ix < nx; ix++) {
      if (values[ix + iy * nx] !== null) continue;
      let sum = 0;
      let n = 0;
      for (let dy = -1; dy <= 1; dy++) {
        for (let dx = -1; dx <= 1; dx++) {
          const jx = ix + dx;
          const jy = iy + dy;
          if (jx < 0 || jy < 0 || jx >= nx || jy >= ny) continue;
          const v = values[jx + jy * nx];
          if (v !== null && v !== undefined && Number.isFinite(v)) {
            sum += v;
            n++;
          }
        }
      }
      if (n > 0) out[ix + iy * nx] = sum / n;
    }
  }
  return out;
}
