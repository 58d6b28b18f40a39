/** Site paths of the cell studies (relative to the site base; join with siteHref). */

/** `/cells/`: the list of cell studies. */
export const CELLS_INDEX_PATH = "cells/";

/** `/cells/edit/`: the cell editor (query `cell=<id>` or `arms=a,b`; state in `#state=`). */
export const CELL_EDITOR_PATH = "cells/edit/";

/** Page of a cell study. */
export function cellPath(id: string): string {
  return `cells/${encodeURIComponent(id)}/`;
}

/** The editor started from a cell study. */
export function cellEditorPath(query: { readonly cell?: string; readonly arms?: readonly string[] }): string {
  if (query.cell) return `${CELL_EDITOR_PATH}?cell=${encodeURIComponent(query.cell)}`;
  if (query.arms?.length) return `${CELL_EDITOR_PATH}?arms=${query.arms.map(encodeURIComponent).join(",")}`;
  return CELL_EDITOR_PATH;
}

/** Downloads of a cell study. */
export function cellDataPaths(id: string): {
  study: string;
  placements: string;
  movesCsv: string;
  targetsCsv: string;
  cellFile: string;
} {
  const e = encodeURIComponent(id);
  return {
    study: `data/cells/${e}.json`,
    placements: `data/cells/${e}/placements.json`,
    movesCsv: `data/cells/${e}/moves.csv`,
    targetsCsv: `data/cells/${e}/targets.csv`,
    cellFile: `data/cells/${e}/cell.json`,
  };
}
