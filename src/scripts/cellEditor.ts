/**
 * The cell editor (`/cells/edit/`, bundled by Astro: no inline script). It starts from the address (`#state=` with
 * a cell, else `?cell=<id>`: the study's published cell file, else `?arms=a,b`: a starter loop for those arms), shows
 * the cell in a form, and on every change validates it with the catalog's own cell validation, runs the same core
 * (`cellStudy`) for every candidate on each arm's published description (data/arms/<id>/spec.json, fetched once per
 * arm) and redraws the ranking, the tables, the time bars and the drawings with the cell page's view models and
 * charts. The state goes back into the address; "Download cell file" saves it for arms/cells/. Placement maps are
 * not recomputed here.
 */
import "./zodJitless";
import { validateCell } from "../catalog/cell/validate";
import {
  cellStudy,
  compileChain,
  type ArmKinematicsInput,
  type CellArm,
  type CellSpec,
  type PayloadSpec,
} from "../core";
import { cellLayoutChart } from "../charts/cellLayoutChart";
import { cellTimeChart } from "../charts/cellTimeChart";
import { cellDrawings, type CellArmReach } from "../view/cellDrawing";
import {
  applyFormChange,
  cellFileText,
  decodeState,
  encodeState,
  fieldValue,
  pruneOptional,
  setAt,
  slotOf,
  starterCell,
  stateOfHash,
  STATE_KEY,
  type FormChange,
  type JsonObject,
  type JsonValue,
  type PathSegment,
} from "../view/cellEditorState";
import { cellArmParts, cellAssumptions, requirementsText } from "../view/cellPageModel";
import { rankingTable, type CellArmInfo } from "../view/cellTables";
import { formatNumber } from "../view/format";
import { buildForm, type BuiltForm } from "./cellEditorForm";
import { chartElement, tableElement } from "./cellDom";
import { h } from "./dom";

export interface EditorConfigArm {
  readonly id: string;
  readonly name: string;
  readonly shortName: string;
  readonly specHref: string;
  readonly sheetHref: string;
  readonly specHash: string;
  readonly prismaticJoints: readonly string[];
  readonly reach: CellArmReach | null;
}

export interface EditorConfig {
  readonly arms: readonly EditorConfigArm[];
  readonly cells: readonly { readonly id: string; readonly fileHref: string; readonly pageHref: string }[];
}

type ArmSpecJson = ArmKinematicsInput & PayloadSpec;

/** How long typing pauses before a recomputation, ms. */
const SETTLE_MS = 250;

interface Els {
  readonly root: HTMLElement;
  readonly status: HTMLElement;
  readonly form: HTMLElement;
  readonly results: HTMLElement;
  readonly download: HTMLButtonElement;
  readonly origin: HTMLElement;
}

/** Where the editor starts: the address's state, a published cell, chosen arms or the first two arms. */
async function startingCell(
  config: EditorConfig,
): Promise<{ cell: JsonObject; origin: string; problem?: string; page?: { href: string; text: string } }> {
  const encoded = stateOfHash(location.hash);
  if (encoded) {
    const decoded = decodeState(encoded);
    if (decoded.ok && typeof decoded.value === "object" && decoded.value && !Array.isArray(decoded.value))
      return { cell: decoded.value, origin: "Restored from the address." };
    if (!decoded.ok)
      return { cell: starterCell(config.arms.slice(0, 2).map((a) => a.id)), origin: "", problem: decoded.error };
  }
  const query = new URLSearchParams(location.search);
  const cellId = query.get("cell");
  if (cellId) {
    const ref = config.cells.find((c) => c.id === cellId);
    if (!ref)
      return {
        cell: starterCell(config.arms.slice(0, 2).map((a) => a.id)),
        origin: "",
        problem: `No cell study "${cellId}" on this site (known: ${config.cells.map((c) => c.id).join(", ") || "none"}).`,
      };
    const res = await fetch(ref.fileHref);
    if (!res.ok) throw new Error(`${ref.fileHref}: HTTP ${res.status}`);
    return {
      cell: (await res.json()) as JsonObject,
      origin: `Started from the published study ${cellId}.`,
      page: { href: ref.pageHref, text: "Its page (with the placement maps)" },
    };
  }
  const wanted = (query.get("arms") ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  const known = wanted.filter((id) => config.arms.some((a) => a.id === id));
  const unknown = wanted.filter((id) => !known.includes(id));
  const ids = known.length ? known : config.arms.slice(0, 2).map((a) => a.id);
  return {
    cell: starterCell(ids),
    origin: known.length ? "Started from the arms chosen on the side-by-side page." : "Started from a sample loop.",
    ...(unknown.length ? { problem: `Unknown arm ids left out: ${unknown.join(", ")}.` } : {}),
  };
}

class CellEditor {
  private state: JsonObject = {};
  private built: BuiltForm = { slots: new Map(), fields: new Map() };
  private readonly arms = new Map<string, Promise<CellArm>>();
  private readonly info: Map<string, CellArmInfo>;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private run = 0;
  private runs = 0;

  constructor(
    private readonly els: Els,
    private readonly config: EditorConfig,
  ) {
    this.info = new Map(
      config.arms.map((a) => [
        a.id,
        { id: a.id, name: a.name, sheetHref: a.sheetHref, specHash: a.specHash, prismaticJoints: a.prismaticJoints },
      ]),
    );
  }

  async start(): Promise<void> {
    this.setStatus("loading", "Loading the cell…");
    let origin = "";
    let page: { href: string; text: string } | undefined;
    try {
      const start = await startingCell(this.config);
      this.state = start.cell;
      origin = [start.origin, start.problem].filter(Boolean).join(" ");
      page = start.page;
    } catch (e) {
      this.setStatus("error", `The cell could not be loaded: ${e instanceof Error ? e.message : String(e)}`);
      this.state = starterCell(this.config.arms.slice(0, 2).map((a) => a.id));
    }
    this.els.origin.replaceChildren(origin);
    if (page) this.els.origin.append(" ", h("a", { text: page.text, attrs: { href: page.href } }), ".");
    this.els.form.addEventListener("input", (e) => this.onField(e, "input"));
    this.els.form.addEventListener("change", (e) => this.onField(e, "change"));
    this.els.download.addEventListener("click", () => this.download());
    this.rebuild();
    await this.recompute();
  }

  private onField(e: Event, type: "input" | "change"): void {
    const el = e.target as HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement;
    const json = el.dataset?.pathJson;
    if (!json) return;
    const isText = el instanceof HTMLTextAreaElement || (el instanceof HTMLInputElement && el.type === "text");
    if ((type === "input") !== isText) return;
    const path = JSON.parse(json) as PathSegment[];
    const kind = el.dataset.kind;
    let value: JsonValue | undefined;
    if (el instanceof HTMLInputElement && el.type === "checkbox") value = el.checked ? true : undefined;
    else value = fieldValue(kind === "number" ? "number" : "text", el.value);
    setAt(this.state, path, value);
    if (value === undefined) pruneOptional(this.state, path);
    this.schedule(isText ? SETTLE_MS : 0);
  }

  private change(change: FormChange): void {
    try {
      applyFormChange(this.state, change);
    } catch (e) {
      this.setStatus("invalid", `That change needs valid targets first: ${e instanceof Error ? e.message : String(e)}`);
      return;
    }
    this.rebuild();
    this.schedule(0);
  }

  private rebuild(): void {
    const arms = this.config.arms.map((a) => ({ id: a.id, name: a.name }));
    this.built = buildForm(this.els.form, this.state, arms, { structure: (c) => this.change(c) });
  }

  private schedule(ms: number): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => void this.recompute(), ms);
  }

  private armOf(id: string): Promise<CellArm> {
    let p = this.arms.get(id);
    if (!p) {
      const ref = this.config.arms.find((a) => a.id === id);
      if (!ref) return Promise.reject(new Error(`unknown arm ${id}`));
      p = fetch(ref.specHref)
        .then((r) => {
          if (!r.ok) throw new Error(`${ref.specHref}: HTTP ${r.status}`);
          return r.json() as Promise<ArmSpecJson>;
        })
        .then((spec) => ({
          id,
          chain: compileChain(spec),
          facts: {
            ratedPayloadKg: spec.ratedPayloadKg,
            mountings: spec.mountings,
            wrist: spec.wrist,
            links: spec.links,
          },
        }));
      p.catch(() => this.arms.delete(id));
      this.arms.set(id, p);
    }
    return p;
  }

  private writeAddress(): void {
    const url = new URL(location.href);
    url.hash = `${STATE_KEY}=${encodeState(this.state)}`;
    history.replaceState(null, "", url);
  }

  /** Validates, recomputes every candidate and redraws; a newer run supersedes an older one. */
  async recompute(): Promise<void> {
    const token = ++this.run;
    this.writeAddress();
    const fileId = typeof this.state.id === "string" ? this.state.id : "";
    const ids = this.config.arms.map((a) => a.id);
    const checked = validateCell(this.state, "cell file", fileId, ids);
    this.showIssues(checked.issues);
    if (!checked.ok) {
      const n = checked.issues.filter((i) => i.severity === "error").length;
      this.setStatus(
        "invalid",
        `${n} problem${n === 1 ? "" : "s"} in the cell: see the marked fields. The results below are of the last valid cell.`,
      );
      this.els.results.classList.add("stale");
      return;
    }
    this.setStatus("computing", "Computing…");
    let arms: CellArm[];
    try {
      arms = await Promise.all(checked.spec.candidates.map((id) => this.armOf(id)));
    } catch (e) {
      if (token === this.run)
        this.setStatus("error", `An arm could not be loaded: ${e instanceof Error ? e.message : String(e)}`);
      return;
    }
    if (token !== this.run) return;
    const t0 = performance.now();
    try {
      const study = cellStudy(checked.spec, arms);
      const ms = performance.now() - t0;
      this.render(checked.spec, study);
      this.runs++;
      this.els.root.dataset.runs = String(this.runs);
      this.setStatus(
        "done",
        `${arms.length} candidate${arms.length === 1 ? "" : "s"} recomputed in ${formatNumber(ms, 0)} ms.`,
      );
    } catch (e) {
      this.setStatus("error", `The study could not be computed: ${e instanceof Error ? e.message : String(e)}`);
    }
  }

  private showIssues(issues: readonly { path: string; message: string; severity: string }[]): void {
    for (const el of this.built.slots.values()) {
      el.replaceChildren();
      el.hidden = true;
    }
    for (const list of this.built.fields.values()) for (const f of list) f.removeAttribute("aria-invalid");
    const slots = new Set(this.built.slots.keys());
    for (const issue of issues) {
      const at = slotOf(issue.path, slots);
      const el = this.built.slots.get(at)!;
      el.hidden = false;
      el.append(
        h("span", {
          className: issue.severity === "error" ? "" : "warning",
          text: `${issue.path && at !== issue.path ? `${issue.path}: ` : ""}${issue.message}`,
        }),
        " ",
      );
      if (issue.severity === "error")
        for (const f of this.built.fields.get(issue.path) ?? []) f.setAttribute("aria-invalid", "true");
    }
  }

  private render(spec: CellSpec, study: ReturnType<typeof cellStudy>): void {
    const max = spec.requirements?.maxCycleS ?? null;
    const parts = study.arms.map((a) => cellArmParts(a, spec, this.info, "edit"));
    const drawings = cellDrawings(
      spec,
      study.arms.map((a) => {
        const ref = this.config.arms.find((x) => x.id === a.arm);
        return { id: a.arm, name: ref?.name ?? a.arm, shortName: ref?.shortName ?? a.arm, reach: ref?.reach ?? null };
      }),
      "edit",
    );
    const section = (id: string, title: string, ...children: (Node | string)[]) =>
      h(
        "section",
        { attrs: { id, "aria-labelledby": `${id}-heading` } },
        h("h2", { text: title, attrs: { id: `${id}-heading` } }),
        ...children,
      );
    const armSections = parts.map((p) =>
      h(
        "section",
        { className: "cell-arm", attrs: { id: `edit-${p.anchor}`, "data-arm": p.id, "data-verdict": p.verdict } },
        h("h3", {}, `${p.heading} `, h("span", { className: `verdict-tag verdict-${p.verdict}`, text: p.verdict })),
        h("p", { className: "section-intro", text: `${p.summary} ${p.placementText}` }),
        ...(p.reasons.length
          ? [h("ul", { className: "cell-reasons" }, ...p.reasons.map((r) => h("li", { text: r })))]
          : []),
        ...(p.accelerationNote ? [h("p", { className: "cell-accel-note", text: p.accelerationNote })] : []),
        tableElement(p.targets),
        tableElement(p.moves),
        h(
          "div",
          { className: "chart-grid cell-chart-wide" },
          chartElement(
            cellTimeChart({
              id: `edit-${p.id}-time`,
              title: `${p.heading.replace(/^\d+\. /, "")}: cycle by move`,
              rows: [p.timeRow],
              maxCycleS: max,
              captionExtra: p.accelerationNote,
            }),
          ),
        ),
        tableElement(p.toolLoad),
      ),
    );
    this.els.results.classList.remove("stale");
    this.els.results.replaceChildren(
      section(
        "edit-ranking",
        "Ranking",
        h("p", { className: "section-intro", text: `To pass: ${requirementsText(spec)}` }),
        tableElement(rankingTable(study, this.info, { id: "edit-ranking-table" })),
        h(
          "div",
          { className: "chart-grid cell-chart-wide" },
          chartElement(
            cellTimeChart({
              id: "edit-time",
              title: "Cycle by move, every candidate",
              rows: parts.map((p) => p.timeRow),
              maxCycleS: max,
            }),
          ),
        ),
      ),
      section(
        "edit-assumptions",
        "Assumptions",
        h(
          "ul",
          { className: "cell-assumptions" },
          ...cellAssumptions(study, this.info).map((a) => h("li", { text: a })),
        ),
      ),
      section(
        "edit-layout",
        "Cell drawings",
        h(
          "div",
          { className: "chart-grid" },
          chartElement(cellLayoutChart(drawings.top)),
          chartElement(cellLayoutChart(drawings.side)),
        ),
      ),
      ...armSections,
    );
  }

  private download(): void {
    const text = cellFileText(this.state);
    const name = typeof this.state.id === "string" && /^[a-z0-9-]+$/.test(this.state.id) ? this.state.id : "cell";
    const url = URL.createObjectURL(new Blob([text], { type: "application/json" }));
    const a = h("a", { attrs: { href: url, download: `${name}.json` } });
    document.body.append(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  }

  private setStatus(state: string, text: string): void {
    this.els.root.dataset.state = state;
    this.els.status.dataset.state = state;
    this.els.status.textContent = text;
  }
}

/** Mounts the editor on its page; resolves once the first recomputation is done (null when the page has none). */
export function mountCellEditor(doc: Document = document): Promise<void> | null {
  const root = doc.querySelector<HTMLElement>("[data-cell-editor]");
  if (!root) return null;
  const q = <T extends HTMLElement>(sel: string) => {
    const el = root.querySelector<T>(sel);
    if (!el) throw new Error(`cell editor: ${sel} missing`);
    return el;
  };
  const config = JSON.parse(root.dataset.cellEditor ?? "{}") as EditorConfig;
  const editor = new CellEditor(
    {
      root,
      status: q("[data-editor-status]"),
      form: q("[data-editor-form]"),
      results: q("[data-editor-results]"),
      download: q<HTMLButtonElement>("[data-editor-download]"),
      origin: q("[data-editor-origin]"),
    },
    config,
  );
  return editor.start();
}
