/** Angles taken into joint ranges by whole turns. */

/**
 * The value congruent to `value` modulo 2π inside [lo, hi] that is nearest to `near`; NaN when no whole turn brings
 * it inside the range.
 * @example wrapNear(3.5, 0, -Math.PI, Math.PI) // 3.5 − 2π ≈ −2.783
 */
export function wrapNear(value: number, near: number, lo: number, hi: number): number {
  const turn = 2 * Math.PI;
  let k = Math.round((near - value) / turn);
  const kMin = Math.ceil((lo - value) / turn - 1e-12),
    kMax = Math.floor((hi - value) / turn + 1e-12);
  if (kMin > kMax) return NaN;
  if (k < kMin) k = kMin;
  if (k > kMax) k = kMax;
  const v = value + k * turn;
  // Within rounding of a limit: clamp onto it.
  return Math.min(hi, Math.max(lo, v));
}

/**
 * Whether a[ao..ao+n) and b[bo..bo+n) agree modulo whole turns, each to within `tol` (rad).
 * @example sameModuloTurns([0.1, 2 * Math.PI], 0, [0.1, 0], 0, 2, 1e-9) // true
 */
export function sameModuloTurns(
  a: ArrayLike<number>,
  ao: number,
  b: ArrayLike<number>,
  bo: number,
  n: number,
  tol: number,
): boolean {
  for (let i = 0; i < n; i++) {
    const d = Math.abs(a[ao + i]! - b[bo + i]!);
    if (Math.abs(d - 2 * Math.PI * Math.round(d / (2 * Math.PI))) > tol) return false;
  }
  return true;
}
