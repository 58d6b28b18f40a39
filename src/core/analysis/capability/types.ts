/** Options and result types of the capability map (capability.ts); lengths in mm, shares 0–1. */
import type { PolygonMm } from "../../geometry/polygon";

export interface CapabilityOptions {
  /** Grid spacing of the side view, mm (nodes at whole multiples of it). */
  readonly gridMm: number;
  /** Tool directions tried per node (a Fibonacci lattice over the whole sphere). */
  readonly directions: number;
  /**
   * Roll angles about the tool axis tried per direction where the roll is not the last joint's own turn (rolls
   * spread evenly over a turn); where it is, one roll settles every direction (capability.ts, `rollBasis`).
   */
  readonly rolls: number;
  /** Seed of the joint-space samples that start the numeric continuation. */
  readonly seed: number;
  /** Joint-space samples that start the numeric continuation (numeric method only). */
  readonly numericSamples: number;
  /** Seeds tried at one (node, direction) before the numeric method gives it up. */
  readonly numericTries: number;
  /** "auto": closed form where the chain allows it, numeric elsewhere; "numeric": numeric everywhere (tests). */
  readonly method: "auto" | "numeric";
  /** Keep one joint solution per reached (node, direction) in the result (tests); default false. */
  readonly keepSolutions?: boolean;
}

export const DEFAULT_CAPABILITY: CapabilityOptions = {
  gridMm: 50,
  directions: 128,
  rolls: 8,
  seed: 20261202,
  numericSamples: 4000,
  numericTries: 8,
  method: "auto",
};

/** Why an arm has no capability map (the view words it). */
export type CapabilityReason =
  /** Fewer than five driven joints, or the flange position and tool axis have fewer than five independent motions. */
  | "tool-axis-cannot-turn"
  /** The first joint is not a revolute axis 1 the side view turns about (gantries, linear tracks). */
  | "no-axis-1";

/** What the capability map needs of the flange envelope (side view at joint 1 = 0, signed r). */
export interface CapabilityEnvelope {
  readonly side: readonly PolygonMm[];
  readonly maxReachMm: number;
  readonly minHeightMm: number;
  readonly maxHeightMm: number;
}

export interface CapabilityMap {
  readonly gridMm: number;
  /** Node distances from axis 1, mm (0, gridMm, …). */
  readonly rMm: readonly number[];
  /** Node heights along axis 1, mm. */
  readonly zMm: readonly number[];
  /** Number of tool directions tried per node. */
  readonly directions: number;
  /** Row-major (rows follow zMm, columns rMm): share of directions reached, 0–1; NaN outside the flange envelope. */
  readonly share: Float64Array;
  /** How the inverse kinematics was solved. */
  readonly method: "closed-form" | "numeric";
  /**
   * "last-joint": the last joint turns the flange about its own axis, so the roll never decides (one roll, the last
   * joint's range set aside); "solver": the numeric solver leaves the roll free (tool axis only); "sampled": `rolls`
   * roll angles tried per direction.
   */
  readonly rollBasis: "last-joint" | "solver" | "sampled";
  /** Roll angles tried per direction (1 for "last-joint" and "solver"). */
  readonly rollsTried: number;
  /** Inverse-kinematics solves made (closed-form calls or numeric starts). */
  readonly solves: number;
  /** The directions, 3 per direction (unit vectors, base frame). */
  readonly directionVectors: Float64Array;
  /** Base-frame target position of each node, 3 per node (m); NaN outside the envelope. */
  readonly nodePositionsM: Float64Array;
  /** With keepSolutions: driven joints per (node, direction), m values each; NaN where not reached. */
  readonly solutions: Float64Array | null;
}

export type CapabilityResult =
  { readonly ok: true; readonly map: CapabilityMap } | { readonly ok: false; readonly reason: CapabilityReason };
