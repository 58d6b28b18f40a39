/**
 * The key figures of one revision of an arm, for the "what changed" list of the revisions section: computed reach,
 * maximum tool speed, share of the tool-down side view with a guaranteed line speed of at least 1 m/s, standard
 * cycle and payload at full reach. Each is read from the analysis exactly as the arm sheet's key figures read it
 * (src/view/armAnalysisModel.ts; a test checks the two agree), in the analysis's own units.
 *
 * Cached beside the analysis (`<analysis key>.figures.json`), keyed by the analysis key and FIGURES_VERSION, so a
 * rebuild reads a few bytes per revision instead of the full analysis.
 */
import { readFile } from "node:fs/promises";
import { join } from "node:path";
import type { ArmAnalysis } from "../core";
import { analysisKey, cacheDir, getAnalysis } from "./analysis";
import { writeFileAtomic } from "./files";
import type { Arm } from "./load";

/** Bumped when the figures below are read differently. */
export const FIGURES_VERSION = 1;

export interface RevisionFigures {
  /** Reach of the wrist centre point, else of the flange centre, mm. */
  readonly computedReachMm: number | null;
  readonly reachBasis: "wcp" | "flange";
  readonly maxToolSpeedMmPerS: number | null;
  /** Share (0–1) of the tool-down side view reached where the guaranteed line speed is ≥ 1 m/s; null without map. */
  readonly shareAtLeast1MPerSDown: number | null;
  readonly standardCycleS: number | null;
  /** Payload at the largest reach of the first mounting, CG on the flange centre; null where none is reached. */
  readonly payloadFullReach: { readonly payloadKg: number; readonly reachMm: number; readonly mounting: string } | null;
}

/** The key figures of an analysis (see the module comment); `mountings` is the arm's, the first one counts. */
export function revisionFigures(analysis: ArmAnalysis, mountings: readonly string[]): RevisionFigures {
  const wcp = analysis.reach.wcpMaxMm;
  const down = analysis.speed.maps.find((m) => m.orientation === "down");
  const primary = mountings[0];
  const full = analysis.payload.atReach
    .filter((r) => r.mounting === primary && r.offsetMm === 0 && r.limitedBy !== "unreachable")
    .sort((x, y) => y.reachMm - x.reachMm)[0];
  return {
    computedReachMm: wcp ?? analysis.reach.flangeMaxMm ?? null,
    reachBasis: wcp !== null ? "wcp" : "flange",
    maxToolSpeedMmPerS: analysis.speed.maxToolSpeedMmPerS,
    shareAtLeast1MPerSDown: down?.shareAtLeast["1"] ?? null,
    standardCycleS: analysis.cycle.standardCycleS,
    payloadFullReach: full && primary ? { payloadKg: full.payloadKg, reachMm: full.reachMm, mounting: primary } : null,
  };
}

function figuresPath(arm: Pick<Arm, "specHash">): string {
  return join(cacheDir(), `${analysisKey(arm)}.figures.json`);
}

/** The key figures of an arm's analysis: from the cache, else from the analysis (cached or computed) and cached. */
export async function cachedRevisionFigures(arm: Arm): Promise<RevisionFigures> {
  const path = figuresPath(arm);
  try {
    const entry = JSON.parse(await readFile(path, "utf8")) as {
      version?: unknown;
      specHash?: unknown;
      figures?: unknown;
    };
    if (entry.version === FIGURES_VERSION && entry.specHash === arm.specHash && entry.figures)
      return entry.figures as RevisionFigures;
  } catch {
    // none yet, or unreadable: read the analysis
  }
  const figures = revisionFigures(await getAnalysis(arm), arm.spec.mountings);
  // Shaped like the other cache entries (id, specHash) so tools that list the cache read it as one.
  await writeFileAtomic(
    path,
    JSON.stringify({ id: arm.id, specHash: arm.specHash, version: FIGURES_VERSION, figures }),
  );
  return figures;
}
