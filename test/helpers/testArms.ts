/**
 * Invented test chains (round numbers, no real product) as compileChain inputs in file units (mm, deg), plus an
 * independent reference forward kinematics built from mathjs matrix products (no code from src/core).
 *
 * The generic spherical-wrist 6R of CHECKS.md §0, standard DH (Spong, Hutchinson & Vidyasagar, Robot Modeling and
 * Control, ch. 3: Aᵢ = Rz(θᵢ)·Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ)), all θ offsets 0, joint variable added to θ:
 *
 *   i |  aᵢ (m) | αᵢ    | dᵢ (m)
 *   1 |  0.2    | −90°  | 0.5
 *   2 |  1.0    |   0   | 0
 *   3 |  0.2    | −90°  | 0
 *   4 |  0      | +90°  | 1.0
 *   5 |  0      | −90°  | 0
 *   6 |  0      |   0   | 0.1
 *
 * Flange = DH frame 6 (identity flange transform). Wrist centre = origin of DH frame 4.
 */
import * as math from "mathjs";
import type { ArmKinematicsInput, JointInput } from "../../src/core";
import { uniform } from "./prng";

/** Standard-DH row in SI (m, rad). */
export interface DhRowSi {
  readonly a: number;
  readonly alpha: number;
  readonly d: number;
  readonly theta: number;
}

const DEG = Math.PI / 180;

/** The generic 6R of CHECKS §0 in SI. */
export const GENERIC_6R_SI = {
  a1: 0.2,
  a2: 1.0,
  a3: 0.2,
  d1: 0.5,
  d4: 1.0,
  d6: 0.1,
  rows: [
    { a: 0.2, alpha: -90 * DEG, d: 0.5, theta: 0 },
    { a: 1.0, alpha: 0, d: 0, theta: 0 },
    { a: 0.2, alpha: -90 * DEG, d: 0, theta: 0 },
    { a: 0, alpha: 90 * DEG, d: 1.0, theta: 0 },
    { a: 0, alpha: -90 * DEG, d: 0, theta: 0 },
    { a: 0, alpha: 0, d: 0.1, theta: 0 },
  ] as readonly DhRowSi[],
} as const;

/** Test pose q* of CHECKS §0, rad. */
export const Q_STAR = [0.3, -0.7, 0.4, 1.1, 0.8, -0.2] as const;

/** Invented joint speed limits of CHECKS §0, deg/s. */
const W_DEG_PER_S = [150, 150, 180, 300, 300, 400] as const;

const DH_MM_DEG = [
  { aMm: 200, alphaDeg: -90, dMm: 500, thetaDeg: 0 },
  { aMm: 1000, alphaDeg: 0, dMm: 0, thetaDeg: 0 },
  { aMm: 200, alphaDeg: -90, dMm: 0, thetaDeg: 0 },
  { aMm: 0, alphaDeg: 90, dMm: 1000, thetaDeg: 0 },
  { aMm: 0, alphaDeg: -90, dMm: 0, thetaDeg: 0 },
  { aMm: 0, alphaDeg: 0, dMm: 100, thetaDeg: 0 },
] as const;

function revolute(i: number, extra: Partial<JointInput>): JointInput {
  return {
    name: `j${i + 1}`,
    kind: "revolute",
    rangeDeg: [-180, 180],
    maxSpeedDegPerS: W_DEG_PER_S[i] ?? 200,
    ...extra,
  };
}

const NO_FLANGE = { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] } as const;

/** Generic 6R, standard DH. */
export function generic6rDh(): ArmKinematicsInput {
  return { convention: "dh", joints: DH_MM_DEG.map((dh, i) => revolute(i, { dh })), flange: NO_FLANGE };
}

/**
 * The same arm in modified DH (Craig, Introduction to Robotics, 3rd ed., ch. 3: Aᵢ = Rx(αᵢ₋₁)·Tx(aᵢ₋₁)·Rz(θᵢ)·Tz(dᵢ)).
 * Regrouping the standard product Rz(θ₁)Tz(d₁)·[Tx(a₁)Rx(α₁)·Rz(θ₂)Tz(d₂)]⋯ (Rx and Tx commute) gives row i =
 * (aᵢ₋₁, αᵢ₋₁, dᵢ) with a₀ = α₀ = 0; the tail Tx(a₆)Rx(α₆) is the identity here, so the flange stays identity.
 */
export function generic6rMdh(): ArmKinematicsInput {
  const rows = DH_MM_DEG.map((row, i) => {
    const prev = i > 0 ? DH_MM_DEG[i - 1]! : { aMm: 0, alphaDeg: 0 };
    return { aMm: prev.aMm, alphaDeg: prev.alphaDeg, dMm: row.dMm, thetaDeg: row.thetaDeg };
  });
  return { convention: "mdh", joints: rows.map((mdh, i) => revolute(i, { mdh })), flange: NO_FLANGE };
}

/**
 * The same arm as explicit frames, literal rewrite: origin of joint 1 = identity; origin of joint i+1 =
 * Tz(dᵢ)·Tx(aᵢ)·Rx(αᵢ) = (xyz (aᵢ, 0, dᵢ), rpy (αᵢ, 0, 0)); axis z; flange = Tz(d₆).
 */
export function generic6rFramesFromDh(): ArmKinematicsInput {
  const origin = (i: number) => {
    if (i === 0) return { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] };
    const p = DH_MM_DEG[i - 1]!;
    return { xyzMm: [p.aMm, 0, p.dMm], rpyDeg: [p.alphaDeg, 0, 0] };
  };
  const last = DH_MM_DEG[5];
  return {
    convention: "frames",
    joints: DH_MM_DEG.map((_, i) => revolute(i, { origin: origin(i), axis: [0, 0, 1] })),
    flange: { xyzMm: [last.aMm, 0, last.dMm], rpyDeg: [last.alphaDeg, 0, 0] },
  };
}

/**
 * The same arm as a URDF-style description with no rotated joint frames: every joint origin is a pure offset and
 * the axes are given in base directions at the home pose. Derived by hand from the DH table at q = 0: the DH axes
 * z₀…z₅ are (+z, +y, +y, −z, +y, −z) through (0,0,0), (0.2,0,0.5), (1.2,0,0.5), (1.4,0,0.5), (1.4,0,−0.5),
 * (1.4,0,−0.5) m, and the flange is at (1.4, 0, −0.6) m with R = diag(1, −1, −1) = Rx(180°). Two chains with the same
 * home axes and home flange pose have the same FK for every q (product of exponentials, Lynch & Park, Modern
 * Robotics §4.1 [from memory]).
 */
export function generic6rFramesUrdfStyle(): ArmKinematicsInput {
  const spec: [number[], number[]][] = [
    [
      [0, 0, 0],
      [0, 0, 1],
    ],
    [
      [200, 0, 500],
      [0, 1, 0],
    ],
    [
      [1000, 0, 0],
      [0, 1, 0],
    ],
    [
      [200, 0, 0],
      [0, 0, -1],
    ],
    [
      [0, 0, -1000],
      [0, 1, 0],
    ],
    [
      [0, 0, 0],
      [0, 0, -1],
    ],
  ];
  return {
    convention: "frames",
    joints: spec.map(([xyzMm, axis], i) => revolute(i, { origin: { xyzMm, rpyDeg: [0, 0, 0] }, axis })),
    flange: { xyzMm: [0, 0, -100], rpyDeg: [180, 0, 0] },
  };
}

/** Planar 2R in the x–y plane (standard DH, α = 0), link lengths in metres. */
export function planar2r(a1M: number, a2M: number): ArmKinematicsInput {
  return {
    convention: "dh",
    joints: [
      {
        name: "j1",
        kind: "revolute",
        dh: { aMm: a1M * 1000, alphaDeg: 0, dMm: 0, thetaDeg: 0 },
        rangeDeg: [-180, 180],
        maxSpeedDegPerS: 100,
      },
      {
        name: "j2",
        kind: "revolute",
        dh: { aMm: a2M * 1000, alphaDeg: 0, dMm: 0, thetaDeg: 0 },
        rangeDeg: [-180, 180],
        maxSpeedDegPerS: 100,
      },
    ],
    flange: NO_FLANGE,
  };
}

/**
 * Invented SCARA-like R R P R chain with vertical axes, standard DH: a1 = 400 mm, d1 = 500 mm; a2 = 300 mm,
 * α2 = 180° (so the quill and the last axis point down); prismatic quill (variable adds to d3); d4 = 50 mm.
 * Speeds 200 °/s, 300 °/s, 1000 mm/s, 600 °/s.
 */
export function scaraRrprDh(): ArmKinematicsInput {
  return {
    convention: "dh",
    joints: [
      {
        name: "j1",
        kind: "revolute",
        dh: { aMm: 400, alphaDeg: 0, dMm: 500, thetaDeg: 0 },
        rangeDeg: [-150, 150],
        maxSpeedDegPerS: 200,
      },
      {
        name: "j2",
        kind: "revolute",
        dh: { aMm: 300, alphaDeg: 180, dMm: 0, thetaDeg: 0 },
        rangeDeg: [-150, 150],
        maxSpeedDegPerS: 300,
      },
      {
        name: "j3",
        kind: "prismatic",
        dh: { aMm: 0, alphaDeg: 0, dMm: 0, thetaDeg: 0 },
        rangeMm: [0, 300],
        maxSpeedMmPerS: 1000,
      },
      {
        name: "j4",
        kind: "revolute",
        dh: { aMm: 0, alphaDeg: 0, dMm: 50, thetaDeg: 0 },
        rangeDeg: [-360, 360],
        maxSpeedDegPerS: 600,
      },
    ],
    flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
  };
}

/** Invented cylindrical arm in standard DH: revolute base, prismatic lift, prismatic radial stroke, 2R wrist. */
export function cylindricalPrismaticDh(): ArmKinematicsInput {
  return {
    convention: "dh",
    joints: [
      {
        name: "base",
        kind: "revolute",
        dh: { aMm: 0, alphaDeg: 0, dMm: 400, thetaDeg: 0 },
        rangeDeg: [-170, 170],
        maxSpeedDegPerS: 120,
      },
      {
        name: "lift",
        kind: "prismatic",
        dh: { aMm: 0, alphaDeg: -90, dMm: 300, thetaDeg: 0 },
        rangeMm: [0, 800],
        maxSpeedMmPerS: 500,
      },
      {
        name: "stroke",
        kind: "prismatic",
        dh: { aMm: 0, alphaDeg: 0, dMm: 200, thetaDeg: 0 },
        rangeMm: [0, 600],
        maxSpeedMmPerS: 800,
      },
      {
        name: "w1",
        kind: "revolute",
        dh: { aMm: 0, alphaDeg: 90, dMm: 100, thetaDeg: 30 },
        rangeDeg: [-120, 120],
        maxSpeedDegPerS: 300,
      },
      {
        name: "w2",
        kind: "revolute",
        dh: { aMm: 50, alphaDeg: 0, dMm: 80, thetaDeg: 0 },
        rangeDeg: [-360, 360],
        maxSpeedDegPerS: 400,
      },
    ],
    flange: { xyzMm: [0, 0, 60], rpyDeg: [0, 0, 0] },
  };
}

/** Invented gantry-like chain as frames with an oblique prismatic axis (0.6, 0, 0.8) and a rotated origin. */
export function obliquePrismaticFrames(): ArmKinematicsInput {
  return {
    convention: "frames",
    joints: [
      {
        name: "x",
        kind: "prismatic",
        origin: { xyzMm: [0, 0, 1000], rpyDeg: [0, 0, 0] },
        axis: [1, 0, 0],
        rangeMm: [0, 2000],
        maxSpeedMmPerS: 1000,
      },
      {
        name: "slant",
        kind: "prismatic",
        origin: { xyzMm: [100, 50, 0], rpyDeg: [10, 0, 20] },
        axis: [0.6, 0, 0.8],
        rangeMm: [-300, 300],
        maxSpeedMmPerS: 600,
      },
      {
        name: "r1",
        kind: "revolute",
        origin: { xyzMm: [0, 0, -200], rpyDeg: [0, 15, 0] },
        axis: [0, 0, 1],
        rangeDeg: [-180, 180],
        maxSpeedDegPerS: 200,
      },
      {
        name: "r2",
        kind: "revolute",
        origin: { xyzMm: [80, 0, -50], rpyDeg: [0, 0, 0] },
        axis: [0, 1, 0],
        rangeDeg: [-120, 120],
        maxSpeedDegPerS: 300,
      },
    ],
    flange: { xyzMm: [0, 0, -120], rpyDeg: [180, 0, 0] },
  };
}

/**
 * Invented 4-axis palletizer with a parallelogram: the passive joint p4 follows q4 = −(q2 + q3), so the three
 * parallel y axes sum to zero and the flange stays level: R_flange = Rz(q1 + q5)·Rx(180°) for every pose.
 */
export function palletizerPassiveFrames(): ArmKinematicsInput {
  return {
    convention: "frames",
    joints: [
      {
        name: "j1",
        kind: "revolute",
        origin: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
        axis: [0, 0, 1],
        rangeDeg: [-180, 180],
        maxSpeedDegPerS: 120,
      },
      {
        name: "j2",
        kind: "revolute",
        origin: { xyzMm: [150, 0, 600], rpyDeg: [0, 0, 0] },
        axis: [0, 1, 0],
        rangeDeg: [-60, 90],
        maxSpeedDegPerS: 110,
      },
      {
        name: "j3",
        kind: "revolute",
        origin: { xyzMm: [0, 0, 1100], rpyDeg: [0, 0, 0] },
        axis: [0, 1, 0],
        rangeDeg: [-80, 60],
        maxSpeedDegPerS: 110,
      },
      {
        name: "p4",
        kind: "revolute",
        origin: { xyzMm: [1200, 0, 0], rpyDeg: [0, 0, 0] },
        axis: [0, 1, 0],
        coupling: {
          terms: [
            { joint: "j2", gain: -1 },
            { joint: "j3", gain: -1 },
          ],
          offsetDeg: 0,
        },
      },
      {
        name: "j5",
        kind: "revolute",
        origin: { xyzMm: [200, 0, -250], rpyDeg: [0, 0, 0] },
        axis: [0, 0, 1],
        rangeDeg: [-360, 360],
        maxSpeedDegPerS: 300,
      },
    ],
    flange: { xyzMm: [0, 0, -50], rpyDeg: [180, 0, 0] },
  };
}

/** Offset added to the kinematic j3 of the driven-coupled variant, deg. */
export const COUPLED_J3_OFFSET_DEG = 10;

/**
 * The generic 6R with joint 3 driven but measured from the upper arm's horizontal: kinematic q₃ = q₃,driven − q₂ +
 * 10° (a driven joint that also has a coupling).
 */
export function generic6rDrivenCoupledDh(): ArmKinematicsInput {
  const base = generic6rDh();
  return {
    ...base,
    joints: base.joints.map((j) =>
      j.name === "j3"
        ? { ...j, coupling: { terms: [{ joint: "j2", gain: -1 }], offsetDeg: COUPLED_J3_OFFSET_DEG } }
        : j,
    ),
  };
}

// ---------------------------------------------------------------------------------------------------------------
// Independent reference FK: explicit elementary matrices multiplied by mathjs (nothing from src/core).

type M4 = number[][];

const rz = (t: number): M4 => [
  [Math.cos(t), -Math.sin(t), 0, 0],
  [Math.sin(t), Math.cos(t), 0, 0],
  [0, 0, 1, 0],
  [0, 0, 0, 1],
];
const rx = (t: number): M4 => [
  [1, 0, 0, 0],
  [0, Math.cos(t), -Math.sin(t), 0],
  [0, Math.sin(t), Math.cos(t), 0],
  [0, 0, 0, 1],
];
const tz = (d: number): M4 => [
  [1, 0, 0, 0],
  [0, 1, 0, 0],
  [0, 0, 1, d],
  [0, 0, 0, 1],
];
const tx = (a: number): M4 => [
  [1, 0, 0, a],
  [0, 1, 0, 0],
  [0, 0, 1, 0],
  [0, 0, 0, 1],
];

/** Standard-DH link transform Aᵢ = Rz(θ)·Tz(d)·Tx(a)·Rx(α) (Spong et al., ch. 3). */
export function dhLinkReference(row: DhRowSi, q: number): M4 {
  return math.multiply(math.multiply(rz(row.theta + q), tz(row.d)), math.multiply(tx(row.a), rx(row.alpha)));
}

/** ⁰Tₖ = A₁⋯Aₖ for revolute joints, as a nested 4×4 array (m). k defaults to all rows. */
export function dhFrameReference(rows: readonly DhRowSi[], q: ArrayLike<number>, k = rows.length): M4 {
  let t: M4 = [
    [1, 0, 0, 0],
    [0, 1, 0, 0],
    [0, 0, 1, 0],
    [0, 0, 0, 1],
  ];
  for (let i = 0; i < k; i++) t = math.multiply(t, dhLinkReference(rows[i]!, q[i]!));
  return t;
}

/** Row-major flattening of a nested 4×4. */
export function flat4(t: M4): number[] {
  return t.flat();
}

/**
 * Invented Cartesian gantry: prismatic X, Y, Z along the base axes, then a rotary axis about z; the flange points
 * down (rpy 180° about x), so the flange position is (x, y, z). Speeds 2000 mm/s and accelerations 20 000 mm/s²
 * (V = 2 m/s, A = 20 m/s², the CHECKS C17 values) unless `accel` is false.
 */
export function cartesianGantry(accel: boolean): ArmKinematicsInput {
  const origin = { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] };
  const linear = (name: string, axis: number[], rangeMm: number[]) => ({
    name,
    kind: "prismatic" as const,
    origin,
    axis,
    rangeMm,
    maxSpeedMmPerS: 2000,
    ...(accel ? { maxAccelMmPerS2: 20000 } : {}),
  });
  return {
    convention: "frames",
    joints: [
      linear("X", [1, 0, 0], [0, 2000]),
      linear("Y", [0, 1, 0], [-1000, 1000]),
      linear("Z", [0, 0, 1], [-500, 1000]),
      {
        name: "R",
        kind: "revolute",
        origin,
        axis: [0, 0, 1],
        rangeDeg: [-180, 180],
        maxSpeedDegPerS: 360,
        ...(accel ? { maxAccelDegPerS2: 3600 } : {}),
      },
    ],
    flange: { xyzMm: [0, 0, 0], rpyDeg: [180, 0, 0] },
  };
}

/** A dimension-drawing arm (convention "dimensions"): the seven lengths, per-joint senses and zero offsets; ±360° ranges. */
export function dimensionsArmInput(
  dims: Record<"a1Mm" | "a2Mm" | "bMm" | "c1Mm" | "c2Mm" | "c3Mm" | "c4Mm", number>,
  sign: readonly number[],
  zeroOffsetDeg: readonly number[],
  maxSpeedDegPerS: readonly number[] = [200, 200, 200, 200, 200, 200],
): ArmKinematicsInput {
  return {
    convention: "dimensions",
    dimensions: dims,
    joints: sign.map((s, i) => ({
      name: `J${i + 1}`,
      kind: "revolute" as const,
      rangeDeg: [-360, 360],
      maxSpeedDegPerS: maxSpeedDegPerS[i]!,
      sign: s,
      zeroOffsetDeg: zeroOffsetDeg[i],
    })),
  };
}

/**
 * A dimension-drawing arm with random lengths (mm: a1 0–300, a2 ±200, b ±150, c1 200–800, c2 300–1 200,
 * c3 300–1 400, c4 50–250), random joint senses and whole-degree zero offsets (±180°), drawn from `rnd` in that
 * order; joint speeds 200°/s, or drawn after the rest from 100–400°/s with `randomSpeeds`.
 */
export function randomDimensionsArm(rnd: () => number, randomSpeeds = false): ArmKinematicsInput {
  const dims = {
    a1Mm: uniform(rnd, 0, 300),
    a2Mm: uniform(rnd, -200, 200),
    bMm: uniform(rnd, -150, 150),
    c1Mm: uniform(rnd, 200, 800),
    c2Mm: uniform(rnd, 300, 1200),
    c3Mm: uniform(rnd, 300, 1400),
    c4Mm: uniform(rnd, 50, 250),
  };
  const sign = Array.from({ length: 6 }, () => (rnd() < 0.5 ? -1 : 1));
  const offset = Array.from({ length: 6 }, () => Math.round(uniform(rnd, -180, 180)));
  const speeds = randomSpeeds ? Array.from({ length: 6 }, () => uniform(rnd, 100, 400)) : undefined;
  return dimensionsArmInput(dims, sign, offset, speeds);
}
