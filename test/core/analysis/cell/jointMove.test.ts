/**
 * Tests of src/core/analysis/cell/jointMove.ts: the synchronised point-to-point joint move.
 *
 * Outside reference: the rest-to-rest closed form T = D/V + V/A when D ≥ V²/A (trapezoid), else T = 2·√(D/A)
 * (triangle), CHECKS C17 (V = 2 m/s, A = 20 m/s²: 0.25 s for 0.3 m, 0.0707107 s for 0.025 m), Biagiotti &
 * Melchiorri 2008 ch. 3 [from memory: chapter]. Each expected value below is worked by hand from that formula.
 */
import { describe, expect, it } from "vitest";
import {
  CELL_TIME_TO_TOP_SPEED_S,
  effectiveAccelInto,
  jointMoveTime,
} from "../../../../src/core/analysis/cell/jointMove";
import { expectClose } from "../../../helpers/expectClose";

describe("jointMoveTime: one joint (CHECKS C17)", () => {
  it("trapezoid: 0.3 m at 2 m/s and 20 m/s² takes 0.3/2 + 2/20 = 0.25 s (D ≥ V²/A = 0.2 m)", () => {
    const r = jointMoveTime([0.3], [2], [20]);
    expectClose(r.timeS, 0.25, 1e-12, "trapezoid");
    expect(r.limitingJoint).toBe(0);
    expect(r.accelAssumed).toEqual([false]);
    expect(r.limitingAccelAssumed).toBe(false);
  });

  it("triangle: 0.025 m at 2 m/s and 20 m/s² takes 2·√(0.025/20) = 0.0707107 s (D < V²/A)", () => {
    const r = jointMoveTime([-0.025], [2], [20]);
    expectClose(r.timeS, 0.0707107, 1e-7, "CHECKS C17 printed value");
    expectClose(r.timeS, 2 * Math.sqrt(0.025 / 20), 1e-12, "triangle closed form");
  });

  it("the boundary D = V²/A: both forms give 2V/A (0.2 m at 2 m/s, 20 m/s²: 0.2 s)", () => {
    // D/V + V/A = 0.1 + 0.1 = 0.2; 2·√(D/A) = 2·√0.01 = 0.2.
    expectClose(jointMoveTime([0.2], [2], [20]).timeS, 0.2, 1e-12);
  });
});

describe("jointMoveTime: several joints, the slowest governs", () => {
  it("three joints: times 0.25 s, 0.0707107 s and 0.65 s → 0.65 s, joint 2", () => {
    // Joint 0: CHECKS C17 trapezoid, 0.25 s. Joint 1: C17 triangle, 0.0707 s.
    // Joint 2: 0.9 rad at 2 rad/s, 10 rad/s²: V²/A = 0.4 ≤ 0.9 → 0.9/2 + 2/10 = 0.45 + 0.2 = 0.65 s.
    const r = jointMoveTime([0.3, 0.025, -0.9], [2, 2, 2], [20, 20, 10]);
    expectClose(r.timeS, 0.65, 1e-12, "slowest joint");
    expect(r.limitingJoint).toBe(2);
    expectClose(r.jointTimesS, [0.25, 2 * Math.sqrt(0.025 / 20), 0.65], 1e-12, "each joint's own time");
  });

  it("nothing moves: 0 s, limiting joint −1", () => {
    const r = jointMoveTime([0, 0], [1, 1], [5, NaN]);
    expect(r.timeS).toBe(0);
    expect(r.limitingJoint).toBe(-1);
    expect(r.limitingAccelAssumed).toBe(false);
    expect(r.accelAssumed).toEqual([false, true]);
  });
});

describe("jointMoveTime: speed scale and assumed acceleration", () => {
  it("speedScale 0.5 halves the speed, not the acceleration: 0.3 m at 1 m/s, 20 m/s² → 0.3 + 0.05 = 0.35 s", () => {
    // V = 2·0.5 = 1 m/s, A = 20 m/s²: V²/A = 0.05 ≤ 0.3 → 0.3/1 + 1/20 = 0.35 s.
    expectClose(jointMoveTime([0.3], [2], [20], 0.5).timeS, 0.35, 1e-12);
  });

  it("a slow scale can change which joint limits the move", () => {
    // Full speed: joint 0: 0.3 m at 2, 20 → 0.25 s; joint 1: 0.5 rad at 4 rad/s, 4 rad/s²: V²/A = 4 > 0.5 →
    // triangle 2·√(0.5/4) = 0.7071 s (joint 1 limits). At 10 %: joint 0: V = 0.2: 0.3/0.2 + 0.2/20 = 1.51 s;
    // joint 1: V = 0.4, V²/A = 0.04 ≤ 0.5 → 0.5/0.4 + 0.4/4 = 1.35 s (joint 0 limits).
    const full = jointMoveTime([0.3, 0.5], [2, 4], [20, 4]);
    expectClose(full.timeS, 2 * Math.sqrt(0.5 / 4), 1e-12);
    expect(full.limitingJoint).toBe(1);
    const slow = jointMoveTime([0.3, 0.5], [2, 4], [20, 4], 0.1);
    expectClose(slow.timeS, 1.51, 1e-12);
    expect(slow.limitingJoint).toBe(0);
  });

  it("NaN acceleration: full speed in 0.25 s (a = V/0.25), flagged; the limiting joint says so", () => {
    // V = 2 rad/s → a = 8 rad/s². 1 rad: V²/A = 0.5 ≤ 1 → 1/2 + 2/8 = 0.75 s.
    expect(CELL_TIME_TO_TOP_SPEED_S).toBe(0.25); // issue 12: "assume full speed in 0.25 s"
    const r = jointMoveTime([0.1, 1], [2, 2], [20, NaN]);
    expectClose(r.timeS, 0.75, 1e-12);
    expect(r.limitingJoint).toBe(1);
    expect(r.accelAssumed).toEqual([false, true]);
    expect(r.limitingAccelAssumed).toBe(true);
  });

  it("the assumed acceleration uses the full speed, whatever the scale; the time to top speed is an option", () => {
    // V = 2, assumed over 0.5 s → a = 4 (not 0.5·2/0.5). Scale 0.5: V = 1, V²/A = 0.25 ≤ 1 → 1/1 + 1/4 = 1.25 s.
    expectClose(jointMoveTime([1], [2], [NaN], 0.5, 0.5).timeS, 1.25, 1e-12);
  });

  it("effectiveAccelInto writes given values and assumed ones, with flags", () => {
    const flags: boolean[] = [];
    const out = effectiveAccelInto(new Float64Array(2), [2, 3], [20, NaN], 0.25, flags);
    expectClose(out, [20, 12], 1e-12); // 3 / 0.25 = 12
    expect(flags).toEqual([false, true]);
  });

  it("bad input: mismatched lengths, a scale outside (0, 1], a non-finite distance", () => {
    expect(() => jointMoveTime([1, 2], [1], [1])).toThrow(/2 distances but 1 speed/);
    expect(() => jointMoveTime([1], [1], [1], 0)).toThrow(/speed scale 0/);
    expect(() => jointMoveTime([1], [1], [1], 1.5)).toThrow(/speed scale 1.5/);
    expect(() => jointMoveTime([NaN], [1], [1])).toThrow(/joint 1 distance NaN/);
    expect(() => jointMoveTime([1], [1], [NaN], 1, 0)).toThrow(/time to top speed/);
  });
});
