/**
 * Joint roles of the payload-at-reach search (src/core/analysis/payload/searchPlan.ts), every expectation worked by
 * hand from the geometry of the test arms (testArms.ts, line/fixtures.ts):
 * - generic 6R: spherical wrist at (1.4, 0, −0.5) at home, flange 0.1 m further along the flange axis (−z), axis 6
 *   the flange spin, axis 1 vertical through the origin;
 * - palletizer: the parallelogram keeps the flange axis at −z in every pose ("fixed by structure");
 * - cylindrical arm: vertical lift (prismatic along base z at every pose), horizontal stroke, 2R wrist;
 * - planar 3R in the x–y plane: every axis along base z, so the flange axis never turns.
 */
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import { chainFacts, planFor, searchRange } from "../../../../src/core/analysis/payload/searchPlan";
import type { ArmKinematicsInput } from "../../../../src/core/kinematics/compile";
import { expectClose } from "../../../helpers/expectClose";
import { cylindricalPrismaticDh, generic6rDh, palletizerPassiveFrames } from "../../../helpers/testArms";
import { planar3r } from "../line/fixtures";

const DEG = Math.PI / 180;
const FLOOR = [0, 0, -1];
const CEILING = [0, 0, 1];
const WALL = [1, 0, 0];

describe("searchRange", () => {
  it("uses the limits; open limits become ±π (revolute) or ±1 m (prismatic)", () => {
    const c = compileChain(planar3r([-30, 120]));
    // hand: joint 1 limited to [−30°, 120°]; joints 2, 3 have no limits
    expectClose(searchRange(c, 0), [-30 * DEG, 120 * DEG], 1e-15, "limited");
    expectClose(searchRange(c, 1), [-Math.PI, Math.PI], 0, "open revolute");
    const cyl = compileChain(cylindricalPrismaticDh());
    // hand: lift 0 … 800 mm, stroke 0 … 600 mm
    expectClose(searchRange(cyl, 1), [0, 0.8], 1e-15, "lift");
    expectClose(searchRange(cyl, 2), [0, 0.6], 1e-15, "stroke");
    const open: ArmKinematicsInput = {
      ...cylindricalPrismaticDh(),
      joints: cylindricalPrismaticDh().joints.map((j) => (j.name === "lift" ? { ...j, rangeMm: undefined } : j)),
    };
    expectClose(searchRange(compileChain(open), 1), [-1, 1], 0, "open prismatic");
  });

  it("searches one turn of a joint with more than a full turn of range", () => {
    // hand: ±360° → [−π, π]; [−90°, 300°] (390°) → [−90°, 270°], starting at the lower limit
    const cyl = compileChain(cylindricalPrismaticDh());
    expectClose(searchRange(cyl, 4), [-Math.PI, Math.PI], 0, "±360°");
    const c = compileChain(planar3r([-90, 300]));
    expectClose(searchRange(c, 0), [-90 * DEG, 270 * DEG], 1e-12, "[−90°, 300°]");
  });
});

describe("chainFacts", () => {
  it("generic 6R: wrist axes 4, 5 orient, axis 6 spins, flange 0.1 m beyond the wrist centre", () => {
    const f = chainFacts(compileChain(generic6rDh()));
    expect([...f.spins]).toEqual([5]);
    expect(f.orientingCandidates).toEqual([3, 4]);
    expect(f.structureFixedAxis).toBeNull();
    // hand: flange (1.4, 0, −0.6) = WCP (1.4, 0, −0.5) + 0.1·(0, 0, −1) with the flange z = (0, 0, −1): d₆ = 0.1 m
    expectClose(f.wcpFlangeDistanceM!, 0.1, 1e-12, "WCP–flange distance");
  });

  it("palletizer: the flange axis stays −z (R = Rz(q₁ + q₅)·Rx(180°) for every pose)", () => {
    const f = chainFacts(compileChain(palletizerPassiveFrames()));
    expectClose(f.structureFixedAxis!, [0, 0, -1], 1e-12, "fixed flange axis");
    expect(f.orientingCandidates).toEqual([]);
    expect(f.wcpFlangeDistanceM).toBeNull();
    expect([...f.spins]).toEqual([4]);
  });

  it("planar 3R: all axes along z, so the flange axis is fixed (+z); no spin (the flange is 0.1 m off axis 3)", () => {
    const f = chainFacts(compileChain(planar3r()));
    expectClose(f.structureFixedAxis!, [0, 0, 1], 1e-12, "fixed flange axis");
    expect(f.orientingCandidates).toEqual([]);
    expect(f.spins.size).toBe(0);
  });

  it("generic 6R with the flange 50 mm off axis 6: no spin, so axes 4, 5, 6 orient; no WCP shortcut", () => {
    const f = chainFacts(compileChain({ ...generic6rDh(), flange: { xyzMm: [50, 0, 100], rpyDeg: [0, 0, 0] } }));
    expect(f.spins.size).toBe(0);
    expect(f.orientingCandidates).toEqual([3, 4, 5]);
    expect(f.wcpFlangeDistanceM).toBeNull(); // hand: the flange is 0.05 m from the flange axis through the WCP
  });
});

describe("planFor", () => {
  it("generic 6R on the floor: axis 1 held (vertical through the origin), axes 2, 3 searched, 4, 5 orient", () => {
    const chain = compileChain(generic6rDh());
    const p = planFor(chain, chainFacts(chain), FLOOR);
    expect(p.mode).toBe("along-gravity");
    expect(p.searched).toEqual([1, 2]);
    expect(p.orienting).toEqual([3, 4]);
    expect(p.held.map((h) => [h.j, h.value])).toEqual([
      [0, 0],
      [5, 0],
    ]);
    expect(p.held[0]!.reason).toMatch(/vertical axis 1/);
    expect(p.held[1]!.reason).toMatch(/own axis/);
    expectClose(p.wcpFlangeDistanceM!, 0.1, 1e-12, "WCP–flange distance");
  });

  it("generic 6R on the ceiling: gravity still along axis 1, the same roles", () => {
    const chain = compileChain(generic6rDh());
    const p = planFor(chain, chainFacts(chain), CEILING);
    expect(p.searched).toEqual([1, 2]);
    expect(p.held.map((h) => h.j)).toEqual([0, 5]);
  });

  it("generic 6R on a wall (gravity along base x): axis 1 now moves the load and is searched", () => {
    const chain = compileChain(generic6rDh());
    const p = planFor(chain, chainFacts(chain), WALL);
    expect(p.searched).toEqual([0, 1, 2]);
    expect(p.held.map((h) => h.j)).toEqual([5]);
  });

  it("palletizer on the floor: fixed by structure, nothing orients, j1 and the flange spin j5 held", () => {
    const chain = compileChain(palletizerPassiveFrames());
    const p = planFor(chain, chainFacts(chain), FLOOR);
    expect(p.mode).toBe("fixed-by-structure");
    expect(p.orienting).toEqual([]);
    expect(p.searched).toEqual([1, 2]);
    expect(p.held.map((h) => h.j)).toEqual([0, 3]);
    expect(p.wcpFlangeDistanceM).toBeNull();
  });

  it("cylindrical arm on the floor: base and the vertical lift held, the stroke searched, the 2R wrist orients", () => {
    const chain = compileChain(cylindricalPrismaticDh());
    const p = planFor(chain, chainFacts(chain), FLOOR);
    expect(p.mode).toBe("along-gravity");
    expect(p.orienting).toEqual([3, 4]);
    expect(p.searched).toEqual([2]);
    expect(p.held.map((h) => h.j)).toEqual([0, 1]);
    expect(p.held[1]!.reason).toMatch(/slides along gravity/);
    // hand: the lift range is [0, 800] mm, so it is held at 0 (inside the range)
    expect(p.held[1]!.value).toBe(0);
  });

  it("cylindrical arm on a wall: the lift is across gravity, so base, lift and stroke are searched", () => {
    const chain = compileChain(cylindricalPrismaticDh());
    const p = planFor(chain, chainFacts(chain), WALL);
    expect(p.searched).toEqual([0, 1, 2]);
    expect(p.held).toEqual([]);
  });

  it("planar 3R on the floor (lying flat): joint 1 held, joints 2 and 3 searched, tool axis fixed by structure", () => {
    const chain = compileChain(planar3r());
    const p = planFor(chain, chainFacts(chain), FLOOR);
    expect(p.mode).toBe("fixed-by-structure");
    expect(p.searched).toEqual([1, 2]);
    expect(p.held.map((h) => h.j)).toEqual([0]);
  });

  it("7-axis arm (an extra joint inserted after axis 2): the middle positioning joint held", () => {
    // An invented 7R: the generic 6R with an extra DH row (a = d = α = 0) after axis 2, i.e. a second joint on the
    // elbow axis. Positioning joints (not spin, not orienting): 0, 1, 2, 3 → more than three, so the middle ones,
    // slice(2, −1) = [2], are held; 0 is held as the vertical axis 1, 6 as the flange spin; 1 and 3 are searched.
    const base = generic6rDh();
    const extra = {
      name: "j2b",
      kind: "revolute" as const,
      dh: { aMm: 0, alphaDeg: 0, dMm: 0, thetaDeg: 0 },
      rangeDeg: [-170, 170],
      maxSpeedDegPerS: 150,
    };
    const input: ArmKinematicsInput = {
      ...base,
      joints: [base.joints[0]!, base.joints[1]!, extra, ...base.joints.slice(2)],
      wristCentre: { joints: ["j4", "j5", "j6"] },
    };
    const chain = compileChain(input);
    const facts = chainFacts(chain);
    const p = planFor(chain, facts, FLOOR);
    expect(p.orienting).toEqual([4, 5]);
    const redundant = p.held.find((h) => h.j === 2);
    expect(redundant?.reason).toMatch(/redundant/);
    expect(p.searched).toEqual([1, 3]);
    expect(p.held.map((h) => h.j)).toEqual([0, 2, 6]);
  });
});
