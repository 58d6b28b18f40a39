/**
 * Singularity proximity and kind at one pose.
 *
 * Proximity: singular values of the Jacobian with its linear rows divided by a characteristic length L (so both row
 * blocks are per radian and comparable); inverseCondition = σ_min / σ_max of that scaled Jacobian (1 isotropic,
 * 0 singular). Kind: from the null motion, the right singular vector of σ_min of the driven-joint Jacobian J·G (the
 * joint motion that barely moves the tool), by the share of its squared norm on three joint groups (jointRoles):
 * axis 1 (driven column 1), the shoulder/elbow pair (driven columns 2–3) and the wrist or tool-roll joints (the
 * rest), the same rule for every arm class:
 * - wrist:    the wrist joints only (axes 4 and 6 in line, turning against each other);
 * - shoulder: axis 1 with wrist/tool-roll joints, the pair not taking part (flange or wrist centre on axis 1: joint 1
 *             spins, the wrist or tool roll turns it back);
 * - elbow:    the pair takes part, axis 1 not (upper arm and forearm folding or stretching; the wrist may compensate);
 * - other:    anything else (axis 1 and the pair together, or no group clearly).
 * @see Salisbury & Craig, IJRR 1(1), 1982 (condition number) [from memory];
 *   Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, §4.9 (decoupling of singularities) [from memory]
 */
import type { Chain } from "../kinematics/chain";
import { createSvdScratch, singularValuesInto, svdInto, type SvdScratch } from "../math/svd";

export type SingularityKind = "none" | "wrist" | "shoulder" | "elbow" | "other";

/** Below this inverse condition (scaled Jacobian) a pose counts as singular for labelling. */
export const SINGULAR_INVERSE_CONDITION = 0.01;
/** Share of the null vector's squared norm that makes a joint group "take part". */
const TAKES_PART = 0.15;

/**
 * Driven-joint roles used to name a singularity. Indices are driven-joint columns: axis 1 is column 0, `arm` the
 * shoulder/elbow pair (columns 1 and 2, the second and third driven joints), `wrist` every later column (the wrist of
 * a six-axis arm, the tool roll of a palletizer or SCARA, the forearm and wrist joints of a seven-axis arm) together
 * with any declared wrist axis.
 */
export interface JointRoles {
  readonly axis1: number;
  readonly arm: readonly number[];
  readonly wrist: readonly number[];
}

export function jointRoles(chain: Chain): JointRoles {
  const m = chain.drivenCount;
  const columnOf = new Map(Array.from(chain.drivenJoint, (k, c) => [k, c] as const));
  const declared = new Set<number>();
  if (chain.wrist)
    for (const k of chain.wrist.axes) {
      const c = columnOf.get(k);
      if (c !== undefined && c > 0) declared.add(c);
    }
  const arm = [1, 2].filter((c) => c < m && !declared.has(c));
  const wrist: number[] = [];
  for (let c = 1; c < m; c++) if (!arm.includes(c)) wrist.push(c);
  return { axis1: 0, arm, wrist };
}

export interface SingularityScratch {
  readonly scaled: Float64Array;
  readonly sv: Float64Array;
  readonly v: Float64Array;
  readonly svd: SvdScratch;
}

export function createSingularityScratch(m: number): SingularityScratch {
  return {
    scaled: new Float64Array(6 * m),
    sv: new Float64Array(Math.min(6, m)),
    v: new Float64Array(m * m),
    svd: createSvdScratch(6, m),
  };
}

/**
 * Scaled singular values of the 6 × m SI Jacobian `j` (linear rows divided by lengthM) into s.sv (descending) and
 * the right singular vectors into s.v. Returns the inverse condition σ_min/σ_max (0 when σ_max is 0).
 */
export function scaledSingularValues(j: ArrayLike<number>, m: number, lengthM: number, s: SingularityScratch): number {
  const scaled = s.scaled;
  for (let i = 0; i < 3 * m; i++) scaled[i] = j[i]! / lengthM;
  for (let i = 3 * m; i < 6 * m; i++) scaled[i] = j[i]!;
  svdInto(s.sv, s.v, scaled, 6, m, s.svd);
  const k = Math.min(6, m);
  const max = s.sv[0]!;
  return max > 0 ? s.sv[k - 1]! / max : 0;
}

/**
 * Inverse condition σ_min/σ_max of the scaled Jacobian only (singular values into s.sv, no singular vectors):
 * the cheaper path for maps and kernels that do not name the singularity.
 */
export function scaledInverseCondition(
  j: ArrayLike<number>,
  m: number,
  lengthM: number,
  s: SingularityScratch,
): number {
  const scaled = s.scaled;
  for (let i = 0; i < 3 * m; i++) scaled[i] = j[i]! / lengthM;
  for (let i = 3 * m; i < 6 * m; i++) scaled[i] = j[i]!;
  singularValuesInto(s.sv, scaled, 6, m, s.svd);
  const k = Math.min(6, m);
  const max = s.sv[0]!;
  return max > 0 ? s.sv[k - 1]! / max : 0;
}

/**
 * Kind of singularity from the null vector in column `col` of the m × m matrix v (row-major), by the shares of its
 * squared norm on axis 1 (a), the shoulder/elbow pair (p) and the wrist or tool-roll joints (module comment). A group
 * whose share is below `negligibleShare` does not take part: wrist when a + p is negligible (the wrist joints only);
 * shoulder when the pair does not take part but axis 1 does (axis 1 with the wrist or tool roll); elbow when the pair
 * takes part and holds more than axis 1 (a stretched planar 2R or SCARA turns axis 1 too, less than the elbow);
 * other otherwise (axis 1 leading the pair, as on the cylinder of a lateral shoulder offset).
 * `negligibleShare` defaults to TAKES_PART for a pose merely near a singularity, whose σ_min vector mixes in the
 * other groups to first order in the distance; at a pose on the singularity (det J = 0 to rounding) the shares of
 * the groups that do not take part are rounding noise, so a far smaller bound separates the kinds (labels.ts).
 * @example a palletizer with its flange on axis 1: null motion (J1, J2, J3, J4) ∝ (1, 0, 0, −1) → "shoulder"
 */
export function classifyNullVector(
  v: ArrayLike<number>,
  m: number,
  col: number,
  roles: JointRoles,
  negligibleShare = TAKES_PART,
): Exclude<SingularityKind, "none"> {
  let total = 0,
    axis1 = 0,
    arm = 0;
  for (let i = 0; i < m; i++) {
    const w = v[i * m + col]! * v[i * m + col]!;
    total += w;
    if (i === roles.axis1) axis1 += w;
    else if (roles.arm.includes(i)) arm += w;
  }
  if (!(total > 0)) return "other";
  const a = axis1 / total,
    p = arm / total;
  if (roles.wrist.length > 0 && a + p < negligibleShare) return "wrist";
  if (p < negligibleShare) return a >= negligibleShare ? "shoulder" : "other";
  return p > a ? "elbow" : "other";
}

export interface SingularityReport {
  readonly kind: SingularityKind;
  readonly inverseCondition: number;
  /** σ_min of the scaled Jacobian (1/rad). */
  readonly sigmaMinScaled: number;
  /** Unit joint-rate vector (driven order) that moves the tool least; largest component positive. */
  readonly nullVector: number[];
  readonly lengthScaleM: number;
}

/**
 * Allocating convenience over scaledSingularValues + the classification. Pass `wcpMinusTcpM` (the wrist centre
 * minus the Jacobian's reference point, base frame, m) so a decoupled six-joint arm is classified by its blocks.
 */
export function singularityReport(
  chain: Chain,
  j: ArrayLike<number>,
  threshold = SINGULAR_INVERSE_CONDITION,
  wcpMinusTcpM?: ArrayLike<number>,
): SingularityReport {
  const m = chain.drivenCount;
  const s = createSingularityScratch(m);
  const lengthM = chain.characteristicLengthM;
  const inverseCondition = scaledSingularValues(j, m, lengthM, s);
  const col = Math.min(6, m) - 1;
  const nullVector = Array.from({ length: m }, (_, i) => s.v[i * m + col]!);
  let big = 0;
  for (const x of nullVector) if (Math.abs(x) > Math.abs(big)) big = x;
  const sign = big < 0 ? -1 : 1;
  let kind: SingularityKind = "none";
  if (inverseCondition < threshold) {
    const cols = decoupledWristColumns(chain);
    const d = cols ? (wcpMinusTcpM ?? wristOffsetFromJacobian(j, cols.wrist)) : null;
    if (cols && d) {
      // Reference point moved to the wrist centre: v_w = v_t + ω × d.
      const jw = Float64Array.from({ length: 36 }, (_, i) => j[i]!);
      const dx = d[0]!,
        dy = d[1]!,
        dz = d[2]!;
      for (let c = 0; c < 6; c++) {
        const wx = j[18 + c]!,
          wy = j[24 + c]!,
          wz = j[30 + c]!;
        jw[c] = j[c]! + (wy * dz - wz * dy);
        jw[6 + c] = j[6 + c]! + (wz * dx - wx * dz);
        jw[12 + c] = j[12 + c]! + (wx * dy - wy * dx);
      }
      kind = classifyDecoupled(jw, lengthM, cols);
    } else {
      kind = classifyNullVector(s.v, m, col, jointRoles(chain));
    }
  }
  return {
    kind,
    inverseCondition,
    sigmaMinScaled: s.sv[col]!,
    nullVector: nullVector.map((x) => x * sign + 0),
    lengthScaleM: lengthM,
  };
}

/**
 * Driven columns (arm, wrist) of a six-joint arm whose Jacobian at the wrist centre is block lower-triangular
 * [[J11, 0], [J21, J22]]: a spherical wrist centre, three wrist columns, and no arm joint driven by a wrist column.
 * Null otherwise.
 */
export function decoupledWristColumns(chain: Chain): { arm: number[]; wrist: number[] } | null {
  const m = chain.drivenCount,
    w = chain.wrist;
  if (m !== 6 || !w || w.basis !== "spherical" || w.axes.length !== 3) return null;
  const wrist: number[] = [];
  for (const k of w.axes) {
    const c = chain.drivenJoint.indexOf(k);
    if (c < 0) return null;
    wrist.push(c);
  }
  const arm = [0, 1, 2, 3, 4, 5].filter((c) => !wrist.includes(c));
  for (let i = 0; i < chain.jointCount; i++) {
    if (w.axes.includes(i)) continue;
    for (const c of wrist) if (chain.couplingGain[i * m + c] !== 0) return null;
  }
  return { arm, wrist };
}

/**
 * Kind of a near-singular pose of a decoupled six-joint arm (spherical wrist), from the blocks of J taken at the
 * wrist centre (det J = det J11 · det J22, CHECKS C4): the block closer to singular names it: J22 → wrist; J11 →
 * shoulder when its null vector is mostly joint 1 (wrist centre on axis 1), elbow otherwise.
 * @param jAtWcp 6 × 6 Jacobian with the wrist centre as reference point
 */
export function classifyDecoupled(
  jAtWcp: ArrayLike<number>,
  lengthM: number,
  cols: { arm: number[]; wrist: number[] },
): "wrist" | "shoulder" | "elbow" {
  const b11 = new Float64Array(9),
    b22 = new Float64Array(9);
  for (let r = 0; r < 3; r++) {
    for (let c = 0; c < 3; c++) {
      b11[r * 3 + c] = jAtWcp[r * 6 + cols.arm[c]!]! / lengthM;
      b22[r * 3 + c] = jAtWcp[(r + 3) * 6 + cols.wrist[c]!]!;
    }
  }
  const sv = new Float64Array(3),
    v = new Float64Array(9),
    svd = createSvdScratch(3, 3);
  svdInto(sv, v, b22, 3, 3, svd);
  const wristMeasure = sv[2]! / (sv[0]! || 1);
  svdInto(sv, v, b11, 3, 3, svd);
  const armMeasure = sv[2]! / (sv[0]! || 1);
  if (wristMeasure <= armMeasure) return "wrist";
  return v[2]! * v[2]! > 0.5 ? "shoulder" : "elbow";
}

/**
 * The wrist centre minus the Jacobian's reference point, from the wrist columns of a 6 × 6 Jacobian alone: each
 * wrist column's linear part is zₖ × (p − w) = −zₖ × d, three linear equations per column, solved by least squares
 * (two non-parallel wrist axes suffice, so it holds at the wrist singularity too). Null when the axes are parallel.
 */
export function wristOffsetFromJacobian(j: ArrayLike<number>, wrist: readonly number[]): number[] | null {
  // −[z]× d = v  ⇔  [z]× d = −v; accumulate AᵀA and Aᵀb.
  const ata = new Float64Array(9),
    atb = new Float64Array(3);
  for (const c of wrist) {
    const zx = j[18 + c]!,
      zy = j[24 + c]!,
      zz = j[30 + c]!;
    const a = [0, -zz, zy, zz, 0, -zx, -zy, zx, 0];
    const b = [-j[c]!, -j[6 + c]!, -j[12 + c]!];
    for (let r = 0; r < 3; r++) {
      for (let k = 0; k < 3; k++) {
        atb[k] = atb[k]! + a[r * 3 + k]! * b[r]!;
        for (let l = 0; l < 3; l++) ata[k * 3 + l] = ata[k * 3 + l]! + a[r * 3 + k]! * a[r * 3 + l]!;
      }
    }
  }
  const det =
    ata[0]! * (ata[4]! * ata[8]! - ata[5]! * ata[7]!) -
    ata[1]! * (ata[3]! * ata[8]! - ata[5]! * ata[6]!) +
    ata[2]! * (ata[3]! * ata[7]! - ata[4]! * ata[6]!);
  if (!(Math.abs(det) > 1e-12)) return null;
  const out = [0, 0, 0];
  for (let c = 0; c < 3; c++) {
    const m = Float64Array.from(ata);
    for (let r = 0; r < 3; r++) m[r * 3 + c] = atb[r]!;
    out[c] =
      (m[0]! * (m[4]! * m[8]! - m[5]! * m[7]!) -
        m[1]! * (m[3]! * m[8]! - m[5]! * m[6]!) +
        m[2]! * (m[3]! * m[7]! - m[4]! * m[6]!)) /
      det;
  }
  return out;
}
