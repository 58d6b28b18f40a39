/**
 * Warnings of an arm's analysis: a code and the numbers behind it, nothing else. The sentences a reader sees are
 * written in one place of the view layer (src/view/warningText.ts), so the core never words anything.
 */

/** Stated reach off the computed reach by more than {@link REACH_MISMATCH_FRACTION}. */
export interface StatedReachMismatch {
  readonly code: "stated-reach-mismatch";
  readonly statedMm: number;
  readonly computedMm: number;
  /** Which point the computed reach is of. */
  readonly basis: "wrist centre" | "flange";
  /** (stated / computed − 1) · 100, rounded to 0.1. */
  readonly deviationPercent: number;
  /** True when the stated value is about 1000× or 1/1000× the computed one (metres typed as millimetres?). */
  readonly unitsSuspect: boolean;
}

/** Declared repeatability outside the usual range [minMm, maxMm]. */
export interface RepeatabilityImplausible {
  readonly code: "repeatability-implausible";
  readonly repeatabilityMm: number;
  readonly minMm: number;
  readonly maxMm: number;
}

/** The standard cycle could not be computed. */
export interface CycleNotComputed {
  readonly code: "cycle-not-computed";
  /** start-unreachable: the cycle's start at rMm; point-unreachable: the named point; no-location: no start found. */
  readonly reason: "start-unreachable" | "point-unreachable" | "no-location";
  readonly point: string | null;
  readonly rMm: number | null;
}

/** The rated payload exceeds what a wrist rating allows with the CG at the flange centre. */
export interface PayloadAboveWristRating {
  readonly code: "payload-above-wrist-rating";
  readonly kind: "moment" | "inertia";
  readonly joint: string;
  readonly ratedPayloadKg: number;
  /** Mass the rating allows with the CG at the flange centre, kg. */
  readonly allowedKg: number;
  /** The rating: N·m for a moment, kg·m² for an inertia. */
  readonly rating: number;
  /** Lever from the rated axis to the flange centre, mm (M = m·g·L, J = m·L² at the allowed mass). */
  readonly leverMm: number;
}

export type AnalysisWarning =
  StatedReachMismatch | RepeatabilityImplausible | CycleNotComputed | PayloadAboveWristRating;

/** Stated and computed reach may differ by this fraction before a warning (common practice, no source). */
export const REACH_MISMATCH_FRACTION = 0.02;

/** Usual range of declared pose repeatability, mm (common practice, no source). */
export const REPEATABILITY_RANGE_MM = [0.005, 2] as const;

/**
 * The stated-reach warning, or null when stated and computed agree within {@link REACH_MISMATCH_FRACTION}.
 * @example reachWarning(1800, 1.8, "flange") // 1000× off: deviation +99900 %, unitsSuspect true
 */
export function reachWarning(
  statedMm: number,
  computedMm: number,
  basis: StatedReachMismatch["basis"],
): StatedReachMismatch | null {
  if (!(computedMm > 0)) return null;
  const deviation = statedMm / computedMm - 1;
  // 1e-12: exactly 2 % (1020 mm against 1000 mm, 1020/1000 − 1 = 0.020000000000000018 in doubles) is not "more".
  if (!(Math.abs(deviation) > REACH_MISMATCH_FRACTION + 1e-12)) return null;
  const unitsSuspect =
    Math.abs(statedMm / computedMm - 1000) < 100 || Math.abs((statedMm * 1000) / computedMm - 1) < 0.1;
  return {
    code: "stated-reach-mismatch",
    statedMm,
    computedMm: Math.round(computedMm),
    basis,
    deviationPercent: Math.round(deviation * 1000) / 10,
    unitsSuspect,
  };
}

/** The repeatability warning, or null inside {@link REPEATABILITY_RANGE_MM}. */
export function repeatabilityWarning(repeatabilityMm: number): RepeatabilityImplausible | null {
  const [minMm, maxMm] = REPEATABILITY_RANGE_MM;
  return repeatabilityMm < minMm || repeatabilityMm > maxMm
    ? { code: "repeatability-implausible", repeatabilityMm, minMm, maxMm }
    : null;
}
