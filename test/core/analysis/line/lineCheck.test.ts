/**
 * Tests of src/core/analysis/line/lineCheck.ts: lineCheck (straight TCP line at constant tool orientation and
 * commanded speed) on the planar 3R closed forms, the start-branch rule, input errors and demo-arm invariants.
 * Singular poses and branch changes: continuation.test.ts; fixtures: fixtures.ts.
 *
 * Chains (invented, round numbers; no real product):
 * - Planar 3R in the x–y plane (standard DH, α = 0; a = 0.5, 0.4, 0.1 m; q̇max = 90, 120, 180 °/s; no ranges).
 *   Why 3R and not 2R: a 2R arm cannot hold a tool orientation, and lineCheck always holds it. With all axes along
 *   z and the tool angle φ held, the "wrist point" w = p − a3·(cos φ, sin φ) moves with the TCP's velocity, so
 *   joints 1–2 are a 2R arm driving w (closed forms of CHECKS C1: J, det J = a1a2 sin q2, and its inverse by
 *   hand; IK by the law of cosines) and q̇3 = −(q̇1 + q̇2) keeps φ constant. This is the (x, y, θ) task.
 * - The generic spherical-wrist 6R of CHECKS §0 (standard DH, θ offsets 0, all ranges ±180°); singular poses and
 *   TCP positions from the independent mathjs DH product of test/helpers/testArms.ts, singularity conditions from
 *   CHECKS C5 (wrist: q5 = 0; shoulder: wrist centre on axis 1).
 * Demo arms (arms/*.json) appear only in invariant checks, never as a source of expected values.
 *
 * Outside references are named beside each check: closed forms (CHECKS C1, C5, C13 and geometry derived in the
 * comments), brute-force fine sampling of a closed form, URDF roll-pitch-yaw written out by hand with ml-matrix
 * products, and the Jacobian definition (J·q̇ = [v; 0]).
 */
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../../src/catalog/index";
import {
  compileChain,
  createScratch,
  forwardInto,
  jacobianInto,
  toolPointInto,
  type Chain,
} from "../../../../src/core";
import { lineCheck } from "../../../../src/core/analysis/line";
import { referenceToolRotation, rpyToolRotation } from "../../../../src/core/kinematics/toolOrientation";
import { expectClose, expectRelClose } from "../../../helpers/expectClose";
import { bound3r, CHAIN_3R, CHAIN_6R, DEG, ik3r, planar3r, rates3r, W3R } from "./fixtures";

describe("lineCheck(planar 3R, (x, y, θ) task)", () => {
  // Line from (0.3, 0.5) to (0.8, −0.1) m at φ = 0.3 rad; the wrist point stays between 0.51 and 0.72 m from the
  // origin, inside the 2R annulus [0.1, 0.9] m (CHECKS C3), so no singular pose on the way.
  const P0 = [0.3, 0.5],
    P1 = [0.8, -0.1],
    PHI = 0.3;
  const len = Math.hypot(P1[0]! - P0[0]!, P1[1]! - P0[1]!);
  const u = [(P1[0]! - P0[0]!) / len, (P1[1]! - P0[1]!) / len];
  const speed = 0.5; // m/s
  const at = (f: number) => [P0[0]! + f * (P1[0]! - P0[0]!), P0[1]! + f * (P1[1]! - P0[1]!)];
  const start = ik3r(P0[0]!, P0[1]!, PHI, 1);
  const r = lineCheck(
    CHAIN_3R,
    {
      startM: [P0[0]!, P0[1]!, 0],
      endM: [P1[0]!, P1[1]!, 0],
      baseFromToolRotation: rpyToolRotation(0, 0, PHI),
      speedMPerS: speed,
      startJointsSi: start,
    },
    { samples: 51 },
  );

  it("follows the whole line on the start's elbow branch: samples[].jointsDeg = closed-form 2R IK of the wrist point", () => {
    expect(r.outOfReach).toEqual([]);
    expect(r.branchChanges).toEqual([]);
    expect(r.orientationHeld).toBe("full");
    for (const s of r.samples) {
      expect(s.reachable).toBe(true);
      const p = at(s.fraction);
      // Closed form (law of cosines); IK converged to 1e-10 m: 1e-6 deg.
      expectClose(
        s.jointsDeg!,
        ik3r(p[0]!, p[1]!, PHI, 1).map((v) => v / DEG),
        1e-6,
        `jointsDeg at ${s.fraction}`,
      );
      expectClose(s.positionMm, [p[0]! * 1000, p[1]! * 1000, 0], 1e-9, "positionMm");
    }
  });

  it("samples[].jointRatesDegPerS = J⁻¹·v in closed form (CHECKS C1), rateRatios = |q̇ᵢ| / q̇maxᵢ", () => {
    for (const s of r.samples) {
      const p = at(s.fraction);
      const expected = rates3r(ik3r(p[0]!, p[1]!, PHI, 1), u[0]!, u[1]!).map((v) => v * speed);
      // Relative 1e-7 (joint values converged to 1e-10 m; the 2×2 inverse is well conditioned on this line).
      expectRelClose(
        s.jointRatesDegPerS!,
        expected.map((v) => v / DEG),
        1e-7,
        `rates at ${s.fraction}`,
        1e-6,
      );
      expectRelClose(
        s.rateRatios as number[],
        expected.map((v, i) => Math.abs(v) / W3R[i]!),
        1e-7,
        `rateRatios at ${s.fraction}`,
        1e-9,
      );
      // Local speed limit: commanded / max ratio = closed-form bound (mm/s).
      expectRelClose(
        s.localSpeedMmPerS!,
        bound3r(ik3r(p[0]!, p[1]!, PHI, 1), u[0]!, u[1]!).speed * 1000,
        1e-7,
        "localSpeedMmPerS",
      );
    }
  });

  it("feasibleConstantSpeedMmPerS = min over the line of minᵢ q̇maxᵢ / |(J⁻¹u)ᵢ| (brute force, 200 001 points) at the bottleneck", () => {
    // Independent check: the closed-form bound sampled every 3.9 µm along the line. Tolerance 1e-5 relative: the
    // sampled minimum is within (slope × step / 2) of the true one, about 1e-6 relative on this line.
    let best = { speed: Infinity, joint: -1, f: 0 };
    const N = 200_000;
    for (let k = 0; k <= N; k++) {
      const f = k / N,
        p = at(f);
      const b = bound3r(ik3r(p[0]!, p[1]!, PHI, 1), u[0]!, u[1]!);
      if (b.speed < best.speed) best = { ...b, f };
    }
    expectRelClose(r.feasibleConstantSpeedMmPerS!, best.speed * 1000, 1e-5, "feasibleConstantSpeedMmPerS");
    expect(r.bottleneck!.reason).toBe("joint rate");
    expect(r.bottleneck!.joint).toBe(`j${best.joint + 1}`);
    expectClose(r.bottleneck!.fraction, best.f, 1e-4, "bottleneck.fraction");
    expectRelClose(r.bottleneck!.rateRatio!, speed / best.speed, 1e-5, "bottleneck.rateRatio");
    expect(r.commandedSpeedFeasible).toBe(speed <= best.speed);
    // The per-sample profile never allows less than the constant speed (it is the minimum over more points).
    for (const p of r.speedProfile)
      expect(p.speedMmPerS!).toBeGreaterThanOrEqual(r.feasibleConstantSpeedMmPerS! * (1 - 1e-9));
  });

  it("feasibleConstantSpeedMmPerS does not depend on the commanded speed; rateRatios scale with it (q̇ = B·v is linear in v)", () => {
    const r2 = lineCheck(
      CHAIN_3R,
      {
        startM: [P0[0]!, P0[1]!, 0],
        endM: [P1[0]!, P1[1]!, 0],
        baseFromToolRotation: rpyToolRotation(0, 0, PHI),
        speedMPerS: 2 * speed,
        startJointsSi: start,
      },
      { samples: 51 },
    );
    expectRelClose(r2.feasibleConstantSpeedMmPerS!, r.feasibleConstantSpeedMmPerS!, 1e-9, "feasible at 2v");
    expectRelClose(
      r2.samples[20]!.rateRatios as number[],
      (r.samples[20]!.rateRatios as number[]).map((v) => 2 * v),
      1e-9,
      "ratios at 2v",
    );
  });

  it("a line leaving the reach: outOfReach starts where the wrist point reaches a1 + a2 (CHECKS C3), feasible speed 0", () => {
    // φ = 0 and y = 0.2: the wrist point (x − 0.1, 0.2) leaves the disc of radius 0.9 at x = 0.1 + sqrt(0.81 − 0.04).
    const out = lineCheck(
      CHAIN_3R,
      { startM: [0.5, 0.2, 0], endM: [1.3, 0.2, 0], baseFromToolRotation: rpyToolRotation(0, 0, 0), speedMPerS: 0.5 },
      { samples: 41 },
    );
    const xEdge = 0.1 + Math.sqrt(0.81 - 0.04);
    expect(out.outOfReach).toHaveLength(1);
    // Located by continuation down to the 1 µm minimum step: 10 µm (0.01 mm) tolerance.
    expectClose(out.outOfReach[0]!.fromPositionMm[0]!, xEdge * 1000, 0.01, "boundary x");
    expectClose(out.outOfReach[0]!.fromFraction, (xEdge - 0.5) / 0.8, 0.01 / 800, "boundary fraction");
    expect(out.outOfReach[0]!.toFraction).toBe(1);
    expect(out.feasibleConstantSpeedMmPerS).toBe(0);
    expect(out.commandedSpeedFeasible).toBe(false);
    expect(out.bottleneck!.reason).toBe("out of reach");
    for (const s of out.samples) expect(s.reachable).toBe(s.positionMm[0]! < xEdge * 1000);
  });

  it("a line through the inner hole: one outOfReach interval between the two crossings of |w| = a1 − a2 (CHECKS C3)", () => {
    // φ = 0, y = 0.02: the wrist point (x − 0.1, 0.02) is closer than 0.1 m to the origin for |x − 0.1| < sqrt(0.01 − 0.0004).
    const hole = lineCheck(
      CHAIN_3R,
      {
        startM: [-0.5, 0.02, 0],
        endM: [0.7, 0.02, 0],
        baseFromToolRotation: rpyToolRotation(0, 0, 0),
        speedMPerS: 0.5,
      },
      { samples: 61 },
    );
    const h = Math.sqrt(0.01 - 0.0004);
    expect(hole.outOfReach).toHaveLength(1);
    expectClose(hole.outOfReach[0]!.fromPositionMm[0]!, (0.1 - h) * 1000, 0.01, "hole entry x");
    expectClose(hole.outOfReach[0]!.toPositionMm[0]!, (0.1 + h) * 1000, 0.01, "hole exit x");
    expect(hole.feasibleConstantSpeedMmPerS).toBe(0);
  });

  it("a joint range crossed: jointLimitViolations names j1 where the closed-form q1 reaches −30°; no feasible speed", () => {
    const limited = compileChain(planar3r([-30, 170]));
    const v = lineCheck(
      limited,
      {
        startM: [P0[0]!, P0[1]!, 0],
        endM: [P1[0]!, P1[1]!, 0],
        baseFromToolRotation: rpyToolRotation(0, 0, PHI),
        speedMPerS: speed,
        startJointsSi: start,
      },
      { samples: 51 },
    );
    // Closed-form q1 along the line (elbow +) falls from 20° at the start to about −43.5° near f = 0.9 and turns
    // back a little: bisection on [0, 0.75] (where it is still falling) for q1 = −30°, dense sampling for the minimum.
    let lo = 0,
      hi = 0.75;
    for (let i = 0; i < 60; i++) {
      const mid = (lo + hi) / 2,
        p = at(mid);
      if (ik3r(p[0]!, p[1]!, PHI, 1)[0]! > -30 * DEG) lo = mid;
      else hi = mid;
    }
    expect(v.jointLimitViolations).toHaveLength(1);
    const viol = v.jointLimitViolations[0]!;
    expect(viol).toMatchObject({ joint: "j1", bound: "lower", unit: "deg", toFraction: 1 });
    expectClose(viol.limitValue, -30, 1e-9, "limitValue");
    // Linear interpolation between continuation points at most one sample spacing (2 %) apart: 1e-4 in fraction.
    expectClose(viol.fromFraction, lo, 1e-4, "violation start");
    let minQ1 = Infinity;
    for (let k = 0; k <= 100_000; k++) {
      const p = at(k / 100_000);
      minQ1 = Math.min(minQ1, ik3r(p[0]!, p[1]!, PHI, 1)[0]!);
    }
    // The extreme is taken over the accepted continuation points, at most one sample spacing (16 mm) apart; near the
    // minimum that is within q1''·h²/8 of the true minimum: 0.01° here.
    expectClose(viol.extremeValue, minQ1 / DEG, 0.01, "extreme q1");
    // A line the arm cannot follow within its joint ranges has no feasible speed: 0, not feasible, and the start
    // branch says why and where (the closed-form crossing above).
    expect(v.feasibleConstantSpeedMmPerS).toBe(0);
    expect(v.commandedSpeedFeasible).toBe(false);
    expect(v.followed).toBe(false);
    expect(v.bottleneck).toMatchObject({ reason: "joint limit", joint: "j1" });
    expect(v.startBranch).toMatchObject({ followed: false, reason: "joint limit", joint: "j1" });
    expectClose(v.startBranch!.atFraction!, lo, 1e-4, "reason at the crossing");
  });
});

describe("lineCheck start branch", () => {
  // Tool-down line along y at x = 1.2 m, z = 0.3 m (generic 6R).
  const down = referenceToolRotation(CHAIN_6R, "down", [1.2, -0.4, 0.3], [0, 0, -1]);
  const input = { startM: [1.2, -0.4, 0.3], endM: [1.2, 0.4, 0.3], baseFromToolRotation: down, speedMPerS: 0.5 };

  it("default rule: of the start solutions listed, the chosen one has the fewest problems, then the highest feasible speed", () => {
    const res = lineCheck(CHAIN_6R, input, { samples: 21 });
    expect(res.startRule).toBe("best run");
    expect(res.startBranches.length).toBeGreaterThanOrEqual(2);
    expect(res.startBranches.filter((b) => b.chosen)).toHaveLength(1);
    expect(new Set(res.startBranches.map((b) => b.branch)).size).toBe(res.startBranches.length); // one per branch name
    const chosen = res.startBranch!;
    const problems = (b: typeof chosen) => b.jumps + b.jointLimitViolations;
    for (const b of res.startBranches) {
      expect(problems(b)).toBeGreaterThanOrEqual(problems(chosen));
      if (problems(b) === problems(chosen))
        expect(b.feasibleConstantSpeedMmPerS!).toBeLessThanOrEqual(chosen.feasibleConstantSpeedMmPerS! * (1 + 1e-9));
    }
    expect(res.samples[0]!.branch).toBe(chosen.branch);
    expect(res.feasibleConstantSpeedMmPerS).toBe(chosen.feasibleConstantSpeedMmPerS);
  });

  it("startJointsSi picks the solution nearest to the given joints (an elbow-down posture here)", () => {
    // Closed-form check of the posture: an elbow-down solution has the elbow (origin of axis 3) below the line from
    // axis 2 to the wrist centre; we only give a rough elbow-down guess and ask for the branch name.
    const res = lineCheck(
      CHAIN_6R,
      { ...input, startJointsSi: [-20 * DEG, 80 * DEG, 150 * DEG, 0, 60 * DEG, 0] },
      { samples: 21 },
    );
    expect(res.startRule).toBe("nearest start joints");
    expect(res.startBranches).toHaveLength(1);
    expect(res.startBranch!.branch).toContain("elbow down");
  });
});

describe("lineCheck input errors (RangeError, STYLE C9)", () => {
  const rot = rpyToolRotation(0, 0, 0);
  const ok = { startM: [0.5, 0.2, 0], endM: [0.6, 0.2, 0], baseFromToolRotation: rot, speedMPerS: 0.1 };
  it.each([
    ["speed 0", { ...ok, speedMPerS: 0 }, /invalid speedMPerS/],
    ["zero length", { ...ok, endM: [0.5, 0.2, 0] }, /same point/],
    ["not a rotation", { ...ok, baseFromToolRotation: [1, 0, 0, 0, 2, 0, 0, 0, 1] }, /not orthonormal/],
    ["reflection", { ...ok, baseFromToolRotation: [1, 0, 0, 0, 1, 0, 0, 0, -1] }, /reflection/],
    ["start joints count", { ...ok, startJointsSi: [0, 0] }, /invalid startJointsSi/],
    ["NaN in the line", { ...ok, startM: [NaN, 0, 0] }, /invalid startM/],
  ])("%s", (_, input, message) => {
    expect(() => lineCheck(CHAIN_3R, input)).toThrow(RangeError);
    expect(() => lineCheck(CHAIN_3R, input)).toThrow(message);
  });
  it("samples < 2", () => expect(() => lineCheck(CHAIN_3R, ok, { samples: 1 })).toThrow(/invalid samples/));
});

describe("lineCheck on the demo arms (invariants only)", async () => {
  const { arms } = await loadArms([fileURLToPath(new URL("../../../../arms", import.meta.url))]);
  it("there are demo arms to check", () => expect(arms.length).toBeGreaterThan(0));

  /** A pose away from the zero pose: 40 % into each joint's range (0.3 rad or m where the range is open). */
  function poseOf(chain: Chain): Float64Array {
    return Float64Array.from({ length: chain.drivenCount }, (_, i) => {
      const lo = chain.lowerSi[i]!,
        hi = chain.upperSi[i]!;
      return Number.isFinite(lo) && Number.isFinite(hi) ? lo + 0.4 * (hi - lo) : 0.3;
    });
  }

  it.each(arms.map((a) => [a.id, a] as const))(
    "%s: samples reproduce the line (FK), J·q̇ = [v; 0], speed figures consistent",
    (_, arm) => {
      const chain = arm.chain,
        m = chain.drivenCount;
      const q0 = poseOf(chain);
      const s = createScratch(chain);
      const f = forwardInto(chain, q0, s);
      const rot = [f[0]!, f[1]!, f[2]!, f[4]!, f[5]!, f[6]!, f[8]!, f[9]!, f[10]!];
      const start = [f[3]!, f[7]!, f[11]!];
      const dir = [0.6, -0.48, 0.64]; // unit vector
      const end = start.map((v, i) => v + 0.06 * dir[i]!);
      const speed = 0.25;
      const res = lineCheck(
        chain,
        { startM: start, endM: end, baseFromToolRotation: rot, speedMPerS: speed, startJointsSi: q0 },
        { samples: 11 },
      );
      const res2 = lineCheck(
        chain,
        { startM: start, endM: end, baseFromToolRotation: rot, speedMPerS: 2 * speed, startJointsSi: q0 },
        { samples: 11 },
      );
      expect(res.orientationHeld).toBe("full");
      const j = new Float64Array(6 * m),
        tcp = new Float64Array(3);
      for (const smp of res.samples) {
        if (!smp.reachable) continue;
        // Forward kinematics of the reported joints reproduces the line point and the constant orientation.
        const q = smp.jointsDeg!.map((v, i) => (res.jointUnits[i] === "mm" ? v / 1000 : v * DEG));
        const t = forwardInto(chain, q, s);
        toolPointInto(tcp, s, 0, 0, 0);
        expectClose(
          Array.from(tcp, (v) => v * 1000),
          smp.positionMm,
          1e-5,
          `${arm.id}: position at ${smp.fraction}`,
        );
        expectClose(
          [t[0]!, t[1]!, t[2]!, t[4]!, t[5]!, t[6]!, t[8]!, t[9]!, t[10]!],
          rot,
          1e-8,
          `${arm.id}: rotation at ${smp.fraction}`,
        );
        // The reported rates are joint rates that move the TCP at v along the line with zero angular velocity.
        if (!smp.jointRatesDegPerS) continue;
        jacobianInto(j, chain, s, tcp[0]!, tcp[1]!, tcp[2]!);
        const qd = smp.jointRatesDegPerS.map((v, i) => (res.jointUnits[i] === "mm" ? v / 1000 : v * DEG));
        const twist = [0, 1, 2, 3, 4, 5].map((r) => qd.reduce((acc, v, c) => acc + j[r * m + c]! * v, 0));
        expectClose(
          twist,
          [...res.direction.map((d) => d * speed), 0, 0, 0],
          1e-7,
          `${arm.id}: J·q̇ at ${smp.fraction}`,
        );
      }
      if (res.feasibleConstantSpeedMmPerS !== null && res.feasibleConstantSpeedMmPerS > 0) {
        expectRelClose(
          res2.feasibleConstantSpeedMmPerS!,
          res.feasibleConstantSpeedMmPerS,
          1e-9,
          `${arm.id}: feasible speed independent of the command`,
        );
        for (const p of res.speedProfile)
          if (p.speedMmPerS !== null)
            expect(p.speedMmPerS).toBeGreaterThanOrEqual(res.feasibleConstantSpeedMmPerS * (1 - 1e-9));
      }
    },
  );
});
