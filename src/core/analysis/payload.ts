/**
 * Payload analyses (pure): the load diagram from the wrist ratings, static payload at reach from the joint torque
 * ratings and link masses, and the plausibility warnings that compare the rated payload with the wrist ratings.
 *
 * Everything here is static holding: accelerations, safety margins and the maker's own derating come on top.
 * Gripper, tooling and part all count as payload.
 *
 * Notation (SI inside, mm/kg/N·m at the output):
 *   m        payload mass, kg                       g        standard gravity, m/s² (units.ts)
 *   Lz       CG offset along the flange axis, from the flange face, m
 *   Lxy      CG offset across the flange axis (radial), m
 *   d, e     pivot of a bending wrist axis in the flange frame: d behind the flange face along the flange axis,
 *            e off that axis, m (for a spherical wrist the pivot is the wrist centre point)
 *   τ        holding torque of the driven joints, N·m (N for prismatic joints); τ = Jᵀ·F with F the support force
 *
 * Conventions (common practice, no source):
 *   - Load diagram levers. Roll axis (the last axis, the flange axis): L = Lxy + e. Bending axes (4/5 of a
 *     spherical wrist): L = √((d + Lz)² + (e + Lxy)²), the distance from the wrist centre to the CG. That is the
 *     largest moment arm the axis can meet over wrist postures and gravity directions (the perpendicular distance
 *     from an axis through the pivot never exceeds the distance to the pivot, and reaches it when the axis is
 *     perpendicular to pivot→CG), so the diagram holds in every posture. It matches the drawings that measure Lz
 *     from the flange and add the flange distance of the axis-5 centre.
 *   - Inertia: the payload is a point mass, J = m·L² with the same lever; the load's own inertia about its CG is
 *     not included (add it when comparing with a real tool).
 *   - Payload at reach: the tool points along gravity ("down") wherever the arm can orient it; the reach is the
 *     radial distance of the flange centre from the base z axis (axis 1 of an articulated arm); the CG offsets lie
 *     along the tool axis. Gravity per mounting, in the base frame: floor (0, 0, −1); ceiling (0, 0, +1); wall
 *     (+1, 0, 0): base turned 90° about its y axis so that base +x points down; angled: tilted by `angledTiltDeg`
 *     (default 45°) about base y, (sin θ, 0, −cos θ). A wall mounting is the angled one at 90°.
 */
import type { Chain } from "../kinematics/chain";
import {
  createScratch,
  forwardInto,
  linkFrameInto,
  wristCentreInto,
  type KinematicsScratch,
} from "../kinematics/forward";
import { STANDARD_GRAVITY_M_PER_S2, degToRad, mToMm, mmToM, radToDeg } from "../units";

// ---------------------------------------------------------------------------------------------------------------
// Input

export type Mounting = "floor" | "ceiling" | "wall" | "angled";

/** How the lever of one wrist rating is measured (see the module notes). */
export interface WristLever {
  /** "roll": the axis is the flange axis (lever Lxy + e); "bend": any other axis (lever from its pivot). */
  readonly kind: "roll" | "bend";
  /** Pivot behind the flange face, along the flange axis, m (d). */
  readonly pivotBehindFlangeM: number;
  /** Pivot off the flange axis, m (e). */
  readonly pivotOffAxisM: number;
  /**
   * "flange-axis": roll axis, exact. "wrist-centre": the axis passes through the wrist centre, which stays fixed in
   * the flange frame: the lever is the exact worst case. "bound-over-flange-roll": the pivot is fixed on the axis and
   * only the flange roll turns between it and the flange: an upper bound of the worst case. "home-pose-estimate":
   * offset wrists with more joints in between; the pivot is taken at the home pose, an estimate.
   */
  readonly basis: "flange-axis" | "wrist-centre" | "bound-over-flange-roll" | "home-pose-estimate";
}

/** Wrist rating of one driven joint (load diagram). */
export interface WristRating {
  /** Driven-joint index. */
  readonly driven: number;
  readonly joint: string;
  /** Allowed load moment, N·m; NaN when not rated. */
  readonly momentNm: number;
  /** Allowed load inertia, kg·m²; NaN when not rated. */
  readonly inertiaKgM2: number;
  readonly lever: WristLever;
}

/** A link's own mass, fixed in the link frame of a kinematic joint (linkFrameInto). */
export interface LinkMass {
  /** Kinematic joint index whose link frame holds the mass. */
  readonly joint: number;
  readonly massKg: number;
  /** Centre of mass in that link frame, m. */
  readonly comInLinkM: readonly [number, number, number];
}

/** Core-side payload data of one arm (SI, joints by index). Build it with `payloadInputOf`. */
export interface PayloadInput {
  readonly ratedPayloadKg: number;
  readonly mountings: readonly Mounting[];
  readonly wrist: readonly WristRating[];
  readonly links: readonly LinkMass[];
  /** Things the converter dropped, with the reason. */
  readonly notes: readonly string[];
}

/** The payload fields of an arm file, as plain types (the catalog passes its validated spec). */
export interface PayloadSpec {
  readonly ratedPayloadKg: number;
  readonly mountings: readonly Mounting[];
  readonly wrist?:
    | {
        readonly momentNm?: Readonly<Record<string, number>> | undefined;
        readonly inertiaKgM2?: Readonly<Record<string, number>> | undefined;
      }
    | undefined;
  readonly links?:
    readonly { readonly after: string; readonly massKg: number; readonly comMm: readonly number[] }[] | undefined;
}

/** Distance (m) under which points count as on an axis, and the sine under which axes count as parallel. */
const ON_AXIS_M = 1e-6;
const PARALLEL_SIN = 1e-9;

/**
 * Converts the file-shaped payload fields to a PayloadInput: joint names to indices, mm to m, and the lever
 * geometry of each wrist rating from the chain at its home pose (q = 0).
 * @throws RangeError for a joint name the chain does not have (validation catches that first)
 * @example payloadInputOf({ ratedPayloadKg: 7, mountings: ["floor"], wrist: { momentNm: { J5: 16 } } }, chain)
 *   // wrist: [{ joint: "J5", momentNm: 16, inertiaKgM2: NaN, lever: { kind: "bend", pivotBehindFlangeM: 0.08, … } }]
 */
export function payloadInputOf(spec: PayloadSpec, chain: Chain): PayloadInput {
  if (!(spec.ratedPayloadKg > 0)) throw new RangeError(`invalid ratedPayloadKg: ${spec.ratedPayloadKg}`);
  const kinematicOf = (name: string): number => {
    const k = chain.jointNames.indexOf(name);
    if (k < 0) throw new RangeError(`invalid joint name: ${name}`);
    return k;
  };
  const notes: string[] = [];
  const names = new Set<string>([
    ...Object.keys(spec.wrist?.momentNm ?? {}),
    ...Object.keys(spec.wrist?.inertiaKgM2 ?? {}),
  ]);
  const wrist: WristRating[] = [];
  for (const name of names) {
    const k = kinematicOf(name);
    const driven = chain.drivenJoint.indexOf(k);
    if (driven < 0) {
      notes.push(`wrist rating of ${name} ignored: a passive joint`);
      continue;
    }
    if (chain.isPrismatic[k]) {
      notes.push(`wrist rating of ${name} ignored: a prismatic joint carries no load moment about an axis`);
      continue;
    }
    wrist.push({
      driven,
      joint: name,
      momentNm: spec.wrist?.momentNm?.[name] ?? NaN,
      inertiaKgM2: spec.wrist?.inertiaKgM2?.[name] ?? NaN,
      lever: wristLeverOf(chain, k),
    });
  }
  wrist.sort((a, b) => a.driven - b.driven);
  const links: LinkMass[] = (spec.links ?? []).map((l) => ({
    joint: kinematicOf(l.after),
    massKg: l.massKg,
    comInLinkM: [mmToM(l.comMm[0]!), mmToM(l.comMm[1]!), mmToM(l.comMm[2]!)] as const,
  }));
  return { ratedPayloadKg: spec.ratedPayloadKg, mountings: [...spec.mountings], wrist, links, notes };
}

/**
 * Lever geometry of the wrist rating of kinematic joint k, from the chain at its home pose (q_driven = 0).
 * @example a spherical wrist whose centre lies 0.08 m behind the flange: joint 5 → { kind: "bend",
 *   pivotBehindFlangeM: 0.08, pivotOffAxisM: 0, basis: "wrist-centre" }; joint 6 → { kind: "roll", … }
 */
export function wristLeverOf(chain: Chain, k: number): WristLever {
  if (!(k >= 0 && k < chain.jointCount)) throw new RangeError(`invalid joint index: ${k}`);
  const s = createScratch(chain);
  const q = homePose(chain);
  forwardInto(chain, q, s);
  const f = s.flange;
  const zf = [f[2]!, f[6]!, f[10]!],
    pf = [f[3]!, f[7]!, f[11]!];
  const { o, w } = axisInBase(chain, s, k);
  const pivotAt = (p: ArrayLike<number>): { d: number; e: number } => {
    const r = [p[0]! - pf[0]!, p[1]! - pf[1]!, p[2]! - pf[2]!];
    const along = dot3(r, zf);
    return {
      d: toNanometre(-along),
      e: toNanometre(Math.hypot(r[0]! - along * zf[0]!, r[1]! - along * zf[1]!, r[2]! - along * zf[2]!)),
    };
  };
  const parallelToFlange = norm3(cross3(w, zf)) < PARALLEL_SIN;
  const spins = flangeSpinSet(chain, s);
  // Roll: the axis is parallel to the flange axis and no other joint lies between it and the flange.
  let onlySpinsAfter = true;
  for (let i = k + 1; i < chain.jointCount; i++) if (!spins.has(i)) onlySpinsAfter = false;
  if (parallelToFlange && onlySpinsAfter) {
    return {
      kind: "roll",
      pivotBehindFlangeM: 0,
      pivotOffAxisM: toNanometre(distanceToLine(pf, o, w)),
      basis: "flange-axis",
    };
  }
  const wcp = new Float64Array(3);
  if (wristCentreInto(wcp, chain, s) && distanceToLine(wcp, o, w) < ON_AXIS_M) {
    const { d, e } = pivotAt(wcp);
    return { kind: "bend", pivotBehindFlangeM: d, pivotOffAxisM: e, basis: "wrist-centre" };
  }
  // Offset wrist: the point of the axis nearest the flange axis line (its foot on the axis when parallel).
  const p = nearestPointOnLine(o, w, pf, zf);
  const { d, e } = pivotAt(p);
  return {
    kind: "bend",
    pivotBehindFlangeM: d,
    pivotOffAxisM: e,
    basis: onlySpinsAfter ? "bound-over-flange-roll" : "home-pose-estimate",
  };
}

/** Lever geometry snapped to the nanometre: 1e-17 m of floating-point dust on a zero offset would otherwise read
 * as a finite lever and turn "unlimited" into 1e66 kg. */
function toNanometre(m: number): number {
  return Math.round(m * 1e9) / 1e9 + 0;
}

// ---------------------------------------------------------------------------------------------------------------
// Small vector helpers (not in hot loops)

function dot3(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
}
function cross3(a: readonly number[], b: readonly number[]): number[] {
  return [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
}
function norm3(a: readonly number[]): number {
  return Math.hypot(a[0]!, a[1]!, a[2]!);
}
function distanceToLine(p: ArrayLike<number>, o: readonly number[], w: readonly number[]): number {
  return norm3(cross3([p[0]! - o[0]!, p[1]! - o[1]!, p[2]! - o[2]!], w));
}
/** Point of line (o, w) nearest to line (p, z); both directions unit. */
function nearestPointOnLine(
  o: readonly number[],
  w: readonly number[],
  p: readonly number[],
  z: readonly number[],
): number[] {
  const r = [p[0]! - o[0]!, p[1]! - o[1]!, p[2]! - o[2]!];
  const b = dot3(w, z),
    denom = 1 - b * b;
  const t = denom < 1e-12 ? dot3(r, w) : (dot3(r, w) - b * dot3(r, z)) / denom;
  return [o[0]! + t * w[0]!, o[1]! + t * w[1]!, o[2]! + t * w[2]!];
}

/** Origin and unit axis (base frame) of kinematic joint k after forwardInto. */
function axisInBase(chain: Chain, s: KinematicsScratch, k: number): { o: number[]; w: number[] } {
  const fr = s.motionFrames,
    f = 16 * k,
    a = chain.axisLocal;
  const ax = a[3 * k]!,
    ay = a[3 * k + 1]!,
    az = a[3 * k + 2]!;
  return {
    o: [fr[f + 3]!, fr[f + 7]!, fr[f + 11]!],
    w: [
      fr[f]! * ax + fr[f + 1]! * ay + fr[f + 2]! * az,
      fr[f + 4]! * ax + fr[f + 5]! * ay + fr[f + 6]! * az,
      fr[f + 8]! * ax + fr[f + 9]! * ay + fr[f + 10]! * az,
    ],
  };
}

/** q_driven = 0, clamped into the limits (mid-range when 0 lies outside). */
function homePose(chain: Chain): Float64Array {
  const q = new Float64Array(chain.drivenCount);
  for (let j = 0; j < chain.drivenCount; j++) q[j] = holdValue(chain, j);
  return q;
}
function holdValue(chain: Chain, j: number): number {
  const lo = chain.lowerSi[j]!,
    hi = chain.upperSi[j]!;
  if (0 >= lo && 0 <= hi) return 0;
  return Number.isFinite(lo) && Number.isFinite(hi) ? (lo + hi) / 2 : Number.isFinite(lo) ? lo : hi;
}

/** True when driven joint j moves kinematic joint k alone, with gain 1, and nothing else follows it. */
function isUncoupled(chain: Chain, j: number): boolean {
  const m = chain.drivenCount,
    k = chain.drivenJoint[j]!,
    g = chain.couplingGain;
  for (let i = 0; i < chain.jointCount; i++) if (g[i * m + j]! !== (i === k ? 1 : 0)) return false;
  for (let c = 0; c < m; c++) if (c !== j && g[k * m + c]! !== 0) return false;
  return true;
}

/**
 * Kinematic indices of the trailing "flange spin" joints: uncoupled driven revolute joints at the end of the chain
 * whose axis is the flange axis (they turn the tool about its own axis and move no CG that lies on it).
 * Expects forwardInto at the home pose in `s`.
 */
function flangeSpinSet(chain: Chain, s: KinematicsScratch): Set<number> {
  const out = new Set<number>();
  const f = s.flange,
    zf = [f[2]!, f[6]!, f[10]!],
    pf = [f[3]!, f[7]!, f[11]!];
  for (let k = chain.jointCount - 1; k >= 0; k--) {
    const j = chain.drivenJoint.indexOf(k);
    if (j < 0 || chain.isPrismatic[k] || !isUncoupled(chain, j)) break;
    const { o, w } = axisInBase(chain, s, k);
    if (norm3(cross3(w, zf)) > PARALLEL_SIN || distanceToLine(pf, o, w) > ON_AXIS_M) break;
    out.add(k);
  }
  return out;
}

// ---------------------------------------------------------------------------------------------------------------
// Load diagram

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

/** Lever of one rating at CG offset (Lxy, Lz), m. */
function leverM(lever: WristLever, lxyM: number, lzM: number): number {
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

// ---------------------------------------------------------------------------------------------------------------
// Static holding torques: τ = Jᵀ·F, F the support force (−m·g_vec) at each mass

/** Link masses in flat arrays, sorted by kinematic joint (fast path of holdingTorqueInto). */
export interface BodySet {
  readonly count: number;
  readonly joint: Int32Array;
  readonly massKg: Float64Array;
  /** 3 per body, m, in the link frame of `joint`. */
  readonly comInLinkM: Float64Array;
}

export function bodySetOf(links: readonly LinkMass[]): BodySet {
  const sorted = [...links].sort((a, b) => a.joint - b.joint);
  const comInLinkM = new Float64Array(3 * sorted.length);
  sorted.forEach((l, i) => comInLinkM.set(l.comInLinkM, 3 * i));
  return {
    count: sorted.length,
    joint: Int32Array.from(sorted.map((l) => l.joint)),
    massKg: Float64Array.from(sorted.map((l) => l.massKg)),
    comInLinkM,
  };
}

/** Work buffers for the holding-torque kernels: made once per analysis. */
export interface HoldingScratch {
  readonly tauKin: Float64Array;
  /** Σ m·p over the bodies distal to each kinematic joint (3n) and Σ m (n). */
  readonly momentSum: Float64Array;
  readonly massSum: Float64Array;
  readonly link: Float64Array;
}

export function createHoldingScratch(chain: Chain): HoldingScratch {
  const n = chain.jointCount;
  return {
    tauKin: new Float64Array(n),
    momentSum: new Float64Array(3 * n),
    massSum: new Float64Array(n),
    link: new Float64Array(16),
  };
}

/** Driven torques from kinematic ones: τ_driven = Gᵀ·τ_kin (virtual work through the coupling). */
function drivenFromKinematicInto(out: Float64Array, chain: Chain, tauKin: Float64Array): Float64Array {
  const n = chain.jointCount,
    m = chain.drivenCount,
    g = chain.couplingGain;
  for (let j = 0; j < m; j++) {
    let v = 0;
    for (let i = 0; i < n; i++) {
      const gij = g[i * m + j]!;
      if (gij !== 0) v += gij * tauKin[i]!;
    }
    out[j] = v;
  }
  return out;
}

/**
 * Static holding torques of the driven joints against the weight of the link masses, after forwardInto:
 * τ = Σ_b J_bᵀ·(−m_b·g_vec), with J_b the Jacobian of body b's centre of mass (columns of the joints distal to b are
 * zero) and passive joints mapped to driven ones by Gᵀ. Equals +∂V/∂q with V = −Σ m_b·g_vec·p_b. Allocates nothing.
 * @param out m driven torques, N·m (N for prismatic joints)
 * @param gravityInBaseMPerS2 gravity acceleration vector in the base frame, m/s² (floor: (0, 0, −9.80665))
 * @see Craig, Introduction to Robotics, 3rd ed., ch. 5 (static forces: τ = Jᵀ F); Spong et al., ch. 4
 * @example planar 2R with horizontal axes, a 10 kg mass at the tip (0.5, 0.3) m, q = 0, floor: (78.4532, 29.41995)
 */
export function holdingTorqueInto(
  out: Float64Array,
  chain: Chain,
  s: KinematicsScratch,
  bodies: BodySet,
  gravityInBaseMPerS2: ArrayLike<number>,
  h: HoldingScratch,
): Float64Array {
  const n = chain.jointCount,
    ms = h.momentSum,
    mass = h.massSum;
  ms.fill(0);
  mass.fill(0);
  for (let b = 0; b < bodies.count; b++) {
    const k = bodies.joint[b]!,
      mb = bodies.massKg[b]!;
    const t = linkFrameInto(h.link, chain, s, k);
    const cx = bodies.comInLinkM[3 * b]!,
      cy = bodies.comInLinkM[3 * b + 1]!,
      cz = bodies.comInLinkM[3 * b + 2]!;
    ms[3 * k] = ms[3 * k]! + mb * (t[0]! * cx + t[1]! * cy + t[2]! * cz + t[3]!);
    ms[3 * k + 1] = ms[3 * k + 1]! + mb * (t[4]! * cx + t[5]! * cy + t[6]! * cz + t[7]!);
    ms[3 * k + 2] = ms[3 * k + 2]! + mb * (t[8]! * cx + t[9]! * cy + t[10]! * cz + t[11]!);
    mass[k] = mass[k]! + mb;
  }
  // Suffix sums: joint i carries every body on links i, i+1, …
  for (let i = n - 2; i >= 0; i--) {
    ms[3 * i] = ms[3 * i]! + ms[3 * i + 3]!;
    ms[3 * i + 1] = ms[3 * i + 1]! + ms[3 * i + 4]!;
    ms[3 * i + 2] = ms[3 * i + 2]! + ms[3 * i + 5]!;
    mass[i] = mass[i]! + mass[i + 1]!;
  }
  // Support force per kg: −g_vec.
  const fx = -gravityInBaseMPerS2[0]!,
    fy = -gravityInBaseMPerS2[1]!,
    fz = -gravityInBaseMPerS2[2]!;
  const fr = s.motionFrames,
    ax = chain.axisLocal;
  for (let i = 0; i < n; i++) {
    const f = 16 * i;
    const a0 = ax[3 * i]!,
      a1 = ax[3 * i + 1]!,
      a2 = ax[3 * i + 2]!;
    const zx = fr[f]! * a0 + fr[f + 1]! * a1 + fr[f + 2]! * a2;
    const zy = fr[f + 4]! * a0 + fr[f + 5]! * a1 + fr[f + 6]! * a2;
    const zz = fr[f + 8]! * a0 + fr[f + 9]! * a1 + fr[f + 10]! * a2;
    const M = mass[i]!;
    if (chain.isPrismatic[i]) {
      h.tauKin[i] = M * (zx * fx + zy * fy + zz * fz);
    } else {
      // Σ (p_b − o_i) × m_b f = (Σ m_b p_b − M o_i) × f
      const rx = ms[3 * i]! - M * fr[f + 3]!,
        ry = ms[3 * i + 1]! - M * fr[f + 7]!,
        rz = ms[3 * i + 2]! - M * fr[f + 11]!;
      h.tauKin[i] = zx * (ry * fz - rz * fy) + zy * (rz * fx - rx * fz) + zz * (rx * fy - ry * fx);
    }
  }
  return drivenFromKinematicInto(out, chain, h.tauKin);
}

/**
 * Static holding torques of the driven joints for a point mass (p in the base frame, m) carried by the flange,
 * after forwardInto: τ = Jᵀ·(−m·g_vec), J the Jacobian of p with respect to the driven joints. Allocates nothing.
 * @example 2R in a vertical plane (a = 0.5, 0.3 m), 10 kg at the tip, q = (30°, 45°): (50.0784835, 7.6144434) N·m
 */
export function pointHoldingTorqueInto(
  out: Float64Array,
  chain: Chain,
  s: KinematicsScratch,
  px: number,
  py: number,
  pz: number,
  massKg: number,
  gravityInBaseMPerS2: ArrayLike<number>,
  h: HoldingScratch,
): Float64Array {
  const n = chain.jointCount,
    fr = s.motionFrames,
    ax = chain.axisLocal;
  const fx = -massKg * gravityInBaseMPerS2[0]!,
    fy = -massKg * gravityInBaseMPerS2[1]!,
    fz = -massKg * gravityInBaseMPerS2[2]!;
  for (let i = 0; i < n; i++) {
    const f = 16 * i;
    const a0 = ax[3 * i]!,
      a1 = ax[3 * i + 1]!,
      a2 = ax[3 * i + 2]!;
    const zx = fr[f]! * a0 + fr[f + 1]! * a1 + fr[f + 2]! * a2;
    const zy = fr[f + 4]! * a0 + fr[f + 5]! * a1 + fr[f + 6]! * a2;
    const zz = fr[f + 8]! * a0 + fr[f + 9]! * a1 + fr[f + 10]! * a2;
    if (chain.isPrismatic[i]) {
      h.tauKin[i] = zx * fx + zy * fy + zz * fz;
    } else {
      const rx = px - fr[f + 3]!,
        ry = py - fr[f + 7]!,
        rz = pz - fr[f + 11]!;
      h.tauKin[i] = zx * (ry * fz - rz * fy) + zy * (rz * fx - rx * fz) + zz * (rx * fy - ry * fx);
    }
  }
  return drivenFromKinematicInto(out, chain, h.tauKin);
}

/**
 * Gravity vector in the base frame for a mounting, m/s² (see the module notes for the conventions).
 * @example gravityInBase("ceiling") // [0, 0, 9.80665]
 */
export function gravityInBase(
  mounting: Mounting,
  angledTiltDeg = 45,
  gravityMPerS2 = STANDARD_GRAVITY_M_PER_S2,
): [number, number, number] {
  const tilt =
    mounting === "floor"
      ? 0
      : mounting === "ceiling"
        ? Math.PI
        : mounting === "wall"
          ? Math.PI / 2
          : degToRad(angledTiltDeg);
  const x = Math.sin(tilt),
    z = -Math.cos(tilt);
  // Exact zeros where the tilt is a multiple of 90° (cos(π/2) is 6e-17 in floating point).
  const clean = (v: number) => (Math.abs(v) < 1e-15 ? 0 : v);
  return [clean(x) * gravityMPerS2, 0, clean(z) * gravityMPerS2];
}

// ---------------------------------------------------------------------------------------------------------------
// Payload at reach

export interface PayloadAtReachOptions {
  /** Row spacing of the horizontal reach, mm. */
  readonly reachStepMm: number;
  /** CG offsets along the tool axis from the flange, mm. */
  readonly offsetsMm: readonly number[];
  /** Mountings to compute; null: those the arm offers. */
  readonly mountings: readonly Mounting[] | null;
  /** Tilt of the "angled" mounting about base y, deg. */
  readonly angledTiltDeg: number;
  /**
   * Grid nodes of the posture search by the number of searched joints D (index D; the last entry for more), spread
   * over the joints by their ranges. A D-dimensional grid meets a row's reach along a (D−1)-dimensional set, so the
   * work per row grows like nodes^((D−1)/D): three searched joints (wall and angled mountings) get fewer nodes.
   */
  readonly searchNodesByDims: readonly number[];
  /** A posture counts as at the row's reach within this distance, mm (its effect on the payload is about
   * tolerance / reach, relative). */
  readonly reachToleranceMm: number;
  readonly gravityMPerS2: number;
}

export const DEFAULT_PAYLOAD_AT_REACH: PayloadAtReachOptions = {
  reachStepMm: 50,
  offsetsMm: [0, 100, 200],
  mountings: null,
  angledTiltDeg: 45,
  searchNodesByDims: [1, 2000, 1600, 6000],
  reachToleranceMm: 0.5,
  gravityMPerS2: STANDARD_GRAVITY_M_PER_S2,
};

export type PayloadBasis = "computed" | "upper-bound-no-link-masses" | "upper-bound-missing-torques" | "as-rated";

export interface PayloadAtReachRow {
  readonly mounting: Mounting;
  /** Radial distance of the flange centre from the base z axis (axis 1), mm. */
  readonly reachMm: number;
  /** CG offset along the tool axis from the flange, mm. */
  readonly offsetMm: number;
  /** Largest static payload at the worst posture found for this reach, capped at the rated payload, kg. */
  readonly payloadKg: number;
  /** Name of the joint whose rating binds; null when the rated payload caps, as rated, or out of reach. */
  readonly limitingJoint: string | null;
  readonly limitedBy: "joint-rating" | "own-weight" | "rated-payload" | "as-rated" | "unreachable";
  /** The torque-limited payload before the cap, kg (above the rated payload where that caps); null when no rated
   * joint carries load or out of reach. */
  readonly torqueLimitKg: number | null;
  /** The joint that sets torqueLimitKg. */
  readonly torqueLimitJoint: string | null;
  /** Flange height above the base plane at that posture, mm; null when out of reach or as rated. */
  readonly flangeHeightMm: number | null;
  /** Driven joints at that posture, deg (revolute) or mm (prismatic); null when out of reach or as rated. */
  readonly jointsDegOrMm: readonly number[] | null;
}

export interface PayloadMountingReport {
  readonly mounting: Mounting;
  readonly gravityDirectionInBase: readonly [number, number, number];
  /** "along-gravity": the wrist points the tool down; "fixed-by-structure": the flange axis never turns (SCARA,
   * palletizer, gantry); "follows-posture": the arm cannot orient its tool (no wrist joints). */
  readonly toolDirection: "along-gravity" | "fixed-by-structure" | "follows-posture";
  readonly minReachMm: number | null;
  readonly maxReachMm: number | null;
  /** Joints swept by the search and their grid steps, deg or mm. */
  readonly searched: readonly { readonly joint: string; readonly stepDegOrMm: number }[];
  /** Joints the search solves for the tool direction. */
  readonly orienting: readonly string[];
  /** Joints held fixed, with the reason. */
  readonly held: readonly { readonly joint: string; readonly valueDegOrMm: number; readonly reason: string }[];
  /** Postures evaluated at a row's reach. */
  readonly postures: number;
  readonly notes: readonly string[];
}

export interface PayloadAtReach {
  readonly basis: PayloadBasis;
  readonly statement: string;
  readonly convention: string;
  readonly ratedPayloadKg: number;
  readonly linkMassTotalKg: number;
  readonly rows: readonly PayloadAtReachRow[];
  readonly mountings: readonly PayloadMountingReport[];
  readonly notes: readonly string[];
}

const AT_REACH_CONVENTION =
  "Rows every step of the flange centre's radial distance from axis 1 (the base z axis; horizontal for floor and " +
  "ceiling mountings). The tool points along gravity where the wrist can orient it; the CG offsets lie along the tool " +
  "axis. Each row is the worst posture found for that reach over heights and joint branches (grid search with local " +
  "refinement; a 7-axis arm keeps its redundant joint at zero), from τ = Jᵀ·F for the payload plus the links' own " +
  "weight against each joint's rated torque (|τ| ≤ rating in either direction), capped at the rated payload. " +
  "Gravity in the base frame: floor −z; ceiling +z; wall +x (base turned 90° about its y axis, +x pointing down); " +
  "angled: tilted about y by the stated angle (default 45°).";

/** Roles of the driven joints for one mounting. */
interface SearchPlan {
  readonly searched: number[];
  readonly orienting: number[];
  readonly held: { j: number; value: number; reason: string }[];
  readonly mode: PayloadMountingReport["toolDirection"];
  /** Flange = WCP + d·t̂ when the tool points along t̂ (spherical wrist): reach without solving the wrist. */
  readonly wcpFlangeDistanceM: number | null;
}

/** Everything about the chain that does not depend on the mounting. */
interface ChainFacts {
  readonly spins: Set<number>;
  readonly orientingCandidates: number[];
  readonly structureFixedAxis: number[] | null;
  readonly wcpFlangeDistanceM: number | null;
}

function chainFacts(chain: Chain): ChainFacts {
  const m = chain.drivenCount;
  const s = createScratch(chain);
  const home = homePose(chain);
  forwardInto(chain, home, s);
  const f = s.flange;
  const zHome = [f[2]!, f[6]!, f[10]!],
    pHome = [f[3]!, f[7]!, f[11]!];
  const spins = flangeSpinSet(chain, s);
  // Does the flange axis ever turn? Check three spread postures within the limits.
  let fixed = true;
  const q = new Float64Array(m);
  for (const frac of [0.17, 0.61, 0.83]) {
    for (let j = 0; j < m; j++) {
      const [lo, hi] = searchRange(chain, j);
      q[j] = lo + frac * (hi - lo) + (0.1 * j * (hi - lo)) / m;
    }
    forwardInto(chain, q, s);
    if (Math.hypot(s.flange[2]! - zHome[0]!, s.flange[6]! - zHome[1]!, s.flange[10]! - zHome[2]!) > 1e-9) fixed = false;
  }
  // Orienting joints: the wrist axes (when the chain has a wrist centre) or the last three driven joints of an arm
  // with six or more; the flange spin never counts (it does not turn the flange axis).
  const w = chain.wrist;
  let candidates: number[] = [];
  if (!fixed) {
    for (let j = 0; j < m; j++) {
      const k = chain.drivenJoint[j]!;
      if (spins.has(k) || chain.isPrismatic[k]) continue;
      if (w ? w.axes.includes(k) : j >= m - Math.min(3, Math.max(0, m - 3))) candidates.push(j);
    }
  }
  // Spherical shortcut: every orienting axis passes through the wrist centre and the flange lies on the flange axis
  // through it; then with the tool along t̂ the flange is at WCP + d·t̂ whatever the wrist angles.
  let wcpD: number | null = null;
  forwardInto(chain, home, s);
  const wcp = new Float64Array(3);
  if (candidates.length > 0 && wristCentreInto(wcp, chain, s)) {
    const r = [pHome[0]! - wcp[0]!, pHome[1]! - wcp[1]!, pHome[2]! - wcp[2]!];
    const d = dot3(r, zHome);
    const e = Math.hypot(r[0]! - d * zHome[0]!, r[1]! - d * zHome[1]!, r[2]! - d * zHome[2]!);
    const through = candidates.every((j) => {
      const { o, w: axis } = axisInBase(chain, s, chain.drivenJoint[j]!);
      return distanceToLine(wcp, o, axis) < ON_AXIS_M;
    });
    if (through && e < ON_AXIS_M) wcpD = d;
  }
  candidates = candidates.filter((j) => isRevoluteDriven(chain, j));
  return { spins, orientingCandidates: candidates, structureFixedAxis: fixed ? zHome : null, wcpFlangeDistanceM: wcpD };
}

function isRevoluteDriven(chain: Chain, j: number): boolean {
  return !chain.isPrismatic[chain.drivenJoint[j]!];
}

/**
 * Search range of driven joint j: its limits, or ±π rad / ±1 m where a limit is open. A revolute joint with more
 * than a full turn repeats its postures, so one turn is searched: [−π, π] when the limits allow it.
 */
function searchRange(chain: Chain, j: number): [number, number] {
  const prismatic = chain.isPrismatic[chain.drivenJoint[j]!] === 1;
  const open = prismatic ? 1 : Math.PI;
  const lo = Number.isFinite(chain.lowerSi[j]!) ? chain.lowerSi[j]! : -open;
  const hi = Number.isFinite(chain.upperSi[j]!) ? chain.upperSi[j]! : open;
  if (!prismatic && hi - lo > 2 * Math.PI) {
    if (lo <= -Math.PI && hi >= Math.PI) return [-Math.PI, Math.PI];
    return [lo, lo + 2 * Math.PI];
  }
  return [lo, hi];
}

function planFor(chain: Chain, facts: ChainFacts, gDir: readonly number[]): SearchPlan {
  const m = chain.drivenCount;
  const s = createScratch(chain);
  forwardInto(chain, homePose(chain), s);
  const held: SearchPlan["held"] = [];
  const mode: SearchPlan["mode"] = facts.structureFixedAxis
    ? "fixed-by-structure"
    : facts.orientingCandidates.length > 0
      ? "along-gravity"
      : "follows-posture";
  const orienting = mode === "along-gravity" ? [...facts.orientingCandidates] : [];
  // Positioning joints: neither the flange spin nor orienting.
  const positioning: number[] = [];
  for (let j = 0; j < m; j++) {
    if (facts.spins.has(chain.drivenJoint[j]!))
      held.push({ j, value: holdValue(chain, j), reason: "turns the tool about its own axis" });
    else if (!orienting.includes(j)) positioning.push(j);
  }
  // Redundant arms (more than three positioning joints, e.g. a 7-axis arm): the middle ones are held at zero in every
  // mounting, so the arm stays in its plane like a 6-axis arm.
  const redundant = new Set(mode === "along-gravity" && positioning.length > 3 ? positioning.slice(2, -1) : []);
  const searched: number[] = [];
  for (const j of positioning) {
    const k = chain.drivenJoint[j]!;
    if (redundant.has(j)) {
      held.push({ j, value: holdValue(chain, j), reason: "redundant joint held at zero (the arm in its plane)" });
      continue;
    }
    if (isUncoupled(chain, j)) {
      const { o, w } = axisInBase(chain, s, k);
      const alongGravity = norm3(cross3(w, gDir)) < PARALLEL_SIN;
      const gravityVertical = Math.abs(gDir[2]!) > 1 - 1e-12;
      // A joint that rotates the whole arm about the vertical base z axis changes neither reach nor torques.
      if (k === 0 && !chain.isPrismatic[k] && alongGravity && gravityVertical && Math.hypot(o[0]!, o[1]!) < ON_AXIS_M) {
        held.push({
          j,
          value: holdValue(chain, j),
          reason: "turns the arm about the vertical axis 1: no change in reach or holding torque",
        });
        continue;
      }
      // A slide along a vertical gravity line shifts the load along its own line of action.
      if (chain.isPrismatic[k] && alongGravity && gravityVertical && prismaticStaysAlong(chain, j, gDir)) {
        held.push({
          j,
          value: holdValue(chain, j),
          reason: "slides along gravity: no change in reach or holding torque",
        });
        continue;
      }
    }
    searched.push(j);
  }
  held.sort((a, b) => a.j - b.j);
  return {
    searched,
    orienting,
    held,
    mode,
    wcpFlangeDistanceM: mode === "along-gravity" ? facts.wcpFlangeDistanceM : null,
  };
}

/** The slide's axis stays parallel to gravity at three spread postures. */
function prismaticStaysAlong(chain: Chain, j: number, gDir: readonly number[]): boolean {
  const s = createScratch(chain),
    q = new Float64Array(chain.drivenCount);
  for (const frac of [0.2, 0.5, 0.9]) {
    for (let c = 0; c < chain.drivenCount; c++) {
      const [lo, hi] = searchRange(chain, c);
      q[c] = lo + ((frac + 0.13 * c) % 1) * (hi - lo);
    }
    forwardInto(chain, q, s);
    if (norm3(cross3(axisInBase(chain, s, chain.drivenJoint[j]!).w, gDir)) > PARALLEL_SIN) return false;
  }
  return true;
}

/** Per-mounting search context: scratch, buffers and the tool-direction solver. */
class Search {
  readonly s: KinematicsScratch;
  readonly h: HoldingScratch;
  readonly q: Float64Array;
  readonly tauLinks: Float64Array;
  readonly tauUnit: Float64Array;
  readonly ata = new Float64Array(9);
  readonly atb = new Float64Array(3);
  readonly cols: Float64Array;
  constructor(
    readonly chain: Chain,
    readonly plan: SearchPlan,
    readonly tool: readonly number[],
  ) {
    this.s = createScratch(chain);
    this.h = createHoldingScratch(chain);
    this.q = new Float64Array(chain.drivenCount);
    this.tauLinks = new Float64Array(chain.drivenCount);
    this.tauUnit = new Float64Array(chain.drivenCount);
    this.cols = new Float64Array(3 * Math.max(1, plan.orienting.length));
  }

  /**
   * Turns the orienting joints until the flange axis points along `tool` (Gauss–Newton on the rotation that carries
   * the flange axis onto the target, damped), then wraps them into their limits; tries the other wrist branch once.
   * Leaves forwardInto of the solution in the scratch. False when no solution within the limits was found.
   */
  solveTool(): boolean {
    const w = this.plan.orienting;
    if (w.length === 0) {
      forwardInto(this.chain, this.q, this.s);
      return true;
    }
    if (this.gaussNewton() && this.wrapIntoLimits()) return true;
    // The other branch of a two-axis wrist: first axis turned by π, second mirrored.
    const a = w[0]!,
      b = w[1];
    this.q[a] = this.q[a]! + Math.PI;
    if (b !== undefined) this.q[b] = -this.q[b]!;
    return this.gaussNewton() && this.wrapIntoLimits();
  }

  private gaussNewton(): boolean {
    const chain = this.chain,
      s = this.s,
      q = this.q,
      w = this.plan.orienting,
      nw = w.length;
    const tx = this.tool[0]!,
      ty = this.tool[1]!,
      tz = this.tool[2]!;
    const n = chain.jointCount,
      m = chain.drivenCount,
      g = chain.couplingGain,
      fr = s.motionFrames,
      ax = chain.axisLocal;
    const cols = this.cols,
      A = this.ata,
      B = this.atb;
    for (let iter = 0; iter < 40; iter++) {
      forwardInto(chain, q, s);
      const zx = s.flange[2]!,
        zy = s.flange[6]!,
        zz = s.flange[10]!;
      // Rotation vector e that carries z onto t: angle · (z × t)/|z × t|.
      let cx = zy * tz - zz * ty,
        cy = zz * tx - zx * tz,
        cz = zx * ty - zy * tx;
      const sinA = Math.hypot(cx, cy, cz),
        cosA = zx * tx + zy * ty + zz * tz;
      const angle = Math.atan2(sinA, cosA);
      if (angle < 1e-11) return true;
      // Columns: the driven orienting joints' angular velocity, projected across the flange axis.
      for (let c = 0; c < nw; c++) {
        const j = w[c]!;
        let ox = 0,
          oy = 0,
          oz = 0;
        for (let i = 0; i < n; i++) {
          const gij = g[i * m + j]!;
          if (gij === 0 || chain.isPrismatic[i]) continue;
          const f = 16 * i,
            a0 = ax[3 * i]!,
            a1 = ax[3 * i + 1]!,
            a2 = ax[3 * i + 2]!;
          ox += gij * (fr[f]! * a0 + fr[f + 1]! * a1 + fr[f + 2]! * a2);
          oy += gij * (fr[f + 4]! * a0 + fr[f + 5]! * a1 + fr[f + 6]! * a2);
          oz += gij * (fr[f + 8]! * a0 + fr[f + 9]! * a1 + fr[f + 10]! * a2);
        }
        const along = ox * zx + oy * zy + oz * zz;
        cols[3 * c] = ox - along * zx;
        cols[3 * c + 1] = oy - along * zy;
        cols[3 * c + 2] = oz - along * zz;
      }
      if (sinA < 1e-12) {
        // Antipodal: any axis across z works; take the best-placed column's direction.
        let best = 0,
          bn = -1;
        for (let c = 0; c < nw; c++) {
          const nn = Math.hypot(cols[3 * c]!, cols[3 * c + 1]!, cols[3 * c + 2]!);
          if (nn > bn) {
            bn = nn;
            best = c;
          }
        }
        if (!(bn > 1e-12)) return false;
        cx = cols[3 * best]! / bn;
        cy = cols[3 * best + 1]! / bn;
        cz = cols[3 * best + 2]! / bn;
      } else {
        cx /= sinA;
        cy /= sinA;
        cz /= sinA;
      }
      const ex = angle * cx,
        ey = angle * cy,
        ez = angle * cz;
      // Normal equations (AᵀA + λI) δ = Aᵀ e, at most 3 × 3.
      for (let r = 0; r < nw; r++) {
        B[r] = cols[3 * r]! * ex + cols[3 * r + 1]! * ey + cols[3 * r + 2]! * ez;
        for (let c = 0; c < nw; c++)
          A[r * 3 + c] =
            cols[3 * r]! * cols[3 * c]! +
            cols[3 * r + 1]! * cols[3 * c + 1]! +
            cols[3 * r + 2]! * cols[3 * c + 2]! +
            (r === c ? 1e-9 : 0);
      }
      if (!solveSmallInPlace(A, B, nw)) return false;
      let big = 0;
      for (let c = 0; c < nw; c++) big = Math.max(big, Math.abs(B[c]!));
      const scale = big > 0.7 ? 0.7 / big : 1;
      for (let c = 0; c < nw; c++) q[w[c]!] = q[w[c]!]! + scale * B[c]!;
      // Quadratic convergence: after a step this small the remaining error is ~step², far below 1e-11 rad; the
      // scratch stays at the previous iterate, which differs from q by less than STEP_DONE_RAD.
      if (big < STEP_DONE_RAD && angle < 1e-6) return true;
    }
    return false;
  }

  private wrapIntoLimits(): boolean {
    const chain = this.chain,
      q = this.q;
    for (const j of this.plan.orienting) {
      const lo = chain.lowerSi[j]!,
        hi = chain.upperSi[j]!;
      let v = q[j]!;
      if (!Number.isFinite(lo) && !Number.isFinite(hi)) {
        q[j] = Math.atan2(Math.sin(v), Math.cos(v));
        continue;
      }
      const twoPi = 2 * Math.PI;
      v -= twoPi * Math.floor((v - lo) / twoPi); // into [lo, lo + 2π)
      if (v > hi) return false;
      q[j] = v;
    }
    return true;
  }

  /**
   * Radial distance of the flange centre from the base z axis at the posture in `q`, m; NaN when the tool cannot
   * point along the target. With the spherical shortcut the wrist is not solved (flange = WCP + d·t̂).
   */
  reach(): number {
    const d = this.plan.wcpFlangeDistanceM;
    if (d !== null) {
      forwardInto(this.chain, this.q, this.s);
      const p = this.wcp;
      wristCentreInto(p, this.chain, this.s);
      return Math.hypot(p[0]! + d * this.tool[0]!, p[1]! + d * this.tool[1]!);
    }
    if (!this.solveTool()) return NaN;
    return Math.hypot(this.s.flange[3]!, this.s.flange[7]!);
  }
  readonly wcp = new Float64Array(3);
  /** Wrist warm start buffer. */
  readonly wrist = new Float64Array(3);
}

/** Golden-section steps per joint in the refinement (the bracket shrinks to 0.618^6 ≈ 5.6 % of two grid steps). */
const REFINE_STEPS = 6;
const GOLDEN = (Math.sqrt(5) - 1) / 2;

/** Gauss–Newton stops once a wrist step is below this, rad. */
const STEP_DONE_RAD = 1e-9;

/** Solves the n × n system (n ≤ 3; row stride 3) in place by Gaussian elimination with partial pivoting; B ← x. */
function solveSmallInPlace(A: Float64Array, B: Float64Array, n: number): boolean {
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(A[r * 3 + c]!) > Math.abs(A[p * 3 + c]!)) p = r;
    if (!(Math.abs(A[p * 3 + c]!) > 1e-300)) return false;
    if (p !== c) {
      for (let k = 0; k < n; k++) {
        const t = A[c * 3 + k]!;
        A[c * 3 + k] = A[p * 3 + k]!;
        A[p * 3 + k] = t;
      }
      const t = B[c]!;
      B[c] = B[p]!;
      B[p] = t;
    }
    for (let r = c + 1; r < n; r++) {
      const f = A[r * 3 + c]! / A[c * 3 + c]!;
      for (let k = c; k < n; k++) A[r * 3 + k] = A[r * 3 + k]! - f * A[c * 3 + k]!;
      B[r] = B[r]! - f * B[c]!;
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    let v = B[r]!;
    for (let k = r + 1; k < n; k++) v -= A[r * 3 + k]! * B[k]!;
    B[r] = v / A[r * 3 + r]!;
  }
  return true;
}

/**
 * Largest static payload at each horizontal reach (rows every `reachStepMm`, CG offsets along the tool axis), at the
 * worst posture found for that reach, for each mounting the arm offers. Torques by τ = Jᵀ·F for the payload weight
 * plus the links' own weight, passive joints through the coupling; |τ| ≤ rated torque in either direction; capped at
 * the rated payload.
 *
 * Search: the joints that place the wrist are swept on a grid (a joint that turns the whole arm about a vertical
 * axis 1 is held, since it changes neither reach nor torque; a redundant arm keeps its extra joint at zero), and the
 * wrist is solved so the tool points along gravity. With one or two searched joints, every grid edge that crosses a
 * row's reach gives a posture on it (Illinois method). With three (wall and angled mountings, where axis 1 matters),
 * every node is evaluated and each row's worst nodes are moved onto the row's reach along a grid edge. Each row's
 * worst posture is then refined by golden-section search over the other searched joints, the reach re-solved.
 *
 * Basis: "as-rated" when no joint has a rated torque (rows carry the rated payload over the reach range);
 * "upper-bound-no-link-masses" without link masses; "upper-bound-missing-torques" when a joint that carries load has
 * no rating; otherwise "computed".
 * @see Craig, Introduction to Robotics, 3rd ed., ch. 5 (statics, τ = Jᵀ F); CHECKS C14
 * @example single horizontal axis, massless link of 0.5 m, 49.0332 N·m rated, 20 kg rated payload: at 0.5 m reach
 *   payloadKg = 49.0332 / (9.80665 · 0.5) = 10 kg
 */
export function payloadAtReach(
  chain: Chain,
  input: PayloadInput,
  options: Partial<PayloadAtReachOptions> = {},
): PayloadAtReach {
  const o = { ...DEFAULT_PAYLOAD_AT_REACH, ...options };
  if (!(o.reachStepMm > 0)) throw new RangeError(`invalid reachStepMm: ${o.reachStepMm}`);
  if (!(o.searchNodesByDims.length >= 2 && o.searchNodesByDims.every((v) => v >= 1)))
    throw new RangeError(`invalid searchNodesByDims: ${o.searchNodesByDims.join(",")}`);
  if (!(o.reachToleranceMm > 0)) throw new RangeError(`invalid reachToleranceMm: ${o.reachToleranceMm}`);
  if (!(o.gravityMPerS2 > 0)) throw new RangeError(`invalid gravityMPerS2: ${o.gravityMPerS2}`);
  for (const off of o.offsetsMm) if (!Number.isFinite(off)) throw new RangeError(`invalid offsetMm: ${off}`);
  const ctx: SearchContext = {
    chain,
    input,
    o,
    bodies: bodySetOf(input.links),
    facts: chainFacts(chain),
    anyRating: Array.from(chain.ratedEffortSi).some((t) => t > 0),
  };
  const rows: PayloadAtReachRow[] = [];
  const reports: PayloadMountingReport[] = [];
  const loadedUnrated = new Set<string>();
  for (const mounting of o.mountings ?? input.mountings) {
    const search = new MountingSearch(ctx, mounting);
    search.run();
    rows.push(...search.rows());
    reports.push(search.report());
    for (const name of search.loadedUnrated()) loadedUnrated.add(name);
  }

  const notes: string[] = [...input.notes];
  let basis: PayloadBasis;
  if (!ctx.anyRating) {
    basis = "as-rated";
    notes.push("no joint torque ratings: the rated payload is given over the reach range, as rated by the maker");
  } else if (loadedUnrated.size > 0) {
    basis = "upper-bound-missing-torques";
    notes.push(`joints that carry load but have no rated torque (not checked): ${[...loadedUnrated].join(", ")}`);
    if (input.links.length === 0) notes.push("no link masses: the arm's own weight is left out");
  } else if (input.links.length === 0) {
    basis = "upper-bound-no-link-masses";
    notes.push("no link masses: the arm's own weight is left out, so the figures are upper bounds");
  } else {
    basis = "computed";
  }
  return {
    basis,
    statement: PAYLOAD_STATEMENT,
    convention: AT_REACH_CONVENTION,
    ratedPayloadKg: input.ratedPayloadKg,
    linkMassTotalKg: input.links.reduce((a, l) => a + l.massKg, 0),
    rows,
    mountings: reports,
    notes,
  };
}

interface SearchContext {
  readonly chain: Chain;
  readonly input: PayloadInput;
  readonly o: PayloadAtReachOptions;
  readonly bodies: BodySet;
  readonly facts: ChainFacts;
  readonly anyRating: boolean;
}

/** Grid edges solved exactly per row and offset when three or more joints are searched (the lowest screened). */
const SEEDS_PER_ROW = 4;

/** The posture search of one mounting: grid, crossings, refinement and the rows. */
class MountingSearch {
  private readonly chain: Chain;
  private readonly plan: SearchPlan;
  private readonly search: Search;
  private readonly gVec: [number, number, number];
  private readonly gDir: [number, number, number];
  private readonly notes: string[] = [];
  // Grid over the searched joints.
  private readonly D: number;
  private readonly lo: number[] = [];
  private readonly hi: number[] = [];
  private readonly count: number[] = [];
  private readonly strides: number[] = [];
  /** A searched revolute joint whose window is a full turn: its grid wraps (the last node repeats the first). */
  private readonly periodic: boolean[] = [];
  private readonly total: number;
  private readonly idx: Int32Array;
  private readonly nw: number;
  private nodeReach = new Float64Array(0);
  private nodeWrist = new Float64Array(0);
  private nodeAllowed = new Float64Array(0);
  private minReach = Infinity;
  private maxReach = -Infinity;
  // Rows.
  private readonly stepM: number;
  private readonly nOff: number;
  private readonly offsetsM: number[];
  private kFirst = 0;
  private nRows = 0;
  private best = new Float64Array(0);
  private bestLimit = new Int32Array(0);
  private bestOwn = new Uint8Array(0);
  private bestQ = new Float64Array(0);
  private bestHeight = new Float64Array(0);
  private bestDim = new Int8Array(0);
  // Last evaluation, per offset.
  private readonly lastAllowed: Float64Array;
  private readonly lastLimit: Int32Array;
  private readonly lastOwn: Uint8Array;
  private readonly maxUnit: Float64Array;
  private readonly unitFloor: number;
  private postures = 0;
  // Work buffers.
  private readonly qa: Float64Array;
  private readonly qb: Float64Array;
  private readonly qStar: Float64Array;
  private readonly lastWrist: Float64Array;

  constructor(
    private readonly ctx: SearchContext,
    private readonly mounting: Mounting,
  ) {
    const chain = (this.chain = ctx.chain),
      o = ctx.o,
      m = chain.drivenCount;
    this.gVec = gravityInBase(mounting, o.angledTiltDeg, o.gravityMPerS2);
    const gNorm = norm3(this.gVec);
    this.gDir = [this.gVec[0] / gNorm, this.gVec[1] / gNorm, this.gVec[2] / gNorm];
    this.plan = planFor(chain, ctx.facts, this.gDir);
    const tool = this.plan.mode === "fixed-by-structure" ? ctx.facts.structureFixedAxis! : this.gDir;
    this.search = new Search(chain, this.plan, tool);
    if (this.plan.mode === "fixed-by-structure" && dot3(tool, this.gDir) < 1 - 1e-9)
      this.notes.push(
        "the flange axis is fixed by the arm's structure and does not point along gravity in this mounting",
      );
    if (this.plan.mode === "follows-posture")
      this.notes.push("the arm has no wrist joints to orient the tool: the flange axis follows the posture");

    // Grid: nodes spread by range (prismatic ranges counted per characteristic length).
    const D = (this.D = this.plan.searched.length);
    const weights = this.plan.searched.map((j) => {
      const [a, b] = searchRange(chain, j);
      this.lo.push(a);
      this.hi.push(b);
      this.periodic.push(!chain.isPrismatic[chain.drivenJoint[j]!] && b - a >= 2 * Math.PI - 1e-12);
      return Math.max(
        (b - a) / (chain.isPrismatic[chain.drivenJoint[j]!] ? Math.max(chain.characteristicLengthM, 1e-3) : 1),
        1e-9,
      );
    });
    const budget = o.searchNodesByDims[Math.min(D, o.searchNodesByDims.length - 1)]!;
    const k = D > 0 ? Math.pow(budget / weights.reduce((p, w) => p * w, 1), 1 / D) : 0;
    for (let d = 0; d < D; d++) this.count.push(Math.max(3, Math.round(weights[d]! * k) + 1));
    let total = 1;
    for (let d = D - 1; d >= 0; d--) {
      this.strides[d] = total;
      total *= this.count[d]!;
    }
    this.total = total;
    this.idx = new Int32Array(D);
    this.nw = this.plan.orienting.length;

    this.stepM = mmToM(o.reachStepMm);
    this.nOff = o.offsetsMm.length;
    this.offsetsM = o.offsetsMm.map(mmToM);
    this.lastAllowed = new Float64Array(this.nOff);
    this.lastLimit = new Int32Array(this.nOff);
    this.lastOwn = new Uint8Array(this.nOff);
    this.maxUnit = new Float64Array(m);
    // Payload torque per kg below this is rounding (a load hanging on the joint's axis): 1e-9 · g · arm size.
    this.unitFloor = 1e-9 * o.gravityMPerS2 * Math.max(1, chain.characteristicLengthM);
    this.qa = new Float64Array(m);
    this.qb = new Float64Array(m);
    this.qStar = new Float64Array(m);
    this.lastWrist = Float64Array.from(this.plan.orienting, (j) => holdValue(chain, j));
  }

  run(): void {
    const screen = this.ctx.anyRating && this.D >= 3;
    this.sweepNodes(screen);
    if (!Number.isFinite(this.minReach)) {
      this.notes.push("no posture found with the tool along gravity within the joint limits");
      return;
    }
    this.kFirst = Math.ceil(this.minReach / this.stepM - 1e-9);
    this.nRows = Math.max(0, Math.floor(this.maxReach / this.stepM + 1e-9) - this.kFirst + 1);
    if (!this.ctx.anyRating) return;
    const slots = this.nRows * this.nOff,
      m = this.chain.drivenCount;
    this.best = new Float64Array(slots).fill(Infinity);
    this.bestLimit = new Int32Array(slots).fill(-2);
    this.bestOwn = new Uint8Array(slots);
    this.bestQ = new Float64Array(slots * m);
    this.bestHeight = new Float64Array(slots);
    this.bestDim = new Int8Array(slots);
    if (screen) this.seededCrossings();
    else this.edgeCrossings();
    this.continueAcrossRows();
    this.refine();
  }

  /** Sets the searched joints of search.q (and idx) to grid node `node`. */
  private setNode(node: number): void {
    let rem = node;
    for (let d = 0; d < this.D; d++) {
      const i = Math.floor(rem / this.strides[d]!);
      this.idx[d] = i;
      rem -= i * this.strides[d]!;
      this.search.q[this.plan.searched[d]!] = this.gridValue(d, i);
    }
  }

  private gridValue(d: number, i: number): number {
    return this.lo[d]! + ((this.hi[d]! - this.lo[d]!) * i) / (this.count[d]! - 1);
  }

  /** Node posture (searched joints, held joints, wrist as stored) into `out`. */
  private nodePosture(out: Float64Array, node: number): void {
    this.setNode(node);
    for (let c = 0; c < this.nw; c++) this.search.q[this.plan.orienting[c]!] = this.nodeWrist[node * this.nw + c]!;
    out.set(this.search.q);
  }

  /** Reach at every node (NaN where the tool cannot point along gravity within the limits); with `screen`, also the
   * allowed payload at every node. */
  private sweepNodes(screen: boolean): void {
    const chain = this.chain,
      q = this.search.q,
      nw = this.nw,
      plan = this.plan;
    for (let j = 0; j < chain.drivenCount; j++) q[j] = holdValue(chain, j);
    for (const hj of plan.held) q[hj.j] = hj.value;
    this.nodeReach = new Float64Array(this.total);
    this.nodeWrist = new Float64Array(this.total * nw);
    if (screen) this.nodeAllowed = new Float64Array(this.total * this.nOff).fill(NaN);
    const solveAlways = screen || plan.wcpFlangeDistanceM === null;
    for (let node = 0; node < this.total; node++) {
      this.setNode(node);
      // Warm start of the wrist from the neighbour that precedes this node along the innermost moved axis.
      if (nw > 0 && solveAlways && node > 0) {
        let prev = node - 1;
        for (let d = this.D - 1; d >= 0; d--) {
          if (this.idx[d]! > 0) {
            prev = node - this.strides[d]!;
            break;
          }
        }
        for (let c = 0; c < nw; c++) q[plan.orienting[c]!] = this.nodeWrist[prev * nw + c]!;
      }
      let r = this.search.reach();
      if (screen && r === r && plan.wcpFlangeDistanceM !== null && !this.search.solveTool()) r = NaN;
      this.nodeReach[node] = r;
      for (let c = 0; c < nw; c++) this.nodeWrist[node * nw + c] = q[plan.orienting[c]!]!;
      if (r !== r) continue;
      if (r < this.minReach) this.minReach = r;
      if (r > this.maxReach) this.maxReach = r;
      if (screen) {
        this.evaluate();
        for (let oi = 0; oi < this.nOff; oi++) this.nodeAllowed[node * this.nOff + oi] = this.lastAllowed[oi]!;
      }
    }
  }

  /** Uncapped allowed payload per offset at the solved posture in the scratch (lastAllowed, lastLimit, lastOwn). */
  private evaluate(): void {
    const chain = this.chain,
      s = this.search.s,
      m = chain.drivenCount,
      tauL = this.search.tauLinks,
      u = this.search.tauUnit;
    holdingTorqueInto(tauL, chain, s, this.ctx.bodies, this.gVec, this.search.h);
    const zx = s.flange[2]!,
      zy = s.flange[6]!,
      zz = s.flange[10]!;
    for (let oi = 0; oi < this.nOff; oi++) {
      const off = this.offsetsM[oi]!;
      pointHoldingTorqueInto(
        u,
        chain,
        s,
        s.flange[3]! + off * zx,
        s.flange[7]! + off * zy,
        s.flange[11]! + off * zz,
        1,
        this.gVec,
        this.search.h,
      );
      for (let j = 0; j < m; j++) if (Math.abs(u[j]!) > this.maxUnit[j]!) this.maxUnit[j] = Math.abs(u[j]!);
      let allowed = Infinity,
        limit = -1,
        own = 0;
      for (let j = 0; j < m; j++) {
        const T = chain.ratedEffortSi[j]!;
        if (!(T > 0)) continue;
        const a = tauL[j]!,
          uj = u[j]!;
        if (Math.abs(a) > T) {
          // The arm cannot hold its own weight here.
          allowed = 0;
          limit = j;
          own = 1;
          break;
        }
        let cap = Infinity;
        if (uj > this.unitFloor) cap = (T - a) / uj;
        else if (uj < -this.unitFloor) cap = (T + a) / -uj;
        if (cap < allowed) {
          allowed = cap;
          limit = j;
        }
      }
      this.lastAllowed[oi] = allowed;
      this.lastLimit[oi] = limit;
      this.lastOwn[oi] = own;
    }
    this.postures++;
  }

  /** Keeps the last evaluation as the worst of row `row` where it is. */
  private record(row: number, dim: number): void {
    const m = this.chain.drivenCount;
    for (let oi = 0; oi < this.nOff; oi++) {
      const slot = row * this.nOff + oi,
        allowed = this.lastAllowed[oi]!;
      if (allowed < this.best[slot]! || this.bestLimit[slot] === -2) {
        this.best[slot] = allowed;
        this.bestLimit[slot] = this.lastLimit[oi]!;
        this.bestOwn[slot] = this.lastOwn[oi]!;
        this.bestQ.set(this.search.q, slot * m);
        for (let d = 0; d < this.D; d++) {
          if (!this.periodic[d]) continue;
          const at = slot * m + this.plan.searched[d]!,
            v = this.bestQ[at]!,
            lo = this.lo[d]!;
          this.bestQ[at] = v - 2 * Math.PI * Math.floor((v - lo) / (2 * Math.PI));
        }
        this.bestHeight[slot] = this.search.s.flange[11]!;
        this.bestDim[slot] = dim;
      }
    }
  }

  /** After `crossing`: solves the wrist where the spherical shortcut left it unsolved. */
  private finishCrossing(warm: Float64Array): boolean {
    if (this.plan.wcpFlangeDistanceM === null) return true;
    for (let c = 0; c < this.nw; c++) this.search.q[this.plan.orienting[c]!] = warm[c]!;
    if (!this.search.solveTool()) return false;
    for (let c = 0; c < this.nw; c++) this.lastWrist[c] = this.search.q[this.plan.orienting[c]!]!;
    return true;
  }

  /** One or two searched joints: every grid edge that crosses a row's reach gives a posture on it. */
  private edgeCrossings(): void {
    const D = this.D,
      stepM = this.stepM,
      tolM = mmToM(this.ctx.o.reachToleranceMm),
      kLast = this.kFirst + this.nRows - 1;
    const idxA = new Int32Array(D);
    for (let node = 0; node < this.total; node++) {
      const ra = this.nodeReach[node]!;
      if (ra !== ra) continue;
      this.setNode(node);
      idxA.set(this.idx);
      for (let d = 0; d < D; d++) {
        if (idxA[d]! + 1 >= this.count[d]!) continue;
        const nb = node + this.strides[d]!,
          rb = this.nodeReach[nb]!;
        if (rb !== rb) continue;
        const k0 = Math.max(this.kFirst, Math.ceil(Math.min(ra, rb) / stepM - 1e-12));
        const k1 = Math.min(kLast, Math.floor(Math.max(ra, rb) / stepM + 1e-12));
        if (k1 < k0) continue;
        this.nodePosture(this.qa, node);
        this.nodePosture(this.qb, nb);
        for (let kk = k0; kk <= k1; kk++) {
          const target = kk * stepM;
          if (
            !crossing(
              this.search,
              this.qa,
              this.qb,
              ra - target,
              rb - target,
              target,
              tolM,
              this.nw,
              this.plan.orienting,
            )
          )
            continue;
          if (!this.finishCrossing(this.lastWrist)) continue;
          this.evaluate();
          this.record(kk - this.kFirst, d);
        }
      }
    }
  }

  /**
   * Three or more searched joints: every grid edge that crosses a row's reach is screened with the allowed payload
   * interpolated between its two nodes at the crossing; the SEEDS_PER_ROW lowest edges of each row (and offset) are
   * solved exactly (Illinois) and evaluated.
   */
  private seededCrossings(): void {
    const nOff = this.nOff,
      slots = this.nRows * nOff,
      K = SEEDS_PER_ROW,
      D = this.D,
      stepM = this.stepM;
    const tolM = mmToM(this.ctx.o.reachToleranceMm),
      kLast = this.kFirst + this.nRows - 1;
    const seedEdge = new Int32Array(slots * K).fill(-1),
      seedVal = new Float64Array(slots * K).fill(Infinity);
    for (let node = 0; node < this.total; node++) {
      const ra = this.nodeReach[node]!;
      if (ra !== ra) continue;
      this.setNode(node);
      for (let d = 0; d < D; d++) {
        if (this.idx[d]! + 1 >= this.count[d]!) continue;
        const nb = node + this.strides[d]!,
          rb = this.nodeReach[nb]!;
        if (rb !== rb || ra === rb) continue;
        const k0 = Math.max(this.kFirst, Math.ceil(Math.min(ra, rb) / stepM - 1e-12));
        const k1 = Math.min(kLast, Math.floor(Math.max(ra, rb) / stepM + 1e-12));
        for (let kk = k0; kk <= k1; kk++) {
          const t = (kk * stepM - ra) / (rb - ra),
            row = kk - this.kFirst;
          for (let oi = 0; oi < nOff; oi++) {
            const va = this.nodeAllowed[node * nOff + oi]!,
              vb = this.nodeAllowed[nb * nOff + oi]!;
            const v = Number.isFinite(va) && Number.isFinite(vb) ? va + t * (vb - va) : Math.min(va, vb);
            const base = (row * nOff + oi) * K;
            if (!(v < seedVal[base + K - 1]!)) continue;
            let at = K - 1;
            while (at > 0 && v < seedVal[base + at - 1]!) {
              seedVal[base + at] = seedVal[base + at - 1]!;
              seedEdge[base + at] = seedEdge[base + at - 1]!;
              at--;
            }
            seedVal[base + at] = v;
            seedEdge[base + at] = node * D + d;
          }
        }
      }
    }
    const wrist = new Float64Array(Math.max(1, this.nw));
    for (let slot = 0; slot < slots; slot++) {
      const row = Math.floor(slot / nOff),
        target = (this.kFirst + row) * stepM;
      for (let sd = 0; sd < K; sd++) {
        const edge = seedEdge[slot * K + sd]!;
        if (edge < 0) continue;
        // The same edge may seed several offsets of a row: solve it once (the evaluation records every offset).
        let seen = false;
        for (let other = Math.floor(slot / nOff) * nOff; other < slot && !seen; other++) {
          for (let t = 0; t < K; t++) if (seedEdge[other * K + t] === edge) seen = true;
        }
        if (seen) continue;
        const node = Math.floor(edge / D),
          d = edge % D,
          nb = node + this.strides[d]!;
        this.nodePosture(this.qa, node);
        this.nodePosture(this.qb, nb);
        for (let c = 0; c < this.nw; c++) wrist[c] = this.nodeWrist[node * this.nw + c]!;
        if (
          !crossing(
            this.search,
            this.qa,
            this.qb,
            this.nodeReach[node]! - target,
            this.nodeReach[nb]! - target,
            target,
            tolM,
            this.nw,
            this.plan.orienting,
          )
        )
          continue;
        if (!this.finishCrossing(wrist)) continue;
        this.evaluate();
        this.record(row, d);
      }
    }
  }

  /**
   * Continuation: the worst postures of neighbouring rows lie on one smooth family, so each row's worst posture is
   * moved onto the next row's reach (along the joint its crossing was found on, within ± two grid steps) and
   * evaluated there; one sweep up the rows, one down. A row the grid sampled poorly inherits its neighbours' find.
   */
  private continueAcrossRows(): void {
    if (this.D < 2) return;
    const m = this.chain.drivenCount,
      nOff = this.nOff;
    for (const dir of [1, -1]) {
      for (let k = 0; k < this.nRows - 1; k++) {
        const from = dir > 0 ? k : this.nRows - 1 - k,
          to = from + dir;
        for (let oi = 0; oi < nOff; oi++) {
          const src = from * nOff + oi;
          if (this.bestLimit[src] === -2 || !Number.isFinite(this.best[src]!)) continue;
          this.qStar.set(this.bestQ.subarray(src * m, src * m + m));
          this.project(to, this.bestDim[src]!, 2);
        }
      }
    }
  }

  /**
   * Moves qStar onto row `row`'s reach along searched joint dStar (within ± `steps` grid steps), solves the wrist,
   * evaluates and records. Returns the allowed payload of every offset in lastAllowed; false where no such posture.
   */
  private project(row: number, dStar: number, steps: number): boolean {
    const plan = this.plan,
      search = this.search,
      qa = this.qa,
      qb = this.qb,
      qStar = this.qStar;
    const target = (this.kFirst + row) * this.stepM;
    const jd = plan.searched[dStar]!,
      step = steps * this.gridStep(dStar);
    qa.set(qStar);
    qb.set(qStar);
    qa[jd] = this.clampTo(dStar, qStar[jd]! - step);
    qb[jd] = this.clampTo(dStar, qStar[jd]! + step);
    search.q.set(qa);
    const fa = search.reach() - target;
    qa.set(search.q);
    search.q.set(qb);
    const fb = search.reach() - target;
    qb.set(search.q);
    if (!(fa * fb <= 0)) return false;
    if (!crossing(search, qa, qb, fa, fb, target, mmToM(this.ctx.o.reachToleranceMm), this.nw, plan.orienting))
      return false;
    if (plan.wcpFlangeDistanceM !== null) {
      for (let c = 0; c < this.nw; c++) search.q[plan.orienting[c]!] = qStar[plan.orienting[c]!]!;
      if (!search.solveTool()) return false;
    }
    this.evaluate();
    this.record(row, dStar);
    return true;
  }

  /** Allowed payload (offset oi) at the posture on row `row`'s reach with searched joint e at x, the reach solved
   * along searched joint dStar within ± one grid step of the slot's best posture qStar; Infinity where none. */
  private onLevel(row: number, oi: number, dStar: number, e: number, x: number): number {
    const saved = this.qStar[this.plan.searched[e]!]!;
    this.qStar[this.plan.searched[e]!] = x;
    const ok = this.project(row, dStar, 1);
    this.qStar[this.plan.searched[e]!] = saved;
    return ok ? this.lastAllowed[oi]! : Infinity;
  }

  /** Into the search window of searched joint d; a periodic joint is left as is (it may pass the seam). */
  private clampTo(d: number, v: number): number {
    return this.periodic[d] ? v : Math.min(this.hi[d]!, Math.max(this.lo[d]!, v));
  }

  private gridStep(d: number): number {
    return (this.hi[d]! - this.lo[d]!) / (this.count[d]! - 1);
  }

  /**
   * Local refinement of each row's worst posture: golden-section search over each other searched joint within ± one
   * grid step, the row's reach re-solved along the joint the crossing was found on (two passes when three or more
   * joints are searched).
   */
  private refine(): void {
    const D = this.D,
      m = this.chain.drivenCount,
      passes = D >= 3 ? 2 : 1;
    if (D < 2) return;
    for (let slot = 0; slot < this.nRows * this.nOff; slot++) {
      if (this.bestLimit[slot] === -2 || !Number.isFinite(this.best[slot]!)) continue;
      const row = Math.floor(slot / this.nOff),
        oi = slot % this.nOff,
        dStar = this.bestDim[slot]!;
      for (let pass = 0; pass < passes; pass++) {
        for (let e = 0; e < D; e++) {
          if (e === dStar) continue;
          this.qStar.set(this.bestQ.subarray(slot * m, slot * m + m));
          const center = this.qStar[this.plan.searched[e]!]!,
            step = this.gridStep(e);
          let a = this.clampTo(e, center - step),
            b = this.clampTo(e, center + step);
          let x1 = b - GOLDEN * (b - a),
            x2 = a + GOLDEN * (b - a);
          let f1 = this.onLevel(row, oi, dStar, e, x1),
            f2 = this.onLevel(row, oi, dStar, e, x2);
          for (let it = 0; it < REFINE_STEPS; it++) {
            if (f1 < f2) {
              b = x2;
              x2 = x1;
              f2 = f1;
              x1 = b - GOLDEN * (b - a);
              f1 = this.onLevel(row, oi, dStar, e, x1);
            } else {
              a = x1;
              x1 = x2;
              f1 = f2;
              x2 = a + GOLDEN * (b - a);
              f2 = this.onLevel(row, oi, dStar, e, x2);
            }
          }
        }
      }
    }
  }

  /** Rows of this mounting. Rows at the ends of the range where no posture holds the tool along gravity are dropped
   * (the reach range of the spherical shortcut does not check the wrist limits); gaps inside stay, "unreachable". */
  rows(): PayloadAtReachRow[] {
    const chain = this.chain,
      m = chain.drivenCount,
      nOff = this.nOff,
      o = this.ctx.o,
      rated = this.ctx.input.ratedPayloadKg;
    const out: PayloadAtReachRow[] = [];
    const mounting = this.mounting;
    if (!this.ctx.anyRating) {
      for (let r = 0; r < this.nRows; r++) {
        for (const offsetMm of o.offsetsMm) {
          out.push({
            mounting,
            reachMm: (this.kFirst + r) * o.reachStepMm,
            offsetMm,
            payloadKg: rated,
            limitingJoint: null,
            limitedBy: "as-rated",
            torqueLimitKg: null,
            torqueLimitJoint: null,
            flangeHeightMm: null,
            jointsDegOrMm: null,
          });
        }
      }
      return out;
    }
    const reached = (r: number): boolean => {
      for (let oi = 0; oi < nOff; oi++) if (this.bestLimit[r * nOff + oi] !== -2) return true;
      return false;
    };
    let rFirst = 0,
      rLast = this.nRows - 1;
    while (rFirst <= rLast && !reached(rFirst)) rFirst++;
    while (rLast >= rFirst && !reached(rLast)) rLast--;
    const name = (j: number): string => chain.jointNames[chain.drivenJoint[j]!]!;
    for (let r = rFirst; r <= rLast; r++) {
      for (let oi = 0; oi < nOff; oi++) {
        const slot = r * nOff + oi;
        const reachMm = (this.kFirst + r) * o.reachStepMm,
          offsetMm = o.offsetsMm[oi]!;
        if (this.bestLimit[slot] === -2) {
          out.push({
            mounting,
            reachMm,
            offsetMm,
            payloadKg: 0,
            limitingJoint: null,
            limitedBy: "unreachable",
            torqueLimitKg: null,
            torqueLimitJoint: null,
            flangeHeightMm: null,
            jointsDegOrMm: null,
          });
          continue;
        }
        const torqueKg = Math.max(0, this.best[slot]!),
          capped = !(torqueKg < rated),
          lim = this.bestLimit[slot]!;
        out.push({
          mounting,
          reachMm,
          offsetMm,
          payloadKg: Math.min(rated, torqueKg),
          limitingJoint: !capped && lim >= 0 ? name(lim) : null,
          limitedBy: capped ? "rated-payload" : this.bestOwn[slot] ? "own-weight" : "joint-rating",
          torqueLimitKg: Number.isFinite(torqueKg) ? torqueKg : null,
          torqueLimitJoint: lim >= 0 ? name(lim) : null,
          flangeHeightMm: mToMm(this.bestHeight[slot]!),
          jointsDegOrMm: Array.from(this.bestQ.subarray(slot * m, slot * m + m), (v, j) => jointOut(chain, j, v)),
        });
      }
    }
    return out;
  }

  report(): PayloadMountingReport {
    const chain = this.chain,
      plan = this.plan;
    const name = (j: number): string => chain.jointNames[chain.drivenJoint[j]!]!;
    return {
      mounting: this.mounting,
      gravityDirectionInBase: this.gDir,
      toolDirection: plan.mode,
      minReachMm: Number.isFinite(this.minReach) ? mToMm(this.minReach) : null,
      maxReachMm: Number.isFinite(this.maxReach) ? mToMm(this.maxReach) : null,
      searched: plan.searched.map((j, d) => ({ joint: name(j), stepDegOrMm: jointOut(chain, j, this.gridStep(d)) })),
      orienting: plan.orienting.map(name),
      held: plan.held.map((h) => ({ joint: name(h.j), valueDegOrMm: jointOut(chain, h.j, h.value), reason: h.reason })),
      postures: this.postures,
      notes: this.notes,
    };
  }

  /** Names of driven joints that carried payload torque somewhere but have no rating. */
  loadedUnrated(): string[] {
    const chain = this.chain,
      out: string[] = [];
    for (let j = 0; j < chain.drivenCount; j++) {
      if (this.maxUnit[j]! > this.unitFloor && !(chain.ratedEffortSi[j]! > 0))
        out.push(chain.jointNames[chain.drivenJoint[j]!]!);
    }
    return out;
  }
}

/** Joint value for output: deg for revolute, mm for prismatic. */
function jointOut(chain: Chain, j: number, si: number): number {
  return chain.isPrismatic[chain.drivenJoint[j]!] ? mToMm(si) : radToDeg(si);
}

/**
 * Finds t in [0, 1] along qa→qb where reach − target changes sign (Illinois method), leaving search.q (and for
 * solved wrists the scratch) at that posture. fa, fb: reach − target at the ends. False when the reach is not
 * continuous along the edge (a wrist branch flip) or the tolerance is not met.
 */
function crossing(
  search: Search,
  qa: Float64Array,
  qb: Float64Array,
  fa: number,
  fb: number,
  target: number,
  tolM: number,
  nw: number,
  orienting: readonly number[],
): boolean {
  const q = search.q;
  let ta = 0,
    tb = 1,
    side = 0,
    first = true;
  const at = (t: number): number => {
    // Wrist angles: the first guess from the nearer end (interpolating across a 2π wrap would be wrong), then from
    // the previous iterate, which is closer.
    for (let c = 0; c < nw; c++) search.wrist[c] = first ? (t < 0.5 ? qa : qb)[orienting[c]!]! : q[orienting[c]!]!;
    first = false;
    for (let j = 0; j < q.length; j++) q[j] = qa[j]! + t * (qb[j]! - qa[j]!);
    for (let c = 0; c < nw; c++) q[orienting[c]!] = search.wrist[c]!;
    return search.reach() - target;
  };
  if (fa === 0 || fb === 0) {
    const f = at(fa === 0 ? 0 : 1);
    return Math.abs(f) <= tolM;
  }
  for (let iter = 0; iter < 60; iter++) {
    const t = (ta * fb - tb * fa) / (fb - fa);
    const f = at(t);
    if (f !== f) return false;
    if (Math.abs(f) <= tolM) return true;
    if (f > 0 === fb > 0) {
      tb = t;
      fb = f;
      if (side === -1) fa /= 2;
      side = -1;
    } else {
      ta = t;
      fa = f;
      if (side === 1) fb /= 2;
      side = 1;
    }
    if (tb - ta < 1e-15) break;
  }
  return false;
}

// ---------------------------------------------------------------------------------------------------------------
// Everything together

export interface PayloadAnalysisOptions {
  readonly loadDiagram: Partial<LoadDiagramOptions>;
  readonly atReach: Partial<PayloadAtReachOptions>;
  /** Relative tolerance of the plausibility warnings. */
  readonly warningTolerance: number;
}

export interface PayloadAnalysis {
  readonly basis: PayloadBasis;
  readonly statement: string;
  readonly atReach: readonly PayloadAtReachRow[];
  readonly atReachDetail: Omit<PayloadAtReach, "rows">;
  readonly loadDiagram: LoadDiagram;
  readonly warnings: readonly PayloadWarning[];
}

/**
 * The payload section of an arm's analysis: payload at reach, load diagram and plausibility warnings.
 * Shape (contract): { basis, atReach: [{ reachMm, offsetMm, payloadKg, limitingJoint, mounting, … }], loadDiagram }.
 */
export function analysePayload(
  chain: Chain,
  input: PayloadInput,
  options: Partial<PayloadAnalysisOptions> = {},
): PayloadAnalysis {
  const atReach = payloadAtReach(chain, input, options.atReach ?? {});
  const { rows, ...detail } = atReach;
  return {
    basis: atReach.basis,
    statement: PAYLOAD_STATEMENT,
    atReach: rows,
    atReachDetail: detail,
    loadDiagram: loadDiagram(input, options.loadDiagram ?? {}),
    warnings: payloadWarnings(input, options.warningTolerance ?? 0),
  };
}
