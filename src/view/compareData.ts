/**
 * The per-arm summary the side-by-side page fetches (dist/data/arms/<id>/compare.json): what the page draws and what
 * the requirements panel checks, a few kilobytes instead of the full analysis (0.1–1.7 MB, mostly the speed maps).
 *
 * - Side-view envelopes of the wrist centre point and the flange centre, rings simplified at 1 mm (Douglas–Peucker)
 *   and rounded to whole millimetres.
 * - Payload-at-reach rows (every mounting, reach row and CG offset of the analysis).
 * - Speed figures per reference orientation, and for the requirements a compact form of each map:
 *   `blocks` holds, for square blocks of `blockMm` (aligned with the map nodes), the LOWEST guaranteed straight-line
 *   speed over the map nodes in the block that the flange reaches (null: none), and `reachedRuns` lists, for each
 *   node row, the runs of node columns reached [first, last] (inclusive). The runs are exact at the node spacing;
 *   block minima are conservative (they may include nodes up to one block outside a band).
 * - Declared fields for the spec table, and the computed key figures (the capability map's headline shares among them).
 *
 * Pure over (arm, analysis): no filesystem, no Astro.
 */
import type { Arm } from "../catalog/load";
import type { ArmAnalysis } from "../core";
import { simplifyRing, type PointData, type PolygonData } from "../charts/geometry";
import { declaredPoseRepeatability, type DeclaredValue } from "./datasheetFormat";

/** Side of a speed block, mm (rounded up to a multiple of the map's node spacing). */
export const COMPARE_SPEED_BLOCK_MM = 50;

/** Ring simplification tolerance for the envelopes, mm. */
export const COMPARE_ENVELOPE_TOLERANCE_MM = 1;

export interface CompareSpeedBlocks {
  /** Lower-left corner of block (0, 0), mm; block (bx, by) spans [rMin + bx·blockMm, rMin + (bx+1)·blockMm) × … */
  readonly rMinMm: number;
  readonly zMinMm: number;
  readonly blockMm: number;
  readonly nx: number;
  readonly ny: number;
  /** Lowest guaranteed speed over the reached nodes of each block, mm/s rounded down; null: no node reached. */
  readonly minMmPerS: readonly (number | null)[];
}

export interface CompareSpeedMap {
  readonly orientation: "down" | "outward";
  readonly maxGuaranteedMmPerS: number | null;
  readonly maxToolSpeedMmPerS: number | null;
  /** Share of the reached cells with a guaranteed speed at least 0.5, 1, 2 m/s (keys "0.5", "1", "2"). */
  readonly shareAtLeast: Readonly<Record<string, number>>;
  /** Map nodes: value (ix, iy) at r = rMinMm + ix·stepMm, z = zMinMm + iy·stepMm. */
  readonly nodes: {
    readonly nx: number;
    readonly ny: number;
    readonly rMinMm: number;
    readonly zMinMm: number;
    readonly stepMm: number;
  };
  /** Per node row iy: inclusive column runs [ixFirst, ixLast] of nodes the flange reaches with this orientation. */
  readonly reachedRuns: readonly (readonly (readonly [number, number])[])[];
  readonly blocks: CompareSpeedBlocks;
}

/** Payload at reach for one mounting and CG offset, as columns (rows every reach step of the analysis). */
export interface ComparePayloadSeries {
  readonly mounting: string;
  readonly offsetMm: number;
  /** Flange centre's distance from axis 1, mm, ascending. */
  readonly reachMm: readonly number[];
  /** Largest static payload, kg, rounded down to the gram; null where the reach is out of range. */
  readonly payloadKg: readonly (number | null)[];
  /** What limits each row: a joint name, "rated payload", or null (out of reach). */
  readonly limit: readonly (string | null)[];
}

export interface CompareArmSummary {
  readonly id: string;
  readonly maker: string;
  readonly model: string;
  readonly name: string;
  readonly class: string;
  readonly drivenAxes: number;
  readonly declared: {
    readonly ratedPayloadKg: number;
    readonly reachMm: number | null;
    readonly repeatabilityMm: number;
    readonly massKg: number | null;
    readonly protection: string | null;
    readonly mountings: readonly string[];
    readonly listPrice: number | null;
    readonly currency: string | null;
    readonly source: string;
    /** Declared base footprint [width, depth], mm. */
    readonly footprintMm: readonly [number, number] | null;
    /** Declared ISO 9283 pose repeatability with its test load and speed (declaredPerformance). */
    readonly poseRepeatability: DeclaredValue | null;
  };
  readonly reach: {
    readonly basis: string;
    readonly computedMm: number | null;
    readonly flangeMaxMm: number | null;
    readonly maxHeightMm: number | null;
    readonly minHeightMm: number | null;
  };
  readonly envelope: {
    readonly layout: string;
    readonly wcp: readonly PolygonData[] | null;
    readonly flange: readonly PolygonData[];
    readonly wcpAreaM2: number | null;
    readonly flangeAreaM2: number | null;
  };
  readonly payload: {
    readonly basis: string;
    /** CG offsets along the tool axis the rows hold, mm, ascending. */
    readonly offsetsMm: readonly number[];
    readonly series: readonly ComparePayloadSeries[];
  };
  readonly speed: {
    readonly maxToolSpeedMmPerS: number | null;
    /** Mounting the maps were computed for (gravity of "down"). */
    readonly mapMounting: string;
    readonly maps: readonly CompareSpeedMap[];
  };
  readonly cycle: {
    readonly standardCycleS: number | null;
    readonly limitingJoint: string | null;
    readonly reason: string | null;
  };
  /** The capability map's headline figures; null for arms without a map (capabilityReason says why). */
  readonly capability: {
    readonly areaShareAtLeastHalf: number | null;
    readonly meanShare: number | null;
    readonly directions: number;
  } | null;
  readonly capabilityReason: string | null;
}

const mm = (v: number) => Math.round(v) + 0;

function simplifyPolygons(
  polygons: readonly { outer: readonly PointData[]; holes: readonly (readonly PointData[])[] }[],
): PolygonData[] {
  const ring = (r: readonly PointData[]): PointData[] => {
    const s = simplifyRing(r, COMPARE_ENVELOPE_TOLERANCE_MM).map((p) => [mm(p[0]), mm(p[1])] as const);
    return s.length > 0 ? [...s, s[0]!] : s;
  };
  return polygons
    .map((p) => ({ outer: ring(p.outer), holes: p.holes.map(ring).filter((h) => h.length >= 4) }))
    .filter((p) => p.outer.length >= 4);
}

function payloadSeries(rows: ArmAnalysis["payload"]["atReach"]): ComparePayloadSeries[] {
  const keys = [...new Set(rows.map((r) => `${r.mounting}|${r.offsetMm}`))];
  return keys.map((key) => {
    const [mounting = "", offset = "0"] = key.split("|");
    const own = rows
      .filter((r) => r.mounting === mounting && r.offsetMm === Number(offset))
      .sort((p, q) => p.reachMm - q.reachMm);
    return {
      mounting,
      offsetMm: Number(offset),
      reachMm: own.map((r) => r.reachMm),
      // Rounded down to the gram: a rounded table never promises more than the analysis.
      payloadKg: own.map((r) =>
        r.limitedBy === "unreachable" ? null : Math.floor(r.payloadKg * 1000 + 1e-9) / 1000 + 0,
      ),
      limit: own.map((r) =>
        r.limitedBy === "unreachable"
          ? null
          : (r.limitingJoint ?? (r.limitedBy === "rated-payload" ? "rated payload" : r.limitedBy)),
      ),
    };
  });
}

type MapJson = ArmAnalysis["speed"]["maps"][number];

/** The compact form of one speed map (see the module comment). */
export function compactSpeedMap(map: MapJson, blockTargetMm = COMPARE_SPEED_BLOCK_MM): CompareSpeedMap {
  const g = map.grid;
  const values = map.guaranteedMmPerS as readonly (number | null)[];
  const reachedRuns: [number, number][][] = [];
  for (let iy = 0; iy < g.ny; iy++) {
    const runs: [number, number][] = [];
    let start = -1;
    for (let ix = 0; ix <= g.nx; ix++) {
      const v = ix < g.nx ? values[ix + iy * g.nx] : null;
      const reached = v !== null && v !== undefined && Number.isFinite(v);
      if (reached && start < 0) start = ix;
      if (!reached && start >= 0) {
        runs.push([start, ix - 1]);
        start = -1;
      }
    }
    reachedRuns.push(runs);
  }
  const per = Math.max(1, Math.ceil(blockTargetMm / g.stepMm));
  const bnx = Math.ceil(g.nx / per),
    bny = Math.ceil(g.ny / per);
  const minMmPerS: (number | null)[] = new Array<number | null>(bnx * bny).fill(null);
  for (let iy = 0; iy < g.ny; iy++) {
    for (let ix = 0; ix < g.nx; ix++) {
      const v = values[ix + iy * g.nx];
      if (v === null || v === undefined || !Number.isFinite(v)) continue;
      const b = Math.floor(ix / per) + Math.floor(iy / per) * bnx;
      const cur = minMmPerS[b];
      const down = Math.floor(v);
      if (cur === null || cur === undefined || down < cur) minMmPerS[b] = down;
    }
  }
  return {
    orientation: map.orientation,
    maxGuaranteedMmPerS: map.maxGuaranteedMmPerS,
    maxToolSpeedMmPerS: map.maxToolSpeedMmPerS,
    shareAtLeast: map.shareAtLeast,
    nodes: { nx: g.nx, ny: g.ny, rMinMm: g.rMinMm, zMinMm: g.zMinMm, stepMm: g.stepMm },
    reachedRuns,
    // Node ix sits at rMin + ix·step; block bx holds nodes bx·per … bx·per + per − 1, i.e. [rMin + bx·B, rMin + (bx+1)·B) with B = per·step.
    blocks: { rMinMm: g.rMinMm, zMinMm: g.zMinMm, blockMm: per * g.stepMm, nx: bnx, ny: bny, minMmPerS },
  };
}

/** The summary of one arm for the side-by-side page. */
export function compareSummary(arm: Arm, analysis: ArmAnalysis): CompareArmSummary {
  const s = arm.spec;
  const env = analysis.envelope;
  return {
    id: arm.id,
    maker: s.maker,
    model: s.model,
    name: `${s.maker} ${s.model}`,
    class: s.class,
    drivenAxes: arm.chain.drivenCount,
    declared: {
      ratedPayloadKg: s.ratedPayloadKg,
      reachMm: s.reachMm ?? null,
      repeatabilityMm: s.repeatabilityMm,
      massKg: s.massKg ?? null,
      protection: s.protection ?? null,
      mountings: s.mountings,
      listPrice: s.commercial?.listPrice ?? null,
      currency: s.commercial?.currency ?? null,
      source: `${s.source.document}, ${s.source.revision}, ${s.source.date}`,
      footprintMm: s.footprintMm ?? null,
      poseRepeatability: declaredPoseRepeatability(s),
    },
    reach: {
      basis: analysis.reach.basis,
      computedMm: analysis.reach.wcpMaxMm ?? analysis.reach.flangeMaxMm,
      flangeMaxMm: analysis.reach.flangeMaxMm,
      maxHeightMm: analysis.reach.maxHeightMm,
      minHeightMm: analysis.reach.minHeightMm,
    },
    envelope: {
      layout: env.layout,
      wcp: env.wcp ? simplifyPolygons(env.wcp.side) : null,
      flange: simplifyPolygons(env.flange.side),
      wcpAreaM2: env.wcp ? env.wcp.areaM2 : null,
      flangeAreaM2: env.flange.areaM2,
    },
    payload: {
      basis: analysis.payload.basis,
      offsetsMm: [...new Set(analysis.payload.atReach.map((r) => r.offsetMm))].sort((a, b) => a - b),
      series: payloadSeries(analysis.payload.atReach),
    },
    speed: {
      maxToolSpeedMmPerS: analysis.speed.maxToolSpeedMmPerS,
      mapMounting: s.mountings[0] ?? "floor",
      maps: analysis.speed.maps.map((m) => compactSpeedMap(m)),
    },
    cycle: {
      standardCycleS: analysis.cycle.standardCycleS,
      limitingJoint: analysis.cycle.limitingJoint,
      reason: "reason" in analysis.cycle && typeof analysis.cycle.reason === "string" ? analysis.cycle.reason : null,
    },
    capability: analysis.capability
      ? {
          areaShareAtLeastHalf: analysis.capability.areaShareAtLeastHalf,
          meanShare: analysis.capability.meanShare,
          directions: analysis.capability.directions,
        }
      : null,
    capabilityReason: analysis.capabilityReason,
  };
}
