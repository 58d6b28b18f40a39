/**
 * The tool load of a cell for one arm, as the study reports it: toolLoad.ts's figures rounded for the JSON, with the
 * verdict's reasons in numbers, and the load carried at a target (tool plus the part held) for the holding torques.
 */
import type { Chain } from "../../kinematics/chain";
import { mmToM } from "../../units";
import { payloadInputOf, type PayloadSpec } from "../payload";
import { combineBodies, toolLoadsOf, type ToolLoad, type ToolLoadRating } from "./toolLoad";
import type { CellSpec } from "./types";

/** One wrist rating as toolLoad.ts gives it, rounded for the JSON (without the internal share). */
export type ToolLoadRatingJson = Omit<ToolLoadRating, "share">;

export interface ToolLoadJson {
  readonly carrying: string | null;
  readonly massKg: number;
  readonly cogMm: [number, number, number];
  readonly inertiaAboutCogKgM2: { xx: number; yy: number; zz: number; xy: number; xz: number; yz: number };
  readonly ratedPayloadKg: number;
  readonly withinRatedPayload: boolean;
  readonly ratings: readonly ToolLoadRatingJson[];
  /** The wrist rating the load uses most, or null. */
  readonly limiting: string | null;
  readonly loadDiagram: { readonly lzMm: number; readonly lxyMm: number };
}

export interface CellToolLoad {
  readonly json: ToolLoadJson;
  /** Failed checks, in words with numbers. */
  readonly problems: string[];
}

const round = (v: number, digits: number) => Number(v.toFixed(digits));
const roundOrNull = (v: number | null, digits: number) => (v === null ? null : round(v, digits));

function loadJson(t: ToolLoad): ToolLoadJson {
  const i = t.inertiaAboutCogKgM2;
  return {
    carrying: t.carrying,
    massKg: round(t.massKg, 3),
    cogMm: [round(t.cogMm[0], 1), round(t.cogMm[1], 1), round(t.cogMm[2], 1)],
    inertiaAboutCogKgM2: {
      xx: round(i.xx, 5),
      yy: round(i.yy, 5),
      zz: round(i.zz, 5),
      xy: round(i.xy, 5),
      xz: round(i.xz, 5),
      yz: round(i.yz, 5),
    },
    ratedPayloadKg: t.ratedPayloadKg,
    withinRatedPayload: t.withinRatedPayload,
    ratings: t.ratings.map((r) => ({
      joint: r.joint,
      axis: r.axis,
      leverMm: round(r.leverMm, 1),
      momentNm: round(r.momentNm, 2),
      allowedMomentNm: roundOrNull(r.allowedMomentNm, 2),
      inertiaKgM2: round(r.inertiaKgM2, 4),
      allowedInertiaKgM2: roundOrNull(r.allowedInertiaKgM2, 4),
      ok: r.ok,
    })),
    limiting: t.limiting,
    loadDiagram: { lzMm: round(t.loadDiagram.lzMm, 1), lxyMm: round(t.loadDiagram.lxyMm, 1) },
  };
}

/** The tool alone, then with each part, against the arm's ratings, with the failed checks in words. */
export function cellToolLoads(cell: CellSpec, chain: Chain, facts: PayloadSpec): CellToolLoad[] {
  return toolLoadsOf(cell, payloadInputOf(facts, chain)).map((t) => {
    const what = t.carrying ? `tool with ${t.carrying}` : "tool";
    const problems: string[] = [];
    if (!t.withinRatedPayload)
      problems.push(`${what}: ${t.massKg.toFixed(1)} kg > rated payload ${t.ratedPayloadKg} kg`);
    for (const r of t.ratings) {
      if (r.allowedMomentNm !== null && r.momentNm > r.allowedMomentNm)
        problems.push(`${r.joint} moment ${r.momentNm.toFixed(1)} N·m > ${r.allowedMomentNm} N·m (${what})`);
      if (r.allowedInertiaKgM2 !== null && r.inertiaKgM2 > r.allowedInertiaKgM2)
        problems.push(`${r.joint} inertia ${r.inertiaKgM2.toFixed(3)} kg·m² > ${r.allowedInertiaKgM2} kg·m² (${what})`);
    }
    return { json: loadJson(t), problems };
  });
}

/** Mass and centre of gravity (flange frame, m) of the tool carrying `part` (null: the tool alone). */
export function cellLoadOf(cell: CellSpec, part: string | null): { massKg: number; cogM: [number, number, number] } {
  const bodies = [...cell.tool.bodies, ...cell.parts.filter((p) => p.name === part)];
  const c = combineBodies(bodies);
  return { massKg: c.massKg, cogM: [mmToM(c.cogMm[0]), mmToM(c.cogMm[1]), mmToM(c.cogMm[2])] };
}
