/**
 * Reach and height figures: the best grid samples of the radius ρ = √(c₀² + c₁²) (largest and smallest) and of the
 * height (largest and smallest), each refined by a bounded compass search over the sampled joints within their
 * limits (Kolda, Lewis & Torczon, SIAM Review 45(3), 2003 [from memory]), so a figure is the local optimum next to
 * the best sample rather than the sample itself (which falls short by up to the sagitta of the joint grid).
 */
import { PointProbe, type SamplingPlan } from "./jointSampling";
import type { SliceBuffers } from "./sliceGrid";

/** Which figure: 0 largest ρ, 1 smallest ρ, 2 largest height, 3 smallest height. */
type Extreme = 0 | 1 | 2 | 3;

export class Extremes {
  /** Best sampled value per figure: ρ², −ρ², h, −h. */
  private readonly best = new Float64Array([-Infinity, -Infinity, -Infinity, -Infinity]);
  private readonly qBest: Float64Array[];
  /**
   * @param heightRow view row holding the height (2 for the (x_f, y_l, h) view, 1 for base x–z projections)
   */
  constructor(
    private readonly plan: SamplingPlan,
    private readonly heightRow: 1 | 2,
  ) {
    this.qBest = [0, 1, 2, 3].map(() => Float64Array.from(plan.qRef));
  }

  /** Tracks the slice's samples. Allocates nothing. */
  visit(buf: SliceBuffers): void {
    const { c0, c1 } = buf,
      h = this.heightRow === 2 ? buf.c2 : buf.c1;
    const n = c0.length;
    const best = this.best;
    let b0 = best[0]!,
      b1 = best[1]!,
      b2 = best[2]!,
      b3 = best[3]!;
    let i0 = -1,
      i1 = -1,
      i2 = -1,
      i3 = -1;
    for (let p = 0; p < n; p++) {
      const x = c0[p]!,
        y = this.heightRow === 2 ? c1[p]! : 0,
        z = h[p]!;
      const r2 = x * x + y * y;
      if (r2 > b0) {
        b0 = r2;
        i0 = p;
      }
      if (-r2 > b1) {
        b1 = -r2;
        i1 = p;
      }
      if (z > b2) {
        b2 = z;
        i2 = p;
      }
      if (-z > b3) {
        b3 = -z;
        i3 = p;
      }
    }
    if (i0 >= 0) this.keep(0, b0, i0, buf);
    if (i1 >= 0) this.keep(1, b1, i1, buf);
    if (i2 >= 0) this.keep(2, b2, i2, buf);
    if (i3 >= 0) this.keep(3, b3, i3, buf);
  }

  private keep(which: Extreme, value: number, at: number, buf: SliceBuffers): void {
    this.best[which] = value;
    const q = this.qBest[which]!,
      nb = this.plan.b.values.length;
    q.set(buf.q);
    const { a, b } = this.plan;
    if (a.driven >= 0) q[a.driven] = a.values[Math.floor(at / nb)]!;
    if (b.driven >= 0) q[b.driven] = b.values[at % nb]!;
  }

  /** The figure after a compass search from its best sample: ρ (mm) for 0 and 1, height (mm) for 2 and 3. */
  refined(which: Extreme): number {
    const plan = this.plan,
      heightRow = this.heightRow;
    const objective = (c: Float64Array): number => {
      const r2 = c[0]! * c[0]! + (heightRow === 2 ? c[1]! * c[1]! : 0);
      return which === 0 ? r2 : which === 1 ? -r2 : which === 2 ? c[heightRow]! : -c[heightRow]!;
    };
    let best = this.best[which]!;
    if (best > -Infinity) {
      const probe = new PointProbe(plan.chain, plan.point, plan.view);
      const c = new Float64Array(3),
        q = Float64Array.from(this.qBest[which]!);
      const f = (): number => {
        probe.into(c, 0, q);
        return objective(c);
      };
      best = Math.max(best, f());
      const joints = plan.relevant;
      const grids = [plan.a, plan.b, ...plan.secondaries];
      const step = joints.map((j) => {
        const g = grids.find((x) => x.driven === j);
        return g && g.values.length > 1 ? Math.abs(g.values[1]! - g.values[0]!) : 0.01;
      });
      for (let iter = 0; iter < 400; iter++) {
        let improved = false;
        for (let r = 0; r < joints.length && !improved; r++) {
          const j = joints[r]!,
            [lo, hi] = plan.ranges[j]!;
          for (let dir = 1; dir >= -1; dir -= 2) {
            const old = q[j]!;
            q[j] = Math.min(hi, Math.max(lo, old + dir * step[r]!));
            if (q[j] === old) continue;
            const v = f();
            if (v > best) {
              best = v;
              improved = true;
              break;
            }
            q[j] = old;
          }
        }
        if (!improved) {
          let done = true;
          for (let r = 0; r < step.length; r++) {
            step[r] = step[r]! / 2;
            if (step[r]! > 1e-9) done = false;
          }
          if (done) break;
        }
      }
    }
    return which === 0
      ? Math.sqrt(Math.max(0, best))
      : which === 1
        ? Math.sqrt(Math.max(0, -best))
        : which === 2
          ? best
          : -best;
  }
}
