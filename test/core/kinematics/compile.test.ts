/**
 * Tests of src/core/kinematics/compile.ts: the three conventions (standard DH, modified DH, frames) of the same
 * invented arm compile to the same kinematics (CHECKS §0), units are converted once, the coupling matrix follows
 * the chain rule, and the wrist centre is found where the last three axes meet.
 */
import { describe, expect, it } from "vitest";
import { compileChain, createScratch, forwardInto, linkFrameInto } from "../../../src/core";
import { expectClose } from "../../helpers/expectClose";
import { mulberry32, uniform } from "../../helpers/prng";
import {
  dhFrameReference,
  flat4,
  generic6rDh,
  generic6rDrivenCoupledDh,
  generic6rFramesFromDh,
  generic6rFramesUrdfStyle,
  generic6rMdh,
  GENERIC_6R_SI,
  palletizerPassiveFrames,
} from "../../helpers/testArms";

const DEG = Math.PI / 180;

describe("compileChain: one arm in three conventions", () => {
  it("compileChain(dh | mdh | frames | URDF-style frames) give the same flange pose as the mathjs DH product", () => {
    // CHECKS §0: standard DH Aᵢ = Rz(θ)Tz(d)Tx(a)Rx(α) (Spong et al. ch. 3) and modified DH
    // Aᵢ = Rx(αᵢ₋₁)Tx(aᵢ₋₁)Rz(θ)Tz(d) (Craig 2005 ch. 3) describe the same arm; the reference is an explicit
    // product of elementary matrices by mathjs (testArms.ts). 40 random poses; tolerance 1e-12 (m and unitless).
    const chains = [generic6rDh(), generic6rMdh(), generic6rFramesFromDh(), generic6rFramesUrdfStyle()].map((input) => {
      const chain = compileChain(input);
      return { chain, s: createScratch(chain), convention: input.convention };
    });
    const rand = mulberry32(0x3c);
    for (let trial = 0; trial < 40; trial++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      const expected = flat4(dhFrameReference(GENERIC_6R_SI.rows, q));
      chains.forEach(({ chain, s, convention }, k) => {
        expectClose(forwardInto(chain, q, s), expected, 1e-12, `variant ${k} (${convention}), trial ${trial}`);
      });
    }
  });

  it("compileChain(dh) link frame i equals the DH frame ⁰Tᵢ of the mathjs product (every i)", () => {
    // linkFrames of a DH arm are the DH frames (Spong et al. ch. 3); 1e-12.
    const chain = compileChain(generic6rDh());
    const s = createScratch(chain);
    const q = [0.3, -0.7, 0.4, 1.1, 0.8, -0.2]; // CHECKS §0 test pose q*
    forwardInto(chain, q, s);
    const out = new Float64Array(16);
    for (let i = 0; i < 6; i++) {
      expectClose(
        linkFrameInto(out, chain, s, i),
        flat4(dhFrameReference(GENERIC_6R_SI.rows, q, i + 1)),
        1e-12,
        `frame ${i + 1}`,
      );
    }
  });
});

describe("compileChain: units and limits", () => {
  it("compileChain converts ranges and speeds from deg, deg/s, mm, mm/s to SI exactly once", () => {
    // Fact of the unit system: 1° = π/180 rad, 1 mm = 1e-3 m; CHECKS §0 speeds w = (150, 150, 180, 300, 300, 400) °/s.
    const chain = compileChain(generic6rDh());
    expectClose(chain.lowerSi, Array(6).fill(-Math.PI), 1e-15, "lower");
    expectClose(chain.upperSi, Array(6).fill(Math.PI), 1e-15, "upper");
    expectClose(
      chain.maxSpeedSi,
      [150, 150, 180, 300, 300, 400].map((w) => w * DEG),
      1e-15,
      "speeds",
    );
    expect(chain.characteristicLengthM).toBeGreaterThan(1);
  });
});

describe("compileChain: coupling", () => {
  it("compileChain(palletizer) makes p4 passive with row −(q2 + q3) of G and 4 driven joints", () => {
    // The coupling is q_kin = G q_driven + offset (issue 2 §2); passive p4 = −(q2 + q3) (parallelogram).
    const chain = compileChain(palletizerPassiveFrames());
    expect(chain.jointCount).toBe(5);
    expect(chain.drivenCount).toBe(4);
    expect(Array.from(chain.drivenJoint)).toEqual([0, 1, 2, 4]);
    expectClose(chain.couplingGain, [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, -1, -1, 0, 0, 0, 0, 1], 0, "G");
    expectClose(chain.couplingOffset, [0, 0, 0, 0, 0], 0, "offset");
  });

  it("compileChain(driven-coupled 6R) keeps joint 3 driven with G row (0, −1, 1, 0, 0, 0) and offset 10°", () => {
    const chain = compileChain(generic6rDrivenCoupledDh());
    expect(chain.drivenCount).toBe(6);
    expectClose(chain.couplingGain.subarray(12, 18), [0, -1, 1, 0, 0, 0], 0, "row 3 of G");
    expectClose(chain.couplingOffset[2]!, 10 * DEG, 1e-15, "offset");
  });
});

describe("compileChain: wrist centre", () => {
  it("compileChain(generic 6R) finds a spherical wrist on axes 4–6, at the origin of DH frame 4", () => {
    // For this DH table the axes z₃, z₄, z₅ meet at the origin of frame 4 (Spong et al. §4.9.1, kinematic
    // decoupling [from memory]); the point must therefore be the origin of link frame index 3. 1e-12 m.
    const chain = compileChain(generic6rDh());
    expect(chain.wrist).not.toBeNull();
    expect(chain.wrist!.basis).toBe("spherical");
    expect(chain.wrist!.axes).toEqual([3, 4, 5]);
    expect(chain.wrist!.joint).toBe(3);
    expectClose(chain.wrist!.pointInLinkM, [0, 0, 0], 1e-12);
  });

  it("compileChain finds no wrist centre for the palletizer (parallel axes do not meet)", () => {
    expect(compileChain(palletizerPassiveFrames()).wrist).toBeNull();
  });
});
