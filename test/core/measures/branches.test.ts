/**
 * Branch names (src/core/measures/branches.ts) of hand-made poses, each derived by hand from the geometry of the
 * generic 6R of testArms.ts (standard DH, Spong et al. ch. 3) and of a planar 2R.
 *
 * Hand geometry of the generic 6R with q₁ = 0 (all in the x–z plane, up = +z): the shoulder (axis 2, along +y) is at
 * S = (0.2, 0, 0.5); a rotation by q about +y takes (1, 0, 0) to (cos q, 0, −sin q) and (0, 0, −1) to
 * (−sin q, 0, −cos q). With θ = q₂ + q₃:
 *   elbow (axis 3)  E = S + 1.0·(cos q₂, 0, −sin q₂)
 *   wrist centre    C = E + 0.2·(cos θ, 0, −sin θ) + 1.0·(−sin θ, 0, −cos θ)
 * Axis 1 is +z through the origin and axis 2 at q₁ = 0 is +y, so (z₁ × z₂)·C = −C_x: the zero pose has
 * C = (1.4, 0, −0.5), and a pose is "front" when C_x > 0 (C on the same side of axis 1 as at zero), "back" when C_x < 0.
 * Wrist: in DH frame 3, z₄ = (0, 0, 1), z₅ = (sin q₄, −cos q₄, 0), z₆ = (−sin q₅ cos q₄, −sin q₅ sin q₄, cos q₅),
 * so det[z₄ z₅ z₆] = −sin q₅: "wrist +" for q₅ < 0 (and q₅ = 0), "wrist −" for q₅ > 0.
 */
import { describe, expect, it } from "vitest";
import { compileChain, createScratch, forwardInto, wristCentreInto } from "../../../src/core";
import { branchCode, branchFrame, branchName, type BranchFrame } from "../../../src/core/measures/branches";
import type { Chain } from "../../../src/core/kinematics/chain";
import { expectClose } from "../../helpers/expectClose";
import { dhFrameReference, generic6rDh, GENERIC_6R_SI, planar2r } from "../../helpers/testArms";

const PI = Math.PI;
const UP: [number, number, number] = [0, 0, 1];

/** Hand formula for the wrist centre (header), q₁ = 0. */
function handWristCentre(q2: number, q3: number): [number, number, number] {
  const th = q2 + q3;
  const ex = 0.2 + Math.cos(q2),
    ez = 0.5 - Math.sin(q2);
  return [ex + 0.2 * Math.cos(th) - Math.sin(th), 0, ez - 0.2 * Math.sin(th) - Math.cos(th)];
}

function setup6r(): { chain: Chain; frame: BranchFrame; name: (q: number[]) => string } {
  const chain = compileChain(generic6rDh());
  const s = createScratch(chain);
  forwardInto(chain, new Float64Array(6), s);
  const c0 = new Float64Array(3);
  expect(wristCentreInto(c0, chain, s)).toBe(true);
  const frame = branchFrame(chain, s, Array.from(c0), UP)!;
  const name = (q: number[]): string => {
    forwardInto(chain, Float64Array.from(q), s);
    const c = new Float64Array(3);
    wristCentreInto(c, chain, s);
    return branchName(frame, branchCode(chain, s, frame, c[0]!, c[1]!, c[2]!));
  };
  return { chain, frame, name };
}

describe("branch names of the generic 6R (hand-worked poses)", () => {
  const { frame, name } = setup6r();

  it("zero pose: wrist centre at the hand value (1.4, 0, −0.5), front, elbow up", () => {
    expectClose(handWristCentre(0, 0), [1.4, 0, -0.5], 1e-12, "hand formula at zero");
    // independent: origin of DH frame 4 by the mathjs product of testArms.ts
    const t = dhFrameReference(GENERIC_6R_SI.rows, [0, 0, 0, 0, 0, 0], 4);
    expectClose([t[0]![3]!, t[1]![3]!, t[2]![3]!], [1.4, 0, -0.5], 1e-12, "mathjs wrist centre at zero");
    expect(frame.frontSign).toBe(-1); // hand: (z₁ × z₂)·C₀ = −C₀x = −1.4
    expect(frame.scara).toBe(false);
    expect(frame.wrist.length).toBe(3);
    // hand: elbow E = (1.2, 0, 0.5) is above the line S → C (which falls from z = 0.5 to −0.5); q₅ = 0 ⇒ det = 0 ⇒ "+"
    expect(name([0, 0, 0, 0, 0, 0])).toBe("front, elbow up, wrist +");
  });

  // Each pose: (q₂, q₃), hand-evaluated C and E, and the side of E relative to the line S → C in the x–z plane
  // (sign of the 2-D cross product (C − S) × (E − S), + = E to the left of S → C; "up" = E above the line).
  const poses: { q2: number; q3: number; c: [number, number]; e: [number, number]; want: string; why: string }[] = [
    {
      q2: -PI / 2,
      q3: 0,
      c: [1.2, 1.7],
      e: [0.2, 1.5],
      want: "front, elbow up",
      why: "upper arm vertical, forearm horizontal forward: E = (0.2, 1.5) above the line from S = (0.2, 0.5) to C",
    },
    {
      q2: PI / 4,
      q3: (-3 * PI) / 4,
      c: [0.2 + Math.SQRT1_2 + 1, 0.5 - Math.SQRT1_2 + 0.2],
      e: [0.2 + Math.SQRT1_2, 0.5 - Math.SQRT1_2],
      want: "front, elbow down",
      why: "upper arm 45° below horizontal, forearm horizontal forward: E at z = −0.207, the line at x_E is at z ≈ 0.29",
    },
    {
      q2: (-3 * PI) / 4,
      q3: -PI / 4,
      c: [0.2 - Math.SQRT1_2 - 0.2, 0.5 + Math.SQRT1_2 + 1],
      e: [0.2 - Math.SQRT1_2, 0.5 + Math.SQRT1_2],
      want: "back, elbow down",
      why: "upper arm 45° back from vertical, forearm straight up: C_x = −0.707 < 0; E lies below the steep line S → C",
    },
    {
      q2: (-3 * PI) / 4,
      q3: (-3 * PI) / 4,
      c: [0.2 - Math.SQRT1_2 - 1, 0.5 + Math.SQRT1_2 - 0.2],
      e: [0.2 - Math.SQRT1_2, 0.5 + Math.SQRT1_2],
      want: "back, elbow up",
      why: "upper arm 45° back from vertical, forearm pointing back horizontally: C_x = −1.507 < 0; E above S → C",
    },
  ];

  for (const p of poses) {
    it(`q₂ = ${p.q2.toFixed(3)}, q₃ = ${p.q3.toFixed(3)}: ${p.want} (${p.why})`, () => {
      const hc = handWristCentre(p.q2, p.q3);
      expectClose([hc[0], hc[2]], p.c, 1e-12, "hand wrist centre");
      // independent: mathjs DH product (origin of frame 4) agrees with the hand value
      const t = dhFrameReference(GENERIC_6R_SI.rows, [0, p.q2, p.q3, 0, 0, 0], 4);
      expectClose([t[0]![3]!, t[2]![3]!], p.c, 1e-12, "mathjs wrist centre");
      const t2 = dhFrameReference(GENERIC_6R_SI.rows, [0, p.q2, p.q3, 0, 0, 0], 2);
      expectClose([t2[0]![3]!, t2[2]![3]!], p.e, 1e-12, "mathjs elbow");
      // hand side test: E above the line S → C ⇔ (E − S) has a positive component along the upward normal of S → C
      const sx = 0.2,
        sz = 0.5;
      const dx = p.c[0] - sx,
        dz = p.c[1] - sz;
      const nUp = dx >= 0 ? [-dz, dx] : [dz, -dx]; // normal of S → C with a positive z component
      const above = (p.e[0] - sx) * nUp[0]! + (p.e[1] - sz) * nUp[1]! > 0;
      expect(above ? "up" : "down").toBe(p.want.endsWith("up") ? "up" : "down");
      expect(p.c[0] > 0 ? "front" : "back").toBe(p.want.split(",")[0]);
      expect(name([0, p.q2, p.q3, 0, -0.5, 0])).toBe(`${p.want}, wrist +`);
    });
  }

  it("turning the whole arm about axis 1 keeps the names (the shoulder test is relative to the arm's own plane)", () => {
    // hand: (z₁ × z₂(q₁))·C = −(cos q₁ C_x + sin q₁ C_y), invariant under rotating the arm and C together
    for (const q1 of [PI / 2, PI, -2.5]) {
      expect(name([q1, -PI / 2, 0, 0, -0.5, 0])).toBe("front, elbow up, wrist +");
      expect(name([q1, (-3 * PI) / 4, -PI / 4, 0, -0.5, 0])).toBe("back, elbow down, wrist +");
    }
  });

  it("wrist sign follows det[z₄ z₅ z₆] = −sin q₅ for any q₄, q₆", () => {
    for (const q4 of [-2, 0, 0.7, 3]) {
      for (const q5 of [-1.2, -0.3, 0.3, 1.2, 2.5]) {
        const want = -Math.sin(q5) < 0 ? "wrist −" : "wrist +";
        expect(name([0, -PI / 2, 0, q4, q5, 0.4])).toBe(`front, elbow up, ${want}`);
      }
    }
  });

  it("branchCode bits: shoulder back = 1, elbow down = 2, wrist − = 4 (all eight combinations named)", () => {
    const names = new Set<string>();
    for (let code = 0; code < 8; code++) names.add(branchName(frame, code));
    expect(names.size).toBe(8);
    expect(branchName(frame, 7)).toBe("back, elbow down, wrist −");
    expect(branchName(frame, 0)).toBe("front, elbow up, wrist +");
  });
});

describe("branch names of a planar 2R (parallel first axes: elbow left/right seen from above)", () => {
  // Hand: o₁ = 0, o₂ = a₁(cos q₁, sin q₁, 0), tip c = o₂ + a₂(cos(q₁+q₂), sin(q₁+q₂), 0);
  // z·((o₂ − o₁) × (c − o₂)) = a₁a₂ sin q₂: left for q₂ > 0 (the forearm turns counter-clockwise), right for q₂ < 0.
  const chain = compileChain(planar2r(0.4, 0.3));
  const s = createScratch(chain);
  forwardInto(chain, new Float64Array(2), s);
  const frame = branchFrame(chain, s, [s.flange[3]!, s.flange[7]!, s.flange[11]!], UP)!;

  it("is recognised as parallel-axes with no wrist", () => {
    expect(frame).not.toBeNull();
    expect(frame.scara).toBe(true);
    expect(frame.wrist).toEqual([]);
  });

  for (const [q1, q2] of [
    [0, 0.5],
    [0, -0.5],
    [1.3, 2.0],
    [-2.0, -1.0],
    [3.0, 0.1],
  ] as const) {
    it(`q = (${q1}, ${q2}): ${Math.sin(q2) > 0 ? "left" : "right"} (sign of a₁a₂ sin q₂)`, () => {
      forwardInto(chain, Float64Array.from([q1, q2]), s);
      // hand tip position
      const cx = 0.4 * Math.cos(q1) + 0.3 * Math.cos(q1 + q2),
        cy = 0.4 * Math.sin(q1) + 0.3 * Math.sin(q1 + q2);
      expectClose([s.flange[3]!, s.flange[7]!], [cx, cy], 1e-12, "2R tip");
      const code = branchCode(chain, s, frame, cx, cy, 0);
      expect(branchName(frame, code)).toBe(Math.sin(q2) > 0 ? "elbow left" : "elbow right");
    });
  }
});

describe("branchName without a frame", () => {
  it('is "single" when no branch frame applies', () => {
    expect(branchName(null, 0)).toBe("single");
    expect(branchName(null, 7)).toBe("single");
  });
});
