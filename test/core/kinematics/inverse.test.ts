/**
 * Tests of src/core/kinematics/inverse.ts (solveIkInto, damped least squares), as the analysis uses it.
 *
 * Round trips FK(IK(x)) = x: targets are the forward kinematics of reproducible random joint values within the
 * limits (mulberry32), seeds are those joint values perturbed by up to ±0.2 rad (±20 mm for prismatic joints).
 * Task checked as inverse.ts states it: full flange pose for six or more driven joints; position and tool axis
 * (flange z) for fewer. Tolerances: position 1e-6 m, orientation 1e-5 rad (the solver stops at 1e-7 m / 1e-6 rad).
 * Targets at near-singular poses (σ_min/σ_max of the length-scaled Jacobian below 0.01, ml-matrix SVD, the
 * threshold at which singularityReport calls a pose singular) are skipped, since the task is ill-conditioned there;
 * the number skipped is asserted to stay at or below 20 % (about 12 % for these chains).
 *
 * Outside references: the independent mathjs DH product of test/helpers/testArms.ts for the generic 6R (CHECKS §0),
 * forwardInto for the demo arms (itself checked against finite differences and a KDL fixture), CHECKS C6 (reach of
 * the generic 6R) for the out-of-reach target, and the geometry of the zero lateral offset for the limit case.
 */
import { fileURLToPath } from "node:url";
import { Matrix, SingularValueDecomposition } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../src/catalog/index";
import type { Chain } from "../../../src/core";
import { compileChain, createScratch, forwardInto, jacobianInto } from "../../../src/core";
import { createIkScratch, solveIkInto } from "../../../src/core/kinematics/inverse";
import { expectClose } from "../../helpers/expectClose";
import { mulberry32, uniform } from "../../helpers/prng";
import { dhFrameReference, flat4, generic6rDh, GENERIC_6R_SI } from "../../helpers/testArms";

const DEG = Math.PI / 180;
const POSITION_TOL_M = 1e-6;
const ORIENTATION_TOL_RAD = 1e-5;

const ARMS_DIR = process.env.ARMDEX_ARMS_DIR ?? fileURLToPath(new URL("../../../arms", import.meta.url));
const { arms } = await loadArms([ARMS_DIR]);

/** Random driven-joint values within the limits (open limits: ±π rad, ±1 m). */
function randomPose(chain: Chain, rand: () => number): number[] {
  return Array.from({ length: chain.drivenCount }, (_, c) => {
    const open = chain.isPrismatic[chain.drivenJoint[c]!] ? 1 : Math.PI;
    return uniform(rand, Math.max(chain.lowerSi[c]!, -open), Math.min(chain.upperSi[c]!, open));
  });
}

/** σ_min/σ_max of the flange Jacobian with linear rows divided by the chain's length scale (ml-matrix SVD). */
function scaledInverseCondition(chain: Chain, q: ArrayLike<number>): number {
  const m = chain.drivenCount,
    s = createScratch(chain);
  const t = forwardInto(chain, q, s);
  const j = jacobianInto(new Float64Array(6 * m), chain, s, t[3]!, t[7]!, t[11]!);
  const scaled = Array.from(j, (v, i) => (i < 3 * m ? v / chain.characteristicLengthM : v));
  const sv = new SingularValueDecomposition(Matrix.from1DArray(6, m, scaled), { autoTranspose: true }).diagonal;
  return sv[Math.min(6, m) - 1]! / sv[0]!;
}

/** Rotation angle of Ra·Rbᵀ (rad), from two row-major 4×4 poses: atan2(‖vee(skew)‖, (trace − 1)/2). */
function rotationAngle(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const d = (r: number, c: number) =>
    a[r * 4]! * b[c * 4]! + a[r * 4 + 1]! * b[c * 4 + 1]! + a[r * 4 + 2]! * b[c * 4 + 2]!;
  const sin = Math.hypot(d(2, 1) - d(1, 2), d(0, 2) - d(2, 0), d(1, 0) - d(0, 1)) / 2;
  return Math.atan2(sin, (d(0, 0) + d(1, 1) + d(2, 2) - 1) / 2);
}

/** Angle between the z columns (tool axes) of two row-major 4×4 poses, rad. */
function axisAngle(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const cross = Math.hypot(
    a[6]! * b[10]! - a[10]! * b[6]!,
    a[10]! * b[2]! - a[2]! * b[10]!,
    a[2]! * b[6]! - a[6]! * b[2]!,
  );
  return Math.atan2(cross, a[2]! * b[2]! + a[6]! * b[6]! + a[10]! * b[10]!);
}

function positionError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return Math.hypot(a[3]! - b[3]!, a[7]! - b[7]!, a[11]! - b[11]!);
}

function withinLimits(chain: Chain, q: ArrayLike<number>): boolean {
  for (let c = 0; c < chain.drivenCount; c++)
    if (!(q[c]! >= chain.lowerSi[c]! && q[c]! <= chain.upperSi[c]!)) return false;
  return true;
}

interface RoundTripSummary {
  readonly tried: number;
  readonly skippedSingular: number;
  readonly failures: string[];
}

/**
 * Round trips on `count` random targets. `fk` is the forward kinematics used to build targets and to check results
 * (row-major 4×4, m). Returns a readable list of failures (not converged, error too large, outside the limits).
 */
function roundTrips(
  chain: Chain,
  fk: (q: ArrayLike<number>) => ArrayLike<number>,
  count: number,
  seed: number,
): RoundTripSummary {
  const m = chain.drivenCount,
    ik = createIkScratch(chain),
    rand = mulberry32(seed);
  const failures: string[] = [];
  let skippedSingular = 0;
  for (let k = 0; k < count; k++) {
    const q = randomPose(chain, rand);
    const start = q.map((v, c) => v + (chain.isPrismatic[chain.drivenJoint[c]!] ? 0.02 : 0.2) * uniform(rand, -1, 1));
    if (scaledInverseCondition(chain, q) < 0.01) {
      skippedSingular++;
      continue;
    }
    const target = Float64Array.from(fk(q));
    const out = new Float64Array(m);
    const converged = solveIkInto(out, chain, target, start, ik);
    const reached = fk(out);
    const dp = positionError(reached, target);
    const dr = m >= 6 ? rotationAngle(reached, target) : axisAngle(reached, target);
    const where = `pose ${k}: q = [${q.map((v) => v.toFixed(4))}]`;
    if (!withinLimits(chain, out))
      failures.push(`${where}: solution [${Array.from(out, (v) => v.toFixed(4))}] outside the limits`);
    if (!converged || dp > POSITION_TOL_M || dr > ORIENTATION_TOL_RAD) {
      const atLimit = Array.from(out)
        .map((v, c) =>
          Math.abs(v - chain.lowerSi[c]!) < 1e-9 || Math.abs(v - chain.upperSi[c]!) < 1e-9
            ? `joint ${c + 1} at its limit`
            : "",
        )
        .filter(Boolean);
      failures.push(
        `${where}: converged ${converged}, position error ${dp.toExponential(2)} m, orientation error ${dr.toExponential(2)} rad${atLimit.length ? ` (${atLimit.join(", ")})` : ""}`,
      );
    }
  }
  return { tried: count, skippedSingular, failures };
}

describe("solveIkInto: round trips FK(IK(x)) = x", () => {
  it("generic 6R (CHECKS §0): 100 random targets, checked with the independent mathjs DH product", () => {
    const chain = compileChain(generic6rDh());
    const fk = (q: ArrayLike<number>) => flat4(dhFrameReference(GENERIC_6R_SI.rows, q));
    const r = roundTrips(chain, fk, 100, 2101);
    expect(r.skippedSingular, "near-singular targets skipped (at most 20 %)").toBeLessThanOrEqual(20);
    expect(r.failures).toEqual([]);
  });

  it.each(arms.map((a) => [a.id, a] as const))("demo arm %s: 60 random targets within the limits", (_, arm) => {
    const chain = arm.chain,
      s = createScratch(chain);
    const fk = (q: ArrayLike<number>) => Float64Array.from(forwardInto(chain, q, s));
    const r = roundTrips(chain, fk, 60, 2102);
    expect(r.skippedSingular, "near-singular targets skipped (at most 20 %)").toBeLessThanOrEqual(12);
    expect(
      r.failures,
      `${arm.file}: ${r.failures.length} of ${r.tried - r.skippedSingular} round trips failed`,
    ).toEqual([]);
  });
});

describe("solveIkInto: unreachable targets and joint limits", () => {
  it("a target out of reach of the generic 6R returns false, with the result inside the limits", () => {
    // CHECKS C6: the flange stays within ρ_max + d6 = a2 + sqrt(a3² + d4²) + d6 ≈ 2.12 m of the axis-2 point
    // (0.2, 0, 0.5) m when a1 is counted; (3, 0, 0.5) m is 2.8 m from it, beyond any joint values.
    const chain = compileChain(generic6rDh());
    const ik = createIkScratch(chain),
      rand = mulberry32(2201);
    const target = flat4(dhFrameReference(GENERIC_6R_SI.rows, [0, 0, 0, 0, 0, 0]));
    target[3] = 3;
    target[7] = 0;
    target[11] = 0.5;
    for (let k = 0; k < 10; k++) {
      const out = new Float64Array(6);
      expect(solveIkInto(out, chain, target, randomPose(chain, rand), ik)).toBe(false);
      expect(withinLimits(chain, out), `result [${Array.from(out)}]`).toBe(true);
      expect(Array.from(out).every(Number.isFinite)).toBe(true);
    }
  });

  it.each(arms.map((a) => [a.id, a] as const))(
    "demo arm %s: a target 10 length scales away returns false",
    (_, arm) => {
      const chain = arm.chain,
        m = chain.drivenCount,
        s = createScratch(chain),
        ik = createIkScratch(chain);
      const target = Float64Array.from(
        forwardInto(
          chain,
          new Float64Array(m).map((_, c) => Math.min(Math.max(0, chain.lowerSi[c]!), chain.upperSi[c]!)),
          s,
        ),
      );
      target[3] = 10 * chain.characteristicLengthM;
      const out = new Float64Array(m);
      expect(
        solveIkInto(
          out,
          chain,
          target,
          new Float64Array(m).map((_, c) => (chain.lowerSi[c]! + chain.upperSi[c]!) / 2 || 0),
          ik,
        ),
      ).toBe(false);
      expect(withinLimits(chain, out)).toBe(true);
    },
  );

  it("a pose reachable only with joint 1 outside [−30°, 30°] returns false; the same pose converges without the limit", () => {
    // The generic 6R has no lateral offset, so the wrist centre lies in the plane of axis 1 and the arm: any solution
    // has q1 = azimuth of the wrist centre (front) or azimuth ± 180° (back). At q1 = 90° with r_w = 1.45 m (CHECKS C5
    // formula) both are ±90°, outside [−30°, 30°].
    const free = compileChain(generic6rDh());
    const base = generic6rDh();
    const limited = compileChain({
      ...base,
      joints: base.joints.map((j, i) => (i === 0 ? { ...j, rangeDeg: [-30, 30] } : j)),
    });
    const q = [90 * DEG, -0.7, 0.4, 1.1, 0.8, -0.2];
    const target = flat4(dhFrameReference(GENERIC_6R_SI.rows, q));
    const rand = mulberry32(2202);
    const ikLimited = createIkScratch(limited);
    for (let k = 0; k < 10; k++) {
      const out = new Float64Array(6);
      expect(solveIkInto(out, limited, target, randomPose(limited, rand), ikLimited)).toBe(false);
      expect(out[0]!).toBeGreaterThanOrEqual(-30 * DEG);
      expect(out[0]!).toBeLessThanOrEqual(30 * DEG);
    }
    const out = new Float64Array(6);
    expect(
      solveIkInto(
        out,
        free,
        target,
        q.map((v) => v + 0.1),
        createIkScratch(free),
      ),
    ).toBe(true);
    expectClose(flat4(dhFrameReference(GENERIC_6R_SI.rows, out)), target, 1e-6, "control: reachable without the limit");
  });

  it("every result of 20 solves per demo arm from random seeds (converged or not) lies within the limits", () => {
    // solveIkInto contract: "keeping every joint inside its range". Seeds anywhere in ±π (beyond the limits too).
    for (const arm of arms) {
      const chain = arm.chain,
        m = chain.drivenCount,
        s = createScratch(chain),
        ik = createIkScratch(chain);
      const rand = mulberry32(2203);
      for (let k = 0; k < 20; k++) {
        const target = Float64Array.from(forwardInto(chain, randomPose(chain, rand), s));
        const seed = Array.from({ length: m }, () => uniform(rand, -Math.PI, Math.PI));
        const out = new Float64Array(m);
        const ok = solveIkInto(out, chain, target, seed, ik);
        expect(withinLimits(chain, out), `${arm.id}: [${Array.from(out)}]`).toBe(true);
        if (ok) expect(positionError(forwardInto(chain, out, s), target)).toBeLessThan(POSITION_TOL_M);
      }
    }
  });
});
