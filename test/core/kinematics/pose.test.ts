/**
 * Tests of src/core/kinematics/pose.ts (poseReport) on invented arms: manipulability of the planar 2R (CHECKS C2),
 * decoupling of the spherical wrist (C4), the three singularities of a spherical-wrist 6R (C5), the home pose and
 * wrist-centre reach (C6), and the wrist centre point.
 */
import { determinant, Matrix, SingularValueDecomposition } from "ml-matrix";
import { describe, expect, it } from "vitest";
import type { Chain } from "../../../src/core";
import {
  compileChain,
  createScratch,
  createSvdScratch,
  forwardInto,
  jacobianInto,
  poseReport,
  singularValuesInto,
} from "../../../src/core";
import { expectClose, expectRelClose } from "../../helpers/expectClose";
import { finiteDifferenceJacobian } from "../../helpers/finiteDifference";
import { mulberry32, uniform } from "../../helpers/prng";
import {
  dhFrameReference,
  generic6rDh,
  generic6rFramesUrdfStyle,
  GENERIC_6R_SI,
  planar2r,
  Q_STAR,
} from "../../helpers/testArms";

const DEG = Math.PI / 180;
const { a1, a2, a3, d1, d4, d6 } = GENERIC_6R_SI;

/** Singular values of the translational 2 × 2 block (rows vx, vy) of a planar arm's 6 × 2 Jacobian. */
function planarSingularValues(jacobian: Float64Array): Float64Array {
  const block = [jacobian[0]!, jacobian[1]!, jacobian[2]!, jacobian[3]!];
  return singularValuesInto(new Float64Array(2), block, 2, 2, createSvdScratch(2, 2));
}

/** ml-matrix singular values, descending (independent reference). */
function mlSingularValues(a: ArrayLike<number>, rows: number, cols: number): number[] {
  return new SingularValueDecomposition(Matrix.from1DArray(rows, cols, Array.from(a)), { autoTranspose: true })
    .diagonal;
}

/** det J₁₁ of CHECKS C5 (derived there with sympy [derived✓]) for the generic 6R. */
function detJ11ClosedForm(q: ArrayLike<number>): number {
  const q2 = q[1]!,
    q3 = q[2]!;
  return (
    a2 *
    (a3 * Math.sin(q3) + d4 * Math.cos(q3)) *
    (a1 + a2 * Math.cos(q2) + a3 * Math.cos(q2 + q3) - d4 * Math.sin(q2 + q3))
  );
}

/** 6 × 6 Jacobian of the generic 6R at q with reference point p (base frame, m). */
function jacobianAt(chain: Chain, q: ArrayLike<number>, point: "flange" | "wcp"): Matrix {
  const s = createScratch(chain);
  const f = forwardInto(chain, q, s);
  const r = poseReport(chain, q);
  const p = point === "flange" ? [f[3]!, f[7]!, f[11]!] : Array.from(r.wcpM!);
  return Matrix.from1DArray(6, 6, Array.from(jacobianInto(new Float64Array(36), chain, s, p[0]!, p[1]!, p[2]!)));
}

describe("poseReport: planar 2R manipulability (CHECKS C2)", () => {
  it("poseReport(2R).jacobian's translational block has Π σ = a1 a2 |sin q2| at random poses", () => {
    // Yoshikawa, Manipulability of robotic mechanisms, IJRR 4(2):3–9, 1985 [from memory]: w = √det(J Jᵀ) = |det J|
    // for square J; for the 2R w = a1 a2 |s2| (CHECKS C2). poseReport's own singular values include the angular rows
    // (ωz = 1, 1), so the planar block is taken from its Jacobian. Tolerance 1e-12.
    const rand = mulberry32(22);
    for (let trial = 0; trial < 40; trial++) {
      const l1 = uniform(rand, 0.1, 1.5),
        l2 = uniform(rand, 0.1, 1.5);
      const q = [uniform(rand, -Math.PI, Math.PI), uniform(rand, -Math.PI, Math.PI)];
      const sv = planarSingularValues(poseReport(compileChain(planar2r(l1, l2)), q).jacobian);
      expectClose(sv[0]! * sv[1]!, l1 * l2 * Math.abs(Math.sin(q[1]!)), 1e-12, `trial ${trial}`);
    }
  });

  it("poseReport(2R (1, 1), (q1, 90°)) translational singular values are (φ, 1/φ) for any q1", () => {
    // CHECKS C2: J Jᵀ = [[2, −1], [−1, 1]] at q1 = 0, σ = (φ, 1/φ), w = 1; a rotation about the base (q1) leaves
    // the singular values unchanged. 1e-12.
    const phi = (1 + Math.sqrt(5)) / 2;
    for (const q1 of [0, 0.4, -2.2]) {
      expectClose(
        planarSingularValues(poseReport(compileChain(planar2r(1, 1)), [q1, 90 * DEG]).jacobian),
        [phi, 1 / phi],
        1e-12,
        `q1 = ${q1}`,
      );
    }
  });

  it("poseReport(2R (0.5, 0.3)): w peaks at q2 = ±90° with w_max = 0.15 (grid of 1°)", () => {
    // CHECKS C2: (0.5, 0.3) → w_max = 0.15 at q2 = 90°; argmax within one grid step (1°).
    const chain = compileChain(planar2r(0.5, 0.3));
    let best = -1,
      argmax = NaN;
    for (let deg = 0; deg <= 180; deg++) {
      const sv = planarSingularValues(poseReport(chain, [0.3, deg * DEG]).jacobian);
      if (sv[0]! * sv[1]! > best) {
        best = sv[0]! * sv[1]!;
        argmax = deg;
      }
    }
    expect(Math.abs(argmax - 90)).toBeLessThanOrEqual(1);
    expectClose(best, 0.15, 1e-12, "w_max");
  });

  it("poseReport(…).singularValues, manipulability and conditionNumber agree with ml-matrix on the full 6 × m Jacobian", () => {
    // ml-matrix SVD as the independent reference (STYLE.md C6); 1e-12 · σ_max. For a square J, Π σ = |det J|.
    const rand = mulberry32(5);
    const chains = [compileChain(planar2r(0.4, 0.3)), compileChain(generic6rDh())];
    for (const chain of chains) {
      for (let trial = 0; trial < 10; trial++) {
        const q = Array.from({ length: chain.drivenCount }, () => uniform(rand, -3, 3));
        const r = poseReport(chain, q);
        const ml = mlSingularValues(r.jacobian, 6, chain.drivenCount);
        expectClose(r.singularValues, ml, 1e-12 * ml[0]!, "singular values");
        expectRelClose(
          r.manipulability,
          ml.reduce((p, v) => p * v, 1),
          1e-10,
          "manipulability",
        );
        expectRelClose(r.conditionNumber, ml[0]! / ml[ml.length - 1]!, 1e-8, "condition number");
        if (chain.drivenCount === 6) {
          expectRelClose(
            r.manipulability,
            Math.abs(determinant(Matrix.from1DArray(6, 6, Array.from(r.jacobian)))),
            1e-9,
            "|det J|",
          );
        }
      }
    }
  });
});

describe("poseReport: generic 6R home pose and wrist centre (CHECKS C6)", () => {
  it("poseReport(generic 6R, q = 0) puts the flange at (a1 + a2 + a3, 0, d1 − d4 − d6) with R = diag(1, −1, −1)", () => {
    // CHECKS C6 [derived✓], re-derived by hand for this DH table (Spong et al. ch. 3 convention):
    //   A₁ = Tz(d1)Tx(a1)Rx(−90°): o₁ = (a1, 0, d1), z₁ = +y.   A₂ = Tx(a2): o₂ = (a1 + a2, 0, d1).
    //   A₃ = Tx(a3)Rx(−90°): o₃ = (a1 + a2 + a3, 0, d1), R₃ = Rx(−180°), z₃ = −z.
    //   A₄ = Tz(d4)Rx(+90°): o₄ = o₃ − d4 ẑ, R₄ = Rx(−90°).   A₅ = Rx(−90°): R₅ = Rx(−180°), z₅ = −z.
    //   A₆ = Tz(d6): o₆ = o₄ − d6 ẑ, R₆ = Rx(180°) = diag(1, −1, −1).
    // The sign convention of CHECKS agrees with this derivation. 1e-12.
    const r = poseReport(compileChain(generic6rDh()), [0, 0, 0, 0, 0, 0]);
    const t = r.baseFromFlange;
    expectClose([t[3]!, t[7]!, t[11]!], [a1 + a2 + a3, 0, d1 - d4 - d6], 1e-12, "position");
    expectClose([t[3]!, t[7]!, t[11]!], [1.4, 0, -0.6], 1e-12, "position, numbers");
    expectClose(
      [t[0]!, t[1]!, t[2]!, t[4]!, t[5]!, t[6]!, t[8]!, t[9]!, t[10]!],
      [1, 0, 0, 0, -1, 0, 0, 0, -1],
      1e-12,
      "rotation",
    );
    expectClose(r.wcpM!, [a1 + a2 + a3, 0, d1 - d4], 1e-12, "wrist centre at home");
  });

  it("poseReport(generic 6R, q).wcpM equals the origin of DH frame 4 from the mathjs product (dh and URDF-style frames)", () => {
    // Wrist centre = origin of frame 4 (CHECKS §0); independent reference: explicit DH product (testArms.ts). 1e-12 m.
    const rand = mulberry32(4);
    const chains = [compileChain(generic6rDh()), compileChain(generic6rFramesUrdfStyle())];
    for (const chain of chains) expect(chain.wrist?.basis).toBe("spherical");
    for (let trial = 0; trial < 20; trial++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      const t4 = dhFrameReference(GENERIC_6R_SI.rows, q, 4);
      for (const chain of chains)
        expectClose(poseReport(chain, q).wcpM!, [t4[0]![3]!, t4[1]![3]!, t4[2]![3]!], 1e-12, `trial ${trial}`);
    }
  });

  it("poseReport(generic 6R, q).wcpM lies at ρ from axis-2's origin with ρ² = a2² + a3² + d4² + 2 a2 (a3 c3 − d4 s3)", () => {
    // CHECKS C6 [derived✓] (law of cosines); o₁ = origin of DH frame 1 from the mathjs product. 1e-12.
    const rand = mulberry32(6);
    for (let trial = 0; trial < 20; trial++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      const t1 = dhFrameReference(GENERIC_6R_SI.rows, q, 1);
      const w = poseReport(compileChain(generic6rDh()), q).wcpM!;
      const rho2 = (w[0]! - t1[0]![3]!) ** 2 + (w[1]! - t1[1]![3]!) ** 2 + (w[2]! - t1[2]![3]!) ** 2;
      const q3 = q[2]!;
      expectClose(
        rho2,
        a2 ** 2 + a3 ** 2 + d4 ** 2 + 2 * a2 * (a3 * Math.cos(q3) - d4 * Math.sin(q3)),
        1e-12,
        `trial ${trial}`,
      );
    }
  });

  it("poseReport(…, toolInFlangeM).jacobian is the Jacobian of the tool point (finite differences, CHECKS C11)", () => {
    // Reference point moved to a tool point 0.15 m along the flange z and 0.05 m along x; C11, h = 1e-6, 1e-7.
    const chain = compileChain(generic6rDh());
    const tool = [0.05, 0, 0.15];
    const s = createScratch(chain);
    const toolPose = (q: Float64Array): number[] => {
      const f = forwardInto(chain, q, s);
      const out = Array.from(f);
      for (let r = 0; r < 3; r++)
        out[r * 4 + 3] = f[r * 4]! * tool[0]! + f[r * 4 + 1]! * tool[1]! + f[r * 4 + 2]! * tool[2]! + f[r * 4 + 3]!;
      return out;
    };
    const r = poseReport(chain, Q_STAR, tool);
    expectClose(r.jacobian, finiteDifferenceJacobian(toolPose, Q_STAR), 1e-7);
    const tp = toolPose(Float64Array.from(Q_STAR));
    expectClose(r.tcpM, [tp[3]!, tp[7]!, tp[11]!], 0, "tcp");
  });
});

describe("poseReport: wrist decoupling and the three singularities of the generic 6R (CHECKS C4, C5)", () => {
  it("det J at the flange = det J at the wrist centre = det J11 · det J22, with the C5 closed forms", () => {
    // Spong et al. §4.9.1 "Decoupling of singularities" [from memory]; Siciliano et al. 2009 §3.3.1 [from memory];
    // CHECKS C4 (1e-9 relative) and C5 closed forms (1e-9): det J22 = −sin q5,
    // det J11 = a2 (a3 s3 + d4 c3)(a1 + a2 c2 + a3 c23 − d4 s23). The closed forms match our sign convention as
    // stated (rows v then ω, columns q1…q6, base frame), no absolute value needed. Determinants by ml-matrix.
    const chain = compileChain(generic6rDh());
    const rand = mulberry32(45);
    const poses = [
      Array.from(Q_STAR),
      ...Array.from({ length: 30 }, () => Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI))),
    ];
    for (const q of poses) {
      const jt = jacobianAt(chain, q, "flange");
      const jw = jacobianAt(chain, q, "wcp");
      const detT = determinant(jt),
        detW = determinant(jw);
      const j11 = determinant(jw.subMatrix(0, 2, 0, 2)),
        j22 = determinant(jw.subMatrix(3, 5, 3, 5));
      const label = `q = ${q.map((v) => v.toFixed(3))}`;
      expectRelClose(detT, detW, 1e-9, `det at flange vs wcp, ${label}`, 1e-6);
      expectClose(jw.subMatrix(0, 2, 3, 5).to1DArray(), Array(9).fill(0), 1e-12, `J12 = 0 at the wcp, ${label}`);
      expectRelClose(detW, j11 * j22, 1e-9, `block product, ${label}`, 1e-6);
      expectClose(j22, -Math.sin(q[4]!), 1e-9, `det J22, ${label}`);
      expectClose(j11, detJ11ClosedForm(q), 1e-9, `det J11, ${label}`);
      expectClose(detT, detJ11ClosedForm(q) * -Math.sin(q[4]!), 1e-9, `det J closed form, ${label}`);
    }
  });

  it("poseReport's |r_w| = a1 + a2 c2 + a3 c23 − d4 s23 is the horizontal distance of the wcp from axis 1", () => {
    // CHECKS C5 (shoulder factor) [derived✓]; axis 1 is the base z axis. 1e-12 m.
    const rand = mulberry32(46);
    for (let trial = 0; trial < 20; trial++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      const w = poseReport(compileChain(generic6rDh()), q).wcpM!;
      const rw = a1 + a2 * Math.cos(q[1]!) + a3 * Math.cos(q[1]! + q[2]!) - d4 * Math.sin(q[1]! + q[2]!);
      expectClose(Math.hypot(w[0]!, w[1]!), Math.abs(rw), 1e-12, `trial ${trial}`);
    }
  });

  // Singular poses of CHECKS C5 (threshold σ_min/σ_max < 1e-12), other joints at q* of CHECKS §0.
  const elbowQ3 = -Math.atan2(d4, a3); // a3 s3 + d4 c3 = 0
  const shoulderQ2 = (() => {
    // r_w(q2; q3 = 0.4) = a1 + (a2 + a3 c3 − d4 s3)·c2 − (a3 s3 + d4 c3)·s2 = a1 + R cos(q2 + φ) = 0.
    const q3 = Q_STAR[2];
    const A = a2 + a3 * Math.cos(q3) - d4 * Math.sin(q3),
      B = a3 * Math.sin(q3) + d4 * Math.cos(q3);
    return Math.acos(-a1 / Math.hypot(A, B)) - Math.atan2(B, A);
  })();
  const singular = [
    { name: "elbow (q3 = −atan2(d4, a3))", q: [Q_STAR[0], Q_STAR[1], elbowQ3, Q_STAR[3], Q_STAR[4], Q_STAR[5]] },
    {
      name: "elbow (q3 = π − atan2(d4, a3))",
      q: [Q_STAR[0], Q_STAR[1], Math.PI + elbowQ3, Q_STAR[3], Q_STAR[4], Q_STAR[5]],
    },
    { name: "wrist (q5 = 0)", q: [Q_STAR[0], Q_STAR[1], Q_STAR[2], Q_STAR[3], 0, Q_STAR[5]] },
    { name: "wrist (q5 = π)", q: [Q_STAR[0], Q_STAR[1], Q_STAR[2], Q_STAR[3], Math.PI, Q_STAR[5]] },
    { name: "shoulder (r_w = 0)", q: [Q_STAR[0], shoulderQ2, Q_STAR[2], Q_STAR[3], Q_STAR[4], Q_STAR[5]] },
  ];

  it.each(singular)("poseReport(generic 6R, $name) has σ_min/σ_max < 1e-12", ({ q }) => {
    // CHECKS C5 singular loci [derived✓]; Spong et al. §4.9 [from memory]. Checked with our SVD and with ml-matrix.
    const r = poseReport(compileChain(generic6rDh()), q);
    expect(r.singularValues[5]! / r.singularValues[0]!).toBeLessThan(1e-12);
    const ml = mlSingularValues(r.jacobian, 6, 6);
    expect(ml[5]! / ml[0]!).toBeLessThan(1e-12);
    expect(r.conditionNumber).toBeGreaterThan(1e12);
  });

  it("the shoulder singular pose puts the wrist centre on axis 1; q* is far from every singularity", () => {
    // CHECKS C5: shoulder singularity ⇔ the wcp is on axis 1. Control: q* itself is regular (σ_min/σ_max > 1e-3).
    const chain = compileChain(generic6rDh());
    const w = poseReport(chain, singular[4]!.q).wcpM!;
    expectClose(Math.hypot(w[0]!, w[1]!), 0, 1e-12, "distance from axis 1");
    const r = poseReport(chain, Q_STAR);
    expect(r.singularValues[5]! / r.singularValues[0]!).toBeGreaterThan(1e-3);
  });
});
