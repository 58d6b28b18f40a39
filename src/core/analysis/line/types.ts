/**
 * Input, options and result of the straight-line check (lineCheck.ts). The result's key names are the contract of
 * `armdex line`: add keys freely, do not rename.
 */
import type { SingularityKind } from "../../measures/singularity";

export interface LineCheckInput {
  /** Start of the TCP line in the base frame, m (3 values). */
  readonly startM: ArrayLike<number>;
  /** End of the TCP line in the base frame, m (3 values). */
  readonly endM: ArrayLike<number>;
  /**
   * The constant tool orientation baseFromTool: 3×3 (9 values) or 4×4 (16 values, translation ignored), row-major.
   * The tool frame is the flange frame moved to the TCP, so this is also the flange rotation.
   * Helpers (kinematics/toolOrientation.ts): referenceToolRotation ("down", "outward"), rpyToolRotation (roll,
   * pitch, yaw).
   */
  readonly baseFromToolRotation: ArrayLike<number>;
  /** Commanded TCP speed along the line, m/s (> 0). */
  readonly speedMPerS: number;
  /** TCP in the flange frame, m (default: the flange origin). */
  readonly toolInFlangeM?: ArrayLike<number> | undefined;
  /** Driven joints, rad or m: start on the IK solution nearest to these instead of the default rule. */
  readonly startJointsSi?: ArrayLike<number> | undefined;
}

export interface LineCheckOptions {
  /** Evenly spaced sample points reported, including both ends (≥ 2). */
  readonly samples: number;
  /** Gravity direction in the base frame (primary mounting); names elbow up/down. */
  readonly gravity: readonly [number, number, number];
  /** Largest joint change between neighbouring continuation points before the step is halved, rad (prismatic: m / characteristic length). */
  readonly maxJointStepRad: number;
  /** A joint change larger than this between points `minStepM` apart is a jump (no continuous solution), rad. */
  readonly jumpRad: number;
  /** Smallest continuation step, m. */
  readonly minStepM: number;
  /** Seeded random starts (besides the zero pose) used to find the IK solutions at the start. */
  readonly discoverySeeds: number;
  readonly seed: number;
  /** Start solutions followed at most (one per branch name). */
  readonly maxBranches: number;
}

export const DEFAULT_LINE_CHECK: LineCheckOptions = {
  samples: 101,
  gravity: [0, 0, -1],
  maxJointStepRad: (2 * Math.PI) / 180,
  jumpRad: 0.3,
  minStepM: 1e-6,
  discoverySeeds: 24,
  seed: 20260601,
  maxBranches: 8,
};

export type LineSingularityKind = Exclude<SingularityKind, "none">;

export interface LineSample {
  readonly fraction: number;
  /** Target TCP position, mm. */
  readonly positionMm: number[];
  readonly reachable: boolean;
  readonly branch: string | null;
  /** Driven joints, deg (revolute) or mm (prismatic); null when out of reach. */
  readonly jointsDeg: number[] | null;
  /** Joint rates needed at the commanded speed, deg/s or mm/s, signed; null when out of reach or exactly singular. */
  readonly jointRatesDegPerS: number[] | null;
  /** |q̇ᵢ| / q̇maxᵢ at the commanded speed (> 1: the joint cannot keep up); null entries for joints without a speed limit. */
  readonly rateRatios: (number | null)[] | null;
  /** Largest speed the arm could hold here (commanded / max rate ratio), mm/s; 0 when out of reach or singular;
   * null when no joint with a speed limit moves. */
  readonly localSpeedMmPerS: number | null;
  /** Smallest singular value of the Jacobian with linear rows divided by the characteristic length, 1/rad. */
  readonly sigmaMinScaled: number | null;
  /** σ_min / σ_max of that scaled Jacobian: 1 isotropic, 0 singular. */
  readonly inverseCondition: number | null;
  /** Kind of the nearest singular pose, from the joint motion that moves the tool least (singularity.ts). */
  readonly singularityKind: LineSingularityKind | null;
}

export interface LineBranchChange {
  readonly fraction: number;
  readonly positionMm: number[];
  readonly from: string;
  readonly to: string;
  /** "wrist flip", "elbow", "shoulder", "multiple" (names differ in several parts) or "jump" (joints only). */
  readonly kind: string;
  /** True when the joints moved continuously (the line crossed a singular pose); false for a jump. */
  readonly continuous: boolean;
  /** True when the change happens across an out-of-reach interval. */
  readonly acrossGap: boolean;
  /** Joint change between the two points, deg or mm. */
  readonly jointChangeDeg: number[];
  /** True when the wrist centre passes axis 1 continuously (front ↔ back, the arm reaching behind the axis with
   * finite rates): the arm keeps following the line; not a posture change and not a problem. */
  readonly passesAxis1: boolean;
  /** A plain note on the change, or null. */
  readonly note: string | null;
}

export interface LineOutOfReach {
  readonly fromFraction: number;
  readonly toFraction: number;
  readonly fromPositionMm: number[];
  readonly toPositionMm: number[];
}

export interface LineJointLimitViolation {
  readonly joint: string;
  readonly jointIndex: number;
  readonly bound: "lower" | "upper";
  /** The violated limit and the furthest value reached, in `unit`. */
  readonly limitValue: number;
  readonly extremeValue: number;
  readonly unit: "deg" | "mm";
  readonly fromFraction: number;
  readonly toFraction: number;
  readonly fromPositionMm: number[];
  readonly toPositionMm: number[];
}

/**
 * Why a start branch does not follow the line (the first of these that applies): a point out of reach, a joint
 * jump (no continuous solution), a joint leaving its range, or a pose needing unbounded joint rates.
 */
export type LineNotFollowedReason = "out of reach" | "jump" | "joint limit" | "singular";

export interface LineStartBranch {
  readonly branch: string;
  readonly startJointsDeg: number[];
  /** 0 whenever `followed` is false. */
  readonly feasibleConstantSpeedMmPerS: number | null;
  readonly jumps: number;
  readonly jointLimitViolations: number;
  readonly chosen: boolean;
  /** True when this start follows the whole line within reach, within every joint range and without a jump. */
  readonly followed: boolean;
  /** Why it does not (null when followed). */
  readonly reason: LineNotFollowedReason | null;
  /** Where along the line the reason applies (0 … 1; null when followed). */
  readonly atFraction: number | null;
  /** The joint concerned (the one leaving its range, jumping most, or needing the unbounded rate), or null. */
  readonly joint: string | null;
}

export interface LineCheckResult {
  readonly lengthMm: number;
  readonly speedMmPerS: number;
  readonly direction: number[];
  readonly orientationHeld: "full" | "tool axis";
  readonly jointNames: string[];
  readonly jointUnits: ("deg" | "mm")[];
  readonly startRule: "best run" | "nearest start joints";
  readonly startBranch: LineStartBranch | null;
  readonly startBranches: LineStartBranch[];
  /** True when the reported start branch follows the whole line within reach, within every joint range and
   * without a jump (see LineStartBranch.followed); the start branches are ranked followed first. */
  readonly followed: boolean;
  /** Largest constant TCP speed the whole line allows, mm/s: 0 when no start branch follows the line (a point out
   * of reach, a joint leaving its range, a jump, or an exactly singular pose); null when no joint with a speed
   * limit moves. */
  readonly feasibleConstantSpeedMmPerS: number | null;
  /** True when the line is followed and the commanded speed is within the feasible speed. */
  readonly commandedSpeedFeasible: boolean;
  /** True when the reported run passes axis 1 continuously (see LineBranchChange.passesAxis1). */
  readonly passesAxis1: boolean;
  readonly bottleneck: {
    readonly joint: string | null;
    readonly jointIndex: number | null;
    readonly positionMm: number[];
    readonly fraction: number;
    /** Rate ratio of that joint at the commanded speed (null when unbounded). */
    readonly rateRatio: number | null;
    /** What limits the speed: a joint's rate; a point out of reach; a joint jump (no continuous solution: the arm
     * must stop and reconfigure); a joint leaving its range (fraction: where it leaves); a pose where the motion
     * needs unbounded rates. */
    readonly reason: "joint rate" | LineNotFollowedReason;
  } | null;
  readonly nearestSingularity: {
    readonly kind: LineSingularityKind;
    readonly positionMm: number[];
    readonly fraction: number;
    readonly inverseCondition: number;
    readonly sigmaMinScaled: number;
    /** inverseCondition below SINGULAR_INVERSE_CONDITION. */
    readonly singular: boolean;
  } | null;
  readonly branchChanges: LineBranchChange[];
  readonly outOfReach: LineOutOfReach[];
  readonly jointLimitViolations: LineJointLimitViolation[];
  readonly jointsWithoutSpeedLimit: string[];
  /** Per sample: the largest speed the arm could hold there if the controller may slow down locally, mm/s. */
  readonly speedProfile: { readonly fraction: number; readonly speedMmPerS: number | null }[];
  readonly samples: LineSample[];
  /** Continuation points accepted on the reported run (samples plus adaptive steps). */
  readonly evaluatedPoints: number;
}
