/**
 * Side view near axis 1: the signed radius r = ±√(x² + y²) jumps by 2|y| where x changes sign, so a slice shows a
 * gap −|y| < r < |y| at a lateral offset y. When y itself changes sign between two sampled slices the true set
 * closes the gap somewhere between them, but |y| has a kink at 0 and the sampled slices keep a gap of first order in
 * the secondary step. This fills it: for slices adjacent along one secondary joint, every primary grid edge whose
 * four end points (two per slice) straddle both x = 0 and y = 0 is joined by a quad to its copy in the neighbour;
 * for every 2-D cell of the secondary grid, each primary grid point whose four images straddle both is spanned by a
 * quad. The quads are faces of the product grid, clipped like any other triangle.
 */
import type { SamplingPlan } from "./jointSampling";
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
  /** the current slice's points within `near` of the axis (a straddling quad has all its corners that close), in
   * grid order */
  private readonly nearPoints: Int32Array;
  /** per stored point: bit 0 set when x ≥ 0, bit 1 when y ≥ 0 (four corners straddle both axes when both bits
   * differ among them: one byte per corner to test instead of two coordinates) */
  private readonly signs: Uint8Array;
  private readonly near2: number;
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
    // a quad of the product grid spans one step of two joints: its corners straddle both x = 0 and y = 0 only when
    // they all lie within that distance of the axis
    this.near2 = plan.stepReachMm ** 2;
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

  /** Stores the slice and collects the quads (as triangles) that close the axis gap towards its neighbours. */
  visit(buf: SliceBuffers, slice: number): void {
    this.count = 0;
    const k = this.radix.length;
    if (k === 0) return;
    const np = this.na * this.nb,
      nb = this.nb,
      na = this.na;
    const base = this.slot(slice),
      near = this.nearPoints,
      signs = this.signs,
      near2 = this.near2;
    this.storeX.set(buf.c0, base);
    this.storeY.set(buf.c1, base);
    this.storeH.set(buf.c2, base);
    let nearCount = 0;
    for (let p = 0; p < np; p++) {
      const x = buf.c0[p]!,
        y = buf.c1[p]!;
      if (x * x + y * y <= near2) near[nearCount++] = p;
      signs[base + p] = (x >= 0 ? 1 : 0) | (y >= 0 ? 2 : 0);
    }
    if (nearCount === 0) return;
    const digit = (d: number) => Math.floor(slice / this.strides[d]!) % this.radix[d]!;
    // four stored points: both signs of x and both signs of y present
    const straddles = (i1: number, i2: number, i3: number, i4: number): boolean => {
      const s1 = signs[i1]!,
        s2 = signs[i2]!,
        s3 = signs[i3]!,
        s4 = signs[i4]!;
      return ((s1 | s2 | s3 | s4) & ~(s1 & s2 & s3 & s4) & 3) === 3;
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
          this.push(base + p, nbase + p, b12 + p);
          this.push(base + p, b12 + p, b2 + p);
        }
      }
    }
  }
}
