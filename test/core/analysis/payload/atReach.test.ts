/**
 * Tests of src/core/analysis/payload/atReach.ts (payloadAtReach). Outside references:
 * - CHECKS C14 (static torques τ = Jᵀ F; 2R in a vertical plane; payload at reach m_max(L) = τ_rated / (g L));
 *   Craig, Introduction to Robotics, 3rd ed., ch. 5 (static forces); Spong, Hutchinson & Vidyasagar, ch. 4.
 * - Every demo arm's rows re-checked by forward kinematics and Jᵀ F multiplied out with ml-matrix.
 * Every chain here is an invented round-number chain.
 */
import { fileURLToPath } from "node:url";
import { Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../../src/catalog/load";
import type { ArmKinematicsInput, Chain } from "../../../../src/core";
import {
  compileChain,
  createScratch,
  forwardInto,
  jacobianInto,
  STANDARD_GRAVITY_M_PER_S2,
} from "../../../../src/core";
import { PAYLOAD_STATEMENT, payloadAtReach, payloadInputOf } from "../../../../src/core/analysis/payload";
import { gravityInBase, type LinkMass } from "../../../../src/core/kinematics/statics";
import { expectClose, expectRelClose } from "../../../helpers/expectClose";
import { hasNonFinite, referenceLinkTorque, testPayload, vertical2r } from "../../../helpers/statics";
import { generic6rDh } from "../../../helpers/testArms";

const G = STANDARD_GRAVITY_M_PER_S2;
const DEG = Math.PI / 180;

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

describe("payloadAtReach", () => {
  it("payloadAtReach(single horizontal axis, massless) gives m_max(L) = τ_rated / (g L), capped at the rated payload", () => {
    // CHECKS C14, payload at reach. τ_rated = 100 N·m, L = 0.5 m; rated payload 60 kg caps the short reaches
    // (100 / (g · 0.17) = 59.98 kg, so rows below 170 mm are capped).
    const chain = singleAxis(0.5, 100);
    const r = payloadAtReach(chain, testPayload(60), { offsetsMm: [0], reachToleranceMm: 1e-6 });
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
    const r = payloadAtReach(chain, testPayload(60, [link]), { offsetsMm: [0], reachToleranceMm: 1e-6 });
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
    const r = payloadAtReach(chain, testPayload(50), { offsetsMm: [0] });
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
    const r = payloadAtReach(chain, testPayload(1000), { reachToleranceMm: 1e-6 });
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
    const r = payloadAtReach(chain, testPayload(5, [{ joint: 0, massKg: 10, comInLinkM: [0.5, 0, 0] }]), {
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
    const floor = payloadAtReach(chain, testPayload(50, [], [], ["floor"]), { offsetsMm: [0] });
    const ceiling = payloadAtReach(chain, testPayload(50, [], [], ["ceiling"]), { offsetsMm: [0] });
    expect(ceiling.rows.map((x) => x.reachMm)).toEqual(floor.rows.map((x) => x.reachMm));
    expectRelClose(
      ceiling.rows.map((x) => x.payloadKg),
      floor.rows.map((x) => x.payloadKg),
      1e-6,
    );
  });

  it("payloadAtReach says which basis it used: as-rated without torques, upper bound with an unrated loaded joint", () => {
    const noTorque = compileChain(vertical2r(0.5, 0.3));
    const asRated = payloadAtReach(noTorque, testPayload(8), { offsetsMm: [0, 100] });
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
    const upper = payloadAtReach(partly, testPayload(8, [link]), { offsetsMm: [0] });
    expect(upper.basis).toBe("upper-bound-missing-torques");
    expect(upper.notes.join(" ")).toContain("j2");
    expect(upper.statement).toBe(PAYLOAD_STATEMENT);
    expect(PAYLOAD_STATEMENT).toMatch(/static/i);
    expect(PAYLOAD_STATEMENT).toMatch(/acceleration/);
    expect(PAYLOAD_STATEMENT).toMatch(/tooling/);
  });

  it("payloadAtReach rejects bad options with a RangeError naming the value (STYLE C9)", () => {
    const chain = singleAxis(0.5, 100);
    expect(() => payloadAtReach(chain, testPayload(5), { reachStepMm: 0 })).toThrow(/invalid reachStepMm: 0/);
    expect(() => payloadAtReach(chain, testPayload(5), { offsetsMm: [NaN] })).toThrow(RangeError);
  });
});

// ---------------------------------------------------------------------------------------------------------------
// Every demo arm

const ARMS_DIR = process.env.ARMDEX_ARMS_DIR ?? fileURLToPath(new URL("../../../../arms", import.meta.url));
const { arms } = await loadArms([ARMS_DIR]);

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
});
