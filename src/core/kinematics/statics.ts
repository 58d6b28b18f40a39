/**
 * Statics of a compiled chain (pure): holding torques τ = Jᵀ·F of the driven joints against the weight of point
 * masses and of link masses, and the direction of gravity in the base frame for each mounting.
 *
 * Notation (SI): τ holding torque, N·m (N for prismatic joints); F the support force (−m·g_vec) at each mass;
 * g_vec gravity acceleration in the base frame, m/s²; G the coupling gain (kinematic joints = G·driven + offset).
 *
 * Mountings (common practice, no source): geometry is always shown in the base frame; only gravity (payload) and
 * the meaning of "tool down" follow the mounting. The base is tilted about its y axis: floor 0° (gravity (0, 0, −1)),
 * wall 90° (gravity along base +x: base +x points down), ceiling 180° (gravity along base +z), angled by
 * `angledTiltDeg` (45° by default, an assumption: the real angle depends on the installation): (sin θ, 0, −cos θ).
 * @see Craig, Introduction to Robotics, 3rd ed., ch. 5 (static forces: τ = Jᵀ F); Spong, Hutchinson & Vidyasagar,
 *   Robot Modeling and Control, ch. 4
 */
import type { Chain } from "./chain";
import { linkFrameInto, type KinematicsScratch } from "./forward";
import { STANDARD_GRAVITY_M_PER_S2, degToRad } from "../units";

export type Mounting = "floor" | "ceiling" | "wall" | "angled";

/** A link's own mass, fixed in the link frame of a kinematic joint (linkFrameInto). */
export interface LinkMass {
  /** Kinematic joint index whose link frame holds the mass. */
  readonly joint: number;
  readonly massKg: number;
  /** Centre of mass in that link frame, m. */
  readonly comInLinkM: readonly [number, number, number];
}

/** Link masses in flat arrays, sorted by kinematic joint (fast path of holdingTorqueInto). */
export interface BodySet {
  readonly count: number;
  readonly joint: Int32Array;
  readonly massKg: Float64Array;
  /** 3 per body, m, in the link frame of `joint`. */
  readonly comInLinkM: Float64Array;
}

/** Flat, sorted copy of the link masses for holdingTorqueInto. */
export function bodySetOf(links: readonly LinkMass[]): BodySet {
  const sorted = [...links].sort((a, b) => a.joint - b.joint);
  const comInLinkM = new Float64Array(3 * sorted.length);
  sorted.forEach((l, i) => comInLinkM.set(l.comInLinkM, 3 * i));
  return {
    count: sorted.length,
    joint: Int32Array.from(sorted.map((l) => l.joint)),
    massKg: Float64Array.from(sorted.map((l) => l.massKg)),
    comInLinkM,
  };
}

/** Work buffers for the holding-torque kernels: made once per analysis. */
export interface HoldingScratch {
  readonly tauKin: Float64Array;
  /** Σ m·p over the bodies distal to each kinematic joint (3n) and Σ m (n). */
  readonly momentSum: Float64Array;
  readonly massSum: Float64Array;
  readonly link: Float64Array;
}

/** Work buffers of holdingTorqueInto and pointHoldingTorqueInto for `chain`. */
export function createHoldingScratch(chain: Chain): HoldingScratch {
  const n = chain.jointCount;
  return {
    tauKin: new Float64Array(n),
    momentSum: new Float64Array(3 * n),
    massSum: new Float64Array(n),
    link: new Float64Array(16),
  };
}

/** Driven torques from kinematic ones: τ_driven = Gᵀ·τ_kin (virtual work through the coupling). */
function drivenFromKinematicInto(out: Float64Array, chain: Chain, tauKin: Float64Array): Float64Array {
  const n = chain.jointCount,
    m = chain.drivenCount,
    g = chain.couplingGain;
  for (let j = 0; j < m; j++) {
    let v = 0;
    for (let i = 0; i < n; i++) {
      const gij = g[i * m + j]!;
      if (gij !== 0) v += gij * tauKin[i]!;
    }
    out[j] = v;
  }
  return out;
}

/**
 * Static holding torques of the driven joints against the weight of the link masses, after forwardInto:
 * τ = Σ_b J_bᵀ·(−m_b·g_vec), with J_b the Jacobian of body b's centre of mass (columns of the joints distal to b are
 * zero) and passive joints mapped to driven ones by Gᵀ. Equals +∂V/∂q with V = −Σ m_b·g_vec·p_b. Allocates nothing.
 * @param out m driven torques, N·m (N for prismatic joints)
 * @param gravityInBaseMPerS2 gravity acceleration vector in the base frame, m/s² (floor: (0, 0, −9.80665))
 * @see Craig, Introduction to Robotics, 3rd ed., ch. 5 (static forces: τ = Jᵀ F); Spong et al., ch. 4
 * @example planar 2R with horizontal axes, a 10 kg mass at the tip (0.5, 0.3) m, q = 0, floor: (78.4532, 29.41995)
 */
export function holdingTorqueInto(
  out: Float64Array,
  chain: Chain,
  s: KinematicsScratch,
  bodies: BodySet,
  gravityInBaseMPerS2: ArrayLike<number>,
  h: HoldingScratch,
): Float64Array {
  const n = chain.jointCount,
    ms = h.momentSum,
    mass = h.massSum;
  ms.fill(0);
  mass.fill(0);
  for (let b = 0; b < bodies.count; b++) {
    const k = bodies.joint[b]!,
      mb = bodies.massKg[b]!;
    const t = linkFrameInto(h.link, chain, s, k);
    const cx = bodies.comInLinkM[3 * b]!,
      cy = bodies.comInLinkM[3 * b + 1]!,
      cz = bodies.comInLinkM[3 * b + 2]!;
    ms[3 * k] = ms[3 * k]! + mb * (t[0]! * cx + t[1]! * cy + t[2]! * cz + t[3]!);
    ms[3 * k + 1] = ms[3 * k + 1]! + mb * (t[4]! * cx + t[5]! * cy + t[6]! * cz + t[7]!);
    ms[3 * k + 2] = ms[3 * k + 2]! + mb * (t[8]! * cx + t[9]! * cy + t[10]! * cz + t[11]!);
    mass[k] = mass[k]! + mb;
  }
  // Suffix sums: joint i carries every body on links i, i+1, …
  for (let i = n - 2; i >= 0; i--) {
    ms[3 * i] = ms[3 * i]! + ms[3 * i + 3]!;
    ms[3 * i + 1] = ms[3 * i + 1]! + ms[3 * i + 4]!;
    ms[3 * i + 2] = ms[3 * i + 2]! + ms[3 * i + 5]!;
    mass[i] = mass[i]! + mass[i + 1]!;
  }
  // Support force per kg: −g_vec.
  const fx = -gravityInBaseMPerS2[0]!,
    fy = -gravityInBaseMPerS2[1]!,
    fz = -gravityInBaseMPerS2[2]!;
  const fr = s.motionFrames,
    ax = chain.axisLocal;
  for (let i = 0; i < n; i++) {
    const f = 16 * i;
    const a0 = ax[3 * i]!,
      a1 = ax[3 * i + 1]!,
      a2 = ax[3 * i + 2]!;
    const zx = fr[f]! * a0 + fr[f + 1]! * a1 + fr[f + 2]! * a2;
    const zy = fr[f + 4]! * a0 + fr[f + 5]! * a1 + fr[f + 6]! * a2;
    const zz = fr[f + 8]! * a0 + fr[f + 9]! * a1 + fr[f + 10]! * a2;
    const M = mass[i]!;
    if (chain.isPrismatic[i]) {
      h.tauKin[i] = M * (zx * fx + zy * fy + zz * fz);
    } else {
      // Σ (p_b − o_i) × m_b f = (Σ m_b p_b − M o_i) × f
      const rx = ms[3 * i]! - M * fr[f + 3]!,
        ry = ms[3 * i + 1]! - M * fr[f + 7]!,
        rz = ms[3 * i + 2]! - M * fr[f + 11]!;
      h.tauKin[i] = zx * (ry * fz - rz * fy) + zy * (rz * fx - rx * fz) + zz * (rx * fy - ry * fx);
    }
  }
  return drivenFromKinematicInto(out, chain, h.tauKin);
}

/**
 * Static holding torques of the driven joints for a point mass (p in the base frame, m) carried by the flange,
 * after forwardInto: τ = Jᵀ·(−m·g_vec), J the Jacobian of p with respect to the driven joints. Allocates nothing.
 * @example 2R in a vertical plane (a = 0.5, 0.3 m), 10 kg at the tip, q = (30°, 45°): (50.0784835, 7.6144434) N·m
 */
export function pointHoldingTorqueInto(
  out: Float64Array,
  chain: Chain,
  s: KinematicsScratch,
  px: number,
  py: number,
  pz: number,
  massKg: number,
  gravityInBaseMPerS2: ArrayLike<number>,
  h: HoldingScratch,
): Float64Array {
  const n = chain.jointCount,
    fr = s.motionFrames,
    ax = chain.axisLocal;
  const fx = -massKg * gravityInBaseMPerS2[0]!,
    fy = -massKg * gravityInBaseMPerS2[1]!,
    fz = -massKg * gravityInBaseMPerS2[2]!;
  for (let i = 0; i < n; i++) {
    const f = 16 * i;
    const a0 = ax[3 * i]!,
      a1 = ax[3 * i + 1]!,
      a2 = ax[3 * i + 2]!;
    const zx = fr[f]! * a0 + fr[f + 1]! * a1 + fr[f + 2]! * a2;
    const zy = fr[f + 4]! * a0 + fr[f + 5]! * a1 + fr[f + 6]! * a2;
    const zz = fr[f + 8]! * a0 + fr[f + 9]! * a1 + fr[f + 10]! * a2;
    if (chain.isPrismatic[i]) {
      h.tauKin[i] = zx * fx + zy * fy + zz * fz;
    } else {
      const rx = px - fr[f + 3]!,
        ry = py - fr[f + 7]!,
        rz = pz - fr[f + 11]!;
      h.tauKin[i] = zx * (ry * fz - rz * fy) + zy * (rz * fx - rx * fz) + zz * (rx * fy - ry * fx);
    }
  }
  return drivenFromKinematicInto(out, chain, h.tauKin);
}

/**
 * Gravity vector in the base frame for a mounting, m/s² (see the module notes for the conventions).
 * @example gravityInBase("ceiling") // [0, 0, 9.80665]
 */
export function gravityInBase(
  mounting: Mounting,
  angledTiltDeg = 45,
  gravityMPerS2 = STANDARD_GRAVITY_M_PER_S2,
): [number, number, number] {
  const tilt =
    mounting === "floor"
      ? 0
      : mounting === "ceiling"
        ? Math.PI
        : mounting === "wall"
          ? Math.PI / 2
          : degToRad(angledTiltDeg);
  const x = Math.sin(tilt),
    z = -Math.cos(tilt);
  // Exact zeros where the tilt is a multiple of 90° (cos(π/2) is 6e-17 in floating point).
  const clean = (v: number) => (Math.abs(v) < 1e-15 ? 0 : v);
  return [clean(x) * gravityMPerS2, 0, clean(z) * gravityMPerS2];
}

/**
 * Unit vector of gravity in the base frame for a mounting (gravityInBase with |g| = 1 and the default 45° tilt).
 * @example gravityDirectionInBase("wall") // [1, 0, 0]
 */
export function gravityDirectionInBase(mounting: Mounting): [number, number, number] {
  const g = gravityInBase(mounting, 45, 1);
  return [g[0], g[1], g[2]];
}
