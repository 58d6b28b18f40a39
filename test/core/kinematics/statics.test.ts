/**
 * Tests of src/core/kinematics/statics.ts. Outside references:
 * - CHECKS C14 (static torques τ = Jᵀ F; 2R in a vertical plane: τ1 = m g (a1 c1 + a2 c12), τ2 = m g a2 c12);
 *   Craig, Introduction to Robotics, 3rd ed., ch. 5 (static forces); Spong, Hutchinson & Vidyasagar, ch. 4.
 * - Holding torque = +∂V/∂q with V the gravitational potential energy (principle of virtual work), checked by
 *   central differences of V computed from forwardInto/linkFrameInto positions only.
 * - Jᵀ F with the geometric Jacobian of each centre of mass (jacobianInto's kinematic Jacobian, columns of distal
 *   joints zeroed, times the coupling G), multiplied out with ml-matrix: the reference path for the fast kernel.
 * - Gravity by mounting: the stated conventions (base tilted about y), unit length by Pythagoras.
 * Every chain here is an invented round-number chain.
 */
import { describe, expect, it } from "vitest";
import type { Chain } from "../../../src/core";
import { compileChain, createScratch, forwardInto, linkFrameInto, STANDARD_GRAVITY_M_PER_S2 } from "../../../src/core";
import {
  bodySetOf,
  createHoldingScratch,
  gravityDirectionInBase,
  gravityInBase,
  holdingTorqueInto,
  pointHoldingTorqueInto,
  type LinkMass,
} from "../../../src/core/kinematics/statics";
import { expectClose, expectRelClose } from "../../helpers/expectClose";
import { mulberry32, uniform } from "../../helpers/prng";
import { referenceLinkTorque, vertical2r } from "../../helpers/statics";
import { generic6rDh, generic6rDrivenCoupledDh, palletizerPassiveFrames } from "../../helpers/testArms";

const G = STANDARD_GRAVITY_M_PER_S2;
const DEG = Math.PI / 180;
const FLOOR = [0, 0, -G] as const;

/** Holding torque of a point mass at the flange origin (fast kernel). */
function tipTorque(chain: Chain, qRad: readonly number[], massKg: number, gravity: readonly number[]): Float64Array {
  const s = createScratch(chain);
  const f = forwardInto(chain, qRad, s);
  return pointHoldingTorqueInto(
    new Float64Array(chain.drivenCount),
    chain,
    s,
    f[3]!,
    f[7]!,
    f[11]!,
    massKg,
    gravity,
    createHoldingScratch(chain),
  );
}

/** Gravitational potential energy V = −Σ m_b g·p_b of the link masses, from positions only (no Jacobian). */
function potentialJ(
  chain: Chain,
  links: readonly LinkMass[],
  q: ArrayLike<number>,
  gravity: readonly number[],
): number {
  const s = createScratch(chain);
  forwardInto(chain, q, s);
  const t = new Float64Array(16);
  let v = 0;
  for (const l of links) {
    linkFrameInto(t, chain, s, l.joint);
    const [cx, cy, cz] = l.comInLinkM;
    const p = [0, 1, 2].map((r) => t[4 * r]! * cx + t[4 * r + 1]! * cy + t[4 * r + 2]! * cz + t[4 * r + 3]!);
    v -= l.massKg * (gravity[0]! * p[0]! + gravity[1]! * p[1]! + gravity[2]! * p[2]!);
  }
  return v;
}

function drivenLimits(chain: Chain, j: number): [number, number] {
  const lo = chain.lowerSi[j]!,
    hi = chain.upperSi[j]!;
  const open = chain.isPrismatic[chain.drivenJoint[j]!] ? 1 : Math.PI;
  return [Number.isFinite(lo) ? lo : -open, Number.isFinite(hi) ? hi : open];
}

function randomLinks(chain: Chain, rand: () => number): LinkMass[] {
  return Array.from({ length: chain.jointCount }, (_, k) => ({
    joint: k,
    massKg: uniform(rand, 1, 20),
    comInLinkM: [uniform(rand, -0.3, 0.3), uniform(rand, -0.3, 0.3), uniform(rand, -0.3, 0.3)] as const,
  }));
}

// ---------------------------------------------------------------------------------------------------------------

describe("pointHoldingTorqueInto and holdingTorqueInto", () => {
  const chain = compileChain(vertical2r(0.5, 0.3));
  const tip: LinkMass = { joint: 1, massKg: 10, comInLinkM: [0.3, 0, 0] };

  it("pointHoldingTorqueInto(2R vertical, 10 kg at the tip) gives CHECKS C14's τ at q = 0 and q = (30°, 45°)", () => {
    // CHECKS C14: τ1 = m g (a1 c1 + a2 c12), τ2 = m g a2 c12; tolerance 1e-9 relative.
    expectRelClose(tipTorque(chain, [0, 0], 10, FLOOR), [78.4532, 29.41995], 1e-9, "q = 0");
    expectRelClose(tipTorque(chain, [30 * DEG, 45 * DEG], 10, FLOOR), [50.0784835, 7.6144434], 1e-8, "q = (30°, 45°)");
  });

  it("holdingTorqueInto(2R vertical, the same 10 kg as a link mass of link 2) gives the same CHECKS C14 numbers", () => {
    const s = createScratch(chain),
      h = createHoldingScratch(chain),
      out = new Float64Array(2);
    forwardInto(chain, [30 * DEG, 45 * DEG], s);
    expectRelClose(holdingTorqueInto(out, chain, s, bodySetOf([tip]), FLOOR, h), [50.0784835, 7.6144434], 1e-8);
  });

  it("holdingTorqueInto on a ceiling mounting is the floor torque with the sign flipped (gravity reversed)", () => {
    // Ceiling: gravity along base +z (the base turned 180°); τ is linear in g, so τ_ceiling = −τ_floor.
    const ceiling = gravityInBase("ceiling");
    expect(ceiling).toEqual([0, 0, G]);
    const floor = tipTorque(chain, [30 * DEG, 45 * DEG], 10, FLOOR);
    expectRelClose(
      tipTorque(chain, [30 * DEG, 45 * DEG], 10, ceiling),
      Array.from(floor, (v) => -v),
      1e-12,
    );
  });

  const chains: [string, Chain][] = [
    ["generic 6R (CHECKS §0)", compileChain(generic6rDh())],
    ["6R with J3 driven from the horizontal (coupled)", compileChain(generic6rDrivenCoupledDh())],
    ["palletizer with a passive parallelogram joint", compileChain(palletizerPassiveFrames())],
  ];

  it.each(chains)(
    "holdingTorqueInto(%s) equals Σ J_bᵀ F_b computed with ml-matrix (reference path), all mountings",
    (_, c) => {
      const rand = mulberry32(1234);
      const links = randomLinks(c, rand);
      const s = createScratch(c),
        h = createHoldingScratch(c),
        out = new Float64Array(c.drivenCount),
        bodies = bodySetOf(links);
      for (const mounting of ["floor", "ceiling", "wall", "angled"] as const) {
        const g = gravityInBase(mounting);
        for (let trial = 0; trial < 4; trial++) {
          const q = Array.from({ length: c.drivenCount }, (_, j) => uniform(rand, ...drivenLimits(c, j)));
          forwardInto(c, q, s);
          expectClose(
            holdingTorqueInto(out, c, s, bodies, g, h),
            referenceLinkTorque(c, links, q, g),
            1e-9,
            `${mounting} trial ${trial}`,
          );
        }
      }
    },
  );

  it.each(chains)("holdingTorqueInto(%s) equals +∂V/∂q by central differences of the potential energy", (_, c) => {
    // Virtual work: the holding torque balances gravity, τ = +∂V/∂q with V = −Σ m_b g·p_b. h = 1e-6 rad; the
    // round-off of the difference is about ε·|V|/h ≈ 1e-8 N·m here, the truncation O(h²); tolerance 1e-6 N·m.
    const rand = mulberry32(99);
    const links = randomLinks(c, rand);
    const s = createScratch(c),
      hs = createHoldingScratch(c),
      out = new Float64Array(c.drivenCount),
      bodies = bodySetOf(links);
    const step = 1e-6;
    for (const mounting of ["floor", "angled"] as const) {
      const g = gravityInBase(mounting);
      for (let trial = 0; trial < 3; trial++) {
        const q = Array.from({ length: c.drivenCount }, (_, j) => uniform(rand, ...drivenLimits(c, j)));
        const fd = q.map((_, j) => {
          const qp = [...q],
            qm = [...q];
          qp[j] = qp[j]! + step;
          qm[j] = qm[j]! - step;
          return (potentialJ(c, links, qp, g) - potentialJ(c, links, qm, g)) / (2 * step);
        });
        forwardInto(c, q, s);
        expectClose(holdingTorqueInto(out, c, s, bodies, g, hs), fd, 1e-6, `${mounting} trial ${trial}`);
      }
    }
  });
});

describe("gravityInBase", () => {
  it("gravityInBase(mounting) follows the stated conventions: floor −z, ceiling +z, wall +x, angled 45° about y", () => {
    // Conventions of this project (module notes), not an outside source; the magnitude is standard gravity.
    expect(gravityInBase("floor")).toEqual([0, 0, -G]);
    expect(gravityInBase("wall")).toEqual([G, 0, 0]);
    expectClose(gravityInBase("angled"), [G * Math.SQRT1_2, 0, -G * Math.SQRT1_2], 1e-12);
  });

  it("gravityDirectionInBase(mounting) is the unit vector of gravityInBase: floor −z, ceiling +z, wall +x", () => {
    // The same conventions with |g| = 1; unit length checked by Pythagoras (x² + y² + z² = 1).
    expect(gravityDirectionInBase("floor")).toEqual([0, 0, -1]);
    expect(gravityDirectionInBase("ceiling")).toEqual([0, 0, 1]);
    expect(gravityDirectionInBase("wall")).toEqual([1, 0, 0]);
    const angled = gravityDirectionInBase("angled");
    expectClose(angled, [Math.SQRT1_2, 0, -Math.SQRT1_2], 1e-15);
    expectClose(Math.hypot(...angled), 1, 1e-15);
  });
});
