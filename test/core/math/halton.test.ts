/**
 * The radical inverse (van der Corput sequence), worked by hand from its definition: write i in base b and mirror
 * the digits about the point (Halton 1960; Niederreiter 1992, ch. 3 [from memory]).
 */
import { describe, expect, it } from "vitest";
import { HALTON_BASES, radicalInverse } from "../../../src/core/math/halton";

describe("radicalInverse", () => {
  it("mirrors the digits of i about the point", () => {
    // base 2: 1 = 1₂ → 0.1₂; 2 = 10₂ → 0.01₂; 3 = 11₂ → 0.11₂; 6 = 110₂ → 0.011₂
    expect([1, 2, 3, 6].map((i) => radicalInverse(i, 2))).toEqual([0.5, 0.25, 0.75, 0.375]);
    // base 3: 1 → 1/3; 2 → 2/3; 5 = 12₃ → 0.21₃ = 2/3 + 1/9
    expect(radicalInverse(1, 3)).toBeCloseTo(1 / 3, 15);
    expect(radicalInverse(5, 3)).toBeCloseTo(2 / 3 + 1 / 9, 15);
    expect(radicalInverse(0, 7)).toBe(0);
  });

  it("fills [0, 1) evenly: the first bⁿ points of base b are the multiples of b⁻ⁿ", () => {
    for (const b of [2, 3, 5]) {
      const n = b ** 3;
      const points = Array.from({ length: n }, (_, i) => radicalInverse(i, b)).sort((x, y) => x - y);
      points.forEach((p, k) => expect(p).toBeCloseTo(k / n, 12));
    }
  });

  it("uses the first twelve primes as bases", () => {
    const isPrime = (n: number) => n > 1 && Array.from({ length: n - 2 }, (_, k) => k + 2).every((d) => n % d !== 0);
    expect(HALTON_BASES.length).toBe(12);
    expect(HALTON_BASES.every(isPrime)).toBe(true);
    expect([...HALTON_BASES]).toEqual([...HALTON_BASES].sort((a, b) => a - b));
  });
});
