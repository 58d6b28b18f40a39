/**
 * Outline of a RowCover as rings: marching squares on nodes spaced dx along x on every row, where the field is the
 * signed distance along the row to the nearest interval end (positive inside), clamped to ±dx. Linear
 * interpolation then puts each crossing along a row exactly at the interval end; between rows the crossing falls
 * midway (the resolution in y is the row spacing).
 */
import { isolineRings } from "../../geometry/isolines";
import type { RowCover } from "./rowCover";

/**
 * @param dxMm node spacing along x (mm)
 * @returns rings in the cover's coordinates (mm), open, inside on the left
 */
export function coverRings(cover: RowCover, dxMm: number): Float64Array[] {
  if (!(dxMm > 0)) throw new RangeError(`invalid dxMm: ${dxMm}`);
  const [xmin, xmax] = cover.xExtent();
  if (!(xmin <= xmax)) return [];
  const x0 = (Math.floor(xmin / dxMm) - 1) * dxMm;
  const nx = Math.ceil((xmax - x0) / dxMm) + 2;
  const col = (x: number) => Math.floor((x - x0) / dxMm);
  const events: number[] = [];
  const rings = isolineRings({
    nx,
    jMin: cover.jMin,
    jMax: cover.jMax,
    periodicX: false,
    // cells near an interval end of either row, and cells where the two rows differ
    cells(j, out) {
      const va = cover.valuesOf(j),
        la = cover.lengthOf(j),
        vb = cover.valuesOf(j + 1),
        lb = cover.lengthOf(j + 1);
      events.length = 0;
      for (let k = 0; k < la; k++) events.push(va[k]!, 1);
      for (let k = 0; k < lb; k++) events.push(vb[k]!, 2);
      for (let k = 0; k < events.length; k += 2) {
        const c = col(events[k]!);
        out.push(c - 1, c + 1);
      }
      // symmetric difference of the two rows: sweep the ends in order
      let ia = 0,
        ib = 0,
        inA = false,
        inB = false,
        open = 0;
      while (ia < la || ib < lb) {
        const takeA = ib >= lb || (ia < la && va[ia]! <= vb[ib]!);
        const x = takeA ? va[ia]! : vb[ib]!;
        const before = inA !== inB;
        if (takeA) {
          inA = !inA;
          ia++;
        } else {
          inB = !inB;
          ib++;
        }
        const after = inA !== inB;
        if (!before && after) open = x;
        else if (before && !after) out.push(col(open) - 1, col(x) + 1);
      }
    },
    value(i, j) {
      const v = cover.valuesOf(j),
        len = cover.lengthOf(j);
      const x = x0 + i * dxMm;
      // first interval whose end ≥ x
      let lo = 0,
        hi = len >> 1;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (v[2 * mid + 1]! < x) lo = mid + 1;
        else hi = mid;
      }
      const k = 2 * lo;
      let f: number;
      if (k < len && v[k]! <= x) f = Math.min(x - v[k]!, v[k + 1]! - x, dxMm);
      else {
        let d = dxMm;
        if (k < len) d = Math.min(d, v[k]! - x);
        if (k >= 2) d = Math.min(d, x - v[k - 1]!);
        f = -d;
      }
      // an interval with no node strictly inside it would fall between two nodes of negative value and vanish from
      // the outline (a thin part of the region, or a single point): its nearest node takes it, with the distance to
      // its far end, so the crossing towards the next node lands on that end (the outline contains the interval;
      // it widens by at most half a node spacing there)
      let s = k;
      while (s >= 2 && v[s - 1]! > x - dxMm) s -= 2;
      for (; s < len && v[s]! < x + dxMm; s += 2) {
        const a = v[s]!,
          b = v[s + 1]!;
        // nodes strictly inside (a, b): the first node after a comes at or after b
        if (x0 + (Math.floor((a - x0) / dxMm) + 1) * dxMm < b) continue;
        if (Math.round(((a + b) / 2 - x0) / dxMm) !== i) continue;
        const reach = Math.max(b - x, x - a, 1e-6 * dxMm);
        if (reach > f) f = reach;
      }
      return f;
    },
  });
  for (const r of rings) {
    for (let k = 0; k < r.length; k += 2) {
      r[k] = x0 + r[k]! * dxMm;
      r[k + 1] = cover.y0 + r[k + 1]! * cover.dy;
    }
  }
  return rings;
}

/** Smallest |x| over the cover (0 when an interval contains x = 0); Infinity when empty. */
export function coverMinAbsX(cover: RowCover): number {
  let best = Infinity;
  for (let j = cover.jMin, jEnd = cover.jMax; j <= jEnd; j++) {
    const v = cover.valuesOf(j),
      len = cover.lengthOf(j);
    for (let k = 0; k < len; k += 2) {
      const s = v[k]!,
        e = v[k + 1]!;
      const d = s <= 0 && e >= 0 ? 0 : Math.min(Math.abs(s), Math.abs(e));
      if (d < best) best = d;
    }
  }
  return best;
}
