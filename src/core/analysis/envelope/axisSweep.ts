/**
 * Side view near axis 1: the signed radius r = ±√(x² + y²) jumps by 2|y| where x changes sign, so a slice shows a
 * gap −|y| < r < |y| at a lateral offset y, and its image piles up at r = ±|y| (a spike: r barely moves while x
 * crosses 0). Between two sampled slices the true set holds every r between their |y| at those heights, but the
 * sampled slices alone leave a saw-tooth of spikes (one per slice, the valleys between them of first order in the
 * secondary step, far beyond the sagitta bound, since ρ'' = v⊥²/ρ is unbounded near the axis); when y itself
 * changes sign, |y| has a kink at 0 and the gap around the axis stays open. This fills both: for slices adjacent
 * along one secondary joint, every primary grid edge whose four end points (two per slice) straddle x = 0 is joined
 * by a quad to its copy in the neighbour; for every 2-D cell of the secondary grid, each primary grid point whose
 * four images straddle x = 0 is spanned by a quad. The quads are faces of the product grid, clipped like any other
 * triangle: their cut at x = 0 maps to r = ±|y| with y between the slices' values. Most such quads lie inside the
 * region the slices already filled: a quad whose image the cover holds already is skipped (the result is the same;
 * filling each quad on its own made the envelope 2–5 times slower).
 */
import type { SamplingPlan } from "./jointSampling";
import type { RowCover } from "./rowCover";
import type { SliceBuffers } from "./sliceGrid";

export class AxisSweep {
  private readonly na: number;
  private readonly nb: number;
  private readonly strides: number[];
  private readonly radix: number[];
  private readonly history: number;
  /** the last `history` slices' points, one array per coordinate (copied whole, slot · na · nb + point) */
  private readonly storeX: Float64Array;
  private readonly storeY: Float64Array;
  private readonly storeH: Float64Array;
  /** the current slice's points within `near` of the plane x = 0 (a straddling quad has all its corners that close),
   * in grid order */
  private readonly nearPoints: Int32Array;
  /** per stored point: 1 when x ≥ 0 (four corners straddle x = 0 when it differs among them) */
  private readonly signs: Uint8Array;
  private readonly near: number;
  tris: Float64Array = new Float64Array(9 * 64);
  count = 0;

  constructor(plan: SamplingPlan) {
    this.na = plan.a.values.length;
    this.nb = plan.b.values.length;
    this.radix = plan.secondaries.map((g) => g.values.length);
    this.strides = [];
    let st = 1;
    for (const r of this.radix) {
      this.strides.push(st);
      st *= r;
    }
    const k = this.radix.length;
    this.history = k === 0 ? 1 : this.strides[k - 1]! + (k >= 2 ? this.strides[k - 2]! : 0) + 1;
    const stored = k === 0 ? 0 : this.history * this.na * this.nb;
    this.storeX = new Float64Array(stored);
    this.storeY = new Float64Array(stored);
    this.storeH = new Float64Array(stored);
    this.nearPoints = new Int32Array(k === 0 ? 0 : this.na * this.nb);
    this.signs = new Uint8Array(stored);
    // a quad of the product grid spans one step of two joints: its corners straddle x = 0 only when they all lie
    // within that distance of the plane x = 0
    this.near = plan.stepReachMm;
  }

  /** Index of the slice's first stored point. */
  private slot(slice: number): number {
    return (slice % this.history) * this.na * this.nb;
  }

  /** Adds the triangle of stored points i, j, k. */
  private push(i: number, j: number, k: number): void {
    if (9 * (this.count + 1) > this.tris.length) {
      const grown = new Float64Array(this.tris.length * 2);
      grown.set(this.tris);
      this.tris = grown;
    }
    const o = 9 * this.count,
      t = this.tris,
      x = this.storeX,
      y = this.storeY,
      h = this.storeH;
    t[o] = x[i]!;
    t[o + 1] = y[i]!;
    t[o + 2] = h[i]!;
    t[o + 3] = x[j]!;
    t[o + 4] = y[j]!;
    t[o + 5] = h[j]!;
    t[o + 6] = x[k]!;
    t[o + 7] = y[k]!;
    t[o + 8] = h[k]!;
    this.count++;
  }

  /**
   * True when `cover` already holds the side-view image of the quad of stored points i1 … i4: both of its pieces lie
   * within ρmin ≤ |r| ≤ ρmax (ρ = √(x² + y²) is convex, so ρmax of the corners bounds it; ρ ≥ |y| ≥ min |y| of the
   * corners when y keeps its sign, else 0) and hmin ≤ h ≤ hmax, and every row whose band meets that box covers it.
   */
  private covered(cover: RowCover, i1: number, i2: number, i3: number, i4: number): boolean {
    const x = this.storeX,
      y = this.storeY,
      h = this.storeH;
    let rhoMax = 0,
      yMin = Infinity,
      yMax = -Infinity,
      hMin = Infinity,
      hMax = -Infinity;
    for (let c = 0; c < 4; c++) {
      const i = c === 0 ? i1 : c === 1 ? i2 : c === 2 ? i3 : i4;
      const xi = x[i]!,
        yi = y[i]!,
        hi = h[i]!;
      const rho = Math.sqrt(xi * xi + yi * yi);
      if (rho > rhoMax) rhoMax = rho;
      if (yi < yMin) yMin = yi;
      if (yi > yMax) yMax = yi;
      if (hi < hMin) hMin = hi;
      if (hi > hMax) hMax = hi;
    }
    const rhoMin = yMin > 0 ? yMin : yMax < 0 ? -yMax : 0;
    const jLo = Math.floor((hMin - cover.y0) / cover.dy),
      jHi = Math.ceil((hMax - cover.y0) / cover.dy);
    return cover.coversMirrored(jLo, jHi, rhoMin, rhoMax);
  }

  /**
   * Stores the slice and collects the quads (as triangles) that close the axis gap towards its neighbours, leaving
   * out those whose image `cover` holds already.
   */
  visit(buf: SliceBuffers, slice: number, cover: RowCover): void {
    this.count = 0;
    const k = this.radix.length;
    if (k === 0) return;
    const np = this.na * this.nb,
      nb = this.nb,
      na = this.na;
    const base = this.slot(slice),
      near = this.nearPoints,
      signs = this.signs,
      nearMm = this.near;
    this.storeX.set(buf.c0, base);
    this.storeY.set(buf.c1, base);
    this.storeH.set(buf.c2, base);
    let nearCount = 0;
    for (let p = 0; p < np; p++) {
      const x = buf.c0[p]!;
      if (Math.abs(x) <= nearMm) near[nearCount++] = p;
      signs[base + p] = x >= 0 ? 1 : 0;
    }
    if (nearCount === 0) return;
    const digit = (d: number) => Math.floor(slice / this.strides[d]!) % this.radix[d]!;
    // four stored points: both signs of x present
    const straddles = (i1: number, i2: number, i3: number, i4: number): boolean => {
      const sum = signs[i1]! + signs[i2]! + signs[i3]! + signs[i4]!;
      return sum > 0 && sum < 4;
    };
    for (let d = 0; d < k; d++) {
      if (digit(d) === 0) continue;
      const nbase = this.slot(slice - this.strides[d]!);
      for (let n = 0; n < nearCount; n++) {
        const p = near[n]!,
          ia = Math.floor(p / nb),
          ib = p - ia * nb;
        for (let side = 0; side < 2; side++) {
          const q = side === 0 ? (ia + 1 < na ? p + nb : -1) : ib + 1 < nb ? p + 1 : -1;
          if (q < 0 || !straddles(base + p, base + q, nbase + p, nbase + q)) continue;
          if (this.covered(cover, base + p, base + q, nbase + p, nbase + q)) continue;
          this.push(base + p, base + q, nbase + q);
          this.push(base + p, nbase + q, nbase + p);
        }
      }
      for (let e = d + 1; e < k; e++) {
        if (digit(e) === 0) continue;
        const b2 = this.slot(slice - this.strides[e]!),
          b12 = this.slot(slice - this.strides[d]! - this.strides[e]!);
        for (let n = 0; n < nearCount; n++) {
          const p = near[n]!;
          if (!straddles(base + p, nbase + p, b12 + p, b2 + p)) continue;
          if (this.covered(cover, base + p, nbase + p, b12 + p, b2 + p)) continue;
          this.push(base + p, nbase + p, b12 + p);
          this.push(base + p, b12 + p, b2 + p);
        }
      }
    }
  }
}
