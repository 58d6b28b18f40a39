/**
 * Tests of src/core/analysis/line/continuation.ts (through lineCheck): the walk near and through singular poses
 * (CHECKS C5: wrist q5 = 0, shoulder: wrist centre on axis 1), branch changes and jumps, and the tool-axis task of a
 * five-joint arm. Chains and closed forms: fixtures.ts (generic 6R of CHECKS §0, TCP poses from the independent
 * mathjs DH product of test/helpers/testArms.ts).
 */
import { describe, expect, it } from "vitest";
import { compileChain, createScratch, forwardInto, jacobianInto } from "../../../../src/core";
import { lineCheck } from "../../../../src/core/analysis/line";
import { referenceToolRotation, rpyToolRotation } from "../../../../src/core/kinematics/toolOrientation";
import { expectClose, expectRelClose } from "../../../helpers/expectClose";
import { generic6rDh, GENERIC_6R_SI } from "../../../helpers/testArms";
import { CHAIN_6R, DEG, peakRate, pose6r } from "./fixtures";

describe("lineCheck(generic 6R) near and through a wrist singularity (CHECKS C5: q5 = 0)", () => {
  it("tool down, line crossing q5 = 0: kind 'wrist', a continuous wrist flip (q5 changes sign) and q4 constant", () => {
    // Singular pose q_s = (0, −20°, 20°, 0, 0, 0): q2 + q3 = 0 keeps the forearm (axis 4) vertical and q5 = 0 puts
    // axis 6 on it, so the tool points straight down (mathjs DH product). The line passes through its TCP at
    // fraction 0.5 (20 samples: none lands exactly on it).
    // Derived: for tool down, axis 4 and the tool axis both lie in the arm's vertical plane (no lateral offsets in
    // this arm), so q4 stays at 0 (or π) and the wrist crosses q5 = 0 with finite rates; the branch name's wrist
    // sign (det[z4 z5 z6] = −sin q5, CHECKS C5) changes without any joint jump.
    const qs = [0, -20 * DEG, 20 * DEG, 0, 0, 0];
    const { p, r: rot } = pose6r(qs);
    expectClose([rot[2]!, rot[5]!, rot[8]!], [0, 0, -1], 1e-12, "tool axis of q_s is down");
    const down = referenceToolRotation(CHAIN_6R, "down", p, [0, 0, -1]);
    const res = lineCheck(
      CHAIN_6R,
      {
        startM: [p[0]! - 0.1, p[1]! + 0.05, p[2]!],
        endM: [p[0]! + 0.1, p[1]! - 0.05, p[2]!],
        baseFromToolRotation: down,
        speedMPerS: 0.25,
        startJointsSi: qs,
      },
      { samples: 20 },
    );
    expect(res.nearestSingularity!.kind).toBe("wrist");
    expect(res.nearestSingularity!.singular).toBe(true);
    expect(res.nearestSingularity!.inverseCondition).toBeLessThan(1e-6);
    expectClose(res.nearestSingularity!.fraction, 0.5, 1e-5, "singular point at the middle");
    expect(res.branchChanges).toHaveLength(1);
    const flip = res.branchChanges[0]!;
    expect(flip).toMatchObject({ kind: "wrist flip", continuous: true, acrossGap: false });
    expect(flip.from).not.toBe(flip.to);
    expectClose(flip.fraction, 0.5, 0.01, "flip at the middle");
    const q4 = res.samples[0]!.jointsDeg![3]!;
    for (const s of res.samples) {
      expectClose(s.jointsDeg![3]!, q4, 1e-6, "q4 constant");
      expectClose(s.jointRatesDegPerS![3]!, 0, 1e-6, "q̇4 = 0");
      expect(Math.sign(s.jointsDeg![4]!)).toBe(
        s.fraction < 0.5 ? Math.sign(res.samples[0]!.jointsDeg![4]!) : -Math.sign(res.samples[0]!.jointsDeg![4]!),
      );
    }
    expect(res.outOfReach).toEqual([]);
    expect(res.feasibleConstantSpeedMmPerS!).toBeGreaterThan(0);
  });

  it("tool tilted 10° from down: peak q̇4 and q̇6 grow like 1/d (rate × d constant) with opposite signs; kind 'wrist'", () => {
    // Singular pose q_s = (0, −20°, 30°, 0, 0, 0): the forearm is tilted 10° in the arm plane and q5 = 0, so the
    // tool axis is tilted 10° from down (mathjs DH product). With the tool axis out of the vertical, the wrist
    // singular poses at this orientation form a curve in the arm plane y = 0; lines along y pass it at distance d.
    // Derived: the tool axis seen from the forearm passes axis 4 at an angle ε ∝ d, and a path passing a pole at
    // angular distance ε turns its azimuth (q4, and q6 against it) at a peak rate ∝ 1/ε; so peak rate × d → const.
    // Tolerance 1 %: besides the 1/d part, each rate has a bounded part (q6 also turns the tool with joint 1),
    // which changes the product by O(d): about 0.5 % at d = 1 mm against d = 0.125 mm.
    const qs = [0, -20 * DEG, 30 * DEG, 0, 0, 0];
    const { p, r: rot } = pose6r(qs);
    expectClose(Math.acos(-rot[8]!) / DEG, 10, 1e-9, "tilt of the tool axis");
    const products4: number[] = [],
      products6: number[] = [];
    for (const dMm of [1, 0.5, 0.25, 0.125]) {
      const d = dMm / 1000;
      const res = lineCheck(
        CHAIN_6R,
        {
          startM: [p[0]! + d, p[1]! - 0.1, p[2]!],
          endM: [p[0]! + d, p[1]! + 0.1, p[2]!],
          baseFromToolRotation: rot,
          speedMPerS: 0.1,
          startJointsSi: qs,
        },
        { samples: 41 },
      );
      expect(res.nearestSingularity!.kind).toBe("wrist");
      expect(res.branchChanges).toEqual([]);
      const p4 = peakRate(res, 3),
        p6 = peakRate(res, 5);
      expect(res.samples[p4.sample]!.fraction).toBe(0.5); // closest approach: the line crosses y = 0 at the middle
      const atPeak = res.samples[p4.sample]!.jointRatesDegPerS!;
      expect(atPeak[3]! * atPeak[5]!).toBeLessThan(0);
      products4.push(p4.value * dMm);
      products6.push(p6.value * dMm);
      expect(res.bottleneck!.joint).toBe("j4"); // q̇4 ≈ −q̇6 and j4 has the lower limit (300 < 400 °/s)
    }
    expectRelClose(
      products4,
      products4.map(() => products4[products4.length - 1]!),
      0.01,
      "peak q̇4 × d",
    );
    expectRelClose(
      products6,
      products6.map(() => products6[products6.length - 1]!),
      0.01,
      "peak q̇6 × d",
    );
  });
});

describe("lineCheck(generic 6R) near the shoulder singularity (CHECKS C5: wrist centre on axis 1)", () => {
  it("the wrist centre passing axis 1 at distance d: kind 'shoulder', q̇1 = v·d / (d² + x²) exactly, joints 4 and 6 spin", () => {
    // Tool tilted 30° from down about base x (so the wrist must turn about a non-vertical axis to compensate q̇1).
    // The wrist centre is d6 = 0.1 m behind the TCP along the tool axis; it runs on the line (x, d, 1.3 m),
    // x ∈ [−0.15, 0.15] m. This arm has no lateral offsets, so the wrist centre lies in the arm plane and its
    // azimuth is q1 (or q1 + π): a point moving at speed v on a straight line at distance d from the axis has
    // azimuth rate v·d / (d² + x²) (closed form), at every sample.
    const rot = Array.from(rpyToolRotation(Math.PI + 30 * DEG, 0, 0));
    const z = [rot[2]!, rot[5]!, rot[8]!];
    const v = 0.1;
    const p4d: number[] = [],
      p6d: number[] = [];
    for (const dMm of [4, 2, 1]) {
      const d = dMm / 1000;
      const w0 = [-0.15, d, 1.3],
        w1 = [0.15, d, 1.3];
      const res = lineCheck(
        CHAIN_6R,
        {
          startM: w0.map((c, i) => c + GENERIC_6R_SI.d6 * z[i]!),
          endM: w1.map((c, i) => c + GENERIC_6R_SI.d6 * z[i]!),
          baseFromToolRotation: rot,
          speedMPerS: v,
        },
        { samples: 61 },
      );
      expect(res.outOfReach).toEqual([]);
      expect(res.branchChanges).toEqual([]);
      expect(res.nearestSingularity!.kind).toBe("shoulder");
      expectClose(res.nearestSingularity!.fraction, 0.5, 1e-3, "nearest singularity at the closest approach");
      for (const s of res.samples) {
        const x = -0.15 + 0.3 * s.fraction;
        // Relative 1e-6 (floor 1e-3 deg/s).
        expectRelClose(
          Math.abs(s.jointRatesDegPerS![0]!),
          (v * d) / (d * d + x * x) / DEG,
          1e-6,
          `q̇1 at x = ${x}`,
          1e-3,
        );
      }
      const p4 = peakRate(res, 3),
        p6 = peakRate(res, 5);
      const end4 = Math.abs(res.samples[0]!.jointRatesDegPerS![3]!),
        end6 = Math.abs(res.samples[0]!.jointRatesDegPerS![5]!);
      expect(p4.value).toBeGreaterThan(100 * end4); // joints 4 and 6 spin near the axis, not at the ends
      expect(p6.value).toBeGreaterThan(100 * end6);
      p4d.push(p4.value * dMm);
      p6d.push(p6.value * dMm);
      expect(res.bottleneck!.joint).toBe("j1"); // q̇1 peaks at v/d and has the lowest limit (150 °/s)
    }
    // Derived as above: the wrist compensates q̇1 about a fixed tool direction, so its rates follow 1/d too (1 %).
    expectRelClose(
      p4d,
      p4d.map(() => p4d[p4d.length - 1]!),
      0.01,
      "peak q̇4 × d",
    );
    expectRelClose(
      p6d,
      p6d.map(() => p6d[p6d.length - 1]!),
      0.01,
      "peak q̇6 × d",
    );
  });
});

describe("lineCheck(generic 6R) never jumps branches silently", () => {
  // The tilted-wrist line of above at d = 0.1 µm from the singular pose: q4 and q6 turn by about 180° within a
  // few tenths of a µm, far below a 10 µm minimum step, so no continuous solution exists at that resolution and
  // the only way on is a wrist flip (q4 and q6 jumping against each other).
  const qs = [0, -20 * DEG, 30 * DEG, 0, 0, 0];
  const { p, r: rot } = pose6r(qs);
  const run = (dM: number, minStepM: number) =>
    lineCheck(
      CHAIN_6R,
      {
        startM: [p[0]! + dM, p[1]! - 0.1, p[2]!],
        endM: [p[0]! + dM, p[1]! + 0.1, p[2]!],
        baseFromToolRotation: rot,
        speedMPerS: 0.1,
        startJointsSi: qs,
      },
      { samples: 41, minStepM },
    );

  it("a line whose only continuation is a wrist flip reports it in branchChanges (jump), with feasible speed 0", () => {
    const res = run(1e-7, 1e-5);
    expect(res.branchChanges).toHaveLength(1);
    const flip = res.branchChanges[0]!;
    expect(flip).toMatchObject({ kind: "wrist flip", continuous: false });
    expectClose(flip.fraction, 0.5, 1e-3, "flip at the singular pose");
    // q4 and q6 jump by large, opposite amounts (more than the 0.3 rad jump threshold); the arm joints hardly move.
    expect(Math.abs(flip.jointChangeDeg[3]!)).toBeGreaterThan(0.3 / DEG);
    expect(flip.jointChangeDeg[3]! * flip.jointChangeDeg[5]!).toBeLessThan(0);
    for (const i of [0, 1, 2]) expect(Math.abs(flip.jointChangeDeg[i]!)).toBeLessThan(0.1);
    expect(res.feasibleConstantSpeedMmPerS).toBe(0);
    expect(res.bottleneck).toMatchObject({ reason: "jump" });
  });

  it("the same line 0.1 mm from the singular pose is followed continuously (no change reported)", () => {
    const res = run(1e-4, 1e-6);
    expect(res.branchChanges).toEqual([]);
    expect(res.feasibleConstantSpeedMmPerS!).toBeGreaterThan(0);
  });
});

describe("lineCheck(five-joint arm): the tool axis is held when the full orientation cannot be", () => {
  it("orientationHeld 'tool axis'; FK reproduces the line and the axis; J·q̇ = [v; ω] with ω along the tool axis", () => {
    // Invented 5R: the first five joints of the generic 6R, flange 0.1 m along axis 5's z (so the tool axis is
    // free to point anywhere near, but the rotation about it follows the arm). A tilted tool orientation (roll
    // 180°, pitch 20°, yaw 0.4 rad) is not reachable as a full rotation along a line.
    const base = generic6rDh();
    const five = compileChain({
      ...base,
      joints: base.joints.slice(0, 5),
      flange: { xyzMm: [0, 0, 100], rpyDeg: [0, 0, 0] },
    });
    const rot = rpyToolRotation(Math.PI, 20 * DEG, 0.4);
    const axis = [rot[2]!, rot[5]!, rot[8]!];
    const res = lineCheck(
      five,
      { startM: [1.2, -0.3, 0.4], endM: [1.2, 0.3, 0.4], baseFromToolRotation: rot, speedMPerS: 0.5 },
      { samples: 11 },
    );
    expect(res.orientationHeld).toBe("tool axis");
    expect(res.outOfReach).toEqual([]);
    const s = createScratch(five),
      j = new Float64Array(30);
    for (const smp of res.samples) {
      const t = forwardInto(
        five,
        smp.jointsDeg!.map((v) => v * DEG),
        s,
      );
      // Position (1e-6 mm) and tool axis (1e-9) from forward kinematics.
      expectClose([t[3]! * 1000, t[7]! * 1000, t[11]! * 1000], smp.positionMm, 1e-6, "position");
      expectClose([t[2]!, t[6]!, t[10]!], axis, 1e-9, "tool axis");
      jacobianInto(j, five, s, t[3]!, t[7]!, t[11]!);
      const qd = smp.jointRatesDegPerS!.map((v) => v * DEG);
      const tw = [0, 1, 2, 3, 4, 5].map((r) => qd.reduce((acc, v, c) => acc + j[r * 5 + c]! * v, 0));
      expectClose(
        tw.slice(0, 3),
        res.direction.map((d) => d * 0.5),
        1e-9,
        "linear velocity",
      );
      const along = tw[3]! * axis[0]! + tw[4]! * axis[1]! + tw[5]! * axis[2]!;
      expectClose(
        tw.slice(3),
        axis.map((a) => a * along),
        1e-9,
        "angular velocity along the tool axis only",
      );
    }
  });
});
