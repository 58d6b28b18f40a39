/**
 * Eigenvalues of a real symmetric 3×3 matrix by the cyclic Jacobi method: plane rotations that zero one
 * off-diagonal entry at a time until the matrix is diagonal. Accurate to rounding relative to the matrix norm, double
 * eigenvalues included (the closed trigonometric form loses half the digits there).
 * @see Golub & Van Loan, Matrix Computations, 4th ed., §8.5 (Jacobi methods), Algorithm 8.5.1 (sym.schur2)
 */

/**
 * Eigenvalues, ascending, of the symmetric matrix [[xx, xy, xz], [xy, yy, yz], [xz, yz, zz]]. Allocates a 9-entry
 * work array and the result.
 * @example symmetricEigenvalues3(2, 2, 3, 1, 0, 0) // [1, 3, 3]
 */
export function symmetricEigenvalues3(
  xx: number,
  yy: number,
  zz: number,
  xy: number,
  xz: number,
  yz: number,
): [number, number, number] {
  const a = [xx, xy, xz, xy, yy, yz, xz, yz, zz];
  const pairs = [
    [0, 1],
    [0, 2],
    [1, 2],
  ] as const;
  for (let sweep = 0; sweep < 50; sweep++) {
    const off = a[1]! * a[1]! + a[2]! * a[2]! + a[5]! * a[5]!;
    const diag = a[0]! * a[0]! + a[4]! * a[4]! + a[8]! * a[8]!;
    if (off <= 1e-36 * diag || off === 0) break;
    for (const [p, q] of pairs) {
      const apq = a[p * 3 + q]!;
      if (apq === 0) continue;
      // sym.schur2: cos and sin of the rotation that zeroes a_pq (the smaller of the two roots of t² + 2τt − 1).
      const tau = (a[q * 3 + q]! - a[p * 3 + p]!) / (2 * apq);
      const t = (tau >= 0 ? 1 : -1) / (Math.abs(tau) + Math.sqrt(1 + tau * tau));
      const c = 1 / Math.sqrt(1 + t * t),
        s = t * c;
      a[p * 3 + p] = a[p * 3 + p]! - t * apq;
      a[q * 3 + q] = a[q * 3 + q]! + t * apq;
      a[p * 3 + q] = a[q * 3 + p] = 0;
      const r = 3 - p - q;
      const arp = a[r * 3 + p]!,
        arq = a[r * 3 + q]!;
      a[r * 3 + p] = a[p * 3 + r] = c * arp - s * arq;
      a[r * 3 + q] = a[q * 3 + r] = s * arp + c * arq;
    }
  }
  const d = [a[0]!, a[4]!, a[8]!].sort((u, v) => u - v);
  return [d[0]!, d[1]!, d[2]!];
}
