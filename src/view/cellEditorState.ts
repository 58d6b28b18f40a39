/**
 * The cell editor's state, DOM-free: the cell file being edited as a plain JSON value, how it travels in the address
 * (`#state=` + base64url of its UTF-8 JSON, RFC 4648 §5, no padding), how form fields read and write it (by JSON
 * path), renaming a target or part together with the entries that name it, a starter cell for chosen arms, and the
 * cell file as the editor saves it (`$schema` first, ready for arms/cells/).
 */
import { resolveTargets, type TargetSpec } from "../core";

/** The cell file's `$schema` as files in arms/cells/ write it. */
export const CELL_SCHEMA_REF = "../../public/schema/cell.schema.json";

/** The address fragment key of the state. */
export const STATE_KEY = "state";

export type JsonValue = null | boolean | number | string | JsonValue[] | { [key: string]: JsonValue };
export type JsonObject = { [key: string]: JsonValue };
export type PathSegment = string | number;

const B64 = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_";

/**
 * Bytes as base64url without padding (RFC 4648 §5).
 * @example base64UrlOfBytes(new TextEncoder().encode("?>")) // "Pz4"
 */
export function base64UrlOfBytes(bytes: Uint8Array): string {
  let out = "";
  for (let i = 0; i < bytes.length; i += 3) {
    const n = (bytes[i]! << 16) | ((bytes[i + 1] ?? 0) << 8) | (bytes[i + 2] ?? 0);
    const left = bytes.length - i;
    out += B64[(n >> 18) & 63]! + B64[(n >> 12) & 63]!;
    if (left > 1) out += B64[(n >> 6) & 63]!;
    if (left > 2) out += B64[n & 63]!;
  }
  return out;
}

/**
 * base64url (padding optional) to bytes.
 * @throws RangeError naming the first character that is not base64url, or an impossible length
 */
export function bytesOfBase64Url(text: string): Uint8Array {
  const clean = text.replace(/=+$/, "");
  if (clean.length % 4 === 1) throw new RangeError(`invalid base64url length: ${clean.length}`);
  const out = new Uint8Array(Math.floor((clean.length * 3) / 4));
  let bits = 0,
    value = 0,
    k = 0;
  for (let i = 0; i < clean.length; i++) {
    const v = B64.indexOf(clean[i]!);
    if (v < 0) throw new RangeError(`invalid base64url character ${JSON.stringify(clean[i])} at ${i}`);
    value = (value << 6) | v;
    bits += 6;
    if (bits >= 8) {
      bits -= 8;
      out[k++] = (value >> bits) & 255;
    }
  }
  return out;
}

/** The state as the address carries it. */
export function encodeState(value: JsonValue): string {
  return base64UrlOfBytes(new TextEncoder().encode(JSON.stringify(value)));
}

/** The state from the address, or what is wrong with it. */
export function decodeState(text: string): { ok: true; value: JsonValue } | { ok: false; error: string } {
  try {
    const json = new TextDecoder("utf-8", { fatal: true }).decode(bytesOfBase64Url(text));
    return { ok: true, value: JSON.parse(json) as JsonValue };
  } catch (e) {
    return {
      ok: false,
      error: `the cell in the address could not be read: ${e instanceof Error ? e.message : String(e)}`,
    };
  }
}

/** The encoded state of an address fragment ("#state=…"), or null. */
export function stateOfHash(hash: string): string | null {
  const params = new URLSearchParams(hash.replace(/^#/, ""));
  return params.get(STATE_KEY);
}

const isObject = (v: unknown): v is JsonObject => typeof v === "object" && v !== null && !Array.isArray(v);

/** The value at a path, or undefined. */
export function getAt(root: JsonValue | undefined, path: readonly PathSegment[]): JsonValue | undefined {
  let v: JsonValue | undefined = root;
  for (const s of path) {
    if (typeof s === "number") v = Array.isArray(v) ? v[s] : undefined;
    else v = isObject(v) ? v[s] : undefined;
    if (v === undefined) return undefined;
  }
  return v;
}

/**
 * Writes `value` at `path` in `root` (in place), making the objects and arrays on the way; undefined removes the key
 * (an array entry becomes null: positions of the other entries keep their meaning).
 */
export function setAt(root: JsonObject, path: readonly PathSegment[], value: JsonValue | undefined): void {
  if (!path.length) throw new RangeError("invalid path: empty");
  let v: JsonValue = root;
  for (let i = 0; i < path.length - 1; i++) {
    const s = path[i]!;
    const nextIsIndex = typeof path[i + 1] === "number";
    const container = v as JsonObject & JsonValue[];
    let next: JsonValue | undefined = container[s as never];
    if (typeof next !== "object" || next === null) {
      next = nextIsIndex ? [] : {};
      container[s as never] = next as never;
    }
    v = next;
  }
  const last = path[path.length - 1]!;
  if (Array.isArray(v) && typeof last === "number") v[last] = value === undefined ? null : value;
  else if (isObject(v)) {
    if (value === undefined) delete v[last as string];
    else v[last as string] = value;
  }
}

/**
 * What a text field holds: blank → undefined (the key is left out), a number → the number, anything else → the text
 * (so validation can say what it found).
 * @example fieldValue("number", " 12.5 ") // 12.5
 * @example fieldValue("number", "") // undefined
 * @example fieldValue("number", "12 kg") // "12 kg"
 */
export function fieldValue(kind: "number" | "text", text: string): JsonValue | undefined {
  const t = text.trim();
  if (kind === "text") return t === "" ? undefined : text;
  if (t === "") return undefined;
  const n = Number(t);
  return Number.isFinite(n) ? n : text;
}

/** The text a field shows for a value. */
export function fieldText(value: JsonValue | undefined): string {
  if (value === undefined || value === null) return "";
  return typeof value === "string" ? value : typeof value === "number" ? String(value) : JSON.stringify(value);
}

/**
 * Renames a target or a part and every entry that names it: `relativeTo` and the steps' `to` for a target, the steps'
 * `grip` for a part. In place; returns how many references were changed.
 */
export function renameReferences(cell: JsonObject, kind: "target" | "part", from: string, to: string): number {
  if (from === to) return 0;
  let changed = 0;
  const steps = Array.isArray(cell.cycle) ? cell.cycle : [];
  if (kind === "target") {
    for (const t of Array.isArray(cell.targets) ? cell.targets : [])
      if (isObject(t) && t.relativeTo === from) {
        t.relativeTo = to;
        changed++;
      }
    for (const s of steps)
      if (isObject(s) && s.to === from) {
        s.to = to;
        changed++;
      }
  } else {
    for (const s of steps)
      if (isObject(s) && s.grip === from) {
        s.grip = to;
        changed++;
      }
  }
  return changed;
}

/**
 * Turns target `index` into the other form, keeping where it is: absolute → an offset from `base` (its position minus
 * the base's; the base's orientation then applies), relative → its resolved position and orientation. In place.
 * @throws RangeError when the targets cannot be resolved (a loop, an unknown name): the form shows the errors first
 */
export function switchTargetForm(cell: JsonObject, index: number, base: string | null): void {
  const targets = cell.targets as JsonValue[];
  const resolved = resolveTargets(targets as unknown as TargetSpec[]);
  const me = resolved[index]!;
  const name = me.name;
  if (base === null) {
    targets[index] = { name, positionMm: [...me.positionMm], rpyDeg: [...me.rpyDeg] };
  } else {
    const b = resolved.find((t) => t.name === base);
    if (!b) throw new RangeError(`unknown target ${base}`);
    const round = (v: number) => Math.round(v * 1000) / 1000;
    targets[index] = { name, relativeTo: base, offsetMm: me.positionMm.map((v, k) => round(v - b.positionMm[k]!)) };
  }
}

/** A small pick-and-place loop for the arms chosen (a start to edit, not a recommendation). */
export function starterCell(armIds: readonly string[]): JsonObject {
  return {
    id: "new-cell",
    title: "New cell study",
    description: "A pick-and-place loop to start from: move the targets, change the tool and the steps.",
    candidates: [...armIds],
    placement: { positionMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
    tool: {
      tcp: { xyzMm: [0, 0, 150], rpyDeg: [0, 0, 0] },
      bodies: [{ name: "gripper", massKg: 1.5, cogMm: [0, 0, 60] }],
    },
    parts: [{ name: "part", massKg: 1, cogMm: [0, 0, 160] }],
    targets: [
      { name: "pick", positionMm: [500, -300, 200], rpyDeg: [180, 0, 0] },
      { name: "above pick", relativeTo: "pick", offsetMm: [0, 0, 150] },
      { name: "place", positionMm: [500, 300, 200], rpyDeg: [180, 0, 0] },
      { name: "above place", relativeTo: "place", offsetMm: [0, 0, 150] },
    ],
    cycle: [
      { to: "above pick", motion: "joint", speedPercent: 100 },
      { to: "pick", motion: "linear", speedMmPerS: 500, dwellS: 0.2, grip: "part" },
      { to: "above pick", motion: "linear", speedMmPerS: 500 },
      { to: "above place", motion: "joint", speedPercent: 100 },
      { to: "place", motion: "linear", speedMmPerS: 500, dwellS: 0.2, release: true },
      { to: "above place", motion: "linear", speedMmPerS: 500 },
    ],
    requirements: { maxCycleS: 6 },
  };
}

const KEY_ORDER = [
  "$schema",
  "id",
  "title",
  "description",
  "candidates",
  "placement",
  "placements",
  "tool",
  "parts",
  "targets",
  "cycle",
  "requirements",
];

function formatJson(v: JsonValue | undefined, depth: number): string {
  const pad = "  ".repeat(depth + 1),
    end = "  ".repeat(depth);
  if (Array.isArray(v)) {
    if (v.length === 0) return "[]";
    if (v.every((x) => typeof x === "number" || x === null)) return `[${v.map((x) => JSON.stringify(x)).join(", ")}]`;
    return `[\n${v.map((x) => pad + formatJson(x, depth + 1)).join(",\n")}\n${end}]`;
  }
  if (isObject(v)) {
    const entries = Object.entries(v);
    if (entries.length === 0) return "{}";
    return `{\n${entries.map(([k, x]) => `${pad}${JSON.stringify(k)}: ${formatJson(x, depth + 1)}`).join(",\n")}\n${end}}`;
  }
  return JSON.stringify(v ?? null);
}

/**
 * The cell file to save: `$schema` first, the fields in the order of the format, two-space indent, vectors on one
 * line, a final newline.
 */
export function cellFileText(cell: JsonObject): string {
  const ordered: JsonObject = { $schema: CELL_SCHEMA_REF };
  for (const k of KEY_ORDER) if (k !== "$schema" && cell[k] !== undefined) ordered[k] = cell[k]!;
  for (const [k, v] of Object.entries(cell)) if (!(k in ordered)) ordered[k] = v;
  return `${formatJson(ordered, 0)}\n`;
}

/**
 * The path one level up: `targets[2].positionMm[0]` → `targets[2].positionMm` → `targets[2]` → `targets` → "".
 * @example parentPath('placements["arm-a"].rpyDeg') // 'placements["arm-a"]'
 */
export function parentPath(path: string): string {
  const m = /^(.*?)(?:\.[A-Za-z_$][\w$]*|\[(?:\d+|"(?:[^"\\]|\\.)*")\])$/.exec(path);
  return m ? m[1]! : "";
}

/**
 * Where an issue is shown: the deepest of `slots` (paths of fields and groups that have a place for messages) at or
 * above the issue's path; "" (the top of the form) when none is.
 */
export function slotOf(issuePath: string, slots: ReadonlySet<string>): string {
  let p = issuePath;
  while (p !== "" && !slots.has(p)) {
    const up = parentPath(p);
    if (up === p) return "";
    p = up;
  }
  return p;
}

/** A change to the cell's structure, made by a button or a select of the form. */
export type FormChange =
  | { readonly kind: "add"; readonly list: readonly PathSegment[]; readonly entry: JsonValue; readonly at?: number }
  | { readonly kind: "remove"; readonly list: readonly PathSegment[]; readonly index: number }
  | { readonly kind: "move"; readonly list: readonly PathSegment[]; readonly index: number; readonly by: -1 | 1 }
  | { readonly kind: "candidate"; readonly id: string; readonly on: boolean }
  | { readonly kind: "placement-key"; readonly from: string; readonly to: string }
  | { readonly kind: "placement-remove"; readonly id: string }
  | { readonly kind: "placement-add" }
  | { readonly kind: "rename"; readonly what: "target" | "part"; readonly from: string; readonly to: string }
  | { readonly kind: "target-form"; readonly index: number; readonly base: string | null }
  | { readonly kind: "motion"; readonly index: number; readonly motion: "joint" | "linear" };

const clone = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T;

/**
 * Applies a structural change to the cell (in place). Keys and entries the change leaves empty are removed
 * (`placements` without an arm).
 * @throws RangeError from switchTargetForm when the targets cannot be resolved
 */
export function applyFormChange(cell: JsonObject, change: FormChange): void {
  const list = (path: readonly PathSegment[]): JsonValue[] => {
    let v = getAt(cell, path);
    if (!Array.isArray(v)) {
      v = [];
      setAt(cell, path, v);
    }
    return v;
  };
  switch (change.kind) {
    case "add": {
      const l = list(change.list);
      l.splice(change.at ?? l.length, 0, clone(change.entry));
      return;
    }
    case "remove":
      list(change.list).splice(change.index, 1);
      return;
    case "move": {
      const l = list(change.list);
      const j = change.index + change.by;
      if (j < 0 || j >= l.length) return;
      [l[change.index], l[j]] = [l[j]!, l[change.index]!];
      return;
    }
    case "candidate": {
      const l = list(["candidates"]);
      const at = l.indexOf(change.id);
      if (change.on && at < 0) l.push(change.id);
      if (!change.on && at >= 0) l.splice(at, 1);
      return;
    }
    case "placement-key":
    case "placement-remove":
    case "placement-add":
      placementChange(cell, change);
      return;
    case "rename":
      renameReferences(cell, change.what, change.from, change.to);
      return;
    case "target-form":
      switchTargetForm(cell, change.index, change.base);
      return;
    case "motion": {
      const step = getAt(cell, ["cycle", change.index]);
      if (!isObject(step)) return;
      step.motion = change.motion;
      if (change.motion === "linear") delete step.speedPercent;
      else delete step.speedMmPerS;
      return;
    }
  }
}

function placementChange(
  cell: JsonObject,
  change: Extract<FormChange, { kind: "placement-key" | "placement-remove" | "placement-add" }>,
): void {
  const own: JsonObject = isObject(cell.placements) ? cell.placements : {};
  if (change.kind === "placement-add") {
    const candidates = Array.isArray(cell.candidates) ? cell.candidates : [];
    const id = candidates.find((c): c is string => typeof c === "string" && !(c in own));
    if (!id) return;
    own[id] = clone(cell.placement ?? { positionMm: [0, 0, 0], rpyDeg: [0, 0, 0] });
  } else if (change.kind === "placement-remove") {
    delete own[change.id];
  } else if (change.from !== change.to && !(change.to in own)) {
    // Re-keyed in place: the entries keep their order.
    const entries = Object.entries(own).map(([k, v]): [string, JsonValue] => [k === change.from ? change.to : k, v]);
    for (const k of Object.keys(own)) delete own[k];
    for (const [k, v] of entries) own[k] = v;
  }
  if (Object.keys(own).length) cell.placements = own;
  else delete cell.placements;
}

/** Optional objects of the format that are left out when every field in them is blank. */
const OPTIONAL_OBJECTS = new Set(["inertiaKgM2", "requirements"]);

/**
 * After a field at `path` was cleared: removes its parent when that is an optional object left empty
 * (`inertiaKgM2`, `requirements`). In place.
 */
export function pruneOptional(cell: JsonObject, path: readonly PathSegment[]): void {
  const parentPath = path.slice(0, -1);
  const key = parentPath[parentPath.length - 1];
  if (typeof key !== "string" || !OPTIONAL_OBJECTS.has(key)) return;
  const parent = getAt(cell, parentPath);
  if (isObject(parent) && Object.keys(parent).length === 0) setAt(cell, parentPath, undefined);
}
