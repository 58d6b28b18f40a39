/** Loads arm files from disk, validates them and builds the catalog. Node-only (fs, crypto); no Astro. */
import { readFile, readdir, stat } from "node:fs/promises";
import { createHash } from "node:crypto";
import { basename, dirname, join, relative, resolve } from "node:path";
import type { Chain } from "../core";
import type { ArmSpec } from "./schema";
import { type ArmIssue, formatIssue } from "./issues";
import { validateArm } from "./validate";

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

/** Reads and validates one arm file. Never throws for bad data: problems come back as issues. */
export async function loadArmFile(path: string): Promise<{ arm: Arm | null; issues: ArmIssue[] }> {
  const file = relative(process.cwd(), path) || path;
  const err = (p: string, message: string): { arm: null; issues: ArmIssue[] } => ({ arm: null, issues: [{ file, path: p, message, severity: "error" }] });
  let bytes: Buffer;
  try {
    const info = await stat(path);
    if (!info.isFile()) return err("", "expected a JSON file, found a directory or other non-file");
    bytes = await readFile(path);
  } catch (e) {
    return err("", `cannot read the file: ${(e as NodeJS.ErrnoException).code ?? String(e)}`);
  }
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
    const msg = e instanceof Error ? e.message : String(e);
    const pos = /position (\d+)/.exec(msg);
    const where = pos ? ` at ${lineColumn(text, Number(pos[1]))}` : "";
    const truncated = /end of JSON input|Unterminated/.test(msg) ? " (the file looks truncated)" : "";
    return err("", `expected valid JSON, found a syntax error${where}${truncated}: ${msg}`);
  }
  const fileId = basename(path).replace(/\.json$/i, "");
  const result = validateArm(data, file, fileId);
  const issues: ArmIssue[] = [...result.issues];
  const schemaRef = (data as { $schema?: unknown } | null)?.$schema;
  if (typeof schemaRef === "string") {
    const problem = await checkSchemaRef(schemaRef, dirname(path));
    if (problem) issues.push({ file, path: "$schema", message: problem, severity: "error" });
  }
  if (!result.ok || issues.some((i) => i.severity === "error")) return { arm: null, issues };
  return {
    arm: { id: result.spec.id, file, spec: result.spec, chain: result.chain, specHash: specHashOf(data), warnings: issues.filter((i) => i.severity === "warning") },
    issues,
  };
}

async function checkSchemaRef(ref: string, baseDir: string): Promise<string | null> {
  if (/^https?:\/\//.test(ref)) {
    return ref.endsWith("/arm.schema.json") ? null : `expected a URL ending in /arm.schema.json, found ${JSON.stringify(ref)}`;
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

/** Loads arm files and folders; reports every problem of every file, plus duplicate ids across files. */
export async function loadArms(paths: readonly string[]): Promise<LoadResult> {
  const { files, issues } = await expandPaths(paths);
  const results = await Promise.all(files.map((f) => loadArmFile(f)));
  const arms: Arm[] = [];
  const byId = new Map<string, string>();
  for (const r of results) {
    issues.push(...r.issues);
    if (!r.arm) continue;
    const first = byId.get(r.arm.id);
    if (first) {
      issues.push({ file: r.arm.file, path: "id", message: `expected a unique id, found "${r.arm.id}" which ${first} already uses`, severity: "error" });
      continue;
    }
    byId.set(r.arm.id, r.arm.file);
    arms.push(r.arm);
  }
  arms.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return { arms, issues };
}

export class CatalogError extends Error {
  constructor(readonly issues: readonly ArmIssue[]) {
    const errors = issues.filter((i) => i.severity === "error");
    super(`${errors.length} error${errors.length === 1 ? "" : "s"} in the arm catalog:\n${errors.map(formatIssue).join("\n")}`);
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
