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
import { createSvdScratch, svdInto, type SvdScratch } from "../math/svd";

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
  return { scaled: new Float64Array(6 * m), sv: new Float64Array(Math.min(6, m)), v: new Float64Array(m * m), svd: createSvdScratch(6, m) };
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

/** Kind of singularity from the null vector in column `col` of the m × m matrix v (row-major). */
export function classifyNullVector(v: ArrayLike<number>, m: number, col: number, roles: JointRoles): Exclude<SingularityKind, "none"> {
  let total = 0, axis1 = 0, arm = 0, wrist = 0;
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

/** Allocating convenience over scaledSingularValues + classifyNullVector. */
export function singularityReport(chain: Chain, j: ArrayLike<number>, threshold = SINGULAR_INVERSE_CONDITION): SingularityReport {
  const m = chain.drivenCount;
  const s = createSingularityScratch(m);
  const lengthM = chain.characteristicLengthM;
  const inverseCondition = scaledSingularValues(j, m, lengthM, s);
  const col = Math.min(6, m) - 1;
  const nullVector = Array.from({ length: m }, (_, i) => s.v[i * m + col]!);
  let big = 0;
  for (const x of nullVector) if (Math.abs(x) > Math.abs(big)) big = x;
  const sign = big < 0 ? -1 : 1;
  return {
    kind: inverseCondition < threshold ? classifyNullVector(s.v, m, col, jointRoles(chain)) : "none",
    inverseCondition,
    sigmaMinScaled: s.sv[col]!,
    nullVector: nullVector.map((x) => x * sign + 0),
    lengthScaleM: lengthM,
  };
}
