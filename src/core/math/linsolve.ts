/**
 * Solves a·x = b in place for `rhs` right-hand sides (a: n × n row-major, overwritten; x: n × rhs row-major, b on
 * entry, the solution on return) by Gaussian elimination with partial pivoting. Returns false when a pivot is not
 * above max(relTol × the largest |entry|, 1e-300). Allocates nothing.
 * @see Golub & Van Loan, Matrix Computations, 4th ed., §3.4 (partial pivoting) [from memory]
 * @example solveInPlace(Float64Array.of(2, 1, 1, 3), Float64Array.of(3, 5), 2) // x = (0.8, 1.4)
 */
export function solveInPlace(a: Float64Array, x: Float64Array, n: number, relTol = 0, rhs = 1): boolean {
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale = Math.max(scale, Math.abs(a[i]!));
  if (!(scale > 0)) return false;
  const tol = Math.max(relTol * scale, 1e-300);
  for (let c = 0; c < n; c++) {
    let p = c,
      best = Math.abs(a[c * n + c]!);
    for (let r = c + 1; r < n; r++) {
      const v = Math.abs(a[r * n + c]!);
      if (v > best) {
        best = v;
        p = r;
      }
    }
    if (!(best > tol)) return false;
    if (p !== c) {
      for (let k = 0; k < n; k++) {
        const t = a[c * n + k]!;
        a[c * n + k] = a[p * n + k]!;
        a[p * n + k] = t;
      }
      for (let j = 0; j < rhs; j++) {
        const t = x[c * rhs + j]!;
        x[c * rhs + j] = x[p * rhs + j]!;
        x[p * rhs + j] = t;
      }
    }
    const piv = a[c * n + c]!;
    for (let r = c + 1; r < n; r++) {
      const f = a[r * n + c]! / piv;
      if (f === 0) continue;
      for (let k = c; k < n; k++) a[r * n + k] = a[r * n + k]! - f * a[c * n + k]!;
      for (let j = 0; j < rhs; j++) x[r * rhs + j] = x[r * rhs + j]! - f * x[c * rhs + j]!;
    }
  }
  for (let c = n - 1; c >= 0; c--) {
    const piv = a[c * n + c]!;
    for (let j = 0; j < rhs; j++) {
      let v = x[c * rhs + j]!;
      for (let r = c + 1; r < n; r++) v -= a[c * n + r]! * x[r * rhs + j]!;
      x[c * rhs + j] = v / piv;
    }
  }
  return true;
}

/**
 * Solves a·x = b in place for a symmetric positive definite a (n × n row-major; only its lower triangle is read,
 * and it is overwritten by the Cholesky factor L with a = L·Lᵀ; x: b on entry, the solution on return). About half
 * the work of elimination with pivoting and no pivot search. Returns false when a pivot is not positive (a not
 * numerically positive definite); a and x are then spoilt. Allocates nothing.
 * @see Golub & Van Loan, Matrix Computations, 4th ed., §4.2 (Cholesky factorization) [from memory]
 */
export function choleskySolveInPlace(a: Float64Array, x: Float64Array, n: number): boolean {
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j]!;
    for (let k = 0; k < j; k++) d -= a[j * n + k]! * a[j * n + k]!;
    if (!(d > 0)) return false;
    const ljj = Math.sqrt(d);
    a[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let v = a[i * n + j]!;
      for (let k = 0; k < j; k++) v -= a[i * n + k]! * a[j * n + k]!;
      a[i * n + j] = v / ljj;
    }
  }
  // L·y = b, then Lᵀ·x = y.
  for (let i = 0; i < n; i++) {
    let v = x[i]!;
    for (let k = 0; k < i; k++) v -= a[i * n + k]! * x[k]!;
    x[i] = v / a[i * n + i]!;
  }
  for (let i = n - 1; i >= 0; i--) {
    let v = x[i]!;
    for (let k = i + 1; k < n; k++) v -= a[k * n + i]! * x[k]!;
    x[i] = v / a[i * n + i]!;
  }
  return true;
}

/**
 * Determinant of a k × k row-major matrix in `work` (overwritten) by LU with partial pivoting.
 * @see Golub & Van Loan, Matrix Computations, 4th ed., §3.2 (LU factorization) [from memory]
 */
export function determinantInPlace(work: Float64Array, k: number): number {
  let det = 1;
  for (let c = 0; c < k; c++) {
    let p = c,
      best = Math.abs(work[c * k + c]!);
    for (let r = c + 1; r < k; r++) {
      const v = Math.abs(work[r * k + c]!);
      if (v > best) {
        best = v;
        p = r;
      }
    }
    if (best === 0) return 0;
    if (p !== c) {
      det = -det;
      for (let i = 0; i < k; i++) {
        const t = work[c * k + i]!;
        work[c * k + i] = work[p * k + i]!;
        work[p * k + i] = t;
      }
    }
    const piv = work[c * k + c]!;
    det *= piv;
    for (let r = c + 1; r < k; r++) {
      const f = work[r * k + c]! / piv;
      for (let i = c; i < k; i++) work[r * k + i] = work[r * k + i]! - f * work[c * k + i]!;
    }
  }
  return det;
}
