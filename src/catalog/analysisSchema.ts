/**
 * The analysis output contract as a zod schema: every analysis and summary read back from the cache passes through
 * it, so a stale, truncated or hand-edited cache entry is recomputed instead of reaching a page as a cast.
 *
 * The TypeScript type of an analysis is `ArmAnalysis` in the core (src/core/analysis/armAnalysis.ts: the core uses
 * no zod); `test/catalog/analysisSchema.test.ts` checks that the two agree in both directions and that every demo
 * arm's fresh analysis passes.
 */
import { z } from "zod";
import type { AnalysisOptions, AnalysisWarning, ArmAnalysis, PayloadAnalysis, StandardLines } from "../core";

const num = z.number();
const numOrNull = z.number().nullable();
/**
 * An array of numbers (or null where `nullable`), checked in one loop: the map arrays hold up to 10⁵ values, and a
 * per-element schema made reading a large arm's analysis about 10× slower.
 */
const finiteNumbers = z.custom<number[]>(
  (v) => Array.isArray(v) && v.every((x) => typeof x === "number" && Number.isFinite(x)),
  { message: "expected an array of finite numbers" },
);
const finiteNumbersOrNull = z.custom<(number | null)[]>(
  (v) => Array.isArray(v) && v.every((x) => x === null || (typeof x === "number" && Number.isFinite(x))),
  { message: "expected an array of finite numbers or null" },
);
const point2 = z.tuple([num, num]);
const point3 = z.tuple([num, num, num]);
const ring = z.array(point2);
const polygon = z.strictObject({ outer: ring, holes: z.array(ring) });

const grid = z.strictObject({
  nx: z.int().nonnegative(),
  ny: z.int().nonnegative(),
  rMinMm: num,
  zMinMm: num,
  stepMm: num,
});

const shares = z.record(z.string(), num);

const pointEnvelope = z.strictObject({
  point: z.enum(["wcp", "flange"]),
  side: z.array(polygon),
  top: z.array(polygon),
  maxReachMm: num,
  minReachMm: num,
  maxHeightMm: num,
  minHeightMm: num,
  sideAreaM2: num,
  topAreaM2: num,
  volumeM3: numOrNull,
  targetToleranceMm: num,
  toleranceMm: num,
  samples: num,
  areaM2: numOrNull,
});

const envelopeLayout = z.enum(["revolute-base", "prismatic-base", "base-frame"]);
const axis1 = z.strictObject({ pointMm: point3, direction: point3, forward: point3, sweepRad: point2 });

const speedMap = z.strictObject({
  orientation: z.enum(["down", "outward"]),
  computedGrid: grid,
  grid,
  reachableCells: z.int().nonnegative(),
  maxGuaranteedMmPerS: numOrNull,
  maxToolSpeedMmPerS: numOrNull,
  shareAtLeast: shares,
  branchNames: z.array(z.string()),
  guaranteedMmPerS: finiteNumbersOrNull,
  maxMmPerS: finiteNumbersOrNull,
  inverseCondition: finiteNumbersOrNull,
  detSign: finiteNumbers,
  branch: finiteNumbers,
});

const locus = z.strictObject({
  kind: z.enum(["wrist", "shoulder", "elbow", "other"]),
  orientation: z.enum(["down", "outward"]),
  polylinesMm: z.array(z.array(z.tuple([numOrNull, numOrNull]))),
});

/** A warning: a code and the numbers its sentence is made from (the view layer writes the sentence). */
export const analysisWarningSchema: z.ZodType<AnalysisWarning> = z.discriminatedUnion("code", [
  z.strictObject({
    code: z.literal("stated-reach-mismatch"),
    statedMm: num,
    computedMm: num,
    basis: z.enum(["wrist centre", "flange"]),
    deviationPercent: num,
    unitsSuspect: z.boolean(),
  }),
  z.strictObject({ code: z.literal("repeatability-implausible"), repeatabilityMm: num, minMm: num, maxMm: num }),
  z.strictObject({
    code: z.literal("cycle-not-computed"),
    reason: z.enum(["start-unreachable", "point-unreachable", "no-location"]),
    point: z.string().nullable(),
    rMm: numOrNull,
  }),
  z.strictObject({
    code: z.literal("payload-above-wrist-rating"),
    kind: z.enum(["moment", "inertia"]),
    joint: z.string(),
    ratedPayloadKg: num,
    allowedKg: num,
    rating: num,
    leverMm: num,
  }),
]);

const cycleMove = z.strictObject({ from: z.string(), to: z.string(), timeS: num, limitingJoint: z.string() });

const cycle = z.strictObject({
  standardCycleS: numOrNull,
  limitingJoint: z.string().nullable(),
  location: z.strictObject({ rMm: num, zMm: num }).nullable(),
  moves: z.array(cycleMove),
  assumptions: z.array(z.string()),
  /** Where the across move had to run to one side of the side plane, mm along base y. */
  lateralShiftMm: num.optional(),
  /** Why there is no cycle time (absent when there is one). */
  failure: z
    .strictObject({
      reason: z.enum(["start-unreachable", "point-unreachable", "no-location"]),
      point: z.string().nullable(),
    })
    .optional(),
});

const payloadRow = z.looseObject({
  mounting: z.string(),
  reachMm: num,
  payloadKg: num,
  limitedBy: z.enum(["joint-rating", "own-weight", "rated-payload", "as-rated", "unreachable"]),
});

const payloadShape = z.looseObject({
  basis: z.string(),
  statement: z.string(),
  atReach: z.array(payloadRow),
  atReachDetail: z.looseObject({ mountings: z.array(z.looseObject({ mounting: z.string() })) }),
  loadDiagram: z.looseObject({ ratedPayloadKg: num, curves: z.array(z.looseObject({ massKg: num })) }),
  warnings: z.array(z.unknown()),
});
/** The payload section: its key fields checked (rows, mountings, load diagram); the rest typed as the core writes it. */
const payload = z.custom<PayloadAnalysis>((v) => payloadShape.safeParse(v).success, {
  message: "expected the payload section (atReach rows, atReachDetail.mountings, loadDiagram)",
});
const options = z.custom<AnalysisOptions>(
  (v) => z.looseObject({ mapStepMm: z.number().positive(), seed: z.int() }).safeParse(v).success,
  { message: "expected the analysis options { mapStepMm, seed }" },
);

const point3Mm = z.tuple([num, num, num]);
const placement = z.discriminatedUnion("kind", [
  z.strictObject({ kind: z.literal("across"), rMm: num, zMm: num }),
  z.strictObject({ kind: z.literal("radial"), zMm: num }),
  z.strictObject({ kind: z.literal("near-axis1"), dMm: num, zMm: num, closest: z.boolean() }),
  z.strictObject({ kind: z.literal("to-edge"), endMm: num, insideEdgeMm: num, zMm: num }),
  z.strictObject({ kind: z.literal("area-across"), xMm: num, zMm: num }),
  z.strictObject({ kind: z.literal("area-out"), marginMm: num, zMm: num }),
]);
const lineKey = z.enum(["front", "axis1", "edge"]);
/** The line check's report: its key figures checked, the rest typed as the core writes it (it is the JSON
 * `armdex line` prints, validated there by its own tests). */
const lineResultShape = z.looseObject({
  lengthMm: num,
  speedMmPerS: num,
  followed: z.boolean(),
  feasibleConstantSpeedMmPerS: numOrNull,
  commandedSpeedFeasible: z.boolean(),
  jointNames: z.array(z.string()),
  startBranches: z.array(z.looseObject({ followed: z.boolean() })),
  samples: z.array(z.looseObject({ fraction: num, reachable: z.boolean() })),
});
const lineResult = z.custom<StandardLines["lines"][number]["result"]>((v) => lineResultShape.safeParse(v).success, {
  message: "expected a line check report",
});
const standardLineNote = z.discriminatedUnion("code", [
  z.strictObject({ code: z.literal("no-tool-down-region") }),
  z.strictObject({ code: z.literal("region-too-small") }),
  z.strictObject({ code: z.literal("no-top-view") }),
  z.strictObject({
    code: z.literal("too-short"),
    key: lineKey,
    placement: z.enum(["across", "radial", "near-axis1", "to-edge", "area-across", "area-out"]),
  }),
  z.strictObject({ code: z.literal("no-line-near-axis1") }),
  z.strictObject({ code: z.literal("no-axis1") }),
]);
const standardLines: z.ZodType<StandardLines> = z.strictObject({
  speedMmPerS: num,
  lines: z.array(
    z.strictObject({
      key: lineKey,
      placement,
      fromMm: point3Mm,
      toMm: point3Mm,
      speedMmPerS: num,
      result: lineResult,
    }),
  ),
  notes: z.array(standardLineNote),
});

/** The capability map: its arrays checked in one loop each; `share` must cover the grid (rows × columns). */
const capability = z
  .strictObject({
    gridMm: z.number().positive(),
    rMm: finiteNumbers,
    zMm: finiteNumbers,
    directions: z.int().positive(),
    share: finiteNumbersOrNull,
    areaShareAtLeastHalf: numOrNull,
    meanShare: numOrNull,
    method: z.enum(["closed-form", "numeric"]),
    rollBasis: z.enum(["last-joint", "solver", "sampled"]),
    rollsTried: z.int().positive(),
  })
  .refine((c) => c.share.length === c.rMm.length * c.zMm.length, {
    message: "expected one share per node (rMm × zMm)",
    path: ["share"],
  });
const capabilityReason = z.enum(["tool-axis-cannot-turn", "no-axis-1"]);
const capabilityHeadline = z.strictObject({
  gridMm: z.number().positive(),
  directions: z.int().positive(),
  areaShareAtLeastHalf: numOrNull,
  meanShare: numOrNull,
});

const reach = z.strictObject({
  wcpMaxMm: numOrNull,
  wcpMinMm: numOrNull,
  flangeMaxMm: numOrNull,
  flangeMinMm: numOrNull,
  maxHeightMm: numOrNull,
  minHeightMm: numOrNull,
  statedMm: numOrNull,
  basis: z.string(),
});

export const armAnalysisSchema: z.ZodType<ArmAnalysis> = z.strictObject({
  id: z.string(),
  specHash: z.string(),
  analysisVersion: z.string(),
  options,
  reach,
  envelope: z.strictObject({
    layout: envelopeLayout,
    sideAxes: z.tuple([z.string(), z.string()]),
    topAxes: z.tuple([z.string(), z.string()]),
    axis1: axis1.nullable(),
    wcp: pointEnvelope.nullable(),
    flange: pointEnvelope,
    notes: z.array(z.string()),
  }),
  speed: z.strictObject({
    maxToolSpeedMmPerS: numOrNull,
    shareAtLeast: shares,
    shareBasis: z.string(),
    redundancy: z.string().nullable(),
    tcp: z.string(),
    maps: z.array(speedMap),
  }),
  singularities: z.strictObject({
    lengthScaleMm: numOrNull,
    proximity: z.string(),
    loci: z.array(locus),
    notes: z.array(z.string()),
  }),
  payload,
  cycle,
  standardLines,
  capability: capability.nullable(),
  capabilityReason: capabilityReason.nullable(),
  warnings: z.array(analysisWarningSchema),
});

type SpeedMap = ArmAnalysis["speed"]["maps"][number];

/**
 * The part of an analysis that pages listing every arm use: reach, warnings, axis 1 and the flange's top view, the
 * speed figures and the reach maps (the standard lines start from the "tool down" one), the cycle time, the
 * capability headline. The same shape as the analysis (an ArmAnalysis is one), so
 * view functions typed with it take either.
 */
export interface AnalysisSummary {
  readonly id: string;
  readonly specHash: string;
  readonly analysisVersion: ArmAnalysis["analysisVersion"];
  readonly reach: ArmAnalysis["reach"];
  readonly warnings: ArmAnalysis["warnings"];
  readonly envelope: Pick<ArmAnalysis["envelope"], "layout" | "axis1"> & {
    readonly flange: Pick<ArmAnalysis["envelope"]["flange"], "top">;
  };
  readonly speed: Pick<ArmAnalysis["speed"], "maxToolSpeedMmPerS" | "shareAtLeast"> & {
    readonly maps: readonly Pick<
      SpeedMap,
      | "orientation"
      | "grid"
      | "reachableCells"
      | "maxGuaranteedMmPerS"
      | "maxToolSpeedMmPerS"
      | "shareAtLeast"
      | "guaranteedMmPerS"
    >[];
  };
  readonly cycle: Pick<ArmAnalysis["cycle"], "standardCycleS">;
  /** The capability map's headline figures (no per-node shares). */
  readonly capability: Pick<
    NonNullable<ArmAnalysis["capability"]>,
    "gridMm" | "directions" | "areaShareAtLeastHalf" | "meanShare"
  > | null;
  readonly capabilityReason: ArmAnalysis["capabilityReason"];
  /** The standard lines without their check reports (the side-by-side page's default line is the first). */
  readonly standardLines: Omit<StandardLines, "lines"> & {
    readonly lines: readonly Omit<StandardLines["lines"][number], "result">[];
  };
}

/** The summary kept beside each analysis: the fields of the analysis that pages listing every arm read. */
export const analysisSummarySchema: z.ZodType<AnalysisSummary> = z.strictObject({
  id: z.string(),
  specHash: z.string(),
  analysisVersion: z.string(),
  reach,
  warnings: z.array(analysisWarningSchema),
  envelope: z.strictObject({
    layout: envelopeLayout,
    axis1: axis1.nullable(),
    flange: z.strictObject({ top: z.array(polygon) }),
  }),
  speed: z.strictObject({
    maxToolSpeedMmPerS: numOrNull,
    shareAtLeast: shares,
    maps: z.array(
      speedMap.pick({
        orientation: true,
        grid: true,
        reachableCells: true,
        maxGuaranteedMmPerS: true,
        maxToolSpeedMmPerS: true,
        shareAtLeast: true,
        guaranteedMmPerS: true,
      }),
    ),
  }),
  cycle: z.strictObject({ standardCycleS: numOrNull }),
  capability: capabilityHeadline.nullable(),
  capabilityReason: capabilityReason.nullable(),
  standardLines: z.strictObject({
    speedMmPerS: num,
    lines: z.array(z.strictObject({ key: lineKey, placement, fromMm: point3Mm, toMm: point3Mm, speedMmPerS: num })),
    notes: z.array(standardLineNote),
  }),
});
