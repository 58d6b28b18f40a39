/**
 * mulberry32 (src/core/math/random.ts) against
 * - a reference written from the published C form of the algorithm (T. Ettinger, public domain [from memory]):
 *     z = (state += 0x6D2B79F5); z = (z ^ z >> 15) * (z | 1); z ^= z + (z ^ z >> 7) * (z | 61); return z ^ z >> 14;
 *   evaluated here in BigInt arithmetic modulo 2³² (no Math.imul, no >>> tricks), divided by 2³²;
 * - statistics of the uniform distribution on [0, 1): mean 1/2, variance 1/12, flat histogram (χ² test), no lag-1
 *   correlation, each with a bound of about five standard errors (standard results, e.g. Knuth TAOCP vol. 2 §3.3).
 */
import { describe, expect, it } from "vitest";
import { mulberry32 } from "../../../src/core/math/random";

const M32 = 1n << 32n;

/** The C algorithm in BigInt: every operation reduced modulo 2³² as uint32_t arithmetic does. */
function referenceMulberry32(seed: number): () => number {
  let state = BigInt.asUintN(32, BigInt(Math.trunc(seed)));
  return () => {
    state = (state + 0x6d2b79f5n) % M32;
    let z = state;
    z = ((z ^ (z >> 15n)) * (z | 1n)) % M32;
    z = (z ^ ((z + (z ^ (z >> 7n)) * (z | 61n)) % M32)) % M32;
    return Number(z ^ (z >> 14n)) / 2 ** 32;
  };
}

const N = 100_000;

describe("mulberry32 against the BigInt reference", () => {
  for (const seed of [0, 1, 42, 9127, 0x7fffffff, 0xffffffff, -1, -123456]) {
    it(`seed ${seed}: first 1000 outputs equal`, () => {
      const a = mulberry32(seed),
        b = referenceMulberry32(seed);
      for (let k = 0; k < 1000; k++) expect(a(), `draw ${k}`).toBe(b());
    });
  }

  it("reduces the seed modulo 2³² (uint32_t state): −1 and 2³² − 1 give one sequence, 2³² and 0 another", () => {
    const a = mulberry32(-1),
      b = mulberry32(2 ** 32 - 1),
      c = mulberry32(2 ** 32),
      d = mulberry32(0);
    for (let k = 0; k < 100; k++) {
      expect(a()).toBe(b());
      expect(c()).toBe(d());
    }
  });
});

describe("mulberry32 determinism and range", () => {
  it("the same seed gives the same sequence; different seeds differ", () => {
    const a = mulberry32(7),
      b = mulberry32(7),
      c = mulberry32(8);
    let same = 0;
    for (let k = 0; k < 1000; k++) {
      const x = a();
      expect(b()).toBe(x);
      if (c() === x) same++;
    }
    expect(same).toBeLessThan(3); // equal 32-bit draws: ~1000/2³² expected
  });

  it("draws lie in [0, 1) and are multiples of 2⁻³²", () => {
    const r = mulberry32(12345);
    let outOfRange = 0,
      offGrid = 0,
      min = 1,
      max = 0;
    for (let k = 0; k < N; k++) {
      const x = r();
      if (!(x >= 0 && x < 1)) outOfRange++;
      if (!Number.isInteger(x * 2 ** 32)) offGrid++;
      min = Math.min(min, x);
      max = Math.max(max, x);
    }
    expect(outOfRange).toBe(0);
    expect(offGrid).toBe(0);
    // order statistics of N uniforms: min and max within ~1e-4 of the ends (P(min > 2e-4) = (1 − 2e-4)^N ≈ e⁻²⁰)
    expect(min).toBeLessThan(2e-4);
    expect(max).toBeGreaterThan(1 - 2e-4);
  });
});

describe("mulberry32 statistics over 10⁵ draws", () => {
  const xs = new Float64Array(N);
  const r = mulberry32(2024);
  for (let k = 0; k < N; k++) xs[k] = r();

  it("mean within 5 standard errors of 1/2 (σ = √(1/12/N) ≈ 9.1e-4)", () => {
    let s = 0;
    for (const x of xs) s += x;
    expect(Math.abs(s / N - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / N));
  });

  it("variance within 5 standard errors of 1/12 (Var((U − ½)²) = 1/80 − 1/144 = 1/180)", () => {
    let s = 0;
    for (const x of xs) s += (x - 0.5) ** 2;
    expect(Math.abs(s / N - 1 / 12)).toBeLessThan(5 * Math.sqrt(1 / 180 / N));
  });

  it("20-bin histogram passes χ² with 19 degrees of freedom at the 0.1 % level (critical value 43.82)", () => {
    const bins = new Array<number>(20).fill(0);
    for (const x of xs) bins[Math.floor(x * 20)]!++;
    const e = N / 20;
    const chi2 = bins.reduce((acc, o) => acc + (o - e) ** 2 / e, 0);
    expect(chi2).toBeLessThan(43.82); // χ²₀.₉₉₉(19) from standard tables
  });

  it("lag-1 serial correlation within 5/√N of 0", () => {
    let sxy = 0;
    for (let k = 0; k + 1 < N; k++) sxy += (xs[k]! - 0.5) * (xs[k + 1]! - 0.5);
    const corr = sxy / (N - 1) / (1 / 12);
    expect(Math.abs(corr)).toBeLessThan(5 / Math.sqrt(N));
  });
});
