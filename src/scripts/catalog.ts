/**
 * Browser side of the catalog page (bundled by Astro from src/pages/index.astro; no inline script). It reads the
 * rows from the table's data attributes, turns the column headings into sort buttons, shows the filter form and the
 * tick column, and keeps the state (filters, sort, ticks) in the address with history.replaceState, so a shortlist
 * can be sent as a link and a link restores it. Every decision is made by the DOM-free functions of
 * src/view/catalogFilter.ts; this module only reads and writes the page.
 */
import {
  CATALOG_QUERY_KEYS,
  compareHref,
  nextSort,
  NO_FILTER,
  parseCatalogQuery,
  pickProblem,
  rowPasses,
  shownText,
  sortRows,
  urlWithCatalogState,
  type CatalogChoices,
  type CatalogFilter,
  type CatalogRowData,
  type CatalogState,
} from "../view/catalogFilter";

interface LiveRow extends CatalogRowData {
  readonly el: HTMLTableRowElement;
  readonly tick: HTMLInputElement | null;
}

function numberOf(text: string | undefined): number | null {
  if (text === undefined || text.trim() === "") return null;
  const v = Number(text);
  return Number.isFinite(v) ? v : null;
}

function footprintOf(width: string | undefined, depth: string | undefined): [number, number] | null {
  const w = numberOf(width),
    d = numberOf(depth);
  return w === null || d === null ? null : [w, d];
}

/** The rows as the filter and sort see them, from the data attributes the page wrote. */
function readRows(table: HTMLTableElement, numericKeys: ReadonlySet<string>): LiveRow[] {
  return Array.from(table.tBodies[0]?.rows ?? []).map((el) => {
    const d = el.dataset;
    const sort: Record<string, number | string | null> = {};
    const sortGroup: Record<string, string | undefined> = {};
    for (const cell of Array.from(el.cells)) {
      const key = cell.dataset.key;
      if (!key) continue;
      const raw = cell.dataset.sort;
      sort[key] = raw === undefined ? null : numericKeys.has(key) ? numberOf(raw) : raw;
      if (cell.dataset.sortGroup !== undefined) sortGroup[key] = cell.dataset.sortGroup;
    }
    return {
      el,
      tick: el.querySelector<HTMLInputElement>('input[type="checkbox"]'),
      id: d.key ?? "",
      class: d.class ?? "",
      mountings: (d.mountings ?? "").split(" ").filter(Boolean),
      payloadKg: numberOf(d.payloadKg) ?? Number.NaN,
      computedReachMm: numberOf(d.computedReachMm),
      minHeightMm: numberOf(d.minHeightMm),
      maxHeightMm: numberOf(d.maxHeightMm),
      lineSpeedMPerS: numberOf(d.lineSpeedMPerS),
      footprintMm: footprintOf(d.footprintWidthMm, d.footprintDepthMm),
      protection: d.protection ?? null,
      repeatabilityMm: numberOf(d.repeatabilityMm),
      sort,
      sortGroup,
    };
  });
}

function optionValues(form: HTMLFormElement, name: string): string[] {
  const select = form.elements.namedItem(name);
  return select instanceof HTMLSelectElement ? Array.from(select.options, (o) => o.value).filter((v) => v !== "") : [];
}

const FILTER_FIELDS: readonly (keyof CatalogFilter)[] = [
  "class",
  "mounting",
  "minPayloadKg",
  "minReachMm",
  "heightFromMm",
  "heightToMm",
  "minLineSpeedMPerS",
  "maxFootprintWidthMm",
  "maxFootprintDepthMm",
  "minProtection",
  "maxRepeatabilityMm",
];

/** The form's fields as a query, read by the same parser as the address (one set of rules for both). */
function formQuery(form: HTMLFormElement): URLSearchParams {
  const q = new URLSearchParams();
  for (const field of FILTER_FIELDS) {
    const el = form.elements.namedItem(CATALOG_QUERY_KEYS[field]);
    if ((el instanceof HTMLInputElement || el instanceof HTMLSelectElement) && el.value.trim() !== "")
      q.set(CATALOG_QUERY_KEYS[field], el.value.trim());
  }
  return q;
}

function writeForm(form: HTMLFormElement, filter: CatalogFilter): void {
  for (const field of FILTER_FIELDS) {
    const el = form.elements.namedItem(CATALOG_QUERY_KEYS[field]);
    if (el instanceof HTMLInputElement || el instanceof HTMLSelectElement) {
      const v = filter[field];
      el.value = v === null ? "" : String(v);
    }
  }
}

/** Wraps a heading's content in a sort button (moving the nodes: no markup is parsed). */
function sortButton(th: HTMLTableCellElement): HTMLButtonElement {
  const button = document.createElement("button");
  button.type = "button";
  button.className = "sort-button";
  while (th.firstChild) button.append(th.firstChild);
  th.append(button);
  return button;
}

/** Wires the catalog page; does nothing on a page without #catalog-app. */
export function mountCatalog(doc: Document): void {
  const root = doc.getElementById("catalog-app");
  const table = root?.querySelector<HTMLTableElement>("table#catalog");
  const form = root?.querySelector<HTMLFormElement>("#catalog-filters");
  if (!root || !table || !form) return;
  const tbody = table.tBodies[0]!;
  const status = root.querySelector<HTMLElement>(".catalog-status");
  const count = root.querySelector<HTMLElement>("#catalog-count");
  const empty = root.querySelector<HTMLElement>("#catalog-empty");
  const pickStatus = root.querySelector<HTMLElement>("#pick-status");
  const openButton = root.querySelector<HTMLButtonElement>("#open-compare");
  const reason = root.querySelector<HTMLElement>("#compare-reason");
  const baseUrl = root.dataset.baseUrl ?? "/";

  const headers = Array.from(table.tHead?.rows[0]?.cells ?? []).filter((th) => th.dataset.key);
  const numericKeys = new Set(headers.filter((th) => th.classList.contains("num")).map((th) => th.dataset.key!));
  const rows = readRows(table, numericKeys);
  const choices: CatalogChoices = {
    classes: optionValues(form, CATALOG_QUERY_KEYS.class),
    mountings: optionValues(form, CATALOG_QUERY_KEYS.mounting),
    sortKeys: headers.map((th) => th.dataset.key!),
    armIds: rows.map((r) => r.id),
  };
  let state: CatalogState = parseCatalogQuery(window.location.search, choices);

  function render(): void {
    const sorted = sortRows(rows, state.sort);
    // Move rows only when the order changes (moving a row would take the focus from its tick box).
    if (sorted.some((row, i) => tbody.rows[i] !== row.el)) for (const row of sorted) tbody.append(row.el);
    let shown = 0;
    for (const row of sorted) {
      const pass = rowPasses(row, state.filter);
      row.el.hidden = !pass;
      row.el.classList.toggle("row-alt", pass && shown % 2 === 1);
      if (pass) shown++;
      if (row.tick) row.tick.checked = state.pick.includes(row.id);
    }
    const sort = state.sort;
    for (const th of headers) {
      if (sort !== null && sort.key === th.dataset.key)
        th.setAttribute("aria-sort", sort.dir === "asc" ? "ascending" : "descending");
      else th.removeAttribute("aria-sort");
    }
    if (count) count.textContent = shownText(shown, rows.length);
    if (empty) empty.hidden = shown > 0;

    const hiddenTicks = state.pick.filter((id) => rows.find((r) => r.id === id)?.el.hidden).length;
    if (pickStatus) {
      const n = state.pick.length;
      pickStatus.textContent =
        n === 0
          ? "No arm ticked."
          : `${n} arm${n === 1 ? "" : "s"} ticked${hiddenTicks > 0 ? ` (${hiddenTicks} hidden by the filters)` : ""}.`;
    }
    const problem = pickProblem(state.pick);
    if (openButton) openButton.disabled = problem !== null;
    if (reason) {
      reason.textContent = problem ?? `Opens the ${state.pick.length} ticked arms on one page.`;
      reason.classList.toggle("is-ready", problem === null);
    }
    window.history.replaceState(window.history.state, "", urlWithCatalogState(window.location.href, state));
  }

  for (const th of headers) {
    const key = th.dataset.key!;
    sortButton(th).addEventListener("click", () => {
      state = { ...state, sort: nextSort(state.sort, key) };
      render();
    });
  }
  const readFilter = () => {
    state = { ...state, filter: parseCatalogQuery(formQuery(form), choices).filter };
    render();
  };
  form.addEventListener("input", readFilter);
  form.addEventListener("change", readFilter);
  form.addEventListener("submit", (e) => e.preventDefault());
  for (const button of Array.from(root.querySelectorAll<HTMLButtonElement>('[data-action="clear"]'))) {
    button.addEventListener("click", () => {
      state = { ...state, filter: NO_FILTER };
      writeForm(form, NO_FILTER);
      render();
    });
  }
  for (const row of rows) {
    row.tick?.addEventListener("change", () => {
      const others = state.pick.filter((id) => id !== row.id);
      state = { ...state, pick: row.tick!.checked ? [...others, row.id] : others };
      render();
    });
  }
  openButton?.addEventListener("click", () => {
    if (pickProblem(state.pick) === null) window.location.assign(compareHref(baseUrl, state.pick));
  });

  writeForm(form, state.filter);
  form.hidden = false;
  if (status) status.hidden = false;
  root.classList.add("is-live");
  render();
}
