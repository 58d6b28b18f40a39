/**
 * Singular values of a small dense matrix by one-sided Jacobi rotations (Hestenes), which keeps small singular
 * values accurate (they are what singularity proximity is about).
 * @see Golub & Van Loan, Matrix Computations, 4th ed., §8.6 (Jacobi methods for the SVD)
 */

export interface SvdScratch {
  readonly work: Float64Array;
  readonly norms: Float64Array;
  /** Accumulated right rotations, cols × cols row-major. */
  readonly v: Float64Array;
  readonly order: Int32Array;
}

export function createSvdScratch(rows: number, cols: number): SvdScratch {
  return {
    work: new Float64Array(rows * cols),
    norms: new Float64Array(cols),
    v: new Float64Array(cols * cols),
    order: new Int32Array(cols),
  };
}

/**
 * Writes the min(rows, cols) singular values of the row-major rows × cols matrix `a`, in descending order, into
 * `out`. Allocates nothing.
 * @example singularValuesInto(out, [-1, -1, 1, 0], 2, 2, scratch) // out ≈ [1.618034, 0.618034]
 */
export function singularValuesInto(
  out: Float64Array,
  a: ArrayLike<number>,
  rows: number,
  cols: number,
  s: SvdScratch,
): Float64Array {
  const w = s.work,
    norms = s.norms;
  let frob = 0;
  for (let i = 0; i < rows * cols; i++) {
    w[i] = a[i]!;
    frob += a[i]! * a[i]!;
  }
  const tiny = 1e-30 * frob;
  // Orthogonalise the columns of w by plane rotations; singular values are the final column norms.
  for (let sweep = 0; sweep < 60; sweep++) {
    let rotated = false;
    for (let p = 0; p < cols - 1; p++) {
      for (let q = p + 1; q < cols; q++) {
        let alpha = 0,
          beta = 0,
          gamma = 0;
        for (let r = 0; r < rows; r++) {
          const wp = w[r * cols + p]!,
            wq = w[r * cols + q]!;
          alpha += wp * wp;
          beta += wq * wq;
          gamma += wp * wq;
        }
        // Converged pair (|cos| of the angle between the columns ≤ 1e-12: the singular values are then exact to
        // about 1e-24 relative, since the error is quadratic in it), or a column already at zero (a wide or rank-deficient matrix): no rotation.
        if (gamma === 0 || Math.abs(gamma) <= 1e-12 * Math.sqrt(alpha * beta) || alpha <= tiny || beta <= tiny)
          continue;
        rotated = true;
        const zeta = (beta - alpha) / (2 * gamma);
        const t = Math.sign(zeta || 1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t),
          sn = c * t;
        for (let r = 0; r < rows; r++) {
          const wp = w[r * cols + p]!,
            wq = w[r * cols + q]!;
          w[r * cols + p] = c * wp - sn * wq;
          w[r * cols + q] = sn * wp + c * wq;
        }
      }
    }
    if (!rotated) break;
  }
  for (let c = 0; c < cols; c++) {
    let sum = 0;
    for (let r = 0; r < rows; r++) sum += w[r * cols + c]! * w[r * cols + c]!;
    norms[c] = Math.sqrt(sum);
  }
  // Insertion sort, descending (cols ≤ 10 in practice).
  for (let i = 1; i < cols; i++) {
    const v = norms[i]!;
    let j = i - 1;
    while (j >= 0 && norms[j]! < v) {
      norms[j + 1] = norms[j]!;
      j--;
    }
    norms[j + 1] = v;
  }
  const k = Math.min(rows, cols);
  for (let i = 0; i < k; i++) out[i] = norms[i]!;
  return out;
}

/**
 * Singular values (descending, min(rows, cols) of them, into `sv`) and the right singular vectors (into `vOut`,
 * cols × cols row-major; column k belongs to the k-th largest singular value, columns past min(rows, cols) span the
 * null space of a wide matrix). One-sided Jacobi with the rotations accumulated. Allocates nothing.
 */
export function svdInto(
  sv: Float64Array,
  vOut: Float64Array,
  a: ArrayLike<number>,
  rows: number,
  cols: number,
  s: SvdScratch,
): Float64Array {
  const w = s.work,
    v = s.v,
    norms = s.norms,
    order = s.order;
  let frob = 0;
  for (let i = 0; i < rows * cols; i++) {
    w[i] = a[i]!;
    frob += a[i]! * a[i]!;
  }
  const tiny = 1e-30 * frob;
  v.fill(0, 0, cols * cols);
  for (let i = 0; i < cols; i++) v[i * cols + i] = 1;
  for (let sweep = 0; sweep < 60; sweep++) {
    let rotated = false;
    for (let p = 0; p < cols - 1; p++) {
      for (let q = p + 1; q < cols; q++) {
        let alpha = 0,
          beta = 0,
          gamma = 0;
        for (let r = 0; r < rows; r++) {
          const wp = w[r * cols + p]!,
            wq = w[r * cols + q]!;
          alpha += wp * wp;
          beta += wq * wq;
          gamma += wp * wq;
        }
        // Converged pair, or a column already at zero (a wide or rank-deficient matrix): no rotation.
        if (gamma === 0 || Math.abs(gamma) <= 1e-15 * Math.sqrt(alpha * beta) || alpha <= tiny || beta <= tiny)
          continue;
        rotated = true;
        const zeta = (beta - alpha) / (2 * gamma);
        const t = Math.sign(zeta || 1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t),
          sn = c * t;
        for (let r = 0; r < rows; r++) {
          const wp = w[r * cols + p]!,
            wq = w[r * cols + q]!;
          w[r * cols + p] = c * wp - sn * wq;
          w[r * cols + q] = sn * wp + c * wq;
        }
        for (let r = 0; r < cols; r++) {
          const vp = v[r * cols + p]!,
            vq = v[r * cols + q]!;
          v[r * cols + p] = c * vp - sn * vq;
          v[r * cols + q] = sn * vp + c * vq;
        }
      }
    }
    if (!rotated) break;
  }
  for (let c = 0; c < cols; c++) {
    let sum = 0;
    for (let r = 0; r < rows; r++) sum += w[r * cols + c]! * w[r * cols + c]!;
    norms[c] = Math.sqrt(sum);
    order[c] = c;
  }
  for (let i = 1; i < cols; i++) {
    const o = order[i]!;
    let j = i - 1;
    while (j >= 0 && norms[order[j]!]! < norms[o]!) {
      order[j + 1] = order[j]!;
      j--;
    }
    order[j + 1] = o;
  }
  const k = Math.min(rows, cols);
  for (let i = 0; i < k; i++) sv[i] = norms[order[i]!]!;
  for (let c = 0; c < cols; c++) {
    const from = order[c]!;
    for (let r = 0; r < cols; r++) vOut[r * cols + c] = v[r * cols + from]!;
  }
  return sv;
}
