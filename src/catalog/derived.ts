/**
 * Values the site derives from an arm and its analysis (an arm sheet's props with its rendered charts, a CSV file),
 * cached on disk beside the analyses: a rebuild after adding one arm renders only that arm's charts again.
 *
 * The key covers everything the value depends on: the analysis key (spec hash, analysis version, core fingerprint,
 * options), the arm file's path, a fingerprint of the code that derives it (src/catalog, src/view and src/charts),
 * the kind of value and the caller's inputs (base URL, site). Entries live in `<cache>/derived/<kind>-<key>.json`,
 * hold their own key, and are written atomically; an unreadable or foreign entry is ignored and written again.
 *
 * The value comes back through JSON either way (fresh or cached), so a first build and a rebuild render the same
 * bytes; a value JSON cannot carry exactly (NaN, ±Infinity, typed arrays, undefined in an array) is not cached.
 */
import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { join } from "node:path";
import { analysisKey, cacheDir, sourceFingerprint, writeFileAtomic } from "./analysis";
import type { Arm } from "./load";

/** Folders of src/ whose code turns an analysis into page material. */
export const DERIVED_SOURCES: readonly string[] = ["catalog", "view", "charts"];

/** Inputs besides the arm that change the value (base URL, site address…). */
export type DerivedInputs = Readonly<Record<string, string | number | boolean | null | undefined>>;

export interface DerivedOptions {
  /** Fingerprint of the deriving code; default: sourceFingerprint(DERIVED_SOURCES). */
  readonly codeFingerprint?: string;
}

const KIND = /^[a-z0-9][a-z0-9-]*$/;

/** The cache key of a derived value (32 hex digits). */
export function derivedKey(
  arm: Pick<Arm, "specHash" | "file">,
  kind: string,
  inputs: DerivedInputs,
  options: DerivedOptions = {},
): string {
  if (!KIND.test(kind)) throw new RangeError(`invalid kind: ${kind}`);
  const code = options.codeFingerprint ?? sourceFingerprint(DERIVED_SOURCES);
  const sortedInputs = Object.keys(inputs)
    .sort()
    .map((k) => [k, inputs[k] ?? null]);
  return createHash("sha256")
    .update(`${analysisKey(arm)}\n${arm.file}\n${code}\n${kind}\n${JSON.stringify(sortedInputs)}`)
    .digest("hex")
    .slice(0, 32);
}

export function derivedPath(kind: string, key: string): string {
  return join(cacheDir(), "derived", `${kind}-${key}.json`);
}

class NotJsonExact extends Error {}

/** JSON of `value`, or NotJsonExact where parsing it back would not give the same value. */
function exactJson(value: unknown): string {
  return JSON.stringify(value, function (this: unknown, _key: string, v: unknown) {
    if (typeof v === "number" && !Number.isFinite(v)) throw new NotJsonExact();
    if (v === undefined && Array.isArray(this)) throw new NotJsonExact();
    if (ArrayBuffer.isView(v) || v instanceof Map || v instanceof Set || typeof v === "bigint")
      throw new NotJsonExact();
    return v;
  });
}

/**
 * The value of `derive()` for this arm, from the cache when an entry with the same key exists, else computed now and
 * cached.
 * @param kind a lowercase slug naming what is derived ("arm-sheet")
 * @param inputs what else the value depends on (base URL…); the arm's spec, analysis and file path always count
 * @example await cachedDerived(arm, "payload-csv", {}, async () => payloadCsv(await getAnalysis(arm)))
 */
export async function cachedDerived<T>(
  arm: Pick<Arm, "specHash" | "file">,
  kind: string,
  inputs: DerivedInputs,
  derive: () => T | Promise<T>,
  options: DerivedOptions = {},
): Promise<T> {
  const key = derivedKey(arm, kind, inputs, options);
  const path = derivedPath(kind, key);
  try {
    const entry = JSON.parse(await readFile(path, "utf8")) as { key?: unknown; value?: unknown };
    if (entry !== null && typeof entry === "object" && entry.key === key && "value" in entry) return entry.value as T;
  } catch {
    // no entry, or an unreadable one: derive again
  }
  const value = await derive();
  let text: string;
  try {
    text = exactJson({ key, value });
  } catch (e) {
    if (e instanceof NotJsonExact) return value;
    throw e;
  }
  await writeFileAtomic(path, text);
  return (JSON.parse(text) as { value: T }).value;
}
