/**
 * The whole build-time analysis of one arm: (chain, arm facts, options) → plain JSON-ready data.
 * Bump ANALYSIS_VERSION with every change under src/core/analysis or src/core/kinematics: cache entries are keyed
 * by it.
 */
import type { Chain } from "../kinematics/chain";
import { mToMm, STANDARD_GRAVITY_M_PER_S2 } from "../units";
import {
  createSpeedMapWorkspace,
  DEFAULT_SPEED_MAP,
  referenceOrientations,
  toolSpeedMap,
  type ReferenceOrientation,
  type SpeedMapOptions,
  type ToolSpeedMap,
} from "./speedMap/speedMap";
import { gravityDirectionInBase, type Mounting } from "../kinematics/statics";
import { analysePayload, payloadInputOf, type PayloadSpec, type PayloadWarning } from "./payload";
import type { AnalysisOptions, ArmAnalysis, PointEnvelopeJson, SpeedMapJson } from "./armAnalysis";
import { reachWarning, repeatabilityWarning, type AnalysisWarning, type PayloadAboveWristRating } from "./warnings";
import { standardCycle } from "./cycle/cycle";
import { standardLines } from "./standardLines/standardLines";
import { referenceAxesInto } from "../kinematics/toolOrientation";
import { capabilityJson } from "./capability/json";

const BASE_X = [1, 0, 0] as const;
import {
  DEFAULT_ENVELOPE_OPTIONS,
  workspaceEnvelope,
  type PointEnvelope,
  type PolygonMm,
  type WorkspaceEnvelope,
} from "./envelope/envelope";

export const ANALYSIS_VERSION = "9";

/** Arm facts the analysis needs besides the chain (plain types; the catalog fills them from the arm file). */
export interface ArmFacts extends PayloadSpec {
  readonly id: string;
  readonly specHash: string;
  readonly reachMm?: number | undefined;
  readonly repeatabilityMm: number;
  readonly mountings: readonly Mounting[];
}

export type { AnalysisOptions } from "./armAnalysis";

export const DEFAULT_ANALYSIS: AnalysisOptions = { mapStepMm: 10, seed: 20261202 };

/** Share thresholds of the guaranteed straight-line speed, m/s (the JSON keys). */
export const SPEED_SHARE_THRESHOLDS_M_PER_S = ["0.5", "1", "2"] as const;

export type { AnalysisWarning } from "./warnings";

/** A payload plausibility warning as codes and numbers; the lever follows from the rating and the allowed mass. */
function payloadWarning(w: PayloadWarning, facts: ArmFacts): PayloadAboveWristRating {
  const kind = w.code === "rated-payload-beyond-wrist-moment" ? "moment" : "inertia";
  const rating =
    kind === "moment" ? (facts.wrist?.momentNm?.[w.joint] ?? NaN) : (facts.wrist?.inertiaKgM2?.[w.joint] ?? NaN);
  // M = m·g·L and J = m·L² at the allowed mass m (payload.ts payloadWarnings).
  const leverM =
    kind === "moment" ? rating / (STANDARD_GRAVITY_M_PER_S2 * w.allowedKg) : Math.sqrt(rating / w.allowedKg);
  return {
    code: "payload-above-wrist-rating",
    kind,
    joint: w.joint,
    ratedPayloadKg: w.ratedPayloadKg,
    allowedKg: Math.round(w.allowedKg * 1000) / 1000,
    rating,
    leverMm: Math.round(leverM * 10000) / 10,
  };
}

const round = (x: number, decimals: number) => (Number.isFinite(x) ? Number(x.toFixed(decimals)) + 0 : null);
/**
 * round() for the per-cell map arrays (hundreds of thousands of values: toFixed is the slow part of writing them):
 * the nearest multiple of 10^−decimals by Math.round on the scaled value. It can differ from toFixed by one unit
 * in the last place kept, where the scaled value lands on a half by rounding.
 */
const roundCell = (x: number, scale: number) => (Number.isFinite(x) ? Math.round(x * scale) / scale + 0 : null);

function shareAtLeast(map: ToolSpeedMap): Record<string, number> {
  const out: Record<string, number> = {};
  for (const key of SPEED_SHARE_THRESHOLDS_M_PER_S) {
    const limitMmPerS = Number(key) * 1000;
    let hit = 0;
    for (const g of map.guaranteedMmPerS) if (g >= limitMmPerS) hit++;
    out[key] = map.reachableCells > 0 ? (round(hit / map.reachableCells, 4) ?? 0) : 0;
  }
  return out;
}

/** Largest number of columns a map keeps in the JSON output (the figures use the full grid). */
export const MAX_OUTPUT_COLUMNS = 160;

function mapJson(map: ToolSpeedMap): SpeedMapJson {
  let maxG = 0,
    maxV = 0;
  for (let i = 0; i < map.guaranteedMmPerS.length; i++) {
    if (map.guaranteedMmPerS[i]! > maxG) maxG = map.guaranteedMmPerS[i]!;
    if (map.maxMmPerS[i]! > maxV) maxV = map.maxMmPerS[i]!;
  }
  // Output grid: every k-th node of the computation grid (values at those nodes, not averages).
  const g = map.grid;
  const k = Math.max(1, Math.ceil(g.nx / MAX_OUTPUT_COLUMNS));
  const nx = Math.ceil(g.nx / k),
    ny = Math.ceil(g.ny / k);
  const pick = <T>(values: ArrayLike<number>, f: (v: number) => T): T[] => {
    const out: T[] = [];
    for (let iy = 0; iy < ny; iy++) for (let ix = 0; ix < nx; ix++) out.push(f(values[ix * k + iy * k * g.nx]!));
    return out;
  };
  return {
    orientation: map.orientation,
    computedGrid: g,
    grid: { nx, ny, rMinMm: g.rMinMm, zMinMm: g.zMinMm, stepMm: g.stepMm * k },
    reachableCells: map.reachableCells,
    maxGuaranteedMmPerS: round(maxG, 1),
    maxToolSpeedMmPerS: round(maxV, 1),
    shareAtLeast: shareAtLeast(map),
    branchNames: map.branchNames,
    /** Row-major over `grid` (value(ix, iy) at ix + iy·nx); null where the pose cannot be reached. */
    guaranteedMmPerS: pick(map.guaranteedMmPerS, (v) => roundCell(v, 1)),
    maxMmPerS: pick(map.maxMmPerS, (v) => roundCell(v, 1)),
    inverseCondition: pick(map.inverseCondition, (v) => roundCell(v, 1000)),
    detSign: pick(map.detSign, (v) => v),
    branch: pick(map.branch, (v) => v),
  };
}

/**
 * Runs every analysis of one arm.
 * @returns plain data, serialisable as it stands; numbers rounded to the resolution the figures carry
 */
export function analyseArm(chain: Chain, facts: ArmFacts, options: AnalysisOptions = DEFAULT_ANALYSIS): ArmAnalysis {
  const warnings: AnalysisWarning[] = [];
  const primary: Mounting = facts.mountings[0] ?? "floor";
  const gravity = gravityDirectionInBase(primary);

  // 1. Envelope.
  const envelope: WorkspaceEnvelope = workspaceEnvelope(chain, { ...DEFAULT_ENVELOPE_OPTIONS, ...options.envelope });
  const wcp = envelope.wcp;
  const flange = envelope.flange;
  if (!flange) throw new RangeError("invalid envelope: the flange envelope is required");

  // 2–3. Speed maps and singularity loci, per reference orientation.
  const mapOptions: SpeedMapOptions = {
    ...DEFAULT_SPEED_MAP,
    stepMm: options.mapStepMm,
    gravity,
    seed: options.seed,
    // The JSON keeps every k-th node (mapJson): the inverse condition is computed on those only.
    conditionMaxColumns: MAX_OUTPUT_COLUMNS,
    boundsMm: {
      rMax: flange.maxReachMm + 2 * options.mapStepMm,
      zMin: flange.minHeightMm - 2 * options.mapStepMm,
      zMax: flange.maxHeightMm + 2 * options.mapStepMm,
    },
    ...options.speedMap,
  };
  const workspace = createSpeedMapWorkspace();
  const maps = referenceOrientations(chain).map((o: ReferenceOrientation) =>
    toolSpeedMap(chain, o, mapOptions, workspace),
  );
  const down = maps[0]!;
  let maxTool = 0;
  for (const map of maps) for (const v of map.maxMmPerS) if (v > maxTool) maxTool = v;
  const loci = maps.flatMap((map) =>
    map.loci.map((l) => ({
      kind: l.kind,
      orientation: map.orientation,
      polylinesMm: l.polylinesMm.map((p) =>
        p.map(([r, z]): [number | null, number | null] => [round(r, 1), round(z, 1)]),
      ),
    })),
  );

  // 4. Payload.
  const payload = analysePayload(chain, payloadInputOf(facts, chain), options.payload ?? {});
  for (const w of payload.warnings) warnings.push(payloadWarning(w, facts));

  // 5. Cycle: at 60 % of the flange reach, at the height of the best guaranteed speed in the "down" map there.
  const cycle = cycleAt(chain, down, facts, gravity);

  // 6. Standard lines, chosen from the published tool-down map and envelope (as the sheets show them).
  const mapsJson = maps.map(mapJson);
  const flangeJson = pointEnvelopeJson(flange);
  const downJson = mapsJson.find((m) => m.orientation === "down") ?? null;
  const lines = standardLines(
    chain,
    {
      downMap: downJson,
      flangeMaxMm: round(flange.maxReachMm, 1),
      layout: envelope.layout,
      axis1: envelope.axis1,
      flangeTopMm: flangeJson.top.map((p) => p.outer),
    },
    gravity,
  );

  // 7. Capability map: the share of tool directions reached over the side view (flange envelope nodes).
  const { capability, capabilityReason } = capabilityJson(
    chain,
    envelope.layout,
    flange,
    options.seed,
    options.capability,
  );

  // 8. Warnings.
  const computedReachMm = wcp ? wcp.maxReachMm : flange.maxReachMm;
  const reachIssue =
    facts.reachMm === undefined ? null : reachWarning(facts.reachMm, computedReachMm, wcp ? "wrist centre" : "flange");
  if (reachIssue) warnings.push(reachIssue);
  const repeatabilityIssue = repeatabilityWarning(facts.repeatabilityMm);
  if (repeatabilityIssue) warnings.push(repeatabilityIssue);
  if (cycle.failure)
    warnings.push({
      code: "cycle-not-computed",
      reason: cycle.failure.reason,
      point: cycle.failure.point,
      rMm: cycle.location ? Math.round(cycle.location.rMm) : null,
    });

  return {
    id: facts.id,
    specHash: facts.specHash,
    analysisVersion: ANALYSIS_VERSION,
    options,
    reach: {
      wcpMaxMm: wcp ? round(wcp.maxReachMm, 1) : null,
      wcpMinMm: wcp ? round(wcp.minReachMm, 1) : null,
      flangeMaxMm: round(flange.maxReachMm, 1),
      flangeMinMm: round(flange.minReachMm, 1),
      maxHeightMm: round((wcp ?? flange).maxHeightMm, 1),
      minHeightMm: round((wcp ?? flange).minHeightMm, 1),
      statedMm: facts.reachMm ?? null,
      basis: wcp ? "wrist centre point" : "flange centre (the arm has no wrist centre point)",
    },
    envelope: {
      layout: envelope.layout,
      sideAxes: envelope.sideAxes,
      topAxes: envelope.topAxes,
      axis1: envelope.axis1,
      wcp: wcp ? pointEnvelopeJson(wcp) : null,
      flange: flangeJson,
      notes: envelope.notes,
    },
    speed: {
      maxToolSpeedMmPerS: round(maxTool, 0),
      shareAtLeast: shareAtLeast(down),
      shareBasis: `share of the side-view cells (${options.mapStepMm} mm grid) the flange reaches with the tool pointing down`,
      redundancy: chain.drivenCount > 6 ? "minimum-norm joint rates (redundant arm)" : null,
      tcp: "flange centre, no tool",
      maps: mapsJson,
    },
    singularities: {
      lengthScaleMm: round(mToMm(chain.characteristicLengthM), 1),
      proximity: "inverse condition σ_min/σ_max of the Jacobian with linear rows divided by the length scale",
      loci,
      notes:
        chain.drivenCount === 6 || chain.drivenCount === 4
          ? [
              "Loci are the zero crossings of det J followed along continuous inverse-kinematics solutions; singular sets on the edge of the reachable region (arm fully stretched) bound the maps instead.",
            ]
          : ["No det J for this number of driven joints: see the inverse-condition map."],
    },
    payload,
    cycle,
    standardLines: lines,
    capability,
    capabilityReason,
    warnings,
  };
}

export type { ArmAnalysis } from "./armAnalysis";

/** A point envelope for the JSON: polygons rounded to 0.1 mm, `areaM2` = the side-view area (the contract name). */
function pointEnvelopeJson(e: PointEnvelope): PointEnvelopeJson {
  const r1 = (x: number) => Number(x.toFixed(1)) + 0;
  const ring = (r: readonly (readonly [number, number])[]): [number, number][] => r.map((p) => [r1(p[0]), r1(p[1])]);
  const roundRings = (polygons: readonly PolygonMm[]) =>
    polygons.map((poly) => ({ outer: ring(poly.outer), holes: poly.holes.map(ring) }));
  return { ...e, side: roundRings(e.side), top: roundRings(e.top), areaM2: round(e.sideAreaM2, 4) };
}

function cycleAt(chain: Chain, down: ToolSpeedMap, facts: ArmFacts, gravity: readonly number[]) {
  const g = down.grid,
    m = chain.drivenCount;
  const names = Array.from(chain.drivenJoint, (k) => chain.jointNames[k]!);
  // Reference location: the column at 60 % of the largest reached distance from axis 1, at the height with the
  // best guaranteed speed where the point 25 mm up (against gravity) is reached too; when the cycle cannot be
  // completed there (the 300 mm across move leaves the plane), the next best heights and columns are tried, and
  // the across move may run to one side of the plane.
  let rMaxCell = 0;
  for (let i = 0; i < down.branch.length; i++) if (down.branch[i]! >= 0) rMaxCell = Math.max(rMaxCell, i % g.nx);
  const axisCell = -g.rMinMm / g.stepMm;
  const upCells = Math.ceil(25 / g.stepMm) * (gravity[2]! > 0 ? -1 : 1);
  const candidates: { cell: number; speed: number; ix: number; iy: number }[] = [];
  for (const share of [0.6, 0.5, 0.7, 0.4]) {
    const ix = Math.round(axisCell + share * (rMaxCell - axisCell));
    const column: { cell: number; speed: number; ix: number; iy: number }[] = [];
    for (let iy = 0; iy < g.ny; iy++) {
      const up = iy + upCells;
      if (up < 0 || up >= g.ny) continue;
      const cell = ix + iy * g.nx;
      const v = down.guaranteedMmPerS[cell]!;
      if (Number.isFinite(v) && Number.isFinite(down.guaranteedMmPerS[ix + up * g.nx]!))
        column.push({ cell, speed: v, ix, iy });
    }
    // By the speed as published (0.1 mm/s): equal figures (a plateau where one joint's rate limits the speed)
    // keep the scan order, lowest first, so figures a solver tolerance apart choose the same height.
    column.sort((a, b) => Math.round(b.speed * 10) - Math.round(a.speed * 10));
    candidates.push(...column.slice(0, 3));
  }
  // Target: flange along gravity; flange x away from axis 1 (base x made perpendicular to gravity, or base z).
  const pose = (shiftMm: number) => (lateralMm: number, r: number, z: number, upMm: number, out: Float64Array) => {
    const gx = gravity[0]!,
      gy = gravity[1]!,
      gz = gravity[2]!;
    out.fill(0);
    const px = (r - gx * upMm) / 1000,
      py = (lateralMm + shiftMm - gy * upMm) / 1000,
      pz = (z - gz * upMm) / 1000;
    // Tool down, tool x towards base x made perpendicular to gravity.
    referenceAxesInto(out, "down", BASE_X, gravity, 4);
    out[3] = px;
    out[7] = py;
    out[11] = pz;
    out[15] = 1;
    return out;
  };
  void facts;
  let last: ReturnType<typeof standardCycle> | null = null;
  for (const c of candidates.slice(0, 12)) {
    const rMm = g.rMinMm + c.ix * g.stepMm,
      zMm = g.zMinMm + c.iy * g.stepMm;
    const seed = down.joints.subarray(c.cell * m, c.cell * m + m);
    for (const shift of [0, 150, -150]) {
      const result = standardCycle(chain, { rMm, zMm }, seed, pose(shift), {
        upMm: 25,
        acrossMm: 300,
        jointNames: names,
      });
      if (result.standardCycleS !== null) {
        return shift === 0
          ? result
          : {
              ...result,
              assumptions: [
                ...result.assumptions,
                `The across move runs from the side plane to ${shift > 0 ? "+" : "−"}300 mm along base y (the centred move leaves the reach).`,
              ],
              lateralShiftMm: shift,
            };
      }
      last = result;
    }
  }
  return (
    last ?? {
      standardCycleS: null,
      limitingJoint: null,
      location: null,
      moves: [],
      assumptions: [],
      failure: { reason: "no-location", point: null },
    }
  );
}
