/**
 * Browser side of the side-by-side page (/compare/?arms=a,b,c; bundled by Astro, no inline script). Reads the arm
 * ids from the address, fetches each arm's summary (dist/data/arms/<id>/compare.json, built from the analysis) under
 * the site's base path, and draws: the envelopes overlaid on one side view, the payload-at-reach curves overlaid,
 * the speed figures and the spec table with the best value per row marked, and the requirements panel's pass/fail
 * per arm (src/view/requirements.ts). Charts are node trees from src/charts/compareCharts.ts turned into SVG
 * elements with d3-selection; tables are built with createElement/textContent (never innerHTML).
 *
 * State in the address (history.replaceState): arms, the requirements (need-*), the chart choices (point,
 * chart-offset). When everything is drawn (or an error is shown) the <html> element gets data-ready="true".
 */
import {
  envelopeOverlayNode,
  payloadOverlayNode,
  type EnvelopeOverlayArm,
  type PayloadOverlayArm,
} from "../charts/compareCharts";
import type { CompareArmSummary } from "../view/compareData";
import { parseArmIds, specRows, speedRows, type CompareRow } from "../view/compareModel";
import {
  checkRequirements,
  isEmptyRequirements,
  parseRequirements,
  REQUIREMENT_KEYS,
  requirementPairs,
  requirementsArmOf,
  type Requirements,
  type Verdict,
} from "../view/requirements";
import { formatNumber } from "../view/format";
import { appendSvgNode, h } from "./dom";

/** Settings from the page (data-compare attribute, JSON). */
export interface CompareClientConfig {
  readonly arms: readonly {
    readonly id: string;
    readonly name: string;
    readonly summaryHref: string;
    readonly sheetHref: string;
  }[];
}

const POINT_KEY = "point";
const OFFSET_KEY = "chart-offset";

function markReady(root: HTMLElement, state: "done" | "error"): void {
  root.dataset.state = state;
  // Milliseconds from navigation start to ready (read by test/bench/compareInteractive.ts).
  document.documentElement.dataset.readyMs = performance.now().toFixed(1);
  document.documentElement.dataset.ready = "true";
}

/** Chart width: the figure's width, 320–760 px. */
function chartWidth(container: HTMLElement): number {
  const w = Math.floor(container.clientWidth || 720);
  return Math.max(320, Math.min(760, w));
}

// ---------------------------------------------------------------------------------------------------------------
// Tables

function compareTable(
  caption: string,
  arms: readonly CompareArmSummary[],
  rows: readonly CompareRow[],
  className: string,
): HTMLElement {
  const table = h("table", { className: `data-table compare-table ${className}` }, h("caption", { text: caption }));
  const headRow = h("tr", {}, h("th", { text: "", attrs: { scope: "col" } }));
  arms.forEach((a, i) =>
    headRow.append(
      h(
        "th",
        { attrs: { scope: "col", "data-arm": a.id } },
        h("span", { className: `arm-key arm-key-${i}`, attrs: { "aria-hidden": "true" } }),
        a.name,
      ),
    ),
  );
  const body = h("tbody");
  for (const r of rows) {
    const th = h("th", { attrs: { scope: "row" } }, r.label);
    if (r.bestMeans) th.append(h("span", { className: "best-means", text: ` (★ ${r.bestMeans})` }));
    const tr = h("tr", { attrs: { "data-row": r.key } }, th);
    r.cells.forEach((c, i) => {
      const td = h("td", { attrs: { "data-arm": arms[i]!.id } }, c.text);
      if (c.value !== null) td.dataset.value = String(c.value);
      if (c.best) {
        td.dataset.best = "true";
        td.classList.add("is-best");
        td.append(" ", h("span", { className: "best-mark", text: "★ best" }));
      }
      tr.append(td);
    });
    body.append(tr);
  }
  table.append(h("thead", {}, headRow), body);
  return h(
    "div",
    { className: "table-scroll", attrs: { tabindex: "0", role: "region", "aria-label": caption } },
    table,
  );
}

const VERDICT_WORDS: Record<Verdict["status"], string> = { pass: "✓ pass", fail: "✗ fail", undecided: "? not decided" };
const REQUIREMENT_LABELS: Record<Verdict["key"], string> = {
  mounting: "Mounting",
  payload: "Payload at reach",
  reach: "Reach and height band",
  speed: "Guaranteed line speed",
};

function verdictTable(arms: readonly CompareArmSummary[], verdicts: readonly Verdict[][]): HTMLElement {
  const keys = verdicts[0]?.map((v) => v.key) ?? [];
  const table = h(
    "table",
    { className: "data-table compare-table verdict-table" },
    h("caption", { text: "Each arm against the requirements" }),
  );
  const headRow = h("tr", {}, h("th", { text: "Requirement", attrs: { scope: "col" } }));
  arms.forEach((a, i) =>
    headRow.append(
      h(
        "th",
        { attrs: { scope: "col", "data-arm": a.id } },
        h("span", { className: `arm-key arm-key-${i}`, attrs: { "aria-hidden": "true" } }),
        a.name,
      ),
    ),
  );
  const body = h("tbody");
  keys.forEach((key, k) => {
    const tr = h(
      "tr",
      { attrs: { "data-requirement": key } },
      h("th", { text: REQUIREMENT_LABELS[key], attrs: { scope: "row" } }),
    );
    arms.forEach((a, i) => {
      const v = verdicts[i]![k]!;
      tr.append(
        h(
          "td",
          { className: `verdict verdict-${v.status}`, attrs: { "data-arm": a.id, "data-status": v.status } },
          h("strong", { className: "verdict-word", text: VERDICT_WORDS[v.status] }),
          h("span", { className: "verdict-reason", text: v.reason }),
        ),
      );
    });
    body.append(tr);
  });
  const all = h(
    "tr",
    { className: "verdict-all", attrs: { "data-requirement": "all" } },
    h("th", { text: "All asked", attrs: { scope: "row" } }),
  );
  arms.forEach((a, i) => {
    const vs = verdicts[i]!;
    const status = vs.some((v) => v.status === "fail")
      ? "fail"
      : vs.every((v) => v.status === "pass")
        ? "pass"
        : "undecided";
    all.append(
      h(
        "td",
        { className: `verdict verdict-${status}`, attrs: { "data-arm": a.id, "data-status": status } },
        h("strong", { className: "verdict-word", text: VERDICT_WORDS[status] }),
      ),
    );
  });
  body.append(all);
  table.append(h("thead", {}, headRow), body);
  return h(
    "div",
    {
      className: "table-scroll",
      attrs: { tabindex: "0", role: "region", "aria-label": "Requirements, pass or fail per arm" },
    },
    table,
  );
}

// ---------------------------------------------------------------------------------------------------------------
// Form

const FIELD_NAMES = [
  "payload",
  "cg",
  "reach-min",
  "reach-max",
  "height-min",
  "height-max",
  "speed",
  "tool",
  "mounting",
] as const;
type FieldName = (typeof FIELD_NAMES)[number];

function field(form: HTMLFormElement, name: FieldName): HTMLInputElement | HTMLSelectElement {
  const el = form.elements.namedItem(name);
  if (!(el instanceof HTMLInputElement || el instanceof HTMLSelectElement))
    throw new Error(`requirements form: no field ${name}`);
  return el;
}

/** The form's values as the query pairs parseRequirements reads (a band needs both ends). */
function formPairs(form: HTMLFormElement): Map<string, string> {
  const v = (name: FieldName) => field(form, name).value.trim();
  const pair = (a: FieldName, b: FieldName) => (v(a) === "" && v(b) === "" ? "" : `${v(a)},${v(b)}`);
  return new Map([
    [REQUIREMENT_KEYS.payloadKg, v("payload")],
    [REQUIREMENT_KEYS.cgOffsetMm, v("cg")],
    [REQUIREMENT_KEYS.reachMm, pair("reach-min", "reach-max")],
    [REQUIREMENT_KEYS.heightMm, pair("height-min", "height-max")],
    [REQUIREMENT_KEYS.minSpeedMPerS, v("speed")],
    [REQUIREMENT_KEYS.tool, v("tool")],
    [REQUIREMENT_KEYS.mounting, v("mounting")],
  ]);
}

function fillForm(form: HTMLFormElement, r: Requirements): void {
  const set = (name: FieldName, value: number | string | null) =>
    (field(form, name).value = value === null ? "" : String(value));
  set("payload", r.payloadKg);
  set("cg", r.cgOffsetMm === 0 && r.payloadKg === null ? "" : r.cgOffsetMm);
  set("reach-min", r.reachMm?.[0] ?? null);
  set("reach-max", r.reachMm?.[1] ?? null);
  set("height-min", r.heightMm?.[0] ?? null);
  set("height-max", r.heightMm?.[1] ?? null);
  set("speed", r.minSpeedMPerS);
  set("tool", r.tool);
  set("mounting", r.mounting ?? "");
}

// ---------------------------------------------------------------------------------------------------------------
// Page

interface PageState {
  readonly arms: readonly CompareArmSummary[];
  requirements: Requirements;
  point: "wcp" | "flange";
  offsetMm: number;
}

function setQuery(url: URL, pairs: readonly [string, string][], keys: readonly string[]): void {
  for (const k of keys) url.searchParams.delete(k);
  for (const [k, v] of pairs) url.searchParams.set(k, v);
}

function writeAddress(state: PageState): void {
  const url = new URL(location.href);
  setQuery(url, requirementPairs(state.requirements), Object.values(REQUIREMENT_KEYS));
  url.searchParams.delete(POINT_KEY);
  url.searchParams.delete(OFFSET_KEY);
  if (state.point !== "wcp") url.searchParams.set(POINT_KEY, state.point);
  if (state.offsetMm !== 0) url.searchParams.set(OFFSET_KEY, String(state.offsetMm));
  history.replaceState(null, "", url.href);
}

function band(r: Requirements) {
  return r.reachMm && r.heightMm ? { rMm: r.reachMm, zMm: r.heightMm } : null;
}

function drawEnvelope(root: HTMLElement, state: PageState): void {
  const figure = root.querySelector<HTMLElement>("[data-chart='envelope']");
  if (!figure) return;
  const useWcp = state.point === "wcp";
  const arms: EnvelopeOverlayArm[] = state.arms.map((a) => {
    const wcp = useWcp && a.envelope.wcp && a.envelope.wcp.length > 0 ? a.envelope.wcp : null;
    return {
      id: a.id,
      name: a.name,
      polygons: wcp ?? a.envelope.flange,
      ...(useWcp && !wcp ? { note: "(flange centre: no WCP)" } : {}),
    };
  });
  const chart = envelopeOverlayNode({
    id: "compare-envelope-chart",
    pointWords: useWcp ? "wrist centre point" : "flange centre",
    arms,
    band: band(state.requirements),
    widthPx: chartWidth(figure),
  });
  figure.replaceChildren();
  appendSvgNode(figure, chart);
  figure.append(
    h("figcaption", {
      text:
        `Outlines of the side-view region each arm's ${useWcp ? "wrist centre point" : "flange centre"} reaches with joint 1 held (distance from axis 1 against height, one scale on both axes); ` +
        "joint limits honoured, no tool fitted, collisions not checked. Each arm has its own colour and dash pattern." +
        (band(state.requirements) ? " The shaded rectangle is the band from the requirements panel." : ""),
    }),
  );
}

function payloadMountingOf(a: CompareArmSummary, r: Requirements): string {
  return r.mounting !== null && a.declared.mountings.includes(r.mounting)
    ? r.mounting
    : (a.declared.mountings[0] ?? "floor");
}

function drawPayload(root: HTMLElement, state: PageState): void {
  const figure = root.querySelector<HTMLElement>("[data-chart='payload']");
  if (!figure) return;
  const missing: string[] = [];
  const arms: PayloadOverlayArm[] = state.arms.map((a) => {
    const mounting = payloadMountingOf(a, state.requirements);
    const s = a.payload.series.find((x) => x.mounting === mounting && x.offsetMm === state.offsetMm);
    if (!s) missing.push(a.name);
    return { id: a.id, name: a.name, reachMm: s?.reachMm ?? [], payloadKg: s?.payloadKg ?? [], note: `(${mounting})` };
  });
  const r = state.requirements;
  const chart = payloadOverlayNode({
    id: "compare-payload-chart",
    offsetMm: state.offsetMm,
    arms,
    needKg: r.payloadKg,
    bandMm: r.reachMm,
    widthPx: chartWidth(figure),
  });
  figure.replaceChildren();
  appendSvgNode(figure, chart);
  figure.append(
    h("figcaption", {
      text:
        `Largest static payload at each reach of the flange centre, worst posture over heights, CG ${formatNumber(state.offsetMm)} mm along the tool axis; each arm's mounting in brackets. ` +
        "Static holding only: no acceleration, no safety margin; gripper, tooling and part all count as payload." +
        (missing.length ? ` No rows at this offset for: ${missing.join(", ")}.` : ""),
    }),
  );
}

function drawVerdicts(root: HTMLElement, state: PageState): void {
  const out = root.querySelector<HTMLElement>("[data-compare-verdicts]");
  if (!out) return;
  if (isEmptyRequirements(state.requirements)) {
    out.replaceChildren(
      h("p", {
        className: "verdict-empty",
        text: "Fill in what the cell needs and press “Check the arms”: each arm then passes or fails each requirement, with the figures.",
      }),
    );
    return;
  }
  const verdicts = state.arms.map((a) =>
    checkRequirements(requirementsArmOf(a), state.requirements, a.speed.mapMounting),
  );
  if (verdicts[0]?.length === 0) {
    out.replaceChildren(
      h("p", {
        className: "verdict-empty",
        text: "The values given do not make a complete requirement yet: payload needs the reach band; reach needs both bands; speed needs both bands.",
      }),
    );
    return;
  }
  out.replaceChildren(verdictTable(state.arms, verdicts));
}

async function loadSummary(
  href: string,
  name: string,
  early: ReadonlyMap<string, Promise<Response>>,
): Promise<CompareArmSummary> {
  const res = await (early.get(href) ?? fetch(href));
  if (!res.ok) throw new Error(`the figures of ${name} could not be loaded (HTTP ${res.status})`);
  return (await res.json()) as CompareArmSummary;
}

/** Wires the page. `early`: summary fetches already started by compareStart.ts, by address. */
export async function mountCompare(
  root: HTMLElement,
  early: ReadonlyMap<string, Promise<Response>> = new Map(),
): Promise<void> {
  const config = JSON.parse(root.dataset.compare ?? "{}") as CompareClientConfig;
  const status = root.querySelector<HTMLElement>("[data-compare-status]");
  const say = (text: string, kind: "info" | "error") => {
    if (!status) return;
    status.textContent = text;
    status.dataset.kind = kind;
  };
  const params = new URLSearchParams(location.search);
  const parsed = parseArmIds(
    params.get("arms"),
    config.arms.map((a) => a.id),
  );
  if (!parsed.ok) {
    say(parsed.message, "error");
    markReady(root, "error");
    return;
  }
  const refs = parsed.ids.map((id) => config.arms.find((a) => a.id === id)!);
  say(`Loading the figures of ${refs.length} arms…`, "info");
  let arms: CompareArmSummary[];
  try {
    arms = await Promise.all(refs.map((r) => loadSummary(r.summaryHref, r.name, early)));
  } catch (e) {
    say(`Could not load the figures: ${e instanceof Error ? e.message : String(e)}.`, "error");
    markReady(root, "error");
    return;
  }

  const req = parseRequirements((k) => params.get(k));
  const offsets = [...new Set(arms.flatMap((a) => a.payload.offsetsMm))].sort((a, b) => a - b);
  const askedOffset = Number(params.get(OFFSET_KEY) ?? "0");
  const state: PageState = {
    arms,
    requirements: req.requirements,
    point: params.get(POINT_KEY) === "flange" ? "flange" : "wcp",
    offsetMm: offsets.includes(askedOffset) ? askedOffset : (offsets[0] ?? 0),
  };

  // Names in the page heading list.
  const list = root.querySelector<HTMLElement>("[data-compare-arms]");
  if (list) {
    list.replaceChildren(
      ...arms.map((a, i) =>
        h(
          "li",
          { attrs: { "data-arm": a.id } },
          h("span", { className: `arm-key arm-key-${i}`, attrs: { "aria-hidden": "true" } }),
          h("a", { text: a.name, attrs: { href: refs[i]!.sheetHref } }),
        ),
      ),
    );
  }

  // Chart controls.
  const pointSelect = root.querySelector<HTMLSelectElement>("select[name='point']");
  if (pointSelect) {
    pointSelect.value = state.point;
    pointSelect.addEventListener("change", () => {
      state.point = pointSelect.value === "flange" ? "flange" : "wcp";
      writeAddress(state);
      drawEnvelope(root, state);
    });
  }
  const offsetSelect = root.querySelector<HTMLSelectElement>("select[name='chart-offset']");
  if (offsetSelect) {
    offsetSelect.replaceChildren(
      ...offsets.map((o) => h("option", { text: `${formatNumber(o)} mm`, attrs: { value: String(o) } })),
    );
    offsetSelect.value = String(state.offsetMm);
    offsetSelect.addEventListener("change", () => {
      state.offsetMm = Number(offsetSelect.value);
      writeAddress(state);
      drawPayload(root, state);
    });
  }

  // Requirements form.
  const form = root.querySelector<HTMLFormElement>("form[data-compare-form]");
  const formStatus = root.querySelector<HTMLElement>("[data-compare-form-status]");
  if (form) {
    fillForm(form, state.requirements);
    form.addEventListener("submit", (event) => {
      event.preventDefault();
      const pairs = formPairs(form);
      const next = parseRequirements((k) => pairs.get(k) ?? null);
      if (formStatus) formStatus.textContent = next.errors.length ? `Please correct: ${next.errors.join("; ")}.` : "";
      state.requirements = next.requirements;
      writeAddress(state);
      drawVerdicts(root, state);
      drawEnvelope(root, state);
      drawPayload(root, state);
    });
    form.addEventListener("reset", () => {
      setTimeout(() => {
        state.requirements = parseRequirements(() => null).requirements;
        if (formStatus) formStatus.textContent = "";
        writeAddress(state);
        drawVerdicts(root, state);
        drawEnvelope(root, state);
        drawPayload(root, state);
      }, 0);
    });
  }
  if (formStatus && req.errors.length)
    formStatus.textContent = `The requirements in the address could not all be read: ${req.errors.join("; ")}.`;

  // Shown before drawing, so the charts are sized to their figures' widths (a hidden figure measures 0).
  for (const el of root.querySelectorAll<HTMLElement>("[data-compare-section]")) el.hidden = false;
  drawVerdicts(root, state);
  drawEnvelope(root, state);
  drawPayload(root, state);
  const speedOut = root.querySelector<HTMLElement>("[data-compare-speed]");
  speedOut?.replaceChildren(
    compareTable("Speed figures (flange centre, no tool)", arms, speedRows(arms), "speed-table"),
  );
  const specOut = root.querySelector<HTMLElement>("[data-compare-spec]");
  specOut?.replaceChildren(compareTable("Declared and computed figures", arms, specRows(arms), "spec-table"));
  say(`${arms.length} arms side by side.`, "info");
  markReady(root, "done");
}
