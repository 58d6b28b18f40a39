/** Options and result types of the workspace envelope (envelope.ts); lengths in mm, areas in m², volume in m³. */
import type { PolygonMm } from "../../geometry/polygon";

export interface EnvelopeOptions {
  /** Smallest boundary tolerance, mm. */
  readonly minToleranceMm: number;
  /** Boundary tolerance as a share of the point's reach (0.002 = 0.2 %). */
  readonly toleranceOfReach: number;
  /** Share of the tolerance spent on joint sampling (sagitta). */
  readonly samplingShare: number;
  /** Row spacing of the raster as a share of the tolerance. */
  readonly rowShare: number;
  /** Polygon simplification distance as a share of the tolerance. */
  readonly simplifyShare: number;
  /** Largest work per view pass (grid points + estimated outline crossings over all slices); beyond it the joint grid
   * coarsens and toleranceMm grows. 8 M ≈ 0.4 s per pass on one core (measured on the demo arms). */
  readonly workBudget: number;
  /** Compute the flange envelope as well as the WCP's. */
  readonly flange: boolean;
}

export const DEFAULT_ENVELOPE_OPTIONS: EnvelopeOptions = {
  minToleranceMm: 2,
  toleranceOfReach: 0.002,
  samplingShare: 0.35,
  rowShare: 0.7,
  simplifyShare: 0.1,
  workBudget: 8_000_000,
  flange: true,
};

export type EnvelopeLayout = "revolute-base" | "prismatic-base" | "base-frame";

/** Envelope of one point (WCP or flange origin). Lengths in mm, areas in m², volume in m³. */
export interface PointEnvelope {
  readonly point: "wcp" | "flange";
  /** Side view polygons, points [horizontal, vertical] in mm (see WorkspaceEnvelope.sideAxes). */
  readonly side: readonly PolygonMm[];
  /** Top view polygons, points [x, y] in mm. */
  readonly top: readonly PolygonMm[];
  /** Largest horizontal distance from axis 1 (revolute-base) or from the base z axis (otherwise), mm. */
  readonly maxReachMm: number;
  /** Smallest such distance, mm (0 when the point reaches the axis). */
  readonly minReachMm: number;
  /** Largest and smallest coordinate along axis 1 (base z for a vertical axis 1), mm. */
  readonly maxHeightMm: number;
  readonly minHeightMm: number;
  /** Area of the side-view region as drawn (the polygons, pockets filled), m². */
  readonly sideAreaM2: number;
  /** Area of the top-view region, m². */
  readonly topAreaM2: number;
  /** Volume of the swept solid (see the module doc), m³; null where not defined (base-frame layout). */
  readonly volumeM3: number | null;
  /** Boundary tolerance aimed at, mm. */
  readonly targetToleranceMm: number;
  /** Stated bound on the boundary error of the polygons, mm (above the target only when workBudget bit). */
  readonly toleranceMm: number;
  /** Joint-space grid points evaluated. */
  readonly samples: number;
}

export interface Axis1 {
  /** A point of axis 1 (the origin of F₀), base frame, mm. */
  readonly pointMm: readonly [number, number, number];
  /** Unit direction of axis 1, base frame. */
  readonly direction: readonly [number, number, number];
  /** Unit forward direction e_f at joint 1 kinematic angle 0, base frame. */
  readonly forward: readonly [number, number, number];
  /** Kinematic joint 1 range swept, rad ([lo, hi]; hi − lo ≥ 2π for a full turn). */
  readonly sweepRad: readonly [number, number];
}

export interface WorkspaceEnvelope {
  readonly layout: EnvelopeLayout;
  /** Axis labels of the side and top views, e.g. ["rMm", "zMm"] and ["xMm", "yMm"]. */
  readonly sideAxes: readonly [string, string];
  readonly topAxes: readonly [string, string];
  /** Axis 1 (revolute-base only). */
  readonly axis1: Axis1 | null;
  readonly wcp: PointEnvelope | null;
  readonly flange: PointEnvelope | null;
  /** Plain-language remarks: assumptions, coarsened sampling. */
  readonly notes: readonly string[];
}
