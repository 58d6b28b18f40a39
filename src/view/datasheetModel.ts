/**
 * The "Datasheet" section of an arm sheet: the facts a maker presents beside the kinematics (footprint, mounting
 * face, flange interface, environment, controller, noise), the declared ISO 9283 performance with its test
 * conditions, and the stopping data per joint (a table and a chart each) beside its caution. Everything here is
 * declared: copied from the arm file, never computed. A field the file leaves out reads "not declared".
 */
import type { ArmSpec, PerformanceCharacteristic } from "../catalog";
import { PERFORMANCE_CHARACTERISTICS } from "../catalog/datasheetSchema";
import { stoppingChart, type ChartResult } from "../charts";
import type { Cautions } from "./cautions";
import {
  conditionsText,
  declaredPoseRepeatability,
  formatAmbient,
  formatFootprint,
  NOT_DECLARED,
  type DeclaredValue,
} from "./datasheetFormat";
import { formatNumber, formatQuantity } from "./format";

export { conditionsText, declaredPoseRepeatability, formatAmbient, formatFootprint, NOT_DECLARED, type DeclaredValue };
import type { TableModel, TableRow } from "./table";

export interface StoppingJointModel {
  readonly joint: string;
  readonly table: TableModel;
  readonly chart: ChartResult;
}

export interface DatasheetModel {
  readonly table: TableModel;
  /** Declared ISO 9283 characteristics with their conditions; null when the file declares none. */
  readonly performance: TableModel | null;
  /** Stopping data per joint, in the arm's joint order; empty when the file gives none. */
  readonly stopping: readonly StoppingJointModel[];
  /** All stopping data in one compact table (the printed sheet's); null when the file gives none. */
  readonly stoppingSummary: TableModel | null;
  /** How many datasheet fields the file fills (0: the section says the file declares none). */
  readonly declaredCount: number;
}

/** The caution beside the stopping data (the Cautions component shows it). */
export const STOPPING_CAUTIONS: Cautions = {
  heading: "Stopping data is not a safety distance",
  paragraphs: [
    "The stopping distances and times above are copied from the maker\u2019s document named in the Source section. " +
      "Armdex does not check them and does not compute a safety distance from them.",
    "Safeguarding distances are worked out under ISO 13855 and the local rules, by competent people, from the " +
      "maker\u2019s own documents for the arm, controller, brakes and safety functions actually installed, and " +
      "confirmed by measurement on the installed cell where the rules ask for it.",
  ],
  summary:
    "Declared stopping data, not checked; safeguarding distances come from ISO 13855, the local rules and " +
    "competent people working from the maker\u2019s documents.",
  standards: [
    {
      code: "ISO 13855",
      title:
        "Safety of machinery \u2014 Positioning of safeguards with respect to the approach of parts of the human body",
    },
    { code: "ISO 10218-1", title: "Robotics \u2014 Safety requirements \u2014 Part 1: Industrial robots" },
    { code: "IEC 60204-1", title: "Safety of machinery \u2014 Electrical equipment of machines \u2014 Part 1" },
  ],
};

/** A declared ISO 9283 value in its characteristic's unit: "0.03 mm", "0.45 s". */
export function formatDeclaredValue(row: {
  characteristic: PerformanceCharacteristic;
  valueMm?: number;
  valueS?: number;
}): string {
  const unit = PERFORMANCE_CHARACTERISTICS[row.characteristic];
  const v = unit === "mm" ? row.valueMm : row.valueS;
  return v === undefined ? NOT_DECLARED : formatQuantity(v, unit, 3);
}

function fieldRow(key: string, label: string, value: string | undefined): TableRow {
  return { key, cells: [{ text: label }, { text: value ?? NOT_DECLARED }] };
}

function fieldsTable(s: ArmSpec): TableModel {
  const c = s.controller;
  return {
    id: "datasheet-table",
    caption: "Datasheet facts, as declared in the source document",
    rowHeaders: true,
    columns: [
      { key: "property", label: "Property", numeric: false },
      { key: "value", label: "Declared value", numeric: false },
    ],
    rows: [
      fieldRow("footprint", "Base footprint (width \u00d7 depth)", s.footprintMm && formatFootprint(s.footprintMm)),
      fieldRow("mounting-face", "Base mounting face", s.mountingFace),
      fieldRow("flange", "Flange interface (ISO 9409-1)", s.flangeInterface),
      fieldRow("ambient", "Ambient temperature in operation", s.ambientC && formatAmbient(s.ambientC)),
      fieldRow("noise", "Noise level", s.noiseDbA === undefined ? undefined : formatQuantity(s.noiseDbA, "dB(A)", 1)),
      fieldRow("controller", "Controller", c?.model),
      fieldRow(
        "controller-mass",
        "Controller mass",
        c?.massKg === undefined ? undefined : formatQuantity(c.massKg, "kg", 1),
      ),
      fieldRow(
        "controller-supply",
        "Controller supply",
        c?.supplyKva === undefined ? undefined : formatQuantity(c.supplyKva, "kVA", 2),
      ),
    ],
  };
}

function performanceTable(s: ArmSpec): TableModel | null {
  const rows = s.declaredPerformance ?? [];
  if (rows.length === 0) return null;
  return {
    id: "performance-table",
    caption: "Performance as declared by the maker under ISO 9283, with the load and speed it was measured at",
    rowHeaders: true,
    columns: [
      { key: "characteristic", label: "Characteristic", numeric: false },
      { key: "value", label: "Declared value", numeric: true },
      { key: "load", label: "Test load", unit: "% of rated", numeric: true },
      { key: "speed", label: "Test speed", unit: "% of rated", numeric: true },
      { key: "standard", label: "Standard", numeric: false },
    ],
    rows: rows.map((r, i) => ({
      key: `${r.characteristic}-${i}`,
      cells: [
        { text: r.characteristic, ...(r.note ? { note: r.note } : {}) },
        { text: formatDeclaredValue(r) },
        { text: formatNumber(r.loadPercent, 1), sortValue: r.loadPercent },
        { text: formatNumber(r.speedPercent, 1) },
        { text: r.standard },
      ],
    })),
  };
}

type StoppingRow = NonNullable<ArmSpec["stoppingData"]>[number];

/** Rows of one joint in reading order: stop category, extension, payload, speed. */
export function sortStoppingRows(rows: readonly StoppingRow[]): StoppingRow[] {
  return [...rows].sort(
    (a, b) =>
      a.stopCategory - b.stopCategory ||
      a.extensionPercent - b.extensionPercent ||
      a.payloadPercent - b.payloadPercent ||
      a.speedPercent - b.speedPercent,
  );
}

/** Chart and table ids are element ids: joint names are free text, so they are made safe. */
function slug(name: string, index: number): string {
  const s = name
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "");
  return `${s || "joint"}-${index}`;
}

function stoppingJoint(s: ArmSpec, joint: string, index: number): StoppingJointModel {
  const rows = sortStoppingRows((s.stoppingData ?? []).filter((r) => r.joint === joint));
  const id = `stopping-${slug(joint, index)}`;
  return {
    joint,
    table: {
      id: `${id}-table`,
      caption: `Stopping data of ${joint}, as declared`,
      rowHeaders: false,
      columns: [
        { key: "category", label: "Stop category", numeric: true },
        { key: "speed", label: "Speed", unit: "% of max.", numeric: true },
        { key: "extension", label: "Extension", unit: "%", numeric: true },
        { key: "payload", label: "Payload", unit: "% of rated", numeric: true },
        { key: "distance", label: "Stopping distance", unit: "deg", numeric: true },
        { key: "time", label: "Stopping time", unit: "s", numeric: true },
      ],
      rows: rows.map((r, k) => ({
        key: `${k}`,
        cells: [
          { text: String(r.stopCategory) },
          { text: formatNumber(r.speedPercent, 1) },
          { text: formatNumber(r.extensionPercent, 1) },
          { text: formatNumber(r.payloadPercent, 1) },
          { text: formatNumber(r.distanceDeg, 2) },
          { text: formatNumber(r.timeS, 3) },
        ],
      })),
    },
    chart: stoppingChart({ id: `${id}-chart`, armName: s.model, joint, points: rows }),
  };
}

/**
 * Every stopping-data row of the arm in one compact table, for print: a row per joint, stop category, extension and
 * payload, a column per speed, each cell "distance deg, time s" ("—" where the file gives no value). Null without
 * stopping data.
 */
export function stoppingSummaryTable(s: ArmSpec): TableModel | null {
  const rows = s.stoppingData ?? [];
  if (rows.length === 0) return null;
  const speeds = [...new Set(rows.map((r) => r.speedPercent))].sort((a, b) => a - b);
  const jointOrder = new Map(s.joints.map((j, i) => [j.name, i]));
  const groups = new Map<string, StoppingRow[]>();
  for (const r of rows) {
    const key = `${r.joint}|${r.stopCategory}|${r.extensionPercent}|${r.payloadPercent}`;
    groups.set(key, [...(groups.get(key) ?? []), r]);
  }
  const ordered = [...groups.values()].sort(
    (a, b) =>
      (jointOrder.get(a[0]!.joint) ?? 0) - (jointOrder.get(b[0]!.joint) ?? 0) ||
      a[0]!.stopCategory - b[0]!.stopCategory ||
      a[0]!.extensionPercent - b[0]!.extensionPercent ||
      a[0]!.payloadPercent - b[0]!.payloadPercent,
  );
  return {
    id: "stopping-summary-table",
    caption: "Stopping data, as declared: stopping distance and time at each joint speed (% of its maximum)",
    rowHeaders: true,
    columns: [
      { key: "joint", label: "Joint", numeric: false },
      { key: "category", label: "Stop category", numeric: true },
      { key: "extension", label: "Extension", unit: "%", numeric: true },
      { key: "payload", label: "Payload", unit: "% of rated", numeric: true },
      ...speeds.map((v) => ({
        key: `speed-${v}`,
        label: `At ${formatNumber(v, 1)} % speed`,
        unit: "deg, s",
        numeric: true,
      })),
    ],
    rows: ordered.map((g, k) => {
      const first = g[0]!;
      return {
        key: `${k}`,
        cells: [
          { text: first.joint },
          { text: String(first.stopCategory) },
          { text: formatNumber(first.extensionPercent, 1) },
          { text: formatNumber(first.payloadPercent, 1) },
          ...speeds.map((v) => {
            const r = g.find((x) => x.speedPercent === v);
            return { text: r ? `${formatNumber(r.distanceDeg, 2)}, ${formatNumber(r.timeS, 3)}` : "\u2014" };
          }),
        ],
      };
    }),
  };
}

/** The datasheet section of an arm sheet (see the module comment). */
export function datasheetModel(s: ArmSpec): DatasheetModel {
  const stoppingJoints = s.joints.map((j) => j.name).filter((n) => (s.stoppingData ?? []).some((r) => r.joint === n));
  const fields = [
    s.footprintMm,
    s.mountingFace,
    s.flangeInterface,
    s.ambientC,
    s.controller,
    s.noiseDbA,
    s.declaredPerformance?.length ? s.declaredPerformance : undefined,
    s.stoppingData?.length ? s.stoppingData : undefined,
  ];
  return {
    table: fieldsTable(s),
    performance: performanceTable(s),
    stopping: stoppingJoints.map((joint, i) => stoppingJoint(s, joint, i)),
    stoppingSummary: stoppingSummaryTable(s),
    declaredCount: fields.filter((f) => f !== undefined).length,
  };
}
