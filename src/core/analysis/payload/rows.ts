/**
 * Output of the payload-at-reach search of one mounting (pure): its rows (capped at the rated payload, with the
 * limiting joint and the posture), its report (joint roles, reach range) and the loaded joints without a rating.
 */
import type { Chain } from "../../kinematics/chain";
import { mToMm, radToDeg } from "../../units";
import type { PayloadAtReachRow, PayloadMountingReport } from "./atReachTypes";
import type { MountingSearch } from "./searchState";

/** Rows of this mounting. Rows at the ends of the range where no posture holds the tool along gravity are dropped
 * (the reach range of the spherical shortcut does not check the wrist limits); gaps inside stay, "unreachable". */
export function mountingRows(ms: MountingSearch): PayloadAtReachRow[] {
  const chain = ms.chain,
    m = chain.drivenCount,
    nOff = ms.nOff,
    o = ms.ctx.o,
    rated = ms.ctx.input.ratedPayloadKg;
  const out: PayloadAtReachRow[] = [];
  const mounting = ms.mounting;
  if (!ms.ctx.anyRating) {
    for (let r = 0; r < ms.nRows; r++) {
      for (const offsetMm of o.offsetsMm) {
        out.push({
          mounting,
          reachMm: (ms.kFirst + r) * o.reachStepMm,
          offsetMm,
          payloadKg: rated,
          limitingJoint: null,
          limitedBy: "as-rated",
          torqueLimitKg: null,
          torqueLimitJoint: null,
          flangeHeightMm: null,
          jointsDegOrMm: null,
        });
      }
    }
    return out;
  }
  const reached = (r: number): boolean => {
    for (let oi = 0; oi < nOff; oi++) if (ms.bestLimit[r * nOff + oi] !== -2) return true;
    return false;
  };
  let rFirst = 0,
    rLast = ms.nRows - 1;
  while (rFirst <= rLast && !reached(rFirst)) rFirst++;
  while (rLast >= rFirst && !reached(rLast)) rLast--;
  const name = (j: number): string => chain.jointNames[chain.drivenJoint[j]!]!;
  for (let r = rFirst; r <= rLast; r++) {
    for (let oi = 0; oi < nOff; oi++) {
      const slot = r * nOff + oi;
      const reachMm = (ms.kFirst + r) * o.reachStepMm,
        offsetMm = o.offsetsMm[oi]!;
      if (ms.bestLimit[slot] === -2) {
        out.push({
          mounting,
          reachMm,
          offsetMm,
          payloadKg: 0,
          limitingJoint: null,
          limitedBy: "unreachable",
          torqueLimitKg: null,
          torqueLimitJoint: null,
          flangeHeightMm: null,
          jointsDegOrMm: null,
        });
        continue;
      }
      const torqueKg = Math.max(0, ms.best[slot]!),
        capped = !(torqueKg < rated),
        lim = ms.bestLimit[slot]!;
      out.push({
        mounting,
        reachMm,
        offsetMm,
        payloadKg: Math.min(rated, torqueKg),
        limitingJoint: !capped && lim >= 0 ? name(lim) : null,
        limitedBy: capped ? "rated-payload" : ms.bestOwn[slot] ? "own-weight" : "joint-rating",
        torqueLimitKg: Number.isFinite(torqueKg) ? torqueKg : null,
        torqueLimitJoint: lim >= 0 ? name(lim) : null,
        flangeHeightMm: mToMm(ms.bestHeight[slot]!),
        jointsDegOrMm: Array.from(ms.bestQ.subarray(slot * m, slot * m + m), (v, j) => jointOut(chain, j, v)),
      });
    }
  }
  return out;
}

export function mountingReport(ms: MountingSearch): PayloadMountingReport {
  const chain = ms.chain,
    plan = ms.plan;
  const name = (j: number): string => chain.jointNames[chain.drivenJoint[j]!]!;
  return {
    mounting: ms.mounting,
    gravityDirectionInBase: ms.gDir,
    toolDirection: plan.mode,
    minReachMm: Number.isFinite(ms.minReach) ? mToMm(ms.minReach) : null,
    maxReachMm: Number.isFinite(ms.maxReach) ? mToMm(ms.maxReach) : null,
    searched: plan.searched.map((j, d) => ({ joint: name(j), stepDegOrMm: jointOut(chain, j, ms.gridStep(d)) })),
    orienting: plan.orienting.map(name),
    held: plan.held.map((h) => ({ joint: name(h.j), valueDegOrMm: jointOut(chain, h.j, h.value), reason: h.reason })),
    postures: ms.postures,
    notes: ms.notes,
  };
}

/** Names of driven joints that carried payload torque somewhere but have no rating. */
export function loadedUnrated(ms: MountingSearch): string[] {
  const chain = ms.chain,
    out: string[] = [];
  for (let j = 0; j < chain.drivenCount; j++) {
    if (ms.maxUnit[j]! > ms.unitFloor && !(chain.ratedEffortSi[j]! > 0))
      out.push(chain.jointNames[chain.drivenJoint[j]!]!);
  }
  return out;
}

/** Joint value for output: deg for revolute, mm for prismatic. */
function jointOut(chain: Chain, j: number, si: number): number {
  return chain.isPrismatic[chain.drivenJoint[j]!] ? mToMm(si) : radToDeg(si);
}
