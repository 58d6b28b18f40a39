/**
 * Tests of src/core/analysis/speed.ts: guaranteedLineSpeed (with lineRatesInto) and maxToolSpeed.
 *
 * Outside references: CHECKS C12 (velocity zonotope of the joint-rate box: 2R closed forms and numbers, vertex
 * enumeration, norm-equivalence bounds), CHECKS C13 (straight-line speed at constant orientation:
 * r = minᵢ wᵢ / ‖aᵢ‖ with aᵢ the rows of the first three columns of J⁻¹), ml-matrix (`inverse`, `pseudoInverse`,
 * `SingularValueDecomposition`) as an independent linear-algebra library, brute-force sampling of directions and of
 * the joint-rate box (seeded mulberry32), and hand derivations written out beside each check.
 * Chains: invented round-number chains (CHECKS §0 generic 6R and the local ones below); no real robot data.
 */
import { fileURLToPath } from "node:url";
import { Matrix, SingularValueDecomposition, inverse, pseudoInverse } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../src/catalog/index";
import type { ArmKinematicsInput, Chain } from "../../../src/core";
import { compileChain, createScratch, forwardInto, jacobianInto } from "../../../src/core";
import { createSpeedScratch, guaranteedLineSpeed, lineRatesInto, maxToolSpeed } from "../../../src/core/measures/speed";
import { expectClose, expectRelClose } from "../../helpers/expectClose";
import { mulberry32, uniform } from "../../helpers/prng";
import { generic6rDh, palletizerPassiveFrames, Q_STAR, scaraRrprDh } from "../../helpers/testArms";

const DEG = Math.PI / 180;

/** CHECKS §0: invented joint speed limits of the generic 6R, (150, 150, 180, 300, 300, 400) °/s, in rad/s. */
const W_6R = [150, 150, 180, 300, 300, 400].map((v) => v * DEG);

// ---------------------------------------------------------------------------------------------------------------
// Invented chains (round numbers, no real product).

/**
 * Invented 7R redundant arm, standard DH (Spong et al., ch. 3), θ offsets 0:
 *   i | a (mm) | α (deg) | d (mm) | speed (°/s)
 *   1 |   0    |  −90    |  400   | 100
 *   2 |   0    |  +90    |   0    | 100
 *   3 |  50    |  −90    |  500   | 120
 *   4 | −50    |  +90    |   0    | 120
 *   5 |   0    |  −90    |  400   | 180
 *   6 |   0    |  +90    |   0    | 180
 *   7 |   0    |    0    |  100   | 240
 */
function redundant7r(): ArmKinematicsInput {
  const rows = [
    [0, -90, 400, 100],
    [0, 90, 0, 100],
    [50, -90, 500, 120],
    [-50, 90, 0, 120],
    [0, -90, 400, 180],
    [0, 90, 0, 180],
    [0, 0, 100, 240],
  ] as const;
  return {
    convention: "dh",
    joints: rows.map(([aMm, alphaDeg, dMm, speed], i) => ({
      name: `j${i + 1}`,
      kind: "revolute" as const,
      dh: { aMm, alphaDeg, dMm, thetaDeg: 0 },
      rangeDeg: [-180, 180],
      maxSpeedDegPerS: speed,
    })),
    flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
  };
}

/** The generic 6R of CHECKS §0 without its last joint: five revolute joints, flange 100 mm along z of frame 5. */
function fiveJoint(): ArmKinematicsInput {
  const six = generic6rDh();
  return { ...six, joints: six.joints.slice(0, 5), flange: { xyzMm: [0, 0, 100], rpyDeg: [0, 0, 0] } };
}

// ---------------------------------------------------------------------------------------------------------------
// Helpers (independent of src/core/analysis).

/** 6 × m Jacobian of the flange origin (src/core jacobianInto, itself checked against finite differences, C11). */
function flangeJacobian(chain: Chain, q: ArrayLike<number>): Float64Array {
  const s = createScratch(chain);
  const t = forwardInto(chain, q, s);
  return jacobianInto(new Float64Array(6 * chain.drivenCount), chain, s, t[3]!, t[7]!, t[11]!);
}

/** Random driven-joint values within the limits (open limits: ±π rad, ±1 m). */
function randomPose(chain: Chain, rand: () => number): number[] {
  return Array.from({ length: chain.drivenCount }, (_, c) => {
    const open = chain.isPrismatic[chain.drivenJoint[c]!] ? 1 : Math.PI;
    const lo = Number.isFinite(chain.lowerSi[c]!) ? chain.lowerSi[c]! : -open;
    const hi = Number.isFinite(chain.upperSi[c]!) ? chain.upperSi[c]! : open;
    return uniform(rand, Math.max(lo, -open), Math.min(hi, open));
  });
}

/** σ_min / σ_max of a 6 × m matrix by ml-matrix SVD. */
function inverseConditionMl(j: ArrayLike<number>, m: number): number {
  const sv = new SingularValueDecomposition(Matrix.from1DArray(6, m, Array.from(j)), { autoTranspose: true }).diagonal;
  return sv[Math.min(6, m) - 1]! / sv[0]!;
}

/** r = minᵢ wᵢ / ‖row i of B‖ for an m × 3 ml-matrix B (CHECKS C13). */
function radiusOf(b: Matrix, w: readonly number[]): number {
  let r = Infinity;
  for (let i = 0; i < b.rows; i++) r = Math.min(r, w[i]! / Math.hypot(b.get(i, 0), b.get(i, 1), b.get(i, 2)));
  return r;
}

/** Uniform random unit vector (Archimedes: z uniform in [−1, 1], azimuth uniform). */
function randomUnit(rand: () => number): [number, number, number] {
  const z = uniform(rand, -1, 1),
    phi = uniform(rand, 0, 2 * Math.PI),
    rho = Math.sqrt(1 - z * z);
  return [rho * Math.cos(phi), rho * Math.sin(phi), z];
}

/** Naive vertex enumeration: max over all 2^m sign vectors of ‖Σ sᵢ wᵢ J_v,i‖ (CHECKS C12), written independently. */
function maxSpeedBruteForce(j: ArrayLike<number>, m: number, w: ArrayLike<number>): number {
  let best = 0;
  for (let mask = 0; mask < 1 << m; mask++) {
    const v = [0, 0, 0];
    for (let i = 0; i < m; i++) {
      const s = mask & (1 << i) ? -1 : 1;
      for (let r = 0; r < 3; r++) v[r] = v[r]! + s * w[i]! * j[r * m + i]!;
    }
    best = Math.max(best, Math.hypot(v[0]!, v[1]!, v[2]!));
  }
  return best;
}

/** Largest |entry| of a matrix (the scale of an absolute tolerance). */
function maxAbs(a: Matrix): number {
  return Math.max(...a.to1DArray().map(Math.abs));
}

/** The rows 0–2 (linear block) of a 6 × m Jacobian, as an ml-matrix. */
function linearBlock(j: ArrayLike<number>, m: number): Matrix {
  return Matrix.from1DArray(3, m, Array.from(j).slice(0, 3 * m));
}

// ---------------------------------------------------------------------------------------------------------------

describe("maxToolSpeed: planar 2R (CHECKS C12)", () => {
  /** CHECKS C1 closed-form 2R Jacobian, embedded in 6 × 2 rows (vx, vy, vz, ωx, ωy, ωz); independent of src/core. */
  function jacobian2r(a1: number, a2: number, q1: number, q2: number): number[] {
    const s1 = Math.sin(q1),
      c1 = Math.cos(q1),
      s12 = Math.sin(q1 + q2),
      c12 = Math.cos(q1 + q2);
    return [-a1 * s1 - a2 * s12, -a2 * s12, a1 * c1 + a2 * c12, a2 * c12, 0, 0, 0, 0, 0, 0, 1, 1];
  }

  it("maxToolSpeed(2R (1, 1), q = (0, 90°), w = (1, 1) rad/s) = √5 = 2.2360680", () => {
    // CHECKS C12 numbers [derived✓]; printed to 7 decimals, so 1e-7 abs; and √5 itself to 1e-12.
    const v = maxToolSpeed(jacobian2r(1, 1, 0, 90 * DEG), 2, [1, 1], createSpeedScratch(2));
    expectClose(v, 2.236068, 1e-7, "v_max");
    expectClose(v, Math.sqrt(5), 1e-12, "v_max = √5");
  });

  it("maxToolSpeed(2R (0.5, 0.3), q2 = 60°, w = (2, 3) rad/s) = 2.1794495", () => {
    // CHECKS C12 numbers [derived✓]; printed to 7 decimals.
    const v = maxToolSpeed(jacobian2r(0.5, 0.3, 0.4, 60 * DEG), 2, [2, 3], createSpeedScratch(2));
    expectClose(v, 2.1794495, 1e-7, "v_max");
  });

  it("maxToolSpeed(2R) equals the closed form sqrt(w1²‖J1‖² + w2²a2² + 2w1w2|a2² + a1a2c2|) at random poses", () => {
    // CHECKS C12 2R closed form [derived✓]; ‖J1‖ = sqrt(a1² + a2² + 2a1a2c2). Tolerance 1e-12 relative.
    const rand = mulberry32(12);
    const s = createSpeedScratch(2);
    for (let k = 0; k < 200; k++) {
      const a1 = uniform(rand, 0.1, 1.5),
        a2 = uniform(rand, 0.1, 1.5),
        q1 = uniform(rand, -Math.PI, Math.PI),
        q2 = uniform(rand, -Math.PI, Math.PI);
      const w1 = uniform(rand, 0.2, 5),
        w2 = uniform(rand, 0.2, 5),
        c2 = Math.cos(q2);
      const j1 = Math.sqrt(a1 * a1 + a2 * a2 + 2 * a1 * a2 * c2);
      const expected = Math.sqrt(
        w1 * w1 * j1 * j1 + w2 * w2 * a2 * a2 + 2 * w1 * w2 * Math.abs(a2 * a2 + a1 * a2 * c2),
      );
      expectRelClose(maxToolSpeed(jacobian2r(a1, a2, q1, q2), 2, [w1, w2], s), expected, 1e-12, `2R case ${k}`);
    }
  });

  it("guaranteedLineSpeed(planar 2R) = 0: constant orientation allows one line of motion only", () => {
    // Hand derivation from CHECKS C1: ωz = q̇1 + q̇2 = 0 forces q̇2 = −q̇1, so v = q̇1·(J1 − J2) is confined to one
    // line (and vz ≡ 0): not every direction is possible, so no speed is guaranteed in every direction.
    expect(guaranteedLineSpeed(jacobian2r(1, 1, 0, 90 * DEG), 2, [1, 1], createSpeedScratch(2))).toBe(0);
  });
});

describe("guaranteedLineSpeed: generic 6R (CHECKS §0, C13)", () => {
  const chain = compileChain(generic6rDh());

  it("the compiled chain carries the CHECKS §0 joint speed limits (the w used below)", () => {
    expectRelClose(chain.maxSpeedSi, W_6R, 1e-15, "maxSpeedSi");
  });

  /** Reproducible random poses whose Jacobian is well away from singular (σ_min/σ_max ≥ 1e-3 by ml-matrix SVD). */
  function regularPoses(count: number, seed: number): number[][] {
    const rand = mulberry32(seed);
    const out: number[][] = [];
    while (out.length < count) {
      const q = randomPose(chain, rand);
      if (inverseConditionMl(flangeJacobian(chain, q), 6) >= 1e-3) out.push(q);
    }
    return out;
  }

  it("equals minᵢ wᵢ/‖aᵢ‖ with A = first three columns of ml-matrix inverse(J), at 30 random poses", () => {
    // CHECKS C13 formula; J⁻¹ by ml-matrix `inverse` (LU), an independent library. Tolerance 1e-9 relative (C13).
    const s = createSpeedScratch(6);
    for (const q of [Array.from(Q_STAR), ...regularPoses(30, 1301)]) {
      const j = flangeJacobian(chain, q);
      const a = inverse(Matrix.from1DArray(6, 6, Array.from(j))).subMatrix(0, 5, 0, 2);
      const r = guaranteedLineSpeed(j, 6, W_6R, s);
      expectRelClose(r, radiusOf(a, W_6R), 1e-9, `q = ${q.map((v) => v.toFixed(3))}`);
      // B itself (joint rates per unit linear velocity at ω = 0) against the same columns.
      expect(lineRatesInto(j, 6, s)).toBe(true);
      const scale = maxAbs(a);
      expectClose(s.b, a.to1DArray(), 1e-9 * scale, "B vs inverse(J)[:, 0:3]");
    }
  });

  it("brute force over 20000 sampled directions: min over u of minᵢ wᵢ/|aᵢ·u| is ≥ r and within 1 % of it", () => {
    // CHECKS C13: s(u) = minᵢ wᵢ/|aᵢ·u| is the top speed along u; r is its minimum. Sampling only approaches r from
    // above (CHECKS C12 note: a one-sided check). A from ml-matrix inverse; directions from a seeded PRNG.
    const rand = mulberry32(1302);
    const s = createSpeedScratch(6);
    for (const q of [Array.from(Q_STAR), ...regularPoses(4, 1303)]) {
      const j = flangeJacobian(chain, q);
      const a = inverse(Matrix.from1DArray(6, 6, Array.from(j))).subMatrix(0, 5, 0, 2);
      const r = guaranteedLineSpeed(j, 6, W_6R, s);
      let sampled = Infinity;
      for (let k = 0; k < 20000; k++) {
        const u = randomUnit(rand);
        for (let i = 0; i < 6; i++) {
          const dot = Math.abs(a.get(i, 0) * u[0] + a.get(i, 1) * u[1] + a.get(i, 2) * u[2]);
          if (dot > 0) sampled = Math.min(sampled, W_6R[i]! / dot);
        }
      }
      expect(sampled, `q = ${q.map((v) => v.toFixed(3))}: sampled ${sampled} < r ${r}`).toBeGreaterThanOrEqual(
        r * (1 - 1e-12),
      );
      expect(sampled, `q = ${q.map((v) => v.toFixed(3))}: sampled ${sampled} vs r ${r}`).toBeLessThanOrEqual(r * 1.01);
    }
  });

  it("every sampled direction at speed r needs joint rates within the limits (definition of the guarantee)", () => {
    // CHECKS C13 feasible set |aᵢ·v| ≤ wᵢ, with A from ml-matrix inverse; 2000 seeded directions per pose.
    const rand = mulberry32(1304);
    const s = createSpeedScratch(6);
    for (const q of regularPoses(5, 1305)) {
      const j = flangeJacobian(chain, q);
      const jinv = inverse(Matrix.from1DArray(6, 6, Array.from(j)));
      const r = guaranteedLineSpeed(j, 6, W_6R, s);
      let worst = 0;
      for (let k = 0; k < 2000; k++) {
        const u = randomUnit(rand);
        const qdot = jinv.mmul(Matrix.columnVector([r * u[0], r * u[1], r * u[2], 0, 0, 0])).to1DArray();
        for (let i = 0; i < 6; i++) worst = Math.max(worst, Math.abs(qdot[i]!) / W_6R[i]!);
      }
      expect(worst, `largest |q̇ᵢ|/wᵢ at speed r`).toBeLessThanOrEqual(1 + 1e-9);
      expect(worst, "some direction is close to a limit (r is not needlessly small)").toBeGreaterThan(0.9);
    }
  });

  it("falls to 0 at the CHECKS C5 singular poses (wrist q5 = 0, elbow q3 = −atan2(d4, a3))", () => {
    // CHECKS C13: r falls to 0 at singularities. C5 wrist and elbow conditions for this DH layout [derived✓].
    const s = createSpeedScratch(6);
    const wrist = [0.3, -0.7, 0.4, 1.1, 0, -0.2];
    const elbow = [0.3, -0.7, -Math.atan2(1.0, 0.2), 1.1, 0.8, -0.2];
    const regular = guaranteedLineSpeed(flangeJacobian(chain, Q_STAR), 6, W_6R, s);
    expect(regular).toBeGreaterThan(0.1);
    for (const q of [wrist, elbow])
      expect(guaranteedLineSpeed(flangeJacobian(chain, q), 6, W_6R, s)).toBeLessThan(1e-6 * regular);
  });
});

describe("maxToolSpeed against brute force (CHECKS C12)", () => {
  const chains: [string, Chain][] = [
    ["generic 6R", compileChain(generic6rDh())],
    ["7R redundant", compileChain(redundant7r())],
    ["SCARA RRPR", compileChain(scaraRrprDh())],
    ["5R", compileChain(fiveJoint())],
  ];

  it.each(chains)(
    "maxToolSpeed(%s) equals naive enumeration of all 2^m sign vectors at 20 random poses",
    (_, chain) => {
      // CHECKS C12: the maximum of a convex function over the box is at a vertex; all 2^m vertices enumerated
      // naively (no Gray code, no symmetry). Tolerance 1e-12 relative.
      const rand = mulberry32(1401);
      const m = chain.drivenCount,
        w = Array.from(chain.maxSpeedSi),
        s = createSpeedScratch(m);
      for (let k = 0; k < 20; k++) {
        const j = flangeJacobian(chain, randomPose(chain, rand));
        expectRelClose(maxToolSpeed(j, m, w, s), maxSpeedBruteForce(j, m, w), 1e-12, `pose ${k}`);
      }
    },
  );

  it.each(chains)(
    "maxToolSpeed(%s) is never exceeded by 5000 random interior joint rates, and obeys the C12 norm bounds",
    (_, chain) => {
      // Brute-force sampling of the joint-rate box (one-sided); CHECKS C12 sanity bounds
      // σ_max(J_v W) ≤ v_max ≤ √m σ_max(J_v W) (Golub & Van Loan §2.2 [from memory]) with ml-matrix SVD.
      const rand = mulberry32(1402);
      const m = chain.drivenCount,
        w = Array.from(chain.maxSpeedSi),
        s = createSpeedScratch(m);
      for (let k = 0; k < 5; k++) {
        const j = flangeJacobian(chain, randomPose(chain, rand));
        const vmax = maxToolSpeed(j, m, w, s);
        let sampled = 0;
        for (let n = 0; n < 5000; n++) {
          const v = [0, 0, 0];
          for (let i = 0; i < m; i++) {
            const qd = uniform(rand, -w[i]!, w[i]!);
            for (let r = 0; r < 3; r++) v[r] = v[r]! + qd * j[r * m + i]!;
          }
          sampled = Math.max(sampled, Math.hypot(v[0]!, v[1]!, v[2]!));
        }
        expect(sampled).toBeLessThanOrEqual(vmax * (1 + 1e-12));
        const jw = linearBlock(j, m).mmul(Matrix.diag(w));
        const sigmaMax = new SingularValueDecomposition(jw, { autoTranspose: true }).diagonal[0]!;
        expect(vmax).toBeGreaterThanOrEqual(sigmaMax * (1 - 1e-12));
        expect(vmax).toBeLessThanOrEqual(Math.sqrt(m) * sigmaMax * (1 + 1e-12));
      }
    },
  );
});

describe("guaranteedLineSpeed: redundant and short chains", () => {
  it("7R redundant arm: B equals the first three columns of ml-matrix pseudoInverse(J) (minimum-norm rates)", () => {
    // speed.ts contract: minimum-norm joint rates Jᵀ(JJᵀ)⁻¹ for m > 6; ml-matrix pseudoInverse (SVD) is the
    // independent reference. Tolerance 1e-9 relative to the largest entry (CHECKS C13 tolerance).
    const chain = compileChain(redundant7r());
    const m = 7,
      w = Array.from(chain.maxSpeedSi),
      s = createSpeedScratch(m);
    const rand = mulberry32(1501);
    let checked = 0;
    while (checked < 20) {
      const j = flangeJacobian(chain, randomPose(chain, rand));
      if (inverseConditionMl(j, m) < 1e-3) continue;
      checked++;
      const pinv = pseudoInverse(Matrix.from1DArray(6, m, Array.from(j))).subMatrix(0, m - 1, 0, 2);
      expect(lineRatesInto(j, m, s)).toBe(true);
      const scale = maxAbs(pinv);
      expectClose(s.b, pinv.to1DArray(), 1e-9 * scale, `B vs pinv(J)[:, 0:3], pose ${checked}`);
      expectRelClose(guaranteedLineSpeed(j, m, w, s), radiusOf(pinv, w), 1e-9, `r, pose ${checked}`);
    }
  });

  it("SCARA-like R R P R (vertical axes): constant orientation is feasible, B equals pseudoInverse(J)[:, 0:3]", () => {
    // Premise checked independently: J·B = [I₃; 0] (ml-matrix mmul), i.e. every linear velocity at ω = 0 is
    // possible. For m < 6 with full column rank, pinv(J) = (JᵀJ)⁻¹Jᵀ, so B = pinv(J)·[I₃; 0]. Tolerance 1e-9.
    const chain = compileChain(scaraRrprDh());
    const m = 4,
      w = Array.from(chain.maxSpeedSi),
      s = createSpeedScratch(m);
    const rand = mulberry32(1502);
    for (let k = 0; k < 20;) {
      const q = randomPose(chain, rand);
      if (Math.abs(Math.sin(q[1]!)) < 0.1) continue; // away from the stretched/folded elbow (C1: det ∝ sin q2)
      k++;
      const j = flangeJacobian(chain, q);
      const jm = Matrix.from1DArray(6, m, Array.from(j));
      const pinv = pseudoInverse(jm).subMatrix(0, m - 1, 0, 2);
      const e = jm.mmul(pinv).to1DArray();
      expectClose(e, [1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 0, 0, 0, 0, 0, 0], 1e-9, `J·pinv(J)·E = E, pose ${k}`);
      expect(lineRatesInto(j, m, s)).toBe(true);
      const scale = maxAbs(pinv);
      expectClose(s.b, pinv.to1DArray(), 1e-9 * scale, `B, pose ${k}`);
      expectRelClose(guaranteedLineSpeed(j, m, w, s), radiusOf(pinv, w), 1e-9, `r, pose ${k}`);
    }
  });

  it("SCARA-like chain at q = (0, 90°, 100 mm, 0): B and r by hand", () => {
    // Hand derivation (CHECKS C1 for the 2R part): tip (0.4, 0.3) m; J_v columns (−0.3, 0.4, 0), (−0.3, 0, 0),
    // (0, 0, −1) (quill points down), (0, 0, 0) (axis 4 through the flange); ωz = q̇1 + q̇2 − q̇4.
    // ω = 0 and v: q̇1 = vy/0.4, q̇2 = −vx/0.3 − vy/0.4, q̇3 = −vz, q̇4 = q̇1 + q̇2 = −vx/0.3.
    // r = min(w1/2.5, w2/‖(10/3, 2.5)‖, w3/1, w4/(10/3)) = min(1.396, 1.257, 1.0, 3.142) = 1.0 m/s (quill).
    const chain = compileChain(scaraRrprDh());
    const s = createSpeedScratch(4);
    const j = flangeJacobian(chain, [0, 90 * DEG, 0.1, 0]);
    expect(lineRatesInto(j, 4, s)).toBe(true);
    expectClose(s.b, [0, 2.5, 0, -10 / 3, -2.5, 0, 0, 0, -1, -10 / 3, 0, 0], 1e-12, "B");
    const w = [200 * DEG, 300 * DEG, 1.0, 600 * DEG];
    const expected = Math.min(w[0]! / 2.5, w[1]! / Math.hypot(10 / 3, 2.5), w[2]! / 1, w[3]! / (10 / 3));
    expectClose(expected, 1.0, 1e-15, "hand value");
    expectRelClose(guaranteedLineSpeed(j, 4, chain.maxSpeedSi, s), expected, 1e-12, "r");
  });

  it("palletizer with a level-keeping parallelogram (4 driven joints): feasible, B equals pseudoInverse(J)[:, 0:3]", () => {
    // testArms.ts: the flange stays level, R = Rz(q1 + q5)·Rx(180°), so ω = 0 only needs q̇5 = −q̇1 and three joints
    // remain for v. Reference: ml-matrix pseudoInverse; premise J·B = E checked with ml-matrix. Tolerance 1e-9.
    const chain = compileChain(palletizerPassiveFrames());
    const m = chain.drivenCount,
      w = Array.from(chain.maxSpeedSi),
      s = createSpeedScratch(m);
    expect(m).toBe(4);
    const rand = mulberry32(1503);
    let checked = 0;
    while (checked < 10) {
      const j = flangeJacobian(chain, randomPose(chain, rand));
      const jm = Matrix.from1DArray(6, m, Array.from(j));
      const sv = new SingularValueDecomposition(jm, { autoTranspose: true }).diagonal;
      if (sv[m - 1]! / sv[0]! < 1e-2) continue;
      checked++;
      const pinv = pseudoInverse(jm).subMatrix(0, m - 1, 0, 2);
      expectClose(
        jm.mmul(pinv).to1DArray(),
        [1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 0, 0, 0, 0, 0, 0],
        1e-9,
        "J·pinv(J)·E = E",
      );
      expect(lineRatesInto(j, m, s)).toBe(true);
      expectRelClose(guaranteedLineSpeed(j, m, w, s), radiusOf(pinv, w), 1e-9, `r, pose ${checked}`);
    }
  });

  it("5-joint chain: constant orientation is not possible in every direction, so the guarantee is 0", () => {
    // Dimension count: ω = 0 imposes 3 conditions on 5 joint rates, leaving at most 2 dimensions of linear velocity.
    // Premise checked with ml-matrix: the least-squares solution of J·X = [I₃; 0] leaves a residual.
    const chain = compileChain(fiveJoint());
    const m = 5,
      w = Array.from(chain.maxSpeedSi),
      s = createSpeedScratch(m);
    const rand = mulberry32(1504);
    for (let k = 0; k < 20; k++) {
      const j = flangeJacobian(chain, randomPose(chain, rand));
      const jm = Matrix.from1DArray(6, m, Array.from(j));
      const e = Matrix.from1DArray(6, 3, [1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 0, 0, 0, 0, 0, 0]);
      const residual = jm.mmul(pseudoInverse(jm).mmul(e)).sub(e).norm();
      expect(residual, "premise: [v; 0] is not reachable for every v").toBeGreaterThan(1e-3);
      expect(lineRatesInto(j, m, s)).toBe(false);
      expect(guaranteedLineSpeed(j, m, w, s)).toBe(0);
    }
  });
});

// Demo arms (arms/ or ARMDEX_ARMS_DIR), used only for invariants, never as a source of expected values.
const DEMO = await loadArms([process.env.ARMDEX_ARMS_DIR ?? fileURLToPath(new URL("../../../arms", import.meta.url))]);

describe("guaranteedLineSpeed ≤ maxToolSpeed", () => {
  // A direction reached at constant orientation is also reached with orientation free, and no speed exceeds the
  // box maximum (CHECKS C12/C13 definitions), so r ≤ v_max at every pose of every chain.
  const chains: [string, Chain][] = [
    ["generic 6R", compileChain(generic6rDh())],
    ["7R redundant", compileChain(redundant7r())],
    ["SCARA RRPR", compileChain(scaraRrprDh())],
    ["5R", compileChain(fiveJoint())],
    ["palletizer", compileChain(palletizerPassiveFrames())],
    ...DEMO.arms.map((a) => [`demo arm ${a.id}`, a.chain] as [string, Chain]),
  ];

  it.each(chains)(
    "%s: r ≤ v_max at 50 random poses, and r > 0 somewhere when constant orientation is possible",
    (name, chain) => {
      const rand = mulberry32(1601);
      const m = chain.drivenCount,
        w = Array.from(chain.maxSpeedSi),
        s = createSpeedScratch(m);
      let positive = 0;
      for (let k = 0; k < 50; k++) {
        const j = flangeJacobian(chain, randomPose(chain, rand));
        const r = guaranteedLineSpeed(j, m, w, s),
          vmax = maxToolSpeed(j, m, w, s);
        expect(r).toBeGreaterThanOrEqual(0);
        expect(r, `${name} pose ${k}`).toBeLessThanOrEqual(vmax * (1 + 1e-12));
        if (r > 0) positive++;
      }
      if (name !== "5R") expect(positive, `${name}: some pose has a positive guarantee`).toBeGreaterThan(0);
    },
  );
});
