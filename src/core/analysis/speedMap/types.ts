/**
 * Types shared by the speed-map steps and the loci tracer: the map's options and result, and the per-(cell, slot)
 * sheet data the tracer reads. Kept apart so loci.ts and the map steps import types from here, not each other.
 */
import type { Grid2 } from "../../geometry/grid";
import type { SingularityKind } from "../../measures/singularity";

import type { ReferenceOrientation } from "../../kinematics/toolOrientation";
export type { ReferenceOrientation };

export interface ToolSpeedMap {
  readonly orientation: ReferenceOrientation;
  readonly grid: Grid2;
  /** Guaranteed straight-line speed, mm/s; NaN where the pose cannot be reached. */
  readonly guaranteedMmPerS: Float64Array;
  /** Maximum tool speed, mm/s; NaN where unreachable. */
  readonly maxMmPerS: Float64Array;
  /**
   * σ_min/σ_max of the Jacobian with linear rows divided by the length scale; NaN where unreachable, and off the
   * nodes kept when `conditionMaxColumns` is set.
   */
  readonly inverseCondition: Float64Array;
  /** Sign of det J of the best branch (square Jacobians; 0 otherwise or unreachable). */
  readonly detSign: Int8Array;
  /** Index into `branchNames` of the kept branch; −1 where unreachable. */
  readonly branch: Int8Array;
  readonly branchNames: readonly string[];
  /** Driven joint values of the kept branch, rad or m, m per cell (NaN where unreachable). */
  readonly joints: Float64Array;
  readonly reachableCells: number;
  /** Zero crossings of det J along continuous solution sheets, by kind (square task Jacobians only). */
  readonly loci: readonly SingularityLocus[];
}

export interface SpeedMapOptions {
  readonly stepMm: number;
  /** Plane bounds, mm; computed from sampled poses when absent. */
  readonly boundsMm?: { readonly rMax: number; readonly zMin: number; readonly zMax: number } | undefined;
  /** Gravity direction in the base frame (primary mounting). */
  readonly gravity: readonly [number, number, number];
  /** Cells between discovery points (where IK is started from many seeds). */
  readonly discoveryEveryCells: number;
  readonly discoverySeeds: number;
  /** Solutions kept per cell. */
  readonly maxBranches: number;
  readonly seed: number;
  /**
   * Closed-form inverse kinematics (six revolute joints with a spherical wrist), where it applies: true for every
   * cell (discovery and continuation); "discovery" for the discovery cells only, the continuation staying
   * numeric; false keeps the numeric solver everywhere; "auto" (default) is true for the ortho-parallel class
   * (kinematics/orthoParallel.ts), whose maps it gives as the numeric solver does, and false otherwise.
   */
  readonly closedForm?: boolean | "discovery" | "auto";
  /** With closed form: look for solutions at every cell, not only at discovery cells (default true). */
  readonly discoverEveryCell?: boolean;
  /**
   * Wrist-flip twins (default true): on arms whose wrist flip is a symmetry of the chain (kinematics/wristFlip.ts),
   * every solution's twin is stored beside it without solving, with its figures taken from the solution's (same
   * guaranteed speed, det J negated). false solves every solution numerically (for tests).
   */
  readonly wristTwins?: boolean;
  /**
   * When set, the inverse condition is computed on every k-th column and row only, k = ⌈nx / conditionMaxColumns⌉
   * (the nodes a coarser output grid keeps; NaN elsewhere). Default: every cell.
   */
  readonly conditionMaxColumns?: number;
  /**
   * Seeded random joint samples of the joint-space sweep (sweep.ts) after discovery and flood: islands of solutions
   * neither reaches (near axis 1, near the base) are found from them. 0 or absent: no sweep.
   */
  readonly jointSamples?: number;
}

export const DEFAULT_SPEED_MAP: SpeedMapOptions = {
  stepMm: 10,
  gravity: [0, 0, -1],
  discoveryEveryCells: 20,
  discoverySeeds: 24,
  maxBranches: 8,
  seed: 20261202,
  jointSamples: 60000,
};

export interface SingularityLocus {
  readonly kind: Exclude<SingularityKind, "none">;
  /** Polylines as [rMm, zMm] points. */
  readonly polylinesMm: [number, number][][];
}

/** Per (cell, slot) data the tracer needs. */
export interface SheetData {
  readonly grid: Grid2;
  readonly slots: number;
  readonly count: Uint8Array;
  /** Sheet id (union-find root) per cell·slots + slot. */
  readonly sheet: Int32Array;
  /** Scaled det J per cell·slots + slot (NaN when not defined). */
  readonly det: Float64Array;
  /** Driven joint values, m each (rad or m): those of (cell, slot) start at jointsAt[cell·slots + slot]·m. */
  readonly joints: Float64Array;
  readonly jointsAt: Int32Array;
  readonly m: number;
  /**
   * Largest joint change (rad or m) between the solution at a square's first corner and the one taken at another
   * corner. A sheet joined by continuation can come back to a cell on another branch (it winds around a point where
   * branches meet), so "same sheet" alone does not pick one solution per corner; the nearest one within this bound
   * does, and a square without one is skipped.
   */
  readonly maxCornerJump: number;
  /**
   * Kind of the singularity crossed inside a square, from its four corner solutions (cells and slots in the order
   * (0,0), (1,0), (1,1), (0,1)) and the index of the corner nearest to singular (smallest |det|).
   */
  readonly kindAt: (
    cells: readonly number[],
    slots: readonly number[],
    near: number,
  ) => Exclude<SingularityKind, "none">;
}
