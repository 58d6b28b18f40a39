/**
 * Adds the image of one sampled slice (an na × nb grid of points, each grid cell split into two triangles along
 * the diagonal (ia, ib)–(ia+1, ib+1)) to a RowCover, by scanline filling with winding numbers.
 *
 * The number of triangles covering a point equals the winding number of the sum of all triangle outlines, each
 * oriented counter-clockwise in the image. Inside the grid an edge is shared by two triangles that traverse it in
 * opposite parameter directions; their contributions cancel when both triangles keep (or both reverse) the
 * orientation of the parameter grid, and add up to a double edge where the map folds. So only the image of the
 * grid boundary and of the fold edges is scanned: the cost grows with the outline, not with the area.
 *
 * "Signed radius" mode maps (x, y, h) to (r, h) with r = ±√(x² + y²), the sign of x: a triangle whose x changes
 * sign is clipped at x = 0 and each piece is mapped on its own side, so the jump of r across x = 0 (a lateral
 * offset) is not filled in.
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
  signs = new Int8Array(1024);
  u = new Float64Array(1024);
  /** piece polygons for clipping (up to 4 vertices × (x, y, h)) */
  readonly pieceF = new Float64Array(12);
  readonly pieceB = new Float64Array(12);
  readonly pieceUV = new Float64Array(8);

  ensurePoints(n: number): void {
    if (this.u.length < n) this.u = new Float64Array(2 * n);
    if (this.signs.length < 2 * n) this.signs = new Int8Array(4 * n);
  }

  push(row: number, x: number, d: number): void {
    if (this.count === this.xs.length) {
      const n = this.count * 2;
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
    this.rows[this.count] = row;
    this.xs[this.count] = x;
    this.ds[this.count] = d;
    this.count++;
  }
}

/** Options of addSlice. */
export interface SliceMode {
  /** Map (c0, c1, c2) to (±√(c0² + c1²), c2) instead of using (c0, c1). */
  readonly signedRadius: boolean;
  /** Node spacing along x of the later isoline pass (mm); conservative marks are widened by half of it. */
  readonly nodeSpacingMm: number;
}

/**
 * Adds the image of the slice to `cover`.
 * @param c0 c1 c2 grid point coordinates (mm), index ia·nb + ib
 */
export function addSlice(cover: RowCover, c0: Float64Array, c1: Float64Array, c2: Float64Array, na: number, nb: number, mode: SliceMode, s: SliceScratch): void {
  const np = na * nb;
  s.ensurePoints(np);
  const u = s.u;
  const v = mode.signedRadius ? c2 : c1;
  let umin = Infinity, umax = -Infinity, vmin = Infinity, vmax = -Infinity;
  for (let p = 0; p < np; p++) {
    const x = c0[p]!;
    const val = mode.signedRadius ? (x >= 0 ? 1 : -1) * Math.hypot(x, c1[p]!) : x;
    u[p] = val;
    if (val < umin) umin = val;
    if (val > umax) umax = val;
    const w = v[p]!;
    if (w < vmin) vmin = w;
    if (w > vmax) vmax = w;
  }
  const dy = cover.dy;
  // Triangle signs and the total |area|.
  const cellsA = na - 1, cellsB = nb - 1;
  const signs = s.signs;
  let areaSum = 0;
  let clipped = 0;
  for (let ia = 0; ia < cellsA; ia++) {
    for (let ib = 0; ib < cellsB; ib++) {
      const p00 = ia * nb + ib, p10 = p00 + nb, p01 = p00 + 1, p11 = p10 + 1;
      const t = 2 * (ia * cellsB + ib);
      if (mode.signedRadius && needsClip(c0, c1, p00, p10, p11)) {
        signs[t] = 0;
        clipped++;
      } else {
        const a1 = area2(u, v, p00, p10, p11);
        signs[t] = a1 >= 0 ? 1 : -1;
        areaSum += Math.abs(a1);
      }
      if (mode.signedRadius && needsClip(c0, c1, p00, p11, p01)) {
        signs[t + 1] = 0;
        clipped++;
      } else {
        const a2 = area2(u, v, p00, p11, p01);
        signs[t + 1] = a2 >= 0 ? 1 : -1;
        areaSum += Math.abs(a2);
      }
    }
  }
  areaSum /= 2;
  const extent = Math.max(umax - umin, vmax - vmin, 1e-12);
  const degenerate = cellsA === 0 || cellsB === 0 || (areaSum < 0.25 * dy * extent && clipped === 0);
  if (degenerate) {
    addConservative(cover, u, v, na, nb, 0.5 * mode.nodeSpacingMm, umin, umax, vmin, vmax, !mode.signedRadius);
    return;
  }
  s.count = 0;
  const sign = (ia: number, ib: number, which: number): number =>
    ia < 0 || ib < 0 || ia >= cellsA || ib >= cellsB ? 0 : signs[2 * (ia * cellsB + ib) + which]!;
  // a-edges (ia,ib)→(ia+1,ib): T1 of cell (ia,ib) runs forward, T2 of cell (ia,ib−1) backward
  for (let ia = 0; ia < cellsA; ia++) {
    for (let ib = 0; ib < nb; ib++) {
      const m = sign(ia, ib, 0) - sign(ia, ib - 1, 1);
      if (m !== 0) edge(s, cover, u, v, ia * nb + ib, (ia + 1) * nb + ib, m);
    }
  }
  // b-edges (ia,ib)→(ia,ib+1): T1 of cell (ia−1,ib) runs forward, T2 of cell (ia,ib) backward
  for (let ia = 0; ia < na; ia++) {
    for (let ib = 0; ib < cellsB; ib++) {
      const m = sign(ia - 1, ib, 0) - sign(ia, ib, 1);
      if (m !== 0) edge(s, cover, u, v, ia * nb + ib, ia * nb + ib + 1, m);
    }
  }
  // diagonals (ia,ib)→(ia+1,ib+1): T2 runs forward, T1 backward
  for (let ia = 0; ia < cellsA; ia++) {
    for (let ib = 0; ib < cellsB; ib++) {
      const m = sign(ia, ib, 1) - sign(ia, ib, 0);
      if (m !== 0) edge(s, cover, u, v, ia * nb + ib, (ia + 1) * nb + ib + 1, m);
    }
  }
  if (clipped > 0) {
    for (let ia = 0; ia < cellsA; ia++) {
      for (let ib = 0; ib < cellsB; ib++) {
        const t = 2 * (ia * cellsB + ib);
        const p00 = ia * nb + ib, p10 = p00 + nb, p01 = p00 + 1, p11 = p10 + 1;
        if (signs[t] === 0) clipTriangle(s, cover, c0, c1, c2, p00, p10, p11);
        if (signs[t + 1] === 0) clipTriangle(s, cover, c0, c1, c2, p00, p11, p01);
      }
    }
  }
  flush(s, cover);
}

function area2(u: Float64Array, v: Float64Array, p: number, q: number, r: number): number {
  return (u[q]! - u[p]!) * (v[r]! - v[p]!) - (u[r]! - u[p]!) * (v[q]! - v[p]!);
}

/** A triangle needs clipping when its x changes sign and it lies off the x = 0 plane's axis (|y| not ≈ 0). */
function needsClip(x: Float64Array, y: Float64Array, p: number, q: number, r: number): boolean {
  const sp = x[p]! >= 0, sq = x[q]! >= 0, sr = x[r]! >= 0;
  if (sp === sq && sq === sr) return false;
  return Math.max(Math.abs(y[p]!), Math.abs(y[q]!), Math.abs(y[r]!)) > 1e-9;
}

/** Records the crossings of edge p→q (multiplicity m, negative = reversed) with the row lines. */
function edge(s: SliceScratch, cover: RowCover, u: Float64Array, v: Float64Array, p: number, q: number, m: number): void {
  segment(s, cover, u[p]!, v[p]!, u[q]!, v[q]!, m);
}

function segment(s: SliceScratch, cover: RowCover, x0: number, y0: number, x1: number, y1: number, m: number): void {
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
  const lo = Math.min(y0, y1), hi = Math.max(y0, y1);
  const yb = cover.y0, dy = cover.dy;
  const j0 = Math.ceil((lo - yb) / dy), j1 = Math.ceil((hi - yb) / dy) - 1;
  const slope = (x1 - x0) / (y1 - y0);
  for (let j = j0; j <= j1; j++) {
    const y = yb + j * dy;
    s.push(j, x0 + (y - y0) * slope, d);
  }
}

/** Sorts the recorded crossings by row and x, sweeps the winding number and adds the covered intervals. */
export const STATS = { flushes: 0, crossings: 0, maxRow: 0, spans: 0 };
function flush(s: SliceScratch, cover: RowCover): void {
  const n = s.count;
  STATS.flushes++; STATS.crossings += n;
  if (n === 0) return;
  let jlo = Infinity, jhi = -Infinity;
  for (let k = 0; k < n; k++) {
    const j = s.rows[k]!;
    if (j < jlo) jlo = j;
    if (j > jhi) jhi = j;
  }
  const span = jhi - jlo + 1;
  STATS.spans += span;
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
    if (end - start > STATS.maxRow) STATS.maxRow = end - start;
    // insertion sort by x
    for (let k = start + 1; k < end; k++) {
      const x = xs[k]!, d = ds[k]!;
      let i = k - 1;
      while (i >= start && xs[i]! > x) {
        xs[i + 1] = xs[i]!;
        ds[i + 1] = ds[i]!;
        i--;
      }
      xs[i + 1] = x;
      ds[i + 1] = d;
    }
    let w = 0, open = 0;
    const j = jlo + r;
    for (let k = start; k < end; k++) {
      const before = w;
      w += ds[k]!;
      if (before <= 0 && w > 0) open = xs[k]!;
      else if (before > 0 && w <= 0) cover.add(j, open, xs[k]!);
    }
  }
  s.count = 0;
}

/** Marks every grid edge conservatively: the x-extent of the edge within each row band it crosses, widened. */
function addConservative(cover: RowCover, u: Float64Array, v: Float64Array, na: number, nb: number, widen: number, umin: number, umax: number, vmin: number, vmax: number, continuous: boolean): void {
  const yb = cover.y0, dy = cover.dy;
  const jlo = Math.ceil((vmin - yb) / dy - 0.5), jhi = Math.floor((vmax - yb) / dy + 0.5);
  if (jlo === jhi && continuous) {
    // the whole (connected) image lies in one row band: its x-extent is one interval
    cover.add(jlo, umin - widen, umax + widen);
    return;
  }
  const mark = (p: number, q: number) => {
    const x0 = u[p]!, y0 = v[p]!, x1 = u[q]!, y1 = v[q]!;
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

/**
 * Clips triangle (p, q, r) at x = 0 into a front piece (x ≥ 0) and a back piece (x ≤ 0), maps each to (±√(x² + y²),
 * h) on its own side and records both outlines, counter-clockwise.
 */
function clipTriangle(s: SliceScratch, cover: RowCover, x: Float64Array, y: Float64Array, h: Float64Array, p: number, q: number, r: number): void {
  let nf = 0, nbk = 0;
  const F = s.pieceF, B = s.pieceB;
  for (let k = 0; k < 3; k++) {
    const i = k === 0 ? p : k === 1 ? q : r;
    const j = k === 0 ? q : k === 1 ? r : p;
    const xi = x[i]!, xj = x[j]!;
    if (xi >= 0) {
      F[3 * nf] = xi;
      F[3 * nf + 1] = y[i]!;
      F[3 * nf + 2] = h[i]!;
      nf++;
    }
    if (xi <= 0) {
      B[3 * nbk] = xi;
      B[3 * nbk + 1] = y[i]!;
      B[3 * nbk + 2] = h[i]!;
      nbk++;
    }
    if ((xi > 0 && xj < 0) || (xi < 0 && xj > 0)) {
      const t = xi / (xi - xj);
      const yc = y[i]! + t * (y[j]! - y[i]!), hc = h[i]! + t * (h[j]! - h[i]!);
      F[3 * nf] = 0;
      F[3 * nf + 1] = yc;
      F[3 * nf + 2] = hc;
      nf++;
      B[3 * nbk] = 0;
      B[3 * nbk + 1] = yc;
      B[3 * nbk + 2] = hc;
      nbk++;
    }
  }
  piece(s, cover, F, nf, 1);
  piece(s, cover, B, nbk, -1);
}

function piece(s: SliceScratch, cover: RowCover, P: Float64Array, n: number, side: number): void {
  if (n < 3) return;
  const uv = s.pieceUV;
  let a2 = 0;
  for (let k = 0; k < n; k++) {
    uv[2 * k] = side * Math.hypot(P[3 * k]!, P[3 * k + 1]!);
    uv[2 * k + 1] = P[3 * k + 2]!;
  }
  for (let k = 0, l = n - 1; k < n; l = k++) a2 += uv[2 * l]! * uv[2 * k + 1]! - uv[2 * k]! * uv[2 * l + 1]!;
  if (a2 === 0) return;
  const m = a2 > 0 ? 1 : -1;
  for (let k = 0, l = n - 1; k < n; l = k++) segment(s, cover, uv[2 * l]!, uv[2 * l + 1]!, uv[2 * k]!, uv[2 * k + 1]!, m);
}
