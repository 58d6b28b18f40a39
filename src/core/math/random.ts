/**
 * Seeded pseudo-random numbers for reproducible sampling (no Math.random in the core).
 * mulberry32: a 32-bit generator by Tommy Ettinger (public domain) [from memory].
 * @example const rnd = mulberry32(1); rnd() // a number in [0, 1), the same on every run
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
