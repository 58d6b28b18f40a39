/**
 * The one internal chain form every arm description compiles to (all SI):
 *
 *   baseFromFlange(q) = F₀ · M₁(q₁) · F₁ · M₂(q₂) ⋯ Mₙ(qₙ) · Fₙ
 *
 * Fᵢ are fixed rigid transforms; Mᵢ is a rotation about (revolute) or a translation along (prismatic) the unit
 * axis `axisLocal[i]` of the frame that Mᵢ acts in. Kinematic joint values follow the driven joints through an
 * affine coupling: q_kin = G · q_driven + offset (G is n × m, row-major). Passive joints (a parallelogram that keeps
 * the flange level) are rows of G with no driven joint of their own.
 */
export interface Chain {
  /** Number of kinematic joints n (driven and passive). */
  readonly jointCount: number;
  /** Number of driven joints m (the columns of the Jacobian). */
  readonly drivenCount: number;
  /** Names of the kinematic joints, in chain order. */
  readonly jointNames: readonly string[];
  /** Kinematic index of each driven joint. */
  readonly drivenJoint: Int32Array;
  /** 1 where kinematic joint i is prismatic. */
  readonly isPrismatic: Uint8Array;
  /** Unit joint axes in the frame each motion acts in, 3n. */
  readonly axisLocal: Float64Array;
  /** F₀ … Fₙ, 16(n + 1), row-major 4×4 each, metres. */
  readonly fixed: Float64Array;
  /** Pose of link frame i in the frame just after motion Mᵢ, 16n (the frame link masses are given in). */
  readonly linkFromMotion: Float64Array;
  /** G, n × m row-major: kinematic joint rates per driven joint rate. */
  readonly couplingGain: Float64Array;
  /** Offset of each kinematic joint, rad or m. */
  readonly couplingOffset: Float64Array;
  /** Driven-joint limits and ratings, SI (rad, rad/s, rad/s², N·m; or m, m/s, m/s², N). NaN where not given. */
  readonly lowerSi: Float64Array;
  readonly upperSi: Float64Array;
  readonly maxSpeedSi: Float64Array;
  readonly maxAccelSi: Float64Array;
  readonly ratedEffortSi: Float64Array;
  /** Wrist centre point, fixed in the link frame of `joint` (a kinematic index), or null when the arm has none. */
  readonly wrist: WristCentre | null;
  /** A length that scales angular rows against linear ones (m): the largest distance of a joint axis origin or
   * the flange from the base origin at the home pose. */
  readonly characteristicLengthM: number;
}

export interface WristCentre {
  /** Kinematic index of the link the point is fixed in. */
  readonly joint: number;
  /** Point in that link frame, m. */
  readonly pointInLinkM: Float64Array;
  /** Kinematic indices of the joints whose axes define it. */
  readonly axes: readonly number[];
  /** "spherical" when found automatically, "declared" when named in the arm file. */
  readonly basis: "spherical" | "declared";
}

/**
 * The same chain with every joint range opened (−∞, ∞): solvers run on it where a joint leaving its range must be
 * seen rather than clamped (the caller checks the ranges), or to find where a target lies outside them.
 */
export function withOpenRanges(chain: Chain): Chain {
  const m = chain.drivenCount;
  return { ...chain, lowerSi: new Float64Array(m).fill(-Infinity), upperSi: new Float64Array(m).fill(Infinity) };
}
