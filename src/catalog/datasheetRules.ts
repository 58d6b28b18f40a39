/**
 * Rules of the datasheet fields that a type cannot express, run on the raw file beside the schema (validate.ts calls
 * `datasheetIssues` from `semanticIssues`), so they are reported together with every other issue:
 * - a declared ISO 9283 value is given in the unit of its characteristic: valueMm or valueS, exactly one;
 * - a characteristic is declared once per test load and speed;
 * - a stopping-data row names a driven revolute joint of this arm (distances are in degrees), once per condition.
 */
import { PERFORMANCE_CHARACTERISTICS } from "./datasheetSchema";
import { describeValue, toPath } from "./issues";

interface PathMessage {
  readonly path: string;
  readonly message: string;
}

type Loose = Record<string, unknown>;
const isObject = (v: unknown): v is Loose => typeof v === "object" && v !== null && !Array.isArray(v);

function unitOf(characteristic: unknown): "mm" | "s" | null {
  return typeof characteristic === "string" && Object.hasOwn(PERFORMANCE_CHARACTERISTICS, characteristic)
    ? PERFORMANCE_CHARACTERISTICS[characteristic as keyof typeof PERFORMANCE_CHARACTERISTICS]
    : null;
}

/** Key of a row's conditions for the duplicate checks; null when a field is missing (the schema reports it). */
function conditionKey(row: Loose, fields: readonly string[]): string | null {
  const values = fields.map((f) => row[f]);
  return values.every((v) => typeof v === "number" || typeof v === "string") ? JSON.stringify(values) : null;
}

function performanceIssues(out: PathMessage[], rows: unknown[]): void {
  const seen = new Map<string, number>();
  rows.forEach((row, i) => {
    if (!isObject(row)) return;
    const unit = unitOf(row.characteristic);
    if (unit === null) return;
    const want = unit === "mm" ? "valueMm" : "valueS";
    const other = unit === "mm" ? "valueS" : "valueMm";
    const name = String(row.characteristic);
    if (row[other] !== undefined)
      out.push({
        path: toPath(["declaredPerformance", i, other]),
        message: `not used with "${name}", which is measured in ${unit}: expected ${want}`,
      });
    else if (row[want] === undefined)
      out.push({
        path: toPath(["declaredPerformance", i, want]),
        message: `missing required field: "${name}" is measured in ${unit}, expected ${want}`,
      });
    const key = conditionKey(row, ["characteristic", "loadPercent", "speedPercent"]);
    if (key === null) return;
    const first = seen.get(key);
    if (first === undefined) seen.set(key, i);
    else
      out.push({
        path: toPath(["declaredPerformance", i]),
        message: `expected each characteristic once per test load and speed, found "${name}" at ${String(row.loadPercent)} % load and ${String(row.speedPercent)} % speed again (first at declaredPerformance[${first}])`,
      });
  });
}

function stoppingIssues(out: PathMessage[], rows: unknown[], joints: readonly unknown[] | null): void {
  const byName = new Map<string, Loose>();
  for (const j of joints ?? [])
    if (isObject(j) && typeof j.name === "string" && !byName.has(j.name)) byName.set(j.name, j);
  const seen = new Map<string, number>();
  rows.forEach((row, i) => {
    if (!isObject(row) || typeof row.joint !== "string") return;
    const at = toPath(["stoppingData", i, "joint"]);
    if (joints !== null) {
      const joint = byName.get(row.joint);
      if (joint === undefined)
        out.push({ path: at, message: `expected a joint name of this arm, found ${describeValue(row.joint)}` });
      else if (joint.kind === "prismatic")
        out.push({
          path: at,
          message: `expected a revolute joint (stopping distances are in deg), found ${describeValue(row.joint)}, which is prismatic`,
        });
      else if (joint.coupling !== undefined && joint.rangeDeg === undefined)
        out.push({
          path: at,
          message: `expected a driven joint, found ${describeValue(row.joint)}, which is passive (it follows other joints and has no drive to stop)`,
        });
    }
    const key = conditionKey(row, ["joint", "stopCategory", "speedPercent", "extensionPercent", "payloadPercent"]);
    if (key === null) return;
    const first = seen.get(key);
    if (first === undefined) seen.set(key, i);
    else
      out.push({
        path: toPath(["stoppingData", i]),
        message: `expected one row per joint, stop category, speed, extension and payload, found the conditions of stoppingData[${first}] again`,
      });
  });
}

/** Issues of the datasheet fields of a raw arm file (see the module comment). */
export function datasheetIssues(data: Loose): PathMessage[] {
  const out: PathMessage[] = [];
  if (Array.isArray(data.declaredPerformance)) performanceIssues(out, data.declaredPerformance);
  if (Array.isArray(data.stoppingData))
    stoppingIssues(out, data.stoppingData, Array.isArray(data.joints) ? data.joints : null);
  return out;
}
