/**
 * Tests of src/core/analysis/singularity.ts: singularityReport (kind, null vector, inverse condition) at the
 * closed-form singular poses of the generic 6R of CHECKS §0 (standard DH, θ offsets 0) and of an invented SCARA-like
 * chain.
 *
 * Outside references: CHECKS C5 (wrist q5 = 0; elbow q3 = −atan2(d4, a3); shoulder r_w = a1 + a2c2 + a3c23 − d4s23 = 0;
 * singular poses have σ_min/σ_max < 1e-12), CHECKS C4 (det J = det J11 · det J22, so the null space is the same for
 * the TCP and the wrist centre as reference point), the expected null vectors derived by hand from the geometry
 * (written beside each test) and evaluated with the independent mathjs DH product of test/helpers/testArms.ts and
 * ml-matrix (`inverse`, `SingularValueDecomposition`).
 */
import { Matrix, SingularValueDecomposition, inverse } from "ml-matrix";
import { describe, expect, it } from "vitest";
import type { Chain } from "../../../src/core";
import { compileChain, createScratch, forwardInto, jacobianInto } from "../../../src/core";
import { SINGULAR_INVERSE_CONDITION, singularityReport } from "../../../src/core/measures/singularity";
import { expectClose, expectRelClose } from "../../helpers/expectClose";
import { dhFrameReference, generic6rDh, GENERIC_6R_SI, Q_STAR, scaraRrprDh } from "../../helpers/testArms";

const DEG = Math.PI / 180;
const { a1, a2, a3, d4 } = GENERIC_6R_SI;
const L = Math.hypot(a3, d4); // distance from axis 3 to the wrist centre (CHECKS C6)

/** 6 × m Jacobian of the flange origin (src/core jacobianInto, checked against finite differences elsewhere, C11). */
function flangeJacobian(chain: Chain, q: ArrayLike<number>): Float64Array {
  const s = createScratch(chain);
  const t = forwardInto(chain, q, s);
  return jacobianInto(new Float64Array(6 * chain.drivenCount), chain, s, t[3]!, t[7]!, t[11]!);
}

/** Origin and z axis of DH frame k (k = 0 … 6) of the generic 6R, from the independent mathjs product. */
function frame(q: readonly number[], k: number): { o: number[]; z: number[]; x: number[] } {
  const t = dhFrameReference(GENERIC_6R_SI.rows, q, k);
  return {
    o: [t[0]![3]!, t[1]![3]!, t[2]![3]!],
    z: [t[0]![2]!, t[1]![2]!, t[2]![2]!],
    x: [t[0]![0]!, t[1]![0]!, t[2]![0]!],
  };
}

/**
 * Expected null vector of the generic 6R given its arm part nArm (joints 1–3), which must leave the wrist centre
 * still: the wrist joints (axes z3, z4, z5 through the wrist centre) cancel the arm's angular velocity Σ nArmᵢ zᵢ₋₁,
 * n_wrist = −[z3 z4 z5]⁻¹ Σ nArmᵢ zᵢ₋₁ (CHECKS C4 block structure; inverse by ml-matrix). Returned unit length.
 */
function nullVectorFromArmPart(q: readonly number[], nArm: readonly number[]): number[] {
  const omega = [0, 0, 0];
  for (let i = 0; i < 3; i++) {
    const z = frame(q, i).z;
    for (let r = 0; r < 3; r++) omega[r] = omega[r]! + nArm[i]! * z[r]!;
  }
  const zw = [3, 4, 5].map((k) => frame(q, k).z);
  const j22 = new Matrix([0, 1, 2].map((r) => zw.map((z) => z[r]!)));
  const nw = inverse(j22)
    .mmul(Matrix.columnVector(omega))
    .to1DArray()
    .map((v) => -v);
  const n = [...nArm, ...nw];
  const len = Math.hypot(...n);
  return n.map((v) => v / len);
}

/** |a·b| for unit vectors: 1 when they agree up to sign. */
function absDot(a: readonly number[], b: readonly number[]): number {
  return Math.abs(a.reduce((s, v, i) => s + v * b[i]!, 0));
}

describe("singularityReport: generic 6R at the CHECKS C5 singular poses", () => {
  const chain = compileChain(generic6rDh());

  it("wrist (q5 = 0): kind wrist, null vector (0, 0, 0, 1, 0, −1)/√2 up to sign", () => {
    // CHECKS C5: det J22 = −sin q5, so q5 = 0 puts axes 4 and 6 on one line through the wrist centre (same sense:
    // R from frame 3 to 5 is Rz(q4)·Rx(90°)·Rz(0)·Rx(−90°) = Rz(q4)). Turning joint 4 by +ε and joint 6 by −ε moves
    // nothing: the null vector is (e4 − e6)/√2. Tolerances: σ_min/σ_max < 1e-12 (C5), null vector 1e-9.
    const q = [0.3, -0.7, 0.4, 1.1, 0, -0.2];
    // Premise with the independent reference FK: z3 and z5 coincide.
    expectClose(frame(q, 3).z, frame(q, 5).z, 1e-12, "z3 = z5");
    const rep = singularityReport(chain, flangeJacobian(chain, q));
    expect(rep.kind).toBe("wrist");
    expect(rep.inverseCondition).toBeLessThan(1e-12);
    expectClose(absDot(rep.nullVector, [0, 0, 0, Math.SQRT1_2, 0, -Math.SQRT1_2]), 1, 1e-9, "null vector ∥ e4 − e6");
    expect(rep.nullVector[3]! * rep.nullVector[5]!, "joints 4 and 6 turn against each other").toBeLessThan(0);
    expectClose(rep.nullVector.slice(0, 3), [0, 0, 0], 1e-9, "arm joints still");
  });

  it("wrist at several arm poses and q4, q6: always kind wrist with joints 4 and 6 opposite", () => {
    // CHECKS C5: the wrist condition q5 = 0 holds at any q1–q4, q6.
    for (const q of [
      [0, 0.2, 0.3, 0, 0, 0],
      [-2, 0.9, -0.4, -2.5, 0, 1.3],
      [1.7, -1.2, 1.0, 0.6, 0, -2.9],
    ]) {
      const rep = singularityReport(chain, flangeJacobian(chain, q));
      expect(rep.kind, `q = ${q}`).toBe("wrist");
      expect(rep.nullVector[3]! * rep.nullVector[5]!, `q = ${q}`).toBeLessThan(0);
      expectClose(absDot(rep.nullVector, [0, 0, 0, Math.SQRT1_2, 0, -Math.SQRT1_2]), 1, 1e-9, `q = ${q}`);
    }
  });

  it("elbow stretched (q3 = −atan2(d4, a3)): kind elbow, null vector with arm part (0, L, −(a2 + L))", () => {
    // CHECKS C5 elbow condition. At q3 = −atan2(d4, a3) (c3 = a3/L, s3 = −d4/L) the wrist centre is at distance
    // ρ2 = a2 + L from axis 2 and ρ3 = L from axis 3 along the same line (CHECKS C6: ρ² = a2² + L² + 2a2(a3c3 − d4s3)
    // = (a2 + L)²). Axes 2 and 3 are parallel, so the wrist centre stays still when q̇2·ρ2 + q̇3·ρ3 = 0:
    // arm part (0, ρ3, −ρ2); the wrist cancels the rotation (nullVectorFromArmPart).
    const q = [0.3, -0.7, -Math.atan2(d4, a3), 1.1, 0.8, -0.2];
    const w = frame(q, 4).o,
      o1 = frame(q, 1).o;
    expectClose(
      Math.hypot(w[0]! - o1[0]!, w[1]! - o1[1]!, w[2]! - o1[2]!),
      a2 + L,
      1e-12,
      "premise: stretched, ρ2 = a2 + L",
    );
    const rep = singularityReport(chain, flangeJacobian(chain, q));
    expect(rep.kind).toBe("elbow");
    expect(rep.inverseCondition).toBeLessThan(1e-12);
    expectClose(absDot(rep.nullVector, nullVectorFromArmPart(q, [0, L, -(a2 + L)])), 1, 1e-9, "null vector");
    expect(rep.nullVector[1]! * rep.nullVector[2]!, "joints 2 and 3 turn against each other").toBeLessThan(0);
  });

  it("elbow folded (q3 = −atan2(d4, a3) + π): kind elbow, arm part (0, −L, −(a2 − L))", () => {
    // CHECKS C5: the elbow condition holds mod π. Folded: w − o1 = (a2 − L)·x2 and w − o2 = −L·x2, so with the signed
    // distances ρ2 = a2 − L, ρ3 = −L the arm part is again (0, ρ3, −ρ2).
    const q = [-0.8, 0.5, -Math.atan2(d4, a3) + Math.PI, -0.6, 1.2, 0.4];
    const rep = singularityReport(chain, flangeJacobian(chain, q));
    expect(rep.kind).toBe("elbow");
    expect(rep.inverseCondition).toBeLessThan(1e-12);
    expectClose(absDot(rep.nullVector, nullVectorFromArmPart(q, [0, -L, -(a2 - L)])), 1, 1e-9, "null vector");
  });

  /** q2 that puts the wrist centre on axis 1 for a given q3 (CHECKS C5 shoulder condition, solved by hand). */
  function shoulderQ2(q3: number): number {
    // r_w = a1 + P c2 − Q s2 with P = a2 + a3c3 − d4s3, Q = a3s3 + d4c3; P c2 − Q s2 = R cos(q2 + φ), φ = atan2(Q, P).
    const p = a2 + a3 * Math.cos(q3) - d4 * Math.sin(q3),
      qq = a3 * Math.sin(q3) + d4 * Math.cos(q3);
    return -Math.atan2(qq, p) + Math.acos(-a1 / Math.hypot(p, qq));
  }

  it("shoulder (wrist centre on axis 1): kind shoulder, null vector (1, 0, 0, −[z3 z4 z5]⁻¹ z0) with joints 1, 4, 6", () => {
    // CHECKS C5: r_w = 0 puts the wrist centre on axis 1, so turning joint 1 leaves it still; the wrist cancels the
    // rotation about z0. Arm part (1, 0, 0) (nullVectorFromArmPart).
    const q3 = 0.4;
    const q = [0.3, shoulderQ2(q3), q3, 1.1, 0.8, -0.2];
    const w = frame(q, 4).o;
    expectClose([w[0]!, w[1]!], [0, 0], 1e-12, "premise: wrist centre on axis 1 (mathjs FK)");
    const rep = singularityReport(chain, flangeJacobian(chain, q));
    expect(rep.kind).toBe("shoulder");
    expect(rep.inverseCondition).toBeLessThan(1e-12);
    const expected = nullVectorFromArmPart(q, [1, 0, 0]);
    expectClose(absDot(rep.nullVector, expected), 1, 1e-9, "null vector");
    expectClose(rep.nullVector.slice(1, 3), [0, 0], 1e-9, "joints 2 and 3 still");
    expect(Math.abs(rep.nullVector[0]!), "joint 1 takes part").toBeGreaterThan(0.1);
    expect(Math.abs(rep.nullVector[3]!) + Math.abs(rep.nullVector[5]!), "joints 4/6 take part").toBeGreaterThan(0.1);
  });

  it("shoulder with the wrist near (not at) its singularity, q5 = 0.15 rad: still kind shoulder", () => {
    // CHECKS C5: the pose meets the shoulder condition exactly (r_w = 0) and not the wrist one (sin q5 = 0.149).
    // Issue 3 defines the label by the null vector: "shoulder: joints 1 and 4 (and 6)"; here joint 1 moves
    // (arm part (1, 0, 0)) while a pure wrist null vector has joints 1–3 exactly still. The wrist compensation is large
    // (about 1/sin q5), which must not turn the label into "wrist".
    const q3 = 0.9;
    const q = [-0.4, shoulderQ2(q3), q3, 0.7, 0.15, 0.3];
    const w = frame(q, 4).o;
    expectClose([w[0]!, w[1]!], [0, 0], 1e-12, "premise: wrist centre on axis 1 (mathjs FK)");
    const rep = singularityReport(chain, flangeJacobian(chain, q));
    expect(rep.inverseCondition).toBeLessThan(1e-12);
    expectClose(absDot(rep.nullVector, nullVectorFromArmPart(q, [1, 0, 0])), 1, 1e-9, "null vector");
    expect(rep.kind).toBe("shoulder");
  });

  it("regular pose q* (CHECKS §0): kind none; inverseCondition equals ml-matrix SVD of the scaled Jacobian", () => {
    // Definition in singularity.ts: linear rows divided by the chain's characteristic length; σ_min/σ_max by
    // ml-matrix SVD (independent). Tolerance 1e-9 relative.
    const j = flangeJacobian(chain, Q_STAR);
    const scaled = Array.from(j, (v, i) => (i < 18 ? v / chain.characteristicLengthM : v));
    const sv = new SingularValueDecomposition(Matrix.from1DArray(6, 6, scaled)).diagonal;
    const rep = singularityReport(chain, j);
    expect(rep.kind).toBe("none");
    expectRelClose(rep.inverseCondition, sv[5]! / sv[0]!, 1e-9, "inverse condition");
    expect(rep.inverseCondition).toBeGreaterThan(SINGULAR_INVERSE_CONDITION);
    expectClose(Math.hypot(...rep.nullVector), 1, 1e-12, "unit null vector");
  });

  it("a pose near each singularity but above the threshold stays none, and one just beside it is labelled", () => {
    // Proximity (CHECKS C5): |sin q5| for the wrist. q5 = 0.5 rad is far (none); q5 = 1e-4 rad is near (wrist).
    const far = singularityReport(chain, flangeJacobian(chain, [0.3, -0.7, 0.4, 1.1, 0.5, -0.2]));
    const near = singularityReport(chain, flangeJacobian(chain, [0.3, -0.7, 0.4, 1.1, 1e-4, -0.2]));
    expect(far.kind).toBe("none");
    expect(near.kind).toBe("wrist");
    expect(near.inverseCondition).toBeLessThan(far.inverseCondition);
  });
});

describe("singularityReport: SCARA-like chain", () => {
  const chain = compileChain(scaraRrprDh());

  it("stretched (q2 = 0): kind elbow, null vector ∝ (a2, −(a1 + a2), 0, −a1) = (0.3, −0.7, 0, −0.4)", () => {
    // Hand derivation (CHECKS C1 for the planar part, det ∝ sin q2): stretched, the tip is at a1 + a2 from axis 1
    // and a2 from axis 2 along one line, so q̇1(a1 + a2) + q̇2·a2 = 0 → (q̇1, q̇2) ∝ (a2, −(a1 + a2)); ωz = q̇1 + q̇2 − q̇4
    // (axis 4 points down) = 0 → q̇4 = −a1; the quill does not take part.
    for (const q1 of [0, 0.7, -1.9]) {
      const rep = singularityReport(chain, flangeJacobian(chain, [q1, 0, 0.1, 0.5]));
      expect(rep.kind, `q1 = ${q1}`).toBe("elbow");
      const n = [0.3, -0.7, 0, -0.4],
        len = Math.hypot(...n);
      expectClose(
        absDot(
          rep.nullVector,
          n.map((v) => v / len),
        ),
        1,
        1e-9,
        `q1 = ${q1}: null vector`,
      );
    }
  });

  it("regular pose (q2 = 90°): kind none", () => {
    // CHECKS C1: det of the planar block = a1 a2 sin q2, largest at q2 = ±90°.
    expect(singularityReport(chain, flangeJacobian(chain, [0.2, 90 * DEG, 0.1, 0.5])).kind).toBe("none");
  });
});
