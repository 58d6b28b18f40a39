/**
 * Load diagram (pure): allowed payload mass against the CG offset from the wrist moment and inertia ratings, and the
 * plausibility warnings that compare the rated payload with those ratings. Static holding only.
 *
 * Notation (SI inside, mm/kg/N·m at the output):
 *   m        payload mass, kg                       g        standard gravity, m/s² (units.ts)
 *   Lz       CG offset along the flange axis, from the flange face, m
 *   Lxy      CG offset across the flange axis (radial), m
 *   d, e     pivot of a bending wrist axis in the flange frame (input.ts)
 *
 * Conventions (common practice, no source):
 *   - Levers. Roll axis (the last axis, the flange axis): L = Lxy + e. Bending axes (4/5 of a spherical wrist):
 *     L = √((d + Lz)² + (e + Lxy)²), the distance from the wrist centre to the CG. That is the largest moment arm the
 *     axis can meet over wrist postures and gravity directions (the perpendicular distance from an axis through the
 *     pivot never exceeds the distance to the pivot, and reaches it when the axis is perpendicular to pivot→CG), so
 *     the diagram holds in every posture. It matches the drawings that measure Lz from the flange and add the flange
 *     distance of the axis-5 centre.
 *   - Inertia: the payload is a point mass, J = m·L² with the same lever; the load's own inertia about its CG is
 *     not included (add it when comparing with a real tool).
 */
import { STANDARD_GRAVITY_M_PER_S2, mToMm, mmToM } from "../../units";
import type { PayloadInput, WristLever, WristRating } from "./input";

/** `massesKg` (when given) replaces `massFractions`. Extent null: chosen from the smallest curve. */
export interface LoadDiagramOptions {
  /** Curves of equal mass at these fractions of the rated payload, each in (0, 1]. */
  readonly massFractions: readonly number[];
  /** Curves at these masses instead, kg. */
  readonly massesKg: readonly number[] | null;
  /** Grid step of the table, mm. */
  readonly stepMm: number;
  /** Largest Lxy and Lz of the table, mm; null: the reach of the smallest curve, rounded up to 50 mm. */
  readonly extentMm: number | null;
  /** Vertices per curve. */
  readonly curvePoints: number;
  readonly gravityMPerS2: number;
}

export const DEFAULT_LOAD_DIAGRAM: LoadDiagramOptions = {
  massFractions: [1, 0.8, 0.6, 0.4, 0.2],
  massesKg: null,
  stepMm: 25,
  extentMm: null,
  curvePoints: 48,
  gravityMPerS2: STANDARD_GRAVITY_M_PER_S2,
};

export interface LoadDiagramJoint {
  readonly joint: string;
  readonly momentNm: number | null;
  readonly inertiaKgM2: number | null;
  readonly kind: "roll" | "bend";
  readonly pivotBehindFlangeMm: number;
  readonly pivotOffAxisMm: number;
  readonly leverBasis: WristLever["basis"];
}

export interface LoadDiagramCurve {
  readonly massKg: number;
  readonly fractionOfRated: number;
  /** Boundary of the allowed region for this mass, [LxyMm, LzMm] from Lz = 0 to the Lz axis; empty when the mass is
   * not allowed even at zero offset. Exact on the vertices (closed form). */
  readonly pointsMm: readonly (readonly [number, number])[];
  /** The curve leaves the table (a limit that does not depend on Lz, e.g. only a roll rating). */
  readonly openEnded: boolean;
}

export interface LoadDiagram {
  readonly basis: "wrist-ratings" | "as-rated";
  readonly statement: string;
  readonly convention: string;
  readonly ratedPayloadKg: number;
  readonly joints: readonly LoadDiagramJoint[];
  /** Largest mass the wrist ratings allow with the CG at the flange centre, uncapped, kg; null when unlimited. */
  readonly wristAllowsAtZeroOffsetKg: number | null;
  readonly curves: readonly LoadDiagramCurve[];
  /**
   * Allowed mass (capped at the rated payload) on a grid: allowedKg[ix + iz * lxyMm.length] at (lxyMm[ix], lzMm[iz]).
   * limitingIndex: index into `joints`, −1 where the rated payload caps. Null without wrist ratings.
   */
  readonly grid: {
    readonly lxyMm: readonly number[];
    readonly lzMm: readonly number[];
    readonly allowedKg: readonly number[];
    readonly limitingIndex: readonly number[];
  } | null;
}

export const PAYLOAD_STATEMENT =
  "Static holding only: excludes acceleration and safety margins. Gripper, tooling and part all count as payload. " +
  "Computed from the parameters shown; not a maker's figure.";

const LOAD_DIAGRAM_CONVENTION =
  "Lz: CG offset along the flange axis from the flange face; Lxy: CG offset across it. Roll axis: lever Lxy. " +
  "Bending axes: lever = distance from the wrist centre (axis-5 centre) to the CG, √((d + Lz)² + Lxy²) with d the " +
  "flange distance of the wrist centre: the largest moment arm over wrist postures. Moment M ≥ m·g·L; inertia " +
  "J ≥ m·L² for a point mass (the load's own inertia not included). Capped at the rated payload.";

/**
 * Moment of a payload's weight about an axis at lever L: M = m·g·L (CHECKS C15).
 * @param massKg payload, kg @param leverM lever, m @returns N·m
 * @example loadMomentNm(5, 0.1) // 4.903325
 */
export function loadMomentNm(massKg: number, leverM: number, gravityMPerS2 = STANDARD_GRAVITY_M_PER_S2): number {
  return massKg * gravityMPerS2 * leverM;
}

/**
 * Longest lever at which a moment rating holds a mass: L_max = M / (m·g) (CHECKS C15).
 * @example maxLeverM(10, 8) // 0.1274645… m
 */
export function maxLeverM(momentNm: number, massKg: number, gravityMPerS2 = STANDARD_GRAVITY_M_PER_S2): number {
  return momentNm / (massKg * gravityMPerS2);
}

/**
 * Lever of one rating at CG offset (Lxy, Lz), m: roll Lxy + e; bending √((d + Lz)² + (e + Lxy)²) (module notes).
 * @example leverM({ kind: "bend", pivotBehindFlangeM: 0.1, pivotOffAxisM: 0, basis: "wrist-centre" }, 0.03, 0.3)
 *   // √(0.4² + 0.03²) = 0.401123… m
 */
export function leverM(lever: WristLever, lxyM: number, lzM: number): number {
  return lever.kind === "roll"
    ? lxyM + lever.pivotOffAxisM
    : Math.hypot(lever.pivotBehindFlangeM + lzM, lever.pivotOffAxisM + lxyM);
}

/** Largest mass one rating allows at lever L (moment and inertia), kg; Infinity when unlimited. */
function ratingAllowsKg(r: WristRating, lM: number, g: number): number {
  let best = Infinity;
  if (r.momentNm > 0 && lM > 0) best = Math.min(best, r.momentNm / (g * lM));
  if (r.inertiaKgM2 > 0 && lM > 0) best = Math.min(best, r.inertiaKgM2 / (lM * lM));
  return best;
}

/** Largest Lxy (m) at which rating r allows mass m at offset Lz; −Infinity when none, Infinity when unlimited. */
function ratingMaxLxyM(r: WristRating, massKg: number, lzM: number, g: number): number {
  let radius = Infinity;
  if (r.momentNm > 0) radius = Math.min(radius, r.momentNm / (massKg * g));
  if (r.inertiaKgM2 > 0) radius = Math.min(radius, Math.sqrt(r.inertiaKgM2 / massKg));
  if (radius === Infinity) return Infinity;
  const L = r.lever;
  if (L.kind === "roll") return radius - L.pivotOffAxisM;
  const dz = L.pivotBehindFlangeM + lzM;
  if (Math.abs(dz) > radius) return -Infinity;
  return Math.sqrt(radius * radius - dz * dz) - L.pivotOffAxisM;
}

/** Largest Lz (m) at which the bending ratings allow mass m on the flange axis (Lxy = 0); Infinity when unbounded. */
function curveEndLzM(ratings: readonly WristRating[], massKg: number, g: number): number {
  let end = Infinity;
  for (const r of ratings) {
    if (r.lever.kind !== "bend") continue;
    let radius = Infinity;
    if (r.momentNm > 0) radius = Math.min(radius, r.momentNm / (massKg * g));
    if (r.inertiaKgM2 > 0) radius = Math.min(radius, Math.sqrt(r.inertiaKgM2 / massKg));
    if (radius === Infinity) continue;
    const e = r.lever.pivotOffAxisM;
    end = Math.min(end, radius > e ? Math.sqrt(radius * radius - e * e) - r.lever.pivotBehindFlangeM : -Infinity);
  }
  return end;
}

/**
 * Allowed payload mass against the CG offset (Lxy across, Lz along the flange axis) from the wrist moment and
 * inertia ratings, M ≥ m·g·L and J ≥ m·L², capped at the rated payload. Without wrist ratings: basis "as-rated".
 * @returns plain data: curves of equal mass (polylines in mm) and a table on a grid
 * @example a roll rating of 10 N·m and m = 8 kg: the 8 kg curve meets the Lxy axis at 127.4645 mm (CHECKS C15)
 */
export function loadDiagram(input: PayloadInput, options: Partial<LoadDiagramOptions> = {}): LoadDiagram {
  const o = { ...DEFAULT_LOAD_DIAGRAM, ...options };
  if (!(o.stepMm > 0)) throw new RangeError(`invalid stepMm: ${o.stepMm}`);
  if (!(o.curvePoints >= 2)) throw new RangeError(`invalid curvePoints: ${o.curvePoints}`);
  if (o.extentMm !== null && !(o.extentMm > 0)) throw new RangeError(`invalid extentMm: ${o.extentMm}`);
  const g = o.gravityMPerS2,
    rated = input.ratedPayloadKg;
  const ratings = input.wrist.filter((r) => r.momentNm > 0 || r.inertiaKgM2 > 0);
  const joints: LoadDiagramJoint[] = ratings.map((r) => ({
    joint: r.joint,
    momentNm: r.momentNm > 0 ? r.momentNm : null,
    inertiaKgM2: r.inertiaKgM2 > 0 ? r.inertiaKgM2 : null,
    kind: r.lever.kind,
    pivotBehindFlangeMm: mToMm(r.lever.pivotBehindFlangeM),
    pivotOffAxisMm: mToMm(r.lever.pivotOffAxisM),
    leverBasis: r.lever.basis,
  }));
  if (ratings.length === 0) {
    return {
      basis: "as-rated",
      statement: PAYLOAD_STATEMENT,
      convention: LOAD_DIAGRAM_CONVENTION,
      ratedPayloadKg: rated,
      joints,
      wristAllowsAtZeroOffsetKg: null,
      curves: [],
      grid: null,
    };
  }
  const atZero = allowedAt(ratings, 0, 0, g).kg;
  const masses =
    o.massesKg ??
    o.massFractions.map((f) => {
      if (!(f > 0 && f <= 1)) throw new RangeError(`invalid mass fraction: ${f}`);
      return f * rated;
    });

  // Extent: how far the smallest curve reaches along either axis.
  let extentMm = o.extentMm;
  if (extentMm === null) {
    let far = 0;
    for (const massKg of masses) {
      if (!(massKg > 0)) continue;
      const lzEnd = curveEndLzM(ratings, massKg, g);
      const lxy0 = Math.min(...ratings.map((r) => ratingMaxLxyM(r, massKg, 0, g)));
      if (Number.isFinite(lzEnd)) far = Math.max(far, lzEnd);
      if (Number.isFinite(lxy0)) far = Math.max(far, lxy0);
    }
    extentMm = Math.min(5000, Math.max(100, Math.ceil(mToMm(far) / 50) * 50));
  }
  const extentM = mmToM(extentMm);

  const curves: LoadDiagramCurve[] = masses.map((massKg) => {
    if (!(massKg > 0)) throw new RangeError(`invalid curve mass: ${massKg}`);
    const maxLxy = (lzM: number): number => Math.min(...ratings.map((r) => ratingMaxLxyM(r, massKg, lzM, g)));
    const points: [number, number][] = [];
    const lzEnd = curveEndLzM(ratings, massKg, g);
    const open = !Number.isFinite(lzEnd) || lzEnd > extentM;
    const top = Math.min(lzEnd, extentM);
    if (massKg <= rated && maxLxy(0) >= 0 && top >= 0) {
      // Dense near the end, where a circle meets the Lz axis steeply: Lz_i = top·sin(π/2·i/(N−1)).
      const n = o.curvePoints;
      for (let i = 0; i < n; i++) {
        const lz = i === n - 1 ? top : top * Math.sin((Math.PI / 2) * (i / (n - 1)));
        const lxy = Math.max(0, Math.min(maxLxy(lz), extentM));
        points.push([mToMm(lxy), mToMm(lz)]);
      }
      if (!open) points[n - 1] = [0, mToMm(top)];
    }
    return { massKg, fractionOfRated: massKg / rated, pointsMm: points, openEnded: open && points.length > 0 };
  });

  const nCells = Math.floor(extentMm / o.stepMm + 1e-9) + 1;
  const axis = Array.from({ length: nCells }, (_, i) => i * o.stepMm);
  const allowedKg: number[] = [],
    limitingIndex: number[] = [];
  for (let iz = 0; iz < nCells; iz++) {
    for (let ix = 0; ix < nCells; ix++) {
      const a = allowedAt(ratings, mmToM(axis[ix]!), mmToM(axis[iz]!), g);
      allowedKg.push(Math.min(rated, a.kg));
      limitingIndex.push(a.kg < rated ? a.index : -1);
    }
  }
  return {
    basis: "wrist-ratings",
    statement: PAYLOAD_STATEMENT,
    convention: LOAD_DIAGRAM_CONVENTION,
    ratedPayloadKg: rated,
    joints,
    wristAllowsAtZeroOffsetKg: Number.isFinite(atZero) ? atZero : null,
    curves,
    grid: { lxyMm: axis, lzMm: axis, allowedKg, limitingIndex },
  };
}

function allowedAt(
  ratings: readonly WristRating[],
  lxyM: number,
  lzM: number,
  g: number,
): { kg: number; index: number } {
  let kg = Infinity,
    index = -1;
  ratings.forEach((r, i) => {
    const a = ratingAllowsKg(r, leverM(r.lever, lxyM, lzM), g);
    if (a < kg) {
      kg = a;
      index = i;
    }
  });
  return { kg, index };
}

// ---------------------------------------------------------------------------------------------------------------
// Plausibility warnings

export interface PayloadWarning {
  readonly code: "rated-payload-beyond-wrist-moment" | "rated-payload-beyond-wrist-inertia";
  readonly joint: string;
  readonly ratedPayloadKg: number;
  /** What the rating allows with the CG at the flange centre, kg. */
  readonly allowedKg: number;
  readonly message: string;
}

/**
 * Rated payload beyond what each wrist rating allows with the CG at the flange centre (zero offset): a sign of a
 * data-entry error, or of a rating measured from another reference point.
 * @param relTolerance the rated payload may exceed the allowed mass by this fraction before a warning (rounding)
 * @example rated 12 kg, J5 moment 10 N·m, wrist centre 0.1 m behind the flange: allows 10.197 kg → one warning
 */
export function payloadWarnings(
  input: PayloadInput,
  relTolerance = 0,
  gravityMPerS2 = STANDARD_GRAVITY_M_PER_S2,
): PayloadWarning[] {
  if (!(relTolerance >= 0)) throw new RangeError(`invalid relTolerance: ${relTolerance}`);
  const out: PayloadWarning[] = [];
  const rated = input.ratedPayloadKg;
  for (const r of input.wrist) {
    const l = leverM(r.lever, 0, 0);
    if (!(l > 0)) continue;
    const where =
      r.lever.kind === "roll"
        ? "off the axis"
        : r.lever.basis === "wrist-centre"
          ? "from the wrist centre"
          : "from its pivot";
    if (r.momentNm > 0) {
      const allowedKg = r.momentNm / (gravityMPerS2 * l);
      if (rated > allowedKg * (1 + relTolerance) * (1 + 1e-12)) {
        out.push({
          code: "rated-payload-beyond-wrist-moment",
          joint: r.joint,
          ratedPayloadKg: rated,
          allowedKg,
          message: `rated payload ${fmt(rated)} kg exceeds the ${fmt(allowedKg)} kg that the ${r.joint} moment rating (${fmt(r.momentNm)} N·m) allows with the CG at the flange centre (lever ${fmt(mToMm(l))} mm ${where})`,
        });
      }
    }
    if (r.inertiaKgM2 > 0) {
      const allowedKg = r.inertiaKgM2 / (l * l);
      if (rated > allowedKg * (1 + relTolerance) * (1 + 1e-12)) {
        out.push({
          code: "rated-payload-beyond-wrist-inertia",
          joint: r.joint,
          ratedPayloadKg: rated,
          allowedKg,
          message: `rated payload ${fmt(rated)} kg exceeds the ${fmt(allowedKg)} kg that the ${r.joint} inertia rating (${fmt(r.inertiaKgM2)} kg·m²) allows as a point mass at the flange centre (lever ${fmt(mToMm(l))} mm ${where})`,
        });
      }
    }
  }
  return out;
}

function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}
