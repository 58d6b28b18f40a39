/**
 * Side view near axis 1: the signed radius r = ±√(x² + y²) jumps by 2|y| where x changes sign, so a slice shows a
 * gap −|y| < r < |y| at a lateral offset y. When y itself changes sign between two sampled slices the true set
 * closes the gap somewhere between them, but |y| has a kink at 0 and the sampled slices keep a gap of first order in
 * the secondary step. This fills it: for slices adjacent along one secondary joint, every primary grid edge whose
 * four end points (two per slice) straddle both x = 0 and y = 0 is joined by a quad to its copy in the neighbour;
 * for every 2-D cell of the secondary grid, each primary grid point whose four images straddle both is spanned by a
 * quad. The quads are faces of the product grid, clipped like any other triangle.
 */
import type { SamplingPlan, SliceBuffers } from "./jointSampling";

export class AxisSweep {
  private readonly na: number;
  private readonly nb: number;
  private readonly strides: number[];
  private readonly radix: number[];
  private readonly history: number;
  private readonly store: Float64Array;
  /** per stored point: 1 when within `near` of the axis (a straddling quad has all its corners that close) */
  private readonly nearFlags: Uint8Array;
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
    this.store = new Float64Array(k === 0 ? 0 : this.history * 3 * this.na * this.nb);
    this.nearFlags = new Uint8Array(k === 0 ? 0 : this.history * this.na * this.nb);
    // a quad of the product grid spans one step of two joints: its corners straddle both x = 0 and y = 0 only when
    // they all lie within that distance of the axis
    this.near2 = plan.stepReachMm ** 2;
  }

  private slot(slice: number): number {
    return (slice % this.history) * 3 * this.na * this.nb;
  }

  private push(st: Float64Array, i: number, j: number, k: number): void {
    if (9 * (this.count + 1) > this.tris.length) {
      const grown = new Float64Array(this.tris.length * 2);
      grown.set(this.tris);
      this.tris = grown;
    }
    const o = 9 * this.count;
    for (let c = 0; c < 3; c++) {
      this.tris[o + c] = st[i + c]!;
      this.tris[o + 3 + c] = st[j + c]!;
      this.tris[o + 6 + c] = st[k + c]!;
    }
    this.count++;
  }

  /** Stores the slice and collects the quads (as triangles) that close the axis gap towards its neighbours. */
  visit(buf: SliceBuffers, slice: number): void {
    this.count = 0;
    const k = this.radix.length;
    if (k === 0) return;
    const np = this.na * this.nb, nb = this.nb, na = this.na;
    const base = this.slot(slice), st = this.store, near = this.nearFlags, nbase0 = base / 3;
    let any = 0;
    for (let p = 0; p < np; p++) {
      const x = buf.c0[p]!, y = buf.c1[p]!;
      st[base + 3 * p] = x;
      st[base + 3 * p + 1] = y;
      st[base + 3 * p + 2] = buf.c2[p]!;
      const f = x * x + y * y <= this.near2 ? 1 : 0;
      near[nbase0 + p] = f;
      any |= f;
    }
    if (!any) return;
    const digit = (d: number) => Math.floor(slice / this.strides[d]!) % this.radix[d]!;
    // flags of four points: both signs of x and both signs of y present
    const straddles = (o1: number, o2: number, o3: number, o4: number): boolean => {
      const x1 = st[o1]! >= 0, x2 = st[o2]! >= 0, x3 = st[o3]! >= 0, x4 = st[o4]! >= 0;
      if (x1 === x2 && x2 === x3 && x3 === x4) return false;
      const y1 = st[o1 + 1]! >= 0, y2 = st[o2 + 1]! >= 0, y3 = st[o3 + 1]! >= 0, y4 = st[o4 + 1]! >= 0;
      return !(y1 === y2 && y2 === y3 && y3 === y4);
    };
    for (let d = 0; d < k; d++) {
      if (digit(d) === 0) continue;
      const nbase = this.slot(slice - this.strides[d]!);
      for (let ia = 0; ia < na; ia++) {
        for (let ib = 0; ib < nb; ib++) {
          if (!near[nbase0 + ia * nb + ib]) continue;
          const p = 3 * (ia * nb + ib);
          for (let side = 0; side < 2; side++) {
            const q = side === 0 ? (ia + 1 < na ? p + 3 * nb : -1) : ib + 1 < nb ? p + 3 : -1;
            if (q < 0 || !straddles(base + p, base + q, nbase + p, nbase + q)) continue;
            this.push(st, base + p, base + q, nbase + q);
            this.push(st, base + p, nbase + q, nbase + p);
          }
        }
      }
      for (let e = d + 1; e < k; e++) {
        if (digit(e) === 0) continue;
        const b2 = this.slot(slice - this.strides[e]!), b12 = this.slot(slice - this.strides[d]! - this.strides[e]!);
        for (let p = 0; p < 3 * np; p += 3) {
          if (!near[nbase0 + p / 3] || !straddles(base + p, nbase + p, b12 + p, b2 + p)) continue;
          this.push(st, base + p, nbase + p, b12 + p);
          this.push(st, base + p, b12 + p, b2 + p);
        }
      }
    }
  }
}
