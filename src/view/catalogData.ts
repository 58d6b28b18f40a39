/** The catalog summary written to data/catalog.json: one row per arm with its key declared and computed figures. */
import type { Arm } from "../catalog/load";
import { REACH_MISMATCH_FRACTION } from "../core";
import type { AnalysisSummary } from "../catalog/analysis";
import { bestGuaranteedLineSpeedDownMPerS } from "./catalogPageModel";

export function catalogSummaryRow(arm: Arm, analysis: AnalysisSummary) {
  const s = arm.spec;
  const computedReach = analysis.reach.wcpMaxMm ?? analysis.reach.flangeMaxMm;
  const deviation = s.reachMm !== undefined && computedReach ? s.reachMm / computedReach - 1 : null;
  const down = analysis.speed.maps[0];
  return {
    id: arm.id,
    maker: s.maker,
    model: s.model,
    class: s.class,
    drivenAxes: arm.chain.drivenCount,
    ratedPayloadKg: s.ratedPayloadKg,
    reach: {
      computedMm: computedReach,
      basis: analysis.reach.basis,
      statedMm: s.reachMm ?? null,
      deviation: deviation === null ? null : Number(deviation.toFixed(4)),
      mismatch: deviation !== null && Math.abs(deviation) > REACH_MISMATCH_FRACTION,
    },
    maxHeightMm: analysis.reach.maxHeightMm,
    minHeightMm: analysis.reach.minHeightMm,
    repeatabilityMm: s.repeatabilityMm,
    massKg: s.massKg,
    maxToolSpeedMmPerS: analysis.speed.maxToolSpeedMmPerS,
    /** Highest guaranteed straight-line speed in the "down" map (tool pointing down), m/s. */
    bestGuaranteedLineSpeedToolDownMPerS: bestGuaranteedLineSpeedDownMPerS(analysis),
    shareGuaranteedAtLeast1MPerS: analysis.speed.shareAtLeast["1"] ?? null,
    shareOrientation: down?.orientation ?? null,
    /** Share of the flange envelope's side-view cells reached from at least half of the tool directions; null without a map. */
    capabilityAreaShareAtLeastHalf: analysis.capability?.areaShareAtLeastHalf ?? null,
    capabilityReason: analysis.capabilityReason,
    standardCycleS: analysis.cycle.standardCycleS === null ? null : Number(analysis.cycle.standardCycleS.toFixed(3)),
    mountings: s.mountings,
    protection: s.protection,
    commercial: s.commercial ?? null,
    specHash: arm.specHash,
    analysisVersion: analysis.analysisVersion,
    warnings: analysis.warnings.length + arm.warnings.length,
  };
}
