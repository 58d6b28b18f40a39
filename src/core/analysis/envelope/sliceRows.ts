/**
 * Row crossings of the scanline fill (sliceCover.ts): each outline segment records its x-extent within the band of every
 * row it crosses (segment, markEnds), and flush turns the crossings of a slice into intervals of the RowCover by
 * winding numbers.
 */
import type { RowCover } from "./rowCover";
import type { SliceScratch } from "./sliceScratch";

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
export function segment(
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
  // A crossing inside one of its row's two lanes is credited to that interval here, as flush() would do with it:
  // the interval holding x is the one flush() finds (the intervals are disjoint and do not touch), and a sum of
  // multiplicities does not depend on the order it is added up in. Saves writing and re-reading most crossings.
  const wlo = s.winLo,
    wrows = s.winRows,
    lo0 = s.laneLo0,
    hi0 = s.laneHi0,
    lo1 = s.laneLo1,
    hi1 = s.laneHi1,
    start = s.coverStart,
    acc = s.acc;
  let c = s.count;
  for (let j = jFrom; j <= j1; j++) {
    let y = yb + j * dy + left;
    y = y < lo ? lo : y > hi ? hi : y;
    const x = x0 + (y - y0) * slope,
      r = j - wlo;
    if (r >= 0 && r < wrows) {
      if (lo0[r]! <= x && x <= hi0[r]!) {
        const a = (start[r]! >> 1) + s.laneIdx0[r]!;
        acc[a] = acc[a]! + d;
        continue;
      }
      if (lo1[r]! <= x && x <= hi1[r]!) {
        const a = (start[r]! >> 1) + s.laneIdx1[r]!;
        acc[a] = acc[a]! + d;
        continue;
      }
    }
    rows[c] = j;
    xs[c] = x;
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
export function flush(s: SliceScratch, cover: RowCover): void {
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
