/**
 * What changed between two versions of an arm file, as JSON paths with their old and new values. Pure.
 *
 * Objects are compared key by key (keys in sorted order); arrays of objects (joints, links, stopping data) element by
 * element, by index; arrays of plain values (a range [min, max], a vector, a list of mountings) as one value, so
 * `joints[0].rangeDeg: [-170, 170] → [-165, 165]` reads as the datasheet does. A field that is absent on one side
 * has `null` there (no arm field is ever null). Paths are written like validation paths: `joints[2].maxSpeedDegPerS`.
 */
import { toPath } from "./issues";

export interface JsonChange {
  readonly path: string;
  /** The old value; null when the field was absent. */
  readonly from: unknown;
  /** The new value; null when the field was removed. */
  readonly to: unknown;
}

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };

const isPlainObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === "object" && v !== null && !Array.isArray(v);
const isLeafArray = (v: unknown): v is unknown[] =>
  Array.isArray(v) && v.every((x) => x === null || typeof x !== "object");

function same(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((x, i) => same(x, b[i]));
  if (isPlainObject(a) && isPlainObject(b)) {
    const ka = Object.keys(a),
      kb = Object.keys(b);
    return ka.length === kb.length && ka.every((k) => Object.hasOwn(b, k) && same(a[k], b[k]));
  }
  return false;
}

function walk(a: unknown, b: unknown, path: PropertyKey[], out: JsonChange[]): void {
  if (same(a, b)) return;
  if (isPlainObject(a) && isPlainObject(b)) {
    const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])].sort();
    for (const k of keys)
      walk(Object.hasOwn(a, k) ? a[k] : undefined, Object.hasOwn(b, k) ? b[k] : undefined, [...path, k], out);
    return;
  }
  if (Array.isArray(a) && Array.isArray(b) && !(isLeafArray(a) && isLeafArray(b))) {
    for (let i = 0; i < Math.max(a.length, b.length); i++) walk(a[i], b[i], [...path, i], out);
    return;
  }
  out.push({ path: toPath(path), from: (a ?? null) as Json, to: (b ?? null) as Json });
}

/**
 * The changes from `before` to `after`, in path order (keys sorted, array elements by index).
 * @example diffJson({ joints: [{ name: "J1", maxSpeedDegPerS: 200 }] }, { joints: [{ name: "J1", maxSpeedDegPerS: 180 }] })
 *   // [{ path: "joints[0].maxSpeedDegPerS", from: 200, to: 180 }]
 */
export function diffJson(before: unknown, after: unknown): JsonChange[] {
  const out: JsonChange[] = [];
  walk(before, after, [], out);
  return out;
}
