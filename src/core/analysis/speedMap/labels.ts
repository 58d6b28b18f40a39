/**
 * Kind labels of the singularity loci: a det J sign change inside a grid square is named by the null motion of the
 * Jacobian at its corners (decoupled six-joint arms by the factors of det J, others by the σ_min vector).
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto, jacobianInto, wristCentreInto } from "../../kinematics/forward";
import { createSvdScratch, svdInto } from "../../math/svd";
import {
  classifyNullVector,
  createSingularityScratch,
  decoupledWristColumns,
  jointRoles,
  scaledSingularValues,
  type SingularityKind,
} from "../../measures/singularity";
import { solAt, type MapRun } from "./state";
import type { SheetData } from "./types";

/** The kindAt function of traceSingularityLoci for a map run (see SheetData.kindAt). */
export function locusLabeller(run: MapRun): SheetData["kindAt"] {
  const { chain, m, K } = run;
  const j = new Float64Array(6 * m);
  const sg = createSingularityScratch(m);
  const roles = jointRoles(chain);
  const decoupled = decoupledWristColumns(chain);
  const labeller = decoupled ? createDecoupledLabeller(chain, decoupled) : null;
  return (cellsAt, slotsAt, near): Exclude<SingularityKind, "none"> => {
    if (labeller)
      return labeller((c) =>
        run.pool.subarray(solAt(run, cellsAt[c]! * K + slotsAt[c]!), solAt(run, cellsAt[c]! * K + slotsAt[c]!) + m),
      );
    const off = solAt(run, cellsAt[near]! * K + slotsAt[near]!);
    const t = forwardInto(chain, run.pool.subarray(off, off + m), run.kin);
    jacobianInto(j, chain, run.kin, t[3]!, t[7]!, t[11]!);
    scaledSingularValues(j, m, chain.characteristicLengthM, sg);
    return classifyNullVector(sg.v, m, Math.min(6, m) - 1, roles);
  };
}

/**
 * Labels a det J sign change inside a grid square for a decoupled arm (CHECKS C4: det J = det J11 · det J22 with J
 * taken at the wrist centre, J11 = linear rows × arm columns, J22 = angular rows × wrist columns). The factor whose
 * sign differs between the corners is the one crossing zero: J22 → wrist (axes 4 and 6 in line); J11 → shoulder
 * when the null vector of J11 at the corner nearest to singular is mostly joint 1 (the wrist centre on axis 1),
 * elbow otherwise (joints 2 and 3). Labelling by the σ_min vector of the full J instead mislabels crossings near a
 * second, uncrossed singularity (that σ belongs to the other one) and shoulder crossings whose wrist compensation
 * is large.
 * When the second and third arm axes are parallel (the usual elbow), det J11 = c₁·(c₂ × c₃) factors exactly: c₂ and
 * c₃ (the linear columns of those joints) are both perpendicular to the common axis direction z₂, so c₂ × c₃ = e·z₂
 * and det J11 = (c₁·z₂)·e. The elbow factor e vanishes when c₂ ∥ c₃ (wrist centre in the plane of axes 2 and 3),
 * the shoulder factor c₁·z₂ when joint 1 moves the wrist centre along z₂ only or not at all (on axis 1, or on the
 * cylinder of the lateral shoulder offset). The factor that changes sign across the square names the crossing;
 * this stays right where both sets come close (an arm stretched up along axis 1), where the smallest singular
 * vector of J11 mixes the two. Otherwise, and when both or neither factor changes sign, the null vector decides.
 * @see Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, §4.9 (det J11 of an elbow manipulator as a
 *   product of an elbow term and a shoulder term) [from memory]
 */
function createDecoupledLabeller(
  chain: Chain,
  cols: { arm: number[]; wrist: number[] },
): (cornerJoints: (corner: number) => Float64Array) => "wrist" | "shoulder" | "elbow" {
  const kin = createScratch(chain);
  const j = new Float64Array(36),
    w = new Float64Array(3),
    block = new Float64Array(9);
  const sv = new Float64Array(3),
    v = new Float64Array(9),
    svd = createSvdScratch(3, 3);
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
    let near = 0;
    for (let c = 0; c < 4; c++) {
      forwardInto(chain, cornerJoints(c), kin);
      wristCentreInto(w, chain, kin);
      jacobianInto(j, chain, kin, w[0]!, w[1]!, w[2]!);
      fill(3, cols.wrist, 1);
      det22[c] = det3(block);
      fill(0, cols.arm, 1 / chain.characteristicLengthM);
      det11[c] = det3(block);
      if (Math.abs(det11[c]!) < Math.abs(det11[near]!)) near = c;
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
    if (changes(det22) || !changes(det11)) return "wrist";
    if (parallel23) {
      const s = changes(shoulderF),
        e = changes(elbowF);
      if (s && !e) return "shoulder";
      if (e && !s) return "elbow";
    }
    forwardInto(chain, cornerJoints(near), kin);
    wristCentreInto(w, chain, kin);
    jacobianInto(j, chain, kin, w[0]!, w[1]!, w[2]!);
    fill(0, cols.arm, 1 / chain.characteristicLengthM);
    svdInto(sv, v, block, 3, 3, svd);
    // Null vector of J11 = column 2 of V; share of joint 1 (the first arm column).
    const a = v[2]! * v[2]!;
    return a > 0.5 ? "shoulder" : "elbow";
  };
}
