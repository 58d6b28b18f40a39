/**
 * Angles taken into ranges by whole turns (math/angles.ts), against values worked by hand:
 * - wrapNear(3.5, 0, −π, π) = 3.5 − 2π (the only value of 3.5 + 2πk in [−π, π]);
 * - wrapNear(0.2, 7, −4π, 4π) = 0.2 + 2π (of 0.2 + 2πk, the nearest to 7: k = 1 gives 6.483, k = 2 gives 12.77);
 * - wrapNear(3, 0, −1, 1) = NaN (3 + 2πk never lies in [−1, 1]);
 * - a value within rounding beyond a limit is put onto it: wrapNear(1 + 1e-13, 0, −1, 1) = 1.
 */
import { describe, expect, it } from "vitest";
import { sameModuloTurns, wrapNear } from "../../../src/core/math/angles";

describe("wrapNear", () => {
  it("takes a value by whole turns into the range, nearest to `near`; NaN when no turn fits", () => {
    expect(wrapNear(3.5, 0, -Math.PI, Math.PI)).toBeCloseTo(3.5 - 2 * Math.PI, 15);
    expect(wrapNear(0.2, 7, -4 * Math.PI, 4 * Math.PI)).toBeCloseTo(0.2 + 2 * Math.PI, 15);
    expect(wrapNear(3, 0, -1, 1)).toBeNaN();
    expect(wrapNear(1 + 1e-13, 0, -1, 1)).toBe(1);
  });
});

describe("sameModuloTurns", () => {
  it("compares element by element modulo 2π within the tolerance", () => {
    expect(sameModuloTurns([0.1, 2 * Math.PI], 0, [0.1, 0], 0, 2, 1e-9)).toBe(true);
    expect(sameModuloTurns([9, 0.1, -4 * Math.PI + 0.3], 1, [0.1, 0.3], 0, 2, 1e-9)).toBe(true);
    expect(sameModuloTurns([0.1, 0.2], 0, [0.1, 0.2 + 1e-6], 0, 2, 1e-9)).toBe(false);
  });
});
