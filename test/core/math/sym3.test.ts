/**
 * Tests of src/core/math/sym3.ts (closed-form eigenvalues of a symmetric 3×3, Smith 1961) against hand-worked
 * characteristic polynomials and against mathjs `eigs` as an independent general-purpose library.
 */
import * as math from "mathjs";
import { describe, expect, it } from "vitest";
import { symmetricEigenvalues3 } from "../../../src/core/math/sym3";
import { expectClose } from "../../helpers/expectClose";
import { mulberry32, uniform } from "../../helpers/prng";

describe("symmetricEigenvalues3", () => {
  it("[[2,1,0],[1,2,0],[0,0,3]]: eigenvalues 1, 3, 3 (by hand)", () => {
    // Hand: the upper 2×2 block [[2,1],[1,2]] has λ² − 4λ + 3 = 0 → λ = 1, 3; the decoupled z entry adds 3.
    expectClose(symmetricEigenvalues3(2, 2, 3, 1, 0, 0), [1, 3, 3], 1e-12, "block");
  });

  it("a diagonal matrix: its sorted diagonal; a multiple of the identity: that multiple three times", () => {
    // By definition: the eigenvalues of a diagonal matrix are its entries.
    expect(symmetricEigenvalues3(5, -1, 2, 0, 0, 0)).toEqual([-1, 2, 5]);
    expect(symmetricEigenvalues3(4, 4, 4, 0, 0, 0)).toEqual([4, 4, 4]);
  });

  it("the all-ones matrix: 0, 0, 3 (by hand: rank 1, trace 3)", () => {
    // Hand: J = 1·1ᵀ has rank 1, so two eigenvalues are 0 and the third equals the trace, 3.
    expectClose(symmetricEigenvalues3(1, 1, 1, 1, 1, 1), [0, 0, 3], 1e-12, "ones");
  });

  it("R·diag(0.5, 2, 2)·Rᵀ for a turned frame: 0.5, 2, 2 to rounding (a double eigenvalue, by construction)", () => {
    // Similar matrices share eigenvalues; R from mathjs rotationMatrix about an oblique axis.
    const r = math.matrix(math.rotationMatrix(0.7, math.matrix([1, 2, -0.5])));
    const m = math.multiply(math.multiply(r, math.diag([0.5, 2, 2])), math.transpose(r)).toArray() as number[][];
    const got = symmetricEigenvalues3(m[0]![0]!, m[1]![1]!, m[2]![2]!, m[0]![1]!, m[0]![2]!, m[1]![2]!);
    expectClose(got, [0.5, 2, 2], 1e-14, "double eigenvalue");
  });

  it("random symmetric matrices: equal to mathjs eigs (independent library)", () => {
    const rand = mulberry32(20240612);
    for (let k = 0; k < 200; k++) {
      const [xx, yy, zz, xy, xz, yz] = Array.from({ length: 6 }, () => uniform(rand, -3, 3)) as [
        number,
        number,
        number,
        number,
        number,
        number,
      ];
      const ref = (
        math.eigs([
          [xx, xy, xz],
          [xy, yy, yz],
          [xz, yz, zz],
        ]).values as number[]
      )
        .map(Number)
        .sort((a, b) => a - b);
      expectClose(symmetricEigenvalues3(xx, yy, zz, xy, xz, yz), ref, 1e-12, `matrix ${k}`);
    }
  });
});
