/** Tests draw from the core's seeded generator (src/core/math/random.ts), so every random pose is reproducible. */
export { mulberry32 } from "../../src/core/math/random";

/** Uniform number in [lo, hi). */
export function uniform(rand: () => number, lo: number, hi: number): number {
  return lo + (hi - lo) * rand();
}
