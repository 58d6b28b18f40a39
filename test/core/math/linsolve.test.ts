/** Tests of src/core/math/linsolve.ts against ml-matrix (an independent LU solve and determinant). */
import { determinant, Matrix, solve } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { determinantInPlace, solveInPlace } from "../../../src/core/math/linsolve";
import { mulberry32 } from "../../helpers/prng";

const rnd = mulberry32(7301);
const randomMatrix = (n: number) => Array.from({ length: n * n }, () => 2 * rnd() - 1);

describe("solveInPlace with several right-hand sides", () => {
  it("solves a·x = b for 3 right-hand sides like ml-matrix's solve, column by column", () => {
    for (const n of [3, 4, 6]) {
      const a = randomMatrix(n),
        b = Array.from({ length: n * 3 }, () => 2 * rnd() - 1);
      const x = Float64Array.from(b);
      expect(solveInPlace(Float64Array.from(a), x, n, 1e-13, 3)).toBe(true);
      // Reference: ml-matrix solve (LU) of the same system.
      const ref = solve(Matrix.from1DArray(n, n, a), Matrix.from1DArray(n, 3, b));
      for (let i = 0; i < n * 3; i++) expect(x[i]).toBeCloseTo(ref.get(Math.floor(i / 3), i % 3), 9);
    }
  });

  it("with one right-hand side gives the same bits as three copies of it", () => {
    const a = randomMatrix(5),
      b = Array.from({ length: 5 }, () => rnd());
    const x1 = Float64Array.from(b),
      x3 = Float64Array.from(b.flatMap((v) => [v, v, v]));
    solveInPlace(Float64Array.from(a), x1, 5);
    solveInPlace(Float64Array.from(a), x3, 5, 0, 3);
    for (let i = 0; i < 5; i++) for (let j = 0; j < 3; j++) expect(x3[i * 3 + j]).toBe(x1[i]);
  });

  it("reports a singular matrix (two equal rows)", () => {
    const a = Float64Array.of(1, 2, 3, 1, 2, 3, 0, 1, 4);
    expect(solveInPlace(a, new Float64Array(9), 3, 1e-13, 3)).toBe(false);
  });
});

describe("determinantInPlace", () => {
  it("equals ml-matrix's determinant on random 4 × 4 and 6 × 6 matrices", () => {
    for (const n of [4, 6]) {
      const a = randomMatrix(n);
      const ref = determinant(Matrix.from1DArray(n, n, a));
      expect(determinantInPlace(Float64Array.from(a), n)).toBeCloseTo(ref, 12);
    }
  });
});
