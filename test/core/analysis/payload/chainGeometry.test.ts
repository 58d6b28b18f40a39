/**
 * Chain geometry of the payload analysis (src/core/analysis/payload/chainGeometry.ts) against mathjs vector
 * products, a brute-force distance minimisation, the hand-listed home axes of the generic 6R (testArms.ts, from its
 * DH table) and the independent mathjs DH product at a general pose.
 */
import { describe, expect, it } from "vitest";
import * as math from "mathjs";
import { compileChain, createScratch, forwardInto } from "../../../../src/core";
import {
  axisInBase,
  cross3,
  distanceToLine,
  dot3,
  flangeSpinSet,
  holdValue,
  homePose,
  isUncoupled,
  nearestPointOnLine,
  norm3,
} from "../../../../src/core/analysis/payload/chainGeometry";
import type { Chain } from "../../../../src/core/kinematics/chain";
import type { ArmKinematicsInput } from "../../../../src/core/kinematics/compile";
import { expectClose } from "../../../helpers/expectClose";
import {
  dhFrameReference,
  generic6rDh,
  generic6rDrivenCoupledDh,
  GENERIC_6R_SI,
  palletizerPassiveFrames,
  Q_STAR,
} from "../../../helpers/testArms";
import { planar3r } from "../line/fixtures";

const DEG = Math.PI / 180;

describe("vector helpers (mathjs reference)", () => {
  const a = [0.3, -1.2, 2.5],
    b = [-0.7, 0.4, 1.1];
  it("dot3, cross3, norm3", () => {
    expectClose(dot3(a, b), math.dot(a, b), 1e-15, "dot");
    expectClose(cross3(a, b), math.cross(a, b) as number[], 1e-15, "cross");
    expectClose(norm3(a), math.norm(a) as number, 1e-15, "norm");
  });

  it("distanceToLine: hand-worked and against the mathjs formula |(p − o) × w|", () => {
    // hand: (3, 4, 7) from the z axis: √(3² + 4²) = 5
    expectClose(distanceToLine([3, 4, 7], [0, 0, -2], [0, 0, 1]), 5, 1e-15, "distance to z axis");
    const w = math.divide([1, 2, 2], 3) as number[];
    const p = [0.5, -1, 2],
      o = [1, 1, 0];
    const want = math.norm(math.cross(math.subtract(p, o), w) as number[]) as number;
    expectClose(distanceToLine(p, o, w), want, 1e-15, "oblique line");
  });

  it("nearestPointOnLine: hand-worked perpendicular lines, a brute-force skew case, and parallel lines", () => {
    // hand: x axis and the line through (2, 0, 3) along y: the common perpendicular meets the x axis at (2, 0, 0)
    expectClose(nearestPointOnLine([0, 0, 0], [1, 0, 0], [2, 0, 3], [0, 1, 0]), [2, 0, 0], 1e-15, "perpendicular");
    // skew lines at 60°: brute-force minimisation of the distance between the lines over a fine (t, u) grid,
    // refined twice around the best node
    const o = [0.1, 0.2, 0.3],
      w = [1, 0, 0],
      p = [0.5, -0.4, 1.3],
      z = [0.5, Math.sqrt(3) / 2, 0];
    let bt = 0,
      bu = 0,
      span = 4;
    for (let pass = 0; pass < 4; pass++) {
      let best = Infinity,
        nt = bt,
        nu = bu;
      for (let i = -100; i <= 100; i++) {
        for (let k = -100; k <= 100; k++) {
          const t = bt + (i / 100) * span,
            u = bu + (k / 100) * span;
          const d = Math.hypot(o[0]! + t - (p[0]! + u * z[0]!), o[1]! - (p[1]! + u * z[1]!), o[2]! - p[2]!);
          if (d < best) {
            best = d;
            nt = t;
            nu = u;
          }
        }
      }
      bt = nt;
      bu = nu;
      span /= 50;
    }
    expectClose(nearestPointOnLine(o, w, p, z), [o[0]! + bt, o[1]!, o[2]!], 1e-6, "skew, brute force");
    // parallel: the projection of p onto the line
    expectClose(nearestPointOnLine([0, 0, 0], [0, 0, 1], [3, 1, 2.5], [0, 0, 1]), [0, 0, 2.5], 1e-15, "parallel");
  });
});

describe("axisInBase", () => {
  const chain = compileChain(generic6rDh());
  const s = createScratch(chain);

  it("home pose of the generic 6R: the hand-listed axes (+z, +y, +y, −z, +y, −z) through the listed points", () => {
    forwardInto(chain, new Float64Array(6), s);
    // testArms.ts (hand, from the DH table at q = 0)
    const axes = [
      [0, 0, 1],
      [0, 1, 0],
      [0, 1, 0],
      [0, 0, -1],
      [0, 1, 0],
      [0, 0, -1],
    ];
    const points = [
      [0, 0, 0],
      [0.2, 0, 0.5],
      [1.2, 0, 0.5],
      [1.4, 0, 0.5],
      [1.4, 0, -0.5],
      [1.4, 0, -0.5],
    ];
    for (let k = 0; k < 6; k++) {
      const { o, w } = axisInBase(chain, s, k);
      expectClose(w, axes[k]!, 1e-12, `axis ${k + 1} direction`);
      expectClose(distanceToLine(points[k]!, o, w), 0, 1e-12, `axis ${k + 1} passes through the listed point`);
    }
  });

  it("at q*: axis k is z and origin of DH frame k − 1 by the mathjs product (Spong ch. 3)", () => {
    forwardInto(chain, Float64Array.from(Q_STAR), s);
    for (let k = 0; k < 6; k++) {
      const t = dhFrameReference(GENERIC_6R_SI.rows, Q_STAR, k);
      const { o, w } = axisInBase(chain, s, k);
      expectClose(w, [t[0]![2]!, t[1]![2]!, t[2]![2]!], 1e-12, `axis ${k + 1} at q*`);
      expectClose(distanceToLine([t[0]![3]!, t[1]![3]!, t[2]![3]!], o, w), 0, 1e-12, `axis ${k + 1} origin at q*`);
    }
  });
});

describe("homePose / holdValue", () => {
  /** A chain stand-in with only the limits holdValue reads. */
  const limits = (lo: number[], hi: number[]) =>
    ({ drivenCount: lo.length, lowerSi: Float64Array.from(lo), upperSi: Float64Array.from(hi) }) as unknown as Chain;

  it("0 when inside the limits, the middle when 0 is outside, the finite end when the other is open", () => {
    const c = limits([-1, 0.2, -0.8, 0.3, -Infinity, -Infinity], [1, 0.8, -0.2, Infinity, -0.5, Infinity]);
    // hand: 0 ∈ [−1, 1]; mid of [0.2, 0.8] = 0.5; mid of [−0.8, −0.2] = −0.5; [0.3, ∞) → 0.3; (−∞, −0.5] → −0.5;
    // (−∞, ∞) → 0
    expectClose(Array.from(homePose(c)), [0, 0.5, -0.5, 0.3, -0.5, 0], 1e-15, "home pose");
    expect(holdValue(c, 1)).toBe(0.5);
  });

  it("uses the file limits of a compiled arm (deg → rad)", () => {
    const input: ArmKinematicsInput = {
      ...planar3r(),
      joints: planar3r().joints.map((j, i) => (i === 1 ? { ...j, rangeDeg: [20, 80] } : j)),
    };
    // hand: joint 2 limited to [20°, 80°] → held at 50°; joints 1 and 3 have no limits → 0
    expectClose(Array.from(homePose(compileChain(input))), [0, 50 * DEG, 0], 1e-15, "home pose");
  });
});

describe("isUncoupled", () => {
  it("every joint of the plain generic 6R", () => {
    const c = compileChain(generic6rDh());
    expect([0, 1, 2, 3, 4, 5].map((j) => isUncoupled(c, j))).toEqual([true, true, true, true, true, true]);
  });

  it("driven-coupled 6R (kinematic q₃ = q₃ − q₂ + 10°): joints 2 and 3 are coupled (hand)", () => {
    const c = compileChain(generic6rDrivenCoupledDh());
    expect([0, 1, 2, 3, 4, 5].map((j) => isUncoupled(c, j))).toEqual([true, false, false, true, true, true]);
  });

  it("palletizer (passive p4 = −(q₂ + q₃)): j2 and j3 drive p4 as well (hand)", () => {
    const c = compileChain(palletizerPassiveFrames());
    expect(c.drivenCount).toBe(4);
    expect([0, 1, 2, 3].map((j) => isUncoupled(c, j))).toEqual([true, false, false, true]);
  });
});

describe("flangeSpinSet (home pose)", () => {
  const spins = (input: ArmKinematicsInput) => {
    const c = compileChain(input);
    const s = createScratch(c);
    forwardInto(c, homePose(c), s);
    return [...flangeSpinSet(c, s)].sort();
  };

  it("generic 6R: axis 6 only (−z through (1.4, 0, −0.5); the flange (1.4, 0, −0.6) with z = −z lies on it)", () => {
    expect(spins(generic6rDh())).toEqual([5]);
  });

  it("palletizer: j5 (kinematic 4, vertical through the flange); the passive p4 before it stops the run", () => {
    expect(spins(palletizerPassiveFrames())).toEqual([4]);
  });

  it("planar 3R: none (the flange is 0.1 m from axis 3)", () => {
    expect(spins(planar3r())).toEqual([]);
  });

  it("generic 6R with the flange moved 50 mm off axis 6: none", () => {
    expect(spins({ ...generic6rDh(), flange: { xyzMm: [50, 0, 0], rpyDeg: [0, 0, 0] } })).toEqual([]);
  });
});
