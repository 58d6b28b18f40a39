/**
 * Tests of src/core/analysis/payload/rows.ts (mountingRows, mountingReport, loadedUnrated) on a search state filled
 * by hand with the statics of an invented single horizontal axis (link L = 0.5 m, τ_rated = 100 N·m, floor
 * mounting): at reach r the posture is θ = acos(r / L), the flange height √(L² − r²) and the payload a massless link
 * allows τ_rated / (g·r) (CHECKS C14; Craig, Introduction to Robotics, 3rd ed., ch. 5, from memory). The rows must
 * cap it at the rated payload (60 kg: reaches below τ / (g·60) = 170 mm are capped), name the limiting joint,
 * convert to mm and deg, keep inner gaps as unreachable and drop unreached rows at the ends.
 */
import { describe, expect, it } from "vitest";
import { compileChain, STANDARD_GRAVITY_M_PER_S2, type Chain } from "../../../../src/core";
import { DEFAULT_PAYLOAD_AT_REACH } from "../../../../src/core/analysis/payload/atReachTypes";
import { loadedUnrated, mountingReport, mountingRows } from "../../../../src/core/analysis/payload/rows";
import { chainFacts } from "../../../../src/core/analysis/payload/searchPlan";
import { MountingSearch } from "../../../../src/core/analysis/payload/searchState";
import { bodySetOf } from "../../../../src/core/kinematics/statics";
import { testPayload } from "../../../helpers/statics";

const G = STANDARD_GRAVITY_M_PER_S2;
const L = 0.5;
const TAU = 100;
const RATED_KG = 60;

function singleAxis(rated: boolean): Chain {
  return compileChain({
    convention: "frames",
    joints: [
      {
        name: "j1",
        kind: "revolute",
        origin: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
        axis: [0, -1, 0],
        rangeDeg: [-90, 90],
        ...(rated ? { ratedTorqueNm: TAU } : {}),
      },
    ],
    flange: { xyzMm: [L * 1000, 0, 0], rpyDeg: [0, 0, 0] },
  });
}

function search(rated: boolean): MountingSearch {
  const chain = singleAxis(rated);
  return new MountingSearch(
    {
      chain,
      input: testPayload(RATED_KG),
      o: { ...DEFAULT_PAYLOAD_AT_REACH, offsetsMm: [0] },
      bodies: bodySetOf([]),
      facts: chainFacts(chain),
      anyRating: rated,
    },
    "floor",
  );
}

/**
 * Rows k = 1 … 10 (50 … 500 mm) filled with the hand statics, except: row 1 (50 mm) and row 10 (500 mm) unreached
 * (dropped at the ends), row 6 (300 mm) unreached (an inner gap), row 9 (450 mm) the link's own weight too much.
 */
function filled(): MountingSearch {
  const ms = search(true);
  ms.kFirst = 1;
  ms.nRows = 10;
  ms.best = new Float64Array(10);
  ms.bestLimit = new Int32Array(10);
  ms.bestOwn = new Uint8Array(10);
  ms.bestQ = new Float64Array(10);
  ms.bestHeight = new Float64Array(10);
  for (let row = 0; row < 10; row++) {
    const r = (row + 1) * 0.05;
    ms.best[row] = TAU / (G * r);
    ms.bestLimit[row] = 0;
    ms.bestQ[row] = Math.acos(r / L);
    ms.bestHeight[row] = Math.sqrt(L * L - r * r);
  }
  for (const row of [0, 5, 9]) ms.bestLimit[row] = -2;
  ms.best[8] = 0;
  ms.bestOwn[8] = 1;
  return ms;
}

describe("mountingRows", () => {
  it("caps at the rated payload below 170 mm, names the limiting joint above, in mm and deg", () => {
    const rows = mountingRows(filled());
    // Rows 50 mm and 500 mm dropped at the ends; 100 … 450 mm kept.
    expect(rows.map((r) => r.reachMm)).toEqual([100, 150, 200, 250, 300, 350, 400, 450]);
    for (const row of rows) {
      const r = row.reachMm / 1000;
      expect(row.mounting).toBe("floor");
      expect(row.offsetMm).toBe(0);
      if (row.reachMm === 300) {
        expect(row.limitedBy).toBe("unreachable");
        expect([row.payloadKg, row.limitingJoint, row.jointsDegOrMm, row.flangeHeightMm]).toEqual([
          0,
          null,
          null,
          null,
        ]);
        continue;
      }
      if (row.reachMm === 450) {
        expect([row.payloadKg, row.limitedBy, row.limitingJoint, row.torqueLimitKg]).toEqual([
          0,
          "own-weight",
          "j1",
          0,
        ]);
        continue;
      }
      const torqueKg = TAU / (G * r); // 101.97 kg at 100 mm, 67.98 at 150 mm, 50.99 at 200 mm
      expect(row.torqueLimitKg!).toBeCloseTo(torqueKg, 9);
      expect(row.torqueLimitJoint).toBe("j1");
      if (r < TAU / (G * RATED_KG)) {
        expect(row.limitedBy).toBe("rated-payload");
        expect(row.payloadKg).toBe(RATED_KG);
        expect(row.limitingJoint).toBeNull();
      } else {
        expect(row.limitedBy).toBe("joint-rating");
        expect(row.payloadKg).toBeCloseTo(torqueKg, 9);
        expect(row.limitingJoint).toBe("j1");
      }
      expect(row.flangeHeightMm!).toBeCloseTo(1000 * Math.sqrt(L * L - r * r), 9);
      expect(row.jointsDegOrMm![0]!).toBeCloseTo((Math.acos(r / L) * 180) / Math.PI, 9);
    }
    expect(rows.filter((r) => r.limitedBy === "rated-payload").map((r) => r.reachMm)).toEqual([100, 150]);
  });

  it("a negative figure is 0 kg; an unbounded one (load on the axis) is capped with no torque limit", () => {
    const ms = filled();
    ms.best[3] = -5;
    ms.best[4] = Infinity;
    ms.bestLimit[4] = -1;
    const rows = mountingRows(ms);
    const at = (mm: number) => rows.find((r) => r.reachMm === mm)!;
    expect([at(200).payloadKg, at(200).limitedBy, at(200).torqueLimitKg]).toEqual([0, "joint-rating", 0]);
    expect([at(250).payloadKg, at(250).limitedBy, at(250).torqueLimitKg, at(250).torqueLimitJoint]).toEqual([
      RATED_KG,
      "rated-payload",
      null,
      null,
    ]);
  });

  it("no joint rating: the rated payload over every row, as rated", () => {
    const ms = search(false);
    ms.kFirst = 2;
    ms.nRows = 3;
    const rows = mountingRows(ms);
    expect(rows.map((r) => [r.reachMm, r.payloadKg, r.limitedBy])).toEqual([
      [100, RATED_KG, "as-rated"],
      [150, RATED_KG, "as-rated"],
      [200, RATED_KG, "as-rated"],
    ]);
  });
});

describe("mountingReport and loadedUnrated", () => {
  it("reach range in mm, the searched joint's grid step in deg over its range", () => {
    const ms = filled();
    ms.minReach = 0.1;
    ms.maxReach = 0.45;
    const rep = mountingReport(ms);
    expect(rep.mounting).toBe("floor");
    expect(rep.minReachMm!).toBeCloseTo(100, 9);
    expect(rep.maxReachMm!).toBeCloseTo(450, 9);
    expect(rep.searched.map((s) => s.joint)).toEqual(["j1"]);
    // The grid spans the written range −90° … 90°: step · (nodes − 1) = 180°.
    expect(rep.searched[0]!.stepDegOrMm * (ms.count[0]! - 1)).toBeCloseTo(180, 9);
    // Floor mounting: gravity along base −z.
    expect(rep.gravityDirectionInBase.map((v) => v + 0)).toEqual([0, 0, -1]);
  });

  it("no reach found: null reach range", () => {
    const rep = mountingReport(search(true));
    expect([rep.minReachMm, rep.maxReachMm]).toEqual([null, null]);
  });

  it("a joint that carried payload torque without a rating is listed; a rated one is not", () => {
    const unrated = search(false);
    unrated.maxUnit[0] = G * 0.3; // 1 kg at 0.3 m: g·0.3 N·m per kg
    expect(loadedUnrated(unrated)).toEqual(["j1"]);
    const rated = search(true);
    rated.maxUnit[0] = G * 0.3;
    expect(loadedUnrated(rated)).toEqual([]);
    const idle = search(false);
    expect(loadedUnrated(idle)).toEqual([]);
  });
});
