/**
 * Cell studies and placement maps of the catalog's cells, cached on disk by content like the analyses
 * (analysis.ts): the key covers the cell file, every candidate arm file, the core's sources and CELL_RESULTS_VERSION,
 * so an unchanged cell is never computed twice and a changed arm or algorithm never reuses an old result. Computed
 * in `armdex prepare`; the pages read them from the cache. Node-only.
 */
import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { join } from "node:path";
import { z } from "zod";
import { cellStudy, placementMap, type CellStudyJson, type PlacementMapJson } from "../core";
import { armFacts, cacheDir, coreFingerprint } from "./analysis";
import { writeFileAtomic } from "./files";
import type { Cell } from "./cell";
import type { Arm } from "./load";

/** Bumped when the cached shape changes without a core change. */
export const CELL_RESULTS_VERSION = "1";

/** Grid spacing of the published placement maps, mm. */
export const PUBLISHED_PLACEMENT_GRID_MM = 50;

export interface CellResults {
  readonly key: string;
  readonly cellId: string;
  readonly cellSpecHash: string;
  /** Spec hash of each candidate arm, by id: the revisions the results were computed from. */
  readonly armSpecHashes: Readonly<Record<string, string>>;
  readonly study: CellStudyJson;
  /** One placement map per candidate, in the cell's candidate order. */
  readonly placements: readonly PlacementMapJson[];
}

// The cached entry is checked for its frame (keys, ids, one map per candidate); the study and map bodies are what
// this module wrote for the same key (content-addressed), so they are not re-validated field by field.
const resultsSchema = z.object({
  key: z.string(),
  cellId: z.string(),
  cellSpecHash: z.string(),
  armSpecHashes: z.record(z.string(), z.string()),
  study: z
    .object({
      cell: z.string(),
      arms: z.array(z.object({ arm: z.string(), verdict: z.enum(["pass", "fail"]) }).loose()),
    })
    .loose(),
  placements: z.array(
    z.object({ arm: z.string(), feasible: z.array(z.array(z.union([z.literal(0), z.literal(1)]))) }).loose(),
  ),
});

/** The candidate arms of a cell, in its order; throws when one is missing (validation makes sure it is not). */
export function candidateArms(cell: Cell, arms: readonly Arm[]): Arm[] {
  return cell.spec.candidates.map((id) => {
    const arm = arms.find((a) => a.id === id);
    if (!arm) throw new Error(`${cell.file}: candidate ${id} is not in the catalog`);
    return arm;
  });
}

export function cellResultsKey(cell: Cell, candidates: readonly Arm[]): string {
  const arms = candidates.map((a) => `${a.id}:${a.specHash}`).join(",");
  return createHash("sha256")
    .update(`${cell.specHash}\n${arms}\n${CELL_RESULTS_VERSION}\n${coreFingerprint()}\n${PUBLISHED_PLACEMENT_GRID_MM}`)
    .digest("hex")
    .slice(0, 32);
}

const entryPath = (key: string) => join(cacheDir(), `cell-${key}.json`);

/** Computes the study and the placement maps of a cell (no cache). */
export function computeCellResults(cell: Cell, candidates: readonly Arm[]): CellResults {
  const inputs = candidates.map((a) => ({ id: a.id, chain: a.chain, facts: armFacts(a) }));
  return {
    key: cellResultsKey(cell, candidates),
    cellId: cell.id,
    cellSpecHash: cell.specHash,
    armSpecHashes: Object.fromEntries(candidates.map((a) => [a.id, a.specHash])),
    study: cellStudy(cell.spec, inputs),
    placements: inputs.map((arm) => placementMap(cell.spec, arm, { gridMm: PUBLISHED_PLACEMENT_GRID_MM })),
  };
}

export async function readCachedCellResults(key: string, cellId: string): Promise<CellResults | null> {
  try {
    const data: unknown = JSON.parse(await readFile(entryPath(key), "utf8"));
    const parsed = resultsSchema.safeParse(data);
    if (!parsed.success || parsed.data.key !== key || parsed.data.cellId !== cellId) return null;
    return data as CellResults;
  } catch {
    return null;
  }
}

/** The results of a cell: from the cache, or computed here (and cached). `computed` says which. */
export async function getCellResults(
  cell: Cell,
  arms: readonly Arm[],
): Promise<{ results: CellResults; computed: boolean; ms: number }> {
  const candidates = candidateArms(cell, arms);
  const key = cellResultsKey(cell, candidates);
  const t0 = performance.now();
  const cached = await readCachedCellResults(key, cell.id);
  if (cached) return { results: cached, computed: false, ms: performance.now() - t0 };
  const results = computeCellResults(cell, candidates);
  await writeFileAtomic(entryPath(key), JSON.stringify(results));
  return { results, computed: true, ms: performance.now() - t0 };
}
