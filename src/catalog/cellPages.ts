/**
 * What the cell pages read at build time: the catalog's cells as static paths, and for one cell its results (from
 * the cache `armdex prepare` filled), its candidate arms and their analysis summaries. Node-only.
 */
import { readFile } from "node:fs/promises";
import { getAnalysisSummary, type AnalysisSummary } from "./analysis";
import { getCells, type Cell } from "./cell";
import { candidateArms, getCellResults, type CellResults } from "./cellResults";
import { getCatalog, type Arm } from "./load";

/** Ids a cell cannot have: the pages under /cells/ that are not studies. */
export const RESERVED_CELL_IDS: readonly string[] = ["edit"];

/** One static path per valid cell (`/cells/<id>/` and its downloads). */
export async function cellStaticPaths(): Promise<{ params: { id: string }; props: { cell: Cell } }[]> {
  const { cells } = await getCells();
  for (const cell of cells)
    if (RESERVED_CELL_IDS.includes(cell.id))
      throw new Error(
        `${cell.file}: id "${cell.id}" is taken by a page of the site (/cells/${cell.id}/); rename the file`,
      );
  return cells.map((cell) => ({ params: { id: cell.id }, props: { cell } }));
}

export interface CellPageData {
  readonly cell: Cell;
  readonly results: CellResults;
  /** The candidate arms, in the cell's order. */
  readonly arms: readonly Arm[];
  readonly summaries: ReadonlyMap<string, AnalysisSummary>;
}

/** A cell's results with its candidate arms and their analysis summaries. */
export async function cellPageData(cell: Cell): Promise<CellPageData> {
  const { arms } = await getCatalog();
  const { results } = await getCellResults(cell, arms);
  const candidates = candidateArms(cell, arms);
  const summaries = new Map<string, AnalysisSummary>();
  for (const arm of candidates) summaries.set(arm.id, await getAnalysisSummary(arm));
  return { cell, results, arms: candidates, summaries };
}

/** The cell file as written (the download `data/cells/<id>/cell.json`). */
export function cellFileText(cell: Cell): Promise<string> {
  return readFile(cell.file, "utf8");
}
