/**
 * A line check set up in file units (mm, deg, mm/s), as the sheets, the browser form, the standard lines and
 * `armdex line` all set it up: a reference tool orientation taken at the line's start, or roll-pitch-yaw.
 */
import type { Chain } from "../../kinematics/chain";
import { referenceToolRotation, rpyToolRotation } from "../../kinematics/toolOrientation";
import { degToRad, mmToM } from "../../units";
import { lineCheck } from "./lineCheck";
import { DEFAULT_LINE_CHECK, type LineCheckResult } from "./types";

/** A line's tool orientation: a reference orientation, or roll-pitch-yaw in deg (R = Rz·Ry·Rx, fixed axes). */
export type LineOrientationSpec = "down" | "outward" | { readonly rpyDeg: readonly [number, number, number] };

/** Optional parts of a line check in file units: samples along the line, a tool point, start joints. */
export interface LineCheckMmOptions {
  readonly samples?: number;
  /** Tool point in the flange frame, mm (default: the flange centre). */
  readonly toolMm?: readonly number[];
  /** Start from the solution nearest these driven joint values (rad or m). */
  readonly startJointsSi?: readonly number[];
}

/**
 * The tool rotation baseFromTool (row-major 3×3) a line holds: a reference orientation taken at the line's start
 * `fromMm`, or roll-pitch-yaw in deg.
 */
export function lineToolRotation(
  chain: Chain,
  gravity: readonly [number, number, number],
  fromMm: readonly number[],
  orientation: LineOrientationSpec,
): Float64Array {
  return typeof orientation === "object"
    ? rpyToolRotation(degToRad(orientation.rpyDeg[0]), degToRad(orientation.rpyDeg[1]), degToRad(orientation.rpyDeg[2]))
    : referenceToolRotation(chain, orientation, fromMm.map(mmToM), gravity);
}

/**
 * Checks one line in file units, as the sheets, the browser form and `armdex line` set it up: a reference
 * orientation is taken at the line's start, gravity from the arm's primary mounting.
 * @param gravity unit gravity direction in the base frame
 * @example checkLineMm(chain, [0, 0, -1], [500, -300, 400], [500, 300, 400], "down", 1000).feasibleConstantSpeedMmPerS
 */
export function checkLineMm(
  chain: Chain,
  gravity: readonly [number, number, number],
  fromMm: readonly number[],
  toMm: readonly number[],
  orientation: LineOrientationSpec,
  speedMmPerS: number,
  options: LineCheckMmOptions = {},
): LineCheckResult {
  const startM = fromMm.map(mmToM),
    endM = toMm.map(mmToM);
  const rotation = lineToolRotation(chain, gravity, fromMm, orientation);
  return lineCheck(
    chain,
    {
      startM,
      endM,
      baseFromToolRotation: rotation,
      speedMPerS: mmToM(speedMmPerS),
      toolInFlangeM: (options.toolMm ?? [0, 0, 0]).map(mmToM),
      startJointsSi: options.startJointsSi,
    },
    { samples: options.samples ?? DEFAULT_LINE_CHECK.samples, gravity },
  );
}
