/**
 * Workspace envelope of the wrist centre point (WCP, when the arm has one) and of the flange origin: side view,
 * top view, reach and height figures, side-view area and swept volume. Pure: (chain, options) → plain data.
 *
 * ## What the views mean
 * **Layout "revolute-base"** (the first joint is revolute and drives nothing else: articulated arms, collaborative
 * arms, 7-axis arms, SCARAs, palletizers). Axis 1 is the line through the origin of F₀ along F₀·axis₁ (base frame).
 * - *Side view*: the set the point reaches in the half-planes that turn with joint 1, i.e. with joint 1 held at
 *   kinematic angle 0, drawn as (r, z): z = the coordinate along axis 1 (base z for a vertical axis 1), and
 *   r = ±√(x_f² + y_l²), the true distance from axis 1, signed by the forward component x_f. The forward direction
 *   e_f is perpendicular to axis 1 and to the first later joint axis that is not parallel to it (for a prismatic
 *   joint: that axis itself, projected), oriented so the point is in front at the reference pose (all driven
 *   joints at 0, clamped to their limits); with no such joint (SCARA: all axes vertical), the direction of the
 *   point at the reference pose. Negative r = reaching over the back. A lateral shoulder offset d shows as a gap
 *   −d < r < d; the side view does not depend on joint 1, and it is not a planar section when the point moves out of
 *   the arm plane (its lateral part is folded into r).
 * - *Top view*: the plan swept by joint 1 over its range, looking down axis 1, in base x, y (mm) when axis 1 is
 *   vertical (for another direction: the projections of base x and y onto the plane normal to axis 1). It is built
 *   from the azimuths ψ the point reaches at each distance from axis 1 (the plan of the side-view set), dilated by
 *   the joint 1 range.
 * - *Volume*: the solid swept about axis 1 by the side-view set over the joint 1 range, by Pappus's centroid theorem
 *   per radius: V = ∫∫_{ρ ≥ 0} ρ · Φ(ρ, z) dρ dz, where Φ is the measure of the azimuths covered at that radius: with
 *   only the front (r = +ρ) reached, Φ = |Ψ_front(ρ) ⊕ [t_lo, t_hi]|; only the back, the same with Ψ_back; both,
 *   the union of the two (so a point and its mirror over axis 1 are not counted twice, and Φ ≤ 2π). Ψ(ρ) are the
 *   azimuths the point reaches at distance ρ over all heights (exact for arms whose point stays in one plane, an
 *   upper bound otherwise); when the joint 1 range is a full turn Φ = 2π and no approximation is involved.
 * - SCARA: side view = the stroke × the radial band [r_min, a₁ + a₂] (r is the distance from axis 1 of the forearm
 *   tip, whatever the elbow angle); top view = the region swept by the forearm's arc; volume = annular sector ×
 *   stroke for a full turn of joint 1; with a partial turn the sector's ends bulge by the forearm's angular spread
 *   ψ(ρ) at each radius, which the top view and the volume include: V = stroke · ∫ ρ (Δ₁ + 2ψ(ρ)) dρ.
 * - Palletizer: passive parallelogram joints follow their coupling; the views are those of an articulated arm.
 *
 * **Layout "prismatic-base"** (the first joint is prismatic: gantries, linear tracks). There is no axis to turn
 * about: the side view is the projection on the base x–z plane ([xMm, zMm]), the top view the projection on the
 * base x–y plane ([xMm, yMm]); reach figures are horizontal distances from the base z axis. Volume = the set at
 * joint 1 = 0 swept along joint 1: (stroke + t)·A⊥, with A⊥ the area of its projection on the plane normal to
 * joint 1 and t its extent along joint 1 (exact for a box gantry, an upper bound when the rest of the arm has depth
 * along joint 1).
 *
 * **Layout "base-frame"** (joint 1 coupled with other joints; unusual): projections as for prismatic-base, every
 * joint sampled, no volume.
 *
 * ## Method and accuracy
 * The joints that move the point are sampled on a grid (steps from the sagitta of each joint, jointSampling.ts): two
 * "primary" joints form a grid whose cells, split into triangles, are filled as piecewise-linear images (winding
 * numbers on the rows of a run-length raster, sliceCover.ts) for every combination ("slice") of the other joints.
 * Between neighbouring slices the corners of the joint box (two limits at once) and, in the side view, the axis gap
 * (lateral offset changing sign) are swept explicitly (cornerSweep.ts, axisSweep.ts): sampled slices alone would
 * leave saw-teeth of first order there. Each row holds the region's extent within its band (|z − z_j| ≤ half a row
 * spacing), so corners and thin strips between two row lines are kept (sliceCover.ts); outlines come from marching
 * squares (isolines.ts), which keep every row interval however narrow (coverOutline.ts), and are simplified
 * (Douglas–Peucker). Outer rings are never dropped; only holes narrower than the secondary-joint step (pockets
 * between sampled slices) are filled. A secondary prismatic joint is sampled finely enough for the curved boundary
 * it translates, and a prismatic joint for the bend of ρ along its line (jointSampling.ts). Reach and height figures are refined from the best grid sample
 * by a bounded compass search (extremes.ts), so they are local optima, not grid values.
 *
 * Target boundary error: max(minToleranceMm, toleranceOfReach × reach of the point). `toleranceMm` states a bound:
 * the sampling budget σ (the per-joint sagittas added, the worst case with every joint half a step off at once) +
 * half a row spacing (a boundary between two rows is placed midway) + the simplification distance + 0.15 × the
 * target (row gaps narrower than 0.3 × target are closed, holes and islands below (0.3 × target)² dropped: features
 * below the resolution). With the default shares the parts add up to 0.95 × target. It exceeds the
 * target when `workBudget` forced a coarser grid (a note says so); being a sum of worst cases it is pessimistic:
 * on closed forms the measured error stays within the target even then (see the tests).
 *
 * @see Pappus's centroid theorem (volume of a solid of revolution); Craig, Introduction to Robotics, ch. 4
 *   (workspace of the two-link arm) [from memory]; CHECKS C3, C6
 */
import type { Chain } from "../kinematics/chain";
import { createScratch, forwardInto } from "../kinematics/forward";
import { mToMm } from "../units";
import { coverMinAbsX, coverRings } from "./coverOutline";
import {
  chainPoint,
  forEachSlice,
  planSampling,
  type ChainPoint,
  type SamplingPlan,
  type SliceBuffers,
} from "./jointSampling";
import {
  polarProfile,
  sweptPlanArcs,
  sweptPlanRings,
  arcsMeasure,
  intersectArcs,
  sweepArcs,
  type PolarProfile,
} from "./polarSweep";
import { assemblePolygons, polygonsArea, pointInPolygons, simplifyFlatRing, type PolygonMm } from "./polygon";
import { RowCover } from "./rowCover";
import { addSlice, addTriangles, SliceScratch } from "./sliceCover";
import { CornerSweep } from "./cornerSweep";
import { AxisSweep } from "./axisSweep";
import { Extremes } from "./extremes";

export type { PolygonMm, PointMm, RingMm } from "./polygon";

export interface EnvelopeOptions {
  /** Smallest boundary tolerance, mm. */
  readonly minToleranceMm: number;
  /** Boundary tolerance as a share of the point's reach (0.002 = 0.2 %). */
  readonly toleranceOfReach: number;
  /** Share of the tolerance spent on joint sampling (sagitta). */
  readonly samplingShare: number;
  /** Row spacing of the raster as a share of the tolerance. */
  readonly rowShare: number;
  /** Polygon simplification distance as a share of the tolerance. */
  readonly simplifyShare: number;
  /** Largest work per view pass (grid points + estimated outline crossings over all slices); beyond it the joint grid
   * coarsens and toleranceMm grows. 8 M ≈ 0.4 s per pass on one core (measured on the demo arms). */
  readonly workBudget: number;
  /** Compute the flange envelope as well as the WCP's. */
  readonly flange: boolean;
}

export const DEFAULT_ENVELOPE_OPTIONS: EnvelopeOptions = {
  minToleranceMm: 2,
  toleranceOfReach: 0.002,
  samplingShare: 0.35,
  rowShare: 0.7,
  simplifyShare: 0.1,
  workBudget: 8_000_000,
  flange: true,
};

export type EnvelopeLayout = "revolute-base" | "prismatic-base" | "base-frame";

/** Envelope of one point (WCP or flange origin). Lengths in mm, areas in m², volume in m³. */
export interface PointEnvelope {
  readonly point: "wcp" | "flange";
  /** Side view polygons, points [horizontal, vertical] in mm (see WorkspaceEnvelope.sideAxes). */
  readonly side: readonly PolygonMm[];
  /** Top view polygons, points [x, y] in mm. */
  readonly top: readonly PolygonMm[];
  /** Largest horizontal distance from axis 1 (revolute-base) or from the base z axis (otherwise), mm. */
  readonly maxReachMm: number;
  /** Smallest such distance, mm (0 when the point reaches the axis). */
  readonly minReachMm: number;
  /** Largest and smallest coordinate along axis 1 (base z for a vertical axis 1), mm. */
  readonly maxHeightMm: number;
  readonly minHeightMm: number;
  /** Area of the side-view region, m². */
  readonly sideAreaM2: number;
  /** Area of the top-view region, m². */
  readonly topAreaM2: number;
  /** Volume of the swept solid (see the module doc), m³; null where not defined (base-frame layout). */
  readonly volumeM3: number | null;
  /** Boundary tolerance aimed at, mm. */
  readonly targetToleranceMm: number;
  /** Stated bound on the boundary error of the polygons, mm (above the target only when workBudget bit). */
  readonly toleranceMm: number;
  /** Joint-space grid points evaluated. */
  readonly samples: number;
}

export interface Axis1 {
  /** A point of axis 1 (the origin of F₀), base frame, mm. */
  readonly pointMm: readonly [number, number, number];
  /** Unit direction of axis 1, base frame. */
  readonly direction: readonly [number, number, number];
  /** Unit forward direction e_f at joint 1 kinematic angle 0, base frame. */
  readonly forward: readonly [number, number, number];
  /** Kinematic joint 1 range swept, rad ([lo, hi]; hi − lo ≥ 2π for a full turn). */
  readonly sweepRad: readonly [number, number];
}

export interface WorkspaceEnvelope {
  readonly layout: EnvelopeLayout;
  /** Axis labels of the side and top views, e.g. ["rMm", "zMm"] and ["xMm", "yMm"]. */
  readonly sideAxes: readonly [string, string];
  readonly topAxes: readonly [string, string];
  /** Axis 1 (revolute-base only). */
  readonly axis1: Axis1 | null;
  readonly wcp: PointEnvelope | null;
  readonly flange: PointEnvelope | null;
  /** Plain-language remarks: assumptions, coarsened sampling. */
  readonly notes: readonly string[];
}

const MM_PER_M = mToMm(1);
const MM2_PER_M2 = MM_PER_M * MM_PER_M;
const MM3_PER_M3 = MM2_PER_M2 * MM_PER_M;
const TWO_PI = 2 * Math.PI;
/** Row gaps narrower than this share of the tolerance are closed; rings smaller than (share × tolerance)² dropped. */
const GAP_SHARE = 0.3;

type Vec3 = [number, number, number];
const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const cross = (a: Vec3, b: Vec3): Vec3 => [
  a[1] * b[2] - a[2] * b[1],
  a[2] * b[0] - a[0] * b[2],
  a[0] * b[1] - a[1] * b[0],
];
const norm = (a: Vec3) => Math.hypot(a[0], a[1], a[2]);
const scale = (a: Vec3, s: number): Vec3 => [a[0] * s, a[1] * s, a[2] * s];
const sub = (a: Vec3, b: Vec3): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
const unit = (a: Vec3): Vec3 => scale(a, 1 / norm(a));

function validate(o: EnvelopeOptions): void {
  const positive: (keyof EnvelopeOptions)[] = ["minToleranceMm", "samplingShare", "rowShare", "workBudget"];
  for (const k of positive) if (!((o[k] as number) > 0)) throw new RangeError(`invalid ${k}: ${String(o[k])}`);
  if (!(o.toleranceOfReach >= 0)) throw new RangeError(`invalid toleranceOfReach: ${o.toleranceOfReach}`);
  if (!(o.simplifyShare >= 0)) throw new RangeError(`invalid simplifyShare: ${o.simplifyShare}`);
}

/** Driven joint 0 moves kinematic joint 0 only, and kinematic joint 0 follows driven joint 0 only. */
function firstJointExclusive(chain: Chain): boolean {
  const m = chain.drivenCount,
    g = chain.couplingGain;
  if (chain.drivenJoint[0] !== 0) return false;
  for (let j = 1; j < m; j++) if (g[j] !== 0) return false;
  for (let i = 1; i < chain.jointCount; i++) if (g[i * m] !== 0) return false;
  return g[0] !== 0;
}

/** View matrix rows (unit vectors, base frame) with translation −row·origin, scaled to mm. */
function viewMatrix(rows: readonly Vec3[], origin: Vec3, translate: readonly boolean[]): Float64Array {
  const v = new Float64Array(12);
  rows.forEach((r, i) => {
    v[4 * i] = r[0] * MM_PER_M;
    v[4 * i + 1] = r[1] * MM_PER_M;
    v[4 * i + 2] = r[2] * MM_PER_M;
    v[4 * i + 3] = translate[i] ? -dot(r, origin) * MM_PER_M : 0;
  });
  return v;
}

function toleranceFn(o: EnvelopeOptions): (radiusMm: number) => number {
  return (r) => Math.max(o.minToleranceMm, o.toleranceOfReach * r);
}

/**
 * Simplified, assembled polygons. Holes narrower than `pocketMm` (2 · area / perimeter) are dropped: points reached
 * only for secondary-joint values strictly between two samples can leave such pockets inside the union (slivers as
 * wide as the secondary step at most, however long), while the holes of a real envelope (around the shoulder, behind
 * a joint limit) are far wider. Outer rings are never dropped (see assemblePolygons).
 */
function polygonsOf(rings: readonly Float64Array[], tolMm: number, o: EnvelopeOptions, pocketMm = 0): PolygonMm[] {
  const eps = o.simplifyShare * tolMm;
  return assemblePolygons(
    rings.map((r) => simplifyFlatRing(r, eps)),
    (GAP_SHARE * tolMm) ** 2,
    pocketMm,
  );
}

/**
 * Stated bound on the boundary error: the sampling budget (sagitta of the joint grid) + half a row spacing (a
 * boundary between two rows is placed midway; along a row it is exact) + the simplification distance.
 */
function statedTolerance(plan: SamplingPlan, rowMm: number, o: EnvelopeOptions, targetMm: number): number {
  return Math.max(targetMm, plan.samplingSigmaMm + rowMm / 2 + o.simplifyShare * targetMm + (GAP_SHARE / 2) * targetMm);
}

/**
 * Accumulates the image of every slice of the plan into `cover` (signed radius: (±√(c₀² + c₁²), c₂); otherwise
 * (c₀, c₁)), with the corner sweeps between neighbouring slices. `onSlice` sees every slice first.
 */
function accumulate(
  plan: SamplingPlan,
  cover: RowCover,
  signedRadius: boolean,
  rowMm: number,
  scratch: SliceScratch,
  onSlice?: (b: SliceBuffers) => void,
): void {
  const na = plan.a.values.length,
    nb = plan.b.values.length;
  // a periodic primary joint leaves the region no corners to sweep
  const sweep = plan.a.periodic || plan.b.periodic ? null : new CornerSweep(plan, 1);
  // the signed radius jumps across x = 0: close the axis gap where the lateral offset changes sign between slices
  const axis = signedRadius && plan.secondaries.length > 0 ? new AxisSweep(plan) : null;
  const mode = { signedRadius, nodeSpacingMm: rowMm, periodicA: plan.a.periodic, periodicB: plan.b.periodic };
  forEachSlice(plan, (buf, slice) => {
    onSlice?.(buf);
    addSlice(cover, buf.c0, buf.c1, buf.c2, na, nb, mode, scratch);
    if (sweep) {
      sweep.visit(buf, slice);
      if (sweep.count > 0) addTriangles(cover, sweep.tris, sweep.count, signedRadius, scratch);
    }
    if (axis) {
      axis.visit(buf, slice);
      if (axis.count > 0) addTriangles(cover, axis.tris, axis.count, true, scratch);
    }
  });
}

/**
 * Workspace envelope of the WCP (when the chain has one) and the flange origin.
 * @param chain compiled chain (SI)
 * @returns views as polygons in mm, figures in mm, m², m³ (see the module doc for what each view means per layout)
 * @throws RangeError for invalid options or an unbounded prismatic joint
 * @example workspaceEnvelope(twoLinkArm) // vertical axis 1, shoulder on the axis, links 0.5 m and 0.3 m, all joints
 *   // ±180°: side view = annulus 200 mm ≤ ρ ≤ 800 mm about the shoulder, sideAreaM2 ≈ 4π·0.5·0.3 = 1.885,
 *   // volumeM3 ≈ 4/3·π·(0.8³ − 0.2³) = 2.111
 */
export function workspaceEnvelope(
  chain: Chain,
  options: EnvelopeOptions = DEFAULT_ENVELOPE_OPTIONS,
): WorkspaceEnvelope {
  validate(options);
  const exclusive = firstJointExclusive(chain);
  if (exclusive && !chain.isPrismatic[0]) return revoluteBase(chain, options);
  return projectedBase(chain, options, exclusive && chain.isPrismatic[0] === 1 ? "prismatic-base" : "base-frame");
}

// ---------------------------------------------------------------------------------------------------------------
// Revolute base

function revoluteBase(chain: Chain, o: EnvelopeOptions): WorkspaceEnvelope {
  const notes: string[] = [];
  const m = chain.drivenCount;
  const f0 = chain.fixed;
  const u = unit([
    f0[0]! * chain.axisLocal[0]! + f0[1]! * chain.axisLocal[1]! + f0[2]! * chain.axisLocal[2]!,
    f0[4]! * chain.axisLocal[0]! + f0[5]! * chain.axisLocal[1]! + f0[6]! * chain.axisLocal[2]!,
    f0[8]! * chain.axisLocal[0]! + f0[9]! * chain.axisLocal[1]! + f0[10]! * chain.axisLocal[2]!,
  ]);
  const origin: Vec3 = [f0[3]!, f0[7]!, f0[11]!];
  const g00 = chain.couplingGain[0]!,
    off0 = chain.couplingOffset[0]!;
  const q0 = -off0 / g00;
  // kinematic sweep of joint 1
  const lo = chain.lowerSi[0]!,
    hi = chain.upperSi[0]!;
  let tLo = -Math.PI,
    tHi = Math.PI;
  if (Number.isFinite(lo) && Number.isFinite(hi)) {
    const a = g00 * lo + off0,
      b = g00 * hi + off0;
    tLo = Math.min(a, b);
    tHi = Math.max(a, b);
  }
  const sweep = tHi - tLo;

  // reference pose: driven joints at 0 clamped, joint 1 at kinematic 0
  const qRef = new Float64Array(m);
  for (let j = 0; j < m; j++) qRef[j] = Math.min(Math.max(0, chain.lowerSi[j]!), chain.upperSi[j]!) || 0;
  qRef[0] = q0;
  const s = createScratch(chain);
  forwardInto(chain, qRef, s);
  const refPoint = chainPoint(chain, "wcp") ?? chainPoint(chain, "flange")!;
  const pRef = pointOf(s.motionFrames, refPoint);
  const toPoint = sub(pRef, origin);
  let forward: Vec3 | null = null;
  for (let i = 1; i < chain.jointCount && !forward; i++) {
    const f = 16 * i,
      fr = s.motionFrames,
      ax = chain.axisLocal;
    const z: Vec3 = [
      fr[f]! * ax[3 * i]! + fr[f + 1]! * ax[3 * i + 1]! + fr[f + 2]! * ax[3 * i + 2]!,
      fr[f + 4]! * ax[3 * i]! + fr[f + 5]! * ax[3 * i + 1]! + fr[f + 6]! * ax[3 * i + 2]!,
      fr[f + 8]! * ax[3 * i]! + fr[f + 9]! * ax[3 * i + 1]! + fr[f + 10]! * ax[3 * i + 2]!,
    ];
    const c = cross(u, z);
    if (norm(c) < 1e-6) continue;
    forward = chain.isPrismatic[i] ? unit(sub(z, scale(u, dot(z, u)))) : unit(c);
  }
  const radial = sub(toPoint, scale(u, dot(toPoint, u)));
  if (!forward) {
    if (norm(radial) > 1e-9) forward = unit(radial);
    else {
      const x: Vec3 = [1, 0, 0],
        y: Vec3 = [0, 1, 0];
      const px = sub(x, scale(u, dot(x, u)));
      forward = norm(px) > 1e-6 ? unit(px) : unit(sub(y, scale(u, dot(y, u))));
    }
  }
  if (dot(forward, toPoint) < -1e-12) forward = scale(forward, -1);
  const lateral = cross(u, forward);
  const view = viewMatrix([forward, lateral, u], origin, [true, true, false]);

  // plan axes of the top view
  const zAxis: Vec3 = [0, 0, 1];
  let ea: Vec3, eb: Vec3;
  if (Math.abs(dot(u, zAxis)) >= 0.5) {
    ea = unit(sub([1, 0, 0], scale(u, u[0])));
    const yp = sub([0, 1, 0], scale(u, u[1]));
    eb = unit(sub(yp, scale(ea, dot(yp, ea))));
  } else {
    const xp = sub([1, 0, 0], scale(u, u[0]));
    ea = norm(xp) > 1e-6 ? unit(xp) : unit(sub([0, 1, 0], scale(u, u[1])));
    eb = cross(u, ea);
  }
  const sense: 1 | -1 = dot(cross(ea, eb), u) >= 0 ? 1 : -1;
  const phi0 = Math.atan2(dot(forward, eb), dot(forward, ea));
  const centre: [number, number] = [dot(origin, ea) * MM_PER_M, dot(origin, eb) * MM_PER_M];

  const fixed = new Map([[0, q0]]);
  const one = (kind: "wcp" | "flange"): PointEnvelope | null => {
    const pt = chainPoint(chain, kind);
    if (!pt) return null;
    const base = {
      chain,
      point: pt,
      view,
      fixed,
      toleranceMm: toleranceFn(o),
      samplingShare: o.samplingShare,
      rowShare: o.rowShare,
      maxWork: o.workBudget,
    } as const;
    const plan = planSampling({ ...base, relevantRows: 3, scoring: "radial" });
    const target = toleranceFn(o)(plan.estimate.radiusMm);
    const row = o.rowShare * target;
    // the plan view gets its own primary pair (the joints that spread the point sideways may differ)
    const planView = planSampling({ ...base, toleranceMm: () => target, relevantRows: 2, scoring: "plane" });
    const side = new RowCover(0, row),
      plane = new RowCover(0, row);
    const scratch = new SliceScratch();
    const ext = new Extremes(plan, 2);
    accumulate(plan, side, true, row, scratch, (buf) => ext.visit(buf));
    const maxRho = ext.refined(0),
      minRho = ext.refined(1);
    accumulate(planView, plane, false, row, scratch);
    // gaps narrower than GAP_SHARE × tolerance are below the resolution (e.g. the axis gap ±|y| left by sampled
    // slices whose lateral offset is small): closing them moves the boundary by at most half that
    side.closeGaps(GAP_SHARE * target);
    plane.closeGaps(GAP_SHARE * target);
    const sidePolygons = polygonsOf(coverRings(side, row), target, o, plan.secondaryStepMm);
    const planRings = coverRings(plane, row).map((r) => simplifyFlatRing(r, o.simplifyShare * target));
    const profile = polarProfile(planRings, row);
    const place = { tLoRad: tLo, tHiRad: tHi, phi0Rad: phi0, sense, centreMm: centre } as const;
    const topPolygons = polygonsOf(
      sweptPlanRings(sweptPlanArcs(profile, place), row, centre),
      target,
      o,
      planView.secondaryStepMm,
    );
    const volumeMm3 = revolvedVolume(side, profile, tLo, tHi);
    const tol = Math.max(statedTolerance(plan, row, o, target), statedTolerance(planView, row, o, target));
    if (tol > target * 1.0001)
      notes.push(
        `${kind}: the sample budget (workBudget ${o.workBudget}) coarsened the joint grid; boundary error up to ${tol.toFixed(1)} mm instead of ${target.toFixed(1)} mm`,
      );
    return {
      point: kind,
      side: sidePolygons,
      top: topPolygons,
      maxReachMm: maxRho,
      minReachMm: Math.max(0, Math.min(minRho, coverMinAbsX(side))),
      maxHeightMm: ext.refined(2),
      minHeightMm: ext.refined(3),
      sideAreaM2: side.area() / MM2_PER_M2,
      topAreaM2: polygonsArea(topPolygons) / MM2_PER_M2,
      volumeM3: volumeMm3 / MM3_PER_M3,
      targetToleranceMm: target,
      toleranceMm: tol,
      samples: plan.pointCount + planView.pointCount,
    };
  };
  const wcp = one("wcp");
  const flange = o.flange || !wcp ? one("flange") : null;
  if (sweep < TWO_PI)
    notes.push(
      "volume: azimuths reached at each distance from axis 1 are taken over all heights (exact when the point stays in one plane, an upper bound otherwise)",
    );
  return {
    layout: "revolute-base",
    sideAxes: ["rMm", "zMm"],
    topAxes: ["xMm", "yMm"],
    axis1: {
      pointMm: [origin[0] * MM_PER_M, origin[1] * MM_PER_M, origin[2] * MM_PER_M],
      direction: u,
      forward,
      sweepRad: [tLo, tHi],
    },
    wcp,
    flange,
    notes,
  };
}

function pointOf(frames: Float64Array, pt: ChainPoint): Vec3 {
  const o = 16 * pt.lastJoint,
    l = pt.localM;
  const r = (k: number) =>
    frames[o + 4 * k]! * l[0]! +
    frames[o + 4 * k + 1]! * l[1]! +
    frames[o + 4 * k + 2]! * l[2]! +
    frames[o + 4 * k + 3]!;
  return [r(0), r(1), r(2)];
}

/**
 * V = Σ_rows Δz · Σ_intervals ∫ ρ Φ(ρ) dρ over the side view folded onto ρ ≥ 0 (mm³), with Φ from the azimuth
 * profile per polar row (front only, back only, or both) dilated by the joint 1 range.
 */
function revolvedVolume(side: RowCover, profile: PolarProfile, tLo: number, tHi: number): number {
  const full = tHi - tLo >= TWO_PI;
  const drho = profile.drhoMm;
  const rows = profile.arcs.length;
  const phiF = new Float64Array(rows),
    phiB = new Float64Array(rows),
    phiFB = new Float64Array(rows);
  const base = Math.min(TWO_PI, tHi - tLo),
    both = Math.min(TWO_PI, 2 * (tHi - tLo));
  for (let k = 0; k < rows; k++) {
    if (full) {
      phiF[k] = phiB[k] = phiFB[k] = TWO_PI;
      continue;
    }
    const arcs = profile.arcs[k]!;
    const front: number[] = [],
      back: number[] = [];
    for (let a = 0; a < arcs.length; a += 2) {
      intersectArcs(arcs[a]!, arcs[a + 1]!, -Math.PI / 2, Math.PI, front);
      intersectArcs(arcs[a]!, arcs[a + 1]!, Math.PI / 2, Math.PI, back);
    }
    if (front.length === 0) front.push(0, 0);
    if (back.length === 0) back.push(Math.PI, 0);
    const sf = sweepArcs(front, tLo, tHi),
      sb = sweepArcs(back, tLo, tHi);
    phiF[k] = arcsMeasure(sf);
    phiB[k] = arcsMeasure(sb);
    phiFB[k] = arcsMeasure(Float64Array.from([...sf, ...sb]));
  }
  // ∫_a^b ρ Φ dρ split at the polar row boundaries ρ = k·Δρ (Φ of category cat in polar row k; beyond the profile,
  // the joint 1 range alone). Runs once per polar row crossed: Φ is looked up inline.
  const integrate = (a: number, b: number, cat: 0 | 1 | 2): number => {
    const phis = cat === 0 ? phiF : cat === 1 ? phiB : phiFB,
      outside = cat === 2 ? both : base;
    let sum = 0;
    let k = Math.floor(a / drho);
    let x = a;
    while (x < b) {
      const end = Math.min(b, (k + 1) * drho);
      const phi = full ? TWO_PI : k >= rows || k < 0 ? outside : phis[k]!;
      sum += ((end * end - x * x) / 2) * phi;
      x = end;
      k++;
    }
    return sum;
  };
  let volume = 0;
  for (let j = side.jMin, jEnd = side.jMax; j <= jEnd; j++) {
    const v = side.valuesOf(j),
      len = side.lengthOf(j);
    if (len === 0) continue;
    // front intervals (ρ = r ≥ 0) and back intervals mirrored (ρ = −r ≥ 0), each sorted ascending in ρ
    const fr: number[] = [],
      bk: number[] = [];
    for (let k = 0; k < len; k += 2) {
      const s = v[k]!,
        e = v[k + 1]!;
      if (e > 0) fr.push(Math.max(0, s), e);
      if (s < 0) bk.push(Math.max(0, -e), -s);
    }
    const bkSorted: number[] = [];
    for (let k = bk.length - 2; k >= 0; k -= 2) bkSorted.push(bk[k]!, bk[k + 1]!);
    // sweep the breakpoints of both lists
    const cuts = [...fr, ...bkSorted].sort((p, q) => p - q);
    let rowSum = 0;
    for (let c = 0; c + 1 < cuts.length; c++) {
      const a = cuts[c]!,
        b = cuts[c + 1]!;
      if (!(b > a)) continue;
      const mid = (a + b) / 2;
      const inF = inside(fr, mid),
        inB = inside(bkSorted, mid);
      if (inF || inB) rowSum += integrate(a, b, inF && inB ? 2 : inF ? 0 : 1);
    }
    volume += rowSum * side.dy;
  }
  return volume;
}

function inside(intervals: readonly number[], x: number): boolean {
  for (let k = 0; k < intervals.length; k += 2) if (intervals[k]! <= x && x <= intervals[k + 1]!) return true;
  return false;
}

// ---------------------------------------------------------------------------------------------------------------
// Prismatic base and base-frame layouts: projections on base planes

function projectedBase(chain: Chain, o: EnvelopeOptions, layout: "prismatic-base" | "base-frame"): WorkspaceEnvelope {
  const notes: string[] = [];
  const zero: Vec3 = [0, 0, 0];
  const X: Vec3 = [1, 0, 0],
    Y: Vec3 = [0, 1, 0],
    Z: Vec3 = [0, 0, 1];
  const sideView = viewMatrix([X, Z, Y], zero, [false, false, false]);
  const topView = viewMatrix([X, Y, Z], zero, [false, false, false]);
  const none = new Map<number, number>();
  if (layout === "base-frame")
    notes.push("joint 1 is coupled with other joints: views are projections on base planes, no swept volume");
  const one = (kind: "wcp" | "flange"): PointEnvelope | null => {
    const pt = chainPoint(chain, kind);
    if (!pt) return null;
    const req = {
      chain,
      point: pt,
      relevantRows: 2,
      scoring: "plane",
      toleranceMm: toleranceFn(o),
      samplingShare: o.samplingShare,
      rowShare: o.rowShare,
      maxWork: o.workBudget,
    } as const;
    // one target for the point, from its overall size
    const sizePlan = planSampling({ ...req, view: sideView, fixed: none });
    const target = toleranceFn(o)(sizePlan.estimate.radiusMm);
    const fixedTol = () => target;
    const row = o.rowShare * target;
    const scratch = new SliceScratch();
    const sidePlan = planSampling({ ...req, toleranceMm: fixedTol, view: sideView, fixed: none });
    const side = new RowCover(0, row);
    const sideExt = new Extremes(sidePlan, 1);
    accumulate(sidePlan, side, false, row, scratch, (buf) => sideExt.visit(buf));
    const maxH = sideExt.refined(2),
      minH = sideExt.refined(3);
    const topPlan = planSampling({ ...req, toleranceMm: fixedTol, view: topView, fixed: none });
    const top = new RowCover(0, row);
    const topExt = new Extremes(topPlan, 2);
    accumulate(topPlan, top, false, row, scratch, (buf) => topExt.visit(buf));
    const maxReach = topExt.refined(0);
    side.closeGaps(GAP_SHARE * target);
    top.closeGaps(GAP_SHARE * target);
    const sidePolygons = polygonsOf(coverRings(side, row), target, o, sidePlan.secondaryStepMm);
    const topPolygons = polygonsOf(coverRings(top, row), target, o, topPlan.secondaryStepMm);
    let volumeM3: number | null = null;
    let samples = sidePlan.pointCount + topPlan.pointCount;
    let tol = Math.max(statedTolerance(sidePlan, row, o, target), statedTolerance(topPlan, row, o, target));
    if (layout === "prismatic-base") {
      const f0 = chain.fixed,
        ax = chain.axisLocal;
      const u1 = unit([
        f0[0]! * ax[0]! + f0[1]! * ax[1]! + f0[2]! * ax[2]!,
        f0[4]! * ax[0]! + f0[5]! * ax[1]! + f0[6]! * ax[2]!,
        f0[8]! * ax[0]! + f0[9]! * ax[1]! + f0[10]! * ax[2]!,
      ]);
      const e1 = Math.abs(u1[2]) < 0.9 ? unit(cross(Z, u1)) : unit(cross(X, u1));
      const e2 = cross(u1, e1);
      const sectionView = viewMatrix([e1, e2, u1], zero, [false, false, false]);
      const g00 = chain.couplingGain[0]!,
        off0 = chain.couplingOffset[0]!;
      const sectionPlan = planSampling({
        ...req,
        toleranceMm: fixedTol,
        view: sectionView,
        fixed: new Map([[0, -off0 / g00]]),
      });
      const section = new RowCover(0, row);
      let tMin = Infinity,
        tMax = -Infinity;
      accumulate(sectionPlan, section, false, row, scratch, ({ c2 }) => {
        for (let p = 0; p < c2.length; p++) {
          if (c2[p]! < tMin) tMin = c2[p]!;
          if (c2[p]! > tMax) tMax = c2[p]!;
        }
      });
      const strokeMm = Math.abs(g00) * (chain.upperSi[0]! - chain.lowerSi[0]!) * MM_PER_M;
      volumeM3 = ((strokeMm + (tMax - tMin)) * section.area()) / MM3_PER_M3;
      samples += sectionPlan.pointCount;
      tol = Math.max(tol, statedTolerance(sectionPlan, row, o, target));
    }
    if (tol > target * 1.0001)
      notes.push(`${kind}: the sample budget coarsened the joint grid; boundary error up to ${tol.toFixed(1)} mm`);
    return {
      point: kind,
      side: sidePolygons,
      top: topPolygons,
      maxReachMm: maxReach,
      // the nearest sample (refined) bounds the minimum too: the top view may have no polygon at all when the
      // point's projection on the base x–y plane has no area (a vertical line or curve)
      minReachMm: pointInPolygons(0, 0, topPolygons)
        ? 0
        : Math.max(0, Math.min(topExt.refined(1), distanceToPolygons(0, 0, topPolygons))),
      maxHeightMm: maxH,
      minHeightMm: minH,
      sideAreaM2: side.area() / MM2_PER_M2,
      topAreaM2: top.area() / MM2_PER_M2,
      volumeM3,
      targetToleranceMm: target,
      toleranceMm: tol,
      samples,
    };
  };
  const wcp = one("wcp");
  const flange = o.flange || !wcp ? one("flange") : null;
  return { layout, sideAxes: ["xMm", "zMm"], topAxes: ["xMm", "yMm"], axis1: null, wcp, flange, notes };
}

function distanceToPolygons(x: number, y: number, polygons: readonly PolygonMm[]): number {
  let best = Infinity;
  for (const p of polygons) {
    for (const ring of [p.outer, ...p.holes]) {
      for (let k = 1; k < ring.length; k++) {
        const [ax, ay] = ring[k - 1]!,
          [bx, by] = ring[k]!;
        const dx = bx - ax,
          dy = by - ay,
          l2 = dx * dx + dy * dy;
        const t = l2 > 0 ? Math.max(0, Math.min(1, ((x - ax) * dx + (y - ay) * dy) / l2)) : 0;
        best = Math.min(best, Math.hypot(x - ax - t * dx, y - ay - t * dy));
      }
    }
  }
  return best;
}
