/**
 * Browser side of the straight-line check (bundled by Astro from LineCheck.astro; no inline script). It fetches
 * each arm's validated description (dist/data/arms/<id>/spec.json), compiles the chain with the same core the build
 * and `armdex line` use, runs lineCheck for the line in the form, and draws the joint-rate chart as SVG elements
 * (d3-selection over the chart's node tree: no innerHTML). The line lives in the URL query (from, to, orientation,
 * speed), so a result can be linked; a page loaded with it runs the check at once.
 *
 * One arm (arm sheet) or several (comparison page): `runLineCheckForArms` is the DOM-free part for any list of
 * arms; `mountLineCheck` wires one section; `mountAllLineChecks` every section of the page.
 */
import { compileChain, type ArmKinematicsInput, type Chain } from "../core";
import type { LineCheckResult } from "../core";
import type { Mounting } from "../core";
import { lineRatesChartNode } from "../charts/lineRatesChart";
import {
  LINE_QUERY_KEYS,
  lineCommandText,
  lineFigures,
  lineQueryPairs,
  lineRatesChartInput,
  orientationKindsFor,
  orientationWords,
  parseLineQuery,
  runLineQuery,
  type LineQuery,
} from "../view/lineCheckModel";
import { COMPARE_ARMS_KEY, type LineCheckArmRef, type LineCheckClientConfig } from "../view/lineCheckSection";
import { formatQuantity } from "../view/format";
import { appendSvgNode, h } from "./dom";

/** An arm description as the spec endpoint serves it: the kinematics plus the mountings (gravity). */
export type LineCheckSpec = ArmKinematicsInput & { readonly mountings?: readonly Mounting[] };

export interface LineCheckArm {
  readonly id: string;
  readonly name: string;
  readonly spec: LineCheckSpec;
}

export interface ArmLineOutcome {
  readonly id: string;
  readonly name: string;
  /** The check; null when it could not run (see error). */
  readonly result: LineCheckResult | null;
  readonly error: string | null;
  readonly ms: number;
}

const chains = new WeakMap<LineCheckSpec, Chain>();

function chainOf(spec: LineCheckSpec): Chain {
  let chain = chains.get(spec);
  if (!chain) {
    chain = compileChain(spec);
    chains.set(spec, chain);
  }
  return chain;
}

/**
 * Runs one line for several arms (the comparison page) or one. DOM-free: arm descriptions in, results out; an arm
 * that cannot hold the orientation, or whose description fails to compile, gets an error instead of a result.
 * @example runLineCheckForArms([{ id: "corvell-tern-7", name: "Tern 7", spec }], { fromMm: [560, -365, 230],
 *   toMm: [560, 365, 230], orientation: { kind: "down" }, speedMmPerS: 500 })[0].result.feasibleConstantSpeedMmPerS
 */
export function runLineCheckForArms(arms: readonly LineCheckArm[], query: LineQuery): ArmLineOutcome[] {
  return arms.map((arm) => {
    const started = performance.now();
    const fail = (error: string): ArmLineOutcome => ({
      id: arm.id,
      name: arm.name,
      result: null,
      error,
      ms: performance.now() - started,
    });
    let chain: Chain;
    try {
      chain = chainOf(arm.spec);
    } catch (e) {
      return fail(`The arm description could not be compiled: ${e instanceof Error ? e.message : String(e)}`);
    }
    if (!orientationKindsFor(chain.drivenCount).includes(query.orientation.kind)) {
      return fail(
        `This arm has ${chain.drivenCount} driven joints: its tool turns about one axis only, so only the "down" orientation can be checked.`,
      );
    }
    try {
      const result = runLineQuery(chain, arm.spec.mountings ?? ["floor"], query);
      return { id: arm.id, name: arm.name, result, error: null, ms: performance.now() - started };
    } catch (e) {
      return fail(`The line could not be checked: ${e instanceof Error ? e.message : String(e)}`);
    }
  });
}

// ---------------------------------------------------------------------------------------------------------------
// DOM

function figureRow(
  term: string,
  value: string,
  key: string,
  extra: Record<string, string> = {},
  caveat: string | null = null,
): HTMLElement {
  const dd = h("dd", { text: value, attrs: { "data-key": key, ...extra } });
  if (caveat) dd.append(" ", h("span", { className: "line-caveat", text: `(${caveat})` }));
  return h("div", { className: "line-figure-row" }, h("dt", { text: term }), dd);
}

/** The result block of one arm. */
function outcomeBlock(
  o: ArmLineOutcome,
  query: LineQuery,
  ref: LineCheckArmRef | undefined,
  several: boolean,
): HTMLElement {
  const block = h("article", { className: "line-result", attrs: { "data-arm": o.id } });
  if (several) block.append(h("h4", { text: o.name }));
  if (!o.result) {
    block.append(h("p", { className: "line-error", text: o.error ?? "No result." }));
    return block;
  }
  const r = o.result;
  const f = lineFigures(r);
  const feasibleExtra: Record<string, string> =
    f.feasibleMmPerS === null ? {} : { "data-value": String(f.feasibleMmPerS) };
  block.append(
    h(
      "dl",
      { className: "line-figures" },
      figureRow("Largest constant speed", f.feasibleText, "feasible", feasibleExtra, f.feasibleCaveat),
      figureRow("Commanded speed", f.commandedText, "commanded"),
      figureRow("Bottleneck", f.bottleneckText, "bottleneck"),
      figureRow("Closest to a singular pose", f.singularityText, "singularity"),
      figureRow("Start posture", f.startText, "start"),
    ),
  );
  if (f.problems.length > 0)
    block.append(h("ul", { className: "line-problems" }, ...f.problems.map((p) => h("li", { text: p }))));
  const figure = h("figure", { className: "chart-figure line-chart" });
  const title = several ? `${o.name}: joint rates along the line` : "Joint rates along the line";
  appendSvgNode(figure, lineRatesChartNode(lineRatesChartInput(r, `line-rates-check-${o.id}`, title)));
  figure.append(
    h("figcaption", {
      text: `${orientationWords(query.orientation)}; flange centre as the tool point; ratios at ${formatQuantity(query.speedMmPerS, "mm/s")}. Computed in this browser in ${Math.max(1, Math.round(o.ms))} ms.`,
    }),
  );
  block.append(figure);
  if (ref)
    block.append(
      h(
        "p",
        { className: "line-command" },
        document.createTextNode("Full JSON: "),
        h("code", { text: lineCommandText(ref.file, query) }),
      ),
    );
  return block;
}

/** Summary table of several arms. */
function summaryTable(outcomes: readonly ArmLineOutcome[]): HTMLElement {
  const table = h(
    "table",
    { className: "data-table line-summary" },
    h("caption", { text: "Largest constant speed per arm" }),
  );
  const head = h(
    "thead",
    {},
    h(
      "tr",
      {},
      h("th", { text: "Arm", attrs: { scope: "col" } }),
      h("th", { text: "Largest constant speed", attrs: { scope: "col" } }),
      h("th", { text: "Bottleneck", attrs: { scope: "col" } }),
    ),
  );
  const body = h("tbody");
  for (const o of outcomes) {
    const f = o.result ? lineFigures(o.result) : null;
    body.append(
      h(
        "tr",
        { attrs: { "data-arm": o.id } },
        h("th", { text: o.name, attrs: { scope: "row" } }),
        h("td", { text: f ? f.feasibleText : "not checked" }),
        h("td", { text: f ? f.bottleneckText : (o.error ?? "") }),
      ),
    );
  }
  table.append(head, body);
  return h("div", { className: "table-scroll" }, table);
}

const FIELDS = [
  "from-x",
  "from-y",
  "from-z",
  "to-x",
  "to-y",
  "to-z",
  "orientation",
  "roll",
  "pitch",
  "yaw",
  "speed",
] as const;

function field(form: HTMLFormElement, name: (typeof FIELDS)[number]): HTMLInputElement | HTMLSelectElement {
  const el = form.elements.namedItem(name);
  if (!(el instanceof HTMLInputElement || el instanceof HTMLSelectElement))
    throw new Error(`line check form: no field ${name}`);
  return el;
}

/** The form's values as the query-string pairs parseLineQuery reads. */
function formPairs(form: HTMLFormElement): Map<string, string> {
  const v = (name: (typeof FIELDS)[number]) => field(form, name).value.trim();
  const orientation = v("orientation") === "rpy" ? `${v("roll")},${v("pitch")},${v("yaw")}` : v("orientation");
  return new Map([
    ["from", `${v("from-x")},${v("from-y")},${v("from-z")}`],
    ["to", `${v("to-x")},${v("to-y")},${v("to-z")}`],
    ["orientation", orientation],
    ["speed", v("speed")],
  ]);
}

function fillForm(form: HTMLFormElement, q: LineQuery): void {
  const set = (name: (typeof FIELDS)[number], value: number | string) => (field(form, name).value = String(value));
  set("from-x", q.fromMm[0]);
  set("from-y", q.fromMm[1]);
  set("from-z", q.fromMm[2]);
  set("to-x", q.toMm[0]);
  set("to-y", q.toMm[1]);
  set("to-z", q.toMm[2]);
  const select = field(form, "orientation") as HTMLSelectElement;
  const hasOption = Array.from(select.options).some((o) => o.value === q.orientation.kind);
  select.value = hasOption ? q.orientation.kind : "down";
  if (q.orientation.kind === "rpy") {
    set("roll", q.orientation.rpyDeg[0]);
    set("pitch", q.orientation.rpyDeg[1]);
    set("yaw", q.orientation.rpyDeg[2]);
  }
  set("speed", q.speedMmPerS);
  syncOrientation(form);
}

/** Shows the roll, pitch, yaw fields only for that choice (the hidden attribute; no inline style). */
function syncOrientation(form: HTMLFormElement): void {
  const rpy = form.querySelector<HTMLElement>("[data-line-rpy]");
  if (rpy) rpy.hidden = field(form, "orientation").value !== "rpy";
}

/** The page URL with the line state in its query (other keys, such as `arms`, kept) and the section as fragment. */
export function urlWithLine(href: string, q: LineQuery, fragment: string): string {
  const url = new URL(href);
  for (const k of LINE_QUERY_KEYS) url.searchParams.delete(k);
  for (const [k, v] of lineQueryPairs(q)) url.searchParams.set(k, v);
  url.hash = fragment;
  return url.href;
}

const nextFrame = () => new Promise<void>((resolve) => requestAnimationFrame(() => setTimeout(resolve, 0)));

/** Wires one section: the form, the URL state, the results. */
export function mountLineCheck(root: HTMLElement): void {
  const config = JSON.parse(root.dataset.lineCheck ?? "{}") as LineCheckClientConfig;
  const form = root.querySelector<HTMLFormElement>("form[data-line-form]");
  const status = root.querySelector<HTMLElement>("[data-line-status]");
  const results = root.querySelector<HTMLElement>("[data-line-results]");
  if (!form || !status || !results || !Array.isArray(config.arms) || config.arms.length === 0) return;
  const params = new URLSearchParams(location.search);
  const say = (text: string, state: "idle" | "running" | "done" | "error") => {
    status.textContent = text;
    root.dataset.state = state;
  };
  // The arms to check: all of them, or (comparison page) those the address names, in its order.
  let arms: readonly LineCheckArmRef[] = config.arms;
  let skipped = "";
  if (config.armsFromQuery) {
    const ids = (params.get(COMPARE_ARMS_KEY) ?? "")
      .split(",")
      .map((x) => x.trim())
      .filter((x) => x !== "");
    const unknown = ids.filter((id) => !config.arms.some((a) => a.id === id));
    arms = [...new Set(ids)].flatMap((id) => config.arms.filter((a) => a.id === id));
    if (unknown.length > 0) skipped = ` No arm has the id ${unknown.map((u) => `"${u}"`).join(", ")}: left out.`;
    if (arms.length === 0) {
      say(`The line check needs arms: the address names none (?${COMPARE_ARMS_KEY}=<id>,<id>).${skipped}`, "error");
      return;
    }
  }
  const several = arms.length > 1;
  const specs = new Map<string, Promise<LineCheckSpec>>();
  const loadSpec = (ref: LineCheckArmRef) => {
    let p = specs.get(ref.id);
    if (!p) {
      p = fetch(ref.specHref).then(async (res) => {
        if (!res.ok) throw new Error(`the description of ${ref.name} could not be loaded (HTTP ${res.status})`);
        return (await res.json()) as LineCheckSpec;
      });
      p.catch(() => specs.delete(ref.id));
      specs.set(ref.id, p);
    }
    return p;
  };

  const run = async (q: LineQuery) => {
    say(several ? `Checking the line for ${arms.length} arms…` : "Checking the line…", "running");
    results.replaceChildren();
    let loaded: LineCheckArm[];
    try {
      loaded = await Promise.all(arms.map(async (ref) => ({ id: ref.id, name: ref.name, spec: await loadSpec(ref) })));
    } catch (e) {
      say(`Could not run the check: ${e instanceof Error ? e.message : String(e)}.`, "error");
      return;
    }
    await nextFrame();
    const started = performance.now();
    const outcomes = runLineCheckForArms(loaded, q);
    const ms = performance.now() - started;
    const link = h("a", {
      text: "Link to this check",
      attrs: { href: urlWithLine(location.href, q, root.id || "line-check"), "data-line-link": "" },
    });
    const blocks: Node[] = [h("p", { className: "line-permalink" }, link)];
    if (several) blocks.push(summaryTable(outcomes));
    for (const o of outcomes)
      blocks.push(
        outcomeBlock(
          o,
          q,
          arms.find((a) => a.id === o.id),
          several,
        ),
      );
    results.replaceChildren(...blocks);
    const failed = outcomes.filter((o) => !o.result).length;
    say(
      failed === outcomes.length
        ? "The line could not be checked; see below."
        : `Checked in ${Math.max(1, Math.round(ms))} ms${failed ? `; ${failed} arm${failed === 1 ? "" : "s"} could not be checked` : ""}.${skipped}`,
      failed === outcomes.length ? "error" : "done",
    );
  };

  field(form, "orientation").addEventListener("change", () => syncOrientation(form));
  form.addEventListener("submit", (event) => {
    event.preventDefault();
    const pairs = formPairs(form);
    const parsed = parseLineQuery((k) => pairs.get(k) ?? null);
    if (!parsed || !parsed.ok) {
      say(`Please correct the line: ${parsed ? parsed.errors.join("; ") : "no values"}.`, "error");
      return;
    }
    history.replaceState(null, "", urlWithLine(location.href, parsed.query, root.id || "line-check"));
    void run(parsed.query);
  });

  // A page opened with a line in its URL runs it at once; otherwise the first arm's default line fills the form.
  const fromUrl = parseLineQuery((k) => params.get(k));
  if (fromUrl === null) {
    const defaults = new Map(arms[0]!.defaults);
    const parsedDefaults = parseLineQuery((k) => defaults.get(k) ?? null);
    if (parsedDefaults?.ok) fillForm(form, parsedDefaults.query);
    say(skipped.trim(), "idle");
  } else if (!fromUrl.ok) {
    say(`The line in the address could not be read: ${fromUrl.errors.join("; ")}.`, "error");
  } else {
    fillForm(form, fromUrl.query);
    void run(fromUrl.query);
  }
}

/** Wires every straight-line check section of the document. */
export function mountAllLineChecks(doc: Document = document): void {
  for (const root of doc.querySelectorAll<HTMLElement>("[data-line-check]")) mountLineCheck(root);
}
