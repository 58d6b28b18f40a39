/** Props of an arm sheet, `/arms/<id>/`: every value formatted, every link joined with the base path. */
import type { Arm } from "../catalog";
import type { ArmAnalysis } from "../core";
import { armAnalysisModel, type ArmAnalysisModel } from "./armAnalysisModel";
import { CAUTIONS, type Cautions } from "./cautions";
import { datasheetModel, type DatasheetModel } from "./datasheetModel";
import type { ViewOptions } from "./catalogPageModel";
import {
  formatList,
  formatNumber,
  formatOptionalQuantity,
  formatPrice,
  formatQuantity,
  formatVector,
  NOT_STATED,
} from "./format";
import { jointTable, parameterTable } from "./jointTables";
import { CLASS_LABEL, CONVENTION_LABEL, MOUNTING_LABEL } from "./labels";
import { absoluteUrl, armPath, siteHref } from "./links";
import type { TableModel, TableRow } from "./table";

/** Length of the spec fingerprint shown on the page: the first hex digits of the arm file's sha256. */
export const FINGERPRINT_HEX_DIGITS = 12;

export interface PageSection {
  /** Anchor id, stable: quotes link to `/arms/<id>/#<anchor>`. */
  readonly id: string;
  readonly title: string;
}

export interface SourceBlockModel {
  readonly document: string;
  readonly revision: string;
  readonly date: string;
  readonly notes: string | null;
  /** Arm file path, relative to the project. */
  readonly file: string;
  /** First 12 hex digits of specHash. */
  readonly fingerprint: string;
  readonly specHash: string;
}

export interface ArmPageModel {
  readonly id: string;
  readonly title: string;
  readonly maker: string;
  readonly model: string;
  /** "Articulated · 6 driven axes · floor, ceiling". */
  readonly summary: string;
  readonly description: string | null;
  readonly sections: readonly PageSection[];
  readonly specTable: TableModel;
  readonly wristTable: TableModel | null;
  readonly commercialTable: TableModel | null;
  /** The declared datasheet facts, performance and stopping data (section "Datasheet"). */
  readonly datasheet: DatasheetModel;
  readonly parameterTable: TableModel;
  readonly linkTable: TableModel | null;
  readonly jointTable: TableModel;
  readonly source: SourceBlockModel;
  /** Warnings from validating the file, formatted. */
  readonly checks: readonly string[];
  readonly cautions: Cautions;
  readonly href: string;
  /** Absolute address when the site address is configured; else null. */
  readonly canonicalUrl: string | null;
  readonly catalogHref: string;
  readonly methodsHref: string;
  /** The computed sections (envelope, speed, singularities, payload, cycle, downloads); null without an analysis. */
  readonly analysis: ArmAnalysisModel | null;
}

export interface ArmViewOptions extends ViewOptions {
  /** Astro.site (from ARMDEX_SITE), if any. */
  readonly site?: URL | string | undefined;
}

type Basis = "declared" | "computed" | "counted" | "not stated";

function specRow(key: string, label: string, value: string, basis: Basis): TableRow {
  return { key, cells: [{ text: label }, { text: value }, { text: value === NOT_STATED ? "" : basis }] };
}

function wristDescription(arm: Arm): { text: string; basis: Basis } {
  const w = arm.chain.wrist;
  if (!w) return { text: "none: no three wrist axes meet in one point", basis: "computed" };
  const names = formatList(w.axes.map((i) => arm.chain.jointNames[i] ?? `#${i}`));
  return w.basis === "spherical"
    ? { text: `where the axes of ${names} meet (spherical wrist)`, basis: "computed" }
    : { text: `defined by the axes of ${names}`, basis: "declared" };
}

function specTable(arm: Arm): TableModel {
  const s = arm.spec;
  const passive = arm.chain.jointCount - arm.chain.drivenCount;
  const wrist = wristDescription(arm);
  return {
    id: "spec-table",
    caption:
      "Key figures, each with its basis: declared in the source document, counted from the joint list, or computed from the geometry",
    rowHeaders: true,
    columns: [
      { key: "property", label: "Property", numeric: false },
      { key: "value", label: "Value", numeric: false },
      { key: "basis", label: "Basis", numeric: false },
    ],
    rows: [
      specRow("maker", "Maker", s.maker, "declared"),
      specRow("model", "Model", s.model, "declared"),
      specRow("class", "Class", CLASS_LABEL[s.class], "declared"),
      specRow(
        "axes",
        "Driven axes",
        passive > 0
          ? `${formatNumber(arm.chain.drivenCount)} (and ${formatNumber(passive)} passive joint${passive === 1 ? "" : "s"})`
          : formatNumber(arm.chain.drivenCount),
        "counted",
      ),
      specRow("payload", "Rated payload", formatQuantity(s.ratedPayloadKg, "kg", 2), "declared"),
      specRow("reach", "Stated reach", formatOptionalQuantity(s.reachMm, "mm"), "declared"),
      specRow(
        "repeatability",
        "Pose repeatability RP (ISO 9283)",
        formatQuantity(s.repeatabilityMm, "mm", 3),
        "declared",
      ),
      specRow("mass", "Arm mass", formatQuantity(s.massKg, "kg", 1), "declared"),
      specRow("mountings", "Mountings", formatList(s.mountings.map((m) => MOUNTING_LABEL[m])), "declared"),
      specRow("protection", "Protection (IEC 60529)", s.protection, "declared"),
      specRow("convention", "Kinematic description", CONVENTION_LABEL[s.convention], "declared"),
      specRow("wrist-centre", "Wrist centre point", wrist.text, wrist.basis),
    ],
  };
}

function wristTable(arm: Arm): TableModel | null {
  const w = arm.spec.wrist;
  const moment = w?.momentNm ?? {};
  const inertia = w?.inertiaKgM2 ?? {};
  const names = arm.spec.joints.map((j) => j.name).filter((n) => moment[n] !== undefined || inertia[n] !== undefined);
  if (names.length === 0) return null;
  return {
    id: "wrist-table",
    caption: "Wrist load ratings, as declared",
    rowHeaders: true,
    columns: [
      { key: "joint", label: "Joint", numeric: false },
      { key: "moment", label: "Allowed moment", unit: "N\u00b7m", numeric: true },
      { key: "inertia", label: "Allowed inertia", unit: "kg\u00b7m\u00b2", numeric: true },
    ],
    rows: names.map((n) => ({
      key: n,
      cells: [
        { text: n },
        moment[n] === undefined ? { text: NOT_STATED } : { text: formatNumber(moment[n], 2), sortValue: moment[n] },
        inertia[n] === undefined ? { text: NOT_STATED } : { text: formatNumber(inertia[n], 4), sortValue: inertia[n] },
      ],
    })),
  };
}

function commercialTable(arm: Arm): TableModel | null {
  const c = arm.spec.commercial;
  if (!c) return null;
  const rows: TableRow[] = [
    { key: "price", cells: [{ text: "List price" }, { text: formatPrice(c.listPrice, c.currency) }] },
  ];
  if (c.leadTimeWeeks !== undefined)
    rows.push({
      key: "lead-time",
      cells: [
        { text: "Lead time" },
        { text: formatQuantity(c.leadTimeWeeks, c.leadTimeWeeks === 1 ? "week" : "weeks", 1) },
      ],
    });
  if (c.quoteRef !== undefined) rows.push({ key: "quote", cells: [{ text: "Quote reference" }, { text: c.quoteRef }] });
  return {
    id: "commercial-table",
    caption: "Commercial data (internal)",
    rowHeaders: true,
    columns: [
      { key: "property", label: "Property", numeric: false },
      { key: "value", label: "Value", numeric: false },
    ],
    rows,
  };
}

function linkTable(arm: Arm): TableModel | null {
  const links = arm.spec.links;
  if (!links || links.length === 0) return null;
  return {
    id: "link-table",
    caption: "Link masses, with the centre of mass in the link frame of the joint named",
    rowHeaders: true,
    columns: [
      { key: "after", label: "After joint", numeric: false },
      { key: "mass", label: "Mass", unit: "kg", numeric: true },
      { key: "com", label: "Centre of mass xyz", unit: "mm", numeric: true },
    ],
    rows: links.map((l, i) => ({
      key: `${l.after}-${i}`,
      cells: [
        { text: l.after },
        { text: formatNumber(l.massKg, 2), sortValue: l.massKg },
        { text: formatVector(l.comMm, 1) },
      ],
    })),
  };
}

/** Section anchors and titles of the computed part of the sheet, in page order. */
export const ANALYSIS_SECTIONS: readonly PageSection[] = [
  { id: "envelope", title: "Envelope" },
  { id: "speed", title: "Speed" },
  { id: "directions", title: "Tool directions" },
  { id: "singularities", title: "Singularities" },
  { id: "payload", title: "Payload" },
  { id: "cycle", title: "Cycle" },
  { id: "line-check", title: "Straight lines" },
];

/**
 * Everything an arm sheet shows, ready to print. With the arm's analysis the sheet gains the key figures, the
 * computed sections and the downloads; without it, the declared part alone.
 */
export function armPageModel(arm: Arm, options: ArmViewOptions, analysis?: ArmAnalysis | null): ArmPageModel {
  const s = arm.spec;
  const href = siteHref(options.baseUrl, armPath(arm.id));
  const checks = arm.warnings.map((w) => (w.path ? `${w.path}: ${w.message}` : w.message));
  const computed = analysis ? armAnalysisModel(arm, analysis, options) : null;
  const sections: PageSection[] = [
    ...(computed ? [{ id: "summary", title: "Key figures" }] : []),
    { id: "specs", title: "Specifications" },
    { id: "datasheet", title: "Datasheet" },
    ...(computed ? ANALYSIS_SECTIONS : []),
    { id: "parameters", title: "Kinematic parameters" },
    { id: "joints", title: "Joints" },
    ...(computed ? [{ id: "downloads", title: "Downloads" }] : []),
    { id: "source", title: "Source" },
    ...(checks.length > 0 ? [{ id: "checks", title: "Checks on this file" }] : []),
    { id: "cautions", title: "Cautions" },
  ];
  const passive = arm.chain.jointCount - arm.chain.drivenCount;
  return {
    id: arm.id,
    title: `${s.maker} ${s.model}`,
    maker: s.maker,
    model: s.model,
    summary: [
      CLASS_LABEL[s.class],
      `${formatNumber(arm.chain.drivenCount)} driven axes${passive > 0 ? ` + ${formatNumber(passive)} passive` : ""}`,
      `${formatQuantity(s.ratedPayloadKg, "kg", 2)} rated payload`,
      s.reachMm === undefined ? "reach not stated" : `${formatQuantity(s.reachMm, "mm")} stated reach`,
    ].join(" \u00b7 "),
    description: s.description ?? null,
    sections,
    specTable: specTable(arm),
    wristTable: wristTable(arm),
    commercialTable: commercialTable(arm),
    datasheet: datasheetModel(s),
    parameterTable: parameterTable(s),
    linkTable: linkTable(arm),
    jointTable: jointTable(arm),
    source: {
      document: s.source.document,
      revision: s.source.revision,
      date: s.source.date,
      notes: s.source.notes ?? null,
      file: arm.file,
      fingerprint: arm.specHash.slice(0, FINGERPRINT_HEX_DIGITS),
      specHash: arm.specHash,
    },
    checks,
    cautions: CAUTIONS,
    href,
    canonicalUrl: absoluteUrl(options.site, href),
    catalogHref: siteHref(options.baseUrl, ""),
    methodsHref: siteHref(options.baseUrl, "methods/"),
    analysis: computed,
  };
}
