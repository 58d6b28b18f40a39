/**
 * Marching squares for the zero level of a field sampled on a regular grid, streamed one row at a time, with
 * linear interpolation on the cell edges (Lorensen & Cline's cube cases in 2-D; the case table and the stitching
 * of fragments follow the usual contour-tracing practice, as d3-contour does). Nodes with value > 0 are inside.
 *
 * Rings come back as flat arrays [x0, y0, x1, y1, …] in grid coordinates (x = column index + fraction, y = row
 * index + fraction), open (the first point is not repeated), oriented with the inside on the left (counter-
 * clockwise for an outer boundary when y points up). Saddles are resolved by the mean of the four corners.
 * The grid is padded with "outside" beyond its rows and, unless periodic in x, beyond its columns, so every ring
 * closes. With `periodicX` the column after the last is column 0 (a polar grid in angle).
 */

/** Writes the field values of row j (nx numbers) into out. */
export type RowFiller = (j: number, out: Float64Array) => void;

interface Fragment {
  start: number;
  end: number;
  /** points before the first segment's start, stored in reverse order (pairs). */
  head: number[];
  /** points from the first segment's start onwards (pairs). */
  tail: number[];
}

/**
 * Traces the zero isolines of the field on rows jMin … jMax and columns 0 … nx − 1.
 * @returns rings in grid coordinates, inside on the left
 */
export function isolineRings(nx: number, jMin: number, jMax: number, periodicX: boolean, fillRow: RowFiller): Float64Array[] {
  if (!(nx >= 1) || !Number.isInteger(nx)) throw new RangeError(`invalid nx: ${nx}`);
  const rings: Float64Array[] = [];
  if (jMax < jMin) return rings;
  const stride = nx + 2;
  let lower = new Float64Array(nx).fill(-1);
  let upper = new Float64Array(nx);
  const byStart = new Map<number, Fragment>();
  const byEnd = new Map<number, Fragment>();

  // Edge-point ids: horizontal edge on row j between columns i and i+1 → even; vertical edge on column i between
  // rows j and j+1 → odd.
  const hId = (i: number, j: number) => ((j - jMin + 1) * stride + (i + 1)) * 2;
  const vId = (i: number, j: number) => ((j - jMin + 1) * stride + (i + 1)) * 2 + 1;

  const emit = (sId: number, sx: number, sy: number, eId: number, ex: number, ey: number): void => {
    const f = byEnd.get(sId);
    const g = byStart.get(eId);
    if (f && g) {
      byEnd.delete(sId);
      byStart.delete(eId);
      if (f === g) {
        rings.push(closeFragment(f));
        return;
      }
      // f … (s → e) … g
      const gPts = orderedPoints(g);
      for (let k = 0; k < gPts.length; k++) f.tail.push(gPts[k]!);
      byEnd.delete(g.end);
      f.end = g.end;
      byEnd.set(f.end, f);
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
  };

  const lastCol = nx - 1;
  const firstCol = periodicX ? 0 : -1;
  for (let j = jMin - 1; j <= jMax; j++) {
    // cells between row j (lower) and row j + 1 (upper)
    if (j + 1 <= jMax) fillRow(j + 1, upper);
    else upper.fill(-1);
    for (let i = firstCol; i <= lastCol; i++) {
      const i1 = i + 1;
      const a = i >= 0 ? lower[i]! : -1;
      const d = i >= 0 ? upper[i]! : -1;
      let b: number, c: number;
      if (i1 < nx) {
        b = lower[i1]!;
        c = upper[i1]!;
      } else if (periodicX) {
        b = lower[0]!;
        c = upper[0]!;
      } else {
        b = -1;
        c = -1;
      }
      const code = (a > 0 ? 1 : 0) | (b > 0 ? 2 : 0) | (c > 0 ? 4 : 0) | (d > 0 ? 8 : 0);
      if (code === 0 || code === 15) continue;
      // crossing points on the edges whose end nodes differ (bottom a–b, right b–c, top d–c, left a–d)
      const inA = code & 1, inB = (code >> 1) & 1, inC = (code >> 2) & 1, inD = (code >> 3) & 1;
      const bId = hId(i, j), bx = inA !== inB ? i + a / (a - b) : 0;
      const tId = hId(i, j + 1), tx = inD !== inC ? i + d / (d - c) : 0;
      const lId = vId(i, j), ly = inA !== inD ? j + a / (a - d) : 0;
      const rId = vId(i1 === nx && periodicX ? 0 : i1, j), ry = inB !== inC ? j + b / (b - c) : 0;
      const y1 = j + 1, x1 = i + 1;
      switch (code) {
        case 1: emit(bId, bx, j, lId, i, ly); break;
        case 2: emit(rId, x1, ry, bId, bx, j); break;
        case 3: emit(rId, x1, ry, lId, i, ly); break;
        case 4: emit(tId, tx, y1, rId, x1, ry); break;
        case 6: emit(tId, tx, y1, bId, bx, j); break;
        case 7: emit(tId, tx, y1, lId, i, ly); break;
        case 8: emit(lId, i, ly, tId, tx, y1); break;
        case 9: emit(bId, bx, j, tId, tx, y1); break;
        case 11: emit(rId, x1, ry, tId, tx, y1); break;
        case 12: emit(lId, i, ly, rId, x1, ry); break;
        case 13: emit(bId, bx, j, rId, x1, ry); break;
        case 14: emit(lId, i, ly, bId, bx, j); break;
        case 5:
          if (a + b + c + d > 0) {
            emit(bId, bx, j, rId, x1, ry);
            emit(tId, tx, y1, lId, i, ly);
          } else {
            emit(bId, bx, j, lId, i, ly);
            emit(tId, tx, y1, rId, x1, ry);
          }
          break;
        case 10:
          if (a + b + c + d > 0) {
            emit(lId, i, ly, bId, bx, j);
            emit(rId, x1, ry, tId, tx, y1);
          } else {
            emit(rId, x1, ry, bId, bx, j);
            emit(lId, i, ly, tId, tx, y1);
          }
          break;
      }
    }
    const t = lower;
    lower = upper;
    upper = t;
  }
  return rings;
}

function orderedPoints(f: Fragment): number[] {
  const out: number[] = [];
  for (let k = f.head.length - 2; k >= 0; k -= 2) out.push(f.head[k + 1]!, f.head[k]!);
  for (let k = 0; k < f.tail.length; k++) out.push(f.tail[k]!);
  return out;
}

function closeFragment(f: Fragment): Float64Array {
  // the closing segment runs from f.end back to f.start, whose point is already first
  return Float64Array.from(orderedPoints(f));
}
