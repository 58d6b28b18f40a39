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

export class SliceScratch {
  rows = new Int32Array(1 << 14);
  xs = new Float64Array(1 << 14);
  ds = new Int8Array(1 << 14);
  count = 0;
  sortedXs = new Float64Array(1 << 14);
  /** multiplicities after sorting: Int32, as the crossings inside a covered interval add up to one (see flush) */
  sortedDs = new Int32Array(1 << 14);
  rowCount = new Int32Array(1024);
  /**
   * The window: the cover's rows winLo … winLo + winRows − 1 as they were before the slice (winRows = 0: none),
   * for flush() and segment() to set aside the crossings inside covered intervals. Their values side by side (row
   * r's from coverStart[r] on: looked up in the cover's own arrays, one per row, most crossings missed the cache),
   * and per interval the summed multiplicity of the crossings inside it (acc, interval k of the window at k).
   */
  winLo = 0;
  winRows = 0;
  coverValues = new Float64Array(1024);
  coverStart = new Int32Array(1024);
  acc = new Int32Array(512);
  /** per window row, two lanes: the two widest intervals, the left one first (one interval: it, twice; none: an
   * empty range), their ends and index in the row; per lane, a difference array over the rows of the multiplicities
   * credited to it by whole runs of rows (see segment) */
  laneLo0 = new Float64Array(1024);
  laneHi0 = new Float64Array(1024);
  laneLo1 = new Float64Array(1024);
  laneHi1 = new Float64Array(1024);
  laneIdx0 = new Int32Array(1024);
  laneIdx1 = new Int32Array(1024);
  laneDiff0 = new Int32Array(1024);
  laneDiff1 = new Int32Array(1024);
  /** per triangle: its orientation (±1), or 0 when clipped; then the signs of its front and back pieces (±1) */
  plain = new Int8Array(1024);
  signF = new Int8Array(1024);
  signB = new Int8Array(1024);
  /** per triangle: twice its area (set by triangleSigns only); the clipped triangles of a slice */
  area2 = new Float64Array(1024);
  clipList = new Int32Array(1024);
  /** per point: mapped horizontal coordinate and side (1 = x ≥ 0) */
  u = new Float64Array(1024);
  side = new Uint8Array(1024);
  /** cut point of the current edge: (y, h) */
  private readonly cut = new Float64Array(2);
  /** end points of a segment given by coordinates (see segment) */
  readonly endX = new Float64Array(2);
  readonly endY = new Float64Array(2);
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

  /** Records the pending mark as two crossings; not when it lies inside a lane of the window, where flush() would
   * only add +1 and −1 to that interval's sum. */
  flushMark(): void {
    const r = this.markRow - this.winLo,
      lo = this.markLo,
      hi = this.markHi;
    const inLane =
      r >= 0 &&
      r < this.winRows &&
      ((this.laneLo0[r]! <= lo && hi <= this.laneHi0[r]!) || (this.laneLo1[r]! <= lo && hi <= this.laneHi1[r]!));
    if (lo <= hi && !inLane) {
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
    if (this.plain.length < 2 * n) {
      this.plain = new Int8Array(4 * n);
      this.signF = new Int8Array(4 * n);
      this.signB = new Int8Array(4 * n);
      this.area2 = new Float64Array(4 * n);
      this.clipList = new Int32Array(4 * n);
    }
  }

  /** Makes room for `extra` more crossings. */
  reserve(extra: number): void {
    if (this.count + extra > this.xs.length) {
      const n = Math.max(2 * this.xs.length, this.count + extra);
      const rows = new Int32Array(n),
        xs = new Float64Array(n),
        ds = new Int8Array(n);
      rows.set(this.rows);
      xs.set(this.xs);
      ds.set(this.ds);
      this.rows = rows;
      this.xs = xs;
      this.ds = ds;
      this.sortedXs = new Float64Array(n);
      this.sortedDs = new Int32Array(n);
    }
  }

  /** Opens the window on rows jlo … jhi of the cover (see winLo). */
  openWindow(cover: RowCover, jlo: number, jhi: number): void {
    this.winRows = 0;
    if (!(jhi >= jlo) || !Number.isFinite(jlo) || !Number.isFinite(jhi)) return;
    const rows = jhi - jlo + 1;
    if (this.coverStart.length < rows + 1) {
      const n = 2 * (rows + 1);
      this.coverStart = new Int32Array(n);
      this.laneLo0 = new Float64Array(n);
      this.laneHi0 = new Float64Array(n);
      this.laneLo1 = new Float64Array(n);
      this.laneHi1 = new Float64Array(n);
      this.laneIdx0 = new Int32Array(n);
      this.laneIdx1 = new Int32Array(n);
      this.laneDiff0 = new Int32Array(n);
      this.laneDiff1 = new Int32Array(n);
    }
    const start = this.coverStart;
    let total = 0;
    for (let r = 0; r < rows; r++) {
      start[r] = total;
      total += cover.lengthOf(jlo + r);
    }
    start[rows] = total;
    if (this.coverValues.length < total) {
      this.coverValues = new Float64Array(2 * total);
      this.acc = new Int32Array(total);
    }
    const cv = this.coverValues;
    const lo0 = this.laneLo0,
      hi0 = this.laneHi0,
      lo1 = this.laneLo1,
      hi1 = this.laneHi1;
    const idx0 = this.laneIdx0,
      idx1 = this.laneIdx1;
    for (let r = 0; r < rows; r++) {
      const v = cover.valuesOf(jlo + r),
        o = start[r]!,
        len = start[r + 1]! - o;
      for (let i = 0; i < len; i++) cv[o + i] = v[i]!;
      // the two widest intervals
      let w1 = -1,
        w2 = -1;
      for (let i = 0; i < len; i += 2) {
        const w = v[i + 1]! - v[i]!;
        if (w1 < 0 || w > v[w1 + 1]! - v[w1]!) {
          w2 = w1;
          w1 = i;
        } else if (w2 < 0 || w > v[w2 + 1]! - v[w2]!) w2 = i;
      }
      if (w2 < 0) w2 = w1;
      const a = w1 < w2 ? w1 : w2,
        b = w1 < w2 ? w2 : w1;
      lo0[r] = a < 0 ? Infinity : v[a]!;
      hi0[r] = a < 0 ? -Infinity : v[a + 1]!;
      idx0[r] = a >> 1;
      lo1[r] = b < 0 ? Infinity : v[b]!;
      hi1[r] = b < 0 ? -Infinity : v[b + 1]!;
      idx1[r] = b >> 1;
    }
    this.acc.fill(0, 0, total >> 1);
    this.laneDiff0.fill(0, 0, rows + 1);
    this.laneDiff1.fill(0, 0, rows + 1);
    this.winLo = jlo;
    this.winRows = rows;
  }

  /** Cut point of segment p–q at x = 0, computed from the lower index first so both triangles agree. */
  cutInto(x: Float64Array, y: Float64Array, h: Float64Array, p: number, q: number): Float64Array {
    const a = p < q ? p : q,
      b = p < q ? q : p;
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
export function addSlice(
  cover: RowCover,
  c0: Float64Array,
  c1: Float64Array,
  c2: Float64Array,
  na: number,
  nb: number,
  mode: SliceMode,
  s: SliceScratch,
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
  const sF = s.signF,
    sB = s.signB,
    plain = s.plain,
    area2 = s.area2,
    clipList = s.clipList;
  // clips: number of clipped triangles, listed in clipList in order
  let areaSum = 0,
    clips = 0;
  for (let ia = 0; ia < cellsA; ia++) {
    for (let ib = 0; ib < cellsB; ib++) {
      const p00 = ia * nb + ib,
        p10 = p00 + nb,
        p01 = p00 + 1,
        p11 = p10 + 1;
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
        const u00 = u[p00]!,
          v00 = v[p00]!,
          du10 = u[p10]! - u00,
          dv10 = v[p10]! - v00;
        const du11 = u[p11]! - u00,
          dv11 = v[p11]! - v00,
          du01 = u[p01]! - u00,
          dv01 = v[p01]! - v00;
        const a1 = du10 * dv11 - du11 * dv10,
          a2 = du11 * dv01 - du01 * dv11;
        plain[t] = a1 >= 0 ? 1 : -1;
        plain[t + 1] = a2 >= 0 ? 1 : -1;
        areaSum += Math.abs(a1);
        areaSum += Math.abs(a2);
      }
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
    return;
  }
  s.count = 0;
  // every crossing and mark of the slice lies on a row from ⌊(vmin − y0)/dy⌋ to ⌈(vmax − y0)/dy⌉ (a cut point off
  // them by a rounding error is simply not set aside)
  s.openWindow(cover, Math.floor((vmin - cover.y0) / dy), Math.ceil((vmax - cover.y0) / dy));
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
      const f = 2 * (cell0 + ib);
      if (plain[f] !== 0 && plain[f] === plain[f - 1]) continue;
      gridEdge(s, cover, c0, c1, c2, u, v, p0 + ib, p0 + nb + ib, f, f - 1, signed);
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
          b = b0 + 2 * ib;
        if (plain[f] !== 0 && plain[f] === plain[b]) continue;
        gridEdge(s, cover, c0, c1, c2, u, v, p0 + ib, p0 + ib + 1, f, b, signed);
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
      const t = t0 + 2 * ib;
      if (plain[t + 1] !== 0 && plain[t + 1] === plain[t]) continue;
      gridEdge(s, cover, c0, c1, c2, u, v, p0 + ib, p0 + nb + ib + 1, t + 1, t, signed);
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
  flush(s, cover);
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
  let vmin = Infinity,
    vmax = -Infinity;
  for (let t = 0; t < count; t++) {
    for (let k = 0; k < 3; k++) {
      const w = tris[9 * t + 3 * k + (signed ? 2 : 1)]!;
      if (w < vmin) vmin = w;
      if (w > vmax) vmax = w;
    }
  }
  s.openWindow(cover, Math.floor((vmin - cover.y0) / cover.dy), Math.ceil((vmax - cover.y0) / cover.dy));
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
  flush(s, cover);
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
 *
 * The end points are read from arrays ((px[i], py[i]) → (px[k], py[k])): this runs for every outline edge of every
 * slice, and doubles passed to a function that is not inlined are boxed, one heap allocation each (the garbage
 * collector took about a tenth of the envelope's time). Computed end points (cut points at x = 0) are written to
 * s.endX / s.endY (or a piece's corner arrays) first.
 */
function segment(
  s: SliceScratch,
  cover: RowCover,
  px: Float64Array,
  py: Float64Array,
  i: number,
  k: number,
  m: number,
): void {
  const yb = cover.y0,
    dy = cover.dy;
  const yi = py[i]!,
    yk = py[k]!;
  const lo = yi < yk ? yi : yk,
    hi = yi < yk ? yk : yi;
  // the end points' heights in row spacings, for the marks (rounded) and the crossings (rounded up)
  const qlo = (lo - yb) / dy,
    qhi = (hi - yb) / dy;
  markEnds(s, cover, px, py, i, k, Math.round(qlo), Math.round(qhi));
  // reversed: from k to i
  const from = m < 0 ? k : i,
    to = m < 0 ? i : k;
  if (m < 0) m = -m;
  const x0 = px[from]!,
    y0 = py[from]!,
    x1 = px[to]!,
    y1 = py[to]!;
  if (y0 === y1) return;
  // going down adds +m when sweeping left to right (counter-clockwise outline)
  const d = y1 < y0 ? m : -m;
  const j0 = Math.ceil(qlo),
    j1 = Math.ceil(qhi) - 1;
  if (j1 < j0) return;
  // Rows on which the whole segment lies inside a lane of the window (see flush): its crossings there would be set
  // aside into that interval anyway, so the run of rows is credited at once, without computing them. The x-extent
  // is widened by far more than the rounding error of a crossing (a few ulps), which may fall just outside it.
  let jFrom = j0;
  const r0 = j0 - s.winLo,
    r1 = j1 - s.winLo;
  if (r0 >= 0 && r1 < s.winRows) {
    const margin = 1e-9 * (Math.abs(x0) + Math.abs(x1) + 1);
    const xa = (x0 < x1 ? x0 : x1) - margin,
      xb = (x0 < x1 ? x1 : x0) + margin;
    const first = s.laneLo0[r0]! <= xa && xb <= s.laneHi0[r0]!;
    const laneLo = first ? s.laneLo0 : s.laneLo1,
      laneHi = first ? s.laneHi0 : s.laneHi1;
    let r = r0;
    while (r <= r1 && laneLo[r]! <= xa && xb <= laneHi[r]!) r++;
    if (r > r0) {
      const diff = first ? s.laneDiff0 : s.laneDiff1;
      diff[r0] = diff[r0]! + d;
      diff[r] = diff[r]! - d;
      if (r > r1) return;
      jFrom = s.winLo + r;
    }
  }
  s.reserve(j1 - jFrom + 1);
  const slope = (x1 - x0) / (y1 - y0);
  // opening crossings (d > 0) move left, closing ones right, to the end of the segment's piece within the band
  // (clipped to the segment: a nearly level segment has a long band run)
  const left = d > 0 === slope > 0 ? -0.5 * dy : 0.5 * dy;
  const rows = s.rows,
    xs = s.xs,
    ds = s.ds;
  let c = s.count;
  for (let j = jFrom; j <= j1; j++) {
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
 * row lines). Where it does cross it, the shifted crossing covers the band piece already. j0 and j1 are passed in
 * (round((lo − y0)/dy), round((hi − y0)/dy)): segment() divides by dy once for both.
 */
function markEnds(
  s: SliceScratch,
  cover: RowCover,
  px: Float64Array,
  py: Float64Array,
  i: number,
  k: number,
  j0: number,
  j1: number,
): void {
  const x0 = px[i]!,
    y0 = py[i]!,
    x1 = px[k]!,
    y1 = py[k]!;
  const yb = cover.y0,
    dy = cover.dy;
  const lo = y0 < y1 ? y0 : y1,
    hi = y0 < y1 ? y1 : y0;
  // row lines y_j with lo ≤ y_j < hi get a crossing (see segment)
  const r0 = yb + j0 * dy,
    r1 = yb + j1 * dy;
  if (j0 === j1) {
    if (!(lo <= r0 && r0 < hi)) s.mark(j0, x0 < x1 ? x0 : x1, x0 < x1 ? x1 : x0);
    return;
  }
  const slope = (x1 - x0) / (y1 - y0);
  // the start's band first: the next segment of a chain then marks the same row and merges with it
  for (let e = 0; e < 2; e++) {
    const j = (e === 0) === y0 <= y1 ? j0 : j1,
      rj = j === j0 ? r0 : r1;
    if (lo <= rj && rj < hi) continue;
    const ya = Math.max(lo, yb + (j - 0.5) * dy),
      yc = Math.min(hi, yb + (j + 0.5) * dy);
    const xa = x0 + (ya - y0) * slope,
      xc = x0 + (yc - y0) * slope;
    s.mark(j, xa < xc ? xa : xc, xa < xc ? xc : xa);
  }
}

/**
 * Sorts the recorded crossings by row and x, sweeps the winding number and adds the covered intervals.
 *
 * Crossings that fall inside an interval the cover held before the slice (the window, see SliceScratch.winLo) are
 * not sorted one by one: each such crossing is moved to the start of its interval, where their multiplicities add
 * up to one crossing (with those credited by segment() and without the marks dropped by flushMark()). That changes
 * the winding number only inside covered intervals, and the new cover (the old one united with the closure of the
 * set where the winding number is positive) stays the same set, to the last bit: with C the covered (closed)
 * intervals and U that set, C ∪ cl(U) = C ∪ cl(U \ C), and U \ C does not change. A RowCover holds a set as its
 * disjoint, non-touching intervals, so the same set gives the same numbers. Rows are left with a few crossings to
 * sort instead of tens.
 */
function flush(s: SliceScratch, cover: RowCover): void {
  s.flushMark();
  const n = s.count,
    wlo = s.winLo,
    wrows = s.winRows;
  if (n === 0 && wrows === 0) return;
  const rows = s.rows,
    xs = s.xs,
    ds = s.ds;
  const start = s.coverStart,
    cv = s.coverValues,
    acc = s.acc;
  // Keep (compacted in place) the crossings outside the window's intervals; add up the others per interval.
  // Consecutive crossings mostly come from one segment on consecutive rows, inside the same interval of each: the
  // interval of the previous crossing (its index in its row) is tried first.
  let jlo = wrows > 0 ? wlo : Infinity,
    jhi = wrows > 0 ? wlo + wrows - 1 : -Infinity;
  let kept = 0,
    guess = 0;
  for (let k = 0; k < n; k++) {
    const j = rows[k]!,
      x = xs[k]!,
      r = j - wlo;
    if (r >= 0 && r < wrows) {
      const o = start[r]!,
        m = (start[r + 1]! - o) >> 1;
      let lo = guess;
      if (!(lo < m && cv[o + 2 * lo]! <= x && x <= cv[o + 2 * lo + 1]!)) {
        // first interval whose end ≥ x
        lo = 0;
        let hi = m;
        while (lo < hi) {
          const mid = (lo + hi) >> 1;
          if (cv[o + 2 * mid + 1]! < x) lo = mid + 1;
          else hi = mid;
        }
      }
      if (lo < m && cv[o + 2 * lo]! <= x) {
        const i = (o >> 1) + lo;
        acc[i] = acc[i]! + ds[k]!;
        guess = lo;
        continue;
      }
    }
    rows[kept] = j;
    xs[kept] = x;
    ds[kept] = ds[k]!;
    kept++;
    if (j < jlo) jlo = j;
    if (j > jhi) jhi = j;
  }
  // the runs of rows credited to the lanes (see segment)
  const diff0 = s.laneDiff0,
    diff1 = s.laneDiff1,
    idx0 = s.laneIdx0,
    idx1 = s.laneIdx1;
  let run0 = 0,
    run1 = 0;
  for (let r = 0; r < wrows; r++) {
    run0 += diff0[r]!;
    run1 += diff1[r]!;
    if (run0 !== 0) acc[(start[r]! >> 1) + idx0[r]!] = acc[(start[r]! >> 1) + idx0[r]!]! + run0;
    if (run1 !== 0) acc[(start[r]! >> 1) + idx1[r]!] = acc[(start[r]! >> 1) + idx1[r]!]! + run1;
  }
  s.winRows = 0;
  // counting sort by row (rows jlo … jhi) of the kept crossings and one crossing per interval with a nonzero sum
  const span = jhi - jlo + 1;
  if (s.rowCount.length < span + 1) s.rowCount = new Int32Array(2 * (span + 1));
  const counts = s.rowCount;
  counts.fill(0, 0, span + 1);
  for (let k = 0; k < kept; k++) {
    const r = rows[k]! - jlo + 1;
    counts[r] = counts[r]! + 1;
  }
  for (let r = 0; r < wrows; r++) {
    const c = wlo + r - jlo + 1;
    for (let i = start[r]! >> 1, end = start[r + 1]! >> 1; i < end; i++) if (acc[i] !== 0) counts[c] = counts[c]! + 1;
  }
  for (let r = 1; r <= span; r++) counts[r] = counts[r]! + counts[r - 1]!;
  // counts[r] is now the start of row r's block
  const sx = s.sortedXs,
    sd = s.sortedDs;
  for (let k = 0; k < kept; k++) {
    const r = rows[k]! - jlo;
    const slot = counts[r]!;
    counts[r] = slot + 1;
    sx[slot] = xs[k]!;
    sd[slot] = ds[k]!;
  }
  for (let r = 0; r < wrows; r++) {
    const c = wlo + r - jlo;
    for (let i = start[r]! >> 1, end = start[r + 1]! >> 1; i < end; i++) {
      if (acc[i] === 0) continue;
      const slot = counts[c]!;
      counts[c] = slot + 1;
      sx[slot] = cv[2 * i]!;
      sd[slot] = acc[i]!;
    }
  }
  // counts[r] is now the end of row r's block; its start is counts[r − 1] (0 for r = 0)
  for (let r = 0; r < span; r++) {
    const from = r === 0 ? 0 : counts[r - 1]!,
      end = counts[r]!;
    if (end - from < 2) continue;
    sortRow(sx, sd, from, end);
    let w = 0,
      open = 0;
    const j = jlo + r;
    for (let k = from; k < end; k++) {
      const before = w;
      w += sd[k]!;
      if (before <= 0 && w > 0) open = sx[k]!;
      else if (before > 0 && w <= 0 && sx[k]! > open) cover.add(j, open, sx[k]!);
    }
  }
  s.count = 0;
}

/** Sorts xs[start..end) ascending, carrying ds along: insertion sort, with shell-sort gaps for long rows. */
function sortRow(xs: Float64Array, ds: Int32Array, start: number, end: number): void {
  const n = end - start;
  let gap = 1;
  if (n > 24) while (gap < n / 3) gap = 3 * gap + 1;
  for (; gap >= 1; gap = (gap - 1) / 3) {
    for (let k = start + gap; k < end; k++) {
      const x = xs[k]!,
        d = ds[k]!;
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
