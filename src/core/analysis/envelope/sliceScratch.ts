/** Work arrays of the scanline fill (sliceCover.ts), reused from slice to slice; grown on demand. */
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
