/**
 * The ortho-parallel closed form (src/core/kinematics/orthoParallel.ts), checked against things outside it:
 * - a pose worked by hand from the dimension drawing's geometry (issue 14 §1), its solution and its wrist flip;
 * - round trips through forward kinematics (forwardInto, itself checked against Orocos KDL in kdlReference.test.ts)
 *   on dimension-drawing arms with random lengths, joint senses and zero offsets, and on random standard-DH arms of
 *   the class (axes 2 ∥ 3, orthogonal spherical wrist): the pose is among the solutions, every solution reproduces it;
 * - chains outside the class are refused (null), so the general solver takes them.
 */
import { describe, expect, it } from "vitest";
import { compileChain, createScratch, forwardInto, type ArmKinematicsInput, type Chain } from "../../../src/core";
import { sphericalWristIk } from "../../../src/core/kinematics/closedForm";
import { orthoParallelKinInto, orthoParallelOf } from "../../../src/core/kinematics/orthoParallel";
import { mulberry32, uniform } from "../../helpers/prng";
import {
  dimensionsArmInput,
  randomDimensionsArm,
  generic6rDh,
  generic6rFramesFromDh,
  generic6rFramesUrdfStyle,
  generic6rMdh,
  Q_STAR,
} from "../../helpers/testArms";

const DEG = Math.PI / 180;

const dimensionsArm = dimensionsArmInput;

/** Largest joint difference modulo whole turns. */
function turnDistance(a: ArrayLike<number>, ao: number, b: ArrayLike<number>): number {
  let d = 0;
  for (let i = 0; i < 6; i++) {
    const x = Math.abs(a[ao + i]! - b[i]!);
    d = Math.max(d, Math.abs(x - 2 * Math.PI * Math.round(x / (2 * Math.PI))));
  }
  return d;
}

/** Kinematic solutions of the flange pose of q (driven = kinematic here: G = I, no offsets in the chain). */
function solveBack(chain: Chain, q: Float64Array): { count: number; sol: Float64Array; target: Float64Array } {
  const ik = sphericalWristIk(chain);
  const op = ik?.orthoParallel;
  if (!op) throw new Error("not of the ortho-parallel class");
  const target = forwardInto(chain, q, createScratch(chain)).slice();
  const sol = new Float64Array(48);
  return { count: orthoParallelKinInto(op, target, sol), sol, target };
}

function maxPoseError(chain: Chain, sol: Float64Array, count: number, target: Float64Array): number {
  const k = createScratch(chain);
  let worst = 0;
  for (let s = 0; s < count; s++) {
    const f = forwardInto(chain, sol.subarray(s * 6, s * 6 + 6), k);
    for (let i = 0; i < 12; i++) worst = Math.max(worst, Math.abs(f[i]! - target[i]!));
  }
  return worst;
}

describe("orthoParallel: the closed form of the dimension-drawing class", () => {
  const HAND = { a1Mm: 150, a2Mm: 110, bMm: 35, c1Mm: 450, c2Mm: 600, c3Mm: 640, c4Mm: 100 };

  it("solves a pose worked by hand, with its wrist flip", () => {
    // Worked by hand from issue 14 §1 (a1 150, a2 110, b 35, c1 450, c2 600, c3 640, c4 100 mm; signs +1, no
    // offsets), θ = (0, 0, 0, 90°, 90°, 0): the wrist centre stays at (a1 + c3, b, c1 + c2 + a2) = (790, 35, 1160);
    // the zero-pose flange axes z₀ = +x, x₀ = −z, y₀ = +y turn by Rx(90°)·Ry(90°): Ry(90°) takes +x to −z and −z to
    // −x, then Rx(90°) takes −z to +y and leaves −x: z = (0, 1, 0), x = (−1, 0, 0), y = z × x = (0, 0, 1); the flange
    // lies c4 along z from the wrist centre: (790, 135, 1160) mm. The wrist flip (θ4 ± 180°, −θ5, θ6 ± 180°) gives
    // the same flange: (0, 0, 0, −90°, −90°, 180°).
    const chain = compileChain(dimensionsArm(HAND, [1, 1, 1, 1, 1, 1], [0, 0, 0, 0, 0, 0]));
    const ik = sphericalWristIk(chain)!;
    expect(ik.orthoParallel).not.toBeNull();
    const target = Float64Array.from([-1, 0, 0, 0.79, 0, 0, 1, 0.135, 0, 1, 0, 1.16, 0, 0, 0, 1]);
    const sol = new Float64Array(48);
    const count = orthoParallelKinInto(ik.orthoParallel!, target, sol);
    // 2 shoulder × 2 elbow × 2 wrist branches: every one reaches this pose (ranges are not applied here).
    expect(count).toBe(8);
    const find = (deg: number[]) =>
      Math.min(
        ...Array.from({ length: count }, (_, s) =>
          turnDistance(
            sol,
            s * 6,
            deg.map((d) => d * DEG),
          ),
        ),
      );
    expect(find([0, 0, 0, 90, 90, 0])).toBeLessThan(1e-12);
    expect(find([0, 0, 0, -90, -90, 180])).toBeLessThan(1e-12);
    expect(maxPoseError(chain, sol, count, target)).toBeLessThan(1e-12);
  });

  it("round-trips random poses of dimension-drawing arms with random lengths, senses and zero offsets", () => {
    const rnd = mulberry32(1414);
    for (let arm = 0; arm < 20; arm++) {
      const chain = compileChain(randomDimensionsArm(rnd));
      for (let t = 0; t < 20; t++) {
        const q = Float64Array.from({ length: 6 }, () => uniform(rnd, -Math.PI, Math.PI));
        const { count, sol, target } = solveBack(chain, q);
        expect(count).toBeGreaterThanOrEqual(2);
        const nearest = Math.min(...Array.from({ length: count }, (_, s) => turnDistance(sol, s * 6, q)));
        expect(nearest, `arm ${arm}, pose ${t}`).toBeLessThan(1e-9);
        expect(maxPoseError(chain, sol, count, target)).toBeLessThan(1e-9);
      }
    }
  });

  it("round-trips random standard-DH arms of the class (any axis 1 to axis 2 offset, wrist senses)", () => {
    const rnd = mulberry32(2718);
    for (let arm = 0; arm < 20; arm++) {
      const pm = () => (rnd() < 0.5 ? -90 : 90);
      const w = pm();
      const input = {
        convention: "dh",
        joints: [
          { a: uniform(rnd, 0, 300), d: uniform(rnd, 200, 700), alpha: pm(), off: uniform(rnd, -180, 180) },
          { a: uniform(rnd, 300, 1100), d: uniform(rnd, -100, 100), alpha: 0, off: uniform(rnd, -180, 180) },
          { a: uniform(rnd, -200, 200), d: 0, alpha: pm(), off: uniform(rnd, -180, 180) },
          { a: 0, d: uniform(rnd, 300, 1200), alpha: w, off: 0 },
          { a: 0, d: 0, alpha: -w, off: 0 },
          { a: 0, d: uniform(rnd, 50, 200), alpha: 0, off: 0 },
        ].map((r, i) => ({
          name: `J${i + 1}`,
          kind: "revolute" as const,
          rangeDeg: [-360, 360],
          maxSpeedDegPerS: 200,
          dh: { aMm: r.a, dMm: r.d, alphaDeg: r.alpha, thetaDeg: r.off },
        })),
        flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
      } as unknown as ArmKinematicsInput;
      const chain = compileChain(input);
      for (let t = 0; t < 20; t++) {
        const q = Float64Array.from({ length: 6 }, () => uniform(rnd, -Math.PI, Math.PI));
        const { count, sol, target } = solveBack(chain, q);
        const nearest = Math.min(...Array.from({ length: count }, (_, s) => turnDistance(sol, s * 6, q)));
        expect(nearest, `arm ${arm}, pose ${t}`).toBeLessThan(1e-9);
        expect(maxPoseError(chain, sol, count, target)).toBeLessThan(1e-9);
      }
    }
  });

  it("finds the class whatever the arm file's convention: the CHECKS §0 6R as dh, mdh, frames and URDF-style frames", () => {
    const q = Float64Array.from(Q_STAR);
    for (const input of [generic6rDh(), generic6rMdh(), generic6rFramesFromDh(), generic6rFramesUrdfStyle()]) {
      const chain = compileChain(input);
      expect(sphericalWristIk(chain)?.orthoParallel).toBeTruthy();
      const { count, sol, target } = solveBack(chain, q);
      const nearest = Math.min(...Array.from({ length: count }, (_, s) => turnDistance(sol, s * 6, q)));
      expect(nearest).toBeLessThan(1e-9);
      expect(maxPoseError(chain, sol, count, target)).toBeLessThan(1e-9);
    }
  });

  it("refuses chains outside the class: axes 2 and 3 not parallel, a wrist that is not orthogonal", () => {
    const base = (alpha2: number, wristAlpha: number): ArmKinematicsInput =>
      ({
        convention: "dh",
        joints: [
          { a: 150, d: 450, alpha: 90 },
          { a: 600, d: 0, alpha: alpha2 },
          { a: 100, d: 0, alpha: 90 },
          { a: 0, d: 640, alpha: wristAlpha },
          { a: 0, d: 0, alpha: -wristAlpha },
          { a: 0, d: 100, alpha: 0 },
        ].map((r, i) => ({
          name: `J${i + 1}`,
          kind: "revolute" as const,
          rangeDeg: [-360, 360],
          maxSpeedDegPerS: 200,
          dh: { aMm: r.a, dMm: r.d, alphaDeg: r.alpha, thetaDeg: 0 },
        })),
        flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
      }) as unknown as ArmKinematicsInput;
    const ok = sphericalWristIk(compileChain(base(0, -90)));
    expect(ok?.orthoParallel).not.toBeNull();
    const skewed = compileChain(base(20, -90));
    const w = sphericalWristIk(skewed);
    expect(w === null || w.orthoParallel === null).toBe(true);
    const oblique = sphericalWristIk(compileChain(base(0, -60)));
    expect(oblique === null || oblique.orthoParallel === null).toBe(true);
    // orthoParallelOf directly: a wrist centre off the chain's own is refused by the round trip.
    expect(orthoParallelOf(compileChain(base(0, -90)), [0, 0.01, -0.1])).toBeNull();
  });
});
