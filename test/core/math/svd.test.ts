/**
 * Tests of src/core/math/svd.ts (one-sided Jacobi singular values) against closed forms (CHECKS C2) and against
 * ml-matrix's SingularValueDecomposition as an independent library (CHECKS §5; STYLE.md C6).
 */
import { Matrix, SingularValueDecomposition } from "ml-matrix";
import { describe, expect, it } from "vitest";
import {
  compileChain,
  createScratch,
  createSvdScratch,
  forwardInto,
  jacobianInto,
  singularValuesInto,
  svdInto,
} from "../../../src/core";
import { expectClose } from "../../helpers/expectClose";
import { mulberry32, uniform } from "../../helpers/prng";
import { generic6rDh } from "../../helpers/testArms";

function svdOurs(a: ArrayLike<number>, rows: number, cols: number): Float64Array {
  return singularValuesInto(new Float64Array(Math.min(rows, cols)), a, rows, cols, createSvdScratch(rows, cols));
}

/** ml-matrix singular values, descending, the reference path of STYLE.md C6. */
function svdMl(a: ArrayLike<number>, rows: number, cols: number): number[] {
  const svd = new SingularValueDecomposition(Matrix.from1DArray(rows, cols, Array.from(a)), {
    autoTranspose: true,
    computeLeftSingularVectors: false,
    computeRightSingularVectors: false,
  });
  return svd.diagonal.slice(0, Math.min(rows, cols));
}

describe("singularValuesInto", () => {
  it("singularValuesInto([[−1, −1], [1, 0]]) = (φ, 1/φ)", () => {
    // 2R with a = (1, 1) at q2 = 90°: J Jᵀ = [[2, −1], [−1, 1]], eigenvalues (3 ± √5)/2, so σ = (φ, 1/φ) with
    // φ = (1 + √5)/2 (Yoshikawa, IJRR 4(2), 1985 [from memory]); CHECKS C2. Tolerance 1e-12.
    const phi = (1 + Math.sqrt(5)) / 2;
    expectClose(svdOurs([-1, -1, 1, 0], 2, 2), [phi, 1 / phi], 1e-12);
  });

  it("singularValuesInto of the 2R Jacobians of CHECKS C2 matches the published numbers", () => {
    // CHECKS C2 (recomputed there with ml-matrix SVD and numeric svd [lib✓]). Printed with 7 decimals; 0.6074777
    // is truncated, not rounded (exact 0.60747775…), so the tolerance is one unit of the last digit, 1e-7. The
    // exact closed form σ² = eigenvalues of J Jᵀ = (tr ± √(tr² − 4 det))/2 is checked to 1e-12 below.
    // J = [[−a1 s1 − a2 s12, −a2 s12], [a1 c1 + a2 c12, a2 c12]] (Spong et al. §4.9 [from memory]; CHECKS C1).
    const j2r = (a1: number, a2: number, q1: number, q2: number): number[] => [
      -a1 * Math.sin(q1) - a2 * Math.sin(q1 + q2),
      -a2 * Math.sin(q1 + q2),
      a1 * Math.cos(q1) + a2 * Math.cos(q1 + q2),
      a2 * Math.cos(q1 + q2),
    ];
    const deg = Math.PI / 180;
    const cases = [
      { a: [0.5, 0.3], q: [0, 90 * deg], printed: [0.6074777, 0.2469226] },
      { a: [0.4, 0.3], q: [30 * deg, 45 * deg], printed: [0.7036796, 0.1205844] },
    ];
    for (const { a, q, printed } of cases) {
      const j = j2r(a[0]!, a[1]!, q[0]!, q[1]!);
      const ours = svdOurs(j, 2, 2);
      expectClose(ours, printed, 1e-7, `printed, a = ${a}`);
      // Closed form from the 2×2 Gram matrix J Jᵀ = [[p, r], [r, t]].
      const p = j[0]! ** 2 + j[1]! ** 2,
        t = j[2]! ** 2 + j[3]! ** 2,
        r = j[0]! * j[2]! + j[1]! * j[3]!;
      const tr = p + t,
        det = p * t - r * r,
        disc = Math.sqrt(tr * tr - 4 * det);
      expectClose(ours, [Math.sqrt((tr + disc) / 2), Math.sqrt((tr - disc) / 2)], 1e-12, `closed form, a = ${a}`);
    }
  });

  it("singularValuesInto matches ml-matrix SVD on random 6 × n matrices, n = 2…7", () => {
    // Independent library check (ml-matrix 6.x SingularValueDecomposition, Golub–Reinsch); CHECKS §5.
    // Tolerance 1e-12 · σ_max (backward-stable SVDs agree to a few ulps of the largest singular value).
    const rand = mulberry32(2024);
    for (let cols = 2; cols <= 7; cols++) {
      for (let trial = 0; trial < 20; trial++) {
        const a = Array.from({ length: 6 * cols }, () => uniform(rand, -2, 2));
        const expected = svdMl(a, 6, cols);
        expect(expected.length).toBe(Math.min(6, cols));
        expectClose(svdOurs(a, 6, cols), expected, 1e-12 * expected[0]!, `6×${cols}, trial ${trial}`);
      }
    }
  });

  it("singularValuesInto matches ml-matrix SVD on rank-deficient matrices (one column a combination of two)", () => {
    // The smallest singular value of a rank-deficient matrix is 0 up to round-off; both libraries must agree.
    const rand = mulberry32(11);
    for (let trial = 0; trial < 20; trial++) {
      const a = Array.from({ length: 36 }, () => uniform(rand, -1, 1));
      for (let r = 0; r < 6; r++) a[r * 6 + 5] = 0.3 * a[r * 6]! - 1.7 * a[r * 6 + 2]!;
      const expected = svdMl(a, 6, 6);
      const ours = svdOurs(a, 6, 6);
      expectClose(ours, expected, 1e-12 * expected[0]!, `trial ${trial}`);
      expect(ours[5]! / ours[0]!).toBeLessThan(1e-14);
    }
  });

  it("singularValuesInto matches ml-matrix SVD on Jacobians of the generic 6R at random poses", () => {
    // Generic 6R of CHECKS §0 (standard DH, invented); Jacobian from jacobianInto at the flange; 1e-12 · σ_max.
    const chain = compileChain(generic6rDh());
    const s = createScratch(chain);
    const j = new Float64Array(36);
    const rand = mulberry32(606);
    for (let trial = 0; trial < 30; trial++) {
      const q = Array.from({ length: 6 }, () => uniform(rand, -Math.PI, Math.PI));
      const f = forwardInto(chain, q, s);
      jacobianInto(j, chain, s, f[3]!, f[7]!, f[11]!);
      const expected = svdMl(j, 6, 6);
      expectClose(svdOurs(j, 6, 6), expected, 1e-12 * expected[0]!, `trial ${trial}`);
      // Also the 3 × 6 translational block (rows vx, vy, vz), the measure the site reports in metres.
      const jv = j.subarray(0, 18);
      const expectedV = svdMl(jv, 3, 6);
      expectClose(svdOurs(jv, 3, 6), expectedV, 1e-12 * expectedV[0]!, `Jv trial ${trial}`);
    }
  });
});

describe("svdInto", () => {
  /** A (rows × cols) · column k of V (cols × cols), both row-major. */
  function aTimesV(a: ArrayLike<number>, v: ArrayLike<number>, rows: number, cols: number, k: number): number[] {
    return Array.from({ length: rows }, (_, r) => {
      let sum = 0;
      for (let c = 0; c < cols; c++) sum += a[r * cols + c]! * v[c * cols + k]!;
      return sum;
    });
  }

  it.each([
    [6, 6],
    [6, 4],
    [3, 6],
    [6, 7],
  ])(
    "svdInto(%i × %i random) gives orthonormal V with A vₖ ⟂ A vⱼ, ‖A vₖ‖ = σₖ, and the ml-matrix σ and vₖ (up to sign)",
    (rows, cols) => {
      // Definition of the SVD, A V = U Σ (Golub & Van Loan, Matrix Computations, 4th ed., §2.4 [from memory]);
      // ml-matrix's right singular vectors as the independent reference (random matrices have distinct σ, so each
      // vₖ is unique up to sign). Tolerances: 1e-12 · σ_max for products, 1e-10 for vectors.
      const rand = mulberry32(rows * 100 + cols);
      for (let trial = 0; trial < 10; trial++) {
        const a = Array.from({ length: rows * cols }, () => uniform(rand, -2, 2));
        const k = Math.min(rows, cols);
        const sv = new Float64Array(k),
          v = new Float64Array(cols * cols);
        svdInto(sv, v, a, rows, cols, createSvdScratch(rows, cols));
        const ml = new SingularValueDecomposition(Matrix.from1DArray(rows, cols, a), { autoTranspose: true });
        const scale = ml.diagonal[0]!;
        expectClose(sv, ml.diagonal.slice(0, k), 1e-12 * scale, "singular values");
        // VᵀV = I.
        const vtv = Matrix.from1DArray(cols, cols, Array.from(v))
          .transpose()
          .mmul(Matrix.from1DArray(cols, cols, Array.from(v)));
        expectClose(vtv.to1DArray(), Matrix.eye(cols, cols).to1DArray(), 1e-12, "VᵀV = I");
        const av = Array.from({ length: cols }, (_, c) => aTimesV(a, v, rows, cols, c));
        for (let c = 0; c < cols; c++) {
          // ‖A vₖ‖ = σₖ; columns past min(rows, cols) are in the null space.
          expectClose(Math.hypot(...av[c]!), c < k ? sv[c]! : 0, 1e-12 * scale, `‖A v${c}‖`);
          for (let d = c + 1; d < k; d++) {
            const dot = av[c]!.reduce((p, x, r) => p + x * av[d]![r]!, 0);
            expectClose(dot, 0, 1e-12 * scale * scale, `A v${c} · A v${d}`);
          }
        }
        const vMl = ml.rightSingularVectors;
        for (let c = 0; c < k; c++) {
          const ours = Array.from({ length: cols }, (_, r) => v[r * cols + c]!);
          const ref = vMl.getColumn(c);
          expectClose(Math.abs(ours.reduce((p, x, r) => p + x * ref[r]!, 0)), 1, 1e-10, `|v${c} · v${c},ml|`);
        }
      }
    },
  );
});
