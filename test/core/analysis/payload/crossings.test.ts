/**
 * Tests of src/core/analysis/payload/crossings.ts (edgeCrossings): the postures found on each row's reach of an
 * invented single horizontal axis (link L = 0.5 m along x, axis along base −y, floor mounting), recorded as each
 * row's worst, against hand-worked statics (CHECKS C14; Craig, Introduction to Robotics, 3rd ed., ch. 5, from
 * memory). At reach r the arm is at θ = ±acos(r / L), the payload lever is r and a link mass m_l with its centre of
 * mass c along the link has lever c·cos θ = c·r / L, so
 *   payload(r) = (τ_rated − m_l·g·c·r / L) / (g·r),
 * and the link alone overloads the joint where m_l·g·c·r / L > τ_rated.
 */
import { describe, expect, it } from "vitest";
import { compileChain, STANDARD_GRAVITY_M_PER_S2, type Chain } from "../../../../src/core";
import { DEFAULT_PAYLOAD_AT_REACH } from "../../../../src/core/analysis/payload/atReachTypes";
import { edgeCrossings } from "../../../../src/core/analysis/payload/crossings";
import { chainFacts } from "../../../../src/core/analysis/payload/searchPlan";
import { MountingSearch } from "../../../../src/core/analysis/payload/searchState";
import { bodySetOf, type LinkMass } from "../../../../src/core/kinematics/statics";
import { testPayload } from "../../../helpers/statics";

const G = STANDARD_GRAVITY_M_PER_S2;
const L = 0.5;
const TAU = 100; // N·m

function singleAxis(): Chain {
  return compileChain({
    convention: "frames",
    joints: [
      {
        name: "j1",
        kind: "revolute",
        origin: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
        axis: [0, -1, 0],
        rangeDeg: [-90, 90],
        ratedTorqueNm: TAU,
      },
    ],
    flange: { xyzMm: [L * 1000, 0, 0], rpyDeg: [0, 0, 0] },
  });
}

/** Sweep, rows and the crossing stage, as atReach.ts runs them (without the later refinement stages). */
function crossed(links: LinkMass[]): MountingSearch {
  const chain = singleAxis();
  const ms = new MountingSearch(
    {
      chain,
      input: testPayload(1000, links),
      o: { ...DEFAULT_PAYLOAD_AT_REACH, offsetsMm: [0], reachToleranceMm: 1e-6 },
      bodies: bodySetOf(links),
      facts: chainFacts(chain),
      anyRating: true,
    },
    "floor",
  );
  ms.sweepNodes(false);
  expect(ms.startRows()).toBe(true);
  edgeCrossings(ms);
  return ms;
}

describe("edgeCrossings: each row's posture on its reach, against hand statics of one horizontal axis", () => {
  it("massless link: payload τ / (g·r) at every row from 50 mm to L, posture on the reach circle", () => {
    const ms = crossed([]);
    // Rows from reach 0 (θ = ±90°) to L = 500 mm in 50 mm steps.
    expect(ms.kFirst + 0).toBe(0); // + 0: the first row index may come out as −0
    expect(ms.nRows).toBe(11);
    for (let row = 1; row < ms.nRows; row++) {
      const r = (ms.kFirst + row) * 0.05;
      expect(ms.bestLimit[row]).toBe(0);
      expect(ms.bestOwn[row]).toBe(0);
      expect(ms.best[row]! / (TAU / (G * r))).toBeCloseTo(1, 6);
      // The flange at height ±√(L² − r²) and the joint at ±acos(r / L) (which of the two postures is recorded is
      // the search's choice: the payload is the same for both).
      expect(Math.abs(ms.bestHeight[row]!)).toBeCloseTo(Math.sqrt(L * L - r * r), 6);
      expect(Math.abs(ms.bestQ[row]!)).toBeCloseTo(Math.acos(r / L), 4);
    }
  });

  it("link of 4 kg with its centre 0.2 m out: payload (τ − m·g·c·r/L) / (g·r)", () => {
    const ms = crossed([{ joint: 0, massKg: 4, comInLinkM: [0.2, 0, 0] }]);
    for (let row = 1; row < ms.nRows; row++) {
      const r = (ms.kFirst + row) * 0.05;
      const expected = (TAU - 4 * G * 0.2 * (r / L)) / (G * r);
      expect(ms.best[row]! / expected).toBeCloseTo(1, 6);
      expect(ms.bestOwn[row]).toBe(0);
    }
  });

  it("link of 60 kg: beyond r = τ·L / (m·g·c) = 425 mm the arm cannot hold itself (0 kg, own weight)", () => {
    const ms = crossed([{ joint: 0, massKg: 60, comInLinkM: [0.2, 0, 0] }]);
    const rOwn = (TAU * L) / (60 * G * 0.2); // 0.4248 m
    for (let row = 1; row < ms.nRows; row++) {
      const r = (ms.kFirst + row) * 0.05;
      if (r > rOwn) {
        expect([ms.best[row], ms.bestOwn[row], ms.bestLimit[row]]).toEqual([0, 1, 0]);
      } else {
        expect(ms.bestOwn[row]).toBe(0);
        expect(ms.best[row]! / ((TAU - 60 * G * 0.2 * (r / L)) / (G * r))).toBeCloseTo(1, 6);
      }
    }
  });
});
