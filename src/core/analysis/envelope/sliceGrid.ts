/**
 * The point over the primary grid of every slice of a SamplingPlan (jointSampling.ts): forEachSlice, with the
 * factorised evaluator (StagedGrid) for plans whose two primaries can be split, p = Left(q_a) · Right(q_b).
 */
import type { Chain } from "../../kinematics/chain";
import { mul4AtInto, mul4Into, rotationAxisAngleInto, translationInto } from "../../math/mat4";
import { kinematicSpan, PointProbe, type SamplingPlan } from "./jointSampling";

/** Buffers for one slice: view coordinates of the a × b grid, index ia·nb + ib. */
export interface SliceBuffers {
  readonly c0: Float64Array;
  readonly c1: Float64Array;
  readonly c2: Float64Array;
  /** Driven joint values of the slice (secondaries set; the primaries' entries are not meaningful). */
  readonly q: Float64Array;
}

/**
 * Calls `visit` once per combination of the secondary joints with the view coordinates (mm) of the point over the
 * primary grid. Staged plans evaluate p = Left(q_a) · Right(q_b) (see StagedGrid); otherwise every grid point runs
 * the full forward kinematics. The buffers are reused between calls. With `select`, only the combinations it
 * accepts (given the sample index of every secondary) are evaluated and visited.
 */
export function forEachSlice(
  plan: SamplingPlan,
  visit: (buffers: SliceBuffers, sliceIndex: number) => void,
  select?: (counter: Int32Array) => boolean,
): void {
  const { chain, point, view, a, b, secondaries } = plan;
  const na = a.values.length,
    nb = b.values.length;
  const q = Float64Array.from(plan.qRef);
  const buffers: SliceBuffers = {
    c0: new Float64Array(na * nb),
    c1: new Float64Array(na * nb),
    c2: new Float64Array(na * nb),
    q,
  };
  const ns = secondaries.length;
  const counter = new Int32Array(ns);
  const staged = plan.staged ? new StagedGrid(plan) : null;
  const probe = plan.staged ? null : new PointProbe(chain, point, view);
  const out3 = new Float64Array(3);

  for (let slice = 0; ; slice++) {
    if (select && !select(counter)) {
      if (!nextCombination(counter, secondaries)) break;
      continue;
    }
    for (let s = 0; s < ns; s++) q[secondaries[s]!.driven] = secondaries[s]!.values[counter[s]!]!;
    if (staged) staged.fill(q, buffers);
    else {
      const { c0, c1, c2 } = buffers;
      for (let ia = 0; ia < na; ia++) {
        if (a.driven >= 0) q[a.driven] = a.values[ia]!;
        for (let ib = 0; ib < nb; ib++) {
          if (b.driven >= 0) q[b.driven] = b.values[ib]!;
          probe!.into(out3, 0, q);
          c0[ia * nb + ib] = out3[0]!;
          c1[ia * nb + ib] = out3[1]!;
          c2[ia * nb + ib] = out3[2]!;
        }
      }
    }
    // a periodic primary's last sample is its first one turned a full turn: make the copies bit-identical, so
    // outlines that run through the seam stay closed to the last bit
    if (a.periodic) {
      const { c0, c1, c2 } = buffers,
        last = (na - 1) * nb;
      for (let ib = 0; ib < nb; ib++) {
        c0[last + ib] = c0[ib]!;
        c1[last + ib] = c1[ib]!;
        c2[last + ib] = c2[ib]!;
      }
    }
    if (b.periodic) {
      const { c0, c1, c2 } = buffers;
      for (let ia = 0; ia < na; ia++) {
        c0[ia * nb + nb - 1] = c0[ia * nb]!;
        c1[ia * nb + nb - 1] = c1[ia * nb]!;
        c2[ia * nb + nb - 1] = c2[ia * nb]!;
      }
    }
    visit(buffers, slice);
    if (!nextCombination(counter, secondaries)) break;
  }
}

/** Steps the counter to the next combination of secondaries (the first one fastest); false after the last one. */
function nextCombination(counter: Int32Array, secondaries: SamplingPlan["secondaries"]): boolean {
  const ns = secondaries.length;
  let s = 0;
  while (s < ns) {
    counter[s] = counter[s]! + 1;
    if (counter[s]! < secondaries[s]!.values.length) break;
    counter[s] = 0;
    s++;
  }
  return s < ns;
}

/**
 * The factorised evaluator of a staged plan: per slice, Left is a 3 × 4 matrix per sample of q_a (view transform
 * folded in) and Right a vector per sample of q_b, so each grid point costs one 3 × 4 product.
 *
 * Motions that stay the same from one sample to the next are evaluated once (the same operations on the same
 * numbers, so the grid values do not change in the last bit): M_cut(g·q_b) per sample of b, for all slices; per
 * slice, the motion of every joint that the primary at hand does not move (θ + 0·q is θ, except for θ = −0: such a
 * joint stays in the per-sample loop). A method called once per slice, not the body of forEachSlice's loop: there
 * it ran only as on-stack-replaced code of one long call, and boxed several times as many numbers (measured).
 */
class StagedGrid {
  private readonly chain: Chain;
  private readonly plan: SamplingPlan;
  /** joints up to the point's last one */
  private readonly n: number;
  /** θ of every kinematic joint with both primaries at zero (per slice) */
  private readonly thetaBase: Float64Array;
  /** coupling gains of the primaries per kinematic joint */
  private readonly gA: Float64Array;
  private readonly gB: Float64Array;
  /** Left ends with kinematic joint `cut` (the first one b moves), whose motion by b starts Right */
  private readonly cut: number;
  /** first kinematic joint a moves */
  private readonly firstA: number;
  private readonly viewM = new Float64Array(16);
  private readonly motion = new Float64Array(16);
  private readonly pre = new Float64Array(16);
  private readonly pre4 = new Float64Array(16);
  private readonly accA = new Float64Array(16);
  private readonly accB = new Float64Array(16);
  private readonly left: Float64Array;
  private readonly right: Float64Array;
  /** M_cut(g·q_b), 16 numbers per sample of b */
  private readonly cutMotion: Float64Array;
  /** per slice: the motion of joint i (from 16·i) where steadyForA[i] */
  private readonly sliceMotion: Float64Array;
  private readonly steadyForA: Uint8Array;

  constructor(plan: SamplingPlan) {
    const { chain, point, view, a, b } = plan;
    const m = chain.drivenCount,
      n = point.lastJoint + 1,
      g = chain.couplingGain;
    this.chain = chain;
    this.plan = plan;
    this.n = n;
    this.thetaBase = new Float64Array(n);
    this.gA = new Float64Array(n);
    this.gB = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      this.gA[i] = a.driven >= 0 ? g[i * m + a.driven]! : 0;
      this.gB[i] = b.driven >= 0 ? g[i * m + b.driven]! : 0;
    }
    const spanA = a.driven >= 0 ? kinematicSpan(chain, point, a.driven) : null;
    const spanB = b.driven >= 0 ? kinematicSpan(chain, point, b.driven) : null;
    this.cut = spanB ? spanB[0] : n - 1;
    this.firstA = spanA ? spanA[0] : this.cut;
    this.viewM.set(view.subarray(0, 12));
    this.viewM[15] = 1;
    const na = a.values.length,
      nb = b.values.length;
    this.left = new Float64Array(12 * na);
    this.right = new Float64Array(3 * nb);
    this.cutMotion = new Float64Array(16 * nb);
    for (let ib = 0; ib < nb; ib++)
      this.cutMotion.set(this.motionInto(this.motion, this.cut, this.gB[this.cut]! * b.values[ib]!), 16 * ib);
    this.sliceMotion = new Float64Array(16 * n);
    this.steadyForA = new Uint8Array(n);
  }

  private motionInto(out: Float64Array, i: number, theta: number): Float64Array {
    const axes = this.chain.axisLocal;
    return this.chain.isPrismatic[i]
      ? translationInto(out, axes[3 * i]! * theta, axes[3 * i + 1]! * theta, axes[3 * i + 2]! * theta)
      : rotationAxisAngleInto(out, axes[3 * i]!, axes[3 * i + 1]!, axes[3 * i + 2]!, theta);
  }

  /** acc ← acc · F_i · M_i(θ) */
  private stepInto(acc: Float64Array, i: number, theta: number): void {
    mul4AtInto(this.pre4, 0, acc, 0, this.chain.fixed, 16 * i);
    this.motionInto(this.motion, i, theta);
    mul4Into(acc, this.pre4, this.motion);
  }

  /** acc ← acc · F_i · sliceMotion_i */
  private stepSteadyInto(acc: Float64Array, i: number): void {
    mul4AtInto(this.pre4, 0, acc, 0, this.chain.fixed, 16 * i);
    mul4AtInto(acc, 0, this.pre4, 0, this.sliceMotion, 16 * i);
  }

  /** Fills the grid of the slice whose secondaries q holds. */
  fill(q: Float64Array, buffers: SliceBuffers): void {
    const { chain, plan, n, thetaBase, gA, gB, cut, firstA, motion, pre, accA, accB, left, right } = this;
    const { a, b, point } = plan;
    const m = chain.drivenCount,
      g = chain.couplingGain,
      off = chain.couplingOffset,
      fixed = chain.fixed;
    const na = a.values.length,
      nb = b.values.length;
    for (let i = 0; i < n; i++) {
      let t = off[i]!;
      for (let j = 0; j < m; j++) {
        if (j === a.driven || j === b.driven) continue;
        const gij = g[i * m + j]!;
        if (gij !== 0) t += gij * q[j]!;
      }
      thetaBase[i] = t;
    }
    // prefix F₀M₀ ⋯ up to the first joint moved by a (exclusive)
    pre.fill(0);
    pre[0] = pre[5] = pre[10] = pre[15] = 1;
    for (let i = 0; i < firstA && i < cut; i++) this.stepInto(pre, i, thetaBase[i]!);
    const fromA = Math.min(firstA, cut);
    for (let i = fromA; i <= cut; i++) {
      this.steadyForA[i] = steady(thetaBase[i]!, gA[i]!) ? 1 : 0;
      if (this.steadyForA[i]) this.sliceMotion.set(this.motionInto(motion, i, thetaBase[i]!), 16 * i);
    }
    for (let ia = 0; ia < na; ia++) {
      const qa = a.values[ia]!;
      accA.set(pre);
      for (let i = fromA; i <= cut; i++) {
        if (this.steadyForA[i]) this.stepSteadyInto(accA, i);
        else this.stepInto(accA, i, thetaBase[i]! + gA[i]! * qa);
      }
      mul4Into(accB, this.viewM, accA);
      for (let r = 0; r < 12; r++) left[12 * ia + r] = accB[r]!;
    }
    // the point carried through the joints after the cut that b does not move, from the last one down: the same
    // for every sample of b
    let x0 = point.localM[0]!,
      y0 = point.localM[1]!,
      z0 = point.localM[2]!;
    let top = n - 1;
    for (; top > cut && steady(thetaBase[top]!, gB[top]!); top--) {
      this.motionInto(motion, top, thetaBase[top]!);
      const nx = motion[0]! * x0 + motion[1]! * y0 + motion[2]! * z0 + motion[3]!;
      const ny = motion[4]! * x0 + motion[5]! * y0 + motion[6]! * z0 + motion[7]!;
      const nz = motion[8]! * x0 + motion[9]! * y0 + motion[10]! * z0 + motion[11]!;
      const f = 16 * top;
      x0 = fixed[f]! * nx + fixed[f + 1]! * ny + fixed[f + 2]! * nz + fixed[f + 3]!;
      y0 = fixed[f + 4]! * nx + fixed[f + 5]! * ny + fixed[f + 6]! * nz + fixed[f + 7]!;
      z0 = fixed[f + 8]! * nx + fixed[f + 9]! * ny + fixed[f + 10]! * nz + fixed[f + 11]!;
    }
    const cm = this.cutMotion;
    for (let ib = 0; ib < nb; ib++) {
      const qb = b.values[ib]!;
      let x = x0,
        y = y0,
        z = z0;
      for (let i = top; i > cut; i--) {
        this.motionInto(motion, i, thetaBase[i]! + gB[i]! * qb);
        const nx = motion[0]! * x + motion[1]! * y + motion[2]! * z + motion[3]!;
        const ny = motion[4]! * x + motion[5]! * y + motion[6]! * z + motion[7]!;
        const nz = motion[8]! * x + motion[9]! * y + motion[10]! * z + motion[11]!;
        const f = 16 * i;
        x = fixed[f]! * nx + fixed[f + 1]! * ny + fixed[f + 2]! * nz + fixed[f + 3]!;
        y = fixed[f + 4]! * nx + fixed[f + 5]! * ny + fixed[f + 6]! * nz + fixed[f + 7]!;
        z = fixed[f + 8]! * nx + fixed[f + 9]! * ny + fixed[f + 10]! * nz + fixed[f + 11]!;
      }
      // the cut joint's motion by b, without F_cut (which Left holds)
      const o = 16 * ib;
      right[3 * ib] = cm[o]! * x + cm[o + 1]! * y + cm[o + 2]! * z + cm[o + 3]!;
      right[3 * ib + 1] = cm[o + 4]! * x + cm[o + 5]! * y + cm[o + 6]! * z + cm[o + 7]!;
      right[3 * ib + 2] = cm[o + 8]! * x + cm[o + 9]! * y + cm[o + 10]! * z + cm[o + 11]!;
    }
    const { c0, c1, c2 } = buffers;
    for (let ia = 0; ia < na; ia++) {
      const L = 12 * ia;
      const l0 = left[L]!,
        l1 = left[L + 1]!,
        l2 = left[L + 2]!,
        l3 = left[L + 3]!;
      const l4 = left[L + 4]!,
        l5 = left[L + 5]!,
        l6 = left[L + 6]!,
        l7 = left[L + 7]!;
      const l8 = left[L + 8]!,
        l9 = left[L + 9]!,
        l10 = left[L + 10]!,
        l11 = left[L + 11]!;
      const row = ia * nb;
      for (let ib = 0; ib < nb; ib++) {
        const x = right[3 * ib]!,
          y = right[3 * ib + 1]!,
          z = right[3 * ib + 2]!;
        c0[row + ib] = l0 * x + l1 * y + l2 * z + l3;
        c1[row + ib] = l4 * x + l5 * y + l6 * z + l7;
        c2[row + ib] = l8 * x + l9 * y + l10 * z + l11;
      }
    }
  }
}

/** θ + gain · q equals θ for every q: the motion of the joint does not depend on that primary. */
function steady(theta: number, gain: number): boolean {
  return gain === 0 && !Object.is(theta, -0);
}
