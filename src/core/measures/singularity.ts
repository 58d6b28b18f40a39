/**
 * Singularity proximity and kind at one pose.
 *
 * Proximity: singular values of the Jacobian with its linear rows divided by a characteristic length L (so both row
 * blocks are per radian and comparable); inverseCondition = σ_min / σ_max of that scaled Jacobian (1 isotropic,
 * 0 singular). Kind: from the right singular vector of σ_min (the joint motion that barely moves the tool):
 * - elbow:    the arm joints after axis 1 take part (upper arm and forearm folding or stretching);
 * - shoulder: axis 1 takes part without them (wrist centre on axis 1: joint 1 spins, the wrist compensates);
 * - wrist:    only the wrist joints take part (axes 4 and 6 in line, turning against each other);
 * - other:    anything else.
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

/** Driven-joint roles used to name a singularity. Indices are driven-joint columns. */
export interface JointRoles {
  readonly axis1: number;
  readonly arm: readonly number[];
  readonly wrist: readonly number[];
}

export function jointRoles(chain: Chain): JointRoles {
  const m = chain.drivenCount;
  const columnOf = new Map(Array.from(chain.drivenJoint, (k, c) => [k, c] as const));
  let wrist: number[] = [];
  if (chain.wrist) wrist = chain.wrist.axes.map((k) => columnOf.get(k)).filter((c): c is number => c !== undefined);
  if (wrist.length === 0 && m >= 6) {
    const revolute = Array.from(chain.drivenJoint, (k, c) => (chain.isPrismatic[k] ? -1 : c)).filter((c) => c >= 0);
    wrist = revolute.slice(-3);
  }
  const arm: number[] = [];
  for (let c = 1; c < m; c++) if (!wrist.includes(c)) arm.push(c);
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

/** Kind of singularity from the null vector in column `col` of the m × m matrix v (row-major). */
export function classifyNullVector(
  v: ArrayLike<number>,
  m: number,
  col: number,
  roles: JointRoles,
): Exclude<SingularityKind, "none"> {
  let total = 0,
    axis1 = 0,
    arm = 0,
    wrist = 0;
  for (let i = 0; i < m; i++) {
    const w = v[i * m + col]! * v[i * m + col]!;
    total += w;
    if (i === roles.axis1) axis1 += w;
    else if (roles.arm.includes(i)) arm += w;
    else if (roles.wrist.includes(i)) wrist += w;
  }
  if (!(total > 0)) return "other";
  if (arm / total >= TAKES_PART) return "elbow";
  if (axis1 / total >= TAKES_PART) return "shoulder";
  if (roles.wrist.length > 0 && wrist / total >= 1 - TAKES_PART) return "wrist";
  return "other";
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
