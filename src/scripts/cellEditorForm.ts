/**
 * The cell editor's form, built from the cell being edited (a plain JSON value) and rebuilt when its structure
 * changes (an entry added, removed or moved, a target switched between absolute and relative, a name changed). Each
 * field carries the JSON path it edits (`data-path`, the path the validator reports), so a value change writes one
 * place of the state and an issue finds its field. DOM only through `h` (text as textContent).
 */
import { toPath } from "../catalog/issues";
import {
  fieldText,
  getAt,
  type FormChange,
  type JsonObject,
  type JsonValue,
  type PathSegment,
} from "../view/cellEditorState";
import { h } from "./dom";

export interface EditorArm {
  readonly id: string;
  readonly name: string;
}

/**
 * What the form asks of the editor. Field values are not passed here: each field carries its JSON path
 * (`data-path-json`) and kind (`data-kind`), and the editor listens to the form's input and change events.
 */
export interface FormHandlers {
  /** A structural change: the editor applies it to the state, rebuilds the form and recomputes. */
  structure(change: FormChange): void;
}

/** The built form: where each JSON path's messages go, and the fields that edit it. */
export interface BuiltForm {
  readonly slots: Map<string, HTMLElement>;
  readonly fields: Map<string, HTMLElement[]>;
}

interface Ctx extends BuiltForm {
  readonly state: JsonObject;
  readonly arms: readonly EditorArm[];
  readonly on: FormHandlers;
}

const isObject = (v: unknown): v is JsonObject => typeof v === "object" && v !== null && !Array.isArray(v);
const listAt = (ctx: Ctx, path: readonly PathSegment[]): JsonValue[] => {
  const v = getAt(ctx.state, path);
  return Array.isArray(v) ? v : [];
};
const namesOf = (list: readonly JsonValue[]) =>
  list.map((e) => (isObject(e) && typeof e.name === "string" ? e.name : "")).filter((n) => n !== "");

/** A place for messages about `path` (shown by the editor after validation). */
function slot(ctx: Ctx, path: readonly PathSegment[]): HTMLElement {
  const key = toPath(path);
  const el = h("p", { className: "field-error", attrs: { "data-errors-for": key, hidden: "" } });
  ctx.slots.set(key, el);
  return el;
}

function register(ctx: Ctx, path: readonly PathSegment[], el: HTMLElement): void {
  const key = toPath(path);
  el.dataset.path = key;
  el.dataset.pathJson = JSON.stringify(path);
  const list = ctx.fields.get(key) ?? [];
  list.push(el);
  ctx.fields.set(key, list);
}

function input(
  ctx: Ctx,
  labelText: string,
  path: readonly PathSegment[],
  kind: "number" | "text",
  opts: { unit?: string; wide?: boolean } = {},
): HTMLElement {
  const el = h("input", {
    className: opts.wide ? "wide" : "",
    attrs: {
      type: "text",
      autocomplete: "off",
      spellcheck: "false",
      ...(kind === "number" ? { inputmode: "decimal" } : {}),
    },
  });
  el.value = fieldText(getAt(ctx.state, path));
  el.dataset.kind = kind;
  register(ctx, path, el);
  const text = opts.unit ? `${labelText} (${opts.unit})` : labelText;
  return h("label", { className: opts.wide ? "wide-label" : "" }, h("span", { text }), el);
}

function select(
  ctx: Ctx,
  labelText: string,
  path: readonly PathSegment[],
  options: readonly { value: string; label: string }[],
  none?: string,
): HTMLElement {
  const current = getAt(ctx.state, path);
  const el = h("select");
  if (none !== undefined) el.append(h("option", { text: none, attrs: { value: "" } }));
  for (const o of options) el.append(h("option", { text: o.label, attrs: { value: o.value } }));
  if (typeof current === "string" && !options.some((o) => o.value === current))
    el.append(h("option", { text: `${current} (unknown)`, attrs: { value: current } }));
  el.value = typeof current === "string" ? current : "";
  el.dataset.kind = "text";
  register(ctx, path, el);
  return h("label", {}, h("span", { text: labelText }), el);
}

function vec3(ctx: Ctx, labelText: string, path: readonly PathSegment[], axes: readonly string[], unit: string) {
  return h(
    "div",
    { className: "field-row" },
    h("span", { className: "field-group-label", text: `${labelText} (${unit})` }),
    ...axes.map((a, k) => input(ctx, a, [...path, k], "number")),
    slot(ctx, path),
  );
}

function button(text: string, change: FormChange, ctx: Ctx, attrs: Record<string, string> = {}): HTMLButtonElement {
  const b = h("button", { text, attrs: { type: "button", ...attrs } });
  b.addEventListener("click", () => ctx.on.structure(change));
  return b;
}

function entryTools(ctx: Ctx, list: readonly PathSegment[], i: number, n: number, what: string, movable: boolean) {
  const tools = h("div", { className: "entry-tools" });
  if (movable) {
    const up = button("\u2191", { kind: "move", list, index: i, by: -1 }, ctx, { "aria-label": `Move ${what} up` });
    const down = button("\u2193", { kind: "move", list, index: i, by: 1 }, ctx, { "aria-label": `Move ${what} down` });
    up.disabled = i === 0;
    down.disabled = i === n - 1;
    tools.append(up, down);
  }
  tools.append(button("Remove", { kind: "remove", list, index: i }, ctx, { "aria-label": `Remove ${what}` }));
  return tools;
}

/** A name field whose change renames the references to it (targets, parts). */
function nameField(ctx: Ctx, path: readonly PathSegment[], what: "target" | "part" | null): HTMLElement {
  const label = input(ctx, "Name", path, "text");
  const el = label.querySelector("input")!;
  if (what) {
    const old = fieldText(getAt(ctx.state, path));
    el.addEventListener("change", () => {
      if (old && el.value.trim() && el.value !== old)
        ctx.on.structure({ kind: "rename", what, from: old, to: el.value });
    });
  }
  return label;
}

function studySection(ctx: Ctx): HTMLElement {
  const candidates = listAt(ctx, ["candidates"]).filter((v): v is string => typeof v === "string");
  const boxes = ctx.arms.map((a) => {
    const box = h("input", { attrs: { type: "checkbox", value: a.id } });
    box.checked = candidates.includes(a.id);
    box.addEventListener("change", () => ctx.on.structure({ kind: "candidate", id: a.id, on: box.checked }));
    return h("label", { className: "inline" }, box, h("span", { text: a.name }));
  });
  const desc = h("textarea", { attrs: { rows: "2" } });
  desc.value = fieldText(getAt(ctx.state, ["description"]));
  desc.dataset.kind = "text";
  register(ctx, ["description"], desc);
  return h(
    "fieldset",
    {},
    h("legend", { text: "Study" }),
    h(
      "div",
      { className: "field-row" },
      input(ctx, "Id (file name)", ["id"], "text"),
      slot(ctx, ["id"]),
      input(ctx, "Title", ["title"], "text", { wide: true }),
      slot(ctx, ["title"]),
    ),
    h(
      "div",
      { className: "field-row" },
      h("label", {}, h("span", { text: "Description" }), desc),
      slot(ctx, ["description"]),
    ),
    h("p", { className: "field-group-label", text: "Candidate arms" }),
    h("div", { className: "cell-editor-candidates" }, ...boxes),
    slot(ctx, ["candidates"]),
    ...candidates.map((_, i) => slot(ctx, ["candidates", i])),
  );
}

function placementSection(ctx: Ctx): HTMLElement {
  const candidates = listAt(ctx, ["candidates"]).filter((v): v is string => typeof v === "string");
  const own = isObject(ctx.state.placements) ? Object.keys(ctx.state.placements) : [];
  const name = (id: string) => ctx.arms.find((a) => a.id === id)?.name ?? id;
  const entries = own.map((id) => {
    const keySelect = h("select", { attrs: { "aria-label": "Arm" } });
    for (const c of new Set([...candidates, id])) keySelect.append(h("option", { text: name(c), attrs: { value: c } }));
    keySelect.value = id;
    keySelect.addEventListener("change", () =>
      ctx.on.structure({ kind: "placement-key", from: id, to: keySelect.value }),
    );
    const path = ["placements", id];
    return h(
      "div",
      { className: "entry" },
      h(
        "div",
        { className: "field-row" },
        h("label", {}, h("span", { text: "Arm" }), keySelect),
        button("Remove", { kind: "placement-remove", id }, ctx, {
          "aria-label": `Remove the placement of ${name(id)}`,
        }),
        slot(ctx, path),
      ),
      vec3(ctx, "Base position", [...path, "positionMm"], ["x", "y", "z"], "mm"),
      vec3(ctx, "Base roll, pitch, yaw", [...path, "rpyDeg"], ["roll", "pitch", "yaw"], "°"),
    );
  });
  const add = button("Add a placement for one arm", { kind: "placement-add" }, ctx);
  add.disabled = candidates.every((c) => own.includes(c));
  return h(
    "fieldset",
    {},
    h("legend", { text: "Placement of the arms" }),
    h("p", {
      className: "field-hint",
      text: "The base frame in the cell frame (z up). Base z up: floor; down: ceiling; horizontal: wall; else angled.",
    }),
    vec3(ctx, "Base position", ["placement", "positionMm"], ["x", "y", "z"], "mm"),
    vec3(ctx, "Base roll, pitch, yaw", ["placement", "rpyDeg"], ["roll", "pitch", "yaw"], "°"),
    slot(ctx, ["placement"]),
    h("p", { className: "field-group-label", text: "Per-arm placements (another pedestal)" }),
    ...entries,
    slot(ctx, ["placements"]),
    add,
  );
}

function bodyEntries(ctx: Ctx, list: readonly PathSegment[], what: "tool body" | "part"): HTMLElement[] {
  const items = listAt(ctx, list);
  return items.map((_, i) => {
    const p = [...list, i];
    return h(
      "div",
      { className: "entry" },
      h(
        "div",
        { className: "field-row" },
        nameField(ctx, [...p, "name"], what === "part" ? "part" : null),
        input(ctx, "Mass", [...p, "massKg"], "number", { unit: "kg" }),
        entryTools(ctx, list, i, items.length, what, false),
        slot(ctx, p),
        slot(ctx, [...p, "name"]),
        slot(ctx, [...p, "massKg"]),
      ),
      vec3(ctx, "Centre of gravity, flange frame", [...p, "cogMm"], ["x", "y", "z"], "mm"),
      h(
        "div",
        { className: "field-row" },
        h("span", { className: "field-group-label", text: "Inertia about its CG, flange axes (kg·m², optional)" }),
        ...["xx", "yy", "zz", "xy", "xz", "yz"].map((k) => input(ctx, k, [...p, "inertiaKgM2", k], "number")),
        slot(ctx, [...p, "inertiaKgM2"]),
      ),
    );
  });
}

function toolSection(ctx: Ctx): HTMLElement {
  const newBody = { name: `body ${listAt(ctx, ["tool", "bodies"]).length + 1}`, massKg: 1, cogMm: [0, 0, 50] };
  const newPart = { name: `part ${listAt(ctx, ["parts"]).length + 1}`, massKg: 1, cogMm: [0, 0, 150] };
  return h(
    "fieldset",
    {},
    h("legend", { text: "Tool and parts" }),
    vec3(ctx, "Tool point (TCP), flange frame", ["tool", "tcp", "xyzMm"], ["x", "y", "z"], "mm"),
    vec3(ctx, "Tool frame roll, pitch, yaw", ["tool", "tcp", "rpyDeg"], ["roll", "pitch", "yaw"], "°"),
    slot(ctx, ["tool"]),
    h("p", { className: "field-group-label", text: "Tool bodies" }),
    ...bodyEntries(ctx, ["tool", "bodies"], "tool body"),
    slot(ctx, ["tool", "bodies"]),
    button("Add a tool body", { kind: "add", list: ["tool", "bodies"], entry: newBody }, ctx),
    h("p", { className: "field-group-label", text: "Parts (centre of gravity while gripped)" }),
    ...bodyEntries(ctx, ["parts"], "part"),
    slot(ctx, ["parts"]),
    button("Add a part", { kind: "add", list: ["parts"], entry: newPart }, ctx),
  );
}

function targetsSection(ctx: Ctx): HTMLElement {
  const items = listAt(ctx, ["targets"]);
  const names = namesOf(items);
  const entries = items.map((t, i) => {
    const p = ["targets", i];
    const relative = isObject(t) && "relativeTo" in t;
    const form = h("select", { attrs: { "aria-label": "Form of the target" } });
    form.append(h("option", { text: "absolute pose", attrs: { value: "absolute" } }));
    if (names.length > 1)
      form.append(h("option", { text: "offset from another target", attrs: { value: "relative" } }));
    form.value = relative ? "relative" : "absolute";
    const own = isObject(t) && typeof t.name === "string" ? t.name : "";
    form.addEventListener("change", () =>
      ctx.on.structure({
        kind: "target-form",
        index: i,
        base: form.value === "relative" ? (names.find((n) => n !== own) ?? null) : null,
      }),
    );
    const body = relative
      ? [
          h(
            "div",
            { className: "field-row" },
            select(
              ctx,
              "Offset from",
              [...p, "relativeTo"],
              names.filter((n) => n !== own).map((n) => ({ value: n, label: n })),
            ),
            slot(ctx, [...p, "relativeTo"]),
          ),
          vec3(ctx, "Offset, cell frame", [...p, "offsetMm"], ["x", "y", "z"], "mm"),
        ]
      : [
          vec3(ctx, "Tool-point position, cell frame", [...p, "positionMm"], ["x", "y", "z"], "mm"),
          vec3(ctx, "Tool orientation roll, pitch, yaw", [...p, "rpyDeg"], ["roll", "pitch", "yaw"], "°"),
        ];
    return h(
      "div",
      { className: "entry" },
      h(
        "div",
        { className: "field-row" },
        nameField(ctx, [...p, "name"], "target"),
        h("label", {}, h("span", { text: "Form" }), form),
        entryTools(ctx, ["targets"], i, items.length, `target ${own}`, false),
        slot(ctx, p),
        slot(ctx, [...p, "name"]),
      ),
      ...body,
    );
  });
  const fresh = { name: `target ${items.length + 1}`, positionMm: [500, 0, 300], rpyDeg: [180, 0, 0] };
  return h(
    "fieldset",
    {},
    h("legend", { text: "Targets" }),
    h("p", {
      className: "field-hint",
      text: "Tool-point poses in the cell frame (rpy: R = Rz(yaw)·Ry(pitch)·Rx(roll)), or an offset from another target keeping its orientation.",
    }),
    ...entries,
    slot(ctx, ["targets"]),
    button("Add a target", { kind: "add", list: ["targets"], entry: fresh }, ctx),
  );
}

function stepEntry(ctx: Ctx, s: JsonValue, i: number, n: number, targets: string[], parts: string[]): HTMLElement {
  const p = ["cycle", i];
  const motion = isObject(s) && s.motion === "linear" ? "linear" : "joint";
  const motionSelect = h("select", { attrs: { "aria-label": `Motion of step ${i + 1}` } });
  motionSelect.append(
    h("option", { text: "joint", attrs: { value: "joint" } }),
    h("option", { text: "linear", attrs: { value: "linear" } }),
  );
  motionSelect.value = motion;
  motionSelect.addEventListener("change", () =>
    ctx.on.structure({ kind: "motion", index: i, motion: motionSelect.value === "linear" ? "linear" : "joint" }),
  );
  const release = h("input", { attrs: { type: "checkbox" } });
  release.checked = isObject(s) && s.release === true;
  release.dataset.kind = "raw";
  register(ctx, [...p, "release"], release);
  return h(
    "div",
    { className: "entry" },
    h(
      "div",
      { className: "field-row" },
      h("span", { className: "step-number", text: `Step ${i + 1}` }),
      select(
        ctx,
        "To",
        [...p, "to"],
        targets.map((t) => ({ value: t, label: t })),
      ),
      h("label", {}, h("span", { text: "Motion" }), motionSelect),
      motion === "joint"
        ? input(ctx, "Speed", [...p, "speedPercent"], "number", { unit: "%" })
        : input(ctx, "Tool speed cap", [...p, "speedMmPerS"], "number", { unit: "mm/s" }),
      input(ctx, "Dwell", [...p, "dwellS"], "number", { unit: "s" }),
      select(
        ctx,
        "Grip on arrival",
        [...p, "grip"],
        parts.map((t) => ({ value: t, label: t })),
        "nothing",
      ),
      h("label", { className: "inline" }, release, h("span", { text: "release on arrival" })),
      entryTools(ctx, ["cycle"], i, n, `step ${i + 1}`, true),
      ...[
        p,
        [...p, "to"],
        [...p, "speedPercent"],
        [...p, "speedMmPerS"],
        [...p, "dwellS"],
        [...p, "grip"],
        [...p, "release"],
      ].map((q) => slot(ctx, q)),
    ),
  );
}

function cycleSection(ctx: Ctx): HTMLElement {
  const items = listAt(ctx, ["cycle"]);
  const targets = namesOf(listAt(ctx, ["targets"]));
  const parts = namesOf(listAt(ctx, ["parts"]));
  const fresh = { to: targets[0] ?? "", motion: "joint", speedPercent: 100 };
  return h(
    "fieldset",
    {},
    h("legend", { text: "Loop of moves" }),
    h("p", {
      className: "field-hint",
      text: "The arm starts at the last step's target; each step moves to its target and waits its dwell there. A step that releases and grips sets one part down before it takes the next. Blank speed: 100 % (joint moves) or the joints' limits (linear moves).",
    }),
    ...items.map((s, i) => stepEntry(ctx, s, i, items.length, targets, parts)),
    slot(ctx, ["cycle"]),
    button("Add a step", { kind: "add", list: ["cycle"], entry: fresh }, ctx),
  );
}

function requirementsSection(ctx: Ctx): HTMLElement {
  return h(
    "fieldset",
    {},
    h("legend", { text: "Requirements (optional)" }),
    h(
      "div",
      { className: "field-row" },
      input(ctx, "Cycle time at most", ["requirements", "maxCycleS"], "number", { unit: "s" }),
      input(ctx, "Joint margin at every target at least", ["requirements", "minJointMarginDeg"], "number", {
        unit: "°",
      }),
      slot(ctx, ["requirements"]),
      slot(ctx, ["requirements", "maxCycleS"]),
      slot(ctx, ["requirements", "minJointMarginDeg"]),
    ),
  );
}

/** Builds the form for `state` into `form` (its previous content replaced). */
export function buildForm(
  form: HTMLElement,
  state: JsonObject,
  arms: readonly EditorArm[],
  on: FormHandlers,
): BuiltForm {
  const ctx: Ctx = { state, arms, on, slots: new Map(), fields: new Map() };
  const top = h("p", { className: "field-error", attrs: { "data-errors-for": "", hidden: "" } });
  ctx.slots.set("", top);
  form.replaceChildren(
    top,
    studySection(ctx),
    placementSection(ctx),
    toolSection(ctx),
    targetsSection(ctx),
    cycleSection(ctx),
    requirementsSection(ctx),
  );
  return { slots: ctx.slots, fields: ctx.fields };
}
