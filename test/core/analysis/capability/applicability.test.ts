/**
 * Which arms get a capability map, and when the roll is the last joint's own turn (applicability.ts), on invented
 * arms whose answer follows from their geometry by hand:
 * - toolAxisTurns: a five-axis arm with a forearm roll and a wrist bend (the shell arm without joint 6) moves its
 *   flange centre in 3 directions and tilts its tool axis about 2 independent axes: rank 5. A SCARA's revolute axes are all vertical, so its tool axis never tilts: rank ≤ 4. A planar 2R arm
 *   has 2 joints (< 5).
 * - rollJoint: the shell arm's joint 6 axis is DH z₆, the flange z axis, through the flange centre (flange = DH
 *   frame 6). A flange turned 90° about x (z ⟂ axis 6) or moved 10 mm off the axis is not turned by joint 6 alone.
 */
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import { rollJoint, toolAxisTurns, withFreeJoint } from "../../../../src/core/analysis/capability/applicability";
import { mulberry32 } from "../../../../src/core/math/random";
import { planar2r, scaraRrprDh } from "../../../helpers/testArms";
import { dhArm, shellArm } from "./shellArm";

describe("toolAxisTurns", () => {
  it("is true for a five-axis arm with forearm roll and wrist bend, false for bend-and-roll, SCARA and planar 2R", () => {
    // Forearm roll + bend: the shell arm's joints 1–5, flange 0.1 m along DH z₅ (the axis joint 5 tilts).
    const shell = shellArm();
    const rows = shell.rows.map((r) => [r.a * 1000, (r.alpha * 180) / Math.PI, r.d * 1000] as const);
    const rollBend = dhArm(rows.slice(0, 5), shell.rangesDeg.slice(0, 5), { xyzMm: [0, 0, 100], rpyDeg: [0, 0, 0] });
    expect(toolAxisTurns(compileChain(rollBend.input), mulberry32(1))).toBe(true);
    expect(toolAxisTurns(compileChain(shell.input), mulberry32(1))).toBe(true);
    // Bend + tool roll (no forearm roll): every axis but the last is horizontal or axis 1, so the tool axis stays
    // in the vertical plane through axis 1 and the flange: position 3 + tool axis 1 = rank 4.
    const bendRoll = dhArm(
      [
        [0, 90, 0],
        [500, 0, 0],
        [400, 0, 0],
        [0, 90, 0],
        [0, 0, 100],
      ],
      [
        [-180, 180],
        [-180, 180],
        [-180, 180],
        [-120, 120],
        [-360, 360],
      ],
    );
    expect(toolAxisTurns(compileChain(bendRoll.input), mulberry32(1))).toBe(false);
    expect(toolAxisTurns(compileChain(scaraRrprDh()), mulberry32(1))).toBe(false);
    expect(toolAxisTurns(compileChain(planar2r(0.4, 0.3)), mulberry32(1))).toBe(false);
  });
});

describe("rollJoint", () => {
  it("names joint 6 (index 5) of the shell arm, and none when the flange is tilted or off the axis", () => {
    expect(rollJoint(compileChain(shellArm().input))).toBe(5);
    expect(rollJoint(compileChain(shellArm({ xyzMm: [0, 0, 0], rpyDeg: [90, 0, 0] }).input))).toBe(-1);
    expect(rollJoint(compileChain(shellArm({ xyzMm: [10, 0, 0], rpyDeg: [0, 0, 0] }).input))).toBe(-1);
    // Turned about its own axis and moved along it: still joint 6's own turn.
    expect(rollJoint(compileChain(shellArm({ xyzMm: [0, 0, 25], rpyDeg: [0, 0, 40] }).input))).toBe(5);
  });

  it("withFreeJoint sets that joint's range to (−π, π] and leaves the chain's other ranges", () => {
    const chain = compileChain(shellArm().input);
    const free = withFreeJoint(chain, 5);
    expect([free.lowerSi[5], free.upperSi[5]]).toEqual([-Math.PI, Math.PI]);
    expect(Array.from(free.lowerSi.subarray(0, 5))).toEqual(Array.from(chain.lowerSi.subarray(0, 5)));
    expect(chain.upperSi[5]).toBeCloseTo(2 * Math.PI, 12);
  });
});
