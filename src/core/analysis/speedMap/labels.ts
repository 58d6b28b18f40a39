/**
 * Kind labels of the singularity loci: a det J sign change inside a grid square is named by the null motion of the
 * driven-joint Jacobian (J·G) at the singular pose itself, found on the square's edge where det J changes sign
 * (classifyNullVector: the same rule for every arm class). Decoupled six-joint arms whose axes 2 and 3 are parallel
 * refine an undecided "other" by the exact factors of det J11 (createDecoupledLabeller).
 */
import { determinantInPlace } from "../../math/linsolve";
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto, jacobianInto, wristCentreInto } from "../../kinematics/forward";
import { createSvdScratch, svdInto } from "../../math/svd";
import {
  classifyNullVector,
  decoupledWristColumns,
  jointRoles,
  type JointRoles,
  type SingularityKind,
} from "../../measures/singularity";
import { solAt, type MapRun } from "./state";
import { sphericalWristIk } from "../../kinematics/closedForm";
import { createOrthoRatesScratch, orthoDet } from "../../kinematics/orthoParallelRates";
import type { SheetData } from "./types";
import { taskMatrixInto } from "./taskMatrix";

/** Regula falsi (Illinois) steps of the search for det J = 0 along a square's edge. */
const CROSSING_STEPS = 60;
/**
 * Share of the null vector's squared norm below which a joint group does not take part, at a crossing found to
 * rounding. Measured on the demo arms: groups that do not take part hold shares of 1e-26 and below (rounding noise of
 * the SVD), groups that do 1e-5 and above (a shoulder crossing near the wrist locus, whose null motion is mostly the
 * wrist turning back a small turn of axis 1); 1e-12 (components of 1e-6) lies well between.
 */
const CROSSING_NEGLIGIBLE_SHARE = 1e-12;

/**
 * Null motion at the singular pose between two solutions qa, qb of one sheet whose task determinants have opposite
 * signs: det J is followed along the joint-space segment qa + t·(qb − qa) (continuous, so it has a zero there) to its
 * zero by the Illinois regula falsi (or taken at the corner of smaller |det J| when the signs recomputed here agree: a
 * corner on the singular pose); the right singular vectors of the scaled square task Jacobian there go into
 * `v` (m × m, row-major; the null motion in column m − 1). Corners can lie near a second, uncrossed singularity whose
 * σ_min is smaller than the crossing one's; at the crossing itself σ_min is the crossing's (det J ≈ 0 to rounding).
 */
export function createCrossingNullMotion(
  chain: Chain,
): ((qa: ArrayLike<number>, qb: ArrayLike<number>, v: Float64Array) => boolean) | null {
  const m = chain.drivenCount;
  if (m !== 4 && m !== 6) return null;
  const kin = createScratch(chain);
  const q = new Float64Array(m),
    j = new Float64Array(6 * m),
    task = new Float64Array(m * m),
    work = new Float64Array(m * m),
    sv = new Float64Array(m),
    svd = createSvdScratch(m, m);
  const lengthM = chain.characteristicLengthM;
  const taskAt = (qa: ArrayLike<number>, qb: ArrayLike<number>, t: number) => {
    for (let i = 0; i < m; i++) q[i] = qa[i]! + t * (qb[i]! - qa[i]!);
    const f = forwardInto(chain, q, kin);
    jacobianInto(j, chain, kin, f[3]!, f[7]!, f[11]!);
    taskMatrixInto(task, j, m, lengthM, f);
  };
  // The ortho-parallel class: det J from the decoupled form (kinematics/orthoParallelRates.ts), without forward
  // kinematics or a 6 × 6 elimination; divided by L³ it is the task matrix's determinant (its linear rows are J's
  // over L), so the search visits the same points.
  const opw = m === 6 ? (sphericalWristIk(chain)?.orthoParallel ?? null) : null;
  const rates = opw ? createOrthoRatesScratch() : null;
  const lengthCubed = lengthM * lengthM * lengthM;
  const detAt = (qa: ArrayLike<number>, qb: ArrayLike<number>, t: number) => {
    if (opw) {
      for (let i = 0; i < m; i++) q[i] = qa[i]! + t * (qb[i]! - qa[i]!);
      return orthoDet(opw, chain, q, rates!) / lengthCubed;
    }
    taskAt(qa, qb, t);
    work.set(task);
    return determinantInPlace(work, m);
  };
  return (qa, qb, v) => {
    let a = 0,
      b = 1,
      fa = detAt(qa, qb, 0),
      fb = detAt(qa, qb, 1);
    // A corner refined onto the singular pose (refine.ts) has det J at rounding level, of either sign: it is the
    // singular pose.
    if (!(fa * fb < 0)) {
      taskAt(qa, qb, Math.abs(fa) <= Math.abs(fb) ? 0 : 1);
      svdInto(sv, v, task, m, m, svd);
      return true;
    }
    let best = Math.abs(fa) < Math.abs(fb) ? a : b,
      fBest = Math.min(Math.abs(fa), Math.abs(fb));
    for (let it = 0; it < CROSSING_STEPS && Math.abs(b - a) > 1e-15; it++) {
      const c = (a * fb - b * fa) / (fb - fa);
      const fc = detAt(qa, qb, c);
      if (Math.abs(fc) < fBest) {
        best = c;
        fBest = Math.abs(fc);
      }
      if (fc === 0) break;
      if (fc * fb < 0) {
        a = b;
        fa = fb;
      } else fa /= 2;
      b = c;
      fb = fc;
    }
    taskAt(qa, qb, best);
    svdInto(sv, v, task, m, m, svd);
    return true;
  };
}

/**
 * Kind of the singularity whose null motion is column m − 1 of `v` (from createCrossingNullMotion): classifyNullVector
 * with the crossing's negligible share.
 */
export function crossingKind(v: ArrayLike<number>, m: number, roles: JointRoles): Exclude<SingularityKind, "none"> {
  return classifyNullVector(v, m, m - 1, roles, CROSSING_NEGLIGIBLE_SHARE);
}

/** The kindAt function of traceSingularityLoci for a map run (see SheetData.kindAt). */
export function locusLabeller(run: MapRun): SheetData["kindAt"] {
  const { chain, m, K } = run;
  const roles = jointRoles(chain);
  const decoupled = decoupledWristColumns(chain);
  const factors = decoupled ? createDecoupledLabeller(chain, decoupled) : null;
  const nullMotion = createCrossingNullMotion(chain);
  const v = new Float64Array(m * m);
  return (cellsAt, slotsAt, near): Exclude<SingularityKind, "none"> => {
    const idx = (c: number) => cellsAt[c]! * K + slotsAt[c]!;
    const joints = (c: number) => run.pool.subarray(solAt(run, idx(c)), solAt(run, idx(c)) + m);
    // An edge with a sign change, one beside the corner nearest to singular first.
    let kind: Exclude<SingularityKind, "none"> = "other";
    for (const [a, b] of [
      [near, (near + 1) % 4],
      [(near + 3) % 4, near],
      [(near + 1) % 4, (near + 2) % 4],
      [(near + 2) % 4, (near + 3) % 4],
    ] as const) {
      if (!(run.detVal[idx(a)]! * run.detVal[idx(b)]! < 0)) continue;
      if (nullMotion?.(joints(a), joints(b), v)) {
        kind = crossingKind(v, m, roles);
        break;
      }
    }
    return kind === "other" && factors ? (factors(joints) ?? kind) : kind;
  };
}

/**
 * Names a det J sign change inside a grid square of a decoupled arm by the exact factors of det J, or null when they
 * do not decide (CHECKS C4: det J = det J11 · det J22 with J taken at the wrist centre, J11 = linear rows × arm
 * columns, J22 = angular rows × wrist columns). The factor whose sign differs between the corners is the one crossing
 * zero: J22 alone → wrist. When the second and third arm axes are parallel (the usual elbow), det J11 = c₁·(c₂ × c₃)
 * factors further: c₂ and c₃ (the linear columns of those joints) are both perpendicular to the common axis direction
 * z₂, so c₂ × c₃ = e·z₂ and det J11 = (c₁·z₂)·e. The elbow factor e vanishes when c₂ ∥ c₃ (wrist centre in the plane
 * of axes 2 and 3), the shoulder factor c₁·z₂ when joint 1 moves the wrist centre along z₂ only or not at all (on
 * axis 1, or on the cylinder of a lateral shoulder offset, where axis 1 and the pair move together: the null-motion
 * rule calls that "other", and this names it shoulder). Used only where the null motion does not decide.
 * @see Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, §4.9 (det J11 of an elbow manipulator as a
 *   product of an elbow term and a shoulder term) [from memory]
 */
function createDecoupledLabeller(
  chain: Chain,
  cols: { arm: number[]; wrist: number[] },
): (cornerJoints: (corner: number) => Float64Array) => "wrist" | "shoulder" | "elbow" | null {
  const kin = createScratch(chain);
  const j = new Float64Array(36),
    w = new Float64Array(3),
    block = new Float64Array(9);
  const det11 = [0, 0, 0, 0],
    det22 = [0, 0, 0, 0],
    shoulderF = [0, 0, 0, 0],
    elbowF = [0, 0, 0, 0];
  let parallel23: boolean | null = null;
  const det3 = (b: Float64Array) =>
    b[0]! * (b[4]! * b[8]! - b[5]! * b[7]!) -
    b[1]! * (b[3]! * b[8]! - b[5]! * b[6]!) +
    b[2]! * (b[3]! * b[7]! - b[4]! * b[6]!);
  const fill = (rowOffset: number, columns: number[], scale: number) => {
    for (let r = 0; r < 3; r++)
      for (let c = 0; c < 3; c++) block[r * 3 + c] = j[(rowOffset + r) * 6 + columns[c]!]! * scale;
  };
  return (cornerJoints) => {
    for (let c = 0; c < 4; c++) {
      forwardInto(chain, cornerJoints(c), kin);
      wristCentreInto(w, chain, kin);
      jacobianInto(j, chain, kin, w[0]!, w[1]!, w[2]!);
      fill(3, cols.wrist, 1);
      det22[c] = det3(block);
      fill(0, cols.arm, 1 / chain.characteristicLengthM);
      det11[c] = det3(block);
      // Factors of det J11 (columns of `block`: c₁, c₂, c₃ scaled; z₂ from the angular rows of the second arm column).
      const a2 = cols.arm[1]!,
        a3 = cols.arm[2]!;
      const zx = j[18 + a2]!,
        zy = j[24 + a2]!,
        zz = j[30 + a2]!;
      if (parallel23 === null) {
        const ux = j[18 + a3]!,
          uy = j[24 + a3]!,
          uz = j[30 + a3]!;
        parallel23 = Math.hypot(zy * uz - zz * uy, zz * ux - zx * uz, zx * uy - zy * ux) < 1e-9;
      }
      shoulderF[c] = block[0]! * zx + block[3]! * zy + block[6]! * zz;
      const ex = block[4]! * block[8]! - block[7]! * block[5]!,
        ey = block[7]! * block[2]! - block[1]! * block[8]!,
        ez = block[1]! * block[5]! - block[4]! * block[2]!;
      elbowF[c] = ex * zx + ey * zy + ez * zz;
    }
    const changes = (d: number[]) => d.some((x) => x > 0) && d.some((x) => x < 0);
    const c11 = changes(det11),
      c22 = changes(det22);
    if (c22 && !c11) return "wrist";
    if (!c11 || c22 || !parallel23) return null;
    const s = changes(shoulderF),
      e = changes(elbowF);
    return s && !e ? "shoulder" : e && !s ? "elbow" : null;
  };
}
