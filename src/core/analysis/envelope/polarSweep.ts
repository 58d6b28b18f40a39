/**
 * The plan swept by a rotation about an axis: for every radius ρ, the set of azimuths ψ a region reaches, dilated by
 * the rotation range. Rows sit at ρₖ = (k + ½)·Δρ; arcs are stored as (start, length) pairs in rad with
 * start ∈ [−π, π) (profiles) or [0, 2π) (swept plans).
 *
 * The swept plan is outlined by marching squares on a polar grid (angle × radius), periodic in angle, whose field is
 * the signed arc length (mm) to the nearest arc end, clamped to one angular step: crossings along a circle fall
 * exactly on the arc ends. The row below ρ₀ is the antipode of row 0 (ρ = −½Δρ), so a region containing the axis
 * closes through it.
 */
import { isolineRings } from "../../geometry/isolines";

const TWO_PI = 2 * Math.PI;

function mod2pi(a: number): number {
  const r = a % TWO_PI;
  return r < 0 ? r + TWO_PI : r;
}

/** Azimuth profile of a plan region: arcs per row. */
export interface PolarProfile {
  readonly drhoMm: number;
  /** arcs[k] = [start, length, …] for row k (rad); a full circle is [−π, 2π]. */
  readonly arcs: Float64Array[];
}

function flatPointInRings(x: number, y: number, rings: readonly Float64Array[]): boolean {
  let inside = false;
  for (const ring of rings) {
    const n = ring.length >> 1;
    for (let k = 0, p = n - 1; k < n; p = k++) {
      const x0 = ring[2 * p]!,
        y0 = ring[2 * p + 1]!,
        x1 = ring[2 * k]!,
        y1 = ring[2 * k + 1]!;
      if (y0 > y !== y1 > y && x < x0 + ((y - y0) * (x1 - x0)) / (y1 - y0)) inside = !inside;
    }
  }
  return inside;
}

/**
 * Azimuth arcs per row of a region given by rings (inside on the left, centred on the rotation axis, mm).
 * Each ring edge is intersected with the row circles; a crossing enters the region (as ψ grows) when the edge
 * moves away from the axis there (x·d > 0 for the crossing point x and edge direction d).
 */
export function polarProfile(rings: readonly Float64Array[], drhoMm: number): PolarProfile {
  if (!(drhoMm > 0)) throw new RangeError(`invalid drhoMm: ${drhoMm}`);
  let rhoMax = 0;
  for (const r of rings) for (let k = 0; k < r.length; k += 2) rhoMax = Math.max(rhoMax, Math.hypot(r[k]!, r[k + 1]!));
  const rows = rings.length === 0 ? 0 : Math.ceil(rhoMax / drhoMm) + 1;
  const crossings: number[][] = Array.from({ length: rows }, () => []);
  const nudge = 1e-7 * drhoMm * Math.SQRT2;
  for (const ring of rings) {
    const n = ring.length >> 1;
    for (let k = 0; k < n; k++) {
      const px = ring[2 * k]!,
        py = ring[2 * k + 1]!;
      const l = (k + 1) % n;
      const dx = ring[2 * l]! - px,
        dy = ring[2 * l + 1]! - py;
      const a = dx * dx + dy * dy;
      if (a === 0) continue;
      const b = px * dx + py * dy,
        c0 = px * px + py * py;
      const tFoot = Math.max(0, Math.min(1, -b / a));
      const rhoLo = Math.hypot(px + tFoot * dx, py + tFoot * dy);
      const rhoHi = Math.max(Math.sqrt(c0), Math.hypot(px + dx, py + dy));
      const k0 = Math.max(0, Math.ceil(rhoLo / drhoMm - 0.5)),
        k1 = Math.min(rows - 1, Math.floor(rhoHi / drhoMm - 0.5));
      for (let row = k0; row <= k1; row++) {
        const rho = (row + 0.5) * drhoMm + nudge;
        const disc = b * b - a * (c0 - rho * rho);
        if (disc < 0) continue;
        const sq = Math.sqrt(disc);
        for (const t of [(-b - sq) / a, (-b + sq) / a]) {
          if (!(t >= 0 && t < 1)) continue;
          const x = px + t * dx,
            y = py + t * dy;
          crossings[row]!.push(Math.atan2(y, x), x * dx + y * dy > 0 ? 1 : 0);
        }
      }
    }
  }
  const arcs: Float64Array[] = [];
  for (let row = 0; row < rows; row++) {
    const c = crossings[row]!;
    if (c.length === 0) {
      const rho = (row + 0.5) * drhoMm + nudge;
      arcs.push(flatPointInRings(rho, 0, rings) ? Float64Array.of(-Math.PI, TWO_PI) : new Float64Array(0));
      continue;
    }
    const order = Array.from({ length: c.length / 2 }, (_, i) => i).sort((p, q) => c[2 * p]! - c[2 * q]!);
    const first = order.findIndex((i) => c[2 * i + 1] === 1);
    const out: number[] = [];
    if (first >= 0) {
      let inside = false,
        open = 0;
      for (let step = 0; step < order.length; step++) {
        const i = order[(first + step) % order.length]!;
        const psi = c[2 * i]!,
          enter = c[2 * i + 1] === 1;
        if (enter && !inside) {
          inside = true;
          open = psi;
        } else if (!enter && inside) {
          inside = false;
          out.push(open, mod2pi(psi - open));
        }
      }
      if (inside) out.push(open, mod2pi(c[2 * order[first]!]! - open) || TWO_PI);
    }
    arcs.push(Float64Array.from(out));
  }
  return { drhoMm, arcs };
}

function arcMeasureOf(merged: Float64Array): number {
  let sum = 0;
  for (let k = 1; k < merged.length; k += 2) sum += merged[k]!;
  return sum;
}

/** Total measure of a union of arcs (start, length), capped at 2π. */
export function arcsMeasure(arcs: ArrayLike<number>): number {
  const merged = mergeArcs(arcs);
  let sum = 0;
  for (let k = 1; k < merged.length; k += 2) sum += merged[k]!;
  return Math.min(TWO_PI, sum);
}

/** Union of arcs as disjoint arcs with starts in [0, 2π); a full circle is [0, 2π]. */
function mergeArcs(arcs: ArrayLike<number>): Float64Array {
  const list: [number, number][] = [];
  for (let k = 0; k < arcs.length; k += 2) {
    const len = arcs[k + 1]!;
    if (len >= TWO_PI) return Float64Array.of(0, TWO_PI);
    if (len < 0) continue;
    list.push([mod2pi(arcs[k]!), len]);
  }
  if (list.length === 0) return new Float64Array(0);
  list.sort((p, q) => p[0] - q[0]);
  const out: [number, number][] = [];
  for (const [s, l] of list) {
    const last = out[out.length - 1];
    if (last && s <= last[0] + last[1]) last[1] = Math.max(last[1], s + l - last[0]);
    else out.push([s, l]);
  }
  // wrap: the last arc may run past 2π into the first ones
  while (out.length > 1) {
    const last = out[out.length - 1]!,
      firstArc = out[0]!;
    const over = last[0] + last[1] - TWO_PI;
    if (over < firstArc[0]) break;
    last[1] = Math.max(last[1], firstArc[0] + TWO_PI + firstArc[1] - last[0]);
    out.shift();
  }
  const only = out[0]!;
  if (out.length === 1 && only[1] >= TWO_PI) return Float64Array.of(0, TWO_PI);
  return Float64Array.from(out.flat());
}

/** Arcs dilated by a rotation t ∈ [tLo, tHi]: (start + tLo, length + (tHi − tLo)), merged. */
export function sweepArcs(arcs: ArrayLike<number>, tLoRad: number, tHiRad: number): Float64Array {
  const out: number[] = [];
  for (let k = 0; k < arcs.length; k += 2) out.push(arcs[k]! + tLoRad, arcs[k + 1]! + (tHiRad - tLoRad));
  return mergeArcs(out);
}

/** Intersection of arc (a, la) with arc (b, lb): up to two arcs. */
export function intersectArcs(a: number, la: number, b: number, lb: number, out: number[]): void {
  if (la >= TWO_PI) {
    out.push(b, lb);
    return;
  }
  const a0 = b + mod2pi(a - b);
  for (const s of [a0, a0 - TWO_PI]) {
    const lo = Math.max(s, b),
      hi = Math.min(s + la, b + lb);
    if (hi > lo) out.push(lo, hi - lo);
  }
}

/** Where the swept plan sits: plan angle θ = phi0 + sense·(ψ + t); centre = the axis in plan coordinates (mm). */
interface PlanPlacement {
  readonly tLoRad: number;
  readonly tHiRad: number;
  readonly phi0Rad: number;
  readonly sense: 1 | -1;
  readonly centreMm: readonly [number, number];
}

/** Swept arcs per row in plan angle (starts in [0, 2π)). */
export function sweptPlanArcs(profile: PolarProfile, place: PlanPlacement): Float64Array[] {
  return profile.arcs.map((arcs) => {
    const swept = sweepArcs(arcs, place.tLoRad, place.tHiRad);
    const out: number[] = [];
    for (let k = 0; k < swept.length; k += 2) {
      const s = swept[k]!,
        l = swept[k + 1]!;
      out.push(place.sense === 1 ? place.phi0Rad + s : place.phi0Rad - s - l, l);
    }
    return mergeArcs(out);
  });
}

/**
 * Rings of the swept plan (mm, inside on the left) from swept arcs per row. Only cells near an arc end or where
 * two neighbouring rows differ are visited, so the angular step can be fine.
 * @param maxColumns cap on the number of angular nodes
 */
export function sweptPlanRings(
  swept: readonly Float64Array[],
  drhoMm: number,
  centreMm: readonly [number, number],
  maxColumns = 1 << 16,
): Float64Array[] {
  const rows = swept.length;
  if (rows === 0) return [];
  // angular step: at most 0.25°, and at most half the narrowest arc or gap
  let narrow = TWO_PI / 1440;
  for (const a of swept) {
    const n = a.length >> 1;
    if (n === 0 || a[1]! >= TWO_PI) continue;
    for (let k = 0; k < n; k++) {
      narrow = Math.min(narrow, a[2 * k + 1]! / 2);
      const nextStart = k + 1 < n ? a[2 * k + 2]! : a[0]! + TWO_PI;
      narrow = Math.min(narrow, (nextStart - a[2 * k]! - a[2 * k + 1]!) / 2);
    }
  }
  let w = Math.ceil(TWO_PI / Math.max(narrow, 1e-9));
  w = Math.min(maxColumns, Math.max(1440, w + (w % 2)));
  const dtheta = TWO_PI / w;
  // row −1 is the pole (the axis point): inside when row 0 covers at least half a turn
  const poleInside = arcMeasureOf(swept[0]!) >= Math.PI;
  const full = Float64Array.of(0, TWO_PI),
    empty = new Float64Array(0);
  const arcsOf = (k: number): Float64Array =>
    k >= 0 ? (k < rows ? swept[k]! : empty) : k === -1 && poleInside ? full : empty;
  const value = (i: number, k: number): number => {
    const arcs = arcsOf(k),
      n = arcs.length >> 1;
    const rho = k >= 0 ? (k + 0.5) * drhoMm : 0.5 * drhoMm,
      cap = rho * dtheta;
    const theta = i * dtheta;
    let inside = -Infinity,
      outside = Infinity;
    for (let a = 0; a < n; a++) {
      const st = arcs[2 * a]!,
        l = arcs[2 * a + 1]!;
      if (l >= TWO_PI) return cap;
      const r = mod2pi(theta - st);
      if (r <= l) inside = Math.max(inside, Math.min(r, l - r));
      else outside = Math.min(outside, Math.min(r - l, TWO_PI - r));
    }
    return inside > -Infinity ? Math.min(inside * rho, cap) : -Math.min(outside * rho, cap);
  };
  const col = (theta: number) => Math.floor(theta / dtheta);
  const pushWrapped = (out: number[], c0: number, c1: number) => {
    if (c1 - c0 >= w - 1) {
      out.push(0, w - 1);
      return;
    }
    const a = ((c0 % w) + w) % w,
      b = a + (c1 - c0);
    if (b < w) out.push(a, b);
    else out.push(a, w - 1, 0, b - w);
  };
  const events: number[] = [];
  const rings = isolineRings({
    nx: w,
    jMin: -1,
    jMax: rows - 1,
    periodicX: true,
    cells(k, out) {
      const A = arcsOf(k),
        B = arcsOf(k + 1);
      // ends of both rows' arcs
      for (const arcs of [A, B]) {
        for (let a = 0; a < arcs.length; a += 2) {
          if (arcs[a + 1]! >= TWO_PI) continue;
          const s0 = mod2pi(arcs[a]!),
            s1 = mod2pi(arcs[a]! + arcs[a + 1]!);
          pushWrapped(out, col(s0) - 1, col(s0) + 1);
          pushWrapped(out, col(s1) - 1, col(s1) + 1);
        }
      }
      // where the rows differ: sweep both rows' arcs split into [0, 2π)
      events.length = 0;
      for (const [arcs, tag] of [
        [A, 1],
        [B, 2],
      ] as const) {
        for (let a = 0; a < arcs.length; a += 2) {
          const st = mod2pi(arcs[a]!),
            l = Math.min(arcs[a + 1]!, TWO_PI);
          if (st + l <= TWO_PI) events.push(st, tag, st + l, tag);
          else events.push(st, tag, TWO_PI, tag, 0, tag, st + l - TWO_PI, tag);
        }
      }
      const order: number[] = [];
      for (let e = 0; e < events.length; e += 2) order.push(e);
      order.sort((p, q) => events[p]! - events[q]!);
      let inA = false,
        inB = false,
        open = 0;
      for (const e of order) {
        const x = events[e]!,
          before = inA !== inB;
        if (events[e + 1] === 1) inA = !inA;
        else inB = !inB;
        const after = inA !== inB;
        if (!before && after) open = x;
        else if (before && !after) pushWrapped(out, col(open) - 1, col(x) + 1);
      }
    },
    value(i, k) {
      return value(i, k);
    },
  });
  const out: Float64Array[] = [];
  for (const r of rings) {
    const n = r.length >> 1;
    const mapped = new Float64Array(2 * n);
    for (let k = 0; k < n; k++) {
      const theta = r[2 * k]! * dtheta,
        gy = r[2 * k + 1]!;
      // rows k ≥ 0 sit at (k + ½)Δρ; between the pole row and row 0 the radius grows linearly from 0 to ½Δρ
      const rho = gy >= 0 ? (gy + 0.5) * drhoMm : Math.max(0, (gy + 1) * 0.5 * drhoMm);
      // (θ, ρ) → (x, y) reverses orientation: write the ring backwards to keep the inside on the left
      const o = 2 * (n - 1 - k);
      mapped[o] = centreMm[0] + rho * Math.cos(theta);
      mapped[o + 1] = centreMm[1] + rho * Math.sin(theta);
    }
    out.push(mapped);
  }
  return out;
}
