/** Loads arm files from disk, validates them and builds the catalog. Node-only (fs, crypto); no Astro. */
import { readdir, readFile, stat } from "node:fs/promises";
import { createHash } from "node:crypto";
import { basename, dirname, join, relative, resolve } from "node:path";
import type { Chain } from "../core";
import type { ArmSpec } from "./schema";
import { type ArmIssue, formatIssue } from "./issues";
import { plausibilityWarnings, validateArm } from "./validate";
import { checkSchemaRef, parseJsonBytes } from "./jsonFile";

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
  let bytes: Buffer;
  try {
    const info = await stat(path);
    if (!info.isFile()) return fileError(file, "expected a JSON file, found a directory or other non-file");
    bytes = await readFile(path);
  } catch (e) {
    return fileError(file, `cannot read the file: ${(e as NodeJS.ErrnoException).code ?? String(e)}`);
  }
  return loadArmBytes(bytes, file, basename(path).replace(/\.json$/i, ""), dirname(path));
}

function fileError(file: string, message: string): LoadedFile {
  return { arm: null, issues: [{ file, path: "", message, severity: "error" }] };
}

/**
 * Reads and validates the bytes of one arm file, wherever they came from (the disk, or a file's earlier version in
 * the repository's history): `file` names it in issues, `fileId` is its file name without `.json`, `dir` the folder
 * its `$schema` path is resolved from. Never throws for bad data: problems come back as issues.
 */
export async function loadArmBytes(bytes: Uint8Array, file: string, fileId: string, dir: string): Promise<LoadedFile> {
  const read = parseJsonBytes(bytes, file, "one arm");
  if (!read.ok) return { arm: null, issues: read.issues };
  const { data } = read;
  const result = validateArm(data, file, fileId);
  const issues: ArmIssue[] = [...result.issues, ...(result.ok ? plausibilityWarnings(result.spec, file) : [])];
  const schemaRef = (data as { $schema?: unknown } | null)?.$schema;
  if (typeof schemaRef === "string") {
    const problem = await checkSchemaRef(schemaRef, dir, "arm", "../public/schema/arm.schema.json");
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

/** Expands folders to the `*.json` entries directly inside them (a folder named `x.json` is reported, not read). */
export async function expandPaths(paths: readonly string[]): Promise<{ files: string[]; issues: ArmIssue[] }> {
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
