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
 * Between neighbouring slices the corners of the joint box (two limits at once) and, in the side view, the fold at
 * axis 1 (where x changes sign, r piles up at ±|y|: one spike per slice, and the gap −|y| < r < |y| when y changes
 * sign) are swept explicitly (cornerSweep.ts, axisSweep.ts): sampled slices alone would leave saw-teeth of first
 * order there. Each row holds the region's extent within its band (|z − z_j| ≤ half a row
 * spacing), so corners and thin strips between two row lines are kept (sliceCover.ts); outlines come from marching
 * squares (isolines.ts), which keep every row interval however narrow (coverOutline.ts), and are simplified
 * (Douglas–Peucker). Outer rings are never dropped; only holes narrower than the secondary-joint step and than
 * twice the stated tolerance (sliver pockets between sampled slices, see viewPass.ts) are filled, and the stated
 * side area is that of the set as drawn (the rows' area plus the pockets filled). A secondary prismatic joint is sampled finely enough for the curved boundary
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
import type { Chain } from "../../kinematics/chain";
import { DEFAULT_ENVELOPE_OPTIONS, type EnvelopeOptions, type WorkspaceEnvelope } from "./envelopeTypes";
import { projectedBase } from "./projectedBase";
import { revoluteBase } from "./revoluteBase";

export type { PolygonMm, PointMm, RingMm } from "../../geometry/polygon";
export {
  DEFAULT_ENVELOPE_OPTIONS,
  type Axis1,
  type EnvelopeLayout,
  type EnvelopeOptions,
  type PointEnvelope,
  type WorkspaceEnvelope,
} from "./envelopeTypes";

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
