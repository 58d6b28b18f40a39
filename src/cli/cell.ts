/**
 * `armdex cell` and `armdex place`: a cell study of every candidate arm, and the placement map of one arm, as JSON
 * (file units: mm, deg, s). The key names are a contract: add keys freely, do not rename.
 *
 * The arms come from ARMDEX_ARMS_DIR when set, else from the folder above the cell file's folder when that folder is
 * named `cells` (arms/cells/x.json → arms/), else from arms/.
 */
import { basename, dirname } from "node:path";
import { parseArgs } from "node:util";
import { armFacts } from "../catalog/analysis";
import { formatIssue, loadArms, type Arm } from "../catalog";
import { loadCellFile } from "../catalog/cell";
import { cellStudy, placementMap, type CellArm } from "../core";
import { stringifyCompact } from "./json";

export interface CommandOutput {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
}

/** The arms folder for a cell file (see the module notes). */
export function armsDirFor(cellFile: string): string {
  if (process.env.ARMDEX_ARMS_DIR) return process.env.ARMDEX_ARMS_DIR;
  const folder = dirname(cellFile);
  return basename(folder) === "cells" ? dirname(folder) : "arms";
}

export function cellArmOf(arm: Arm): CellArm {
  return { id: arm.id, chain: arm.chain, facts: armFacts(arm) };
}

/** Loads the arms and the cell; the output on failure (exit 1: invalid data). */
async function loadStudy(
  cellFile: string,
): Promise<
  | { ok: true; arms: readonly Arm[]; cell: NonNullable<Awaited<ReturnType<typeof loadCellFile>>["cell"]> }
  | { ok: false; out: CommandOutput }
> {
  const { arms, issues } = await loadArms([armsDirFor(cellFile)]);
  const loaded = await loadCellFile(
    cellFile,
    arms.map((a) => a.id),
  );
  const errors = [...issues, ...loaded.issues].filter((i) => i.severity === "error");
  if (!loaded.cell || errors.length)
    return { ok: false, out: { code: 1, stdout: "", stderr: errors.map((i) => `${formatIssue(i)}\n`).join("") } };
  return { ok: true, arms, cell: loaded.cell };
}

/** `armdex cell <cell.json> [--arms a,b]`. */
export async function cellCommand(args: string[], usage: (m: string) => Error): Promise<CommandOutput> {
  const { values, positionals } = parseArgs({ args, allowPositionals: true, options: { arms: { type: "string" } } });
  if (positionals.length !== 1) throw usage("cell needs exactly one cell file");
  const loaded = await loadStudy(positionals[0]!);
  if (!loaded.ok) return loaded.out;
  const ids = values.arms
    ? values.arms
        .split(",")
        .map((s) => s.trim())
        .filter(Boolean)
    : [...loaded.cell.spec.candidates];
  const chosen: Arm[] = [];
  for (const id of ids) {
    const arm = loaded.arms.find((a) => a.id === id);
    if (!arm)
      throw usage(`--arms: unknown arm id "${id}" (the catalog has ${loaded.arms.map((a) => a.id).join(", ")})`);
    chosen.push(arm);
  }
  const study = cellStudy(loaded.cell.spec, chosen.map(cellArmOf));
  return { code: 0, stdout: `${stringifyCompact(study)}\n`, stderr: "" };
}

/** A positive number option, or a usage error naming it. */
function positiveOption(name: string, value: string | undefined, fallback: number | null): number | null {
  if (value === undefined) return fallback;
  const v = Number(value);
  if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`--${name}: expected a positive number, got "${value}"`);
  return v;
}

/** `armdex place <cell.json> --arm <id> [--grid-mm 50] [--yaw-step-deg 15]`. */
export async function placeCommand(args: string[], usage: (m: string) => Error): Promise<CommandOutput> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: { arm: { type: "string" }, "grid-mm": { type: "string" }, "yaw-step-deg": { type: "string" } },
  });
  if (positionals.length !== 1) throw usage("place needs exactly one cell file");
  if (!values.arm) throw usage("place needs --arm <id>");
  let gridMm: number, yawStepDeg: number | null;
  try {
    gridMm = positiveOption("grid-mm", values["grid-mm"], 50)!;
    yawStepDeg = positiveOption("yaw-step-deg", values["yaw-step-deg"], null);
    if (yawStepDeg !== null && yawStepDeg > 360)
      throw new RangeError(`--yaw-step-deg: expected at most 360, got ${yawStepDeg}`);
  } catch (e) {
    throw usage((e as Error).message);
  }
  const loaded = await loadStudy(positionals[0]!);
  if (!loaded.ok) return loaded.out;
  const arm = loaded.arms.find((a) => a.id === values.arm);
  if (!arm)
    throw usage(`--arm: unknown arm id "${values.arm}" (the catalog has ${loaded.arms.map((a) => a.id).join(", ")})`);
  const map = placementMap(loaded.cell.spec, cellArmOf(arm), { gridMm, yawStepDeg });
  return { code: 0, stdout: `${stringifyCompact(map)}\n`, stderr: "" };
}
