/**
 * Joint-space sampling for the workspace envelope: which driven joints move a point, how finely each must be
 * sampled for a given boundary error, and a fast evaluator of the point over a grid of two "primary" joints for
 * each combination ("slice") of the remaining "secondary" joints.
 *
 * Step sizes come from the sagitta of a chord: a point swept by a joint whose second derivative is bounded by L
 * (for a revolute joint, the point's distance from the axis) departs from the straight chord between two samples Δ
 * apart by at most L·Δ²/8. The same second-order bound governs how far the envelope of a family of regions lies
 * beyond the regions at sampled members of the family. With k sampled joints, each gets an equal share σ/k of the
 * sampling budget σ: Δⱼ = √(8σ / (k·Lⱼ)). A prismatic joint bends nothing by itself; its step is bounded through the
 * mixed second derivative M with each revolute joint (error of a bilinear patch ≤ M·Δⱼ·Δᵢ/4). Lⱼ and M are
 * estimated by central differences at quasi-random poses (Halton sequence) and enlarged by a safety factor.
 */
import { HALTON_BASES, radicalInverse } from "../../math/halton";
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto, type KinematicsScratch } from "../../kinematics/forward";

/** The point whose envelope is traced: p = F₀·M₀·F₁·M₁ ⋯ F_last·M_last · local. */
export interface ChainPoint {
  /** Last kinematic joint whose motion moves the point. */
  readonly lastJoint: number;
  /** The point in the frame just after motion M_last, m. */
  readonly localM: Float64Array;
}

/** The wrist centre point (null when the chain has none) or the flange origin as a ChainPoint. */
export function chainPoint(chain: Chain, kind: "wcp" | "flange"): ChainPoint | null {
  if (kind === "flange") {
    const f = 16 * chain.jointCount;
    return {
      lastJoint: chain.jointCount - 1,
      localM: Float64Array.of(chain.fixed[f + 3]!, chain.fixed[f + 7]!, chain.fixed[f + 11]!),
    };
  }
  const w = chain.wrist;
  if (!w) return null;
  const t = chain.linkFromMotion,
    o = 16 * w.joint,
    p = w.pointInLinkM;
  const local = new Float64Array(3);
  for (let r = 0; r < 3; r++)
    local[r] = t[o + 4 * r]! * p[0]! + t[o + 4 * r + 1]! * p[1]! + t[o + 4 * r + 2]! * p[2]! + t[o + 4 * r + 3]!;
  return { lastJoint: w.joint, localM: local };
}

/** Writes the point (base frame, m) for the current scratch (after forwardInto). */
function pointAfterForwardInto(out: Float64Array, s: KinematicsScratch, pt: ChainPoint): void {
  const f = s.motionFrames,
    o = 16 * pt.lastJoint,
    l = pt.localM;
  for (let r = 0; r < 3; r++)
    out[r] = f[o + 4 * r]! * l[0]! + f[o + 4 * r + 1]! * l[1]! + f[o + 4 * r + 2]! * l[2]! + f[o + 4 * r + 3]!;
}

/** Sampled values of one driven joint. `driven` is −1 for a placeholder dimension with no effect. */
interface JointGrid {
  readonly driven: number;
  readonly values: Float64Array;
  /** The samples span exactly one turn of a joint whose motion repeats every turn: first and last coincide. */
  readonly periodic: boolean;
}

export interface SamplingPlan {
  readonly chain: Chain;
  readonly point: ChainPoint;
  /** View transform, 3 × 4 row-major, base metres → view coordinates in mm. */
  readonly view: Float64Array;
  /** Driven-joint values for joints that are not sampled (rad or m). */
  readonly qRef: Float64Array;
  /** First primary joint (grid rows) and second (grid columns). */
  readonly a: JointGrid;
  readonly b: JointGrid;
  readonly secondaries: readonly JointGrid[];
  /** Sampled range of every driven joint (fixed joints: [v, v]). */
  readonly ranges: readonly (readonly [number, number])[];
  /** Driven joints that move the point (sampled), in driven order. */
  readonly relevant: readonly number[];
  /** Bound on the size of a face of the product grid (one step of two joints): the two largest one-step motions,
   * lever × step, added (mm). */
  readonly stepReachMm: number;
  /** Largest one-step motion of a secondary joint, lever × step (mm; 0 without secondaries): the size of a pocket
   * that points reached only between two sampled slices can leave inside the union. */
  readonly secondaryStepMm: number;
  /** Sampling error budget actually used (mm); larger than requested when the sample budget forced it. */
  readonly samplingSigmaMm: number;
  /** Grid points over all slices. */
  readonly pointCount: number;
  /** Largest view-space radius and extremes seen at the estimation poses (mm), for scale only. */
  readonly estimate: { readonly radiusMm: number };
  /** True when the factorised evaluator applies (see forEachSlice). */
  readonly staged: boolean;
}

interface PlanRequest {
  readonly chain: Chain;
  readonly point: ChainPoint;
  /** 3 × 4 row-major view transform (base m → mm). */
  readonly view: Float64Array;
  /** Driven joints never sampled, with the value they take (e.g. joint 1 held where its kinematic angle is 0). */
  readonly fixed: ReadonlyMap<number, number>;
  /** Which view rows define "moving the point": 3 = all three rows, 2 = the first two only. */
  readonly relevantRows: 2 | 3;
  /** Primary pair scoring: "radial" uses (√(c₀² + c₁²), c₂), "plane" uses (c₀, c₁). */
  readonly scoring: "radial" | "plane";
  /** Boundary tolerance (mm) from the reach; the sampling budget is a share of it. */
  readonly toleranceMm: (radiusMm: number) => number;
  readonly samplingShare: number;
  /** Row spacing as a share of the tolerance (for the work estimate). */
  readonly rowShare: number;
  /** Largest work (grid points + estimated outline crossings, over all slices). */
  readonly maxWork: number;
}

const TWO_PI = 2 * Math.PI;
const ESTIMATION_POSES = 256;
const SAFETY = 1.25;
/** Candidate shares of the sampling budget of each primary joint (secondaries: 1), with three or more joints. */
const PRIMARY_WEIGHTS = [1, 0.5, 0.25, 0.12];

/** Sampled range of driven joint j: its limits, a revolute joint with integer gains capped to one turn. */
function samplingRangeOf(chain: Chain, j: number): { range: [number, number]; periodic: boolean } {
  const m = chain.drivenCount;
  const k = chain.drivenJoint[j]!;
  let lo = chain.lowerSi[j]!,
    hi = chain.upperSi[j]!;
  if (chain.isPrismatic[k]) {
    if (!Number.isFinite(lo) || !Number.isFinite(hi))
      throw new RangeError(`invalid range of prismatic joint ${chain.jointNames[k]}: unbounded`);
    return { range: [lo, hi], periodic: false };
  }
  if (!Number.isFinite(lo)) lo = -Math.PI;
  if (!Number.isFinite(hi)) hi = lo + TWO_PI;
  let integerGains = true;
  for (let i = 0; i < chain.jointCount; i++) {
    const g = chain.couplingGain[i * m + j]!;
    if (g !== 0 && (!Number.isInteger(g) || chain.isPrismatic[i])) integerGains = false;
  }
  if (integerGains && hi - lo >= TWO_PI) return { range: [lo, lo + TWO_PI], periodic: true };
  return { range: [lo, hi], periodic: false };
}

/** Evaluates the point in view coordinates (mm) for driven values q. */
export class PointProbe {
  private readonly s: KinematicsScratch;
  private readonly p = new Float64Array(3);
  constructor(
    private readonly chain: Chain,
    private readonly pt: ChainPoint,
    private readonly view: Float64Array,
  ) {
    this.s = createScratch(chain);
  }
  into(out: Float64Array, o: number, q: Float64Array): void {
    forwardInto(this.chain, q, this.s);
    pointAfterForwardInto(this.p, this.s, this.pt);
    const v = this.view,
      p = this.p;
    for (let r = 0; r < 3; r++)
      out[o + r] = v[4 * r]! * p[0]! + v[4 * r + 1]! * p[1]! + v[4 * r + 2]! * p[2]! + v[4 * r + 3]!;
  }
}

/**
 * Chooses the sampled joints, their steps and the primary pair.
 * @throws RangeError for an unbounded prismatic joint
 */
/** Largest first and second derivatives per candidate joint, mixed ones of prismatic joints, and view-plane
 * derivatives (for the primary-pair score) at quasi-random poses; radiusMm: the largest distance of the point seen. */
interface DerivativeEstimates {
  readonly firstMax: Float64Array;
  readonly secondMax: Float64Array;
  /** nc × nc, row: the prismatic joint */
  readonly mixed: Float64Array;
  /** second derivative of ρ along a prismatic joint (radial scoring) */
  readonly foldedMax: Float64Array;
  /** (du, dv) per pose and candidate: index (e·nc + c)·2 */
  readonly cols: Float64Array;
  readonly radiusMm: number;
}

function estimateDerivatives(
  req: PlanRequest,
  probe: PointProbe,
  qRef: Float64Array,
  candidates: readonly number[],
  ranges: readonly [number, number][],
): DerivativeEstimates {
  const { chain } = req;
  const m = chain.drivenCount;
  const nc = candidates.length;
  // Estimation poses: first and second central differences per candidate joint.
  const q = new Float64Array(m),
    qq = new Float64Array(m);
  const c0 = new Float64Array(3),
    cp = new Float64Array(3),
    cm = new Float64Array(3);
  const firstMax = new Float64Array(nc),
    secondMax = new Float64Array(nc);
  const mixed = new Float64Array(nc * nc);
  const foldedMax = new Float64Array(nc);
  const minTolMm = req.toleranceMm(0);
  const cols = new Float64Array(ESTIMATION_POSES * nc * 2);
  let radiusMm = 0;
  const tmp = new Float64Array(12);
  for (let e = 0; e < ESTIMATION_POSES; e++) {
    q.set(qRef);
    for (let c = 0; c < nc; c++) {
      const j = candidates[c]!,
        [lo, hi] = ranges[j]!;
      q[j] = lo + (hi - lo) * radicalInverse(e + 1, HALTON_BASES[c % HALTON_BASES.length]!);
    }
    probe.into(c0, 0, q);
    radiusMm = Math.max(
      radiusMm,
      req.scoring === "radial" ? Math.hypot(c0[0]!, c0[1]!) : Math.hypot(c0[0]!, c0[1]!, c0[2]!),
    );
    for (let c = 0; c < nc; c++) {
      const j = candidates[c]!;
      const h = chain.isPrismatic[chain.drivenJoint[j]!] ? 1e-4 : 1e-3;
      qq.set(q);
      qq[j] = q[j]! + h;
      probe.into(cp, 0, qq);
      qq[j] = q[j]! - h;
      probe.into(cm, 0, qq);
      let d1 = 0,
        d2 = 0;
      for (let r = 0; r < req.relevantRows; r++) {
        d1 += ((cp[r]! - cm[r]!) / (2 * h)) ** 2;
        d2 += ((cp[r]! - 2 * c0[r]! + cm[r]!) / (h * h)) ** 2;
      }
      firstMax[c] = Math.max(firstMax[c]!, Math.sqrt(d1));
      secondMax[c] = Math.max(secondMax[c]!, Math.sqrt(d2));
      // a prismatic joint moves the point on a straight line, but the side view draws ρ = √(c₀² + c₁²), which bends
      // along it (ρ'' = v⊥²/ρ): its chords then cut into the region. Poses closer to axis 1 than the smallest
      // tolerance are left out (there the chord error is at most ρ itself).
      if (req.scoring === "radial" && chain.isPrismatic[chain.drivenJoint[j]!]) {
        const r0 = Math.hypot(c0[0]!, c0[1]!);
        if (r0 >= minTolMm) {
          const rr = (Math.hypot(cp[0]!, cp[1]!) - 2 * r0 + Math.hypot(cm[0]!, cm[1]!)) / (h * h);
          foldedMax[c] = Math.max(foldedMax[c]!, Math.abs(rr));
        }
      }
      // view-plane derivative for the primary-pair score
      let du: number, dv: number;
      if (req.scoring === "radial") {
        const rho = Math.hypot(c0[0]!, c0[1]!) || 1;
        du = (c0[0]! * (cp[0]! - cm[0]!) + c0[1]! * (cp[1]! - cm[1]!)) / (2 * h * rho);
        dv = (cp[2]! - cm[2]!) / (2 * h);
      } else {
        du = (cp[0]! - cm[0]!) / (2 * h);
        dv = (cp[1]! - cm[1]!) / (2 * h);
      }
      cols[(e * nc + c) * 2] = du;
      cols[(e * nc + c) * 2 + 1] = dv;
    }
    // mixed derivatives of prismatic joints with every other candidate
    for (let c = 0; c < nc; c++) {
      const j = candidates[c]!;
      if (!chain.isPrismatic[chain.drivenJoint[j]!]) continue;
      for (let d = 0; d < nc; d++) {
        if (d === c) continue;
        const k = candidates[d]!;
        const hj = 1e-4,
          hk = chain.isPrismatic[chain.drivenJoint[k]!] ? 1e-4 : 1e-3;
        let acc0 = 0,
          acc1 = 0,
          acc2 = 0;
        for (const [sj, sk, w] of MIXED_STENCIL) {
          qq.set(q);
          qq[j] = q[j]! + sj * hj;
          qq[k] = q[k]! + sk * hk;
          probe.into(tmp, 0, qq);
          acc0 += w * tmp[0]!;
          acc1 += w * tmp[1]!;
          acc2 += w * tmp[2]!;
        }
        const norm = Math.hypot(acc0, acc1, req.relevantRows === 3 ? acc2 : 0) / (4 * hj * hk);
        mixed[c * nc + d] = Math.max(mixed[c * nc + d]!, norm);
      }
    }
  }
  return { firstMax, secondMax, mixed, foldedMax, cols, radiusMm };
}

/**
 * Primary pair: the largest mean |det| of the view-plane Jacobian over the estimation poses, preferring a pair the
 * factorised evaluator can handle (see stagedOrder) when it scores at least 0.3 of the best. Indices into `relevant`.
 */
function primaryPair(
  chain: Chain,
  point: ChainPoint,
  relevant: readonly number[],
  relevantIdx: readonly number[],
  cols: Float64Array,
  nc: number,
): { bestA: number; bestB: number; staged: boolean } {
  const k = relevant.length;
  let bestA = -1,
    bestB = -1,
    bestScore = -1,
    bestStagedA = -1,
    bestStagedB = -1,
    bestStagedScore = -1;
  for (let r = 0; r < k; r++) {
    for (let s = r + 1; s < k; s++) {
      const cr = relevantIdx[r]!,
        cs = relevantIdx[s]!;
      let score = 0;
      for (let e = 0; e < ESTIMATION_POSES; e++) {
        const ur = cols[(e * nc + cr) * 2]!,
          vr = cols[(e * nc + cr) * 2 + 1]!;
        const us = cols[(e * nc + cs) * 2]!,
          vs = cols[(e * nc + cs) * 2 + 1]!;
        score += Math.abs(ur * vs - vr * us);
      }
      if (score > bestScore) {
        bestScore = score;
        bestA = r;
        bestB = s;
      }
      const order = stagedOrder(chain, point, relevant[r]!, relevant[s]!);
      if (order && score > bestStagedScore) {
        bestStagedScore = score;
        bestStagedA = order[0] === relevant[r] ? r : s;
        bestStagedB = order[0] === relevant[r] ? s : r;
      }
    }
  }
  let staged = false;
  if (bestStagedA >= 0 && bestStagedScore >= 0.3 * bestScore) {
    bestA = bestStagedA;
    bestB = bestStagedB;
    staged = true;
  }
  return { bestA, bestB, staged };
}

/** Sample counts per relevant joint (steps of the sampling budget σ, coarsened while the work exceeds maxWork). */
function jointCounts(
  req: PlanRequest,
  est: DerivativeEstimates,
  candidates: readonly number[],
  relevantIdx: readonly number[],
  ranges: readonly [number, number][],
  bestA: number,
  bestB: number,
): { counts: Int32Array; sigma: number } {
  const { chain } = req;
  const { firstMax, secondMax, mixed, foldedMax, radiusMm } = est;
  const nc = candidates.length,
    k = relevantIdx.length;
  const tol = req.toleranceMm(radiusMm);
  let sigma = req.samplingShare * tol;
  // Work of a plan ≈ Σ over slices of (grid points + outline crossings); the outline of a slice is taken as twice
  // 4π·radius / row (an annulus with folds; calibrated on the demo arms), whatever the density of its primary grid.
  // So finer primaries are cheap and fewer slices save the most: the split of the sampling budget between primaries
  // and secondaries is chosen to minimise the work.
  const outline = (8 * Math.PI * Math.max(radiusMm, 1)) / Math.max(1e-9, req.rowShare * tol);
  // smallest radius of curvature of a revolute joint's trajectory: a bound on how sharply region boundaries bend
  let boundaryRadiusMm = Infinity;
  for (let r = 0; r < k; r++) {
    const c = relevantIdx[r]!;
    if (chain.isPrismatic[chain.drivenJoint[candidates[c]!]!] || !(secondMax[c]! > 0)) continue;
    boundaryRadiusMm = Math.min(boundaryRadiusMm, firstMax[c]! ** 2 / secondMax[c]!);
  }
  const isPrimary = (r: number) => r === bestA || r === bestB;
  const countsFor = (sig: number, primaryWeight: number, out: Int32Array): number => {
    let weightSum = 0;
    for (let r = 0; r < k; r++) weightSum += k >= 3 && isPrimary(r) ? primaryWeight : 1;
    const shareOf = (r: number) => (sig * (k >= 3 && isPrimary(r) ? primaryWeight : 1)) / Math.max(1e-12, weightSum);
    const steps = new Float64Array(k);
    for (let r = 0; r < k; r++) {
      const c = relevantIdx[r]!,
        j = candidates[c]!;
      if (chain.isPrismatic[chain.drivenJoint[j]!]) continue;
      steps[r] = Math.sqrt((8 * shareOf(r)) / Math.max(1e-9, SAFETY * secondMax[c]!));
    }
    let slices = 1,
      perSlice = 1;
    for (let r = 0; r < k; r++) {
      const c = relevantIdx[r]!,
        j = candidates[c]!;
      const span = ranges[j]![1] - ranges[j]![0];
      let n: number;
      if (chain.isPrismatic[chain.drivenJoint[j]!]) {
        let step = span;
        if (foldedMax[c]! > 0) step = Math.min(step, Math.sqrt((8 * shareOf(r)) / (SAFETY * foldedMax[c]!)));
        for (let t = 0; t < k; t++) {
          if (t === r) continue;
          const mij = SAFETY * mixed[c * nc + relevantIdx[t]!]!;
          const other = steps[t]! > 0 ? steps[t]! : span;
          if (mij > 0) step = Math.min(step, (4 * shareOf(r)) / (mij * other));
        }
        // A secondary prismatic joint translates the slice's region between samples, and only the sampled slices
        // enter the union: where the region's boundary is curved with radius ρ_b, two copies δ apart leave a notch
        // δ²/(8ρ_b) deep in the swept boundary. The bilinear bound above says nothing about it (two samples over a
        // 1.2 m stroke missed 400 mm in the property tests). ρ_b is taken as the smallest trajectory radius
        // |p'|²/|p''| of the revolute joints (ratio of the maxima at the estimation poses).
        if (k >= 2 && !isPrimary(r) && boundaryRadiusMm < Infinity) {
          const moveMm = SAFETY * firstMax[c]!;
          if (moveMm > 0) step = Math.min(step, Math.sqrt(8 * shareOf(r) * boundaryRadiusMm) / moveMm);
        }
        n = Math.max(1, Math.ceil(span / step - 1e-9));
      } else {
        n = Math.max(span > Math.PI / 2 ? 2 : 1, Math.ceil(span / steps[r]! - 1e-9));
      }
      out[r] = n;
      if (k >= 2 && !isPrimary(r)) slices *= n + 1;
      else perSlice *= n + 1;
    }
    return slices * (perSlice + outline);
  };
  const counts = new Int32Array(k),
    trial = new Int32Array(k);
  const bestCounts = (sig: number): number => {
    let best = Infinity;
    for (const w of PRIMARY_WEIGHTS) {
      const work = countsFor(sig, w, trial);
      if (work < best) {
        best = work;
        counts.set(trial);
      }
    }
    return best;
  };
  let work = bestCounts(sigma);
  for (let iter = 0; iter < 30 && work > req.maxWork && k > 0; iter++) {
    sigma *= Math.max(1.05, (work / req.maxWork) ** (2 / k));
    work = bestCounts(sigma);
  }
  return { counts, sigma };
}

export function planSampling(req: PlanRequest): SamplingPlan {
  const { chain, point, view } = req;
  const m = chain.drivenCount;
  const probe = new PointProbe(chain, point, view);
  const qRef = new Float64Array(m);
  const ranges: [number, number][] = [];
  const periodic: boolean[] = [];
  for (let j = 0; j < m; j++) {
    const fixed = req.fixed.get(j);
    const sr =
      fixed !== undefined ? { range: [fixed, fixed] as [number, number], periodic: false } : samplingRangeOf(chain, j);
    const r = sr.range;
    ranges.push(r);
    periodic.push(sr.periodic);
    qRef[j] = fixed !== undefined ? fixed : Math.min(r[1], Math.max(r[0], 0));
  }
  // Candidate joints: those with a kinematic effect up to the point's last joint.
  const candidates: number[] = [];
  for (let j = 0; j < m; j++) {
    if (req.fixed.has(j)) continue;
    let touches = false;
    for (let i = 0; i <= point.lastJoint; i++) if (chain.couplingGain[i * m + j] !== 0) touches = true;
    if (touches && ranges[j]![1] > ranges[j]![0]) candidates.push(j);
  }
  const nc = candidates.length;
  const est = estimateDerivatives(req, probe, qRef, candidates, ranges);
  const { firstMax, radiusMm } = est;
  // Relevant joints: those that move the point at some estimation pose.
  const relevantIdx: number[] = [];
  for (let c = 0; c < nc; c++) if (firstMax[c]! > 1e-6) relevantIdx.push(c);
  const relevant = relevantIdx.map((c) => candidates[c]!);
  const k = relevant.length;

  const pair = primaryPair(chain, point, relevant, relevantIdx, est.cols, nc);
  const { bestA, bestB } = pair;
  let staged = pair.staged;
  const { counts, sigma } = jointCounts(req, est, candidates, relevantIdx, ranges, bestA, bestB);
  const grid = (r: number): JointGrid => {
    const j = relevant[r]!,
      [lo, hi] = ranges[j]!,
      n = counts[r]!;
    const values = new Float64Array(n + 1);
    for (let i = 0; i <= n; i++) values[i] = lo + ((hi - lo) * i) / n;
    return { driven: j, values, periodic: periodic[j]! };
  };
  const placeholder: JointGrid = { driven: -1, values: new Float64Array(2), periodic: false };
  let a: JointGrid, b: JointGrid;
  if (k >= 2) {
    a = grid(bestA);
    b = grid(bestB);
  } else if (k === 1) {
    a = grid(0);
    b = placeholder;
    staged = stagedOrder(chain, point, relevant[0]!, -1) !== null;
  } else {
    a = placeholder;
    b = placeholder;
    staged = false;
  }
  const secondaries: JointGrid[] = [];
  for (let r = 0; r < k; r++) if (k >= 2 && r !== bestA && r !== bestB) secondaries.push(grid(r));
  // a face of the product grid spans one step of two joints: bound its size by the two largest one-step motions
  const stepMotion: number[] = [];
  for (let r = 0; r < k; r++) {
    const g = [a, b, ...secondaries].find((x) => x.driven === relevant[r]);
    if (g && g.values.length > 1)
      stepMotion.push(SAFETY * firstMax[relevantIdx[r]!]! * Math.abs(g.values[1]! - g.values[0]!));
  }
  let secondaryStepMm = 0;
  for (const g of secondaries) {
    const c = relevantIdx[relevant.indexOf(g.driven)]!;
    secondaryStepMm = Math.max(secondaryStepMm, SAFETY * firstMax[c]! * Math.abs(g.values[1]! - g.values[0]!));
  }
  stepMotion.sort((p, q) => q - p);
  const stepReachMm = (stepMotion[0] ?? 0) + (stepMotion[1] ?? 0);
  let pointCount = a.values.length * b.values.length;
  for (const g of secondaries) pointCount *= g.values.length;
  return {
    chain,
    point,
    view,
    qRef,
    a,
    b,
    secondaries,
    ranges,
    relevant,
    stepReachMm,
    secondaryStepMm,
    samplingSigmaMm: sigma,
    pointCount,
    estimate: { radiusMm },
    staged,
  };
}

const MIXED_STENCIL: readonly (readonly [number, number, number])[] = [
  [1, 1, 1],
  [1, -1, -1],
  [-1, 1, -1],
  [-1, -1, 1],
];

/** Smallest and largest kinematic joint (≤ last) that driven joint j moves; null when none. */
export function kinematicSpan(chain: Chain, point: ChainPoint, j: number): [number, number] | null {
  if (j < 0) return null;
  const m = chain.drivenCount;
  let lo = -1,
    hi = -1;
  for (let i = 0; i <= point.lastJoint; i++) {
    if (chain.couplingGain[i * m + j] === 0) continue;
    if (lo < 0) lo = i;
    hi = i;
  }
  return lo < 0 ? null : [lo, hi];
}

/**
 * The order [first, second] in which two primary joints can be factorised, p = Left(q_first) · Right(q_second):
 * every kinematic joint moved by `first` must come no later in the chain than every one moved by `second`.
 */
function stagedOrder(chain: Chain, point: ChainPoint, j: number, k: number): [number, number] | null {
  const sj = kinematicSpan(chain, point, j);
  if (!sj) return null;
  if (k < 0) return [j, k];
  const sk = kinematicSpan(chain, point, k);
  if (!sk) return null;
  if (sj[1] <= sk[0]) return [j, k];
  if (sk[1] <= sj[0]) return [k, j];
  return null;
}
