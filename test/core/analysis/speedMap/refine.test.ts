/**
 * Tests of src/core/analysis/speedMap/refine.ts: a near-singular solution left off its target's pose along the null
 * motion (as the solver's tolerance allows) is stepped back onto it, and the guaranteed speed then takes its closed-form
 * value.
 *
 * Outside references (closed forms derived by hand, written beside each check):
 * - SCARA-like RRPR (a1 = 0.4 m, a2 = 0.3 m): at q2 = δ the joint rates per unit tool velocity at constant
 *   orientation are B = J⁻¹ with rows ‖B₁‖ = 1/(a1·sin δ), ‖B₂‖ = ρ/(a1·a2·sin δ) (ρ = |tip| from axis 1 =
 *   √(a1² + a2² + 2·a1·a2·cos δ)), ‖B₃‖ = 1 (the quill), ‖B₄‖ = 1/(a2·sin δ) (q̇4 = q̇1 + q̇2 = −vx/(a2·sin δ) in the
 *   arm frame), so r(δ) = min(w1·a1·sin δ, w2·a1·a2·sin δ/ρ, w3, w4·a2·sin δ): 0 stretched (δ = 0), first order in δ
 *   near it (CHECKS C12 for the definition r = minᵢ wᵢ/‖Bᵢ‖, C1 for the planar Jacobian).
 * - Generic 6R of CHECKS §0 at q5 = 0 (C5): axes 4 and 6 in line, so turning joint 4 by +t and joint 6 by −t keeps
 *   the flange pose exactly (a self-motion), and the guaranteed speed is 0 (an angular direction is lost, and with it
 *   straight lines at constant orientation in some direction).
 */
import { describe, expect, it } from "vitest";
import type { Chain } from "../../../../src/core";
import { compileChain, createScratch, forwardInto, jacobianInto } from "../../../../src/core";
import { createNullStepScratch, refineAlongNullMotion } from "../../../../src/core/analysis/speedMap/refine";
import { taskDeterminant } from "../../../../src/core/analysis/speedMap/speedMap";
import { createSpeedScratch, guaranteedLineSpeed } from "../../../../src/core/measures/speed";
import { expectClose } from "../../../helpers/expectClose";
import { generic6rDh, Q_STAR, scaraRrprDh } from "../../../helpers/testArms";

const DEG = Math.PI / 180;
const A1 = 0.4,
  A2 = 0.3;
const W_RAD = [200 * DEG, 300 * DEG, 1, 600 * DEG];

/** Closed-form guaranteed speed of the SCARA at q2 = δ (module comment), m/s. */
function scaraGuaranteed(delta: number): number {
  const s = Math.abs(Math.sin(delta));
  const rho = Math.sqrt(A1 * A1 + A2 * A2 + 2 * A1 * A2 * Math.cos(delta));
  return Math.min(W_RAD[0]! * A1 * s, (W_RAD[1]! * A1 * A2 * s) / rho, W_RAD[2]!, W_RAD[3]! * A2 * s);
}

interface Pose {
  flange: Float64Array;
  jacobian: Float64Array;
  det: number;
  guaranteed: number;
}

function poseAt(chain: Chain, q: ArrayLike<number>): Pose {
  const m = chain.drivenCount;
  const s = createScratch(chain);
  const flange = Float64Array.from(forwardInto(chain, q, s));
  const jacobian = jacobianInto(new Float64Array(6 * m), chain, s, flange[3]!, flange[7]!, flange[11]!);
  const det = taskDeterminant(jacobian, m, chain.characteristicLengthM, flange, new Float64Array(36));
  const guaranteed = guaranteedLineSpeed(jacobian, m, chain.maxSpeedSi, createSpeedScratch(m));
  return { flange, jacobian, det, guaranteed };
}

function refine(chain: Chain, q: Float64Array, goal: Float64Array, axisOnly: boolean): boolean {
  const p = poseAt(chain, q);
  return refineAlongNullMotion(createNullStepScratch(chain)!, q, p.jacobian, p.flange, p.det, goal, axisOnly);
}

describe("refineAlongNullMotion: SCARA stretched (elbow singularity, target at full reach)", () => {
  const chain = compileChain(scaraRrprDh());
  const qStar = [0.5, 0, 0.1, 0.3];
  // Null motion at the stretched pose (CHECKS C1, by hand): q̇1(a1 + a2) + q̇2·a2 = 0 and q̇4 = q̇1 + q̇2:
  // (a2, −(a1 + a2), 0, −a1) = (0.3, −0.7, 0, −0.4), unit length.
  const len = Math.hypot(0.3, 0.7, 0.4);
  const n = [0.3 / len, -0.7 / len, 0, -0.4 / len];
  const goal = poseAt(chain, qStar).flange;

  it("on the singular pose the guaranteed speed is 0 (closed form r(0) = 0)", () => {
    expect(scaraGuaranteed(0)).toBe(0);
    expectClose(poseAt(chain, qStar).guaranteed, 0, 1e-12, "r at q2 = 0");
  });

  it.each([0.004, -0.004, 0.01])(
    "a solution δ = %s rad off along the null motion goes back: r from first order to 0",
    (delta) => {
      const q = Float64Array.from(qStar, (v, i) => v + delta * n[i]!);
      // Premise: the drifted pose meets the map's verification tolerance (1e-6 m) only to second order, yet has the
      // first-order figure r(q2 = δ·n2) of the closed form (to 1e-9 m/s).
      const before = poseAt(chain, q);
      const off = Math.hypot(
        goal[3]! - before.flange[3]!,
        goal[7]! - before.flange[7]!,
        goal[11]! - before.flange[11]!,
      );
      expect(off, "tool error second order in δ").toBeLessThan(delta * delta);
      expectClose(before.guaranteed, scaraGuaranteed(delta * n[1]!), 1e-9, "first-order value before");
      expect(refine(chain, q, goal, true)).toBe(true);
      const after = poseAt(chain, q);
      // After: on the singular pose to 1e-7 rad (q2 → 0), and r = r(q2) of the closed form, below 1e-6 m/s.
      expectClose(q[1]!, 0, 1e-7, "q2 back at 0");
      expectClose(after.guaranteed, scaraGuaranteed(q[1]!), 1e-9, "closed form at the refined q2");
      expect(after.guaranteed).toBeLessThan(1e-6);
    },
  );

  it("a pose at a known distance (q2 = 0.01 rad) that meets its own target stays, with r = r(0.01) ≈ 0.0090 m/s", () => {
    const q = Float64Array.from([0.5, 0.01, 0.1, 0.3]);
    const own = poseAt(chain, q);
    expect(refine(chain, q, own.flange, true)).toBe(false);
    expect(q[1]).toBe(0.01);
    // First order: r ≈ δ·w2·a1·a2/(a1 + a2) = 0.01 · 5.236 · 0.12/0.7 = 0.008976 m/s (the elbow joint limits).
    expectClose(own.guaranteed, scaraGuaranteed(0.01), 1e-9, "closed form");
    expectClose(own.guaranteed, (0.01 * W_RAD[1]! * A1 * A2) / (A1 + A2), 1e-6, "first-order value");
  });
});

describe("refineAlongNullMotion: generic 6R on its wrist singularity (q5 = 0)", () => {
  const chain = compileChain(generic6rDh());
  const qStar: number[] = [...Q_STAR];
  qStar[4] = 0;
  const goal = poseAt(chain, qStar).flange;

  it("guaranteed speed 0 on it; a turn along the self-motion e4 − e6 keeps the pose and is left alone", () => {
    expect(poseAt(chain, qStar).guaranteed).toBe(0);
    const q = Float64Array.from(qStar);
    q[3] = q[3]! + 0.004;
    q[5] = q[5]! - 0.004;
    const p = poseAt(chain, q);
    for (let i = 0; i < 16; i++) expectClose(p.flange[i]!, goal[i]!, 1e-12, `same flange pose [${i}]`);
    expect(refine(chain, q, goal, false)).toBe(false);
    expect(q[3]).toBe(qStar[3]! + 0.004);
  });
});
