/**
 * The output contract of one arm's analysis: what `analyseArm` returns, what the cache stores as JSON and what
 * every page, download and command reads. Plain JSON data: numbers rounded to the resolution the figures carry,
 * lengths in mm, speeds in mm/s, areas in m², volumes in m³, angles in rad only where the name says so.
 *
 * The catalog reads cached analyses back through a zod schema of this shape (src/catalog/analysisSchema.ts); a test
 * checks that the two agree in both directions.
 */
import type { EnvelopeLayout, EnvelopeOptions, PointEnvelope, Axis1 } from "./envelope/envelope";
import type { PayloadAnalysis, PayloadAnalysisOptions } from "./payload";
import type { CycleResult } from "./cycle/cycle";
import type { ReferenceOrientation, SpeedMapOptions } from "./speedMap/speedMap";
import type { AnalysisWarning } from "./warnings";
import type { StandardLines } from "./standardLines/standardLines";
import type { CapabilityJson, CapabilityOverrides } from "./capability/json";
import type { CapabilityReason } from "./capability/types";

export type { CapabilityJson, CapabilityOverrides, CapabilityReason };

/** What an analysis ran with; published analyses use DEFAULT_ANALYSIS (analyseArm.ts). */
export interface AnalysisOptions {
  readonly mapStepMm: number;
  readonly seed: number;
  /** Overrides of the envelope options (a coarser envelope for property tests); absent from published analyses. */
  readonly envelope?: Partial<EnvelopeOptions> | undefined;
  /** Overrides of the payload options (a coarser posture search for property tests); absent from published analyses. */
  readonly payload?: Partial<PayloadAnalysisOptions> | undefined;
  /** Overrides of the speed-map options (closed form on or off, for comparisons); absent from published analyses. */
  readonly speedMap?: Partial<Pick<SpeedMapOptions, "closedForm" | "discoverEveryCell">> | undefined;
  /** Overrides of the capability-map options (a coarser map for property tests); absent from published analyses. */
  readonly capability?: CapabilityOverrides | undefined;
}

/** Regular side-view grid: value(ix, iy) at ix + iy·nx; node (ix, iy) at (rMinMm + ix·stepMm, zMinMm + iy·stepMm). */
export interface MapGrid {
  readonly nx: number;
  readonly ny: number;
  readonly rMinMm: number;
  readonly zMinMm: number;
  readonly stepMm: number;
}

/** Share of reachable cells whose guaranteed straight-line speed is at least the key (m/s: "0.5", "1", "2"). */
export type SpeedShares = Readonly<Record<string, number>>;

export interface PolygonJson {
  readonly outer: readonly (readonly [number, number])[];
  readonly holes: readonly (readonly (readonly [number, number])[])[];
}

/** A point's envelope: polygons rounded to 0.1 mm; `areaM2` = `sideAreaM2` rounded to 1e-4 (the contract name). */
export interface PointEnvelopeJson extends Omit<PointEnvelope, "side" | "top"> {
  readonly side: readonly PolygonJson[];
  readonly top: readonly PolygonJson[];
  readonly areaM2: number | null;
}

/** One reference orientation's tool-speed map, as published (every k-th node of the computed grid). */
export interface SpeedMapJson {
  readonly orientation: ReferenceOrientation;
  /** The grid the map was computed on. */
  readonly computedGrid: MapGrid;
  /** The grid of the arrays below. */
  readonly grid: MapGrid;
  readonly reachableCells: number;
  readonly maxGuaranteedMmPerS: number | null;
  readonly maxToolSpeedMmPerS: number | null;
  readonly shareAtLeast: SpeedShares;
  /** Names of the IK branches `branch` indexes. */
  readonly branchNames: readonly string[];
  /** Row-major over `grid`; null where the pose cannot be reached. Guaranteed straight-line speed, mm/s (0.1). */
  readonly guaranteedMmPerS: readonly (number | null)[];
  /** Largest tool speed over the joint-rate box, mm/s (0.1). */
  readonly maxMmPerS: readonly (number | null)[];
  /** σ_min/σ_max of the scaled Jacobian (0.001). */
  readonly inverseCondition: readonly (number | null)[];
  /** Sign of det J of the kept solution (0 where unreachable or not square). */
  readonly detSign: readonly number[];
  /** Index into branchNames; −1 where unreachable. */
  readonly branch: readonly number[];
}

/** A singularity locus in one map's side view: polylines of (r, z) in mm (0.1). */
export interface LocusJson {
  readonly kind: "wrist" | "shoulder" | "elbow" | "other";
  readonly orientation: ReferenceOrientation;
  readonly polylinesMm: readonly (readonly (readonly [number | null, number | null])[])[];
}

export interface ArmAnalysis {
  readonly id: string;
  /** sha256 of the arm file's canonical JSON. */
  readonly specHash: string;
  readonly analysisVersion: string;
  /** The options the analysis ran with (published analyses: the defaults). */
  readonly options: AnalysisOptions;
  readonly reach: {
    readonly wcpMaxMm: number | null;
    readonly wcpMinMm: number | null;
    readonly flangeMaxMm: number | null;
    readonly flangeMinMm: number | null;
    readonly maxHeightMm: number | null;
    readonly minHeightMm: number | null;
    /** The reach the arm file states, mm; null when it states none. */
    readonly statedMm: number | null;
    /** Which point the computed reach is of, in words. */
    readonly basis: string;
  };
  readonly envelope: {
    readonly layout: EnvelopeLayout;
    readonly sideAxes: readonly [string, string];
    readonly topAxes: readonly [string, string];
    readonly axis1: Axis1 | null;
    /** Null for arms without a wrist centre point. */
    readonly wcp: PointEnvelopeJson | null;
    readonly flange: PointEnvelopeJson;
    readonly notes: readonly string[];
  };
  readonly speed: {
    /** Largest tool speed over both maps, mm/s. */
    readonly maxToolSpeedMmPerS: number | null;
    /** Shares of the "down" map. */
    readonly shareAtLeast: SpeedShares;
    readonly shareBasis: string;
    readonly redundancy: string | null;
    readonly tcp: string;
    readonly maps: readonly SpeedMapJson[];
  };
  readonly singularities: {
    readonly lengthScaleMm: number | null;
    readonly proximity: string;
    readonly loci: readonly LocusJson[];
    readonly notes: readonly string[];
  };
  readonly payload: PayloadAnalysis;
  readonly cycle: CycleResult & { readonly lateralShiftMm?: number };
  /** The sheet's standard straight lines, chosen from the tool-down map and checked at build time. */
  readonly standardLines: StandardLines;
  /**
   * Capability (orientation) map of the flange centre over the side view: per node, the share of tool directions
   * reached (analysis/capability). Null for arms whose tool axis cannot turn or that have no axis 1.
   */
  readonly capability: CapabilityJson | null;
  /** Why `capability` is null (a code the view words); null when there is a map. */
  readonly capabilityReason: CapabilityReason | null;
  readonly warnings: readonly AnalysisWarning[];
}
