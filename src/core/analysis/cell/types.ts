/**
 * Cell study input, file-shaped (mm, deg, kg, kg·m², s; the cell frame has z up, gravity along −z; rpy is
 * R = Rz(yaw)·Ry(pitch)·Rx(roll)). The catalog validates `arms/cells/<id>.json` into this shape; the core converts
 * to SI once, when a study starts (study.ts).
 */

export type Vec3 = readonly [number, number, number];

/** A rigid frame: position (mm) and rpy (deg). */
export interface PlacementSpec {
  readonly positionMm: Vec3;
  readonly rpyDeg: Vec3;
}

/** Inertia about the body's own centre of gravity, in flange axes, kg·m². */
export interface InertiaSpec {
  readonly xx: number;
  readonly yy: number;
  readonly zz: number;
  readonly xy: number;
  readonly xz: number;
  readonly yz: number;
}

/** A tool body or a part: mass, centre of gravity in the flange frame (mm), optional inertia about it. */
export interface BodySpec {
  readonly name: string;
  readonly massKg: number;
  readonly cogMm: Vec3;
  readonly inertiaKgM2?: InertiaSpec | undefined;
}

/** A target: an absolute tool-point pose in the cell frame, or an offset (cell frame, same orientation) of another. */
export type TargetSpec =
  | { readonly name: string; readonly positionMm: Vec3; readonly rpyDeg: Vec3 }
  | { readonly name: string; readonly relativeTo: string; readonly offsetMm: Vec3 };

export interface CycleStepSpec {
  readonly to: string;
  readonly motion: "joint" | "linear";
  /** Joint moves: share of every joint's speed, 1–100 (default 100). */
  readonly speedPercent?: number | undefined;
  /** Linear moves: cap on the tool-point speed, mm/s (default: none, the joints limit). */
  readonly speedMmPerS?: number | undefined;
  /** Wait on arrival, s (default 0). */
  readonly dwellS?: number | undefined;
  /** Part picked up on arrival. */
  readonly grip?: string | undefined;
  /** true: the carried part is set down on arrival. */
  readonly release?: boolean | undefined;
}

export interface CellRequirementsSpec {
  readonly maxCycleS?: number | undefined;
  readonly minJointMarginDeg?: number | undefined;
}

export interface CellSpec {
  readonly id: string;
  readonly title: string;
  readonly description?: string | undefined;
  readonly candidates: readonly string[];
  readonly placement: PlacementSpec;
  readonly placements?: Readonly<Record<string, PlacementSpec>> | undefined;
  readonly tool: {
    readonly tcp: { readonly xyzMm: Vec3; readonly rpyDeg: Vec3 };
    readonly bodies: readonly BodySpec[];
  };
  readonly parts: readonly BodySpec[];
  readonly targets: readonly TargetSpec[];
  readonly cycle: readonly CycleStepSpec[];
  readonly requirements?: CellRequirementsSpec | undefined;
}
