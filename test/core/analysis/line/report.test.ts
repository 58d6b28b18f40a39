/**
 * Tests of src/core/analysis/line/report.ts: the result of a hand-made run of the invented planar 3R (fixtures.ts)
 * converted to mm, deg and mm/s, and the feasible speed rule (0 unless the run follows the whole line; else the
 * speed the worst rate ratio allows).
 *
 * Independent figures: the start pose q = (0°, 90°, −90°) at TCP (0.6, 0.4) with tool angle 0 is worked by hand
 * (wrist at (0.5, 0.4): law of cosines gives cos q2 = 0); its joint rates for a TCP moving along +x are worked by
 * hand (q1 fixed, wrist x = a1 + a2·cos q2, so dq2/dx = −1/(a2·sin q2) = −2.5 rad/m, q̇3 = −q̇2 to hold the tool
 * angle); the end pose and rates come from the closed forms ik3r / rates3r / bound3r of fixtures.ts (2R law of
 * cosines and the 2×2 adjugate inverse), not from src/core. Joint ranges are read from the arm input itself.
 */
import { describe, expect, it } from "vitest";
import { compileChain } from "../../../../src/core";
import { createContext } from "../../../../src/core/analysis/line/context";
import { createRun, type Run } from "../../../../src/core/analysis/line/record";
import { lineReport, type StartRun } from "../../../../src/core/analysis/line/report";
import { DEFAULT_LINE_CHECK } from "../../../../src/core/analysis/line/types";
import { rpyToolRotation } from "../../../../src/core/kinematics/toolOrientation";
import { expectClose } from "../../../helpers/expectClose";
import { A2, bound3r, DEG, ik3r, planar3r, rates3r, W3R } from "./fixtures";

const RANGE_J1_DEG: [number, number] = [-170, 170];
const ARM = planar3r(RANGE_J1_DEG);
const CHAIN = compileChain(ARM);
const L = 0.01; // line length, m
const SPEED = 0.5; // m/s
const options = { ...DEFAULT_LINE_CHECK, samples: 2 };
const input = {
  startM: [0.6, 0.4, 0],
  endM: [0.6 + L, 0.4, 0],
  baseFromToolRotation: rpyToolRotation(0, 0, 0),
  speedMPerS: SPEED,
};

// Hand-worked start pose and joint rates per unit TCP speed along +x (see the header).
const Q0 = [0, Math.PI / 2, -Math.PI / 2];
const RATE0 = [0, -1 / (A2 * Math.sin(Math.PI / 2)), 1 / (A2 * Math.sin(Math.PI / 2))]; // [0, −2.5, 2.5] rad/m
// Closed-form end pose and rates (fixtures.ts ik3r / rates3r).
const Q1 = ik3r(0.6 + L, 0.4, 0, 1);
const RATE1 = rates3r(Q1, 1, 0);

/** Rate ratio per unit speed (s/m) at one pose: maxᵢ |rateᵢ| / q̇maxᵢ, and its joint. */
function ratio(rate: readonly number[]): { r: number; joint: number } {
  let r = 0,
    joint = -1;
  rate.forEach((v, i) => {
    if (Math.abs(v) / W3R[i]! > r) {
      r = Math.abs(v) / W3R[i]!;
      joint = i;
    }
  });
  return { r, joint };
}

/** A run that follows the whole line: both samples reachable, the worst point the larger of the two ratios. */
function handRun(): { ctx: ReturnType<typeof createContext>; run: Run } {
  const ctx = createContext(CHAIN, input, options);
  const run = createRun(ctx);
  [Q0, Q1].forEach((q, k) => {
    run.samplesOk[k] = 1;
    run.samplesRatesOk[k] = 1;
    run.sampleQ.set(q, k * 3);
    run.sampleRate.set(k === 0 ? RATE0 : RATE1, k * 3);
    run.sampleInv[k] = 0.5;
    run.sampleSigma[k] = 0.5;
  });
  run.startQ.set(Q0);
  const r0 = ratio(RATE0),
    r1 = ratio(RATE1);
  const worst = r1.r > r0.r ? { ...r1, s: L } : { ...r0, s: 0 };
  run.worst.s = worst.s;
  run.worst.maxRatio = worst.r;
  run.worst.argJoint = worst.joint;
  run.nearest.s = 0;
  run.nearest.inverseCondition = 0.5;
  run.nearest.sigmaMin = 0.5;
  run.anyPoint = true;
  run.evaluated = 7;
  return { ctx, run };
}

function startRun(run: Run, followed: boolean, feasible: number): StartRun {
  return { run, followed, feasible, rateLimited: feasible, problems: followed ? 0 : 1, d: 0 };
}

describe("lineReport: units of a hand-made run", () => {
  it("line, samples and speed profile in mm, deg, deg/s and mm/s", () => {
    const { ctx, run } = handRun();
    const res = lineReport(ctx, SPEED, [startRun(run, true, 1)], run, false);
    expect(res.lengthMm).toBeCloseTo(10, 9);
    expect(res.speedMmPerS).toBeCloseTo(500, 9);
    expectClose(res.direction, [1, 0, 0], 1e-12, "direction");
    expect(res.jointNames).toEqual(["j1", "j2", "j3"]);
    expect(res.jointUnits).toEqual(["deg", "deg", "deg"]);
    expect(res.startRule).toBe("best run");
    expect(res.evaluatedPoints).toBe(7);
    // Start sample: q = (0°, 90°, −90°) by hand; rates = rate per m · 0.5 m/s · 180/π.
    const s0 = res.samples[0]!;
    expect(s0.fraction).toBe(0);
    expectClose(s0.positionMm, [600, 400, 0], 1e-9, "start position");
    expectClose(s0.jointsDeg!, [0, 90, -90], 1e-9, "start joints");
    const v = (2.5 * 0.5 * 180) / Math.PI; // 71.62 deg/s
    expectClose(s0.jointRatesDegPerS!, [0, -v, v], 1e-9, "start rates");
    // Ratios at 0.5 m/s: j2 1.25 / (120°/s = 2π/3) = 0.5968, j3 1.25 / π = 0.3979 (hand).
    expectClose(s0.rateRatios! as number[], [0, 1.25 / ((2 * Math.PI) / 3), 1.25 / Math.PI], 1e-12, "ratios");
    // Local speed: speed / max ratio = (2π/3) / 2.5 m/s = 837.758 mm/s.
    expect(s0.localSpeedMmPerS!).toBeCloseTo((1000 * (2 * Math.PI)) / 3 / 2.5, 6);
    expect(res.speedProfile[0]!.speedMmPerS!).toBeCloseTo(837.758, 3);
    // End sample from the closed forms of fixtures.ts.
    const s1 = res.samples[1]!;
    expect(s1.fraction).toBe(1);
    expectClose(s1.positionMm, [610, 400, 0], 1e-9, "end position");
    expectClose(
      s1.jointsDeg!,
      Q1.map((x) => x / DEG),
      1e-9,
      "end joints",
    );
    expectClose(
      s1.jointRatesDegPerS!,
      RATE1.map((x) => (x * SPEED) / DEG),
      1e-9,
      "end rates",
    );
    expect(s1.localSpeedMmPerS!).toBeCloseTo(1000 * bound3r(Q1, 1, 0).speed, 6);
  });

  it("followed run: feasible speed is the closed-form bound min over the line, limited by j2", () => {
    const { ctx, run } = handRun();
    const res = lineReport(ctx, SPEED, [startRun(run, true, 1)], run, false);
    // min of the two closed-form bounds (CHECKS C13 along u = +x): (2π/3)/2.5 m/s at the start by hand.
    const expected = Math.min((2 * Math.PI) / 3 / 2.5, bound3r(Q1, 1, 0).speed);
    expect(res.followed).toBe(true);
    expect(res.feasibleConstantSpeedMmPerS!).toBeCloseTo(1000 * expected, 6);
    expect(res.commandedSpeedFeasible).toBe(SPEED <= expected);
    expect(res.bottleneck!.reason).toBe("joint rate");
    expect(res.bottleneck!.joint).toBe("j2");
    expect(res.bottleneck!.rateRatio!).toBeCloseTo(SPEED / expected, 9);
    expect(res.startBranch!.chosen).toBe(true);
    expect(res.startBranch!.followed).toBe(true);
    expect(res.startBranch!.reason).toBeNull();
    expectClose(res.startBranch!.startJointsDeg, [0, 90, -90], 1e-9, "start branch joints");
    expect(res.outOfReach).toEqual([]);
    expect(res.jointLimitViolations).toEqual([]);
    expect(res.jointsWithoutSpeedLimit).toEqual([]);
  });

  it("a commanded speed above the bound is not feasible; the feasible speed does not depend on it", () => {
    const { ctx, run } = handRun();
    const expected = Math.min((2 * Math.PI) / 3 / 2.5, bound3r(Q1, 1, 0).speed);
    const res = lineReport(ctx, 2 * expected, [startRun(run, true, 1)], run, false);
    expect(res.commandedSpeedFeasible).toBe(false);
    expect(res.feasibleConstantSpeedMmPerS!).toBeCloseTo(1000 * expected, 6);
    expect(res.bottleneck!.rateRatio!).toBeCloseTo(2, 9);
  });
});

describe("lineReport: the feasible speed rule (0 unless the whole line is followed)", () => {
  it("a joint leaving its range: 0, reason joint limit, limit and extreme in deg from the arm input", () => {
    const { ctx, run } = handRun();
    run.violations.push({ joint: 0, upper: true, fromS: 0.004, toS: 0.006, extreme: 175 * DEG });
    const res = lineReport(ctx, SPEED, [startRun(run, false, 0)], run, true);
    expect(res.startRule).toBe("nearest start joints");
    expect(res.followed).toBe(false);
    expect(res.feasibleConstantSpeedMmPerS).toBe(0);
    expect(res.commandedSpeedFeasible).toBe(false);
    expect(res.bottleneck!.reason).toBe("joint limit");
    expect(res.bottleneck!.joint).toBe("j1");
    expect(res.bottleneck!.fraction).toBeCloseTo(0.4, 12);
    const v = res.jointLimitViolations[0]!;
    expect(v.bound).toBe("upper");
    expect(v.limitValue).toBeCloseTo(RANGE_J1_DEG[1], 9);
    expect(v.extremeValue).toBeCloseTo(175, 9);
    expect(v.unit).toBe("deg");
    expect(v.fromFraction).toBeCloseTo(0.4, 12);
    expect(v.toFraction).toBeCloseTo(0.6, 12);
    expectClose(v.fromPositionMm, [604, 400, 0], 1e-9, "violation start");
    expectClose(v.toPositionMm, [606, 400, 0], 1e-9, "violation end");
    const b = res.startBranches[0]!;
    expect([b.followed, b.reason, b.joint, b.feasibleConstantSpeedMmPerS]).toEqual([false, "joint limit", "j1", 0]);
    expect(b.atFraction!).toBeCloseTo(0.4, 12);
  });

  it("a point out of reach: 0, the interval in fractions and mm", () => {
    const { ctx, run } = handRun();
    run.gaps.push({ fromS: 0.007, toS: L });
    const res = lineReport(ctx, SPEED, [startRun(run, false, 0)], run, false);
    expect(res.feasibleConstantSpeedMmPerS).toBe(0);
    expect(res.bottleneck!.reason).toBe("out of reach");
    expect(res.bottleneck!.fraction).toBeCloseTo(0.7, 12);
    expect(res.outOfReach).toHaveLength(1);
    expect(res.outOfReach[0]!.fromFraction).toBeCloseTo(0.7, 12);
    expect(res.outOfReach[0]!.toFraction).toBeCloseTo(1, 12);
    expectClose(res.outOfReach[0]!.fromPositionMm, [607, 400, 0], 1e-9, "gap start");
    expectClose(res.outOfReach[0]!.toPositionMm, [610, 400, 0], 1e-9, "gap end");
  });

  it("unbounded rates (exactly singular): 0, reason singular, no rate ratio", () => {
    const { ctx, run } = handRun();
    run.worst.maxRatio = Infinity;
    const res = lineReport(ctx, SPEED, [startRun(run, false, 0)], run, false);
    expect(res.followed).toBe(false);
    expect(res.feasibleConstantSpeedMmPerS).toBe(0);
    expect(res.bottleneck!.reason).toBe("singular");
    expect(res.bottleneck!.rateRatio).toBeNull();
    expect(res.startBranches[0]!.reason).toBe("singular");
  });

  it("no run at all: the whole line out of reach, every sample unreachable at speed 0", () => {
    const ctx = createContext(CHAIN, input, options);
    const res = lineReport(ctx, SPEED, [], null, false);
    expect(res.followed).toBe(false);
    expect(res.feasibleConstantSpeedMmPerS).toBe(0);
    expect(res.startBranch).toBeNull();
    expect(res.bottleneck).toBeNull();
    expect(res.nearestSingularity).toBeNull();
    expect(res.evaluatedPoints).toBe(0);
    expect(res.outOfReach).toHaveLength(1);
    expect([res.outOfReach[0]!.fromFraction, res.outOfReach[0]!.toFraction]).toEqual([0, 1]);
    expectClose(res.outOfReach[0]!.toPositionMm, [610, 400, 0], 1e-9, "line end");
    for (const s of res.samples) {
      expect([s.reachable, s.jointsDeg, s.localSpeedMmPerS]).toEqual([false, null, 0]);
    }
  });
});
