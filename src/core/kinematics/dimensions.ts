/**
 * The dimension-drawing form of an ortho-parallel six-axis arm with a spherical wrist (`"convention":
 * "dimensions"`): seven lengths read off a dimension drawing, parameter names after Brandstötter, Angerer & Hofbaur
 * (2014), "An analytical solution of the inverse kinematics problem of industrial serial manipulators with an
 * ortho-parallel basis and a spherical wrist", Austrian Robotics Workshop. The zero pose and the signs are our own
 * (issue 14 §1):
 *
 * At θ = 0, in the base frame (z up along axis 1, origin on axis 1 at the mounting face):
 * - axis 1 along +z through the origin; axis 2 along +y through (a1, 0, c1);
 * - the upper arm points straight up: axis 3 along +y through (a1, 0, c1 + c2);
 * - the forearm points along +x: axis 4 along +x through (·, b, c1 + c2 + a2); the wrist centre at
 *   (a1 + c3, b, c1 + c2 + a2); axis 5 along +y and axis 6 along +x through the wrist centre;
 * - the flange centre at (a1 + c3 + c4, b, c1 + c2 + a2), flange z along +x, flange x along −z;
 * - every joint turns by the right-hand rule about the axis direction above: positive θ2 tilts the upper arm
 *   towards +x, positive θ3 turns the forearm down, positive θ5 turns the flange down.
 *
 * The model angle of joint i is θᵢ = signᵢ·qᵢ + zeroOffsetᵢ (qᵢ: the maker's joint reading, the driven variable).
 * compile.ts `dimensionsAsFrames` folds both into an equivalent frames arm, Rot(a, sign·q + zeroOffset) =
 * Rot(a, zeroOffset)·Rot(sign·a, q): the zero offset turns the joint origin about its axis and a −1 sign turns the
 * axis round, so the coupling matrix G stays the identity (the closed-form inverse, closedForm.ts, asks for that)
 * and each link frame still turns with θ.
 *
 * As a product of elementary transforms (the form the tests check against):
 *   T(θ) = Rz(θ1)·Tr(a1, 0, c1)·Ry(θ2)·Tr(0, 0, c2)·Ry(θ3)·Tr(c3, b, a2)·Rx(θ4)·Ry(θ5)·Rx(θ6)·Tr(c4, 0, 0)·Ry(90°)
 * Here it is written as six joint frames (origin, axis) with no rotation in any origin, so the link frame of each
 * joint is parallel to the base frame at θ = 0, with its origin at: J1 the base origin, J2 (a1, 0, c1),
 * J3 (a1, 0, c1 + c2), J4–J6 the wrist centre (a1 + c3, b, c1 + c2 + a2). Link masses (`links[].comMm`) of a
 * dimensions arm are given in these frames.
 */

/** The seven lengths of the dimension drawing, mm. */
export interface DimensionsInput {
  /** Shoulder offset: axis 2 lies a1 from axis 1 along +x at θ = 0. */
  readonly a1Mm: number;
  /** Elbow offset: axis 4 lies a2 above axis 3 at θ = 0 (perpendicular to the forearm). */
  readonly a2Mm: number;
  /** Lateral offset of the forearm and wrist along +y. */
  readonly bMm: number;
  /** Shoulder height: axis 2 above the mounting face. */
  readonly c1Mm: number;
  /** Upper arm: axis 2 to axis 3. */
  readonly c2Mm: number;
  /** Forearm: axis 3 to the wrist centre, along axis 4. */
  readonly c3Mm: number;
  /** Wrist centre to the flange face, along axis 6. */
  readonly c4Mm: number;
}

/** A joint frame of the frames convention: origin (mm, deg) in the previous joint frame and a unit axis. */
export interface DimensionJointFrame {
  readonly origin: { readonly xyzMm: readonly number[]; readonly rpyDeg: readonly number[] };
  readonly axis: readonly number[];
}

export interface DimensionFrames {
  readonly joints: readonly DimensionJointFrame[];
  readonly flange: { readonly xyzMm: readonly number[]; readonly rpyDeg: readonly number[] };
}

/** Number of joints of a dimensions arm. */
export const DIMENSIONS_JOINT_COUNT = 6;

/**
 * The dimension drawing as six joint frames (the frames convention, as URDF writes them): every origin is a pure
 * translation from the previous joint's origin, the axes are +z, +y, +y, +x, +y, +x, and the flange is
 * Tr(c4, 0, 0)·Ry(90°) (flange z along +x, flange x along −z).
 * @param d the seven lengths, mm
 * @returns joint frames and the flange frame in file units (mm, deg)
 * @see Brandstötter, Angerer & Hofbaur (2014), fig. 1 (parameter names); issue 14 §1 (zero pose and signs)
 * @example dimensionFrames({ a1Mm: 150, a2Mm: 110, bMm: 0, c1Mm: 450, c2Mm: 600, c3Mm: 640, c4Mm: 100 })
 *   // joints[1].origin.xyzMm = [150, 0, 450]; joints[3].origin.xyzMm = [640, 0, 110] (from axis 3 to the wrist
 *   // centre); at θ = 0 the flange centre is at (890, 0, 1160) mm
 */
export function dimensionFrames(d: DimensionsInput): DimensionFrames {
  const at = (x: number, y: number, z: number) => ({ xyzMm: [x, y, z], rpyDeg: [0, 0, 0] });
  const X = [1, 0, 0],
    Y = [0, 1, 0],
    Z = [0, 0, 1];
  return {
    joints: [
      { origin: at(0, 0, 0), axis: Z },
      { origin: at(d.a1Mm, 0, d.c1Mm), axis: Y },
      { origin: at(0, 0, d.c2Mm), axis: Y },
      { origin: at(d.c3Mm, d.bMm, d.a2Mm), axis: X },
      { origin: at(0, 0, 0), axis: Y },
      { origin: at(0, 0, 0), axis: X },
    ],
    flange: { xyzMm: [d.c4Mm, 0, 0], rpyDeg: [0, 90, 0] },
  };
}
