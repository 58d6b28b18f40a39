/**
 * Adds the image of one sampled slice (an na × nb grid of points; each grid cell split into two triangles along
 * the diagonal (ia, ib)–(ia+1, ib+1)) to a RowCover, by scanline filling with winding numbers.
 *
 * The number of triangles covering a point equals the winding number of the sum of all triangle outlines, each
 * oriented counter-clockwise in the image. Inside the grid an edge is shared by two triangles that traverse it in
 * opposite parameter directions; their contributions cancel when both keep (or both reverse) the orientation of the
 * parameter grid, and add up to a double edge where the map folds. So only the image of the grid boundary and of
 * the fold edges is scanned: the cost grows with the outline, not with the area.
 *
 * "Signed radius" mode maps (x, y, h) to (r, h) with r = ±√(x² + y²), the sign of x. A triangle whose x changes sign
 * is clipped at x = 0 into a front and a back piece, each mapped on its own side, so the jump of r across x = 0 (a
 * lateral offset) is not filled in. Pieces cancel along shared sub-edges like whole triangles do; only the cut
 * edges (r = ±|y| at x = 0) remain.
 *
 * A slice whose image has almost no area (thinner than a quarter row) is drawn conservatively instead: every grid
 * edge marks the rows whose band it crosses, widened by half a node spacing so thin sets stay visible.
 *
 * Once the first slices have filled most of the region, most crossings of a slice fall inside intervals the cover
 * already holds (folds, overlapping sheets, the slice's outline where earlier slices cover it): those are only
 * summed per interval, never sorted (see flush), and runs of rows where a whole segment lies inside one of the two
 * widest intervals are summed at once (see segment). The result is the same to the last bit.
 */
import type { RowCover } from "./rowCover";
import { flush, segment } from "./sliceRows";
import type { SliceScratch } from "./sliceScratch";

/** Options of addSlice. */
interface SliceMode {
  /** Map (c0, c1, c2) to (±√(c0² + c1²), c2) instead of using (c0, c1). */
  readonly signedRadius: boolean;
  /** Node spacing along x of the later isoline pass (mm); conservative marks are widened by half of it. */
  readonly nodeSpacingMm: number;
  /** The first / last grid row (column) coincide: the seam is an inner edge, not a boundary. */
  readonly periodicA: boolean;
  readonly periodicB: boolean;
}

/** Lateral offsets below this (mm) do not need clipping: r is continuous through x = 0. */
const CLIP_EPS_MM = 1e-9;

/**
 * Adds the image of the slice to `cover`.
 * @param c0 c1 c2 grid point coordinates (mm), index ia·nb + ib
 */
export function addSlice(
  cover: RowCover,
  c0: Float64Array,
  c1: Float64Array,
  c2: Float64Array,
  na: number,
  nb: number,
  mode: SliceMode,
  s: SliceScratch,
  extra: readonly TriangleBatch[] = [],
): void {
  const np = na * nb;
  s.ensurePoints(np);
  const u = s.u,
    side = s.side,
    signed = mode.signedRadius;
  const v = signed ? c2 : c1;
  let umin = Infinity,
    umax = -Infinity,
    vmin = Infinity,
    vmax = -Infinity;
  for (let p = 0; p < np; p++) {
    const x = c0[p]!;
    let val: number;
    if (signed) {
      const y = c1[p]!;
      const rho = Math.sqrt(x * x + y * y);
      side[p] = x >= 0 ? 1 : 0;
      val = x >= 0 ? rho : -rho;
    } else {
      side[p] = 1;
      val = x;
    }
    u[p] = val;
    if (val < umin) umin = val;
    if (val > umax) umax = val;
    const w = v[p]!;
    if (w < vmin) vmin = w;
    if (w > vmax) vmax = w;
  }
  const dy = cover.dy;
  const cellsA = na - 1,
    cellsB = nb - 1;
  const plain = s.plain,
    area2 = s.area2,
    clipList = s.clipList;
  // clips: number of clipped triangles, listed in clipList in order
  let areaSum = 0,
    clips = 0;
  // A cell's right column (ib + 1) is the next cell's left one: its coordinates are carried over in locals, not
  // loaded again (the same numbers, so the same signs and areas).
  for (let ia = 0; ia < cellsA; ia++) {
    const row = ia * nb;
    let uL0 = u[row]!,
      vL0 = v[row]!,
      uL1 = u[row + nb]!,
      vL1 = v[row + nb]!;
    for (let ib = 0; ib < cellsB; ib++) {
      const p00 = row + ib,
        p10 = p00 + nb,
        p01 = p00 + 1,
        p11 = p10 + 1;
      const uR0 = u[p01]!,
        vR0 = v[p01]!,
        uR1 = u[p11]!,
        vR1 = v[p11]!;
      const t = 2 * (ia * cellsB + ib);
      if (signed && !(side[p00] === side[p10] && side[p10] === side[p11] && side[p11] === side[p01])) {
        triangleSigns(s, t, c0, c1, c2, u, v, p00, p10, p11, signed);
        triangleSigns(s, t + 1, c0, c1, c2, u, v, p00, p11, p01, signed);
        areaSum += area2[t]!;
        areaSum += area2[t + 1]!;
        if (plain[t] === 0) clipList[clips++] = t;
        if (plain[t + 1] === 0) clipList[clips++] = t + 1;
      } else {
        // both triangles on one side of the axis (all of them but a few): triangleSigns' plain case, inline
        const du10 = uL1 - uL0,
          dv10 = vL1 - vL0;
        const du11 = uR1 - uL0,
          dv11 = vR1 - vL0,
          du01 = uR0 - uL0,
          dv01 = vR0 - vL0;
        const a1 = du10 * dv11 - du11 * dv10,
          a2 = du11 * dv01 - du01 * dv11;
        plain[t] = a1 >= 0 ? 1 : -1;
        plain[t + 1] = a2 >= 0 ? 1 : -1;
        areaSum += Math.abs(a1);
        areaSum += Math.abs(a2);
      }
      uL0 = uR0;
      vL0 = vR0;
      uL1 = uR1;
      vL1 = vR1;
    }
  }
  areaSum /= 2;
  const extent = Math.max(umax - umin, vmax - vmin, 1e-12);
  // (a thin image that crosses the axis counts too: its clipped pieces have no area to fill either)
  if (cellsA === 0 || cellsB === 0 || areaSum < 0.25 * dy * extent) {
    addConservative(
      cover,
      u,
      v,
      na,
      nb,
      0.5 * mode.nodeSpacingMm,
      umin,
      umax,
      vmin,
      vmax,
      !signed,
      signed ? { s, x: c0, y: c1, h: c2 } : null,
    );
    // the extra triangles on their own (the cover has the marks already, so the window sees them)
    vmin = Infinity;
    vmax = -Infinity;
  }
  const sliceRows = vmin <= vmax;
  for (const batch of extra) {
    if (batch.count === 0) continue;
    const [lo, hi] = triangleHeights(batch.tris, batch.count, signed);
    if (lo < vmin) vmin = lo;
    if (hi > vmax) vmax = hi;
  }
  if (!(vmin <= vmax)) return;
  s.count = 0;
  // every crossing and mark of the slice and the triangles lies on a row from ⌊(vmin − y0)/dy⌋ to
  // ⌈(vmax − y0)/dy⌉ (a cut point off them by a rounding error is simply not set aside)
  s.openWindow(cover, Math.floor((vmin - cover.y0) / dy), Math.ceil((vmax - cover.y0) / dy));
  if (sliceRows) scanEdges(s, cover, c0, c1, c2, na, nb, mode, clips);
  for (const batch of extra) if (batch.count > 0) triangleEdges(s, cover, batch.tris, batch.count, signed);
  flush(s, cover);
}

/**
 * Triangles filled in the same sweep as a slice (addSlice's `extra`): 9 numbers per triangle, as addTriangles takes
 * them, in the slice's mode. One sweep instead of one per batch: each batch opened a window over much the same rows
 * (about as many rows as the slice's own, for a few dozen triangles). The cover comes out the same: every part's
 * winding number is ≥ 0 (each triangle counts +1 inside, and flush only moves crossings outward or within covered
 * intervals), so the positive set of the sum is the union of the parts' positive sets.
 */
export interface TriangleBatch {
  readonly tris: Float64Array;
  readonly count: number;
}

/**
 * Emits the grid edges of a slice that do not cancel (fold edges, the grid boundary, edges of clipped triangles)
 * and the cut edges of the clipped triangles (listed in s.clipList, `clips` of them), after triangleSigns.
 */
function scanEdges(
  s: SliceScratch,
  cover: RowCover,
  c0: Float64Array,
  c1: Float64Array,
  c2: Float64Array,
  na: number,
  nb: number,
  mode: SliceMode,
  clips: number,
): void {
  const u = s.u,
    signed = mode.signedRadius;
  const v = signed ? c2 : c1;
  const cellsA = na - 1,
    cellsB = nb - 1;
  const sF = s.signF,
    sB = s.signB,
    plain = s.plain,
    clipList = s.clipList;
  // An edge between two unclipped triangles of opposite orientation on one side of the axis (a fold) is a double
  // segment, emitted here as gridEdge would (mf − mb) without calling it.
  const side = s.side;
  // An edge between two unclipped triangles of the same orientation (most of the grid) adds nothing: skipped
  // without a call, in loops of their own over the edges inside the grid. Triangle indices: 2·(ia·cellsB + ib) for
  // T1 of cell (ia, ib), + 1 for T2; −1 outside the grid.
  const cancels = (tf: number, tb: number): boolean => tf >= 0 && tb >= 0 && plain[tf] !== 0 && plain[tf] === plain[tb];
  // a-edges (ia,ib)→(ia+1,ib): T1 of cell (ia,ib) runs forward, T2 of cell (ia,ib−1) backward. With a periodic b
  // the rows ib = 0 and ib = nb − 1 are one seam: drawn once, between the last and the first cells.
  // (the seam's indices are computed on every call: an operation that runs only for some slices (a periodic
  // primary) has no type feedback when the function gets optimized, and every later call that reached it fell back
  // to the interpreter, allocating a heap number per arithmetic result)
  const pb = nb > 2 && mode.periodicB,
    pa = na > 2 && mode.periodicA;
  const seamA = pa ? cellsA : -1;
  for (let ia = 0; ia < cellsA; ia++) {
    const cell0 = ia * cellsB,
      last = 2 * (cell0 + cellsB - 1) + 1,
      p0 = ia * nb;
    // ib = 0: backward, the last cell's T2 across a periodic seam
    const back0 = pb ? last : -1;
    if (!cancels(2 * cell0, back0)) gridEdge(s, cover, c0, c1, c2, u, v, p0, p0 + nb, 2 * cell0, back0, signed);
    for (let ib = 1; ib < cellsB; ib++) {
      const f = 2 * (cell0 + ib),
        mf = plain[f]!,
        mb = plain[f - 1]!;
      if (mf !== 0 && mf === mb) continue;
      const p = p0 + ib,
        q = p + nb;
      if (mf !== 0 && mb !== 0 && (!signed || side[p] === side[q])) segment(s, cover, u, v, p, q, mf - mb);
      else gridEdge(s, cover, c0, c1, c2, u, v, p, q, f, f - 1, signed);
    }
    // ib = nb − 1: the last cell's T2 alone (with a periodic b, the seam drawn at ib = 0)
    if (!pb) gridEdge(s, cover, c0, c1, c2, u, v, p0 + cellsB, p0 + nb + cellsB, -1, last, signed);
  }
  // b-edges (ia,ib)→(ia,ib+1): T1 of cell (ia−1,ib) runs forward, T2 of cell (ia,ib) backward
  const wrap = (cellsA - 1) * cellsB;
  for (let ia = 0; ia < na; ia++) {
    if (ia === seamA) continue;
    const prev = ia > 0 ? (ia - 1) * cellsB : pa ? wrap : -1,
      p0 = ia * nb;
    if (prev >= 0 && ia < cellsA) {
      // both triangles inside the grid
      const f0 = 2 * prev,
        b0 = 2 * ia * cellsB + 1;
      for (let ib = 0; ib < cellsB; ib++) {
        const f = f0 + 2 * ib,
          b = b0 + 2 * ib,
          mf = plain[f]!,
          mb = plain[b]!;
        if (mf !== 0 && mf === mb) continue;
        const p = p0 + ib;
        if (mf !== 0 && mb !== 0 && (!signed || side[p] === side[p + 1])) segment(s, cover, u, v, p, p + 1, mf - mb);
        else gridEdge(s, cover, c0, c1, c2, u, v, p, p + 1, f, b, signed);
      }
      continue;
    }
    for (let ib = 0; ib < cellsB; ib++) {
      const fwd = prev >= 0 ? 2 * (prev + ib) : -1;
      const back = ia < cellsA ? 2 * (ia * cellsB + ib) + 1 : -1;
      if (!cancels(fwd, back)) gridEdge(s, cover, c0, c1, c2, u, v, p0 + ib, p0 + ib + 1, fwd, back, signed);
    }
  }
  // diagonals (ia,ib)→(ia+1,ib+1): T2 runs forward, T1 backward
  for (let ia = 0; ia < cellsA; ia++) {
    const p0 = ia * nb,
      t0 = 2 * ia * cellsB;
    for (let ib = 0; ib < cellsB; ib++) {
      const t = t0 + 2 * ib,
        mf = plain[t + 1]!,
        mb = plain[t]!;
      if (mf !== 0 && mf === mb) continue;
      const p = p0 + ib,
        q = p + nb + 1;
      if (mf !== 0 && mb !== 0 && (!signed || side[p] === side[q])) segment(s, cover, u, v, p, q, mf - mb);
      else gridEdge(s, cover, c0, c1, c2, u, v, p, q, t + 1, t, signed);
    }
  }
  for (let c = 0; c < clips; c++) {
    const t = clipList[c]!,
      cell = t >> 1,
      ia = Math.floor(cell / cellsB),
      ib = cell - ia * cellsB;
    const p00 = ia * nb + ib,
      p10 = p00 + nb,
      p01 = p00 + 1,
      p11 = p10 + 1;
    if ((t & 1) === 0) cutEdges(s, cover, c0, c1, c2, p00, p10, p11, sF[t]!, sB[t]!);
    else cutEdges(s, cover, c0, c1, c2, p00, p11, p01, sF[t]!, sB[t]!);
  }
}

/**
 * Adds triangles given by their three points each (x, y, h or x, y, –), flat: 9 numbers per triangle, each triangle
 * filled on its own (clipped at x = 0 in signed-radius mode).
 */
export function addTriangles(
  cover: RowCover,
  tris: Float64Array,
  count: number,
  signed: boolean,
  s: SliceScratch,
): void {
  s.count = 0;
  // the window (see addSlice): the rows of the triangles' vertical extent
  const [vmin, vmax] = triangleHeights(tris, count, signed);
  s.openWindow(cover, Math.floor((vmin - cover.y0) / cover.dy), Math.ceil((vmax - cover.y0) / cover.dy));
  triangleEdges(s, cover, tris, count, signed);
  flush(s, cover);
}

/** Lowest and highest vertical coordinate (h in signed-radius mode, else y) of the triangles' corners. */
function triangleHeights(tris: Float64Array, count: number, signed: boolean): [number, number] {
  let vmin = Infinity,
    vmax = -Infinity;
  for (let t = 0; t < count; t++) {
    for (let k = 0; k < 3; k++) {
      const w = tris[9 * t + 3 * k + (signed ? 2 : 1)]!;
      if (w < vmin) vmin = w;
      if (w > vmax) vmax = w;
    }
  }
  return [vmin, vmax];
}

/** Records the outline of every triangle (each on its own, counter-clockwise) as crossings, for flush(). */
function triangleEdges(s: SliceScratch, cover: RowCover, tris: Float64Array, count: number, signed: boolean): void {
  const x = TRI_X,
    y = TRI_Y,
    h = TRI_H,
    uu = TRI_U,
    vv = TRI_V;
  for (let t = 0; t < count; t++) {
    for (let k = 0; k < 3; k++) {
      x[k] = tris[9 * t + 3 * k]!;
      y[k] = tris[9 * t + 3 * k + 1]!;
      h[k] = tris[9 * t + 3 * k + 2]!;
      if (signed) {
        const rho = Math.sqrt(x[k]! * x[k]! + y[k]! * y[k]!);
        uu[k] = x[k]! >= 0 ? rho : -rho;
        vv[k] = h[k]!;
      } else {
        uu[k] = x[k]!;
        vv[k] = y[k]!;
      }
    }
    const mixed = signed && !(x[0]! >= 0 === x[1]! >= 0 && x[1]! >= 0 === x[2]! >= 0);
    if (mixed && Math.max(Math.abs(y[0]!), Math.abs(y[1]!), Math.abs(y[2]!)) > CLIP_EPS_MM) {
      clipOutline(s, cover, x, y, h);
    } else {
      const a2 = (uu[1]! - uu[0]!) * (vv[2]! - vv[0]!) - (uu[2]! - uu[0]!) * (vv[1]! - vv[0]!);
      if (a2 === 0) continue;
      const m = a2 > 0 ? 1 : -1;
      segment(s, cover, uu, vv, 0, 1, m);
      segment(s, cover, uu, vv, 1, 2, m);
      segment(s, cover, uu, vv, 2, 0, m);
    }
  }
}

const TRI_X = new Float64Array(3),
  TRI_Y = new Float64Array(3),
  TRI_H = new Float64Array(3);
const TRI_U = new Float64Array(3),
  TRI_V = new Float64Array(3);
const PIECE = new Float64Array(16);
const PIECE_U = new Float64Array(8),
  PIECE_V = new Float64Array(8);

/** Sets plain[t] (and for a clipped triangle, plain 0, its piece signs) of triangle t (points p, q, r) and area2[t],
 * twice its |area| in the image (for a clipped triangle, of its front and back pieces together; stored, not returned:
 * a returned double is boxed). */
function triangleSigns(
  s: SliceScratch,
  t: number,
  x: Float64Array,
  y: Float64Array,
  h: Float64Array,
  u: Float64Array,
  v: Float64Array,
  p: number,
  q: number,
  r: number,
  signed: boolean,
): void {
  const side = s.side;
  if (
    signed &&
    !(side[p] === side[q] && side[q] === side[r]) &&
    Math.max(Math.abs(y[p]!), Math.abs(y[q]!), Math.abs(y[r]!)) > CLIP_EPS_MM
  ) {
    s.plain[t] = 0;
    const front = pieceArea2(s, x, y, h, p, q, r, 1),
      back = pieceArea2(s, x, y, h, p, q, r, 0);
    s.signF[t] = front >= 0 ? 1 : -1;
    s.signB[t] = back >= 0 ? 1 : -1;
    s.area2[t] = Math.abs(front) + Math.abs(back);
    return;
  }
  const a2 = (u[q]! - u[p]!) * (v[r]! - v[p]!) - (u[r]! - u[p]!) * (v[q]! - v[p]!);
  s.plain[t] = a2 >= 0 ? 1 : -1;
  s.area2[t] = Math.abs(a2);
}

/** Twice the signed area of the piece of triangle (p, q, r) on side `front` (1: x ≥ 0, mapped r = +ρ). */
function pieceArea2(
  s: SliceScratch,
  x: Float64Array,
  y: Float64Array,
  h: Float64Array,
  p: number,
  q: number,
  r: number,
  front: number,
): number {
  let n = 0;
  for (let k = 0; k < 3; k++) {
    const i = k === 0 ? p : k === 1 ? q : r;
    const j = k === 0 ? q : k === 1 ? r : p;
    const si = s.side[i]!,
      sj = s.side[j]!;
    if (si === front) {
      const rho = Math.sqrt(x[i]! * x[i]! + y[i]! * y[i]!);
      PIECE[2 * n] = front ? rho : -rho;
      PIECE[2 * n + 1] = h[i]!;
      n++;
    }
    if (si !== sj) {
      const c = s.cutInto(x, y, h, i, j);
      PIECE[2 * n] = front ? Math.abs(c[0]!) : -Math.abs(c[0]!);
      PIECE[2 * n + 1] = c[1]!;
      n++;
    }
  }
  let a2 = 0;
  for (let k = 0, l = n - 1; k < n; l = k++)
    a2 += PIECE[2 * l]! * PIECE[2 * k + 1]! - PIECE[2 * k]! * PIECE[2 * l + 1]!;
  return a2;
}

/** Emits the contributions of grid edge p→q; tf runs it forward, tb backward (−1: absent). */
function gridEdge(
  s: SliceScratch,
  cover: RowCover,
  x: Float64Array,
  y: Float64Array,
  h: Float64Array,
  u: Float64Array,
  v: Float64Array,
  p: number,
  q: number,
  tf: number,
  tb: number,
  signed: boolean,
): void {
  const side = s.side,
    plain = s.plain;
  if (!signed || side[p] === side[q]) {
    const front = side[p] === 1;
    const mf = tf < 0 ? 0 : plain[tf] !== 0 ? plain[tf]! : front ? s.signF[tf]! : s.signB[tf]!;
    const mb = tb < 0 ? 0 : plain[tb] !== 0 ? plain[tb]! : front ? s.signF[tb]! : s.signB[tb]!;
    const m = mf - mb;
    if (m !== 0) segment(s, cover, u, v, p, q, m);
    return;
  }
  // x changes sign along the edge: clipped triangles contribute the two sub-edges, unclipped ones the whole edge
  const cf = tf >= 0 && plain[tf] === 0,
    cb = tb >= 0 && plain[tb] === 0;
  const whole = (tf >= 0 && !cf ? plain[tf]! : 0) - (tb >= 0 && !cb ? plain[tb]! : 0);
  if (whole !== 0) segment(s, cover, u, v, p, q, whole);
  if (!cf && !cb) return;
  const pf = side[p] === 1;
  const mp = (cf ? (pf ? s.signF[tf]! : s.signB[tf]!) : 0) - (cb ? (pf ? s.signF[tb]! : s.signB[tb]!) : 0);
  const mq = (cf ? (pf ? s.signB[tf]! : s.signF[tf]!) : 0) - (cb ? (pf ? s.signB[tb]! : s.signF[tb]!) : 0);
  const c = s.cutInto(x, y, h, p, q);
  const ry = Math.abs(c[0]!),
    ch = c[1]!;
  // the end points go through s.endX / endY (see segment)
  const ex = s.endX,
    ey = s.endY;
  if (mp !== 0) {
    ex[0] = u[p]!;
    ey[0] = v[p]!;
    ex[1] = pf ? ry : -ry;
    ey[1] = ch;
    segment(s, cover, ex, ey, 0, 1, mp);
  }
  if (mq !== 0) {
    ex[0] = pf ? -ry : ry;
    ey[0] = ch;
    ex[1] = u[q]!;
    ey[1] = v[q]!;
    segment(s, cover, ex, ey, 0, 1, mq);
  }
}

/**
 * The cut edges of a clipped triangle (p, q, r): the front piece runs from the cut where the outline leaves the
 * front side to the cut where it comes back, at r = +|y|; the back piece runs the other way at r = −|y|.
 */
function cutEdges(
  s: SliceScratch,
  cover: RowCover,
  x: Float64Array,
  y: Float64Array,
  h: Float64Array,
  p: number,
  q: number,
  r: number,
  signF: number,
  signB: number,
): void {
  let exitY = 0,
    exitH = 0,
    entryY = 0,
    entryH = 0;
  for (let k = 0; k < 3; k++) {
    const i = k === 0 ? p : k === 1 ? q : r;
    const j = k === 0 ? q : k === 1 ? r : p;
    const si = s.side[i]!,
      sj = s.side[j]!;
    if (si === sj) continue;
    const c = s.cutInto(x, y, h, i, j);
    if (si === 1) {
      exitY = Math.abs(c[0]!);
      exitH = c[1]!;
    } else {
      entryY = Math.abs(c[0]!);
      entryH = c[1]!;
    }
  }
  // the end points go through s.endX / endY (see segment)
  const ex = s.endX,
    ey = s.endY;
  ex[0] = exitY;
  ey[0] = exitH;
  ex[1] = entryY;
  ey[1] = entryH;
  segment(s, cover, ex, ey, 0, 1, signF);
  ex[0] = -entryY;
  ey[0] = entryH;
  ex[1] = -exitY;
  ey[1] = exitH;
  segment(s, cover, ex, ey, 0, 1, signB);
}

/** Full outline of the two pieces of a triangle given by coordinates (for addTriangles). */
function clipOutline(s: SliceScratch, cover: RowCover, x: Float64Array, y: Float64Array, h: Float64Array): void {
  // the piece's corners (r, h), one array per coordinate for segment()
  const pu = PIECE_U,
    pv = PIECE_V;
  for (let front = 1; front >= 0; front--) {
    let n = 0;
    for (let k = 0; k < 3; k++) {
      const l = (k + 1) % 3;
      const sk = x[k]! >= 0 ? 1 : 0,
        sl = x[l]! >= 0 ? 1 : 0;
      if (sk === front) {
        const rho = Math.sqrt(x[k]! * x[k]! + y[k]! * y[k]!);
        pu[n] = front ? rho : -rho;
        pv[n] = h[k]!;
        n++;
      }
      if (sk !== sl) {
        const t = x[k]! / (x[k]! - x[l]!);
        const yc = Math.abs(y[k]! + t * (y[l]! - y[k]!));
        pu[n] = front ? yc : -yc;
        pv[n] = h[k]! + t * (h[l]! - h[k]!);
        n++;
      }
    }
    if (n < 3) continue;
    let a2 = 0;
    for (let k = 0, l = n - 1; k < n; l = k++) a2 += pu[l]! * pv[k]! - pu[k]! * pv[l]!;
    if (a2 === 0) continue;
    const m = a2 > 0 ? 1 : -1;
    for (let k = 0, l = n - 1; k < n; l = k++) segment(s, cover, pu, pv, l, k, m);
  }
}

/**
 * Marks every grid edge conservatively: the x-extent of the edge within each row band it crosses, widened. In
 * signed-radius mode (`clip` given) an edge whose x changes sign is split where it crosses x = 0, and each piece is
 * mapped on its own side (r = ±|y| at the cut), so the jump of r across the axis is not filled in.
 */
function addConservative(
  cover: RowCover,
  u: Float64Array,
  v: Float64Array,
  na: number,
  nb: number,
  widen: number,
  umin: number,
  umax: number,
  vmin: number,
  vmax: number,
  continuous: boolean,
  clip: { s: SliceScratch; x: Float64Array; y: Float64Array; h: Float64Array } | null = null,
): void {
  const yb = cover.y0,
    dy = cover.dy;
  const jlo = Math.ceil((vmin - yb) / dy - 0.5),
    jhi = Math.floor((vmax - yb) / dy + 0.5);
  if (jlo === jhi && continuous) {
    // the whole (connected) image lies in one row band: its x-extent is one interval
    cover.add(jlo, umin - widen, umax + widen);
    return;
  }
  const mark = (p: number, q: number) => {
    if (
      clip &&
      clip.s.side[p] !== clip.s.side[q] &&
      Math.max(Math.abs(clip.y[p]!), Math.abs(clip.y[q]!)) > CLIP_EPS_MM
    ) {
      const c = clip.s.cutInto(clip.x, clip.y, clip.h, p, q);
      const rc = Math.abs(c[0]!),
        hc = c[1]!;
      markSegment(u[p]!, v[p]!, clip.s.side[p] ? rc : -rc, hc);
      markSegment(clip.s.side[q] ? rc : -rc, hc, u[q]!, v[q]!);
      return;
    }
    markSegment(u[p]!, v[p]!, u[q]!, v[q]!);
  };
  const markSegment = (x0: number, y0: number, x1: number, y1: number) => {
    const lo = Math.min(y0, y1),
      hi = Math.max(y0, y1);
    const j0 = Math.ceil((lo - yb) / dy - 0.5),
      j1 = Math.floor((hi - yb) / dy + 0.5);
    for (let j = j0; j <= j1; j++) {
      const bandLo = yb + (j - 0.5) * dy,
        bandHi = yb + (j + 0.5) * dy;
      let t0 = 0,
        t1 = 1;
      if (y1 !== y0) {
        const ta = (bandLo - y0) / (y1 - y0),
          tb = (bandHi - y0) / (y1 - y0);
        t0 = Math.max(0, Math.min(ta, tb));
        t1 = Math.min(1, Math.max(ta, tb));
        if (t0 > t1) continue;
      }
      const xa = x0 + t0 * (x1 - x0),
        xb = x0 + t1 * (x1 - x0);
      const a = Math.min(xa, xb) - widen,
        b = Math.max(xa, xb) + widen;
      if (!cover.covers(j, a, b)) cover.add(j, a, b);
    }
  };
  for (let ia = 0; ia < na; ia++) {
    for (let ib = 0; ib < nb; ib++) {
      const p = ia * nb + ib;
      if (ia + 1 < na) mark(p, p + nb);
      if (ib + 1 < nb) mark(p, p + 1);
      if (na === 1 && nb === 1) mark(p, p);
    }
  }
}
