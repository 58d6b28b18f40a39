/** Loads arm files from disk, validates them and builds the catalog. Node-only (fs, crypto); no Astro. */
import { readFile, readdir, stat } from "node:fs/promises";
import { createHash } from "node:crypto";
import { basename, dirname, join, relative, resolve } from "node:path";
import type { Chain } from "../core";
import type { ArmSpec } from "./schema";
import { type ArmIssue, formatIssue } from "./issues";
import { plausibilityWarnings, validateArm } from "./validate";

export interface Arm {
  readonly id: string;
  /** Path of the file, relative to the working directory. */
  readonly file: string;
  readonly spec: ArmSpec;
  readonly chain: Chain;
  /** sha256 of the canonical JSON of the file (sorted keys, no whitespace), hex. */
  readonly specHash: string;
  readonly warnings: readonly ArmIssue[];
}

export interface LoadResult {
  /** Valid arms, sorted by id. */
  readonly arms: readonly Arm[];
  /** Every error and warning, in file order. */
  readonly issues: readonly ArmIssue[];
}

/** JSON with object keys sorted at every level and no whitespace: the input of the spec hash. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  if (value !== null && typeof value === "object") {
    const entries = Object.keys(value as object)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonicalJson((value as Record<string, unknown>)[k])}`);
    return `{${entries.join(",")}}`;
  }
  return JSON.stringify(value);
}

export function specHashOf(data: unknown): string {
  return createHash("sha256").update(canonicalJson(data)).digest("hex");
}

function lineColumn(text: string, position: number): string {
  const before = text.slice(0, position);
  const line = before.split("\n").length;
  const column = position - before.lastIndexOf("\n");
  return `line ${line}, column ${column}`;
}

/** The first word outside string literals that is not true, false, null or a number (NaN, Infinity, undefined…). */
function firstBareWord(text: string): { index: number; word: string } | null {
  const token = /"(?:[^"\\]|\\.)*"?|[A-Za-z_$][\w$]*|-?\d[\d.eE+-]*/g;
  for (let m = token.exec(text); m; m = token.exec(text)) {
    const w = m[0];
    if (w.startsWith('"') || /^[-\d]/.test(w) || w === "true" || w === "false" || w === "null") continue;
    return { index: m.index, word: w };
  }
  return null;
}

export interface LoadedFile {
  readonly arm: Arm | null;
  readonly issues: ArmIssue[];
  /** The `id` the file declares, valid or not (for duplicate checks across files); null when it has none. */
  readonly declaredId?: string | null;
  /** Whether the declared id equals the file name. */
  readonly idMatchesFile?: boolean;
  /** The file's JSON value, when the text parsed (valid or not). */
  readonly data?: unknown;
}

/** Reads and validates one arm file. Never throws for bad data: problems come back as issues. */
export async function loadArmFile(path: string): Promise<LoadedFile> {
  const file = relative(process.cwd(), path) || path;
  const err = (p: string, message: string): LoadedFile => ({
    arm: null,
    issues: [{ file, path: p, message, severity: "error" }],
  });
  let bytes: Buffer;
  try {
    const info = await stat(path);
    if (!info.isFile()) return err("", "expected a JSON file, found a directory or other non-file");
    bytes = await readFile(path);
  } catch (e) {
    return err("", `cannot read the file: ${(e as NodeJS.ErrnoException).code ?? String(e)}`);
  }
  return loadArmBytes(bytes, file, basename(path).replace(/\.json$/i, ""), dirname(path));
}

/**
 * Reads and validates the bytes of one arm file, wherever they came from (the disk, or a file's earlier version in
 * the repository's history): `file` names it in issues, `fileId` is its file name without `.json`, `dir` the folder
 * its `$schema` path is resolved from. Never throws for bad data: problems come back as issues.
 */
export async function loadArmBytes(bytes: Uint8Array, file: string, fileId: string, dir: string): Promise<LoadedFile> {
  const err = (p: string, message: string): LoadedFile => ({
    arm: null,
    issues: [{ file, path: p, message, severity: "error" }],
  });
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return err("", "expected UTF-8 text, found bytes that are not valid UTF-8 (save the file as UTF-8)");
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (text.trim() === "") return err("", "expected a JSON object describing one arm, found an empty file");
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (e) {
    // V8 names an unexpected letter without its position and quotes a multi-line excerpt: locate the bare word.
    const msg = (e instanceof Error ? e.message : String(e)).replace(/, (?:\.\.\.)?"[\s\S]*is not valid JSON$/, "");
    const pos = /position (\d+)/.exec(msg);
    const at = pos ? Number(pos[1]) : /^Unexpected token/.test(msg) ? firstBareWord(text)?.index : undefined;
    const word = at === undefined ? undefined : /^[A-Za-z_$][\w$]*/.exec(text.slice(at))?.[0];
    const where = at !== undefined ? ` at ${lineColumn(text, at)}` : "";
    const truncated = /end of JSON input|Unterminated/.test(msg) ? " (the file looks truncated)" : "";
    const reason =
      word === "NaN" || word === "Infinity"
        ? `${msg}: ${word} is not a JSON number (JSON has no NaN or Infinity: write a finite number, or leave an optional field out)`
        : word && !pos
          ? `${msg}: found the bare word ${word} (text must be in double quotes)`
          : msg;
    return err("", `expected valid JSON, found a syntax error${where}${truncated}: ${reason}`);
  }
  const result = validateArm(data, file, fileId);
  const issues: ArmIssue[] = [...result.issues, ...(result.ok ? plausibilityWarnings(result.spec, file) : [])];
  const schemaRef = (data as { $schema?: unknown } | null)?.$schema;
  if (typeof schemaRef === "string") {
    const problem = await checkSchemaRef(schemaRef, dir);
    if (problem) issues.push({ file, path: "$schema", message: problem, severity: "error" });
  }
  const declared = (data as { id?: unknown } | null)?.id;
  const declaredId = typeof declared === "string" ? declared : null;
  if (!result.ok || issues.some((i) => i.severity === "error"))
    return { arm: null, issues, declaredId, idMatchesFile: declaredId === fileId, data };
  return {
    data,
    declaredId,
    idMatchesFile: true,
    arm: {
      id: result.spec.id,
      file,
      spec: result.spec,
      chain: result.chain,
      specHash: specHashOf(data),
      warnings: issues.filter((i) => i.severity === "warning"),
    },
    issues,
  };
}

async function checkSchemaRef(ref: string, baseDir: string): Promise<string | null> {
  if (/^https?:\/\//.test(ref)) {
    return ref.endsWith("/arm.schema.json")
      ? null
      : `expected a URL ending in /arm.schema.json, found ${JSON.stringify(ref)}`;
  }
  const target = resolve(baseDir, ref.replace(/^file:\/\//, "").split("#")[0]!);
  try {
    if ((await stat(target)).isFile()) return null;
  } catch {
    /* fall through */
  }
  return `expected a path to the arm JSON Schema (e.g. "../public/schema/arm.schema.json"), found ${JSON.stringify(ref)}, which points to no file`;
}

/** Expands folders to the `*.json` entries directly inside them (a folder named `x.json` is reported, not read). */
async function expandPaths(paths: readonly string[]): Promise<{ files: string[]; issues: ArmIssue[] }> {
  const files: string[] = [];
  const issues: ArmIssue[] = [];
  for (const p of paths) {
    let info;
    try {
      info = await stat(p);
    } catch {
      issues.push({ file: p, path: "", message: "cannot read: no such file or folder", severity: "error" });
      continue;
    }
    if (info.isDirectory() && !p.endsWith(".json")) {
      const entries = (await readdir(p)).filter((e) => e.toLowerCase().endsWith(".json")).sort();
      files.push(...entries.map((e) => join(p, e)));
    } else {
      files.push(p);
    }
  }
  return { files, issues };
}

/**
 * Loads arm files and folders; reports every problem of every file, plus duplicate ids across files (invalid files
 * included: a copied file that kept its original's id is named as such). A file whose id is its own file name keeps
 * the id; the other claimant gets the error.
 */
export async function loadArms(paths: readonly string[]): Promise<LoadResult> {
  const { files, issues } = await expandPaths(paths);
  const results = await Promise.all(files.map((f) => loadArmFile(f)));
  const owner = new Map<string, string>();
  const duplicate = new Map<number, string>();
  const claims = results.flatMap((r, k) =>
    r.declaredId ? [{ k, id: r.declaredId, mine: r.idMatchesFile === true }] : [],
  );
  for (const c of claims.sort((a, b) => Number(b.mine) - Number(a.mine) || a.k - b.k)) {
    const first = owner.get(c.id);
    if (first === undefined) owner.set(c.id, files[c.k]!);
    else duplicate.set(c.k, first);
  }
  const arms: Arm[] = [];
  results.forEach((r, k) => {
    issues.push(...r.issues);
    const first = duplicate.get(k);
    if (first !== undefined) {
      const rel = (p: string) => relative(process.cwd(), p) || p;
      issues.push({
        file: rel(files[k]!),
        path: "id",
        message: `expected a unique id, found "${r.declaredId}" which ${rel(first)} already uses`,
        severity: "error",
      });
    } else if (r.arm) arms.push(r.arm);
  });
  arms.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return { arms, issues };
}

export class CatalogError extends Error {
  constructor(readonly issues: readonly ArmIssue[]) {
    const errors = issues.filter((i) => i.severity === "error");
    super(
      `${errors.length} error${errors.length === 1 ? "" : "s"} in the arm catalog:\n${errors.map(formatIssue).join("\n")}`,
    );
    this.name = "CatalogError";
  }
}

const memo = new Map<string, Promise<LoadResult>>();

/**
 * The catalog of `arms/` (or ARMDEX_ARMS_DIR), loaded once per process. Rejects with a CatalogError listing every
 * error when any file is invalid: the site is never built from a partly valid catalog.
 */
export function getCatalog(dir = process.env.ARMDEX_ARMS_DIR ?? "arms"): Promise<LoadResult> {
  const key = resolve(dir);
  let p = memo.get(key);
  if (!p) {
    p = loadArms([key]).then((r) => {
      if (r.issues.some((i) => i.severity === "error")) throw new CatalogError(r.issues);
      return r;
    });
    memo.set(key, p);
  }
  return p;
}

/** Static paths of the per-arm pages and files (`/arms/<id>/`, `/data/arms/<id>…`): one per catalog arm, the arm as props. */
export async function armStaticPaths(): Promise<{ params: { id: string }; props: { arm: Arm } }[]> {
  const { arms } = await getCatalog();
  return arms.map((arm) => ({ params: { id: arm.id }, props: { arm } }));
}
