/**
 * Where the tool point can be, as a box and a shell in the base frame: the smallest and largest x, y, z and distance
 * from the base origin over the joint ranges. Placement maps solve inverse kinematics only at base positions from
 * which every target lies inside (a position outside cannot reach it), so most of the grid costs nothing.
 *
 * Method: EXTENT_SAMPLES joint samples spread over the ranges (Halton points), then, for each of the eight
 * functionals (±x, ±y, ±z, ±r), projected gradient ascent from the three best samples (gradient Jᵀ·∇f with J the
 * tool point's linear Jacobian; steps halved until they improve; joints kept inside their ranges). Sampling and a
 * local ascent can only fall short of a true extreme, never overshoot it, so the placement map grows the extent by
 * EXTENT_MARGIN (a share of the largest distance plus a fixed length) before pruning.
 * @see Nocedal & Wright, Numerical Optimization, §16.7 (gradient projection) [from memory]
 */
import type { Chain } from "../../kinematics/chain";
import {
  createScratch,
  forwardInto,
  jacobianInto,
  toolPointInto,
  type KinematicsScratch,
} from "../../kinematics/forward";
import { HALTON_BASES, radicalInverse } from "../../math/halton";

export const EXTENT_SAMPLES = 4096;
/** Growth of the estimated extent before pruning: share of the largest distance, and a fixed length (m). */
export const EXTENT_MARGIN = { share: 0.03, lengthM: 0.03 } as const;

export interface ReachExtent {
  /** Smallest and largest tool-point coordinates in the base frame, m. */
  readonly minM: [number, number, number];
  readonly maxM: [number, number, number];
  /** Smallest and largest distance of the tool point from the base origin, m. */
  readonly rMinM: number;
  readonly rMaxM: number;
}

/** Tool point (base frame, m) at q into out; returns out. */
function toolPoint(chain: Chain, q: Float64Array, e: Float64Array, kin: KinematicsScratch, out: Float64Array) {
  forwardInto(chain, q, kin);
  return toolPointInto(out, kin, e[3]!, e[7]!, e[11]!);
}

/** Value of functional k at p: 0..5 = ±x, ±y, ±z; 6 = r, 7 = −r. */
function value(k: number, p: ArrayLike<number>): number {
  if (k < 6) return (k % 2 ? -1 : 1) * p[k >> 1]!;
  const r = Math.hypot(p[0]!, p[1]!, p[2]!);
  return k === 6 ? r : -r;
}

/** The estimated extent of the tool point (see the module notes). */
export function reachExtent(chain: Chain, tcpInFlange: Float64Array): ReachExtent {
  const m = chain.drivenCount;
  const kin = createScratch(chain);
  const lo = new Float64Array(m),
    hi = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    const span = chain.isPrismatic[chain.drivenJoint[i]!] ? 10 : Math.PI;
    lo[i] = Math.max(chain.lowerSi[i]!, -span);
    hi[i] = Math.min(chain.upperSi[i]!, span);
  }
  const samples = new Float64Array(EXTENT_SAMPLES * m);
  const values = new Float64Array(EXTENT_SAMPLES * 8);
  const p = new Float64Array(3);
  const q = new Float64Array(m);
  for (let s = 0; s < EXTENT_SAMPLES; s++) {
    for (let i = 0; i < m; i++)
      q[i] = lo[i]! + (hi[i]! - lo[i]!) * radicalInverse(s + 1, HALTON_BASES[i % HALTON_BASES.length]!);
    samples.set(q, s * m);
    toolPoint(chain, q, tcpInFlange, kin, p);
    for (let k = 0; k < 8; k++) values[s * 8 + k] = value(k, p);
  }
  const best = new Float64Array(8).fill(-Infinity);
  const jac = new Float64Array(6 * m),
    trial = new Float64Array(m),
    grad = new Float64Array(m);
  for (let k = 0; k < 8; k++) {
    const order = Array.from({ length: EXTENT_SAMPLES }, (_, s) => s).sort(
      (a, b) => values[b * 8 + k]! - values[a * 8 + k]!,
    );
    for (const s of order.slice(0, 3)) {
      q.set(samples.subarray(s * m, s * m + m));
      let f = values[s * 8 + k]!;
      let step = 0.2;
      for (let it = 0; it < 60 && step > 1e-6; it++) {
        toolPoint(chain, q, tcpInFlange, kin, p);
        jacobianInto(jac, chain, kin, p[0]!, p[1]!, p[2]!);
        // ∇f in task space: a unit axis (±x, ±y, ±z) or ±p/|p|.
        const r = Math.hypot(p[0]!, p[1]!, p[2]!) || 1;
        const df =
          k < 6
            ? [0, 1, 2].map((a) => (a === k >> 1 ? (k % 2 ? -1 : 1) : 0))
            : p.map((v) => ((k === 6 ? 1 : -1) * v) / r);
        let norm = 0;
        for (let i = 0; i < m; i++) {
          grad[i] = df[0]! * jac[i]! + df[1]! * jac[m + i]! + df[2]! * jac[2 * m + i]!;
          norm += grad[i]! * grad[i]!;
        }
        norm = Math.sqrt(norm);
        if (norm < 1e-12) break;
        for (let i = 0; i < m; i++) trial[i] = Math.min(hi[i]!, Math.max(lo[i]!, q[i]! + (step * grad[i]!) / norm));
        const ft = value(k, toolPoint(chain, trial, tcpInFlange, kin, p));
        if (ft > f) {
          f = ft;
          q.set(trial);
          step *= 1.5;
        } else step /= 2;
      }
      best[k] = Math.max(best[k]!, f);
    }
  }
  return {
    minM: [-best[1]!, -best[3]!, -best[5]!],
    maxM: [best[0]!, best[2]!, best[4]!],
    rMinM: Math.max(0, -best[7]!),
    rMaxM: best[6]!,
  };
}
