/**
 * Between sampled slices, the region of each slice moves; where the region has a convex corner (the image of a
 * corner of the primary joint box: two joint limits at once) the union's boundary is the path of that corner, and
 * sampled slices alone leave a saw-tooth whose depth is first order in the secondary step. This fills the path:
 * for every pair of slices adjacent along one secondary joint, the strip of the primary-grid boundary next to each
 * corner (`depth` grid edges along both limits) is joined to the same strip of the neighbour by quads; for every
 * 2-D cell of the secondary grid, the corner point itself spans a quad. Together with the slices this is the image of
 * the piecewise-linear map on the faces of the product grid that can carry a corner.
 */
import type { SamplingPlan } from "./jointSampling";
import type { SliceBuffers } from "./sliceGrid";

export class CornerSweep {
  private readonly na: number;
  private readonly nb: number;
  private readonly depth: number;
  private readonly strides: number[];
  private readonly radix: number[];
  private readonly history: number;
  /** per stored slice: 8 strips × (depth + 1) points × 3 coordinates */
  private readonly store: Float64Array;
  private readonly stripPoints: Int32Array;
  /** output triangles, 9 numbers each */
  tris: Float64Array;
  count = 0;

  constructor(plan: SamplingPlan, depth = 2) {
    this.na = plan.a.values.length;
    this.nb = plan.b.values.length;
    this.depth = depth;
    this.radix = plan.secondaries.map((g) => g.values.length);
    this.strides = [];
    let st = 1;
    for (const r of this.radix) {
      this.strides.push(st);
      st *= r;
    }
    const k = this.radix.length;
    this.history = k === 0 ? 1 : this.strides[k - 1]! + (k >= 2 ? this.strides[k - 2]! : 0) + 1;
    const perSlice = 8 * (depth + 1) * 3;
    this.store = new Float64Array(this.history * perSlice);
    // grid indices of the strip points: corner c (0..3) × direction (a, b) × step 0..depth
    const na = this.na,
      nb = this.nb;
    const corners: [number, number, number, number][] = [
      [0, 0, 1, 1],
      [na - 1, 0, -1, 1],
      [na - 1, nb - 1, -1, -1],
      [0, nb - 1, 1, -1],
    ];
    this.stripPoints = new Int32Array(8 * (depth + 1));
    corners.forEach(([ia, ib, da, db], c) => {
      for (let step = 0; step <= depth; step++) {
        const a = Math.min(na - 1, Math.max(0, ia + da * step));
        const b = Math.min(nb - 1, Math.max(0, ib + db * step));
        this.stripPoints[2 * c * (depth + 1) + step] = a * nb + ib;
        this.stripPoints[(2 * c + 1) * (depth + 1) + step] = ia * nb + b;
      }
    });
    this.tris = new Float64Array(9 * 64);
  }

  private slot(slice: number): number {
    return (slice % this.history) * 8 * (this.depth + 1) * 3;
  }

  private pushTri(src: Float64Array, i: number, j: number, k: number): void {
    if (9 * (this.count + 1) > this.tris.length) {
      const grown = new Float64Array(this.tris.length * 2);
      grown.set(this.tris);
      this.tris = grown;
    }
    const o = 9 * this.count;
    for (let c = 0; c < 3; c++) {
      this.tris[o + c] = src[i + c]!;
      this.tris[o + 3 + c] = src[j + c]!;
      this.tris[o + 6 + c] = src[k + c]!;
    }
    this.count++;
  }

  /** Stores the slice's corner strips and collects the triangles joining it to its already-visited neighbours. */
  visit(buf: SliceBuffers, slice: number): void {
    this.count = 0;
    const k = this.radix.length;
    if (k === 0) return;
    const per = this.depth + 1;
    const base = this.slot(slice);
    const st = this.store;
    for (let s = 0; s < 8; s++) {
      for (let step = 0; step < per; step++) {
        const p = this.stripPoints[s * per + step]!,
          o = base + 3 * (s * per + step);
        st[o] = buf.c0[p]!;
        st[o + 1] = buf.c1[p]!;
        st[o + 2] = buf.c2[p]!;
      }
    }
    const digit = (d: number) => Math.floor(slice / this.strides[d]!) % this.radix[d]!;
    for (let d = 0; d < k; d++) {
      if (digit(d) === 0) continue;
      const nbBase = this.slot(slice - this.strides[d]!);
      for (let s = 0; s < 8; s++) {
        for (let step = 0; step < this.depth; step++) {
          const p0 = base + 3 * (s * per + step),
            p1 = p0 + 3;
          const q0 = nbBase + 3 * (s * per + step),
            q1 = q0 + 3;
          this.pushTri(st, p0, p1, q1);
          this.pushTri(st, p0, q1, q0);
        }
      }
      for (let e = d + 1; e < k; e++) {
        if (digit(e) === 0) continue;
        const b1 = nbBase,
          b2 = this.slot(slice - this.strides[e]!),
          b12 = this.slot(slice - this.strides[d]! - this.strides[e]!);
        for (let c = 0; c < 4; c++) {
          const o = 3 * (2 * c * per);
          this.pushTri(st, base + o, b1 + o, b12 + o);
          this.pushTri(st, base + o, b12 + o, b2 + o);
        }
      }
    }
  }
}
