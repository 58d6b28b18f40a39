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
 */
import type { RowCover } from "./rowCover";

export class SliceScratch {
  rows = new Int32Array(1 << 14);
  xs = new Float64Array(1 << 14);
  ds = new Int8Array(1 << 14);
  count = 0;
  sortedXs = new Float64Array(1 << 14);
  sortedDs = new Int8Array(1 << 14);
  rowCount = new Int32Array(1024);
  /** per triangle: 1 when clipped; piece signs front / back (±1) */
  clipped = new Uint8Array(1024);
  signF = new Int8Array(1024);
  signB = new Int8Array(1024);
  /** per point: mapped horizontal coordinate and side (1 = x ≥ 0) */
  u = new Float64Array(1024);
  side = new Uint8Array(1024);
  /** cut point of the current edge: (y, h) */
  private readonly cut = new Float64Array(2);
  /** pending band mark (row, x-interval): consecutive outline segments mostly mark the same row, so their marks are
   * merged first; a mark then enters the crossings as a pair (+1 at its start, −1 at its end), so the winding sweep
   * of flush() unites it with the filled intervals at no extra cost to the cover */
  private markRow = 0;
  private markLo = Infinity;
  private markHi = -Infinity;

  /** Marks [a, b] on row j (merged with the pending mark when they touch). */
  mark(j: number, a: number, b: number): void {
    if (j === this.markRow && a <= this.markHi && b >= this.markLo) {
      if (a < this.markLo) this.markLo = a;
      if (b > this.markHi) this.markHi = b;
      return;
    }
    this.flushMark();
    this.markRow = j;
    this.markLo = a;
    this.markHi = b;
  }

  /** Records the pending mark as two crossings. */
  flushMark(): void {
    if (this.markLo <= this.markHi) {
      this.reserve(2);
      const c = this.count;
      this.rows[c] = this.rows[c + 1] = this.markRow;
      this.xs[c] = this.markLo;
      this.xs[c + 1] = this.markHi;
      this.ds[c] = 1;
      this.ds[c + 1] = -1;
      this.count = c + 2;
    }
    this.markLo = Infinity;
    this.markHi = -Infinity;
  }

  ensurePoints(n: number): void {
    if (this.u.length < n) {
      this.u = new Float64Array(2 * n);
      this.side = new Uint8Array(2 * n);
    }
    if (this.clipped.length < 2 * n) {
      this.clipped = new Uint8Array(4 * n);
      this.signF = new Int8Array(4 * n);
      this.signB = new Int8Array(4 * n);
    }
  }

  /** Makes room for `extra` more crossings. */
  reserve(extra: number): void {
    if (this.count + extra > this.xs.length) {
      const n = Math.max(2 * this.xs.length, this.count + extra);
      const rows = new Int32Array(n), xs = new Float64Array(n), ds = new Int8Array(n);
      rows.set(this.rows);
      xs.set(this.xs);
      ds.set(this.ds);
      this.rows = rows;
      this.xs = xs;
      this.ds = ds;
      this.sortedXs = new Float64Array(n);
      this.sortedDs = new Int8Array(n);
    }
  }

  /** Cut point of segment p–q at x = 0, computed from the lower index first so both triangles agree. */
  cutInto(x: Float64Array, y: Float64Array, h: Float64Array, p: number, q: number): Float64Array {
    const a = p < q ? p : q, b = p < q ? q : p;
    const t = x[a]! / (x[a]! - x[b]!);
    this.cut[0] = y[a]! + t * (y[b]! - y[a]!);
    this.cut[1] = h[a]! + t * (h[b]! - h[a]!);
    return this.cut;
  }
}

/** Options of addSlice. */
export interface SliceMode {
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
export function addSlice(cover: RowCover, c0: Float64Array, c1: Float64Array, c2: Float64Array, na: number, nb: number, mode: SliceMode, s: SliceScratch): void {
  const np = na * nb;
  s.ensurePoints(np);
  const u = s.u, side = s.side, signed = mode.signedRadius;
  const v = signed ? c2 : c1;
  let umin = Infinity, umax = -Infinity, vmin = Infinity, vmax = -Infinity;
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
  const cellsA = na - 1, cellsB = nb - 1;
  const clipped = s.clipped, sF = s.signF, sB = s.signB;
  let areaSum = 0, clips = 0;
  for (let ia = 0; ia < cellsA; ia++) {
    for (let ib = 0; ib < cellsB; ib++) {
      const p00 = ia * nb + ib, p10 = p00 + nb, p01 = p00 + 1, p11 = p10 + 1;
      const t = 2 * (ia * cellsB + ib);
      areaSum += triangleSigns(s, t, c0, c1, c2, u, v, p00, p10, p11, signed);
      areaSum += triangleSigns(s, t + 1, c0, c1, c2, u, v, p00, p11, p01, signed);
      clips += clipped[t]! + clipped[t + 1]!;
    }
  }
  areaSum /= 2;
  const extent = Math.max(umax - umin, vmax - vmin, 1e-12);
  // (a thin image that crosses the axis counts too: its clipped pieces have no area to fill either)
  if (cellsA === 0 || cellsB === 0 || areaSum < 0.25 * dy * extent) {
    addConservative(cover, u, v, na, nb, 0.5 * mode.nodeSpacingMm, umin, umax, vmin, vmax, !signed, signed ? { s, x: c0, y: c1, h: c2 } : null);
    return;
  }
  s.count = 0;
  const nTri = 2 * cellsA * cellsB;
  // triangle index or −1 outside the grid
  const tri = (ia: number, ib: number, which: number): number => (ia < 0 || ib < 0 || ia >= cellsA || ib >= cellsB ? -1 : 2 * (ia * cellsB + ib) + which);
  // a-edges (ia,ib)→(ia+1,ib): T1 of cell (ia,ib) runs forward, T2 of cell (ia,ib−1) backward. With a periodic b
  // the rows ib = 0 and ib = nb − 1 are one seam: drawn once, between the last and the first cells.
  const pb = mode.periodicB && nb > 2, pa = mode.periodicA && na > 2;
  for (let ia = 0; ia < cellsA; ia++) {
    for (let ib = 0; ib < nb; ib++) {
      if (pb && ib === nb - 1) continue;
      const back = pb && ib === 0 ? tri(ia, cellsB - 1, 1) : tri(ia, ib - 1, 1);
      gridEdge(s, cover, c0, c1, c2, u, v, ia * nb + ib, (ia + 1) * nb + ib, tri(ia, ib, 0), back, signed);
    }
  }
  // b-edges (ia,ib)→(ia,ib+1): T1 of cell (ia−1,ib) runs forward, T2 of cell (ia,ib) backward
  for (let ia = 0; ia < na; ia++) {
    if (pa && ia === na - 1) continue;
    for (let ib = 0; ib < cellsB; ib++) {
      const fwd = pa && ia === 0 ? tri(cellsA - 1, ib, 0) : tri(ia - 1, ib, 0);
      gridEdge(s, cover, c0, c1, c2, u, v, ia * nb + ib, ia * nb + ib + 1, fwd, tri(ia, ib, 1), signed);
    }
  }
  // diagonals (ia,ib)→(ia+1,ib+1): T2 runs forward, T1 backward
  for (let ia = 0; ia < cellsA; ia++) {
    for (let ib = 0; ib < cellsB; ib++) gridEdge(s, cover, c0, c1, c2, u, v, ia * nb + ib, (ia + 1) * nb + ib + 1, tri(ia, ib, 1), tri(ia, ib, 0), signed);
  }
  if (clips > 0) {
    for (let t = 0; t < nTri; t++) {
      if (!clipped[t]) continue;
      const cell = t >> 1, ia = Math.floor(cell / cellsB), ib = cell - ia * cellsB;
      const p00 = ia * nb + ib, p10 = p00 + nb, p01 = p00 + 1, p11 = p10 + 1;
      if ((t & 1) === 0) cutEdges(s, cover, c0, c1, c2, p00, p10, p11, sF[t]!, sB[t]!);
      else cutEdges(s, cover, c0, c1, c2, p00, p11, p01, sF[t]!, sB[t]!);
    }
  }
  flush(s, cover);
}

/**
 * Adds triangles given by their three points each (x, y, h or x, y, –), flat: 9 numbers per triangle, each triangle
 * filled on its own (clipped at x = 0 in signed-radius mode).
 */
export function addTriangles(cover: RowCover, tris: Float64Array, count: number, signed: boolean, s: SliceScratch): void {
  s.count = 0;
  const x = TRI_X, y = TRI_Y, h = TRI_H, uu = TRI_U, vv = TRI_V;
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
    const mixed = signed && !((x[0]! >= 0) === (x[1]! >= 0) && (x[1]! >= 0) === (x[2]! >= 0));
    if (mixed && Math.max(Math.abs(y[0]!), Math.abs(y[1]!), Math.abs(y[2]!)) > CLIP_EPS_MM) {
      clipOutline(s, cover, x, y, h);
    } else {
      const a2 = (uu[1]! - uu[0]!) * (vv[2]! - vv[0]!) - (uu[2]! - uu[0]!) * (vv[1]! - vv[0]!);
      if (a2 === 0) continue;
      const m = a2 > 0 ? 1 : -1;
      segment(s, cover, uu[0]!, vv[0]!, uu[1]!, vv[1]!, m);
      segment(s, cover, uu[1]!, vv[1]!, uu[2]!, vv[2]!, m);
      segment(s, cover, uu[2]!, vv[2]!, uu[0]!, vv[0]!, m);
    }
  }
  flush(s, cover);
}

const TRI_X = new Float64Array(3), TRI_Y = new Float64Array(3), TRI_H = new Float64Array(3);
const TRI_U = new Float64Array(3), TRI_V = new Float64Array(3);
const PIECE = new Float64Array(16);

/** Sets clipped / piece signs of triangle t (points p, q, r) and returns twice its |area| in the image (for a
 * clipped triangle, of its front and back pieces together). */
function triangleSigns(s: SliceScratch, t: number, x: Float64Array, y: Float64Array, h: Float64Array, u: Float64Array, v: Float64Array, p: number, q: number, r: number, signed: boolean): number {
  const side = s.side;
  if (signed && !(side[p] === side[q] && side[q] === side[r]) && Math.max(Math.abs(y[p]!), Math.abs(y[q]!), Math.abs(y[r]!)) > CLIP_EPS_MM) {
    s.clipped[t] = 1;
    const front = pieceArea2(s, x, y, h, p, q, r, 1), back = pieceArea2(s, x, y, h, p, q, r, 0);
    s.signF[t] = front >= 0 ? 1 : -1;
    s.signB[t] = back >= 0 ? 1 : -1;
    return Math.abs(front) + Math.abs(back);
  }
  const a2 = (u[q]! - u[p]!) * (v[r]! - v[p]!) - (u[r]! - u[p]!) * (v[q]! - v[p]!);
  const sg = a2 >= 0 ? 1 : -1;
  s.clipped[t] = 0;
  s.signF[t] = sg;
  s.signB[t] = sg;
  return Math.abs(a2);
}

/** Twice the signed area of the piece of triangle (p, q, r) on side `front` (1: x ≥ 0, mapped r = +ρ). */
function pieceArea2(s: SliceScratch, x: Float64Array, y: Float64Array, h: Float64Array, p: number, q: number, r: number, front: number): number {
  let n = 0;
  for (let k = 0; k < 3; k++) {
    const i = k === 0 ? p : k === 1 ? q : r;
    const j = k === 0 ? q : k === 1 ? r : p;
    const si = s.side[i]!, sj = s.side[j]!;
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
  for (let k = 0, l = n - 1; k < n; l = k++) a2 += PIECE[2 * l]! * PIECE[2 * k + 1]! - PIECE[2 * k]! * PIECE[2 * l + 1]!;
  return a2;
}

/** Emits the contributions of grid edge p→q; tf runs it forward, tb backward (−1: absent). */
function gridEdge(s: SliceScratch, cover: RowCover, x: Float64Array, y: Float64Array, h: Float64Array, u: Float64Array, v: Float64Array, p: number, q: number, tf: number, tb: number, signed: boolean): void {
  const side = s.side;
  if (!signed || side[p] === side[q]) {
    const front = side[p] === 1;
    const mf = tf < 0 ? 0 : front ? s.signF[tf]! : s.signB[tf]!;
    const mb = tb < 0 ? 0 : front ? s.signF[tb]! : s.signB[tb]!;
    const m = mf - mb;
    if (m !== 0) segment(s, cover, u[p]!, v[p]!, u[q]!, v[q]!, m);
    return;
  }
  // x changes sign along the edge: clipped triangles contribute the two sub-edges, unclipped ones the whole edge
  const cf = tf >= 0 && s.clipped[tf] === 1, cb = tb >= 0 && s.clipped[tb] === 1;
  const whole = (tf >= 0 && !cf ? s.signF[tf]! : 0) - (tb >= 0 && !cb ? s.signF[tb]! : 0);
  if (whole !== 0) segment(s, cover, u[p]!, v[p]!, u[q]!, v[q]!, whole);
  if (!cf && !cb) return;
  const pf = side[p] === 1;
  const mp = (cf ? (pf ? s.signF[tf]! : s.signB[tf]!) : 0) - (cb ? (pf ? s.signF[tb]! : s.signB[tb]!) : 0);
  const mq = (cf ? (pf ? s.signB[tf]! : s.signF[tf]!) : 0) - (cb ? (pf ? s.signB[tb]! : s.signF[tb]!) : 0);
  const c = s.cutInto(x, y, h, p, q);
  const ry = Math.abs(c[0]!), ch = c[1]!;
  if (mp !== 0) segment(s, cover, u[p]!, v[p]!, pf ? ry : -ry, ch, mp);
  if (mq !== 0) segment(s, cover, pf ? -ry : ry, ch, u[q]!, v[q]!, mq);
}

/**
 * The cut edges of a clipped triangle (p, q, r): the front piece runs from the cut where the outline leaves the
 * front side to the cut where it comes back, at r = +|y|; the back piece runs the other way at r = −|y|.
 */
function cutEdges(s: SliceScratch, cover: RowCover, x: Float64Array, y: Float64Array, h: Float64Array, p: number, q: number, r: number, signF: number, signB: number): void {
  let exitY = 0, exitH = 0, entryY = 0, entryH = 0;
  for (let k = 0; k < 3; k++) {
    const i = k === 0 ? p : k === 1 ? q : r;
    const j = k === 0 ? q : k === 1 ? r : p;
    const si = s.side[i]!, sj = s.side[j]!;
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
  segment(s, cover, exitY, exitH, entryY, entryH, signF);
  segment(s, cover, -entryY, entryH, -exitY, exitH, signB);
}

/** Full outline of the two pieces of a triangle given by coordinates (for addTriangles). */
function clipOutline(s: SliceScratch, cover: RowCover, x: Float64Array, y: Float64Array, h: Float64Array): void {
  for (const front of [1, 0]) {
    let n = 0;
    for (let k = 0; k < 3; k++) {
      const l = (k + 1) % 3;
      const sk = x[k]! >= 0 ? 1 : 0, sl = x[l]! >= 0 ? 1 : 0;
      if (sk === front) {
        const rho = Math.sqrt(x[k]! * x[k]! + y[k]! * y[k]!);
        PIECE[2 * n] = front ? rho : -rho;
        PIECE[2 * n + 1] = h[k]!;
        n++;
      }
      if (sk !== sl) {
        const t = x[k]! / (x[k]! - x[l]!);
        const yc = Math.abs(y[k]! + t * (y[l]! - y[k]!));
        PIECE[2 * n] = front ? yc : -yc;
        PIECE[2 * n + 1] = h[k]! + t * (h[l]! - h[k]!);
        n++;
      }
    }
    if (n < 3) continue;
    let a2 = 0;
    for (let k = 0, l = n - 1; k < n; l = k++) a2 += PIECE[2 * l]! * PIECE[2 * k + 1]! - PIECE[2 * k]! * PIECE[2 * l + 1]!;
    if (a2 === 0) continue;
    const m = a2 > 0 ? 1 : -1;
    for (let k = 0, l = n - 1; k < n; l = k++) segment(s, cover, PIECE[2 * l]!, PIECE[2 * l + 1]!, PIECE[2 * k]!, PIECE[2 * k + 1]!, m);
  }
}

/**
 * Records the crossings of segment (x0, y0)→(x1, y1) (multiplicity m, negative = reversed) with the row lines, such
 * that each row j receives the segment's x-extent within the row's band |y − y_j| ≤ dy/2, not only its point on the
 * row line: a crossing that opens an interval (it raises the winding number sweeping left to right) moves left by the
 * segment's band run (at most dy/2 · |dx/dy|, the segment's x-extent within the band), one that closes an interval
 * moves right as far, and the pieces of the segment in the bands of its two end points are marked explicitly (see
 * markEnds).
 *
 * So every row holds the projection of the region's part within its band, not only its section by the row line: a
 * point of the region in band j either drops vertically onto row j inside the region or meets the outline, which
 * lies on such segments, on the way. With sections alone the parts between two row lines were lost: a corner poking
 * between rows and, worse, a thin slanted strip, whose row sections do not overlap from row to row and so were
 * outlined as separate specks (found by the property tests: misses of 40–80 mm with dy ≈ 20 mm). Moving crossings
 * outward only raises the winding number, so the result is the union of the filled rows and the band pieces; it
 * moves a slanted boundary out by its band run, at most dy/2 measured across the boundary.
 */
function segment(s: SliceScratch, cover: RowCover, x0: number, y0: number, x1: number, y1: number, m: number): void {
  markEnds(s, cover, x0, y0, x1, y1);
  if (m < 0) {
    const tx = x0, ty = y0;
    x0 = x1;
    y0 = y1;
    x1 = tx;
    y1 = ty;
    m = -m;
  }
  if (y0 === y1) return;
  // going down adds +m when sweeping left to right (counter-clockwise outline)
  const d = y1 < y0 ? m : -m;
  const lo = y0 < y1 ? y0 : y1, hi = y0 < y1 ? y1 : y0;
  const yb = cover.y0, dy = cover.dy;
  const j0 = Math.ceil((lo - yb) / dy), j1 = Math.ceil((hi - yb) / dy) - 1;
  if (j1 < j0) return;
  s.reserve(j1 - j0 + 1);
  const slope = (x1 - x0) / (y1 - y0);
  // opening crossings (d > 0) move left, closing ones right, to the end of the segment's piece within the band
  // (clipped to the segment: a nearly level segment has a long band run)
  const left = d > 0 === slope > 0 ? -0.5 * dy : 0.5 * dy;
  const rows = s.rows, xs = s.xs, ds = s.ds;
  let c = s.count;
  for (let j = j0; j <= j1; j++) {
    let y = yb + j * dy + left;
    y = y < lo ? lo : y > hi ? hi : y;
    rows[c] = j;
    xs[c] = x0 + (y - y0) * slope;
    ds[c] = d;
    c++;
  }
  s.count = c;
}

/**
 * Marks on rows j0 and j1, the rows whose bands hold the segment's end points, its x-extent within those bands (the
 * whole segment when both ends share a band), where the segment does not cross that row's line: there no shifted
 * crossing reaches the part of the segment between its end point and the band's edge (a corner poking between two
 * row lines). Where it does cross it, the shifted crossing covers the band piece already.
 */
function markEnds(s: SliceScratch, cover: RowCover, x0: number, y0: number, x1: number, y1: number): void {
  const yb = cover.y0, dy = cover.dy;
  const lo = y0 < y1 ? y0 : y1, hi = y0 < y1 ? y1 : y0;
  const j0 = Math.round((lo - yb) / dy), j1 = Math.round((hi - yb) / dy);
  // row lines y_j with lo ≤ y_j < hi get a crossing (see segment)
  const r0 = yb + j0 * dy, r1 = yb + j1 * dy;
  if (j0 === j1) {
    if (!(lo <= r0 && r0 < hi)) s.mark(j0, x0 < x1 ? x0 : x1, x0 < x1 ? x1 : x0);
    return;
  }
  const slope = (x1 - x0) / (y1 - y0);
  // the start's band first: the next segment of a chain then marks the same row and merges with it
  for (let e = 0; e < 2; e++) {
    const j = (e === 0) === (y0 <= y1) ? j0 : j1, rj = j === j0 ? r0 : r1;
    if (lo <= rj && rj < hi) continue;
    const ya = Math.max(lo, yb + (j - 0.5) * dy), yc = Math.min(hi, yb + (j + 0.5) * dy);
    const xa = x0 + (ya - y0) * slope, xc = x0 + (yc - y0) * slope;
    s.mark(j, xa < xc ? xa : xc, xa < xc ? xc : xa);
  }
}

/** Sorts the recorded crossings by row and x, sweeps the winding number and adds the covered intervals. */
function flush(s: SliceScratch, cover: RowCover): void {
  s.flushMark();
  const n = s.count;
  if (n === 0) return;
  let jlo = Infinity, jhi = -Infinity;
  for (let k = 0; k < n; k++) {
    const j = s.rows[k]!;
    if (j < jlo) jlo = j;
    if (j > jhi) jhi = j;
  }
  const span = jhi - jlo + 1;
  if (s.rowCount.length < span + 1) s.rowCount = new Int32Array(2 * (span + 1));
  const counts = s.rowCount;
  counts.fill(0, 0, span + 1);
  for (let k = 0; k < n; k++) {
    const r = s.rows[k]! - jlo + 1;
    counts[r] = counts[r]! + 1;
  }
  for (let r = 1; r <= span; r++) counts[r] = counts[r]! + counts[r - 1]!;
  const xs = s.sortedXs, ds = s.sortedDs;
  for (let k = 0; k < n; k++) {
    const r = s.rows[k]! - jlo;
    const slot = counts[r]!;
    counts[r] = slot + 1;
    xs[slot] = s.xs[k]!;
    ds[slot] = s.ds[k]!;
  }
  // counts[r] is now the end of row r's block; its start is counts[r − 1] (0 for r = 0)
  for (let r = 0; r < span; r++) {
    const start = r === 0 ? 0 : counts[r - 1]!, end = counts[r]!;
    if (end - start < 2) continue;
    sortRow(xs, ds, start, end);
    let w = 0, open = 0;
    const j = jlo + r;
    for (let k = start; k < end; k++) {
      const before = w;
      w += ds[k]!;
      if (before <= 0 && w > 0) open = xs[k]!;
      else if (before > 0 && w <= 0 && xs[k]! > open) cover.add(j, open, xs[k]!);
    }
  }
  s.count = 0;
}

/** Sorts xs[start..end) ascending, carrying ds along: insertion sort, with shell-sort gaps for long rows. */
function sortRow(xs: Float64Array, ds: Int8Array, start: number, end: number): void {
  const n = end - start;
  let gap = 1;
  if (n > 24) while (gap < n / 3) gap = 3 * gap + 1;
  for (; gap >= 1; gap = (gap - 1) / 3) {
    for (let k = start + gap; k < end; k++) {
      const x = xs[k]!, d = ds[k]!;
      let i = k - gap;
      while (i >= start && xs[i]! > x) {
        xs[i + gap] = xs[i]!;
        ds[i + gap] = ds[i]!;
        i -= gap;
      }
      xs[i + gap] = x;
      ds[i + gap] = d;
    }
  }
}

/**
 * Marks every grid edge conservatively: the x-extent of the edge within each row band it crosses, widened. In
 * signed-radius mode (`clip` given) an edge whose x changes sign is split where it crosses x = 0, and each piece is
 * mapped on its own side (r = ±|y| at the cut), so the jump of r across the axis is not filled in.
 */
function addConservative(cover: RowCover, u: Float64Array, v: Float64Array, na: number, nb: number, widen: number, umin: number, umax: number, vmin: number, vmax: number, continuous: boolean, clip: { s: SliceScratch; x: Float64Array; y: Float64Array; h: Float64Array } | null = null): void {
  const yb = cover.y0, dy = cover.dy;
  const jlo = Math.ceil((vmin - yb) / dy - 0.5), jhi = Math.floor((vmax - yb) / dy + 0.5);
  if (jlo === jhi && continuous) {
    // the whole (connected) image lies in one row band: its x-extent is one interval
    cover.add(jlo, umin - widen, umax + widen);
    return;
  }
  const mark = (p: number, q: number) => {
    if (clip && clip.s.side[p] !== clip.s.side[q] && Math.max(Math.abs(clip.y[p]!), Math.abs(clip.y[q]!)) > CLIP_EPS_MM) {
      const c = clip.s.cutInto(clip.x, clip.y, clip.h, p, q);
      const rc = Math.abs(c[0]!), hc = c[1]!;
      markSegment(u[p]!, v[p]!, clip.s.side[p] ? rc : -rc, hc);
      markSegment(clip.s.side[q] ? rc : -rc, hc, u[q]!, v[q]!);
      return;
    }
    markSegment(u[p]!, v[p]!, u[q]!, v[q]!);
  };
  const markSegment = (x0: number, y0: number, x1: number, y1: number) => {
    const lo = Math.min(y0, y1), hi = Math.max(y0, y1);
    const j0 = Math.ceil((lo - yb) / dy - 0.5), j1 = Math.floor((hi - yb) / dy + 0.5);
    for (let j = j0; j <= j1; j++) {
      const bandLo = yb + (j - 0.5) * dy, bandHi = yb + (j + 0.5) * dy;
      let t0 = 0, t1 = 1;
      if (y1 !== y0) {
        const ta = (bandLo - y0) / (y1 - y0), tb = (bandHi - y0) / (y1 - y0);
        t0 = Math.max(0, Math.min(ta, tb));
        t1 = Math.min(1, Math.max(ta, tb));
        if (t0 > t1) continue;
      }
      const xa = x0 + t0 * (x1 - x0), xb = x0 + t1 * (x1 - x0);
      const a = Math.min(xa, xb) - widen, b = Math.max(xa, xb) + widen;
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
