/**
 * Filter, sort and tick state of the catalog page, DOM-free: the browser module (src/scripts/catalog.ts) reads the
 * rows from the table's data attributes into `CatalogRowData`, and everything it decides (which rows show, in which
 * order, what the address says, where "Open side by side" leads) comes from the functions here.
 *
 * The state lives in the URL query, with our own plain keys (see CATALOG_QUERY_KEYS):
 * `?class=articulated&mounting=ceiling&minPayloadKg=10&minReachMm=1200&heightFromMm=0&heightToMm=900`
 * `&minLineSpeedMPerS=1.5&maxFootprintWidthMm=600&maxFootprintDepthMm=500&minProtection=IP54&maxRepeatabilityMm=0.05`
 * `&sort=payload&dir=desc&pick=a,b,c`. A value that does not parse, or names an unknown class,
 * mounting, column or arm, is dropped (as if absent), never an error.
 */
import { siteHref } from "./links";
import { MAX_COMPARE_ARMS, MIN_COMPARE_ARMS } from "./compareModel";
import { parseIpCode, protectionMeets } from "./protection";

/** Query keys of the catalog state. */
export const CATALOG_QUERY_KEYS = {
  class: "class",
  mounting: "mounting",
  minPayloadKg: "minPayloadKg",
  minReachMm: "minReachMm",
  heightFromMm: "heightFromMm",
  heightToMm: "heightToMm",
  minLineSpeedMPerS: "minLineSpeedMPerS",
  maxFootprintWidthMm: "maxFootprintWidthMm",
  maxFootprintDepthMm: "maxFootprintDepthMm",
  minProtection: "minProtection",
  maxRepeatabilityMm: "maxRepeatabilityMm",
  sort: "sort",
  dir: "dir",
  pick: "pick",
} as const;

/** Ticked arms the side-by-side page takes: at least 2, at most 6. */

export interface CatalogFilter {
  /** Arm class key ("articulated", "scara", …); null: any. */
  readonly class: string | null;
  /** The arm offers this mounting; null: any. */
  readonly mounting: string | null;
  /** Rated payload (tooling included) at least this, kg. */
  readonly minPayloadKg: number | null;
  /** Computed reach (wrist centre point, or flange centre) at least this, mm. */
  readonly minReachMm: number | null;
  /** Height band the computed height range must cover, mm (either end alone: that one height). */
  readonly heightFromMm: number | null;
  readonly heightToMm: number | null;
  /** Best guaranteed straight-line speed with the tool down at least this, m/s. */
  readonly minLineSpeedMPerS: number | null;
  /** The declared base footprint fits within width × depth (turned by 90° if need be), mm; either bound alone. */
  readonly maxFootprintWidthMm: number | null;
  readonly maxFootprintDepthMm: number | null;
  /** The declared IP code meets this one (IEC 60529, see protection.ts), e.g. "IP54". */
  readonly minProtection: string | null;
  /** Declared pose repeatability (ISO 9283 RP) at most this, mm. */
  readonly maxRepeatabilityMm: number | null;
}

export type SortDirection = "asc" | "desc";

export interface CatalogSort {
  /** Column key. */
  readonly key: string;
  readonly dir: SortDirection;
}

export interface CatalogState {
  readonly filter: CatalogFilter;
  readonly sort: CatalogSort | null;
  /** Ticked arm ids, in the order they were ticked. */
  readonly pick: readonly string[];
}

export const NO_FILTER: CatalogFilter = {
  class: null,
  mounting: null,
  minPayloadKg: null,
  minReachMm: null,
  heightFromMm: null,
  heightToMm: null,
  minLineSpeedMPerS: null,
  maxFootprintWidthMm: null,
  maxFootprintDepthMm: null,
  minProtection: null,
  maxRepeatabilityMm: null,
};

export const EMPTY_CATALOG_STATE: CatalogState = { filter: NO_FILTER, sort: null, pick: [] };

/** What the page offers: the state read from a URL is kept only where it names one of these. */
export interface CatalogChoices {
  readonly classes: readonly string[];
  readonly mountings: readonly string[];
  readonly sortKeys: readonly string[];
  readonly armIds: readonly string[];
}

/** One table row as the filter and the sort see it; null where the figure is not stated or not computed. */
export interface CatalogRowData {
  readonly id: string;
  readonly class: string;
  readonly mountings: readonly string[];
  readonly payloadKg: number;
  readonly computedReachMm: number | null;
  readonly minHeightMm: number | null;
  readonly maxHeightMm: number | null;
  readonly lineSpeedMPerS: number | null;
  /** Declared base footprint [width, depth], mm; null or absent: not declared. */
  readonly footprintMm?: readonly [number, number] | null;
  /** Declared IEC 60529 code; absent: unknown. */
  readonly protection?: string | null;
  /** Declared pose repeatability, mm; absent: unknown. */
  readonly repeatabilityMm?: number | null;
  /** Sort value per column key: a number (numeric columns) or a string; null or absent sorts last. */
  readonly sort: Readonly<Record<string, number | string | null | undefined>>;
  /** Sorted first by this within a column (the currency of a list price: amounts are not converted). */
  readonly sortGroup?: Readonly<Record<string, string | undefined>>;
}

const DECIMAL = /^-?(?:\d+(?:\.\d*)?|\.\d+)$/;

/**
 * A plain decimal number from a query value; null for anything else (empty, "1e3", "0x10", "Infinity", "12 kg").
 * @example parseDecimal("1.5") // 1.5
 * @example parseDecimal("abc") // null
 */
export function parseDecimal(text: string | null | undefined): number | null {
  if (text === null || text === undefined) return null;
  const t = text.trim();
  if (!DECIMAL.test(t)) return null;
  const v = Number(t);
  return Number.isFinite(v) ? v : null;
}

function nonNegative(text: string | null): number | null {
  const v = parseDecimal(text);
  return v !== null && v >= 0 ? v : null;
}

/** An IEC 60529 code in capitals ("ip54" reads as "IP54"); null for anything else. */
function ipCode(text: string | null): string | null {
  const t = text?.trim().toUpperCase() ?? "";
  return parseIpCode(t) ? t : null;
}

function oneOf(text: string | null, allowed: readonly string[]): string | null {
  return text !== null && allowed.includes(text) ? text : null;
}

/**
 * The catalog state in a URL query; unknown or malformed values are dropped.
 * @example parseCatalogQuery("?class=scara&minPayloadKg=abc&sort=payload&dir=up", choices)
 *   // { filter: { …NO_FILTER, class: "scara" }, sort: { key: "payload", dir: "asc" }, pick: [] }
 */
export function parseCatalogQuery(search: string | URLSearchParams, choices: CatalogChoices): CatalogState {
  const q = typeof search === "string" ? new URLSearchParams(search) : search;
  const K = CATALOG_QUERY_KEYS;
  const filter: CatalogFilter = {
    class: oneOf(q.get(K.class), choices.classes),
    mounting: oneOf(q.get(K.mounting), choices.mountings),
    minPayloadKg: nonNegative(q.get(K.minPayloadKg)),
    minReachMm: nonNegative(q.get(K.minReachMm)),
    heightFromMm: parseDecimal(q.get(K.heightFromMm)),
    heightToMm: parseDecimal(q.get(K.heightToMm)),
    minLineSpeedMPerS: nonNegative(q.get(K.minLineSpeedMPerS)),
    maxFootprintWidthMm: nonNegative(q.get(K.maxFootprintWidthMm)),
    maxFootprintDepthMm: nonNegative(q.get(K.maxFootprintDepthMm)),
    minProtection: ipCode(q.get(K.minProtection)),
    maxRepeatabilityMm: nonNegative(q.get(K.maxRepeatabilityMm)),
  };
  const key = oneOf(q.get(K.sort), choices.sortKeys);
  const sort: CatalogSort | null = key === null ? null : { key, dir: q.get(K.dir) === "desc" ? "desc" : "asc" };
  const pick: string[] = [];
  for (const id of (q.get(K.pick) ?? "").split(",")) {
    const t = id.trim();
    if (choices.armIds.includes(t) && !pick.includes(t)) pick.push(t);
  }
  return { filter, sort, pick };
}

/** Shortest decimal text of a number ("1.5", "1200", "-40"). */
function numberText(v: number): string {
  return String(Number(v.toPrecision(12)));
}

/**
 * The state as query pairs, in a fixed order; empty filters, no sort and no ticks are left out.
 * @example catalogQueryPairs({ filter: { …NO_FILTER, minReachMm: 1200 }, sort: { key: "maker", dir: "desc" }, pick: ["a", "b"] })
 *   // [["minReachMm", "1200"], ["sort", "maker"], ["dir", "desc"], ["pick", "a,b"]]
 */
export function catalogQueryPairs(state: CatalogState): [string, string][] {
  const K = CATALOG_QUERY_KEYS;
  const f = state.filter;
  const out: [string, string][] = [];
  if (f.class !== null) out.push([K.class, f.class]);
  if (f.mounting !== null) out.push([K.mounting, f.mounting]);
  const protection = f.minProtection;
  const numbers: [string, number | null][] = [
    [K.minPayloadKg, f.minPayloadKg],
    [K.minReachMm, f.minReachMm],
    [K.heightFromMm, f.heightFromMm],
    [K.heightToMm, f.heightToMm],
    [K.minLineSpeedMPerS, f.minLineSpeedMPerS],
    [K.maxFootprintWidthMm, f.maxFootprintWidthMm],
    [K.maxFootprintDepthMm, f.maxFootprintDepthMm],
  ];
  for (const [k, v] of numbers) if (v !== null && Number.isFinite(v)) out.push([k, numberText(v)]);
  if (protection !== null) out.push([K.minProtection, protection]);
  if (f.maxRepeatabilityMm !== null && Number.isFinite(f.maxRepeatabilityMm))
    out.push([K.maxRepeatabilityMm, numberText(f.maxRepeatabilityMm)]);
  if (state.sort) out.push([K.sort, state.sort.key], [K.dir, state.sort.dir]);
  if (state.pick.length > 0) out.push([K.pick, state.pick.join(",")]);
  return out;
}

/**
 * `href` with the catalog keys of its query replaced by `state` (other keys and the fragment kept). Commas in the
 * tick list stay readable.
 * @example urlWithCatalogState("https://h.test/tools/armdex/?x=1", { ...EMPTY_CATALOG_STATE, pick: ["a", "b"] })
 *   // "https://h.test/tools/armdex/?x=1&pick=a,b"
 */
export function urlWithCatalogState(href: string, state: CatalogState): string {
  const url = new URL(href);
  for (const k of Object.values(CATALOG_QUERY_KEYS)) url.searchParams.delete(k);
  for (const [k, v] of catalogQueryPairs(state)) url.searchParams.append(k, v);
  url.search = url.searchParams.toString().replace(/%2C/gi, ",");
  return url.href;
}

/**
 * Does the arm pass every filter? An arm whose figure is unknown (not stated, not computed) fails a filter on it.
 * Height band: the arm's computed height range [minHeightMm, maxHeightMm] must cover [from, to] (ends in either
 * order; one end alone asks for that one height).
 */
export function rowPasses(row: CatalogRowData, f: CatalogFilter): boolean {
  if (f.class !== null && row.class !== f.class) return false;
  if (f.mounting !== null && !row.mountings.includes(f.mounting)) return false;
  if (f.minPayloadKg !== null && !(row.payloadKg >= f.minPayloadKg)) return false;
  if (f.minReachMm !== null && !(row.computedReachMm !== null && row.computedReachMm >= f.minReachMm)) return false;
  if (f.minLineSpeedMPerS !== null && !(row.lineSpeedMPerS !== null && row.lineSpeedMPerS >= f.minLineSpeedMPerS))
    return false;
  if (f.heightFromMm !== null || f.heightToMm !== null) {
    const a = f.heightFromMm ?? f.heightToMm!;
    const b = f.heightToMm ?? f.heightFromMm!;
    if (row.minHeightMm === null || row.maxHeightMm === null) return false;
    if (!(row.minHeightMm <= Math.min(a, b) && row.maxHeightMm >= Math.max(a, b))) return false;
  }
  return datasheetPasses(row, f);
}

/**
 * The filters on declared datasheet facts: the footprint fits within the bounds given (as it stands or turned by
 * 90°), the IP code meets the minimum, the pose repeatability is at most the bound. Not declared: fails.
 */
export function datasheetPasses(row: CatalogRowData, f: CatalogFilter): boolean {
  if (f.maxFootprintWidthMm !== null || f.maxFootprintDepthMm !== null) {
    const fp = row.footprintMm;
    if (!fp) return false;
    const w = f.maxFootprintWidthMm ?? Infinity,
      d = f.maxFootprintDepthMm ?? Infinity;
    if (!((fp[0] <= w && fp[1] <= d) || (fp[1] <= w && fp[0] <= d))) return false;
  }
  if (f.minProtection !== null && !(row.protection && protectionMeets(row.protection, f.minProtection))) return false;
  if (
    f.maxRepeatabilityMm !== null &&
    !(row.repeatabilityMm !== null && row.repeatabilityMm !== undefined && row.repeatabilityMm <= f.maxRepeatabilityMm)
  )
    return false;
  return true;
}

const collator = new Intl.Collator("en", { sensitivity: "base", numeric: true });

function missing(v: number | string | null | undefined): boolean {
  return v === null || v === undefined || v === "" || (typeof v === "number" && !Number.isFinite(v));
}

/**
 * Order of two rows by one column: numbers by value, text by an English collation (case-insensitive, digits as
 * numbers); a missing value ("not stated", "not computed") is last in both directions; equal values tie (0).
 */
export function compareRows(a: CatalogRowData, b: CatalogRowData, sort: CatalogSort): number {
  const va = a.sort[sort.key],
    vb = b.sort[sort.key];
  const ma = missing(va),
    mb = missing(vb);
  if (ma || mb) return ma === mb ? 0 : ma ? 1 : -1;
  const sign = sort.dir === "desc" ? -1 : 1;
  const ga = a.sortGroup?.[sort.key] ?? "",
    gb = b.sortGroup?.[sort.key] ?? "";
  if (ga !== gb) return collator.compare(ga, gb);
  if (typeof va === "number" && typeof vb === "number") return sign * (va - vb);
  return sign * collator.compare(String(va), String(vb));
}

/** Rows in sort order; ties (and no sort) keep the given order (the catalog's, by id). A new array. */
export function sortRows<R extends CatalogRowData>(rows: readonly R[], sort: CatalogSort | null): R[] {
  const indexed = rows.map((row, i) => ({ row, i }));
  if (sort) indexed.sort((x, y) => compareRows(x.row, y.row, sort) || x.i - y.i);
  return indexed.map((x) => x.row);
}

/** The ids of the rows that pass, in sort order. */
export function visibleIds(rows: readonly CatalogRowData[], state: CatalogState): string[] {
  return sortRows(rows, state.sort)
    .filter((r) => rowPasses(r, state.filter))
    .map((r) => r.id);
}

/** The next sort after a click on a column's header: a new column sorts ascending, the same column flips. */
export function nextSort(current: CatalogSort | null, key: string): CatalogSort {
  return current?.key === key ? { key, dir: current.dir === "asc" ? "desc" : "asc" } : { key, dir: "asc" };
}

/** "9 of 9 arms shown", "1 of 9 arms shown". */
export function shownText(shown: number, total: number): string {
  return `${shown} of ${total} arm${total === 1 ? "" : "s"} shown`;
}

/** Why "Open side by side" cannot be used with these ticks; null when it can. */
export function pickProblem(pick: readonly string[]): string | null {
  if (pick.length < MIN_COMPARE_ARMS) {
    return pick.length === 0
      ? `Tick ${MIN_COMPARE_ARMS} to ${MAX_COMPARE_ARMS} arms to compare them side by side.`
      : `Tick at least one more arm: side by side takes ${MIN_COMPARE_ARMS} to ${MAX_COMPARE_ARMS}.`;
  }
  if (pick.length > MAX_COMPARE_ARMS) {
    const over = pick.length - MAX_COMPARE_ARMS;
    return `Untick ${over} arm${over === 1 ? "" : "s"}: side by side takes at most ${MAX_COMPARE_ARMS}.`;
  }
  return null;
}

/**
 * The side-by-side page for the ticked arms, inside the base path.
 * @example compareHref("/tools/armdex/", ["a", "b"]) // "/tools/armdex/compare/?arms=a,b"
 */
export function compareHref(baseUrl: string, ids: readonly string[]): string {
  return `${siteHref(baseUrl, "compare/")}?arms=${ids.map(encodeURIComponent).join(",")}`;
}
