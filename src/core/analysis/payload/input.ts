/**
 * Payload input (pure): the payload fields of an arm file turned into core data (joint indices, SI), with the lever
 * geometry of each wrist rating taken from the chain at its home pose.
 *
 * Notation: d, e, pivot of a bending wrist axis in the flange frame: d behind the flange face along the flange axis,
 * e off that axis, m (for a spherical wrist the pivot is the wrist centre point). Conventions: README.md.
 */
import type { Chain } from "../../kinematics/chain";
import { createScratch, forwardInto, wristCentreInto } from "../../kinematics/forward";
import type { LinkMass, Mounting } from "../../kinematics/statics";
import { mmToM } from "../../units";
import {
  axisInBase,
  cross3,
  distanceToLine,
  dot3,
  flangeSpinSet,
  homePose,
  nearestPointOnLine,
  norm3,
  ON_AXIS_M,
  PARALLEL_SIN,
} from "./chainGeometry";

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
