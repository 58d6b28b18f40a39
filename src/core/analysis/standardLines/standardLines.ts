/**
 * The standard straight lines of an arm, chosen from its tool-down map (choose.ts) and checked with the line check
 * (../line) at the standard speed, the tool pointing down, the flange centre as the tool point. They run inside the
 * analysis, so the sheets read them from the cache like every other figure.
 */
import type { Chain } from "../../kinematics/chain";
import { checkLineMm, type LineCheckResult } from "../line";
import { chooseStandardLines, type StandardLineNote, type StandardLineSource, type StandardLineSpec } from "./choose";

export * from "./choose";

/** Commanded speed of the standard lines, mm/s (the rate ratios are at this speed; the largest constant speed does
 * not depend on it). */
export const STANDARD_LINE_SPEED_MM_PER_S = 500;

export interface CheckedStandardLineJson extends StandardLineSpec {
  readonly speedMmPerS: number;
  /** The line check's report (the JSON `armdex line` prints for the same line). */
  readonly result: LineCheckResult;
}

export interface StandardLines {
  readonly speedMmPerS: number;
  readonly lines: readonly CheckedStandardLineJson[];
  readonly notes: readonly StandardLineNote[];
}

/**
 * Chooses and checks the standard lines of an arm.
 * @param gravity unit gravity direction in the base frame (the arm's primary mounting)
 */
export function standardLines(
  chain: Chain,
  source: StandardLineSource,
  gravity: readonly [number, number, number],
): StandardLines {
  const { lines, notes } = chooseStandardLines(source);
  return {
    speedMmPerS: STANDARD_LINE_SPEED_MM_PER_S,
    lines: lines.map((line) => ({
      ...line,
      speedMmPerS: STANDARD_LINE_SPEED_MM_PER_S,
      result: checkLineMm(chain, gravity, line.fromMm, line.toMm, "down", STANDARD_LINE_SPEED_MM_PER_S),
    })),
    notes,
  };
}
