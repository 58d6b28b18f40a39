/**
 * Halton low-discrepancy points: the radical inverse of i in a prime base (the van der Corput sequence), one base
 * per coordinate. Used for deterministic, evenly spread joint-space samples.
 * @see Halton, Numerische Mathematik 2 (1960) [from memory]; Niederreiter, Random Number Generation and Quasi-Monte
 *   Carlo Methods (SIAM 1992), ch. 3 [from memory]
 * @example radicalInverse(3, 2) // 0.75: 3 = 11 in base 2, mirrored after the point: 0.11₂
 */
export function radicalInverse(i: number, base: number): number {
  let f = 1,
    r = 0;
  while (i > 0) {
    f /= base;
    r += f * (i % base);
    i = Math.floor(i / base);
  }
  return r;
}

/** The first twelve primes: one Halton base per coordinate. */
export const HALTON_BASES = [2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37] as const;
