/**
 * Tests of src/core/analysis/line.ts: lineCheck (straight TCP line at constant tool orientation and commanded
 * speed) and its orientation helpers.
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
import { Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../src/catalog/index";
import {
  compileChain,
  createScratch,
  forwardInto,
  jacobianInto,
  toolPointInto,
  type ArmKinematicsInput,
  type Chain,
} from "../../../src/core";
import {
  lineCheck,
  referenceToolRotation,
  rpyToolRotation,
  type LineCheckResult,
} from "../../../src/core/analysis/line";
import { expectClose, expectRelClose } from "../../helpers/expectClose";
import { dhFrameReference, flat4, generic6rDh, GENERIC_6R_SI } from "../../helpers/testArms";

const DEG = Math.PI / 180;

// ---------------------------------------------------------------------------------------------------------------
// Planar 3R and its closed forms.

const A1 = 0.5,
  A2 = 0.4,
  A3 = 0.1;
const W3R = [90 * DEG, 120 * DEG, 180 * DEG]; // rad/s

function planar3r(rangeJ1Deg?: [number, number]): ArmKinematicsInput {
  const joint = (i: number, aMm: number, speed: number) => ({
    name: `j${i + 1}`,
    kind: "revolute" as const,
    dh: { aMm, alphaDeg: 0, dMm: 0, thetaDeg: 0 },
    maxSpeedDegPerS: speed,
    ...(i === 0 && rangeJ1Deg ? { rangeDeg: rangeJ1Deg } : {}),
  });
  return {
    convention: "dh",
    joints: [joint(0, 500, 90), joint(1, 400, 120), joint(2, 100, 180)],
    flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
  };
}
const CHAIN_3R = compileChain(planar3r());

/** Closed-form IK of the planar 3R at TCP (x, y) and tool angle φ: law of cosines for the wrist point (2R). */
function ik3r(x: number, y: number, phi: number, elbow: 1 | -1): number[] {
  const wx = x - A3 * Math.cos(phi),
    wy = y - A3 * Math.sin(phi);
  const c2 = (wx * wx + wy * wy - A1 * A1 - A2 * A2) / (2 * A1 * A2);
  const q2 = elbow * Math.acos(c2);
  const q1 = Math.atan2(wy, wx) - Math.atan2(A2 * Math.sin(q2), A1 + A2 * Math.cos(q2));
  return [q1, q2, phi - q1 - q2];
}

/**
 * Joint rates per unit TCP velocity u = (ux, uy) at constant φ: [q̇1, q̇2] = J2R⁻¹ u with the CHECKS C1 Jacobian
 * J = [[−a1s1 − a2s12, −a2s12], [a1c1 + a2c12, a2c12]], det J = a1a2 s2, inverse by the 2×2 adjugate; q̇3 = −(q̇1 + q̇2).
 */
function rates3r(q: readonly number[], ux: number, uy: number): number[] {
  const s1 = Math.sin(q[0]!),
    c1 = Math.cos(q[0]!),
    s12 = Math.sin(q[0]! + q[1]!),
    c12 = Math.cos(q[0]! + q[1]!);
  const det = A1 * A2 * Math.sin(q[1]!);
  const q1 = (A2 * c12 * ux + A2 * s12 * uy) / det;
  const q2 = ((-A1 * c1 - A2 * c12) * ux + (-A1 * s1 - A2 * s12) * uy) / det;
  return [q1, q2, -(q1 + q2)];
}

/** Closed-form speed bound at one point: minᵢ q̇maxᵢ / |(J⁻¹u)ᵢ| (CHECKS C13 along the one direction u), m/s; and its joint. */
function bound3r(q: readonly number[], ux: number, uy: number): { speed: number; joint: number } {
  const r = rates3r(q, ux, uy);
  let speed = Infinity,
    joint = -1;
  r.forEach((v, i) => {
    const b = W3R[i]! / Math.abs(v);
    if (b < speed) {
      speed = b;
      joint = i;
    }
  });
  return { speed, joint };
}

const toRad = (deg: readonly number[]) => deg.map((v) => v * DEG);

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

  it("a joint range crossed: jointLimitViolations names j1 and the fraction where the closed-form q1 reaches −30°", () => {
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
    // A violation is a problem of the run, not a reason to stop: the speed figure is still given.
    expect(v.feasibleConstantSpeedMmPerS!).toBeGreaterThan(0);
  });
});

// ---------------------------------------------------------------------------------------------------------------
// Generic 6R (CHECKS §0).

const CHAIN_6R = compileChain(generic6rDh());
const W6R = [150, 150, 180, 300, 300, 400].map((v) => v * DEG); // CHECKS §0 invented limits, rad/s

/** TCP position (m) and rotation (row-major 3×3) of the generic 6R from the independent mathjs DH product. */
function pose6r(q: readonly number[]): { p: number[]; r: number[] } {
  const t = flat4(dhFrameReference(GENERIC_6R_SI.rows, q));
  return { p: [t[3]!, t[7]!, t[11]!], r: [t[0]!, t[1]!, t[2]!, t[4]!, t[5]!, t[6]!, t[8]!, t[9]!, t[10]!] };
}

/** Largest |rate| of driven joint i over the samples, and the sample it occurs at. */
function peakRate(r: LineCheckResult, i: number): { value: number; sample: number } {
  let value = 0,
    sample = -1;
  r.samples.forEach((s, k) => {
    const v = Math.abs(s.jointRatesDegPerS?.[i] ?? 0);
    if (v > value) {
      value = v;
      sample = k;
    }
  });
  return { value, sample };
}

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

describe("orientation helpers", () => {
  it("rpyToolRotation = Rz(yaw)·Ry(pitch)·Rx(roll) (URDF fixed axes), products by ml-matrix", () => {
    const [roll, pitch, yaw] = [0.3, -0.7, 1.1];
    const rx = new Matrix([
      [1, 0, 0],
      [0, Math.cos(roll), -Math.sin(roll)],
      [0, Math.sin(roll), Math.cos(roll)],
    ]);
    const ry = new Matrix([
      [Math.cos(pitch), 0, Math.sin(pitch)],
      [0, 1, 0],
      [-Math.sin(pitch), 0, Math.cos(pitch)],
    ]);
    const rz = new Matrix([
      [Math.cos(yaw), -Math.sin(yaw), 0],
      [Math.sin(yaw), Math.cos(yaw), 0],
      [0, 0, 1],
    ]);
    expectClose(rpyToolRotation(roll, pitch, yaw), rz.mmul(ry).mmul(rx).to1DArray(), 1e-15, "rpy");
  });

  it("referenceToolRotation: 'down' and 'outward' for a floor arm with axis 1 along base z (closed form)", () => {
    // down at (1, 0, 0.5): z = gravity (0, 0, −1), x = outward (1, 0, 0), y = z × x = (0, −1, 0).
    expectClose(
      referenceToolRotation(CHAIN_6R, "down", [1, 0, 0.5], [0, 0, -1]),
      [1, 0, 0, 0, -1, 0, 0, 0, -1],
      1e-15,
      "down",
    );
    // outward at (0, 2, 0.5): z = (0, 1, 0), x = gravity (0, 0, −1), y = z × x = (−1, 0, 0).
    expectClose(
      referenceToolRotation(CHAIN_6R, "outward", [0, 2, 0.5], [0, 0, -1]),
      [0, -1, 0, 0, 0, 1, -1, 0, 0],
      1e-15,
      "outward",
    );
    // Ceiling mounting (gravity along base +z): down = tool z along +z.
    const ceiling = referenceToolRotation(CHAIN_6R, "down", [1, 0, 0.5], [0, 0, 1]);
    expectClose([ceiling[2]!, ceiling[5]!, ceiling[8]!], [0, 0, 1], 1e-15, "ceiling down");
  });
});

describe("lineCheck on the demo arms (invariants only)", async () => {
  const { arms } = await loadArms([fileURLToPath(new URL("../../../arms", import.meta.url))]);
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
