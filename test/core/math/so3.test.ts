import { describe, expect, it } from "vitest";
import { expm, matrix, multiply } from "mathjs";
import { rotationErrorInto } from "../../../src/core/math/so3";
import { choleskySolveInPlace, solveInPlace } from "../../../src/core/math/linsolve";
import { CholeskyDecomposition, Matrix } from "ml-matrix";
import { mulberry32 } from "../../helpers/prng";

// Reference: mathjs expm of the skew matrix [ω] (an independent implementation of exp on so(3); CHECKS C7).
const expSkew = (w: number[]): number[][] =>
  expm(
    matrix([
      [0, -w[2]!, w[1]!],
      [w[2]!, 0, -w[0]!],
      [-w[1]!, w[0]!, 0],
    ]),
  ).toArray() as number[][];
const pose4 = (r: number[][]): Float64Array => Float64Array.from([...r[0]!, 0, ...r[1]!, 0, ...r[2]!, 0, 0, 0, 0, 1]);

describe("rotationErrorInto", () => {
  it("recovers ω from R_target = exp([ω])·R_current (mathjs expm), 3×3 and 4×4 targets", () => {
    const rnd = mulberry32(11);
    for (let n = 0; n < 50; n++) {
      const rc = expSkew([rnd() * 4 - 2, rnd() * 4 - 2, rnd() * 4 - 2]);
      const axis = [rnd() - 0.5, rnd() - 0.5, rnd() - 0.5];
      const len = Math.hypot(...axis),
        angle = 0.05 + 2.9 * rnd();
      const w = axis.map((a) => (a / len) * angle);
      const rt = multiply(expSkew(w), rc) as number[][];
      const e3 = rotationErrorInto(new Float64Array(3), 0, rt.flat(), 3, pose4(rc));
      const e4 = rotationErrorInto(new Float64Array(6), 3, pose4(rt), 4, pose4(rc));
      for (let i = 0; i < 3; i++) {
        expect(Math.abs(e3[i]! - w[i]!)).toBeLessThan(1e-9);
        expect(Math.abs(e4[3 + i]! - w[i]!)).toBeLessThan(1e-9);
      }
    }
  });

  it("small errors (below 1e-4 rad, where the series replaces atan2) match mathjs expm to 1e-15 relative", () => {
    const rnd = mulberry32(12);
    for (let n = 0; n < 200; n++) {
      const rc = expSkew([rnd() * 4 - 2, rnd() * 4 - 2, rnd() * 4 - 2]);
      const axis = [rnd() - 0.5, rnd() - 0.5, rnd() - 0.5];
      const len = Math.hypot(...axis),
        angle = 10 ** (-9 + 5 * rnd());
      const w = axis.map((a) => (a / len) * angle);
      const rt = multiply(expSkew(w), rc) as number[][];
      const e = rotationErrorInto(new Float64Array(3), 0, rt.flat(), 3, pose4(rc));
      // rounding of the rotation products limits the absolute accuracy to a few 1e-16
      for (let i = 0; i < 3; i++) expect(Math.abs(e[i]! - w[i]!)).toBeLessThan(1e-15 * angle + 1e-15);
    }
  });

  it("a half turn about z gives |ω| = π along ±z", () => {
    const e = rotationErrorInto(
      new Float64Array(3),
      0,
      [-1, 0, 0, 0, -1, 0, 0, 0, 1],
      3,
      pose4([
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
      ]),
    );
    expect(Math.abs(Math.abs(e[2]!) - Math.PI)).toBeLessThan(1e-12);
    expect(Math.hypot(e[0]!, e[1]!)).toBeLessThan(1e-12);
  });
});

describe("solveInPlace", () => {
  it("solves a random 6×6 system (residual against the original matrix) and rejects a singular one", () => {
    const rnd = mulberry32(5);
    const a = Float64Array.from({ length: 36 }, () => rnd() - 0.5),
      b = Float64Array.from({ length: 6 }, () => rnd());
    const work = Float64Array.from(a),
      x = Float64Array.from(b);
    expect(solveInPlace(work, x, 6)).toBe(true);
    for (let r = 0; r < 6; r++) {
      let v = 0;
      for (let c = 0; c < 6; c++) v += a[r * 6 + c]! * x[c]!;
      expect(Math.abs(v - b[r]!)).toBeLessThan(1e-12);
    }
    const singular = Float64Array.from([1, 2, 2, 4]);
    expect(solveInPlace(singular, Float64Array.from([1, 1]), 2, 1e-15)).toBe(false);
  });
});

describe("choleskySolveInPlace", () => {
  it("solves random symmetric positive definite systems as ml-matrix's Cholesky decomposition does, and refuses an indefinite one", () => {
    // Reference: ml-matrix CholeskyDecomposition(A).solve(b), an independent implementation; tolerance 1e-12.
    const rnd = mulberry32(6);
    for (const n of [2, 4, 6, 7]) {
      for (let trial = 0; trial < 20; trial++) {
        // A = MᵀM + 1e-3·I (positive definite)
        const m = Matrix.from1DArray(
          n,
          n,
          Array.from({ length: n * n }, () => rnd() - 0.5),
        );
        const a = m.transpose().mmul(m).add(Matrix.eye(n, n).mul(1e-3));
        const b = Array.from({ length: n }, () => rnd() - 0.5);
        const expected = new CholeskyDecomposition(a).solve(Matrix.columnVector(b)).to1DArray();
        const work = Float64Array.from(a.to1DArray()),
          x = Float64Array.from(b);
        expect(choleskySolveInPlace(work, x, n)).toBe(true);
        for (let i = 0; i < n; i++)
          expect(Math.abs(x[i]! - expected[i]!)).toBeLessThan(1e-12 * Math.max(1, Math.abs(expected[i]!)));
      }
    }
    expect(choleskySolveInPlace(Float64Array.from([1, 2, 2, 1]), Float64Array.from([1, 1]), 2)).toBe(false);
  });
});
