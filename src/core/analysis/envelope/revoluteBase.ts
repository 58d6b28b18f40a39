/** Revolute-base layout of the workspace envelope: side view about axis 1, top view, swept volume (see envelope.ts). */
import { polygonsArea, simplifyFlatRing } from "../../geometry/polygon";
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto } from "../../kinematics/forward";
import { coverMinAbsX, coverRings } from "./coverOutline";
import type { EnvelopeOptions, PointEnvelope, WorkspaceEnvelope } from "./envelopeTypes";
import { Extremes } from "./extremes";
import { chainPoint, planSampling, type ChainPoint } from "./jointSampling";
import { PocketProbe } from "./pocketProbe";
import { polarProfile, sweptPlanArcs, sweptPlanRings } from "./polarSweep";
import { revolvedVolume } from "./revolvedVolume";
import { RowCover } from "./rowCover";
import { SliceScratch } from "./sliceScratch";
import {
  accumulate,
  cross,
  dot,
  GAP_SHARE,
  MM2_PER_M2,
  MM3_PER_M3,
  MM_PER_M,
  norm,
  polygonsOf,
  scale,
  statedTolerance,
  sub,
  toleranceFn,
  TWO_PI,
  unit,
  viewMatrix,
  type Vec3,
} from "./viewPass";

/** Axis 1, the forward direction, the side-view matrix and the plan placement of the top view. */
interface RevoluteFrame {
  readonly origin: Vec3;
  readonly u: Vec3;
  readonly forward: Vec3;
  /** Driven value of joint 1 at kinematic angle 0. */
  readonly q0: number;
  /** Kinematic joint 1 sweep, rad. */
  readonly tLo: number;
  readonly tHi: number;
  readonly view: Float64Array;
  readonly sense: 1 | -1;
  readonly phi0: number;
  readonly centre: [number, number];
}

function revoluteFrame(chain: Chain): RevoluteFrame {
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
  return { origin, u, forward, q0, tLo, tHi, view, sense, phi0, centre };
}

export function revoluteBase(chain: Chain, o: EnvelopeOptions): WorkspaceEnvelope {
  const notes: string[] = [];
  const { origin, u, forward, q0, tLo, tHi, view, sense, phi0, centre } = revoluteFrame(chain);
  const sweep = tHi - tLo;

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
    // pockets are filled only up to the stated tolerance of their own view (see polygonsOf)
    const sideTol = statedTolerance(plan, row, o, target),
      topTol = statedTolerance(planView, row, o, target);
    const sideFilled = { areaMm2: 0 };
    const sidePolygons = polygonsOf(
      coverRings(side, row),
      target,
      o,
      plan,
      sideTol,
      new PocketProbe(plan, true),
      sideFilled,
    );
    const planRings = coverRings(plane, row).map((r) => simplifyFlatRing(r, o.simplifyShare * target));
    const profile = polarProfile(planRings, row);
    const place = { tLoRad: tLo, tHiRad: tHi, phi0Rad: phi0, sense, centreMm: centre } as const;
    const topPolygons = polygonsOf(
      sweptPlanRings(sweptPlanArcs(profile, place), row, centre),
      target,
      o,
      planView,
      topTol,
      null,
      { areaMm2: 0 },
    );
    const volumeMm3 = revolvedVolume(side, profile, tLo, tHi);
    const tol = Math.max(sideTol, topTol);
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
      // the set as drawn: the rows' area and the pockets filled
      sideAreaM2: (side.area() + sideFilled.areaMm2) / MM2_PER_M2,
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
