/** Loads cell files (`arms/cells/<id>.json`) from disk and validates them against the loaded arm ids. Node-only. */
import { stat } from "node:fs/promises";
import { basename, dirname, join, resolve } from "node:path";
import type { CellSpec } from "../../core";
import type { ArmIssue } from "../issues";
import { checkSchemaRef, readJsonFile } from "../jsonFile";
import { CatalogError, expandPaths, getCatalog, specHashOf } from "../load";
import { validateCell } from "./validate";

export interface Cell {
  readonly id: string;
  /** Path of the file, relative to the working directory. */
  readonly file: string;
  readonly spec: CellSpec;
  /** sha256 of the canonical JSON of the file (sorted keys, no whitespace), hex. */
  readonly specHash: string;
  readonly warnings: readonly ArmIssue[];
}

export interface CellLoadResult {
  /** Valid cells, sorted by id. */
  readonly cells: readonly Cell[];
  /** Every error and warning, in file order. */
  readonly issues: readonly ArmIssue[];
}

/** Reads and validates one cell file against the given arm ids. Never throws for bad data. */
export async function loadCellFile(
  path: string,
  armIds: Iterable<string>,
): Promise<{ readonly cell: Cell | null; readonly issues: ArmIssue[] }> {
  const read = await readJsonFile(path, "one cell");
  if (!read.ok) return { cell: null, issues: read.issues };
  const { file, data } = read;
  const fileId = basename(path).replace(/\.json$/i, "");
  const result = validateCell(data, file, fileId, armIds);
  const issues = [...result.issues];
  const schemaRef = (data as { $schema?: unknown } | null)?.$schema;
  if (typeof schemaRef === "string") {
    const problem = await checkSchemaRef(schemaRef, dirname(path), "cell", "../../public/schema/cell.schema.json");
    if (problem) issues.push({ file, path: "$schema", message: problem, severity: "error" });
  }
  if (!result.ok || issues.some((i) => i.severity === "error")) return { cell: null, issues };
  return {
    cell: {
      id: result.spec.id,
      file,
      spec: result.spec,
      specHash: specHashOf(data),
      warnings: issues.filter((i) => i.severity === "warning"),
    },
    issues,
  };
}

/**
 * Loads the cell files of a folder (its `*.json` entries; a folder that does not exist holds no cells) or of a list
 * of files and folders, each validated against `armIds` (the ids of the valid arms loaded). Reports every problem of
 * every file; the id is the file name, so two files share an id only from different folders: reported.
 */
export async function loadCells(paths: string | readonly string[], armIds: Iterable<string>): Promise<CellLoadResult> {
  const list = typeof paths === "string" ? [paths] : paths;
  const present: string[] = [];
  for (const p of list) {
    // An absent default folder (arms/cells) is no error: a catalog needs no cells.
    if (typeof paths === "string" && !(await exists(p))) continue;
    present.push(p);
  }
  const ids = [...armIds];
  const { files, issues } = await expandPaths(present);
  const results = await Promise.all(files.map((f) => loadCellFile(f, ids)));
  const cells: Cell[] = [];
  const owner = new Map<string, string>();
  for (const r of results) {
    issues.push(...r.issues);
    if (!r.cell) continue;
    const first = owner.get(r.cell.id);
    if (first !== undefined) {
      issues.push({
        file: r.cell.file,
        path: "id",
        message: `expected a unique id, found "${r.cell.id}" which ${first} already uses`,
        severity: "error",
      });
      continue;
    }
    owner.set(r.cell.id, r.cell.file);
    cells.push(r.cell);
  }
  cells.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return { cells, issues };
}

async function exists(p: string): Promise<boolean> {
  try {
    await stat(p);
    return true;
  } catch {
    return false;
  }
}

/** The cells folder of an arms folder: `<arms>/cells`. */
export function cellsDirOf(armsDir: string): string {
  return join(armsDir, "cells");
}

const memo = new Map<string, Promise<CellLoadResult>>();

/**
 * The cells of `arms/cells/` (or ARMDEX_ARMS_DIR/cells) checked against the catalog, loaded once per process.
 * Rejects with a CatalogError listing every error when the catalog or any cell file is invalid.
 */
export function getCells(dir = process.env.ARMDEX_ARMS_DIR ?? "arms"): Promise<CellLoadResult> {
  const key = resolve(dir);
  let p = memo.get(key);
  if (!p) {
    p = getCatalog(dir).then(async ({ arms }) => {
      const r = await loadCells(
        cellsDirOf(key),
        arms.map((a) => a.id),
      );
      if (r.issues.some((i) => i.severity === "error")) throw new CatalogError(r.issues);
      return r;
    });
    memo.set(key, p);
  }
  return p;
}
