/**
 * `armdex check` over arm files and cell files. Which is which:
 *   - a folder named `cells`, or a file directly inside one, holds cell files;
 *   - another folder holds arm files (its `*.json`), and its `cells/` subfolder, when present, cell files;
 *   - another file is a cell file when it is a JSON object with `candidates` or `cycle` and no `joints`, else an arm.
 * Cells are checked against the ids of the valid arms checked in the same run; when the run names no arm folder, the
 * valid arms of the default folder (ARMDEX_ARMS_DIR or arms/) count too, so `armdex check arms/cells/x.json` works.
 */
import { readFile, stat } from "node:fs/promises";
import { basename, dirname } from "node:path";
import { type CellLoadResult, type LoadResult, cellsDirOf, formatIssue, loadArms, loadCells } from "../catalog";

export interface CheckResult {
  readonly arms: LoadResult;
  readonly cells: CellLoadResult;
  /** Whether arm files were checked (else only cells, against the default folder's arms). */
  readonly armsChecked: boolean;
  readonly cellsChecked: boolean;
}

async function kindOf(path: string): Promise<"arm-folder" | "cell-folder" | "cell" | "arm"> {
  let dir = false;
  try {
    dir = (await stat(path)).isDirectory() && !path.endsWith(".json");
  } catch {
    return "arm"; // the arm loader reports "no such file or folder"
  }
  if (dir) return basename(path) === "cells" ? "cell-folder" : "arm-folder";
  if (basename(dirname(path)) === "cells") return "cell";
  try {
    const data = JSON.parse(await readFile(path, "utf8")) as unknown;
    if (typeof data === "object" && data !== null && !Array.isArray(data)) {
      const keys = Object.keys(data);
      if (!keys.includes("joints") && (keys.includes("candidates") || keys.includes("cycle"))) return "cell";
    }
  } catch {
    /* unreadable or not JSON: the arm loader says why */
  }
  return "arm";
}

async function isDirectory(path: string): Promise<boolean> {
  try {
    return (await stat(path)).isDirectory();
  } catch {
    return false;
  }
}

/** Loads and validates the arm and cell files of `paths` (module notes); `defaultArmsDir` when none are given. */
export async function checkPaths(paths: readonly string[], defaultArmsDir: string): Promise<CheckResult> {
  const armPaths: string[] = [];
  const cellPaths: string[] = [];
  let armFolder = false;
  for (const p of paths.length ? paths : [defaultArmsDir]) {
    const kind = await kindOf(p);
    if (kind === "arm-folder") {
      armFolder = true;
      armPaths.push(p);
      if (await isDirectory(cellsDirOf(p))) cellPaths.push(cellsDirOf(p));
    } else if (kind === "arm") armPaths.push(p);
    else cellPaths.push(p);
  }
  const arms = armPaths.length ? await loadArms(armPaths) : { arms: [], issues: [] };
  const ids = new Set(arms.arms.map((a) => a.id));
  if (cellPaths.length && !armFolder) for (const a of (await loadArms([defaultArmsDir])).arms) ids.add(a.id);
  const cells = cellPaths.length ? await loadCells(cellPaths, ids) : { cells: [], issues: [] };
  return { arms, cells, armsChecked: armPaths.length > 0, cellsChecked: cellPaths.length > 0 };
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? "" : "s"}`;

/** Prints a check result (issues, then one summary line for arms and one for cells); 1 when any file has an error. */
export function reportCheck(r: CheckResult, json: boolean): number {
  const all = [...r.arms.issues, ...r.cells.issues];
  const errors = all.filter((i) => i.severity === "error");
  if (json) {
    const warnings = all.filter((i) => i.severity === "warning");
    const out = { valid: r.arms.arms.map((a) => a.id), validCells: r.cells.cells.map((c) => c.id), errors, warnings };
    process.stdout.write(`${JSON.stringify(out, null, 2)}\n`);
    return errors.length > 0 ? 1 : 0;
  }
  for (const i of all) (i.severity === "error" ? process.stderr : process.stdout).write(`${formatIssue(i)}\n`);
  const summary = (valid: number, what: string, issues: CheckResult["arms"]["issues"]) => {
    const e = issues.filter((i) => i.severity === "error");
    const w = issues.length - e.length;
    const where = e.length ? ` in ${new Set(e.map((x) => x.file)).size} file(s)` : "";
    return `${plural(valid, what)} valid; ${plural(e.length, "error")}${where}, ${plural(w, "warning")}\n`;
  };
  if (r.armsChecked || !r.cellsChecked) process.stdout.write(summary(r.arms.arms.length, "arm", r.arms.issues));
  if (r.cellsChecked) process.stdout.write(summary(r.cells.cells.length, "cell", r.cells.issues));
  return errors.length > 0 ? 1 : 0;
}
