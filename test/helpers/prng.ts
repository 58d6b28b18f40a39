/**
 * mulberry32: a small deterministic 32-bit PRNG (public-domain algorithm by Tommy Ettinger, as commonly reproduced
 * [from memory]). Tests use it instead of Math.random so every random pose is reproducible (STYLE.md C15).
 */
export function mulberry32(initialState: number): () => number {
  let a = initialState >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Uniform number in [lo, hi). */
export function uniform(rand: () => number, lo: number, hi: number): number {
  return lo + (hi - lo) * rand();
}
