/**
 * Words for the declared datasheet facts, shared by the arm sheet, the catalog table and the side-by-side page.
 * Light on purpose (no charts, no schema): the side-by-side page's browser module imports it.
 */
import type { ArmSpec } from "../catalog";
import { formatNumber, formatQuantity, UNIT_SPACE } from "./format";

/** Shown where the file gives no value for a datasheet field. */
export const NOT_DECLARED = "not declared";

/** "600 × 450 mm". */
export function formatFootprint(footprintMm: readonly [number, number]): string {
  return `${formatNumber(footprintMm[0])} \u00d7 ${formatQuantity(footprintMm[1], "mm")}`;
}

/** "0 to 45 °C", "−10 to 40 °C". */
export function formatAmbient(ambientC: readonly [number, number]): string {
  return `${formatNumber(ambientC[0], 1)} to ${formatNumber(ambientC[1], 1)}${UNIT_SPACE}\u00b0C`;
}

/** "at 100 % load, 100 % speed": the test conditions of a declared value. */
export function conditionsText(row: { loadPercent: number; speedPercent: number }): string {
  return `at ${formatQuantity(row.loadPercent, "%")} load, ${formatQuantity(row.speedPercent, "%")} speed`;
}

export interface DeclaredValue {
  readonly valueMm: number;
  readonly loadPercent: number;
  readonly speedPercent: number;
}

/**
 * The declared ISO 9283 pose repeatability with its test conditions: of the file's "pose repeatability" rows, the
 * one at the highest load, then the highest speed (ISO 9283's headline condition is 100 % load, 100 % speed); null
 * when the file declares none in `declaredPerformance` (its `repeatabilityMm` then stands without conditions).
 */
export function declaredPoseRepeatability(s: Pick<ArmSpec, "declaredPerformance">): DeclaredValue | null {
  const rows = (s.declaredPerformance ?? [])
    .filter((r) => r.characteristic === "pose repeatability" && r.valueMm !== undefined)
    .sort((a, b) => b.loadPercent - a.loadPercent || b.speedPercent - a.speedPercent);
  const r = rows[0];
  return r ? { valueMm: r.valueMm!, loadPercent: r.loadPercent, speedPercent: r.speedPercent } : null;
}
