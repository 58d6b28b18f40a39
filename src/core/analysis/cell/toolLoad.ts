/**
 * Tool load of a cell (pure): the tool's bodies, alone and with each part gripped, combined into one rigid load, and
 * that load against the arm's rated payload and wrist ratings. Static holding only (no acceleration).
 *
 * Notation (file units at the edges; SI inside):
 *   m        total mass, kg                          c        centre of gravity in the flange frame, mm
 *   I_c      inertia tensor about c in flange axes, kg·m² (entries as URDF: xy = −∫xy dm)
 *   Lz       c_z: CG offset along the flange axis from the flange face;  Lxy = √(c_x² + c_y²): across it
 *   d, e     pivot of a bending wrist axis behind the flange face and off its axis (payload/input.ts)
 *
 * Combination (parallel-axis theorem, Steiner; e.g. Meriam & Kraige, Engineering Mechanics: Dynamics, ch. 7):
 *   m = Σ mᵢ,  c = Σ mᵢcᵢ / m,  I_c = Σ [Iᵢ + mᵢ((rᵢ·rᵢ)E − rᵢrᵢᵀ)],  rᵢ = cᵢ − c.
 *
 * Against each wrist rating, with the levers of the load diagram (payload/loadDiagram.ts `leverM`):
 *   bending axis: L = √((d + Lz)² + (e + Lxy)²), the distance from the pivot to the CG; moment m·g·L; inertia
 *     m·L² + λ_max(I_c): the largest moment of inertia the load can present about an axis through the pivot over wrist
 *     postures (the axis through c parallel to any direction has inertia ≤ λ_max, and the transfer term is ≤ m·L²);
 *   roll axis (the flange axis): L = Lxy + e; moment m·g·L; inertia I_c,zz + m·(Lxy + e)², which is
 *     I_zz + m·(c_x² + c_y²) when the roll axis is the flange axis (e = 0). When the roll axis is off the flange axis
 *     (e > 0) its direction of offset is not kept in the lever model, so the distance from it to the CG is bounded by
 *     Lxy + e (triangle inequality), the same bound the load diagram uses for the moment.
 * g is standard gravity (units.ts). A rating the arm file leaves out (NaN) is not checked: allowed null.
 */
import { STANDARD_GRAVITY_M_PER_S2, mToMm, mmToM } from "../../units";
import { symmetricEigenvalues3 } from "../../math/sym3";
import type { PayloadInput, WristRating } from "../payload/input";
import { leverM, loadMomentNm } from "../payload/loadDiagram";
import type { BodySpec, InertiaSpec, Vec3 } from "./types";

/** A body's mass, centre of gravity (flange frame, mm) and inertia about it (flange axes, kg·m²; zero when absent). */
export type MassBody = Pick<BodySpec, "massKg" | "cogMm" | "inertiaKgM2">;

/** One rigid load: the bodies combined. */
export interface CombinedBody {
  readonly massKg: number;
  /** Centre of gravity in the flange frame, mm ([0, 0, 0] when there is no mass). */
  readonly cogMm: Vec3;
  /** Inertia tensor about the centre of gravity, flange axes, kg·m² (xy, xz, yz: tensor entries, −∫xy dm). */
  readonly inertiaAboutCogKgM2: InertiaSpec;
}

const ZERO_INERTIA: InertiaSpec = { xx: 0, yy: 0, zz: 0, xy: 0, xz: 0, yz: 0 };

/**
 * Combines rigid bodies into one: total mass, centre of gravity, inertia about it (parallel-axis theorem).
 * @param bodies masses kg (> 0), centres of gravity in the flange frame mm, inertias about their own CG kg·m²
 * @returns the combined load; no bodies: zero mass at the flange centre
 * @throws RangeError for a mass that is not a positive finite number
 * @example combineBodies([{ massKg: 1, cogMm: [0, 0, -100] }, { massKg: 1, cogMm: [0, 0, 100] }])
 *   // { massKg: 2, cogMm: [0, 0, 0], inertiaAboutCogKgM2: { xx: 0.02, yy: 0.02, zz: 0, … } } (2·1 kg·(0.1 m)²)
 */
export function combineBodies(bodies: readonly MassBody[]): CombinedBody {
  let m = 0,
    sx = 0,
    sy = 0,
    sz = 0;
  for (const b of bodies) {
    if (!(b.massKg > 0 && Number.isFinite(b.massKg))) throw new RangeError(`invalid massKg: ${b.massKg}`);
    m += b.massKg;
    sx += b.massKg * b.cogMm[0];
    sy += b.massKg * b.cogMm[1];
    sz += b.massKg * b.cogMm[2];
  }
  if (m === 0) return { massKg: 0, cogMm: [0, 0, 0], inertiaAboutCogKgM2: ZERO_INERTIA };
  const cogMm: Vec3 = [sx / m, sy / m, sz / m];
  let xx = 0,
    yy = 0,
    zz = 0,
    xy = 0,
    xz = 0,
    yz = 0;
  for (const b of bodies) {
    const own = b.inertiaKgM2 ?? ZERO_INERTIA;
    const rx = mmToM(b.cogMm[0] - cogMm[0]),
      ry = mmToM(b.cogMm[1] - cogMm[1]),
      rz = mmToM(b.cogMm[2] - cogMm[2]);
    const mi = b.massKg;
    // Iᵢ + mᵢ((r·r)E − r rᵀ)
    xx += own.xx + mi * (ry * ry + rz * rz);
    yy += own.yy + mi * (rx * rx + rz * rz);
    zz += own.zz + mi * (rx * rx + ry * ry);
    xy += own.xy - mi * rx * ry;
    xz += own.xz - mi * rx * rz;
    yz += own.yz - mi * ry * rz;
  }
  return { massKg: m, cogMm, inertiaAboutCogKgM2: { xx, yy, zz, xy, xz, yz } };
}

/** The load against one wrist rating. */
export interface ToolLoadRating {
  readonly joint: string;
  /** "bend": lever from the pivot; "roll": the flange axis (module notes). */
  readonly axis: "roll" | "bend";
  readonly leverMm: number;
  /** Static moment of the load's weight about the axis, m·g·L, N·m. */
  readonly momentNm: number;
  /** The arm file's allowed moment, N·m; null when not rated. */
  readonly allowedMomentNm: number | null;
  /** Inertia of the load about the axis (module notes), kg·m². */
  readonly inertiaKgM2: number;
  /** The arm file's allowed inertia, kg·m²; null when not rated. */
  readonly allowedInertiaKgM2: number | null;
  /** Largest share of a rating the load uses, max(moment/allowed, inertia/allowed); null when nothing is rated. */
  readonly share: number | null;
  /** Every rated quantity within its rating. */
  readonly ok: boolean;
}

/** The tool, alone or with one part gripped, against the arm's payload ratings. */
export interface ToolLoad extends CombinedBody {
  /** The part carried (null: the tool alone). */
  readonly carrying: string | null;
  readonly ratedPayloadKg: number;
  /** massKg ≤ ratedPayloadKg (tooling counts as payload). */
  readonly withinRatedPayload: boolean;
  /** One entry per wrist rating of the arm file, base to flange. */
  readonly ratings: readonly ToolLoadRating[];
  /** The rating with the largest share (the first on a tie); null when the arm file rates no wrist joint. */
  readonly limiting: string | null;
  /** The load's place on the arm's load diagram: CG offset along the flange axis (lzMm) and across it (lxyMm). */
  readonly loadDiagram: { readonly lzMm: number; readonly lxyMm: number };
}

/**
 * The load against one wrist rating (module notes).
 * @example a 4 kg point mass 0.2 m beyond the flange, a bending axis 0.1 m behind it rated 40 N·m:
 *   lever 0.3 m, moment 4·9.80665·0.3 = 11.77 N·m, inertia 4·0.3² = 0.36 kg·m², share 0.294
 */
export function ratingLoad(
  load: CombinedBody,
  rating: WristRating,
  gravityMPerS2 = STANDARD_GRAVITY_M_PER_S2,
): ToolLoadRating {
  const I = load.inertiaAboutCogKgM2;
  const lzM = mmToM(load.cogMm[2]),
    lxyM = mmToM(Math.hypot(load.cogMm[0], load.cogMm[1]));
  const L = leverM(rating.lever, lxyM, lzM);
  const m = load.massKg;
  const momentNm = loadMomentNm(m, L, gravityMPerS2);
  const inertiaKgM2 =
    rating.lever.kind === "roll"
      ? I.zz + m * L * L
      : m * L * L + Math.max(0, symmetricEigenvalues3(I.xx, I.yy, I.zz, I.xy, I.xz, I.yz)[2]);
  const allowedMomentNm = rating.momentNm > 0 ? rating.momentNm : null;
  const allowedInertiaKgM2 = rating.inertiaKgM2 > 0 ? rating.inertiaKgM2 : null;
  const shares = [
    allowedMomentNm === null ? null : momentNm / allowedMomentNm,
    allowedInertiaKgM2 === null ? null : inertiaKgM2 / allowedInertiaKgM2,
  ].filter((s): s is number => s !== null);
  const share = shares.length ? Math.max(...shares) : null;
  return {
    joint: rating.joint,
    axis: rating.lever.kind,
    leverMm: mToMm(L),
    momentNm,
    allowedMomentNm,
    inertiaKgM2,
    allowedInertiaKgM2,
    share,
    ok: share === null || share <= 1,
  };
}

/** The tool side of a cell file: the tool's bodies and the parts it may grip. */
export interface ToolLoadCell {
  readonly tool: { readonly bodies: readonly BodySpec[] };
  readonly parts: readonly BodySpec[];
}

/**
 * The tool alone, then the tool with each part (in file order), against the arm's payload ratings.
 * @param cell the tool's bodies and the parts (file units)
 * @param payload the arm's payload data (payloadInputOf)
 * @returns toolLoad[0]: the tool alone (carrying null); toolLoad[k]: the tool with parts[k − 1]
 * @example a 12 kg gripper and a 6 kg box on an arm rated 20 kg: [{ carrying: null, massKg: 12, … },
 *   { carrying: "box", massKg: 18, withinRatedPayload: true, … }]
 */
export function toolLoadsOf(
  cell: ToolLoadCell,
  payload: PayloadInput,
  gravityMPerS2 = STANDARD_GRAVITY_M_PER_S2,
): ToolLoad[] {
  const cases: { carrying: string | null; bodies: readonly MassBody[] }[] = [
    { carrying: null, bodies: cell.tool.bodies },
    ...cell.parts.map((p) => ({ carrying: p.name, bodies: [...cell.tool.bodies, p] })),
  ];
  return cases.map(({ carrying, bodies }) => {
    const load = combineBodies(bodies);
    const ratings = payload.wrist.map((r) => ratingLoad(load, r, gravityMPerS2));
    let limiting: string | null = null,
      worst = -Infinity;
    for (const r of ratings) {
      if (r.share !== null && r.share > worst) {
        worst = r.share;
        limiting = r.joint;
      }
    }
    return {
      carrying,
      ...load,
      ratedPayloadKg: payload.ratedPayloadKg,
      withinRatedPayload: load.massKg <= payload.ratedPayloadKg,
      ratings,
      limiting,
      loadDiagram: { lzMm: load.cogMm[2], lxyMm: Math.hypot(load.cogMm[0], load.cogMm[1]) },
    };
  });
}
