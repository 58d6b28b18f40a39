/** Prismatic-base and base-frame layouts of the workspace envelope: projections on base planes (see envelope.ts). */
import type { PolygonMm } from "../../geometry/polygon";
import { pointInPolygons } from "../../geometry/polygon";
import type { Chain } from "../../kinematics/chain";
import { coverRings } from "./coverOutline";
import type { EnvelopeOptions, PointEnvelope, WorkspaceEnvelope } from "./envelopeTypes";
import { Extremes } from "./extremes";
import { chainPoint, planSampling } from "./jointSampling";
import { PocketProbe } from "./pocketProbe";
import { RowCover } from "./rowCover";
import { SliceScratch } from "./sliceScratch";
import {
  accumulate,
  cross,
  GAP_SHARE,
  MM2_PER_M2,
  MM3_PER_M3,
  MM_PER_M,
  polygonsOf,
  statedTolerance,
  toleranceFn,
  unit,
  viewMatrix,
  type Vec3,
} from "./viewPass";

// ---------------------------------------------------------------------------------------------------------------
// Prismatic base and base-frame layouts: projections on base planes

export function projectedBase(
  chain: Chain,
  o: EnvelopeOptions,
  layout: "prismatic-base" | "base-frame",
): WorkspaceEnvelope {
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
    // pockets are filled only up to the stated tolerance of their own view (see polygonsOf)
    const sideTol = statedTolerance(sidePlan, row, o, target),
      topTol = statedTolerance(topPlan, row, o, target);
    const sideFilled = { areaMm2: 0 },
      topFilled = { areaMm2: 0 };
    const sideProbe = new PocketProbe(sidePlan, false),
      topProbe = new PocketProbe(topPlan, false);
    const sidePolygons = polygonsOf(coverRings(side, row), target, o, sidePlan, sideTol, sideProbe, sideFilled);
    const topPolygons = polygonsOf(coverRings(top, row), target, o, topPlan, topTol, topProbe, topFilled);
    let volumeM3: number | null = null;
    let samples = sidePlan.pointCount + topPlan.pointCount;
    let tol = Math.max(sideTol, topTol);
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
      // the sets as drawn: the rows' area and the pockets filled
      sideAreaM2: (side.area() + sideFilled.areaMm2) / MM2_PER_M2,
      topAreaM2: (top.area() + topFilled.areaMm2) / MM2_PER_M2,
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
