/**
 * Tests of src/core/kinematics/forward.ts: forwardInto and jacobianInto against the planar 2R closed form
 * (CHECKS C1) and against central finite differences of forwardInto (CHECKS C11) on invented chains of every
 * convention, with prismatic joints and with coupled joints.
 */
import { Matrix, SingularValueDecomposition } from "ml-matrix";
import { describe, expect, it } from "vitest";
import type { ArmKinematicsInput, Chain } from "../../../src/core";
import { compileChain, createScratch, forwardInto, jacobianInto } from "../../../src/core";
import { expectClose } from "../../helpers/expectClose";
import { finiteDifferenceJacobian } from "../../helpers/finiteDifference";
import { mulberry32, uniform } from "../../helpers/prng";
import {
  COUPLED_J3_OFFSET_DEG,
  cylindricalPrismaticDh,
  dhFrameReference,
  flat4,
  generic6rDh,
  generic6rDrivenCoupledDh,
  generic6rFramesFromDh,
  generic6rFramesUrdfStyle,
  generic6rMdh,
  GENERIC_6R_SI,
  obliquePrismaticFrames,
  palletizerPassiveFrames,
  planar2r,
} from "../../helpers/testArms";

const DEG = Math.PI / 180;

/** 6 × m Jacobian of the flange origin at driven q. */
function jacobianAtFlange(chain: Chain, q: ArrayLike<number>): Float64Array {
  const s = createScratch(chain);
  const f = forwardInto(chain, q, s);
  return jacobianInto(new Float64Array(6 * chain.drivenCount), chain, s, f[3]!, f[7]!, f[11]!);
}

/** The pose function the finite differences evaluate: q ↦ baseFromFlange (forwardInto only). */
function flangePose(chain: Chain): (q: Float64Array) => Float64Array {
  const s = createScratch(chain);
  return (q) => forwardInto(chain, q, s);
}

/** Rows 0–1 (vx, vy) of a 6 × m row-major Jacobian, as a flat 2 × m block. */
function planarBlock(j: Float64Array, m: number): number[] {
  return [...j.subarray(0, m), ...j.subarray(m, 2 * m)];
}

describe("jacobianInto: planar 2R (CHECKS C1)", () => {
  it("jacobianInto(2R (1, 1), q = (0°, 90°)) has the planar block [[−1, −1], [1, 0]] and det 1", () => {
    // Spong, Hutchinson & Vidyasagar, Robot Modeling and Control, §4.9 (two-link planar arm) [from memory];
    // Craig 2005 ch. 5 (det J = l1 l2 s2) [from memory]; CHECKS C1. Tolerance 1e-12 abs.
    const j = jacobianAtFlange(compileChain(planar2r(1, 1)), [0, 90 * DEG]);
    const b = planarBlock(j, 2);
    expectClose(b, [-1, -1, 1, 0], 1e-12);
    expectClose(b[0]! * b[3]! - b[1]! * b[2]!, 1, 1e-12, "det");
    // The remaining rows of a planar arm: no vz, no ωx/ωy, ωz = 1 for both joints.
    expectClose(j.subarray(4, 12), [0, 0, 0, 0, 0, 0, 1, 1], 1e-12, "rows vz, ωx, ωy, ωz");
  });

  it("jacobianInto(2R (0.4, 0.3), q = (30°, 45°)) matches the CHECKS C1 numbers, det = 0.12 sin 45°", () => {
    // CHECKS C1 numbers [pub·mem source, values recomputed with mathjs det and ml-matrix determinant there].
    const j = planarBlock(jacobianAtFlange(compileChain(planar2r(0.4, 0.3)), [30 * DEG, 45 * DEG]), 2);
    expectClose(j, [-0.4897777479, -0.2897777479, 0.424055875, 0.0776457135], 1e-10, "printed to 10 decimals");
    expectClose(j[0]! * j[3]! - j[1]! * j[2]!, 0.0848528137, 1e-10, "det, printed");
    expectClose(j[0]! * j[3]! - j[1]! * j[2]!, 0.12 * Math.sin(45 * DEG), 1e-12, "det = a1 a2 sin q2");
  });

  it("jacobianInto(2R) equals the closed form and det = a1 a2 sin q2 at random poses and link lengths", () => {
    // J = [[−a1 s1 − a2 s12, −a2 s12], [a1 c1 + a2 c12, a2 c12]] (Spong et al. §4.9 [from memory]); 1e-12 abs.
    const rand = mulberry32(1);
    for (let trial = 0; trial < 50; trial++) {
      const a1 = uniform(rand, 0.1, 2),
        a2 = uniform(rand, 0.1, 2);
      const q1 = uniform(rand, -Math.PI, Math.PI),
        q2 = uniform(rand, -Math.PI, Math.PI);
      const j = planarBlock(jacobianAtFlange(compileChain(planar2r(a1, a2)), [q1, q2]), 2);
      const s1 = Math.sin(q1),
        c1 = Math.cos(q1),
        s12 = Math.sin(q1 + q2),
        c12 = Math.cos(q1 + q2);
      expectClose(j, [-a1 * s1 - a2 * s12, -a2 * s12, a1 * c1 + a2 * c12, a2 * c12], 1e-12, `trial ${trial}`);
      expectClose(j[0]! * j[3]! - j[1]! * j[2]!, a1 * a2 * Math.sin(q2), 1e-12, `det, trial ${trial}`);
    }
  });

  it("jacobianInto(2R) is singular at q2 = 0 and q2 = π (workspace boundary circles) for any q1", () => {
    // CHECKS C1: singular exactly when q2 ∈ {0, π}; the planar columns are then parallel. 1e-12 abs.
    for (const q2 of [0, Math.PI]) {
      for (const q1 of [-2, -0.5, 0, 0.7, 2.9]) {
        const j = planarBlock(jacobianAtFlange(compileChain(planar2r(0.5, 0.3)), [q1, q2]), 2);
        expectClose(j[0]! * j[3]! - j[1]! * j[2]!, 0, 1e-12, `det at q = (${q1}, ${q2})`);
      }
    }
  });
});

interface FdCase {
  readonly name: string;
  readonly input: () => ArmKinematicsInput;
}

const FD_CASES: readonly FdCase[] = [
  { name: "generic 6R, standard DH", input: generic6rDh },
  { name: "generic 6R, modified DH", input: generic6rMdh },
  { name: "generic 6R, frames (literal DH rewrite)", input: generic6rFramesFromDh },
  { name: "generic 6R, frames (URDF style)", input: generic6rFramesUrdfStyle },
  { name: "cylindrical arm with two prismatic joints, DH", input: cylindricalPrismaticDh },
  { name: "oblique prismatic axis, frames", input: obliquePrismaticFrames },
  { name: "palletizer with a passive coupled joint, frames", input: palletizerPassiveFrames },
  { name: "generic 6R with a driven coupled joint 3, DH", input: generic6rDrivenCoupledDh },
];

/**
 * Random driven pose within the joint limits (±π where a limit is open) whose Jacobian is not singular:
 * σ_min/σ_max ≥ 1e-3 by ml-matrix's SVD (independent of src/core/math/svd.ts). Rejection sampling with the deterministic PRNG.
 */
function randomNonSingularPose(chain: Chain, rand: () => number): number[] {
  const m = chain.drivenCount;
  for (let attempt = 0; attempt < 1000; attempt++) {
    const q = Array.from({ length: m }, (_, c) =>
      uniform(rand, Math.max(chain.lowerSi[c]!, -Math.PI), Math.min(chain.upperSi[c]!, Math.PI)),
    );
    const sv = new SingularValueDecomposition(Matrix.from1DArray(6, m, Array.from(jacobianAtFlange(chain, q))), {
      autoTranspose: true,
    }).diagonal;
    if (sv[Math.min(6, m) - 1]! >= 1e-3 * sv[0]!) return q;
  }
  throw new Error("no non-singular pose found in 1000 draws");
}

describe("jacobianInto: central finite differences of forwardInto (CHECKS C11)", () => {
  it.each(FD_CASES)("jacobianInto($name) matches finite differences at 20 random poses", ({ input }) => {
    // CHECKS C11: linear part by central differences of the position, angular part by vee((D − Dᵀ)/2)/2h with
    // D = R(q + h eᵢ) R(q − h eᵢ)ᵀ; h = 1e-6, tolerance 1e-7 abs at metre scale (Nocedal & Wright §8.1 [from
    // memory] for the step). Poses: random within the driven-joint limits (deterministic PRNG), not singular.
    const chain = compileChain(input());
    const m = chain.drivenCount;
    const pose = flangePose(chain);
    const rand = mulberry32(0xfd + m);
    for (let trial = 0; trial < 20; trial++) {
      const q = randomNonSingularPose(chain, rand);
      const j = jacobianAtFlange(chain, q);
      const fd = finiteDifferenceJacobian(pose, q, 1e-6);
      expectClose(j, fd, 1e-7, `trial ${trial}, q = ${q.map((v) => v.toFixed(3))}`);
    }
  });

  it("the finite-difference reference is not vacuous: a Jacobian with one wrong column fails it", () => {
    // Guards the check itself: swap two columns of the analytic Jacobian of the generic 6R and expect a large error.
    const chain = compileChain(generic6rDh());
    const q = [0.3, -0.7, 0.4, 1.1, 0.8, -0.2];
    const j = jacobianAtFlange(chain, q);
    const fd = finiteDifferenceJacobian(flangePose(chain), q);
    let worst = 0;
    for (let r = 0; r < 6; r++) worst = Math.max(worst, Math.abs(j[r * 6 + 1]! - fd[r * 6 + 2]!));
    expect(worst).toBeGreaterThan(1e-3);
  });
});

describe("forwardInto and jacobianInto with coupled joints", () => {
  it("forwardInto(driven-coupled 6R, q) equals the uncoupled DH product at q₃,kin = q₃ − q₂ + 10°", () => {
    // Independent reference: the standard-DH product by mathjs (testArms.ts, Spong et al. ch. 3); 1e-12 m.
    const chain = compileChain(generic6rDrivenCoupledDh());
    expect(chain.drivenCount).toBe(6);
    const s = createScratch(chain);
    const rand = mulberry32(33);
    for (let trial = 0; trial < 10; trial++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      const qKin = [q[0]!, q[1]!, q[2]! - q[1]! + COUPLED_J3_OFFSET_DEG * DEG, q[3]!, q[4]!, q[5]!];
      expectClose(forwardInto(chain, q, s), flat4(dhFrameReference(GENERIC_6R_SI.rows, qKin)), 1e-12, `trial ${trial}`);
    }
  });

  it("jacobianInto(driven-coupled 6R) = J_uncoupled(q_kin) · G with G the chain rule of q₃,kin = q₃ − q₂ + 10°", () => {
    // Chain rule: column 2 (q₂) = J₂ − J₃; the other columns unchanged. 1e-12.
    const coupled = compileChain(generic6rDrivenCoupledDh());
    const plain = compileChain(generic6rDh());
    const q = [0.3, -0.7, 0.4, 1.1, 0.8, -0.2];
    const qKin = [q[0]!, q[1]!, q[2]! - q[1]! + COUPLED_J3_OFFSET_DEG * DEG, q[3]!, q[4]!, q[5]!];
    const jc = jacobianAtFlange(coupled, q);
    const jp = jacobianAtFlange(plain, qKin);
    const expected = Float64Array.from(jp);
    for (let r = 0; r < 6; r++) expected[r * 6 + 1] = jp[r * 6 + 1]! - jp[r * 6 + 2]!;
    expectClose(jc, expected, 1e-12);
  });

  it("forwardInto(palletizer) keeps the flange level: R = Rz(q1 + q5)·diag(1, −1, −1) at every pose", () => {
    // Parallelogram: passive q4 = −(q2 + q3), the three parallel y rotations cancel (Ry(a)Ry(b) = Ry(a + b));
    // what remains is Rz(q1)·Rz(q5)·Rx(180°). Elementary rotation algebra; 1e-12.
    const chain = compileChain(palletizerPassiveFrames());
    expect(chain.jointCount).toBe(5);
    expect(chain.drivenCount).toBe(4);
    const s = createScratch(chain);
    const rand = mulberry32(44);
    for (let trial = 0; trial < 20; trial++) {
      const q = [uniform(rand, -3, 3), uniform(rand, -1, 1.5), uniform(rand, -1.3, 1), uniform(rand, -6, 6)];
      const f = forwardInto(chain, q, s);
      const psi = q[0]! + q[3]!,
        c = Math.cos(psi),
        sn = Math.sin(psi);
      expectClose(
        [f[0]!, f[1]!, f[2]!, f[4]!, f[5]!, f[6]!, f[8]!, f[9]!, f[10]!],
        [c, sn, 0, sn, -c, 0, 0, 0, -1],
        1e-12,
        `trial ${trial}`,
      );
      // Angular Jacobian: only q1 and q5 turn the flange, both about +z.
      const j = jacobianInto(new Float64Array(24), chain, s, f[3]!, f[7]!, f[11]!);
      expectClose(j.subarray(12, 24), [0, 0, 0, 0, 0, 0, 0, 0, 1, 0, 0, 1], 1e-12, `angular rows, trial ${trial}`);
    }
  });
});
