/**
 * Tells a pocket left between sampled slices from a real hole of the envelope. A hole of the union of sampled
 * slices that is narrower than the secondary-joint step may be either: points reached only for secondary values
 * between two samples (a pocket: fill it), or points the arm cannot reach (behind a joint limit: keep it). The
 * probe looks for a pose whose point lies within the tolerance of the hole's deepest point: a compass search over
 * the plan's joints (within their limits) from the nearest of a fixed set of Halton poses. Deterministic.
 * @see Halton, Numerische Mathematik 2, 1960 (low-discrepancy points) [from memory]; compass search: Kolda, Lewis &
 *   Torczon, SIAM Review 45(3), 2003 [from memory]
 */
import { PointProbe, type SamplingPlan } from "./jointSampling";
import { HALTON_BASES, radicalInverse } from "../../math/halton";

const SEED_POSES = 512;
const STARTS = 6;

export class PocketProbe {
  private readonly probe: PointProbe;
  private readonly plan: SamplingPlan;
  private readonly signedRadius: boolean;
  private seeds: Float64Array | null = null;
  private seedU: Float64Array | null = null;
  private seedV: Float64Array | null = null;
  private readonly c = new Float64Array(3);

  constructor(plan: SamplingPlan, signedRadius: boolean) {
    this.plan = plan;
    this.signedRadius = signedRadius;
    this.probe = new PointProbe(plan.chain, plan.point, plan.view);
  }

  /** View point (u, v) of driven values q, mm. */
  private at(q: Float64Array): [number, number] {
    const c = this.c;
    this.probe.into(c, 0, q);
    if (!this.signedRadius) return [c[0]!, c[1]!];
    const rho = Math.hypot(c[0]!, c[1]!);
    return [c[0]! >= 0 ? rho : -rho, c[2]!];
  }

  private seed(): void {
    const { relevant, ranges, qRef } = this.plan;
    const m = qRef.length;
    this.seeds = new Float64Array(SEED_POSES * m);
    this.seedU = new Float64Array(SEED_POSES);
    this.seedV = new Float64Array(SEED_POSES);
    const q = new Float64Array(m);
    for (let e = 0; e < SEED_POSES; e++) {
      q.set(qRef);
      relevant.forEach((j, k) => {
        const [lo, hi] = ranges[j]!;
        q[j] = lo + (hi - lo) * radicalInverse(e + 1, HALTON_BASES[k % HALTON_BASES.length]!);
      });
      this.seeds.set(q, e * m);
      [this.seedU[e], this.seedV[e]] = this.at(q);
    }
  }

  /** True when some pose puts the point within `tolMm` of (u, v) (view coordinates, mm). */
  reaches(u: number, v: number, tolMm: number): boolean {
    if (!this.seeds) this.seed();
    const { relevant, ranges, qRef } = this.plan;
    const m = qRef.length;
    const order = Array.from({ length: SEED_POSES }, (_, e) => e);
    const d0 = (e: number) => Math.hypot(this.seedU![e]! - u, this.seedV![e]! - v);
    order.sort((a, b) => d0(a) - d0(b));
    const q = new Float64Array(m);
    for (let s = 0; s < STARTS; s++) {
      q.set(this.seeds!.subarray(order[s]! * m, order[s]! * m + m));
      let d = d0(order[s]!);
      let scale = 1 / 16;
      for (let iter = 0; iter < 4000 && d > tolMm && scale > 1e-6; iter++) {
        let improved = false;
        for (const j of relevant) {
          const [lo, hi] = ranges[j]!;
          const step = scale * (hi - lo);
          for (const sign of [1, -1]) {
            const old = q[j]!;
            q[j] = Math.min(hi, Math.max(lo, old + sign * step));
            const [pu, pv] = this.at(q);
            const dd = Math.hypot(pu - u, pv - v);
            if (dd < d) {
              d = dd;
              improved = true;
              break;
            }
            q[j] = old;
          }
        }
        if (!improved) scale /= 2;
      }
      if (d <= tolMm) return true;
    }
    return false;
  }
}

/** Deepest point of an open flat ring (the interior point farthest from its edges, on a grid of up to 32 × 32). */
export function deepestPoint(ring: Float64Array): [number, number] {
  const n = ring.length >> 1;
  let x0 = Infinity,
    x1 = -Infinity,
    y0 = Infinity,
    y1 = -Infinity;
  for (let k = 0; k < n; k++) {
    x0 = Math.min(x0, ring[2 * k]!);
    x1 = Math.max(x1, ring[2 * k]!);
    y0 = Math.min(y0, ring[2 * k + 1]!);
    y1 = Math.max(y1, ring[2 * k + 1]!);
  }
  let best: [number, number] = [ring[0]!, ring[1]!],
    bestD = -1;
  const g = 32;
  for (let a = 0; a < g; a++)
    for (let b = 0; b < g; b++) {
      const x = x0 + ((x1 - x0) * (a + 0.5)) / g,
        y = y0 + ((y1 - y0) * (b + 0.5)) / g;
      let inside = false,
        d2 = Infinity;
      for (let k = 0, p = n - 1; k < n; p = k++) {
        const ax = ring[2 * p]!,
          ay = ring[2 * p + 1]!,
          bx = ring[2 * k]!,
          by = ring[2 * k + 1]!;
        if (ay > y !== by > y && x < ax + ((y - ay) * (bx - ax)) / (by - ay)) inside = !inside;
        const dx = bx - ax,
          dy = by - ay,
          l2 = dx * dx + dy * dy;
        const t = l2 > 0 ? Math.max(0, Math.min(1, ((x - ax) * dx + (y - ay) * dy) / l2)) : 0;
        d2 = Math.min(d2, (x - ax - t * dx) ** 2 + (y - ay - t * dy) ** 2);
      }
      if (inside && d2 > bestD) {
        bestD = d2;
        best = [x, y];
      }
    }
  return best;
}
