/**
 * Options and result shapes of the payload at reach (atReach.ts).
 *
 * Conventions (common practice, no source): the tool points along gravity ("down") wherever the arm can orient it;
 * the reach is the radial distance of the flange centre from the base z axis (axis 1 of an articulated arm); the CG
 * offsets lie along the tool axis. Gravity per mounting: kinematics/statics.ts.
 */
import type { Mounting } from "../../kinematics/statics";
import { STANDARD_GRAVITY_M_PER_S2 } from "../../units";

export interface PayloadAtReachOptions {
  /** Row spacing of the horizontal reach, mm. */
  readonly reachStepMm: number;
  /** CG offsets along the tool axis from the flange, mm. */
  readonly offsetsMm: readonly number[];
  /** Mountings to compute; null: those the arm offers. */
  readonly mountings: readonly Mounting[] | null;
  /** Tilt of the "angled" mounting about base y, deg. */
  readonly angledTiltDeg: number;
  /**
   * Grid nodes of the posture search by the number of searched joints D (index D; the last entry for more), spread
   * over the joints by their ranges. A D-dimensional grid meets a row's reach along a (D−1)-dimensional set, so the
   * work per row grows like nodes^((D−1)/D): three searched joints (wall and angled mountings) get fewer nodes.
   */
  readonly searchNodesByDims: readonly number[];
  /** A posture counts as at the row's reach within this distance, mm (its effect on the payload is about
   * tolerance / reach, relative). */
  readonly reachToleranceMm: number;
  readonly gravityMPerS2: number;
}

export const DEFAULT_PAYLOAD_AT_REACH: PayloadAtReachOptions = {
  reachStepMm: 50,
  offsetsMm: [0, 100, 200],
  mountings: null,
  angledTiltDeg: 45,
  searchNodesByDims: [1, 2000, 1600, 6000],
  reachToleranceMm: 0.5,
  gravityMPerS2: STANDARD_GRAVITY_M_PER_S2,
};

export type PayloadBasis = "computed" | "upper-bound-no-link-masses" | "upper-bound-missing-torques" | "as-rated";

export interface PayloadAtReachRow {
  readonly mounting: Mounting;
  /** Radial distance of the flange centre from the base z axis (axis 1), mm. */
  readonly reachMm: number;
  /** CG offset along the tool axis from the flange, mm. */
  readonly offsetMm: number;
  /** Largest static payload at the worst posture found for this reach, capped at the rated payload, kg. */
  readonly payloadKg: number;
  /** Name of the joint whose rating binds; null when the rated payload caps, as rated, or out of reach. */
  readonly limitingJoint: string | null;
  readonly limitedBy: "joint-rating" | "own-weight" | "rated-payload" | "as-rated" | "unreachable";
  /** The torque-limited payload before the cap, kg (above the rated payload where that caps); null when no rated
   * joint carries load or out of reach. */
  readonly torqueLimitKg: number | null;
  /** The joint that sets torqueLimitKg. */
  readonly torqueLimitJoint: string | null;
  /** Flange height above the base plane at that posture, mm; null when out of reach or as rated. */
  readonly flangeHeightMm: number | null;
  /** Driven joints at that posture, deg (revolute) or mm (prismatic); null when out of reach or as rated. */
  readonly jointsDegOrMm: readonly number[] | null;
}

export interface PayloadMountingReport {
  readonly mounting: Mounting;
  readonly gravityDirectionInBase: readonly [number, number, number];
  /** "along-gravity": the wrist points the tool down; "fixed-by-structure": the flange axis never turns (SCARA,
   * palletizer, gantry); "follows-posture": the arm cannot orient its tool (no wrist joints). */
  readonly toolDirection: "along-gravity" | "fixed-by-structure" | "follows-posture";
  readonly minReachMm: number | null;
  readonly maxReachMm: number | null;
  /** Joints swept by the search and their grid steps, deg or mm. */
  readonly searched: readonly { readonly joint: string; readonly stepDegOrMm: number }[];
  /** Joints the search solves for the tool direction. */
  readonly orienting: readonly string[];
  /** Joints held fixed, with the reason. */
  readonly held: readonly { readonly joint: string; readonly valueDegOrMm: number; readonly reason: string }[];
  /** Postures evaluated at a row's reach. */
  readonly postures: number;
  readonly notes: readonly string[];
}

export interface PayloadAtReach {
  readonly basis: PayloadBasis;
  readonly statement: string;
  readonly convention: string;
  readonly ratedPayloadKg: number;
  readonly linkMassTotalKg: number;
  readonly rows: readonly PayloadAtReachRow[];
  readonly mountings: readonly PayloadMountingReport[];
  readonly notes: readonly string[];
}
