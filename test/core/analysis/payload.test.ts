/**
 * Tests of src/core/analysis/payload.ts. Outside references:
 * - CHECKS C14 (static torques τ = Jᵀ F; 2R in a vertical plane; payload at reach m_max(L) = τ_rated / (g L));
 *   Craig, Introduction to Robotics, 3rd ed., ch. 5 (static forces); Spong, Hutchinson & Vidyasagar, ch. 4.
 * - CHECKS C15 (M = m g L; L_max = M_rated / (m g); J = m L² for a point mass).
 * - Holding torque = +∂V/∂q with V the gravitational potential energy (principle of virtual work), checked by
 *   central differences of V computed from forwardInto/linkFrameInto positions only.
 * - Jᵀ F with the geometric Jacobian of each centre of mass (jacobianInto's kinematic Jacobian, columns of distal
 *   joints zeroed, times the coupling G), multiplied out with ml-matrix: the reference path for the fast kernel.
 * - Conventions of the load diagram (levers from the wrist centre; Lz from the flange face): common practice, no
 *   source.
 * Every chain here is an invented round-number chain.
 */
import { fileURLToPath } from "node:url";
import { Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../src/catalog/load";
import type { ArmKinematicsInput, Chain } from "../../../src/core";
import {
  compileChain,
  createScratch,
  forwardInto,
  jacobianInto,
  linkFrameInto,
  STANDARD_GRAVITY_M_PER_S2,
} from "../../../src/core";
import {
  bodySetOf,
  createHoldingScratch,
  gravityInBase,
  holdingTorqueInto,
  loadDiagram,
  loadMomentNm,
  maxLeverM,
  PAYLOAD_STATEMENT,
  payloadAtReach,
  payloadInputOf,
  payloadWarnings,
  pointHoldingTorqueInto,
  wristLeverOf,
  type LinkMass,
  type Mounting,
  type PayloadInput,
  type WristRating,
} from "../../../src/core/analysis/payload";
import { expectClose, expectRelClose } from "../../helpers/expectClose";
import { mulberry32, uniform } from "../../helpers/prng";
import { generic6rDh, generic6rDrivenCoupledDh, palletizerPassiveFrames } from "../../helpers/testArms";

const G = STANDARD_GRAVITY_M_PER_S2;
const DEG = Math.PI / 180;
const FLOOR = [0, 0, -G] as const;

// ---------------------------------------------------------------------------------------------------------------
// Invented test chains

/**
 * 2R in a vertical plane: both axes along base −y (horizontal), so positive q raises the arm:
 * p = (a1 c1 + a2 c12, 0, a1 s1 + a2 s12). Frames convention; link frame of j2 = its motion frame at the elbow.
 */
function vertical2r(a1M: number, a2M: number, limitsDeg: readonly [number, number] = [-180, 180]): ArmKinematicsInput {
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

/** One horizontal axis (base −y) through the origin and a link of length L along x; rated torque given. */
function singleAxis(lM: number, ratedTorqueNm: number, rangeDeg: readonly [number, number] = [-90, 90]): Chain {
  return compileChain({
    convention: "frames",
    joints: [
      {
        name: "j1",
        kind: "revolute",
        origin: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
        axis: [0, -1, 0],
        rangeDeg: [...rangeDeg],
        ratedTorqueNm,
      },
    ],
    flange: { xyzMm: [lM * 1000, 0, 0], rpyDeg: [0, 0, 0] },
  });
}

function withRatings(input: ArmKinematicsInput, torquesNm: readonly number[]): Chain {
  return compileChain({ ...input, joints: input.joints.map((j, i) => ({ ...j, ratedTorqueNm: torquesNm[i] })) });
}

function payload(
  ratedPayloadKg: number,
  links: readonly LinkMass[] = [],
  wrist: readonly WristRating[] = [],
  mountings: readonly Mounting[] = ["floor"],
): PayloadInput {
  return { ratedPayloadKg, mountings, wrist, links, notes: [] };
}

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

/** Reference path: τ = Σ_b (J_kin,b · G)ᵀ · (−m_b g), J_kin,b with the columns of joints distal to b zeroed (ml-matrix). */
function referenceLinkTorque(
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
});

describe("payloadAtReach", () => {
  it("payloadAtReach(single horizontal axis, massless) gives m_max(L) = τ_rated / (g L), capped at the rated payload", () => {
    // CHECKS C14, payload at reach. τ_rated = 100 N·m, L = 0.5 m; rated payload 60 kg caps the short reaches
    // (100 / (g · 0.17) = 59.98 kg, so rows below 170 mm are capped).
    const chain = singleAxis(0.5, 100);
    const r = payloadAtReach(chain, payload(60), { offsetsMm: [0], reachToleranceMm: 1e-6 });
    expect(r.basis).toBe("upper-bound-no-link-masses");
    const reaches = r.rows.map((row) => row.reachMm);
    expect(reaches).toContain(100);
    expect(reaches).toContain(450);
    for (const row of r.rows) {
      const expected = Math.min(60, 100 / (G * (row.reachMm / 1000)));
      if (row.reachMm === 0) continue;
      expectRelClose(row.payloadKg, expected, 1e-7, `reach ${row.reachMm} mm`);
      if (expected < 60) {
        expect(row.limitingJoint).toBe("j1");
        expect(row.limitedBy).toBe("joint-rating");
      } else {
        expect(row.limitedBy).toBe("rated-payload");
        expect(row.limitingJoint).toBeNull();
      }
    }
  });

  it("payloadAtReach(single axis with a link mass) drops by link_mass · com_lever / L (CHECKS C14)", () => {
    // τ_rated = m g L cos q + m_L g c cos q → m = τ_rated / (g r) − m_L c / L with r = L cos q: 4 kg at c = 0.2 m.
    const chain = singleAxis(0.5, 100);
    const link: LinkMass = { joint: 0, massKg: 4, comInLinkM: [0.2, 0, 0] };
    const r = payloadAtReach(chain, payload(60, [link]), { offsetsMm: [0], reachToleranceMm: 1e-6 });
    expect(r.basis).toBe("computed");
    for (const row of r.rows) {
      if (row.reachMm < 200) continue;
      expectRelClose(
        row.payloadKg,
        100 / (G * (row.reachMm / 1000)) - (4 * 0.2) / 0.5,
        1e-7,
        `reach ${row.reachMm} mm`,
      );
    }
  });

  it("payloadAtReach(2R vertical, massless) finds the worst posture: m(r) = min(τ1/(g r), τ2/(g a2)) (forearm level)", () => {
    // Closed form (statics, CHECKS C14): τ1 = m g r for every posture at reach r (axis 1 on the base z axis);
    // τ2 = m g (r − a1 c1), largest when the forearm is level, |τ2| = m g a2, and a level forearm reaches every
    // r in [0, a1 + a2] here. τ1 = 100, τ2 = 50 N·m → J2 limits below 600 mm, J1 beyond. Tolerance 2e-3 relative:
    // the worst posture comes from a grid search with local refinement.
    const chain = withRatings(vertical2r(0.5, 0.3), [100, 50]);
    const r = payloadAtReach(chain, payload(50), { offsetsMm: [0] });
    expect(r.rows.length).toBeGreaterThanOrEqual(15);
    for (const row of r.rows) {
      if (row.reachMm === 0 || row.reachMm > 750) continue;
      const j1 = 100 / (G * (row.reachMm / 1000)),
        j2 = 50 / (G * 0.3);
      expectRelClose(row.payloadKg, Math.min(50, j1, j2), 2e-3, `reach ${row.reachMm} mm`);
      if (Math.abs(j1 - j2) > 2e-3 * j2) expect(row.limitingJoint).toBe(j1 < j2 ? "j1" : "j2");
      // The reported posture lies at the row's reach (independent FK).
      const s = createScratch(chain);
      const f = forwardInto(
        chain,
        row.jointsDegOrMm!.map((d) => d * DEG),
        s,
      );
      expect(Math.abs(Math.hypot(f[3]!, f[7]!) * 1000 - row.reachMm)).toBeLessThanOrEqual(0.5);
    }
  });

  it("payloadAtReach(generic 6R, tool down) is set by axis 2 reaching over the back: m = τ2 / (g (r + a1))", () => {
    // CHECKS §0 generic 6R (a1 = 0.2 m, no sideways offsets), all ranges ±180°. With the tool pointing down the CG
    // lies on the vertical through the wrist centre, in the arm's plane; axis 2 is horizontal at radius a1 from
    // axis 1, so its lever is |x − a1| (CHECKS C14, horizontal axis 2): r − a1 in front, r + a1 over the back, which
    // every row up to 1.8 m can reach. Only J2 is rated low (500 N·m); the axes through the wrist centre carry no
    // payload torque. Rated payload 1000 kg. The CG offsets lie on the same vertical: same figure for each.
    const base = generic6rDh();
    const chain = compileChain({
      ...base,
      joints: base.joints.map((j, i) => ({ ...j, ratedTorqueNm: i === 1 ? 500 : 1e6 })),
    });
    const r = payloadAtReach(chain, payload(1000), { reachToleranceMm: 1e-6 });
    expect(r.mountings[0]!.toolDirection).toBe("along-gravity");
    const rows = r.rows.filter((x) => x.reachMm <= 1800);
    expect(rows.length).toBeGreaterThanOrEqual(3 * 36);
    for (const row of rows) {
      expectRelClose(
        row.payloadKg,
        Math.min(1000, 500 / (G * (row.reachMm / 1000 + 0.2))),
        1e-7,
        `reach ${row.reachMm} mm, offset ${row.offsetMm} mm`,
      );
      expect(row.limitingJoint).toBe("j2");
    }
  });

  it("payloadAtReach(single axis too weak for its own link) gives 0 kg, limited by own weight, beyond m_L g c cos q = τ", () => {
    // Link 10 kg at c = 0.5 m = L, rated 30 N·m: the link alone needs 10 g r N·m at reach r, more than 30 N·m beyond
    // r = 30 / (10 g) = 0.306 m (statics, CHECKS C14).
    const chain = singleAxis(0.5, 30);
    const r = payloadAtReach(chain, payload(5, [{ joint: 0, massKg: 10, comInLinkM: [0.5, 0, 0] }]), {
      offsetsMm: [0],
      reachToleranceMm: 1e-6,
    });
    for (const row of r.rows) {
      if (row.reachMm <= 300) {
        expectRelClose(
          row.payloadKg,
          Math.min(5, row.reachMm === 0 ? 5 : 30 / ((G * row.reachMm) / 1000) - 10),
          1e-7,
          `reach ${row.reachMm} mm`,
        );
      } else {
        expect(row.payloadKg).toBe(0);
        expect(row.limitedBy).toBe("own-weight");
        expect(row.limitingJoint).toBe("j1");
      }
    }
  });

  it("payloadAtReach(2R vertical) on the ceiling gives the floor's magnitudes (mirror-symmetric posture set)", () => {
    // Ceiling flips gravity; the joint ranges are symmetric, so every floor posture has a mirror posture with the
    // same |τ| under the reversed gravity (CHECKS C14 identity, linear in g).
    const chain = withRatings(vertical2r(0.5, 0.3), [100, 50]);
    const floor = payloadAtReach(chain, payload(50, [], [], ["floor"]), { offsetsMm: [0] });
    const ceiling = payloadAtReach(chain, payload(50, [], [], ["ceiling"]), { offsetsMm: [0] });
    expect(ceiling.rows.map((x) => x.reachMm)).toEqual(floor.rows.map((x) => x.reachMm));
    expectRelClose(
      ceiling.rows.map((x) => x.payloadKg),
      floor.rows.map((x) => x.payloadKg),
      1e-6,
    );
  });

  it("payloadAtReach says which basis it used: as-rated without torques, upper bound with an unrated loaded joint", () => {
    const noTorque = compileChain(vertical2r(0.5, 0.3));
    const asRated = payloadAtReach(noTorque, payload(8), { offsetsMm: [0, 100] });
    expect(asRated.basis).toBe("as-rated");
    expect(asRated.rows.length).toBeGreaterThan(0);
    for (const row of asRated.rows) {
      expect(row.payloadKg).toBe(8);
      expect(row.limitedBy).toBe("as-rated");
    }
    const partly = compileChain({
      ...vertical2r(0.5, 0.3),
      joints: vertical2r(0.5, 0.3).joints.map((j, i) => (i === 0 ? { ...j, ratedTorqueNm: 100 } : j)),
    });
    const link: LinkMass = { joint: 0, massKg: 1, comInLinkM: [0.25, 0, 0] };
    const upper = payloadAtReach(partly, payload(8, [link]), { offsetsMm: [0] });
    expect(upper.basis).toBe("upper-bound-missing-torques");
    expect(upper.notes.join(" ")).toContain("j2");
    expect(upper.statement).toBe(PAYLOAD_STATEMENT);
    expect(PAYLOAD_STATEMENT).toMatch(/static/i);
    expect(PAYLOAD_STATEMENT).toMatch(/acceleration/);
    expect(PAYLOAD_STATEMENT).toMatch(/tooling/);
  });

  it("payloadAtReach rejects bad options with a RangeError naming the value (STYLE C9)", () => {
    const chain = singleAxis(0.5, 100);
    expect(() => payloadAtReach(chain, payload(5), { reachStepMm: 0 })).toThrow(/invalid reachStepMm: 0/);
    expect(() => payloadAtReach(chain, payload(5), { offsetsMm: [NaN] })).toThrow(RangeError);
  });
});

describe("loadMomentNm and maxLeverM", () => {
  it("loadMomentNm(5 kg, 0.1 m) = 4.903325 N·m and maxLeverM(10 N·m, 8 kg) = 0.1274645 m (CHECKS C15)", () => {
    expectClose(loadMomentNm(5, 0.1), 4.903325, 1e-12);
    // CHECKS gives L_max to 7 digits: tolerance half a unit of the last digit.
    expectClose(maxLeverM(10, 8), 0.1274645, 5e-8);
  });
});

describe("loadDiagram", () => {
  const roll = (momentNm: number, inertiaKgM2 = NaN): WristRating => ({
    driven: 5,
    joint: "J6",
    momentNm,
    inertiaKgM2,
    lever: { kind: "roll", pivotBehindFlangeM: 0, pivotOffAxisM: 0, basis: "flange-axis" },
  });
  const bend = (momentNm: number, dM: number, inertiaKgM2 = NaN): WristRating => ({
    driven: 4,
    joint: "J5",
    momentNm,
    inertiaKgM2,
    lever: { kind: "bend", pivotBehindFlangeM: dM, pivotOffAxisM: 0, basis: "wrist-centre" },
  });

  it("loadDiagram(roll rating 10 N·m): the 8 kg curve meets the Lxy axis at L_max = 127.4645 mm (CHECKS C15)", () => {
    const d = loadDiagram(payload(10, [], [roll(10)]), { massesKg: [8] });
    const curve = d.curves[0]!;
    expect(curve.massKg).toBe(8);
    expectClose(curve.pointsMm[0]![0], 127.4645, 5e-5);
    expect(curve.pointsMm[0]![1]).toBe(0);
    // A roll rating does not depend on Lz: the curve runs straight up and leaves the table.
    expect(curve.openEnded).toBe(true);
    for (const [lxy] of curve.pointsMm) expectClose(lxy, (1000 * 10) / (8 * G), 1e-9);
  });

  it("loadDiagram(bend rating, wrist centre d = 50 mm behind the flange): every vertex of the 8 kg curve has m g L = M", () => {
    // Lever from the wrist centre: L = √((d + Lz)² + Lxy²) (common practice, no source). M = 10 N·m, m = 8 kg:
    // L = 0.1274645 m (CHECKS C15), so the curve is a circle of that radius about (0, −d), ending at Lz = L − d.
    const d = loadDiagram(payload(10, [], [bend(10, 0.05)]), { massesKg: [8] });
    const pts = d.curves[0]!.pointsMm;
    expect(pts.length).toBeGreaterThan(10);
    for (const [lxyMm, lzMm] of pts)
      expectClose(loadMomentNm(8, Math.hypot(lxyMm / 1000, 0.05 + lzMm / 1000)), 10, 1e-9);
    expectClose(pts[pts.length - 1]!, [0, 1000 * (10 / (8 * G) - 0.05)], 1e-9);
    expect(d.curves[0]!.openEnded).toBe(false);
  });

  it("loadDiagram grid cells equal min(rated, M/(g L), J/L²) by hand, with the limiting joint", () => {
    // J5: M = 10 N·m, J = 0.2 kg·m², d = 0.1 m; J6: M = 6 N·m. Rated 12 kg. Cell (Lxy, Lz) = (50, 100) mm:
    // J5 L = √(0.2² + 0.05²) = 0.20616 m → M: 4.946 kg, J: 4.706 kg; J6 L = 0.05 m → 12.24 kg → 4.706 kg (J5).
    const d = loadDiagram(payload(12, [], [bend(10, 0.1, 0.2), roll(6)]), { stepMm: 50, extentMm: 300 });
    const grid = d.grid!;
    expect(grid.lxyMm).toEqual([0, 50, 100, 150, 200, 250, 300]);
    const at = (ix: number, iz: number) => grid.allowedKg[ix + iz * grid.lxyMm.length]!;
    const lever5 = Math.hypot(0.2, 0.05);
    expectClose(at(1, 2), Math.min(10 / (G * lever5), 0.2 / lever5 ** 2), 1e-12);
    expect(d.joints[grid.limitingIndex[1 + 2 * 7]!]!.joint).toBe("J5");
    // (0, 0): J5 lever 0.1 m → min(10.197, 20) kg; J6 lever 0 → unlimited.
    expectClose(at(0, 0), 10 / (G * 0.1), 1e-12);
    expectClose(d.wristAllowsAtZeroOffsetKg!, 10 / (G * 0.1), 1e-12);
    // (300, 0): J6 lever 0.3 → 2.039 kg; J5 lever √(0.1² + 0.3²) = 0.316 → M: 3.224, J: 2.0 kg → J5 inertia, 2.0 kg.
    expectClose(at(6, 0), Math.min(6 / (G * 0.3), 10 / (G * Math.hypot(0.1, 0.3)), 0.2 / (0.1 ** 2 + 0.3 ** 2)), 1e-12);
    for (const v of grid.allowedKg) expect(v).toBeLessThanOrEqual(12);
  });

  it("loadDiagram without wrist ratings has basis as-rated and no invented figures", () => {
    const d = loadDiagram(payload(7));
    expect(d.basis).toBe("as-rated");
    expect(d.grid).toBeNull();
    expect(d.curves).toEqual([]);
    expect(d.statement).toBe(PAYLOAD_STATEMENT);
  });
});

describe("payloadWarnings", () => {
  it("payloadWarnings flags a rated payload beyond what the wrist moment allows at zero offset (M / (g d))", () => {
    // d = 0.1 m, M = 10 N·m → 10.197 kg at the flange centre (CHECKS C15 formula).
    const wrist = [
      {
        driven: 4,
        joint: "J5",
        momentNm: 10,
        inertiaKgM2: NaN,
        lever: { kind: "bend", pivotBehindFlangeM: 0.1, pivotOffAxisM: 0, basis: "wrist-centre" },
      } as const,
    ];
    const w = payloadWarnings(payload(12, [], wrist));
    expect(w).toHaveLength(1);
    expect(w[0]!.code).toBe("rated-payload-beyond-wrist-moment");
    expect(w[0]!.joint).toBe("J5");
    expectClose(w[0]!.allowedKg, 10 / (G * 0.1), 1e-12);
    expect(payloadWarnings(payload(10, [], wrist))).toEqual([]);
  });
});

describe("wristLeverOf and payloadInputOf", () => {
  it("wristLeverOf(generic 6R): axes 4 and 5 bend about the wrist centre d6 = 0.1 m behind the flange; axis 6 rolls", () => {
    // CHECKS §0 generic 6R: spherical wrist, flange d6 = 0.1 m beyond the wrist centre along the flange axis.
    const chain = compileChain(generic6rDh());
    for (const k of [3, 4]) {
      const lever = wristLeverOf(chain, k);
      expect(lever).toEqual({ kind: "bend", pivotBehindFlangeM: 0.1, pivotOffAxisM: 0, basis: "wrist-centre" });
    }
    expect(wristLeverOf(chain, 5)).toEqual({
      kind: "roll",
      pivotBehindFlangeM: 0,
      pivotOffAxisM: 0,
      basis: "flange-axis",
    });
  });

  it("payloadInputOf converts names to indices and mm to m, and rejects unknown joints", () => {
    const chain = compileChain(generic6rDh());
    const input = payloadInputOf(
      {
        ratedPayloadKg: 20,
        mountings: ["floor"],
        wrist: { momentNm: { j5: 40 }, inertiaKgM2: { j5: 1, j6: 0.5 } },
        links: [{ after: "j2", massKg: 30, comMm: [-500, 0, 100] }],
      },
      chain,
    );
    expect(input.wrist.map((w) => [w.joint, w.driven])).toEqual([
      ["j5", 4],
      ["j6", 5],
    ]);
    expect(input.wrist[1]!.momentNm).toBeNaN();
    expect(input.links).toEqual([{ joint: 1, massKg: 30, comInLinkM: [-0.5, 0, 0.1] }]);
    expect(() =>
      payloadInputOf(
        { ratedPayloadKg: 1, mountings: ["floor"], links: [{ after: "nope", massKg: 1, comMm: [0, 0, 0] }] },
        chain,
      ),
    ).toThrow(/invalid joint name: nope/);
  });
});

// ---------------------------------------------------------------------------------------------------------------
// Every demo arm

const ARMS_DIR = process.env.ARMDEX_ARMS_DIR ?? fileURLToPath(new URL("../../../arms", import.meta.url));
const { arms } = await loadArms([ARMS_DIR]);

/** True when some number anywhere in the value is NaN or infinite. */
function hasNonFinite(value: unknown): boolean {
  if (typeof value === "number") return !Number.isFinite(value);
  if (Array.isArray(value)) return value.some(hasNonFinite);
  if (value !== null && typeof value === "object") return Object.values(value).some(hasNonFinite);
  return false;
}

describe("payload analyses on every demo arm", () => {
  it("loads at least one demo arm", () => {
    expect(arms.length).toBeGreaterThanOrEqual(1);
  });

  it.each(arms.map((a) => [a.id, a] as const))(
    "payloadAtReach(%s): 0 ≤ payloadKg ≤ rated, finite, rows for every mounting",
    (_, arm) => {
      const input = payloadInputOf(arm.spec, arm.chain);
      const r = payloadAtReach(arm.chain, input);
      expect(hasNonFinite(r)).toBe(false);
      expect(r.statement).toBe(PAYLOAD_STATEMENT);
      expect(r.mountings.map((x) => x.mounting)).toEqual([...arm.spec.mountings]);
      for (const mounting of arm.spec.mountings)
        expect(r.rows.filter((x) => x.mounting === mounting).length).toBeGreaterThan(0);
      for (const row of r.rows) {
        expect(row.payloadKg).toBeGreaterThanOrEqual(0);
        expect(row.payloadKg).toBeLessThanOrEqual(arm.spec.ratedPayloadKg);
        expect(row.reachMm % 50).toBe(0);
        expect([0, 100, 200]).toContain(row.offsetMm);
      }
    },
  );

  it.each(arms.map((a) => [a.id, a] as const))(
    "payloadAtReach(%s): at each reported posture the torques, checked by Jᵀ F, stay within the ratings",
    (_, arm) => {
      // Independent re-check of every row: FK of the reported posture (reach within the 0.5 mm tolerance, tool axis
      // along gravity where the wrist orients it), then τ = Σ J_bᵀ F_b (reference path above) plus the payload's
      // Jᵀ F at the CG; every rated joint within |τ| ≤ rating, and the reported torque limit binds on its joint.
      const chain = arm.chain,
        m = chain.drivenCount;
      const input = payloadInputOf(arm.spec, chain);
      const r = payloadAtReach(chain, input);
      const s = createScratch(chain);
      for (const row of r.rows) {
        if (!row.jointsDegOrMm || row.torqueLimitKg === null) continue;
        const report = r.mountings.find((x) => x.mounting === row.mounting)!;
        const g = gravityInBase(row.mounting);
        const q = row.jointsDegOrMm.map((v, j) => (chain.isPrismatic[chain.drivenJoint[j]!] ? v / 1000 : v * DEG));
        const f = forwardInto(chain, q, s);
        expect(Math.abs(Math.hypot(f[3]!, f[7]!) * 1000 - row.reachMm)).toBeLessThanOrEqual(0.5 + 1e-9);
        if (report.toolDirection === "along-gravity")
          expectClose(
            [f[2]!, f[6]!, f[10]!],
            g.map((v) => v / G),
            1e-6,
            "tool along gravity",
          );
        const cg = [0, 1, 2].map((i) => f[4 * i + 3]! + (row.offsetMm / 1000) * f[4 * i + 2]!);
        const links = referenceLinkTorque(chain, input.links, q, g);
        jacobianInto(new Float64Array(6 * m), chain, s, cg[0]!, cg[1]!, cg[2]!);
        const jPay = Matrix.from1DArray(6, chain.jointCount, Array.from(s.jKin)).mmul(
          Matrix.from1DArray(chain.jointCount, m, Array.from(chain.couplingGain)),
        );
        const perKg = jPay
          .transpose()
          .mmul(Matrix.columnVector([-g[0], -g[1], -g[2], 0, 0, 0]))
          .to1DArray();
        const atLimit = row.torqueLimitKg;
        for (let j = 0; j < m; j++) {
          const rated = chain.ratedEffortSi[j]!;
          if (!(rated > 0)) continue;
          const tau = links[j]! + atLimit * perKg[j]!;
          expect(Math.abs(tau)).toBeLessThanOrEqual(rated * (1 + 1e-9));
          if (chain.jointNames[chain.drivenJoint[j]!] === row.torqueLimitJoint && row.limitedBy !== "own-weight")
            expectRelClose(Math.abs(tau), rated, 1e-9, `${row.mounting} ${row.reachMm} mm`);
        }
      }
    },
  );

  it.each(arms.map((a) => [a.id, a] as const))(
    "loadDiagram(%s): allowed mass within [0, rated], not increasing with the offset",
    (_, arm) => {
      const input = payloadInputOf(arm.spec, arm.chain);
      const d = loadDiagram(input);
      expect(hasNonFinite(d)).toBe(false);
      if (!d.grid) {
        expect(d.basis).toBe("as-rated");
        return;
      }
      const nx = d.grid.lxyMm.length;
      d.grid.allowedKg.forEach((v, i) => {
        expect(v).toBeGreaterThanOrEqual(0);
        expect(v).toBeLessThanOrEqual(arm.spec.ratedPayloadKg);
        // Levers grow with Lxy and Lz (d ≥ 0 on every demo arm), so the allowed mass cannot grow.
        if (i % nx > 0) expect(v).toBeLessThanOrEqual(d.grid!.allowedKg[i - 1]! * (1 + 1e-12));
        if (i >= nx) expect(v).toBeLessThanOrEqual(d.grid!.allowedKg[i - nx]! * (1 + 1e-12));
      });
    },
  );
});
