/**
 * What the envelope's layouts share: vector helpers, view matrices, the tolerance and its stated bound, one view
 * pass over a sampling plan (accumulate: slices, corner and axis sweeps into a RowCover) and the outline's polygons.
 */
import { assemblePolygons, simplifyFlatRing, type PolygonMm } from "../../geometry/polygon";
import { mToMm } from "../../units";
import { AxisSweep } from "./axisSweep";
import { CornerSweep } from "./cornerSweep";
import type { EnvelopeOptions } from "./envelopeTypes";
import type { SamplingPlan } from "./jointSampling";
import { deepestPoint, type PocketProbe } from "./pocketProbe";
import type { RowCover } from "./rowCover";
import { addSlice, addTriangles } from "./sliceCover";
import type { SliceScratch } from "./sliceScratch";
import { forEachSlice, type SliceBuffers } from "./sliceGrid";

export const MM_PER_M = mToMm(1);
export const MM2_PER_M2 = MM_PER_M * MM_PER_M;
export const MM3_PER_M3 = MM2_PER_M2 * MM_PER_M;
export const TWO_PI = 2 * Math.PI;
/** Row gaps narrower than this share of the tolerance are closed; rings smaller than (share × tolerance)² dropped. */
export const GAP_SHARE = 0.3;

export type Vec3 = [number, number, number];
export const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
export const cross = (a: Vec3, b: Vec3): Vec3 => [
  a[1] * b[2] - a[2] * b[1],
  a[2] * b[0] - a[0] * b[2],
  a[0] * b[1] - a[1] * b[0],
];
export const norm = (a: Vec3) => Math.hypot(a[0], a[1], a[2]);
export const scale = (a: Vec3, s: number): Vec3 => [a[0] * s, a[1] * s, a[2] * s];
export const sub = (a: Vec3, b: Vec3): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
export const unit = (a: Vec3): Vec3 => scale(a, 1 / norm(a));

/** View matrix rows (unit vectors, base frame) with translation −row·origin, scaled to mm. */
export function viewMatrix(rows: readonly Vec3[], origin: Vec3, translate: readonly boolean[]): Float64Array {
  const v = new Float64Array(12);
  rows.forEach((r, i) => {
    v[4 * i] = r[0] * MM_PER_M;
    v[4 * i + 1] = r[1] * MM_PER_M;
    v[4 * i + 2] = r[2] * MM_PER_M;
    v[4 * i + 3] = translate[i] ? -dot(r, origin) * MM_PER_M : 0;
  });
  return v;
}

export function toleranceFn(o: EnvelopeOptions): (radiusMm: number) => number {
  return (r) => Math.max(o.minToleranceMm, o.toleranceOfReach * r);
}

/**
 * Pocket rule. Points reached only for secondary-joint values strictly between two samples can leave pockets inside
 * the union of the sampled slices, at most as wide (2 · area / perimeter) as the secondary step; a hole of the
 * envelope (around the shoulder, behind a joint limit) may be as narrow. A hole narrower than the secondary step is
 * filled when it is at most twice the stated tolerance wide (a sliver that narrow keeps its points within the
 * tolerance of its edge) or when a pose puts the point within the tolerance of its deepest point (PocketProbe);
 * otherwise it is kept. So a filled pocket never shows unreachable points beyond the tolerance and a kept hole is
 * one no pose reaches into. `probe` evaluates points in the rings' own coordinates (null: none, keep such holes).
 */
export function polygonsOf(
  rings: readonly Float64Array[],
  tolMm: number,
  o: EnvelopeOptions,
  plan: SamplingPlan,
  statedTolMm: number,
  probe: PocketProbe | null,
  filled: { areaMm2: number },
): PolygonMm[] {
  const eps = o.simplifyShare * tolMm;
  // without a probe (a view that is not the plan's own, e.g. the swept top view) a wider hole is kept
  const keepNarrowHole = (ring: Float64Array, widthMm: number): boolean => {
    if (widthMm <= 2 * statedTolMm) return false;
    if (!probe) return true;
    const [u, v] = deepestPoint(ring);
    return !probe.reaches(u, v, statedTolMm);
  };
  return assemblePolygons(
    rings.map((r) => simplifyFlatRing(r, eps)),
    (GAP_SHARE * tolMm) ** 2,
    plan.secondaryStepMm,
    filled,
    keepNarrowHole,
  );
}

/**
 * Stated bound on the boundary error: the sampling budget (sagitta of the joint grid) + half a row spacing (a
 * boundary between two rows is placed midway; along a row it is exact) + the simplification distance.
 */
export function statedTolerance(plan: SamplingPlan, rowMm: number, o: EnvelopeOptions, targetMm: number): number {
  return Math.max(targetMm, plan.samplingSigmaMm + rowMm / 2 + o.simplifyShare * targetMm + (GAP_SHARE / 2) * targetMm);
}

/**
 * Accumulates the image of every slice of the plan into `cover` (signed radius: (±√(c₀² + c₁²), c₂); otherwise
 * (c₀, c₁)), with the corner sweeps between neighbouring slices. `onSlice` sees every slice first.
 */
export function accumulate(
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
  // the signed radius folds at x = 0: sweep between slices where x changes sign (axisSweep.ts)
  const axis = signedRadius && plan.secondaries.length > 0 ? new AxisSweep(plan) : null;
  const mode = { signedRadius, nodeSpacingMm: rowMm, periodicA: plan.a.periodic, periodicB: plan.b.periodic };
  // Prefill: the side view's middle slice (every secondary at its middle sample) goes into the cover first. A slice
  // adds the same set whatever the cover holds (flush), so the final cover, a union, does not change, and the
  // middle slice's second fill in the full pass adds nothing new. But the slices come in counter order, from the
  // secondaries' lower limits, whose images are often small: without the prefill the cover grows slowly, and most
  // slices' outlines run outside it (crossings sorted one by one instead of summed per interval; AxisSweep fills
  // quads the cover does not hold yet). Measured on the demo arms: side views up to a quarter faster (none more than
  // 2 % slower); the plan view gained nothing, nor did more prefilled slices (quarter points, limits).
  if (signedRadius && plan.secondaries.length > 0) {
    const middle = plan.secondaries.map((g) => (g.values.length - 1) >> 1);
    const isMiddle = (counter: Int32Array): boolean => middle.every((m, s) => counter[s] === m);
    forEachSlice(plan, (buf) => addSlice(cover, buf.c0, buf.c1, buf.c2, na, nb, mode, scratch), isMiddle);
  }
  // The corner sweep of a slice and the axis quads found after the previous one are filled in the slice's own sweep
  // (addSlice's `extra`; the same cover as one fill each). The axis quads wait a slice because they are found
  // against the cover that holds their slice: so AxisSweep skips the same quads as when each part had its own fill.
  const extra: (CornerSweep | AxisSweep)[] = [];
  if (sweep) extra.push(sweep);
  if (axis) extra.push(axis);
  forEachSlice(plan, (buf, slice) => {
    onSlice?.(buf);
    sweep?.visit(buf, slice);
    addSlice(cover, buf.c0, buf.c1, buf.c2, na, nb, mode, scratch, extra);
    axis?.visit(buf, slice, cover);
  });
  if (axis && axis.count > 0) addTriangles(cover, axis.tris, axis.count, true, scratch);
}
