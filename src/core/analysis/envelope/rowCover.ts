/**
 * A run-length raster: for each row (a horizontal line y = y0 + j·dy) the union of x-intervals covered by a region,
 * with exact floating-point endpoints. Sampling along x is therefore exact; along y the resolution is dy.
 * Rows are created on demand. Used by the workspace envelope to accumulate unions of many polygons cheaply:
 * inserting an interval costs a binary search and a splice, independent of its length.
 */
/** Index of the first of the n intervals in v (pairs start, end) whose end is ≥ x, searched from `from`; n when none. */
function firstEndingAtOrAfter(v: ArrayLike<number>, n: number, x: number, from = 0): number {
  let lo = from,
    hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (v[2 * mid + 1]! < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export class RowCover {
  /** y of row 0 (mm). */
  readonly y0: number;
  /** Row spacing (mm). */
  readonly dy: number;
  private firstRow = 0;
  private data: Float64Array[] = [];
  private size: number[] = [];
  /** Bumped by every change of the rows: the cached symmetric radii below hold for the version they were taken at. */
  private version = 1;
  /** Per row: the version its symmetric radius was taken at, and that radius (see coversMirrored). */
  private symVersion = new Float64Array(0);
  private symRadius = new Float64Array(0);

  constructor(y0: number, dy: number) {
    if (!(dy > 0)) throw new RangeError(`invalid dy: ${dy}`);
    this.y0 = y0;
    this.dy = dy;
  }

  /** Index of the lowest row with an interval (meaningless when empty). */
  get jMin(): number {
    let k = 0;
    while (k < this.size.length && this.size[k] === 0) k++;
    return this.firstRow + k;
  }
  /** Index of the highest row with an interval; jMax < jMin when empty. */
  get jMax(): number {
    let k = this.size.length - 1;
    while (k >= 0 && this.size[k] === 0) k--;
    return this.firstRow + k;
  }

  /** Number of values (2 per interval) in row j; 0 when the row does not exist. */
  lengthOf(j: number): number {
    const k = j - this.firstRow;
    return k < 0 || k >= this.data.length ? 0 : this.size[k]!;
  }

  /** Values array of row j (valid up to lengthOf(j)). */
  valuesOf(j: number): Float64Array {
    const k = j - this.firstRow;
    return k < 0 || k >= this.data.length ? EMPTY_VALUES : this.data[k]!;
  }

  private ensureRow(j: number): number {
    if (this.data.length === 0) {
      this.firstRow = j;
      this.data.push(new Float64Array(8));
      this.size.push(0);
      return 0;
    }
    if (j < this.firstRow) {
      // grow downwards with slack (as many rows again), so a cover growing row by row copies O(log n) times
      const add = Math.max(this.firstRow - j, this.data.length);
      const fresh: Float64Array[] = new Array<Float64Array>(add);
      for (let i = 0; i < add; i++) fresh[i] = EMPTY_VALUES;
      this.data = fresh.concat(this.data);
      this.size = new Array<number>(add).fill(0).concat(this.size);
      this.firstRow -= add;
    } else {
      while (j - this.firstRow >= this.data.length) {
        this.data.push(EMPTY_VALUES);
        this.size.push(0);
      }
    }
    const k = j - this.firstRow;
    if (this.data[k]!.length === 0) this.data[k] = new Float64Array(8);
    return k;
  }

  /** True when [a, b] lies inside one interval of row j. */
  covers(j: number, a: number, b: number): boolean {
    const k = j - this.firstRow;
    if (k < 0 || k >= this.data.length) return false;
    const v = this.data[k]!,
      n = this.size[k]! >> 1;
    const lo = firstEndingAtOrAfter(v, n, a);
    return lo < n && v[2 * lo]! <= a && v[2 * lo + 1]! >= b;
  }

  /**
   * True when every row from jLo to jHi holds both [a, b] and its mirror [−b, −a] inside one interval each.
   *
   * For 0 ≤ a ≤ b a row passes at once when b ≤ its symmetric radius min(−L, R), [L, R] being its interval that holds
   * 0 (then [L, R] holds [−b, b], so both); that radius is cached per row until the rows change (the envelope asks
   * this many times over the same rows between two fills). Otherwise, the two searches decide.
   */
  coversMirrored(jLo: number, jHi: number, a: number, b: number): boolean {
    const kLo = jLo - this.firstRow,
      kHi = jHi - this.firstRow;
    if (kLo < 0 || kHi >= this.data.length) return false;
    const symmetric = a >= 0 && a <= b;
    if (symmetric && this.symVersion.length !== this.data.length) {
      this.symVersion = new Float64Array(this.data.length);
      this.symRadius = new Float64Array(this.data.length);
    }
    for (let k = kLo; k <= kHi; k++) {
      if (symmetric) {
        if (this.symVersion[k] !== this.version) {
          this.symRadius[k] = this.symmetricRadius(k);
          this.symVersion[k] = this.version;
        }
        if (b <= this.symRadius[k]!) continue;
      }
      const v = this.data[k]!,
        n = this.size[k]! >> 1;
      if (n === 0 || v[0]! > -b || v[2 * n - 1]! < b) return false;
      // first interval whose end ≥ −b, then the first whose end ≥ a
      let lo = firstEndingAtOrAfter(v, n, -b);
      if (!(v[2 * lo]! <= -b && v[2 * lo + 1]! >= -a)) return false;
      lo = firstEndingAtOrAfter(v, n, a, lo);
      if (!(lo < n && v[2 * lo]! <= a && v[2 * lo + 1]! >= b)) return false;
    }
    return true;
  }

  /** min(−L, R) for the interval [L, R] of row k that holds 0; −Infinity when none does. */
  private symmetricRadius(k: number): number {
    const v = this.data[k]!,
      n = this.size[k]! >> 1;
    const lo = firstEndingAtOrAfter(v, n, 0);
    return lo < n && v[2 * lo]! <= 0 ? Math.min(-v[2 * lo]!, v[2 * lo + 1]!) : -Infinity;
  }

  /** Adds [a, b] (a ≤ b) to row j, merging with the intervals it touches. */
  add(j: number, a: number, b: number): void {
    if (!(a <= b)) return;
    this.version++;
    const k = this.ensureRow(j);
    let v = this.data[k]!;
    const len = this.size[k]!;
    const n = len >> 1;
    const lo = firstEndingAtOrAfter(v, n, a);
    // intervals lo … last-1 overlap [a, b]
    let last = lo;
    let s = a,
      e = b;
    while (last < n && v[2 * last]! <= b) {
      if (v[2 * last]! < s) s = v[2 * last]!;
      if (v[2 * last + 1]! > e) e = v[2 * last + 1]!;
      last++;
    }
    const removed = last - lo;
    if (removed === 1) {
      v[2 * lo] = s;
      v[2 * lo + 1] = e;
      return;
    }
    const newLen = len + 2 - 2 * removed;
    if (newLen > v.length) {
      const grown = new Float64Array(Math.max(8, v.length * 2));
      grown.set(v.subarray(0, len));
      v = grown;
      this.data[k] = v;
    }
    // shift the tail (from interval `last`) to its new place after the merged interval
    v.copyWithin(2 * lo + 2, 2 * last, len);
    v[2 * lo] = s;
    v[2 * lo + 1] = e;
    this.size[k] = newLen;
  }

  /** Merges, in every row, intervals separated by a gap narrower than `widthMm` (a closing along the rows). */
  closeGaps(widthMm: number): void {
    this.version++;
    for (let k = 0; k < this.data.length; k++) {
      const v = this.data[k]!,
        n = this.size[k]!;
      if (n <= 2) continue;
      let w = 2;
      for (let r = 2; r < n; r += 2) {
        if (v[r]! - v[w - 1]! < widthMm) {
          if (v[r + 1]! > v[w - 1]!) v[w - 1] = v[r + 1]!;
        } else {
          v[w] = v[r]!;
          v[w + 1] = v[r + 1]!;
          w += 2;
        }
      }
      this.size[k] = w;
    }
  }

  /** Smallest and largest x over all rows; [Infinity, -Infinity] when empty. */
  xExtent(): [number, number] {
    let lo = Infinity,
      hi = -Infinity;
    for (let k = 0; k < this.data.length; k++) {
      const n = this.size[k]!;
      if (n === 0) continue;
      const v = this.data[k]!;
      if (v[0]! < lo) lo = v[0]!;
      if (v[n - 1]! > hi) hi = v[n - 1]!;
    }
    return [lo, hi];
  }

  /** Σ over rows of the covered length × dy: the area by the midpoint rule in y (mm²). */
  area(): number {
    let sum = 0;
    for (let k = 0; k < this.data.length; k++) {
      const v = this.data[k]!,
        n = this.size[k]!;
      for (let i = 0; i < n; i += 2) sum += v[i + 1]! - v[i]!;
    }
    return sum * this.dy;
  }
}

const EMPTY_VALUES = new Float64Array(0);
