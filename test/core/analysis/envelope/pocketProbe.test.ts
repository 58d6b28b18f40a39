/**
 * deepestPoint on rings whose deepest interior point is known by elementary geometry: the centre of a square and
 * of a regular polygon; for an L-shaped ring, a point of the corner square (along an arm the depth is half the
 * arm width, 10; in the corner it reaches 20√2/(1 + √2) = 11.7 at (11.7, 11.7), equidistant from the outer edges
 * and the inner corner). PocketProbe is exercised through the demo arms in drawnSet.test.ts.
 */
import { describe, expect, it } from "vitest";
import { deepestPoint } from "../../../../src/core/analysis/envelope/pocketProbe";

describe("deepestPoint", () => {
  it("finds the centre of a square (to the 32 × 32 grid's half cell)", () => {
    const [x, y] = deepestPoint(Float64Array.of(0, 0, 100, 0, 100, 100, 0, 100));
    expect(Math.hypot(x - 50, y - 50)).toBeLessThanOrEqual(100 / 32);
  });

  it("finds the centre of a regular 40-gon of radius 80 about (300, −200), either orientation", () => {
    const ring = new Float64Array(80);
    for (let k = 0; k < 40; k++) {
      ring[2 * k] = 300 + 80 * Math.cos((2 * Math.PI * k) / 40);
      ring[2 * k + 1] = -200 - 80 * Math.sin((2 * Math.PI * k) / 40);
    }
    const [x, y] = deepestPoint(ring);
    expect(Math.hypot(x - 300, y + 200)).toBeLessThanOrEqual(160 / 32);
  });

  it("puts the deepest point of an L (arms 20 wide, 100 long) in its corner square", () => {
    const [x, y] = deepestPoint(Float64Array.of(0, 0, 100, 0, 100, 20, 20, 20, 20, 100, 0, 100));
    // only the corner square holds points deeper than 10 (to a grid cell)
    expect(x).toBeLessThanOrEqual(20 + 100 / 32);
    expect(y).toBeLessThanOrEqual(20 + 100 / 32);
  });
});
