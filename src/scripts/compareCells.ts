/**
 * The side-by-side page's cell-study links (CellStudyLinks.astro): the studies whose candidates include the arms in
 * the address (`?arms=a,b`), those sharing the most arms first, and the editor link carrying the same arms.
 */
import { cellsUsingArms, type CellLinkEntry } from "../view/cellIndexModel";
import { h } from "./dom";

interface Config {
  readonly editorHref: string;
  readonly cells: readonly CellLinkEntry[];
}

export function mountCompareCells(doc: Document): void {
  const root = doc.querySelector<HTMLElement>("[data-compare-cells]");
  if (!root) return;
  const config = JSON.parse(root.dataset.compareCells ?? "{}") as Config;
  const ids = (new URLSearchParams(doc.defaultView?.location.search ?? "").get("arms") ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  const start = root.querySelector<HTMLAnchorElement>("[data-compare-cells-start]");
  if (start && ids.length) start.href = `${config.editorHref}?arms=${ids.map(encodeURIComponent).join(",")}`;
  const list = root.querySelector<HTMLElement>("[data-compare-cells-list]");
  const status = root.querySelector<HTMLElement>("[data-compare-cells-status]");
  if (!list || !status || !ids.length) return;
  const found = cellsUsingArms(config.cells ?? [], ids);
  if (!found.length) {
    status.textContent = "No published cell study has any of these arms among its candidates.";
    return;
  }
  status.textContent = `${found.length} cell stud${found.length === 1 ? "y has" : "ies have"} some of these arms among the candidates:`;
  list.replaceChildren(
    ...found.map((c) =>
      h(
        "li",
        { attrs: { "data-cell": c.id } },
        h("a", { text: c.title, attrs: { href: c.href } }),
        ` (${c.shared.length} of these arms: ${c.shared.join(", ")})`,
      ),
    ),
  );
  list.hidden = false;
}
