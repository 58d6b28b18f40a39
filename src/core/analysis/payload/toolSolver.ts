/**
 * Tool-direction solver of the payload-at-reach search (pure): turns the orienting joints until the flange axis
 * points along a target direction (damped Gauss–Newton), gives the reach of a posture, and finds where the reach
 * crosses a row's value along a grid edge (Illinois method).
 * @see Nocedal & Wright, Numerical Optimization, 2nd ed., §10.3 (Gauss–Newton) [from memory]; Dowell & Jarratt
 *   (1971), the Illinois method [from memory]
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto, wristCentreInto, type KinematicsScratch } from "../../kinematics/forward";
import { createHoldingScratch, type HoldingScratch } from "../../kinematics/statics";
import { solveInPlace } from "../../math/linsolve";
import type { SearchPlan } from "./searchPlan";

/** Gauss–Newton stops once a wrist step is below this, rad. */
const STEP_DONE_RAD = 1e-9;

/** Per-mounting solver state: scratch, buffers and the tool-direction solve. */
export class ToolSolver {
  readonly s: KinematicsScratch;
  readonly h: HoldingScratch;
  readonly q: Float64Array;
  readonly tauLinks: Float64Array;
  readonly tauUnit: Float64Array;
  readonly ata = new Float64Array(9);
  readonly atb = new Float64Array(3);
  readonly cols: Float64Array;
  constructor(
    readonly chain: Chain,
    readonly plan: SearchPlan,
    readonly tool: readonly number[],
  ) {
    this.s = createScratch(chain);
    this.h = createHoldingScratch(chain);
    this.q = new Float64Array(chain.drivenCount);
    this.tauLinks = new Float64Array(chain.drivenCount);
    this.tauUnit = new Float64Array(chain.drivenCount);
    this.cols = new Float64Array(3 * Math.max(1, plan.orienting.length));
  }

  /**
   * Turns the orienting joints until the flange axis points along `tool` (Gauss–Newton on the rotation that carries
   * the flange axis onto the target, damped), then wraps them into their limits; tries the other wrist branch once.
   * Leaves forwardInto of the solution in the scratch. False when no solution within the limits was found.
   */
  solveTool(): boolean {
    const w = this.plan.orienting;
    if (w.length === 0) {
      forwardInto(this.chain, this.q, this.s);
      return true;
    }
    if (this.gaussNewton() && this.wrapIntoLimits()) return true;
    // The other branch of a two-axis wrist: first axis turned by π, second mirrored.
    const a = w[0]!,
      b = w[1];
    this.q[a] = this.q[a]! + Math.PI;
    if (b !== undefined) this.q[b] = -this.q[b]!;
    return this.gaussNewton() && this.wrapIntoLimits();
  }

  private gaussNewton(): boolean {
    const chain = this.chain,
      s = this.s,
      q = this.q,
      w = this.plan.orienting,
      nw = w.length;
    const tx = this.tool[0]!,
      ty = this.tool[1]!,
      tz = this.tool[2]!;
    const n = chain.jointCount,
      m = chain.drivenCount,
      g = chain.couplingGain,
      fr = s.motionFrames,
      ax = chain.axisLocal;
    const cols = this.cols,
      A = this.ata,
      B = this.atb;
    for (let iter = 0; iter < 40; iter++) {
      forwardInto(chain, q, s);
      const zx = s.flange[2]!,
        zy = s.flange[6]!,
        zz = s.flange[10]!;
      // Rotation vector e that carries z onto t: angle · (z × t)/|z × t|.
      let cx = zy * tz - zz * ty,
        cy = zz * tx - zx * tz,
        cz = zx * ty - zy * tx;
      const sinA = Math.hypot(cx, cy, cz),
        cosA = zx * tx + zy * ty + zz * tz;
      const angle = Math.atan2(sinA, cosA);
      if (angle < 1e-11) return true;
      // Columns: the driven orienting joints' angular velocity, projected across the flange axis.
      for (let c = 0; c < nw; c++) {
        const j = w[c]!;
        let ox = 0,
          oy = 0,
          oz = 0;
        for (let i = 0; i < n; i++) {
          const gij = g[i * m + j]!;
          if (gij === 0 || chain.isPrismatic[i]) continue;
          const f = 16 * i,
            a0 = ax[3 * i]!,
            a1 = ax[3 * i + 1]!,
            a2 = ax[3 * i + 2]!;
          ox += gij * (fr[f]! * a0 + fr[f + 1]! * a1 + fr[f + 2]! * a2);
          oy += gij * (fr[f + 4]! * a0 + fr[f + 5]! * a1 + fr[f + 6]! * a2);
          oz += gij * (fr[f + 8]! * a0 + fr[f + 9]! * a1 + fr[f + 10]! * a2);
        }
        const along = ox * zx + oy * zy + oz * zz;
        cols[3 * c] = ox - along * zx;
        cols[3 * c + 1] = oy - along * zy;
        cols[3 * c + 2] = oz - along * zz;
      }
      if (sinA < 1e-12) {
        // Antipodal: any axis across z works; take the best-placed column's direction.
        let best = 0,
          bn = -1;
        for (let c = 0; c < nw; c++) {
          const nn = Math.hypot(cols[3 * c]!, cols[3 * c + 1]!, cols[3 * c + 2]!);
          if (nn > bn) {
            bn = nn;
            best = c;
          }
        }
        if (!(bn > 1e-12)) return false;
        cx = cols[3 * best]! / bn;
        cy = cols[3 * best + 1]! / bn;
        cz = cols[3 * best + 2]! / bn;
      } else {
        cx /= sinA;
        cy /= sinA;
        cz /= sinA;
      }
      const ex = angle * cx,
        ey = angle * cy,
        ez = angle * cz;
      // Normal equations (AᵀA + λI) δ = Aᵀ e, at most 3 × 3 (row-major nw × nw).
      for (let r = 0; r < nw; r++) {
        B[r] = cols[3 * r]! * ex + cols[3 * r + 1]! * ey + cols[3 * r + 2]! * ez;
        for (let c = 0; c < nw; c++)
          A[r * nw + c] =
            cols[3 * r]! * cols[3 * c]! +
            cols[3 * r + 1]! * cols[3 * c + 1]! +
            cols[3 * r + 2]! * cols[3 * c + 2]! +
            (r === c ? 1e-9 : 0);
      }
      if (!solveInPlace(A, B, nw)) return false;
      let big = 0;
      for (let c = 0; c < nw; c++) big = Math.max(big, Math.abs(B[c]!));
      const scale = big > 0.7 ? 0.7 / big : 1;
      for (let c = 0; c < nw; c++) q[w[c]!] = q[w[c]!]! + scale * B[c]!;
      // Quadratic convergence: after a step this small the remaining error is ~step², far below 1e-11 rad; the
      // scratch stays at the previous iterate, which differs from q by less than STEP_DONE_RAD.
      if (big < STEP_DONE_RAD && angle < 1e-6) return true;
    }
    return false;
  }

  private wrapIntoLimits(): boolean {
    const chain = this.chain,
      q = this.q;
    for (const j of this.plan.orienting) {
      const lo = chain.lowerSi[j]!,
        hi = chain.upperSi[j]!;
      let v = q[j]!;
      if (!Number.isFinite(lo) && !Number.isFinite(hi)) {
        q[j] = Math.atan2(Math.sin(v), Math.cos(v));
        continue;
      }
      const twoPi = 2 * Math.PI;
      v -= twoPi * Math.floor((v - lo) / twoPi); // into [lo, lo + 2π)
      if (v > hi) return false;
      q[j] = v;
    }
    return true;
  }

  /**
   * Radial distance of the flange centre from the base z axis at the posture in `q`, m; NaN when the tool cannot
   * point along the target. With the spherical shortcut the wrist is not solved (flange = WCP + d·t̂).
   */
  reach(): number {
    const d = this.plan.wcpFlangeDistanceM;
    if (d !== null) {
      forwardInto(this.chain, this.q, this.s);
      const p = this.wcp;
      wristCentreInto(p, this.chain, this.s);
      return Math.hypot(p[0]! + d * this.tool[0]!, p[1]! + d * this.tool[1]!);
    }
    if (!this.solveTool()) return NaN;
    return Math.hypot(this.s.flange[3]!, this.s.flange[7]!);
  }
  readonly wcp = new Float64Array(3);
  /** Wrist warm start buffer. */
  readonly wrist = new Float64Array(3);
}

/**
 * Finds t in [0, 1] along qa→qb where reach − target changes sign (Illinois method), leaving search.q (and for
 * solved wrists the scratch) at that posture. fa, fb: reach − target at the ends. False when the reach is not
 * continuous along the edge (a wrist branch flip) or the tolerance is not met.
 */
export function crossing(
  search: ToolSolver,
  qa: Float64Array,
  qb: Float64Array,
  fa: number,
  fb: number,
  target: number,
  tolM: number,
  nw: number,
  orienting: readonly number[],
): boolean {
  const q = search.q;
  let ta = 0,
    tb = 1,
    side = 0,
    first = true;
  const at = (t: number): number => {
    // Wrist angles: the first guess from the nearer end (interpolating across a 2π wrap would be wrong), then from
    // the previous iterate, which is closer.
    for (let c = 0; c < nw; c++) search.wrist[c] = first ? (t < 0.5 ? qa : qb)[orienting[c]!]! : q[orienting[c]!]!;
    first = false;
    for (let j = 0; j < q.length; j++) q[j] = qa[j]! + t * (qb[j]! - qa[j]!);
    for (let c = 0; c < nw; c++) q[orienting[c]!] = search.wrist[c]!;
    return search.reach() - target;
  };
  if (fa === 0 || fb === 0) {
    const f = at(fa === 0 ? 0 : 1);
    return Math.abs(f) <= tolM;
  }
  for (let iter = 0; iter < 60; iter++) {
    const t = (ta * fb - tb * fa) / (fb - fa);
    const f = at(t);
    if (f !== f) return false;
    if (Math.abs(f) <= tolM) return true;
    if (f > 0 === fb > 0) {
      tb = t;
      fb = f;
      if (side === -1) fa /= 2;
      side = -1;
    } else {
      ta = t;
      fa = f;
      if (side === 1) fb /= 2;
      side = 1;
    }
    if (tb - ta < 1e-15) break;
  }
  return false;
}
