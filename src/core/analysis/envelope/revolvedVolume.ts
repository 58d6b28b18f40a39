/** Swept volume of the revolute-base layout (Pappus's centroid theorem per radius; see envelope.ts). */
import { arcsMeasure, intersectArcs, sweepArcs, type PolarProfile } from "./polarSweep";
import type { RowCover } from "./rowCover";
import { TWO_PI } from "./viewPass";

/**
 * V = Σ_rows Δz · Σ_intervals ∫ ρ Φ(ρ) dρ over the side view folded onto ρ ≥ 0 (mm³), with Φ from the azimuth
 * profile per polar row (front only, back only, or both) dilated by the joint 1 range.
 */
export function revolvedVolume(side: RowCover, profile: PolarProfile, tLo: number, tHi: number): number {
  const full = tHi - tLo >= TWO_PI;
  const drho = profile.drhoMm;
  const rows = profile.arcs.length;
  const phiF = new Float64Array(rows),
    phiB = new Float64Array(rows),
    phiFB = new Float64Array(rows);
  const base = Math.min(TWO_PI, tHi - tLo),
    both = Math.min(TWO_PI, 2 * (tHi - tLo));
  for (let k = 0; k < rows; k++) {
    if (full) {
      phiF[k] = phiB[k] = phiFB[k] = TWO_PI;
      continue;
    }
    const arcs = profile.arcs[k]!;
    const front: number[] = [],
      back: number[] = [];
    for (let a = 0; a < arcs.length; a += 2) {
      intersectArcs(arcs[a]!, arcs[a + 1]!, -Math.PI / 2, Math.PI, front);
      intersectArcs(arcs[a]!, arcs[a + 1]!, Math.PI / 2, Math.PI, back);
    }
    if (front.length === 0) front.push(0, 0);
    if (back.length === 0) back.push(Math.PI, 0);
    const sf = sweepArcs(front, tLo, tHi),
      sb = sweepArcs(back, tLo, tHi);
    phiF[k] = arcsMeasure(sf);
    phiB[k] = arcsMeasure(sb);
    phiFB[k] = arcsMeasure(Float64Array.from([...sf, ...sb]));
  }
  // ∫_a^b ρ Φ dρ split at the polar row boundaries ρ = k·Δρ (Φ of category cat in polar row k; beyond the profile,
  // the joint 1 range alone). Runs once per polar row crossed: Φ is looked up inline.
  const integrate = (a: number, b: number, cat: 0 | 1 | 2): number => {
    const phis = cat === 0 ? phiF : cat === 1 ? phiB : phiFB,
      outside = cat === 2 ? both : base;
    let sum = 0;
    let k = Math.floor(a / drho);
    let x = a;
    while (x < b) {
      const end = Math.min(b, (k + 1) * drho);
      const phi = full ? TWO_PI : k >= rows || k < 0 ? outside : phis[k]!;
      sum += ((end * end - x * x) / 2) * phi;
      x = end;
      k++;
    }
    return sum;
  };
  let volume = 0;
  for (let j = side.jMin, jEnd = side.jMax; j <= jEnd; j++) {
    const v = side.valuesOf(j),
      len = side.lengthOf(j);
    if (len === 0) continue;
    // front intervals (ρ = r ≥ 0) and back intervals mirrored (ρ = −r ≥ 0), each sorted ascending in ρ
    const fr: number[] = [],
      bk: number[] = [];
    for (let k = 0; k < len; k += 2) {
      const s = v[k]!,
        e = v[k + 1]!;
      if (e > 0) fr.push(Math.max(0, s), e);
      if (s < 0) bk.push(Math.max(0, -e), -s);
    }
    const bkSorted: number[] = [];
    for (let k = bk.length - 2; k >= 0; k -= 2) bkSorted.push(bk[k]!, bk[k + 1]!);
    // sweep the breakpoints of both lists
    const cuts = [...fr, ...bkSorted].sort((p, q) => p - q);
    let rowSum = 0;
    for (let c = 0; c + 1 < cuts.length; c++) {
      const a = cuts[c]!,
        b = cuts[c + 1]!;
      if (!(b > a)) continue;
      const mid = (a + b) / 2;
      const inF = inside(fr, mid),
        inB = inside(bkSorted, mid);
      if (inF || inB) rowSum += integrate(a, b, inF && inB ? 2 : inF ? 0 : 1);
    }
    volume += rowSum * side.dy;
  }
  return volume;
}

function inside(intervals: readonly number[], x: number): boolean {
  for (let k = 0; k < intervals.length; k += 2) if (intervals[k]! <= x && x <= intervals[k + 1]!) return true;
  return false;
}
