/**
 * Shared fixtures of the statics and payload tests: an invented 2R arm in a vertical plane, a payload input, the
 * ml-matrix reference path of the link-mass holding torques, and a check for non-finite numbers.
 */
import { Matrix } from "ml-matrix";
import type { ArmKinematicsInput, Chain } from "../../src/core";
import { createScratch, forwardInto, jacobianInto, linkFrameInto } from "../../src/core";
import type { WristRating, PayloadInput } from "../../src/core/analysis/payload";
import type { LinkMass, Mounting } from "../../src/core/kinematics/statics";

/**
 * 2R in a vertical plane: both axes along base −y (horizontal), so positive q raises the arm:
 * p = (a1 c1 + a2 c12, 0, a1 s1 + a2 s12). Frames convention; link frame of j2 = its motion frame at the elbow.
 */
export function vertical2r(
  a1M: number,
  a2M: number,
  limitsDeg: readonly [number, number] = [-180, 180],
): ArmKinematicsInput {
  return {
    convention: "frames",
    joints: [
      {
        name: "j1",
        kind: "revolute",
        origin: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
        axis: [0, -1, 0],
        rangeDeg: [...limitsDeg],
      },
      {
        name: "j2",
        kind: "revolute",
        origin: { xyzMm: [a1M * 1000, 0, 0], rpyDeg: [0, 0, 0] },
        axis: [0, -1, 0],
        rangeDeg: [...limitsDeg],
      },
    ],
    flange: { xyzMm: [a2M * 1000, 0, 0], rpyDeg: [0, 0, 0] },
  };
}

/** A payload input with the given rated payload, link masses, wrist ratings and mountings (floor by default). */
export function testPayload(
  ratedPayloadKg: number,
  links: readonly LinkMass[] = [],
  wrist: readonly WristRating[] = [],
  mountings: readonly Mounting[] = ["floor"],
): PayloadInput {
  return { ratedPayloadKg, mountings, wrist, links, notes: [] };
}

/** Reference path: τ = Σ_b (J_kin,b · G)ᵀ · (−m_b g), J_kin,b with the columns of joints distal to b zeroed (ml-matrix). */
export function referenceLinkTorque(
  chain: Chain,
  links: readonly LinkMass[],
  q: ArrayLike<number>,
  gravity: readonly number[],
): number[] {
  const n = chain.jointCount,
    m = chain.drivenCount;
  const s = createScratch(chain);
  forwardInto(chain, q, s);
  const gain = Matrix.from1DArray(n, m, Array.from(chain.couplingGain));
  const t = new Float64Array(16);
  let tau = Matrix.zeros(m, 1);
  for (const l of links) {
    linkFrameInto(t, chain, s, l.joint);
    const [cx, cy, cz] = l.comInLinkM;
    const p = [0, 1, 2].map((r) => t[4 * r]! * cx + t[4 * r + 1]! * cy + t[4 * r + 2]! * cz + t[4 * r + 3]!);
    jacobianInto(new Float64Array(6 * m), chain, s, p[0]!, p[1]!, p[2]!);
    const jKin = Matrix.from1DArray(6, n, Array.from(s.jKin));
    for (let c = l.joint + 1; c < n; c++) for (let r = 0; r < 6; r++) jKin.set(r, c, 0);
    const force = Matrix.columnVector([
      -l.massKg * gravity[0]!,
      -l.massKg * gravity[1]!,
      -l.massKg * gravity[2]!,
      0,
      0,
      0,
    ]);
    tau = tau.add(jKin.mmul(gain).transpose().mmul(force));
  }
  return tau.to1DArray();
}

/** True when some number anywhere in the value is NaN or infinite. */
export function hasNonFinite(value: unknown): boolean {
  if (typeof value === "number") return !Number.isFinite(value);
  if (Array.isArray(value)) return value.some(hasNonFinite);
  if (value !== null && typeof value === "object") return Object.values(value).some(hasNonFinite);
  return false;
}
