/**
 * Invented test arms of the capability tests (round numbers, no real product), standard DH (Aᵢ = Rz(θ)·Tz(d)·Tx(a)·Rx(α),
 * joint variable added to θ; Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, ch. 3), flange = last DH
 * frame unless a flange is given.
 *
 * The shell arm: shoulder on axis 1 at the base origin, upper arm L1 = 0.5 m, forearm L2 = 0.4 m (elbow axis parallel
 * to the shoulder axis), spherical wrist, flange d = 0.1 m beyond the wrist centre along axis 6.
 *
 *   i | aᵢ (m) | αᵢ   | dᵢ (m) | range
 *   1 | 0      | 90°  | 0      | ±180°
 *   2 | 0.5    | 0    | 0      | ±180°
 *   3 | 0      | 90°  | 0      | ±180°
 *   4 | 0      | −90° | 0.4    | ±360°
 *   5 | 0      | 90°  | 0      | ±360°
 *   6 | 0      | 0    | 0.1    | ±360°
 *
 * With joints 1–3 over a full turn, the wrist centre (origin of DH frame 4) reaches exactly the spherical shell
 * L1 − L2 ≤ |c| ≤ L1 + L2, i.e. 0.1 m ≤ |c| ≤ 0.9 m (law of cosines over the elbow angle); the unlimited wrist
 * turns the flange into every orientation about it, so direction n is reached at p exactly when
 * 0.1 ≤ |p − 0.1·n| ≤ 0.9.
 */
import type { ArmKinematicsInput, JointInput } from "../../../../src/core";
import type { DhRowSi } from "../../../helpers/testArms";

const DEG = Math.PI / 180;

export interface DhArm {
  readonly input: ArmKinematicsInput;
  readonly rows: readonly DhRowSi[];
  readonly rangesDeg: readonly (readonly [number, number])[];
}

/** A DH arm from rows [aMm, αDeg, dMm] and ranges, in file units, with the same rows in SI for mathjs. */
export function dhArm(
  rows: readonly (readonly [number, number, number])[],
  rangesDeg: readonly (readonly [number, number])[],
  flange: ArmKinematicsInput["flange"] = { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
): DhArm {
  const joints: JointInput[] = rows.map(([a, alpha, d], i) => ({
    name: `j${i + 1}`,
    kind: "revolute",
    dh: { aMm: a, alphaDeg: alpha, dMm: d, thetaDeg: 0 },
    rangeDeg: [...rangesDeg[i]!],
    maxSpeedDegPerS: 100,
  }));
  return {
    input: { convention: "dh", joints, flange },
    rows: rows.map(([a, alpha, d]) => ({ a: a / 1000, alpha: alpha * DEG, d: d / 1000, theta: 0 })),
    rangesDeg,
  };
}

export const SHELL = { l1M: 0.5, l2M: 0.4, dM: 0.1 } as const;

export function shellArm(flange?: ArmKinematicsInput["flange"]): DhArm {
  return dhArm(
    [
      [0, 90, 0],
      [500, 0, 0],
      [0, 90, 0],
      [0, -90, 400],
      [0, 90, 0],
      [0, 0, 100],
    ],
    [
      [-180, 180],
      [-180, 180],
      [-180, 180],
      [-360, 360],
      [-360, 360],
      [-360, 360],
    ],
    flange,
  );
}

/** The shell arm's flange reach in the side view: the disc |p| ≤ L1 + L2 + d = 1.0 m (a 360-gon just outside it). */
export function discEnvelope(radiusMm: number) {
  const ring = Array.from({ length: 361 }, (_, i) => {
    const t = (i % 360) * DEG;
    return [(radiusMm + 0.5) * Math.cos(t), (radiusMm + 0.5) * Math.sin(t)] as [number, number];
  });
  return { side: [{ outer: ring, holes: [] }], maxReachMm: radiusMm, minHeightMm: -radiusMm, maxHeightMm: radiusMm };
}
