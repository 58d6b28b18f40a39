/**
 * The one place where analysis warnings and cycle failures become sentences (the core gives codes and numbers).
 */
import type { AnalysisWarning, CycleFailure } from "../core";

const fmt4 = (x: number) => Number(x.toPrecision(4)).toString();

/** Why the standard cycle has no time, as a sentence fragment (no capital, no full stop). */
export function cycleFailureText(failure: CycleFailure, rMm: number | null): string {
  switch (failure.reason) {
    case "start-unreachable":
      return `the cycle start${rMm === null ? "" : ` at ${rMm} mm reach`} cannot be reached with the tool down`;
    case "point-unreachable":
      return `point ${failure.point ?? "?"} of the cycle cannot be reached with the tool down`;
    case "no-location":
      return "no location with the tool pointing down was found for the cycle";
  }
}

/**
 * One warning as a sentence fragment (the page capitalises and ends it).
 * @example analysisWarningText({ code: "repeatability-implausible", repeatabilityMm: 5, minMm: 0.005, maxMm: 2 })
 *   // "declared repeatability 5 mm is outside the usual 0.005–2 mm (common practice, no source)"
 */
export function analysisWarningText(w: AnalysisWarning): string {
  switch (w.code) {
    case "stated-reach-mismatch":
      return (
        `stated reach ${w.statedMm} mm differs from the computed ${w.basis === "flange" ? "flange" : "wrist-centre"} ` +
        `reach ${w.computedMm} mm by ${w.deviationPercent.toFixed(1)} % (more than 2 %)` +
        (w.unitsSuspect ? "; check the units (metres typed as millimetres?)" : "")
      );
    case "repeatability-implausible":
      return `declared repeatability ${w.repeatabilityMm} mm is outside the usual ${w.minMm}–${w.maxMm} mm (common practice, no source)`;
    case "cycle-not-computed":
      return cycleFailureText({ reason: w.reason, point: w.point }, w.rMm);
    case "payload-above-wrist-rating":
      return w.kind === "moment"
        ? `rated payload ${fmt4(w.ratedPayloadKg)} kg exceeds the ${fmt4(w.allowedKg)} kg that the ${w.joint} moment rating (${fmt4(w.rating)} N·m) allows with the CG at the flange centre (lever ${fmt4(w.leverMm)} mm)`
        : `rated payload ${fmt4(w.ratedPayloadKg)} kg exceeds the ${fmt4(w.allowedKg)} kg that the ${w.joint} inertia rating (${fmt4(w.rating)} kg·m²) allows as a point mass at the flange centre (lever ${fmt4(w.leverMm)} mm)`;
  }
}
