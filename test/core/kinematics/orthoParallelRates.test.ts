/**
 * The decoupled joint rates of the ortho-parallel class (src/core/kinematics/orthoParallelRates.ts), checked by
 * finite differences of the forward kinematics (forwardInto, itself checked against Orocos KDL in
 * kdlReference.test.ts): with J from central differences (step 1e-6 rad, error O(h²)), J·B must be [I₃; 0] (the joint
 * rates move the flange at unit velocity without turning it) and det J must match. Arms: the CHECKS §0 6R and
 * dimension-drawing arms with random lengths, senses and zero offsets.
 */
import { describe, expect, it } from "vitest";
import { compileChain, createScratch, forwardInto, type Chain } from "../../../src/core";
import { sphericalWristIk } from "../../../src/core/kinematics/closedForm";
import { createOrthoRatesScratch, orthoLineRatesInto } from "../../../src/core/kinematics/orthoParallelRates";
import { guaranteedFromRates } from "../../../src/core/measures/speed";
import { determinantInPlace } from "../../../src/core/math/linsolve";
import { generic6rDh, randomDimensionsArm } from "../../helpers/testArms";
import { mulberry32, uniform } from "../../helpers/prng";

/** 6 × 6 Jacobian (rows vx, vy, vz, ωx, ωy, ωz; flange origin) by central differences of the forward kinematics. */
function jacobianFd(chain: Chain, q: Float64Array): Float64Array {
  const h = 1e-6,
    kin = createScratch(chain),
    j = new Float64Array(36);
  for (let c = 0; c < 6; c++) {
    const qp = Float64Array.from(q),
      qm = Float64Array.from(q);
    qp[c] = qp[c]! + h;
    qm[c] = qm[c]! - h;
    const tp = forwardInto(chain, qp, kin).slice(),
      tm = forwardInto(chain, qm, kin).slice(),
      t0 = forwardInto(chain, q, kin).slice();
    for (let r = 0; r < 3; r++) j[r * 6 + c] = (tp[r * 4 + 3]! - tm[r * 4 + 3]!) / (2 * h);
    // ω from Ṙ·Rᵀ (skew part).
    const d = (i: number, k: number) => (tp[i * 4 + k]! - tm[i * 4 + k]!) / (2 * h);
    const w = (i: number, k: number) => d(i, 0) * t0[k * 4]! + d(i, 1) * t0[k * 4 + 1]! + d(i, 2) * t0[k * 4 + 2]!;
    j[3 * 6 + c] = w(2, 1);
    j[4 * 6 + c] = w(0, 2);
    j[5 * 6 + c] = w(1, 0);
  }
  return j;
}

describe("orthoLineRatesInto: joint rates at constant orientation from the decoupled Jacobian", () => {
  const rnd = mulberry32(31);
  // The CHECKS §0 6R with joint 3 read from the horizontal (q₃_kin = q₃ − q₂: a coupling on a driven joint).
  const coupledInput = generic6rDh();
  const coupled = compileChain({
    ...coupledInput,
    joints: coupledInput.joints.map((j, i) =>
      i === 2 ? { ...j, coupling: { terms: [{ joint: "j2", gain: -1 }] } } : j,
    ),
  });
  const chains: Chain[] = [
    compileChain(generic6rDh()),
    coupled,
    ...Array.from({ length: 8 }, () => compileChain(randomDimensionsArm(rnd, true))),
  ];
  it("J·B = [I; 0] and det J against the finite-difference Jacobian, at random poses", () => {
    // The coupling is there: joint 3's kinematic value follows joint 2.
    expect(coupled.couplingGain[2 * 6 + 1]).toBe(-1);
    let checked = 0;
    for (const chain of chains) {
      const op = sphericalWristIk(chain)?.orthoParallel;
      expect(op).toBeTruthy();
      const s = createOrthoRatesScratch();
      for (let t = 0; t < 25; t++) {
        const q = Float64Array.from({ length: 6 }, () => uniform(rnd, -3, 3));
        if (!orthoLineRatesInto(op!, chain, q, s)) continue;
        const j = jacobianFd(chain, q);
        const scale = Math.max(...Array.from(s.b, Math.abs));
        for (let r = 0; r < 6; r++)
          for (let c = 0; c < 3; c++) {
            let v = 0;
            for (let k = 0; k < 6; k++) v += j[r * 6 + k]! * s.b[k * 3 + c]!;
            expect(Math.abs(v - (r === c ? 1 : 0))).toBeLessThan(1e-6 * Math.max(1, scale));
          }
        const det = determinantInPlace(Float64Array.from(j), 6);
        expect(Math.abs(s.det - det)).toBeLessThan(1e-6 * Math.max(1, Math.abs(det)));
        // The figure: minᵢ q̇maxᵢ/‖Bᵢ‖, positive and finite away from singular poses.
        const g = guaranteedFromRates(s.b, 6, chain.maxSpeedSi);
        expect(g).toBeGreaterThan(0);
        expect(Number.isFinite(g)).toBe(true);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(150);
  });

  it("reports a singular pose: the wrist with axes 4 and 6 in line (CHECKS §0 6R at q5 = 0)", () => {
    const chain = compileChain(generic6rDh());
    const s = createOrthoRatesScratch();
    expect(orthoLineRatesInto(sphericalWristIk(chain)!.orthoParallel!, chain, [0.3, -0.7, 0.4, 1.1, 0, -0.2], s)).toBe(
      false,
    );
    expect(s.det).toBe(0);
  });
});
