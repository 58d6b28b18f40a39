/**
 * Tests of src/core/analysis/line/solutions.ts: the start solutions of a line of the invented planar 3R
 * (fixtures.ts) at a held tool angle. Holding the tool angle φ fixes the wrist point (TCP − a3·(cos φ, sin φ)), so
 * the start solutions are those of a planar 2R reaching that point: exactly two, elbow up and elbow down, from the
 * law of cosines (fixtures.ts ik3r; Siciliano et al. §2.12, two-link planar arm, from memory). Joint wrapping,
 * distances and line positions are checked against hand-worked values.
 */
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import { createContext } from "../../../../src/core/analysis/line/context";
import {
  discover,
  distance2,
  insideRange,
  nearestSolution,
  positionMm,
  wrapJoints,
} from "../../../../src/core/analysis/line/solutions";
import { DEFAULT_LINE_CHECK } from "../../../../src/core/analysis/line/types";
import { rpyToolRotation } from "../../../../src/core/kinematics/toolOrientation";
import { expectClose } from "../../../helpers/expectClose";
import { A1, A2, A3, CHAIN_3R, DEG, ik3r, planar3r } from "./fixtures";

const PHI = 20 * DEG;
const START = [0.55, 0.35, 0];
const END = [0.45, 0.5, 0];

function ctxOf(tool?: number[], chain = CHAIN_3R) {
  return createContext(
    chain,
    {
      startM: START,
      endM: END,
      baseFromToolRotation: rpyToolRotation(0, 0, PHI),
      speedMPerS: 0.1,
      toolInFlangeM: tool,
    },
    { ...DEFAULT_LINE_CHECK, samples: 11 },
  );
}

/** Angle brought to (−π, π]. */
const wrap = (a: number) => a - 2 * Math.PI * Math.round(a / (2 * Math.PI));

/** Planar 2R IK of the wrist point for a TCP offset `reach` beyond joint 3 along the tool x axis (law of cosines). */
function ik2rWrist(x: number, y: number, phi: number, reach: number, elbow: 1 | -1): number[] {
  const wx = x - reach * Math.cos(phi),
    wy = y - reach * Math.sin(phi);
  const q2 = elbow * Math.acos((wx * wx + wy * wy - A1 * A1 - A2 * A2) / (2 * A1 * A2));
  const q1 = Math.atan2(wy, wx) - Math.atan2(A2 * Math.sin(q2), A1 + A2 * Math.cos(q2));
  return [q1, q2, phi - q1 - q2].map(wrap);
}

/** Sorts solutions by the sign of q2 (elbow −1 first). */
function byElbow(sols: number[][]): number[][] {
  return [...sols].sort((a, b) => a[1]! - b[1]!);
}

describe("discover: start solutions of a planar line at a held tool angle", () => {
  it("finds exactly the two closed-form elbow solutions at the line start", () => {
    const ctx = ctxOf();
    const found = discover(ctx, 0, [], null).map((p) => Array.from(p.q, wrap));
    expect(found).toHaveLength(2);
    const expected = [ik3r(START[0]!, START[1]!, PHI, -1).map(wrap), ik3r(START[0]!, START[1]!, PHI, 1).map(wrap)];
    const got = byElbow(found);
    expectClose(got[0]!, expected[0]!, 1e-7, "elbow −1 solution");
    expectClose(got[1]!, expected[1]!, 1e-7, "elbow +1 solution");
    // The two solutions carry different branch codes (one per branch name).
    const codes = discover(ctx, 0, [], null).map((p) => p.code);
    expect(new Set(codes).size).toBe(2);
  });

  it("at a position along the line (s = L/2) the solutions match the closed form at that point", () => {
    const ctx = ctxOf();
    const s = ctx.lengthM / 2;
    const mid = [(START[0]! + END[0]!) / 2, (START[1]! + END[1]!) / 2];
    const got = byElbow(discover(ctx, s, [], null).map((p) => Array.from(p.q, wrap)));
    expect(got).toHaveLength(2);
    expectClose(got[0]!, ik3r(mid[0]!, mid[1]!, PHI, -1).map(wrap), 1e-7, "elbow −1 at L/2");
    expectClose(got[1]!, ik3r(mid[0]!, mid[1]!, PHI, 1).map(wrap), 1e-7, "elbow +1 at L/2");
  });

  it("a TCP offset along the tool x axis moves the flange target back by R·tool (wrist at a3 + 0.05 m)", () => {
    const ctx = ctxOf([0.05, 0, 0]);
    const got = byElbow(discover(ctx, 0, [], null).map((p) => Array.from(p.q, wrap)));
    expect(got).toHaveLength(2);
    expectClose(got[0]!, ik2rWrist(START[0]!, START[1]!, PHI, A3 + 0.05, -1), 1e-7, "elbow −1 with tool");
    expectClose(got[1]!, ik2rWrist(START[0]!, START[1]!, PHI, A3 + 0.05, 1), 1e-7, "elbow +1 with tool");
  });

  it("a start out of reach has no solution", () => {
    const ctx = createContext(
      CHAIN_3R,
      { startM: [1.2, 0, 0], endM: [1.3, 0, 0], baseFromToolRotation: rpyToolRotation(0, 0, 0), speedMPerS: 0.1 },
      { ...DEFAULT_LINE_CHECK, samples: 3 },
    );
    // |wrist| = 1.1 m > a1 + a2 = 0.9 m: no real law-of-cosines solution.
    expect(discover(ctx, 0, [], null)).toEqual([]);
  });
});

describe("nearestSolution", () => {
  it("from joints near one elbow solution returns that solution (closed form)", () => {
    const ctx = ctxOf();
    const up = ik3r(START[0]!, START[1]!, PHI, 1);
    const q = Float64Array.from(up.map((v) => v + 0.05));
    const p = nearestSolution(ctx, 0, q)!;
    expectClose(Array.from(p.q, wrap), up.map(wrap), 1e-7, "nearest = elbow +1");
    const down = ik3r(START[0]!, START[1]!, PHI, -1);
    const p2 = nearestSolution(ctx, 0, Float64Array.from(down.map((v) => v - 0.05)))!;
    expectClose(Array.from(p2.q, wrap), down.map(wrap), 1e-7, "nearest = elbow −1");
  });
});

describe("joint wrapping, range, distance, position (hand-worked)", () => {
  it("wrapJoints moves revolute joints by 2π toward the reference and into the range", () => {
    const ctx = ctxOf(undefined, compileChain(planar3r([0, 340])));
    const q = Float64Array.from([-20 * DEG, 370 * DEG, -200 * DEG]);
    wrapJoints(ctx, q, null);
    // j1: −20° is below 0°, −20° + 360° = 340° is inside [0°, 340°]; j2: 370° − 360° = 10°; j3: −200° + 360° = 160°.
    expectClose(
      Array.from(q, (v) => v / DEG),
      [340, 10, 160],
      1e-9,
      "wrapped toward 0",
    );
    const r = Float64Array.from([10 * DEG, 10 * DEG, 10 * DEG]);
    wrapJoints(ctx, r, [0, 2 * Math.PI, -2 * Math.PI]);
    // Reference 360° for j2: 10° → 370°; reference −360° for j3: 10° → −350°.
    expectClose(
      Array.from(r, (v) => v / DEG),
      [10, 370, -350],
      1e-9,
      "wrapped toward the reference",
    );
  });

  it("insideRange against the range written in the arm input", () => {
    const ctx = ctxOf(undefined, compileChain(planar3r([-170, 170])));
    expect(insideRange(ctx, Float64Array.from([169 * DEG, 0, 0]))).toBe(true);
    expect(insideRange(ctx, Float64Array.from([171 * DEG, 0, 0]))).toBe(false);
    expect(insideRange(ctx, Float64Array.from([-171 * DEG, 3, -3]))).toBe(false);
  });

  it("distance2 is the plain squared joint distance for revolute joints", () => {
    const ctx = ctxOf();
    expect(distance2(ctx, [1, 2, 3], [0, 0, 1])).toBeCloseTo(1 + 4 + 4, 12);
    expect(distance2(ctx, [0.3, -0.4, 0], null)).toBeCloseTo(0.25, 12);
  });

  it("positionMm walks the line from start to end in mm", () => {
    const ctx = ctxOf();
    expect(ctx.lengthM).toBeCloseTo(Math.hypot(0.1, 0.15), 12);
    expectClose(positionMm(ctx, 0), [550, 350, 0], 1e-9, "start");
    expectClose(positionMm(ctx, ctx.lengthM), [450, 500, 0], 1e-9, "end");
    expectClose(positionMm(ctx, ctx.lengthM / 2), [500, 425, 0], 1e-9, "middle");
  });
});
