/**
 * Marching squares for the zero level of a field on a regular grid, with linear interpolation on the cell edges
 * (the 2-D case table of Lorensen & Cline's marching cubes, SIGGRAPH 1987 [from memory]; fragments are stitched by
 * shared edge points, as contour tracers such as d3-contour do). Nodes with value > 0 are inside.
 *
 * The source says which cells of each row pair may carry the contour (all of them, or only those near the
 * boundary), and gives node values on demand, so the cost follows the length of the boundary, not the grid area.
 *
 * Rings come back as flat arrays [x0, y0, x1, y1, …] in grid coordinates (x = column + fraction, y = row + fraction),
 * open (the first point is not repeated), with the inside on the left (counter-clockwise for an outer boundary when
 * y points up). Saddles are resolved by the mean of the four corners. Nodes outside rows jMin … jMax and, unless
 * periodic in x, outside columns 0 … nx − 1 count as outside, so every ring closes. With `periodicX` the column after
 * the last is column 0.
 */

interface IsolineSource {
  /** Number of node columns. */
  readonly nx: number;
  readonly jMin: number;
  readonly jMax: number;
  readonly periodicX: boolean;
  /**
   * Appends inclusive ranges [i0, i1] of the cells between rows j and j + 1 that may be crossed (cell i spans
   * columns i and i + 1; i from −1 to nx − 1, or 0 to nx − 1 when periodic). Ranges may overlap and be unsorted.
   */
  cells(j: number, out: number[]): void;
  /** Value of node (i, j), 0 ≤ i < nx, jMin ≤ j ≤ jMax. */
  value(i: number, j: number): number;
}

interface Fragment {
  start: number;
  end: number;
  /** points before the first segment's start, stored in reverse order (pairs). */
  head: number[];
  /** points from the first segment's start onwards (pairs). */
  tail: number[];
}

/** Joins the segments of marching squares into rings by their shared edge points (ids). */
class Stitcher {
  readonly rings: Float64Array[] = [];
  readonly byStart = new Map<number, Fragment>();
  readonly byEnd = new Map<number, Fragment>();

  emit(sId: number, sx: number, sy: number, eId: number, ex: number, ey: number): void {
    const { byStart, byEnd, rings } = this;
    const f = byEnd.get(sId);
    const g = byStart.get(eId);
    if (f && g) {
      byEnd.delete(sId);
      byStart.delete(eId);
      if (f === g) {
        // the closing segment runs from f.end back to f.start, whose point is already first
        rings.push(Float64Array.from(orderedPoints(f)));
        return;
      }
      // f … (s → e) … g: move the smaller fragment's points into the larger one
      if (f.head.length + f.tail.length >= g.head.length + g.tail.length) {
        for (let k = g.head.length - 2; k >= 0; k -= 2) f.tail.push(g.head[k + 1]!, g.head[k]!);
        for (let k = 0; k < g.tail.length; k++) f.tail.push(g.tail[k]!);
        byEnd.delete(g.end);
        f.end = g.end;
        byEnd.set(f.end, f);
      } else {
        // prepend f's points (last first) to g's head, which is stored reversed
        for (let k = f.tail.length - 2; k >= 0; k -= 2) g.head.push(f.tail[k + 1]!, f.tail[k]!);
        for (let k = 0; k < f.head.length; k++) g.head.push(f.head[k]!);
        byStart.delete(f.start);
        g.start = f.start;
        byStart.set(g.start, g);
      }
    } else if (f) {
      byEnd.delete(sId);
      f.tail.push(ex, ey);
      f.end = eId;
      byEnd.set(eId, f);
    } else if (g) {
      byStart.delete(eId);
      g.head.push(sy, sx); // reversed pair order, undone in orderedPoints
      g.start = sId;
      byStart.set(sId, g);
    } else {
      const fr: Fragment = { start: sId, end: eId, head: [], tail: [sx, sy, ex, ey] };
      byStart.set(sId, fr);
      byEnd.set(eId, fr);
    }
  }
}

/**
 * Traces the zero isolines of the source's field.
 * @returns rings in grid coordinates, inside on the left
 */
export function isolineRings(src: IsolineSource): Float64Array[] {
  const { nx, jMin, jMax, periodicX } = src;
  if (!(nx >= 1) || !Number.isInteger(nx)) throw new RangeError(`invalid nx: ${nx}`);
  if (jMax < jMin) return [];
  const stride = nx + 2;
  const node = (i: number, j: number): number => {
    if (j < jMin || j > jMax) return -1;
    if (i >= nx) {
      if (!periodicX) return -1;
      i -= nx;
    }
    if (i < 0) return -1;
    return src.value(i, j);
  };
  // Edge-point ids: horizontal edge on row j between columns i and i+1 → even; vertical edge on column i between
  // rows j and j+1 → odd.
  const hId = (i: number, j: number) => ((j - jMin + 1) * stride + (i + 1)) * 2;
  const vId = (i: number, j: number) => ((j - jMin + 1) * stride + (i + 1)) * 2 + 1;

  const stitcher = new Stitcher();
  const rings = stitcher.rings;
  const emit = (sId: number, sx: number, sy: number, eId: number, ex: number, ey: number): void =>
    stitcher.emit(sId, sx, sy, eId, ex, ey);

  const ranges: number[] = [];
  const lo = periodicX ? 0 : -1;
  for (let j = jMin - 1; j <= jMax; j++) {
    ranges.length = 0;
    src.cells(j, ranges);
    // sort ranges by start and visit each cell once
    const order: number[] = [];
    for (let r = 0; r < ranges.length; r += 2) order.push(r);
    order.sort((p, q) => ranges[p]! - ranges[q]!);
    let next = lo;
    for (const r of order) {
      const i0 = Math.max(next, ranges[r]!, lo),
        i1 = Math.min(ranges[r + 1]!, nx - 1);
      for (let i = i0; i <= i1; i++) cell(i, j);
      if (i1 + 1 > next) next = i1 + 1;
    }
  }
  if (stitcher.byStart.size > 0) throw new Error("isolineRings: unclosed contour (internal error)");
  return rings;

  function cell(i: number, j: number): void {
    const i1 = i + 1,
      j1 = j + 1;
    const a = node(i, j),
      b = node(i1, j),
      c = node(i1, j1),
      d = node(i, j1);
    const code = (a > 0 ? 1 : 0) | (b > 0 ? 2 : 0) | (c > 0 ? 4 : 0) | (d > 0 ? 8 : 0);
    if (code === 0 || code === 15) return;
    // crossing points on the edges whose end nodes differ (bottom a–b, right b–c, top d–c, left a–d)
    const inA = code & 1,
      inB = (code >> 1) & 1,
      inC = (code >> 2) & 1,
      inD = (code >> 3) & 1;
    const bId = hId(i, j),
      bx = inA !== inB ? i + a / (a - b) : 0;
    const tId = hId(i, j1),
      tx = inD !== inC ? i + d / (d - c) : 0;
    const lId = vId(i, j),
      ly = inA !== inD ? j + a / (a - d) : 0;
    const rId = vId(i1 === nx && periodicX ? 0 : i1, j),
      ry = inB !== inC ? j + b / (b - c) : 0;
    switch (code) {
      case 1:
        emit(bId, bx, j, lId, i, ly);
        break;
      case 2:
        emit(rId, i1, ry, bId, bx, j);
        break;
      case 3:
        emit(rId, i1, ry, lId, i, ly);
        break;
      case 4:
        emit(tId, tx, j1, rId, i1, ry);
        break;
      case 6:
        emit(tId, tx, j1, bId, bx, j);
        break;
      case 7:
        emit(tId, tx, j1, lId, i, ly);
        break;
      case 8:
        emit(lId, i, ly, tId, tx, j1);
        break;
      case 9:
        emit(bId, bx, j, tId, tx, j1);
        break;
      case 11:
        emit(rId, i1, ry, tId, tx, j1);
        break;
      case 12:
        emit(lId, i, ly, rId, i1, ry);
        break;
      case 13:
        emit(bId, bx, j, rId, i1, ry);
        break;
      case 14:
        emit(lId, i, ly, bId, bx, j);
        break;
      case 5:
        if (a + b + c + d > 0) {
          emit(bId, bx, j, rId, i1, ry);
          emit(tId, tx, j1, lId, i, ly);
        } else {
          emit(bId, bx, j, lId, i, ly);
          emit(tId, tx, j1, rId, i1, ry);
        }
        break;
      case 10:
        if (a + b + c + d > 0) {
          emit(lId, i, ly, bId, bx, j);
          emit(rId, i1, ry, tId, tx, j1);
        } else {
          emit(rId, i1, ry, bId, bx, j);
          emit(lId, i, ly, tId, tx, j1);
        }
        break;
    }
  }
}

function orderedPoints(f: Fragment): number[] {
  const out: number[] = [];
  for (let k = f.head.length - 2; k >= 0; k -= 2) out.push(f.head[k + 1]!, f.head[k]!);
  for (let k = 0; k < f.tail.length; k++) out.push(f.tail[k]!);
  return out;
}
