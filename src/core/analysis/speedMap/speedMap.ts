/**
 * Tool-speed maps on a side-view grid: for each cell of the vertical plane through axis 1 (distance from axis 1
 * against height, mm), the arm is put at that flange position with a reference tool orientation by inverse
 * kinematics, on every branch found; the best branch per cell (highest guaranteed straight-line speed) is kept
 * and named. Per cell: guaranteed straight-line speed at constant orientation, maximum tool speed, scaled inverse
 * condition, the sign of det J (square Jacobians) and the branch.
 *
 * Symmetry: a rotation about a vertical axis 1 turns every figure with it, so the maps are drawn against the
 * distance from axis 1 (r ≥ 0) and hold at every J1 heading. The TCP is the flange centre (no tool).
 * Reference orientations: "down" = flange z along gravity of the primary mounting, flange x pointing away from
 * axis 1; "outward" = flange z pointing away from axis 1, flange x down. "Away from axis 1" is the +radial direction
 * of the plane, the same in every cell: in the two columns behind axis 1 (r < 0, there so a locus on the axis is
 * crossed) it points back towards the axis, so the targets stay continuous across it (methods page, tool speed).
 * Arms with fewer than six driven joints get "down" only, with the rotation about the tool axis left free.
 */
import type { Chain } from "../../kinematics/chain";
import { discoverAndFlood } from "./discovery";
import { retryEdges } from "./edgeRetry";
import { mapOutput } from "./output";
import { discoverAlongAxis, discoverFamilies, sweepJointSpace } from "./sweep";
import { createMapRun, type SpeedMapWorkspace } from "./state";
import type { ReferenceOrientation, SpeedMapOptions, ToolSpeedMap } from "./types";
import { DEFAULT_SPEED_MAP } from "./types";
import { refineNearSingular } from "./verify";

export type { Grid2 } from "../../geometry/grid";
export { createSpeedMapWorkspace, type SpeedMapWorkspace } from "./state";
export { taskDeterminant } from "./verify";
export {
  DEFAULT_SPEED_MAP,
  type ReferenceOrientation,
  type SingularityLocus,
  type SpeedMapOptions,
  type ToolSpeedMap,
} from "./types";

/** Orientations an arm gets maps for. */
export function referenceOrientations(chain: Chain): ReferenceOrientation[] {
  return chain.drivenCount >= 6 ? ["down", "outward"] : ["down"];
}

/**
 * Computes the tool-speed map of one reference orientation: grid and plane setup (plane.ts, state.ts), discovery
 * seeding and continuation (discovery.ts, continuation.ts, each solution verified in verify.ts), then the per-cell
 * output and the loci (output.ts, loci.ts, labels.ts).
 * @see module comment for definitions; DOMAIN: guaranteed straight-line speed and maximum tool speed
 */
export function toolSpeedMap(
  chain: Chain,
  orientation: ReferenceOrientation,
  options: SpeedMapOptions = DEFAULT_SPEED_MAP,
  workspace?: SpeedMapWorkspace,
): ToolSpeedMap {
  const run = createMapRun(chain, orientation, options, workspace);
  discoverAndFlood(run);
  // Islands the flood misses. A cell solved in closed form holds every solution already and is skipped there; a cell
  // on a family of solutions (wrist centre on axis 1) gets the family's members in closed form (discoverFamilies);
  // the random searches remain for what is left (solvedInClosedForm).
  if (!discoverFamilies(run)) {
    if (run.options.jointSamples) discoverAlongAxis(run);
    sweepJointSpace(run);
    // Redundant arms: empty cells beside held ones, from the neighbours' solutions mirrored (edgeRetry.ts).
    if (run.options.jointSamples) retryEdges(run);
  }
  // After every solution is in (flood and sweep): near-singular solutions moved onto their singular pose.
  refineNearSingular(run);
  return mapOutput(run);
}
