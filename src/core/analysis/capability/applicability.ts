/**
 * When an arm gets a capability map, and how the roll about the tool axis is left free.
 *
 * Criterion: the flange position and the tool axis (flange z) together have five degrees of freedom, so a point can
 * be reached from a set of tool directions of positive area: the 5 × m matrix [J_v / L; x_fᵀ·J_ω; y_fᵀ·J_ω] (linear
 * rows over the length scale L, then the angular rates about the two flange axes across the tool axis) has rank 5
 * at most of a few seeded random poses within the limits. A SCARA, a palletizer and an XYZ gantry with a turning
 * tool keep their tool axis vertical (rank ≤ 4) and get a sentence instead of a map of zeros.
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto, jacobianInto } from "../../kinematics/forward";
import { createSvdScratch, singularValuesInto } from "../../math/svd";

/** Random poses tested, and the rank-5 threshold on σ₅/σ₁ of the scaled matrix. */
const POSES = 7;
const RANK_RATIO = 1e-6;

/**
 * Whether the flange position and tool axis have five independent motions (see the module doc).
 * @example a SCARA (all axes vertical): false; a six-axis arm with a spherical wrist: true
 */
export function toolAxisTurns(chain: Chain, random: () => number): boolean {
  const m = chain.drivenCount;
  if (m < 5) return false;
  const kin = createScratch(chain);
  const q = new Float64Array(m),
    jac = new Float64Array(6 * m),
    a = new Float64Array(5 * m),
    sv = new Float64Array(5);
  const svd = createSvdScratch(5, m);
  const L = chain.characteristicLengthM || 1;
  let full = 0;
  for (let t = 0; t < POSES; t++) {
    for (let i = 0; i < m; i++) {
      const lo = Math.max(chain.lowerSi[i]!, -Math.PI),
        hi = Math.min(chain.upperSi[i]!, Math.PI);
      q[i] = lo + (0.1 + 0.8 * random()) * (hi - lo);
    }
    const f = forwardInto(chain, q, kin);
    jacobianInto(jac, chain, kin, f[3]!, f[7]!, f[11]!);
    for (let j = 0; j < m; j++) {
      for (let r = 0; r < 3; r++) a[r * m + j] = jac[r * m + j]! / L;
      const wx = jac[3 * m + j]!,
        wy = jac[4 * m + j]!,
        wz = jac[5 * m + j]!;
      // Flange x and y axes: columns 0 and 1 of the rotation block.
      a[3 * m + j] = f[0]! * wx + f[4]! * wy + f[8]! * wz;
      a[4 * m + j] = f[1]! * wx + f[5]! * wy + f[9]! * wz;
    }
    singularValuesInto(sv, a, 5, m, svd);
    if (sv[4]! > RANK_RATIO * sv[0]!) full++;
  }
  return full * 2 > POSES;
}

/**
 * The driven joint that turns the flange about its own axis and nothing else, or −1: the last kinematic joint is
 * revolute, moved by one driven joint with gain ±1 that moves no other joint, and its axis is the flange z axis
 * through the flange centre (to 1e-9 m and 1e-9 rad). With the roll free, such a joint's range never decides
 * whether a direction is reached: any roll can be added to it.
 */
export function rollJoint(chain: Chain): number {
  const n = chain.jointCount,
    m = chain.drivenCount,
    g = chain.couplingGain;
  const last = n - 1;
  if (chain.isPrismatic[last]) return -1;
  let driven = -1;
  for (let j = 0; j < m; j++) {
    const gain = g[last * m + j]!;
    if (gain === 0) continue;
    if (driven >= 0 || Math.abs(Math.abs(gain) - 1) > 1e-12) return -1;
    driven = j;
  }
  if (driven < 0) return -1;
  for (let i = 0; i < n; i++) if (i !== last && g[i * m + driven] !== 0) return -1;
  // Axis and flange at the zero pose (both are fixed in the frame the last joint acts in).
  const kin = createScratch(chain);
  const f = forwardInto(chain, new Float64Array(m), kin);
  const fr = kin.motionFrames,
    o = 16 * last,
    ax = chain.axisLocal;
  const zx = fr[o]! * ax[3 * last]! + fr[o + 1]! * ax[3 * last + 1]! + fr[o + 2]! * ax[3 * last + 2]!;
  const zy = fr[o + 4]! * ax[3 * last]! + fr[o + 5]! * ax[3 * last + 1]! + fr[o + 6]! * ax[3 * last + 2]!;
  const zz = fr[o + 8]! * ax[3 * last]! + fr[o + 9]! * ax[3 * last + 1]! + fr[o + 10]! * ax[3 * last + 2]!;
  const cx = zy * f[10]! - zz * f[6]!,
    cy = zz * f[2]! - zx * f[10]!,
    cz = zx * f[6]! - zy * f[2]!;
  if (Math.hypot(cx, cy, cz) > 1e-9) return -1;
  // Distance of the flange centre from the axis line.
  const dx = f[3]! - fr[o + 3]!,
    dy = f[7]! - fr[o + 7]!,
    dz = f[11]! - fr[o + 11]!;
  const along = dx * zx + dy * zy + dz * zz;
  if (Math.hypot(dx - along * zx, dy - along * zy, dz - along * zz) > 1e-9) return -1;
  return driven;
}

/** The chain with driven joint `j`'s range set to one whole turn (−π, π]: any value is then taken into it. */
export function withFreeJoint(chain: Chain, j: number): Chain {
  const lowerSi = Float64Array.from(chain.lowerSi),
    upperSi = Float64Array.from(chain.upperSi);
  lowerSi[j] = -Math.PI;
  upperSi[j] = Math.PI;
  return { ...chain, lowerSi, upperSi };
}
