/**
 * The list of cell studies (`/cells/`), and the cell studies that use given arms (the side-by-side page's links).
 * Pure.
 */
import type { CellStudyJson } from "../core";
import { cellPath } from "./cellLinks";
import { formatNumber } from "./format";
import { armPath, siteHref } from "./links";
import type { TableModel, TableRow } from "./table";

export interface CellIndexEntry {
  readonly id: string;
  readonly title: string;
  readonly candidates: readonly string[];
  readonly study: CellStudyJson;
}

/** The table of cell studies: title, candidates, how many pass, the fastest passing arm and its cycle time. */
export function cellIndexTable(
  entries: readonly CellIndexEntry[],
  armNames: ReadonlyMap<string, string>,
  baseUrl: string,
): TableModel {
  const name = (id: string) => armNames.get(id) ?? id;
  const rows: TableRow[] = entries.map((e) => {
    const passing = e.study.arms.filter((a) => a.verdict === "pass");
    const best = passing[0];
    return {
      key: e.id,
      label: e.title,
      data: { passing: String(passing.length) },
      cells: [
        { text: e.title, href: siteHref(baseUrl, cellPath(e.id)), note: e.id },
        { text: String(e.candidates.length), note: e.candidates.map(name).join(", "), sortValue: e.candidates.length },
        { text: `${passing.length} of ${e.study.arms.length}`, sortValue: passing.length },
        best ? { text: name(best.arm), href: siteHref(baseUrl, armPath(best.arm)) } : { text: "none passes" },
        best?.cycleTimeS != null
          ? { text: formatNumber(best.cycleTimeS, 2), sortValue: best.cycleTimeS }
          : { text: "\u2014" },
      ],
    };
  });
  return {
    id: "cell-studies",
    caption: "Cell studies",
    columns: [
      { key: "cell", label: "Cell study", numeric: false },
      { key: "candidates", label: "Candidates", numeric: false },
      { key: "pass", label: "Pass", numeric: true },
      { key: "best", label: "Fastest passing arm", numeric: false },
      { key: "cycle", label: "Its cycle time", unit: "s", numeric: true },
    ],
    rows,
    rowHeaders: false,
    footnote:
      "Cycle times are kinematic lower bounds (no payload dynamics, no blending): see each study's assumptions.",
  };
}

export interface CellLinkEntry {
  readonly id: string;
  readonly title: string;
  readonly href: string;
  readonly candidates: readonly string[];
}

/**
 * The cell studies whose candidates include any of `armIds`, those sharing the most arms first (then by title), with
 * the arms they share.
 * @example cellsUsingArms([{ id: "c", title: "C", href: "/cells/c/", candidates: ["a", "b"] }], ["b", "x"])
 *   // [{ id: "c", …, shared: ["b"] }]
 */
export function cellsUsingArms(
  cells: readonly CellLinkEntry[],
  armIds: readonly string[],
): (CellLinkEntry & { readonly shared: readonly string[] })[] {
  const wanted = new Set(armIds);
  return cells
    .map((c) => ({ ...c, shared: c.candidates.filter((id) => wanted.has(id)) }))
    .filter((c) => c.shared.length > 0)
    .sort((a, b) => b.shared.length - a.shared.length || a.title.localeCompare(b.title));
}
