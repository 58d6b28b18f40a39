/**
 * Payload at reach (pure): the largest static payload at each horizontal reach, at the worst posture found for that
 * reach, for each mounting the arm offers, from τ = Jᵀ·F (kinematics/statics.ts) against the joint torque ratings.
 * The search runs per mounting in stages: reach at every grid node (searchState.ts), postures on each row's reach
 * (crossings.ts), continuation across rows and local refinement (refine.ts), then the rows (rows.ts).
 */
import type { Chain } from "../../kinematics/chain";
import { bodySetOf, type Mounting } from "../../kinematics/statics";
import {
  DEFAULT_PAYLOAD_AT_REACH,
  type PayloadAtReach,
  type PayloadAtReachOptions,
  type PayloadAtReachRow,
  type PayloadBasis,
  type PayloadMountingReport,
} from "./atReachTypes";
import { edgeCrossings, seededCrossings } from "./crossings";
import type { PayloadInput } from "./input";
import { PAYLOAD_STATEMENT } from "./loadDiagram";
import { continueAcrossRows, refineRows } from "./refine";
import { loadedUnrated, mountingReport, mountingRows } from "./rows";
import { chainFacts } from "./searchPlan";
import { MountingSearch, type SearchContext } from "./searchState";

const AT_REACH_CONVENTION =
  "Rows every step of the flange centre's radial distance from axis 1 (the base z axis; horizontal for floor and " +
  "ceiling mountings). The tool points along gravity where the wrist can orient it; the CG offsets lie along the tool " +
  "axis. Each row is the worst posture found for that reach over heights and joint branches (grid search with local " +
  "refinement; a 7-axis arm keeps its redundant joint at zero), from τ = Jᵀ·F for the payload plus the links' own " +
  "weight against each joint's rated torque (|τ| ≤ rating in either direction), capped at the rated payload. " +
  "Gravity in the base frame: floor −z; ceiling +z; wall +x (base turned 90° about its y axis, +x pointing down); " +
  "angled: tilted about y by the stated angle (default 45°).";

/**
 * Largest static payload at each horizontal reach (rows every `reachStepMm`, CG offsets along the tool axis), at the
 * worst posture found for that reach, for each mounting the arm offers. Torques by τ = Jᵀ·F for the payload weight
 * plus the links' own weight, passive joints through the coupling; |τ| ≤ rated torque in either direction; capped at
 * the rated payload.
 *
 * Search: the joints that place the wrist are swept on a grid (a joint that turns the whole arm about a vertical
 * axis 1 is held, since it changes neither reach nor torque; a redundant arm keeps its extra joint at zero), and the
 * wrist is solved so the tool points along gravity. With one or two searched joints, every grid edge that crosses a
 * row's reach gives a posture on it (Illinois method). With three (wall and angled mountings, where axis 1 matters),
 * every node is evaluated and each row's worst nodes are moved onto the row's reach along a grid edge. Each row's
 * worst posture is then refined by golden-section search over the other searched joints, the reach re-solved.
 *
 * Basis: "as-rated" when no joint has a rated torque (rows carry the rated payload over the reach range);
 * "upper-bound-no-link-masses" without link masses; "upper-bound-missing-torques" when a joint that carries load has
 * no rating; otherwise "computed".
 * @see Craig, Introduction to Robotics, 3rd ed., ch. 5 (statics, τ = Jᵀ F); CHECKS C14
 * @example single horizontal axis, massless link of 0.5 m, 49.0332 N·m rated, 20 kg rated payload: at 0.5 m reach
 *   payloadKg = 49.0332 / (9.80665 · 0.5) = 10 kg
 */
export function payloadAtReach(
  chain: Chain,
  input: PayloadInput,
  options: Partial<PayloadAtReachOptions> = {},
): PayloadAtReach {
  const o = { ...DEFAULT_PAYLOAD_AT_REACH, ...options };
  if (!(o.reachStepMm > 0)) throw new RangeError(`invalid reachStepMm: ${o.reachStepMm}`);
  if (!(o.searchNodesByDims.length >= 2 && o.searchNodesByDims.every((v) => v >= 1)))
    throw new RangeError(`invalid searchNodesByDims: ${o.searchNodesByDims.join(",")}`);
  if (!(o.reachToleranceMm > 0)) throw new RangeError(`invalid reachToleranceMm: ${o.reachToleranceMm}`);
  if (!(o.gravityMPerS2 > 0)) throw new RangeError(`invalid gravityMPerS2: ${o.gravityMPerS2}`);
  for (const off of o.offsetsMm) if (!Number.isFinite(off)) throw new RangeError(`invalid offsetMm: ${off}`);
  const ctx: SearchContext = {
    chain,
    input,
    o,
    bodies: bodySetOf(input.links),
    facts: chainFacts(chain),
    anyRating: Array.from(chain.ratedEffortSi).some((t) => t > 0),
  };
  const rows: PayloadAtReachRow[] = [];
  const reports: PayloadMountingReport[] = [];
  const unrated = new Set<string>();
  for (const mounting of o.mountings ?? input.mountings) {
    const search = searchMounting(ctx, mounting);
    rows.push(...mountingRows(search));
    reports.push(mountingReport(search));
    for (const name of loadedUnrated(search)) unrated.add(name);
  }

  const notes: string[] = [...input.notes];
  let basis: PayloadBasis;
  if (!ctx.anyRating) {
    basis = "as-rated";
    notes.push("no joint torque ratings: the rated payload is given over the reach range, as rated by the maker");
  } else if (unrated.size > 0) {
    basis = "upper-bound-missing-torques";
    notes.push(`joints that carry load but have no rated torque (not checked): ${[...unrated].join(", ")}`);
    if (input.links.length === 0) notes.push("no link masses: the arm's own weight is left out");
  } else if (input.links.length === 0) {
    basis = "upper-bound-no-link-masses";
    notes.push("no link masses: the arm's own weight is left out, so the figures are upper bounds");
  } else {
    basis = "computed";
  }
  return {
    basis,
    statement: PAYLOAD_STATEMENT,
    convention: AT_REACH_CONVENTION,
    ratedPayloadKg: input.ratedPayloadKg,
    linkMassTotalKg: input.links.reduce((a, l) => a + l.massKg, 0),
    rows,
    mountings: reports,
    notes,
  };
}

/**
 * The posture search of one mounting, step by step: reach at every grid node (with three or more searched joints
 * also the allowed payload there), postures on each row's reach from the grid edges, continuation across rows, and
 * golden-section refinement of each row's worst posture.
 */
function searchMounting(ctx: SearchContext, mounting: Mounting): MountingSearch {
  const search = new MountingSearch(ctx, mounting);
  const screen = ctx.anyRating && search.D >= 3;
  search.sweepNodes(screen);
  if (!search.startRows()) return search;
  if (screen) seededCrossings(search);
  else edgeCrossings(search);
  continueAcrossRows(search);
  refineRows(search);
  return search;
}
