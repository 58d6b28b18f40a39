/**
 * Analyses of catalog arms, cached on disk by content: the key is the arm's spec hash, the analysis version and
 * the options, so an unchanged arm is never analysed twice and a changed algorithm never reuses old results.
 * Entries are written atomically (temporary file + rename): an interrupted build leaves no half-written entry.
 *
 * Beside each analysis (`<key>.json`, 0.1–2 MB) lies its summary (`<key>.summary.json`, the few figures the catalog
 * table, data/catalog.json and the side-by-side page need), so pages that list every arm never hold every full
 * analysis in memory.
 */
import { createHash } from "node:crypto";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { writeFileAtomic } from "./files";
export { writeFileAtomic } from "./files";
import { fileURLToPath } from "node:url";
import { join, resolve } from "node:path";
import { Worker } from "node:worker_threads";
import { availableParallelism } from "node:os";
import {
  ANALYSIS_VERSION,
  DEFAULT_ANALYSIS,
  analyseArm,
  type AnalysisOptions,
  type ArmAnalysis,
  type ArmFacts,
} from "../core";
import type { Arm } from "./load";
import { analysisSummarySchema, armAnalysisSchema, type AnalysisSummary } from "./analysisSchema";

export function cacheDir(): string {
  return resolve(process.env.ARMDEX_CACHE_DIR ?? "node_modules/.cache/armdex-analyses");
}

export function armFacts(arm: Arm): ArmFacts {
  const s = arm.spec;
  return {
    id: arm.id,
    specHash: arm.specHash,
    reachMm: s.reachMm,
    repeatabilityMm: s.repeatabilityMm,
    ratedPayloadKg: s.ratedPayloadKg,
    mountings: s.mountings,
    wrist: s.wrist,
    links: s.links,
  };
}

const sourceHashes = new Map<string, string>();

/** The project's src/ folder: beside this module when run from source (CLI, tests), else under the working directory
 * (the site build, where this module is bundled). */
function srcDir(): string {
  const beside = fileURLToPath(new URL("../", import.meta.url));
  return existsSync(join(beside, "core", "index.ts")) ? beside : resolve("src");
}

/**
 * sha256 over the TypeScript sources of the named folders of src/ (file names and bytes, in sorted order), e.g.
 * ["view", "charts"]. Memoised per process. A single folder hashes names relative to it (coreFingerprint, as cache
 * keys written before had it).
 */
export function sourceFingerprint(folders: readonly string[]): string {
  const name = folders.join(",");
  const known = sourceHashes.get(name);
  if (known) return known;
  const h = createHash("sha256");
  for (const folder of folders) {
    const root = join(srcDir(), folder);
    const prefix = folders.length === 1 ? "" : `${folder}/`;
    const files = readdirSync(root, { recursive: true, encoding: "utf8" })
      .filter((f) => f.endsWith(".ts"))
      .sort();
    for (const f of files) h.update(`${prefix}${f}\n`).update(readFileSync(join(root, f)));
  }
  const hex = h.digest("hex");
  sourceHashes.set(name, hex);
  return hex;
}

/**
 * sha256 over the sources of the computation core (src/core), so a changed algorithm never reuses a cached result
 * even when ANALYSIS_VERSION was not bumped.
 */
export function coreFingerprint(): string {
  return sourceFingerprint(["core"]);
}

export function analysisKey(arm: Pick<Arm, "specHash">, options: AnalysisOptions = DEFAULT_ANALYSIS): string {
  return createHash("sha256")
    .update(`${arm.specHash}\n${ANALYSIS_VERSION}\n${coreFingerprint()}\n${JSON.stringify(options)}`)
    .digest("hex")
    .slice(0, 32);
}

export type { AnalysisSummary } from "./analysisSchema";

/** The summary of an analysis: a projection, every value as the analysis has it. */
export function summariseAnalysis(a: ArmAnalysis): AnalysisSummary {
  // Every key listed: the summary schema is strict, so a summary never carries more than the pages read.
  return {
    id: a.id,
    specHash: a.specHash,
    analysisVersion: a.analysisVersion,
    reach: a.reach,
    warnings: a.warnings,
    envelope: { layout: a.envelope.layout, axis1: a.envelope.axis1, flange: { top: a.envelope.flange.top } },
    speed: {
      maxToolSpeedMmPerS: a.speed.maxToolSpeedMmPerS,
      shareAtLeast: a.speed.shareAtLeast,
      maps: a.speed.maps.map((m) => ({
        orientation: m.orientation,
        grid: m.grid,
        reachableCells: m.reachableCells,
        maxGuaranteedMmPerS: m.maxGuaranteedMmPerS,
        maxToolSpeedMmPerS: m.maxToolSpeedMmPerS,
        shareAtLeast: m.shareAtLeast,
        guaranteedMmPerS: m.guaranteedMmPerS,
      })),
    },
    cycle: { standardCycleS: a.cycle.standardCycleS },
    capability: a.capability
      ? {
          gridMm: a.capability.gridMm,
          directions: a.capability.directions,
          areaShareAtLeastHalf: a.capability.areaShareAtLeastHalf,
          meanShare: a.capability.meanShare,
        }
      : null,
    capabilityReason: a.capabilityReason,
    standardLines: {
      speedMmPerS: a.standardLines.speedMmPerS,
      lines: a.standardLines.lines.map(({ key, placement, fromMm, toMm, speedMmPerS }) => ({
        key,
        placement,
        fromMm,
        toMm,
        speedMmPerS,
      })),
      notes: a.standardLines.notes,
    },
  };
}

function entryPath(arm: Pick<Arm, "specHash">, options: AnalysisOptions, suffix: "" | ".summary"): string {
  return join(cacheDir(), `${analysisKey(arm, options)}${suffix}.json`);
}

const belongsTo = (data: { specHash?: unknown; analysisVersion?: unknown } | null, arm: Pick<Arm, "specHash">) =>
  data !== null &&
  typeof data === "object" &&
  data.specHash === arm.specHash &&
  data.analysisVersion === ANALYSIS_VERSION;

/**
 * The cached analysis of an arm as the cache file's text (the JSON `armdex analyze` prints), without parsing it;
 * null when there is none.
 */
export async function readCachedAnalysisText(
  arm: Arm,
  options: AnalysisOptions = DEFAULT_ANALYSIS,
): Promise<string | null> {
  try {
    return await readFile(entryPath(arm, options, ""), "utf8");
  } catch {
    return null;
  }
}

export async function readCachedAnalysis(
  arm: Arm,
  options: AnalysisOptions = DEFAULT_ANALYSIS,
): Promise<ArmAnalysis | null> {
  try {
    const parsed = armAnalysisSchema.safeParse(JSON.parse(await readFile(entryPath(arm, options, ""), "utf8")));
    return parsed.success && belongsTo(parsed.data, arm) ? parsed.data : null;
  } catch {
    return null;
  }
}

/** The cached summary of an arm's analysis; null when there is none or it is unreadable (it is then rebuilt). */
export async function readCachedSummary(
  arm: Pick<Arm, "specHash">,
  options: AnalysisOptions = DEFAULT_ANALYSIS,
): Promise<AnalysisSummary | null> {
  try {
    const parsed = analysisSummarySchema.safeParse(
      JSON.parse(await readFile(entryPath(arm, options, ".summary"), "utf8")),
    );
    return parsed.success && belongsTo(parsed.data, arm) ? parsed.data : null;
  } catch {
    return null;
  }
}

export async function writeCachedAnalysis(
  arm: Arm,
  analysis: ArmAnalysis,
  options: AnalysisOptions = DEFAULT_ANALYSIS,
): Promise<void> {
  // The analysis first: a summary on disk means its analysis is there too.
  await writeFileAtomic(entryPath(arm, options, ""), JSON.stringify(analysis));
  await writeFileAtomic(entryPath(arm, options, ".summary"), JSON.stringify(summariseAnalysis(analysis)));
}

/**
 * The summary of one arm's analysis: from the cache; else made from the cached analysis (and cached), else from a
 * new analysis (as getAnalysis).
 */
export async function getAnalysisSummary(
  arm: Arm,
  options: AnalysisOptions = DEFAULT_ANALYSIS,
): Promise<AnalysisSummary> {
  const cached = await readCachedSummary(arm, options);
  if (cached) return cached;
  const analysis = await getAnalysis(arm, options);
  const text = JSON.stringify(summariseAnalysis(analysis));
  await writeFileAtomic(entryPath(arm, options, ".summary"), text);
  return analysisSummarySchema.parse(JSON.parse(text));
}

/** The analysis of one arm: from the cache, or computed here (and cached). */
export async function getAnalysis(arm: Arm, options: AnalysisOptions = DEFAULT_ANALYSIS): Promise<ArmAnalysis> {
  const cached = await readCachedAnalysis(arm, options);
  if (cached) return cached;
  const analysis = analyseArm(arm.chain, armFacts(arm), options);
  await writeCachedAnalysis(arm, analysis, options);
  // As a reader of the cache would see it (JSON numbers, no typed arrays), and checked against the contract.
  return armAnalysisSchema.parse(JSON.parse(JSON.stringify(analysis)));
}

async function summaryFromAnalysis(arm: Arm): Promise<boolean> {
  const analysis = await readCachedAnalysis(arm);
  if (!analysis) return false;
  await writeFileAtomic(entryPath(arm, DEFAULT_ANALYSIS, ".summary"), JSON.stringify(summariseAnalysis(analysis)));
  return true;
}

export interface AnalyseAllReport {
  readonly analysed: readonly { readonly id: string; readonly ms: number }[];
  readonly cached: readonly string[];
}

/**
 * Makes sure every arm has a cache entry, analysing the missing ones in parallel worker threads
 * (one per core, at most `workers`).
 */
export async function analyseCatalog(
  arms: readonly Arm[],
  options: { workers?: number; log?: (line: string) => void } = {},
): Promise<AnalyseAllReport> {
  const missing: Arm[] = [];
  const cached: string[] = [];
  // A readable summary stands for its analysis (written first); an arm with an analysis but no summary gets one
  // here, from the analysis. Neither parses every full analysis.
  for (const arm of arms) {
    if (
      (await readCachedSummary(arm)) ||
      (existsSync(entryPath(arm, DEFAULT_ANALYSIS, "")) && (await summaryFromAnalysis(arm)))
    )
      cached.push(arm.id);
    else missing.push(arm);
  }
  const analysed: { id: string; ms: number }[] = [];
  const count = Math.max(1, Math.min(options.workers ?? availableParallelism(), missing.length));
  let next = 0;
  const runWorker = async () => {
    if (next >= missing.length) return;
    const worker = new Worker(new URL("./analysisWorker.mjs", import.meta.url));
    try {
      while (next < missing.length) {
        const arm = missing[next++]!;
        const result = await new Promise<{ ok: boolean; ms: number; error?: string }>((resolveDone, reject) => {
          const onMessage = (m: { ok: boolean; ms: number; error?: string }) => {
            worker.off("error", onError);
            resolveDone(m);
          };
          const onError = (e: Error) => {
            worker.off("message", onMessage);
            reject(e);
          };
          worker.once("message", onMessage);
          worker.once("error", onError);
          worker.postMessage({ arm });
        });
        if (!result.ok) throw new Error(`analysis of ${arm.id} (${arm.file}) failed: ${result.error}`);
        analysed.push({ id: arm.id, ms: result.ms });
        options.log?.(`analysed ${arm.id} in ${(result.ms / 1000).toFixed(2)} s`);
      }
    } finally {
      await worker.terminate();
    }
  };
  await Promise.all(Array.from({ length: count }, runWorker));
  return { analysed, cached };
}
