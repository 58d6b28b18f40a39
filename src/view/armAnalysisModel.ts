/**
 * The computed sections of an arm sheet (envelope, speed, singularities, payload, cycle) and its key figures, from the
 * arm's analysis: charts as SVG strings with their captions, tables with formatted cells, notes and warnings.
 * Pure: (arm, analysis, options) → props.
 */
import type { Arm } from "../catalog";
import type { ArmAnalysis } from "../core";
import { REACH_MISMATCH_FRACTION, STANDARD_CYCLE_MOVES } from "../core";
import {
  cycleChart,
  envelopeChart,
  loadDiagramChart,
  payloadChart,
  singularityChart,
  speedMapChart,
  type ChartResult,
  type LocusData,
  type PointData,
} from "../charts";
import { armDataPaths } from "./armCsv";
import { capabilitySection, capabilitySummaryFigure, type CapabilitySectionModel } from "./capabilityModel";
import { formatNumber, formatQuantity, NOT_STATED } from "./format";
import { MOUNTING_LABEL } from "./labels";
import { siteHref } from "./links";
import { analysisWarningText, cycleFailureText } from "./warningText";
import type { TableCell, TableModel, TableRow } from "./table";

export type Orientation = "down" | "outward";

export const ORIENTATION_WORDS: Readonly<Record<Orientation, { readonly long: string; readonly short: string }>> = {
  down: { long: "tool pointing down", short: "tool down" },
  outward: { long: "tool horizontal, pointing away from axis 1", short: "tool outward" },
};

function orientationWords(o: string): { long: string; short: string } {
  return o === "down" || o === "outward" ? ORIENTATION_WORDS[o] : { long: `tool ${o}`, short: `tool ${o}` };
}

export interface ReachCheck {
  /** Computed reach: WCP when the arm has one, else the flange centre, mm. */
  readonly computedMm: number;
  readonly basis: "wcp" | "flange";
  readonly statedMm: number | null;
  /** stated / computed − 1; null when not stated. */
  readonly deviation: number | null;
  /** |deviation| > 2 %. */
  readonly mismatch: boolean;
}

/** Stated against computed reach (the same rule as the analysis warning and data/catalog.json). */
export function reachCheck(analysis: Pick<ArmAnalysis, "reach">): ReachCheck {
  const wcp = analysis.reach.wcpMaxMm;
  const computedMm = wcp ?? analysis.reach.flangeMaxMm ?? 0;
  const statedMm = analysis.reach.statedMm ?? null;
  const deviation = statedMm !== null && computedMm > 0 ? statedMm / computedMm - 1 : null;
  return {
    computedMm,
    basis: wcp !== null ? "wcp" : "flange",
    statedMm,
    deviation,
    mismatch: deviation !== null && Math.abs(deviation) > REACH_MISMATCH_FRACTION,
  };
}

/** "+5.2 %", "−0.3 %". */
export function formatSignedPercent(ratio: number, digits = 1): string {
  const text = formatNumber(ratio * 100, digits);
  return `${ratio > 0 && text !== "0" ? "+" : ""}${text}\u00a0%`;
}

/** m/s from mm/s, two decimals: "1.5 m/s". */
export function formatSpeedMPerS(mmPerS: number, digits = 2): string {
  return formatQuantity(mmPerS / 1000, "m/s", digits);
}

/** A share 0–1 as a percentage: "54.9 %". */
export function formatShare(share: number, digits = 1): string {
  return formatQuantity(share * 100, "%", digits);
}

export interface SummaryFigure {
  readonly key: string;
  readonly label: string;
  readonly value: string;
  readonly note: string;
  /** A figure that needs attention (the reach mismatch). */
  readonly flag: boolean;
  /** Anchor of the section that explains the figure ("#envelope"). */
  readonly href: string;
}

export interface DownloadLink {
  readonly key: string;
  readonly label: string;
  readonly href: string;
  readonly description: string;
}

export interface ArmAnalysisModel {
  readonly summary: readonly SummaryFigure[];
  /** Warnings of the analysis, as sentences. */
  readonly warnings: readonly { readonly code: string; readonly text: string }[];
  readonly envelope: {
    readonly charts: readonly ChartResult[];
    readonly table: TableModel;
    /** What the charts show, one sentence, then the reach comparison. */
    readonly intro: string;
    readonly reachText: string;
    readonly notes: readonly string[];
  };
  readonly speed: {
    readonly charts: readonly ChartResult[];
    readonly table: TableModel;
    readonly notes: readonly string[];
  };
  readonly capability: CapabilitySectionModel;
  readonly singularities: { readonly charts: readonly ChartResult[]; readonly notes: readonly string[] };
  readonly payload: {
    readonly basisText: string;
    readonly statement: string;
    readonly charts: readonly ChartResult[];
    readonly tables: readonly TableModel[];
    readonly loadDiagram: ChartResult | null;
    readonly loadDiagramText: string;
    readonly notes: readonly string[];
  };
  readonly cycle: {
    readonly valueText: string;
    readonly chart: ChartResult | null;
    readonly table: TableModel | null;
    readonly assumptions: readonly string[];
    readonly reason: string | null;
  };
  readonly downloads: readonly DownloadLink[];
}

export const PAYLOAD_BASIS_TEXT: Readonly<Record<string, string>> = {
  computed:
    "Computed from the joint torque ratings and link masses in the arm file (\u03c4 = J\u1d40\u00b7F for the payload plus the links\u2019 own weight).",
  "upper-bound-no-link-masses":
    "Upper bound: computed from the joint torque ratings without the links\u2019 own weight, because the arm file gives no link masses.",
  "upper-bound-missing-torques":
    "Upper bound: some joints have no torque rating in the arm file, so they do not limit the figures.",
  "as-rated":
    "As rated by the maker: the arm file gives no joint torque ratings, so the rated payload is shown over the whole envelope.",
};

const LIMITED_BY_TEXT: Readonly<Record<string, string>> = {
  "rated-payload": "rated payload",
  "own-weight": "own weight",
  "as-rated": "as rated",
  unreachable: "not reached",
};

function cell(text: string, sortValue?: number | string): TableCell {
  return sortValue === undefined ? { text } : { text, sortValue };
}

function numCell(value: number | null | undefined, digits: number, unit?: string): TableCell {
  if (value === null || value === undefined || !Number.isFinite(value)) return { text: NOT_STATED };
  return { text: unit ? formatQuantity(value, unit, digits) : formatNumber(value, digits), sortValue: value };
}

function dashCell(): TableCell {
  return { text: "\u2014" };
}

function envelopeSection(arm: Arm, a: ArmAnalysis, name: string): ArmAnalysisModel["envelope"] {
  const e = a.envelope;
  const layout = e.layout;
  const revolute = layout === "revolute-base";
  const charts: ChartResult[] = [];
  const stated = a.reach.statedMm ?? null;
  charts.push(
    envelopeChart({
      id: "envelope-side",
      armName: name,
      view: "side",
      layout,
      wcp: e.wcp?.side ?? null,
      flange: e.flange.side,
      statedReachMm: stated,
    }),
  );
  const axis = e.axis1;
  const vertical = axis !== null && Math.abs(Math.abs(axis.direction[2]) - 1) < 1e-9;
  charts.push(
    envelopeChart({
      id: "envelope-top",
      armName: name,
      view: "top",
      layout,
      wcp: e.wcp?.top ?? null,
      flange: e.flange.top,
      statedReachMm: stated,
      axis1TopMm: axis && vertical ? ([axis.pointMm[0], axis.pointMm[1]] as const) : null,
    }),
  );
  const from = revolute ? "from axis 1" : "from the base z axis";
  type Point = NonNullable<typeof e.wcp> | typeof e.flange;
  const points: Point[] = e.wcp ? [e.wcp, e.flange] : [e.flange];
  const row = (key: string, label: string, f: (p: Point) => TableCell): TableRow => ({
    key,
    cells: [cell(label), ...points.map(f)],
  });
  const table: TableModel = {
    id: "envelope-table",
    caption: "Envelope figures, computed from the kinematic parameters and joint limits",
    rowHeaders: true,
    columns: [
      { key: "figure", label: "Figure", numeric: false },
      ...(e.wcp ? [{ key: "wcp", label: "Wrist centre point", numeric: true }] : []),
      { key: "flange", label: "Flange centre", numeric: true },
    ],
    rows: [
      row("max-reach", `Largest reach, ${from}`, (p) => numCell(p.maxReachMm, 0, "mm")),
      row("min-reach", `Smallest reach, ${from}`, (p) => numCell(p.minReachMm, 0, "mm")),
      row("max-height", revolute ? "Highest point along axis 1" : "Highest point", (p) =>
        numCell(p.maxHeightMm, 0, "mm"),
      ),
      row("min-height", revolute ? "Lowest point along axis 1" : "Lowest point", (p) =>
        numCell(p.minHeightMm, 0, "mm"),
      ),
      row("side-area", "Side-view area", (p) => numCell(p.sideAreaM2, 2, "m\u00b2")),
      row("top-area", "Top-view area", (p) => numCell(p.topAreaM2, 2, "m\u00b2")),
      row("volume", revolute ? "Volume swept about axis 1" : "Volume", (p) => numCell(p.volumeM3, 2, "m\u00b3")),
      row("tolerance", "Boundary accuracy", (p) => ({
        text: `\u00b1${formatQuantity(p.toleranceMm, "mm", 1)}`,
        sortValue: p.toleranceMm,
      })),
    ],
  };
  const rc = reachCheck(a);
  const what = rc.basis === "wcp" ? "wrist centre point" : "flange centre";
  const reachText =
    rc.statedMm === null
      ? `Computed reach of the ${what}: ${formatQuantity(rc.computedMm, "mm")}. The arm file states no reach.`
      : `Computed reach of the ${what}: ${formatQuantity(rc.computedMm, "mm")}; stated reach ${formatQuantity(rc.statedMm, "mm")} ` +
        `(${formatSignedPercent(rc.deviation ?? 0)}${rc.mismatch ? ", more than 2\u00a0%: check the arm file" : ", within 2\u00a0%"}).`;
  const classNote =
    arm.spec.class === "scara"
      ? [
          "SCARA: the side view is the vertical stroke across the band of distances the forearm reaches; the top view is the area the arm sweeps.",
        ]
      : layout === "prismatic-base"
        ? [
            "The first joint slides: the side view is the projection on the base x\u2013z plane, the top view the projection on the base x\u2013y plane.",
          ]
        : [];
  const intro = e.wcp
    ? "Where the wrist centre point and the flange centre can be, within the joint limits of the arm file."
    : "Where the flange centre can be, within the joint limits of the arm file (the arm has no wrist centre point).";
  return { charts, table, intro, reachText, notes: [...classNote, ...e.notes.map(sentence)] };
}

function sentence(text: string): string {
  const t = text.trim();
  if (t === "") return t;
  const first = t.charAt(0).toUpperCase() + t.slice(1);
  return /[.!?]$/.test(first) ? first : `${first}.`;
}

function speedSection(
  a: ArmAnalysis,
  name: string,
  layout: ArmAnalysis["envelope"]["layout"],
): ArmAnalysisModel["speed"] {
  const maps = a.speed.maps;
  const charts = maps.map((m) => {
    const w = orientationWords(m.orientation);
    return speedMapChart({
      id: `speed-${m.orientation}`,
      armName: name,
      orientationLabel: w.long,
      orientationShort: w.short,
      layout,
      grid: m.grid,
      guaranteedMmPerS: m.guaranteedMmPerS,
      flangeSide: a.envelope.flange.side,
      shareAtLeast1: m.shareAtLeast["1"] ?? null,
    });
  });
  const share = (key: "0.5" | "1" | "2") => (m: (typeof maps)[number]) => numShare(m.shareAtLeast[key]);
  const numShare = (v: number | undefined): TableCell =>
    v === undefined ? { text: NOT_STATED } : { text: formatShare(v), sortValue: v };
  const rowOf = (key: string, label: string, f: (m: (typeof maps)[number]) => TableCell): TableRow => ({
    key,
    cells: [cell(label), ...maps.map(f)],
  });
  const table: TableModel = {
    id: "speed-table",
    caption: "Speed figures per reference tool orientation, computed from the joint speed limits",
    rowHeaders: true,
    columns: [
      { key: "figure", label: "Figure", numeric: false },
      ...maps.map((m) => ({
        key: m.orientation,
        label: sentence(orientationWords(m.orientation).short).replace(/\.$/, ""),
        numeric: true,
      })),
    ],
    rows: [
      rowOf("max-guaranteed", "Highest guaranteed straight-line speed", (m) =>
        m.maxGuaranteedMmPerS === null
          ? dashCell()
          : { text: formatSpeedMPerS(m.maxGuaranteedMmPerS), sortValue: m.maxGuaranteedMmPerS },
      ),
      rowOf("max-tool", "Highest tool speed (best direction)", (m) =>
        m.maxToolSpeedMmPerS === null
          ? dashCell()
          : { text: formatSpeedMPerS(m.maxToolSpeedMmPerS), sortValue: m.maxToolSpeedMmPerS },
      ),
      rowOf("share-05", "Share of reached cells, guaranteed \u2265 0.5 m/s", share("0.5")),
      rowOf("share-1", "Share of reached cells, guaranteed \u2265 1 m/s", share("1")),
      rowOf("share-2", "Share of reached cells, guaranteed \u2265 2 m/s", share("2")),
      rowOf("area", "Side-view area reached", (m) => {
        const area = m.reachableCells * (m.computedGrid.stepMm / 1000) ** 2;
        return { text: formatQuantity(area, "m\u00b2", 2), sortValue: area };
      }),
    ],
  };
  const notes = [
    `Maximum tool speed over every map: ${a.speed.maxToolSpeedMmPerS === null ? NOT_STATED : formatSpeedMPerS(a.speed.maxToolSpeedMmPerS)} (the largest speed of the flange centre when every joint runs at its rated speed in the best direction).`,
    `Guaranteed straight-line speed: the speed the flange centre reaches in every direction at constant orientation with every joint within its rated speed; it falls to zero at a singularity.`,
    sentence(a.speed.shareBasis),
    ...maps.map(
      (m) =>
        `Inverse-kinematics branches kept, ${orientationWords(m.orientation).short}: ${m.branchNames.length > 0 ? m.branchNames.join("; ") : "\u2014"} (the best per cell).`,
    ),
    ...(a.speed.redundancy ? [sentence(`joint rates: ${a.speed.redundancy}`), REDUNDANT_POSTURE_RULE] : []),
    `Tool point: ${a.speed.tcp}. Maps are drawn on a ${formatNumber(maps[0]?.grid.stepMm ?? a.options.mapStepMm)}\u00a0mm grid; figures use the ${formatNumber(a.options.mapStepMm)}\u00a0mm computation grid.`,
  ];
  return { charts, table, notes };
}

/**
 * How a seven-axis arm's posture is chosen where a figure is called the best: among the postures the map's
 * continuation reaches, not over the arm's whole self-motion (which is not searched).
 */
export const REDUNDANT_POSTURE_RULE =
  "Posture rule for this redundant arm: each cell keeps the best of the postures the map carries from cell to cell (one per branch); the arm's self-motion at a cell is not searched, so another posture of the same flange pose can be faster than the figure shown.";

function singularitySection(
  a: ArmAnalysis,
  name: string,
  layout: ArmAnalysis["envelope"]["layout"],
): ArmAnalysisModel["singularities"] {
  const charts = a.speed.maps.map((m) => {
    const w = orientationWords(m.orientation);
    const loci: LocusData[] = a.singularities.loci
      .filter((l) => l.orientation === m.orientation)
      .map((l) => ({
        kind: l.kind,
        polylinesMm: l.polylinesMm.map((pl) =>
          pl
            .filter(
              (p): p is [number, number] => p[0] !== null && p[1] !== null && p[0] !== undefined && p[1] !== undefined,
            )
            .map((p) => [p[0], p[1]] as PointData),
        ),
      }));
    return singularityChart({
      id: `singularity-${m.orientation}`,
      armName: name,
      orientationLabel: w.long,
      orientationShort: w.short,
      layout,
      grid: m.grid,
      reached: m.guaranteedMmPerS,
      inverseCondition: m.inverseCondition,
      loci,
      lengthScaleMm: a.singularities.lengthScaleMm,
    });
  });
  const notes = [
    ...a.singularities.notes.map(sentence),
    sentence(
      `proximity: ${a.singularities.proximity}; length scale ${a.singularities.lengthScaleMm === null ? NOT_STATED : formatQuantity(a.singularities.lengthScaleMm, "mm")}`,
    ),
  ];
  return { charts, notes };
}

function payloadSection(arm: Arm, a: ArmAnalysis, name: string): ArmAnalysisModel["payload"] {
  const p = a.payload;
  const rated = arm.spec.ratedPayloadKg;
  const basisText = PAYLOAD_BASIS_TEXT[p.basis] ?? `Basis: ${p.basis}.`;
  const mountings = [...new Set(p.atReach.map((r) => r.mounting))];
  const reachWords = a.envelope.layout === "revolute-base" ? "distance from axis 1" : "distance from the base z axis";
  const charts = mountings.map((m) =>
    payloadChart({
      id: `payload-${m}`,
      armName: name,
      mountingLabel: MOUNTING_LABEL[m],
      rows: p.atReach.filter((r) => r.mounting === m),
      ratedPayloadKg: rated,
      basisText,
      reachWords,
    }),
  );
  const tables = mountings.map((m): TableModel => {
    const rows = p.atReach.filter((r) => r.mounting === m);
    const offsets = [...new Set(rows.map((r) => r.offsetMm))].sort((x, y) => x - y);
    const reaches = [...new Set(rows.map((r) => r.reachMm))].sort((x, y) => x - y);
    const first = offsets[0] ?? 0;
    return {
      id: `payload-table-${m}`,
      caption: `Payload at reach, ${MOUNTING_LABEL[m]} mounting (static; capped at the rated ${formatQuantity(rated, "kg", 2)})`,
      rowHeaders: true,
      columns: [
        { key: "reach", label: `Flange centre ${reachWords}`, unit: "mm", numeric: true },
        ...offsets.map((o) => ({
          key: `offset-${o}`,
          label: `Payload, CG offset ${formatNumber(o)} mm`,
          unit: "kg",
          numeric: true,
        })),
        { key: "limited-by", label: `What limits it (offset ${formatNumber(first)} mm)`, numeric: false },
        {
          key: "ratings-limit",
          label: `Joint ratings alone (offset ${formatNumber(first)} mm)`,
          unit: "kg",
          numeric: true,
        },
      ],
      rows: mergedPayloadRows(rows, offsets, reaches, first),
      footnote:
        "Consecutive reaches with the same payloads are shown as one row (the CSV download has every 50 mm step). " +
        "\u201cJoint ratings alone\u201d: the static limit from the joint torque ratings before the cap at the rated payload, with the joint that sets it; it is not a payload rating.",
    };
  });
  const ld = p.loadDiagram;
  const curves = ld.curves.map((c) => ({
    massKg: c.massKg,
    fractionOfRated: c.fractionOfRated,
    openEnded: c.openEnded,
    pointsMm: c.pointsMm.map((q) => [q[0], q[1]] as const),
  }));
  const loadDiagram =
    ld.basis === "wrist-ratings" && curves.some((c) => c.pointsMm.length >= 2)
      ? loadDiagramChart({ id: "load-diagram", armName: name, curves, ratedPayloadKg: ld.ratedPayloadKg })
      : null;
  const loadDiagramText =
    ld.basis === "as-rated"
      ? "The arm file gives no wrist moment or inertia ratings: no load diagram; the payload is as rated by the maker."
      : ld.wristAllowsAtZeroOffsetKg === null
        ? "The wrist ratings do not limit the mass with the centre of gravity at the flange centre; the rated payload caps it."
        : `With the centre of gravity at the flange centre, the wrist ratings allow ${formatQuantity(ld.wristAllowsAtZeroOffsetKg, "kg", 1)} (before the cap at the rated ${formatQuantity(ld.ratedPayloadKg, "kg", 2)}).`;
  const notes = [
    sentence(p.atReachDetail.convention),
    ...p.atReachDetail.notes.map(sentence),
    ...(ld.basis === "wrist-ratings" ? [sentence(ld.convention)] : []),
  ];
  return { basisText, statement: p.statement, charts, tables, loadDiagram, loadDiagramText, notes };
}

type PayloadRow = ArmAnalysis["payload"]["atReach"][number];

function limitedText(r: PayloadRow | undefined): string {
  if (!r) return "\u2014";
  return r.limitedBy === "joint-rating"
    ? `${r.limitingJoint ?? "joint"} rating`
    : (LIMITED_BY_TEXT[r.limitedBy] ?? r.limitedBy);
}

/**
 * Table rows of payload at reach for one mounting: consecutive reaches whose payloads (every offset) and limit agree
 * are merged into one row "from to mm"; the joint-ratings column then gives its range.
 */
function mergedPayloadRows(
  rows: readonly PayloadRow[],
  offsets: readonly number[],
  reaches: readonly number[],
  first: number,
): TableRow[] {
  const at = (reach: number, o: number) => rows.find((r) => r.reachMm === reach && r.offsetMm === o);
  const signature = (reach: number) =>
    offsets
      .map((o) => {
        const r = at(reach, o);
        return r && r.limitedBy !== "unreachable" ? r.payloadKg.toFixed(2) : "-";
      })
      .join("|") + `|${limitedText(at(reach, first))}`;
  const groups: number[][] = [];
  for (const reach of reaches) {
    const last = groups.at(-1);
    if (last && signature(last[0]!) === signature(reach)) last.push(reach);
    else groups.push([reach]);
  }
  return groups.map((g): TableRow => {
    const r0 = g[0]!;
    const r1 = g.at(-1)!;
    const limits = g
      .map((reach) => at(reach, first))
      .filter((r): r is PayloadRow => r !== undefined && r.torqueLimitKg !== null);
    const lo = Math.min(...limits.map((r) => r.torqueLimitKg!));
    const hi = Math.max(...limits.map((r) => r.torqueLimitKg!));
    const joints = [...new Set(limits.map((r) => r.torqueLimitJoint).filter((j): j is string => j !== null))];
    const ratings: TableCell =
      limits.length === 0
        ? dashCell()
        : {
            text: `${formatNumber(lo, 1)}${hi - lo >= 0.05 ? ` to ${formatNumber(hi, 1)}` : ""}${joints.length > 0 ? ` (${joints.join(", ")})` : ""}`,
            sortValue: lo,
          };
    return {
      key: `${r0}`,
      cells: [
        { text: r0 === r1 ? formatNumber(r0) : `${formatNumber(r0)} to ${formatNumber(r1)}`, sortValue: r0 },
        ...offsets.map((o) => {
          const r = at(r0, o);
          return r && r.limitedBy !== "unreachable"
            ? { text: formatNumber(r.payloadKg, 2), sortValue: r.payloadKg }
            : dashCell();
        }),
        { text: limitedText(at(r0, first)) },
        ratings,
      ],
    };
  });
}

function cycleSection(a: ArmAnalysis, name: string): ArmAnalysisModel["cycle"] {
  const c = a.cycle;
  const computed = c.standardCycleS !== null && c.moves.length > 0;
  const where = c.location
    ? `centre of the across move at ${formatQuantity(c.location.rMm, "mm")} from axis 1, ${formatQuantity(c.location.zMm, "mm")} high`
    : null;
  const valueText = computed
    ? `${formatQuantity(c.standardCycleS!, "s", 2)} per cycle, set by ${c.limitingJoint ?? "\u2014"}${where ? `; ${where}` : ""}.`
    : `Not computed: ${c.failure ? cycleFailureText(c.failure, c.location ? Math.round(c.location.rMm) : null) : "no reason given"}.`;
  const chart = computed
    ? cycleChart({
        id: "cycle-moves",
        armName: name,
        moves: c.moves,
        totalS: c.standardCycleS!,
        pathText: `up ${STANDARD_CYCLE_MOVES.upMm} mm, across ${STANDARD_CYCLE_MOVES.acrossMm} mm, down ${STANDARD_CYCLE_MOVES.upMm} mm and back`,
      })
    : null;
  const table: TableModel | null = computed
    ? {
        id: "cycle-table",
        caption: "Moves of the standard cycle",
        rowHeaders: true,
        columns: [
          { key: "move", label: "Move", numeric: false },
          { key: "time", label: "Time", unit: "s", numeric: true },
          { key: "joint", label: "Joint that sets it", numeric: false },
        ],
        rows: c.moves.map((m, i) => ({
          key: `move-${i}`,
          cells: [
            { text: `${m.from} \u2192 ${m.to}` },
            { text: formatNumber(m.timeS, 3), sortValue: m.timeS },
            { text: m.limitingJoint },
          ],
        })),
      }
    : null;
  return {
    valueText,
    chart,
    table,
    assumptions: c.assumptions.map(sentence),
    reason: computed || !c.failure ? null : cycleFailureText(c.failure, c.location ? Math.round(c.location.rMm) : null),
  };
}

/** Everything the computed sections of an arm sheet show. */
export function armAnalysisModel(
  arm: Arm,
  analysis: ArmAnalysis,
  options: { readonly baseUrl: string },
): ArmAnalysisModel {
  // Chart titles carry the model name only: the page heading names the maker, and long titles do not fit a chart.
  const name = arm.spec.model;
  const layout = analysis.envelope.layout;
  const rc = reachCheck(analysis);
  const reachLabel = rc.basis === "wcp" ? "Computed reach, wrist centre point" : "Computed reach, flange centre";
  const down = analysis.speed.maps.find((m) => m.orientation === "down") ?? null;
  const shareDown = down?.shareAtLeast["1"];
  const cycle = cycleSection(analysis, name);
  const primary = arm.spec.mountings[0];
  const fullReachRow = analysis.payload.atReach
    .filter((r) => r.mounting === primary && r.offsetMm === 0 && r.limitedBy !== "unreachable")
    .sort((x, y) => y.reachMm - x.reachMm)[0];
  const summary: SummaryFigure[] = [
    {
      key: "reach",
      label: reachLabel,
      value: formatQuantity(rc.computedMm, "mm"),
      note:
        rc.statedMm === null
          ? "reach not stated in the arm file"
          : `stated ${formatQuantity(rc.statedMm, "mm")}: ${formatSignedPercent(rc.deviation ?? 0)}${rc.mismatch ? ", more than 2\u00a0% apart: check the arm file" : ", within 2\u00a0%"}`,
      flag: rc.mismatch,
      href: "#envelope",
    },
    {
      key: "max-tool-speed",
      label: "Maximum tool speed",
      value:
        analysis.speed.maxToolSpeedMmPerS === null ? NOT_STATED : formatSpeedMPerS(analysis.speed.maxToolSpeedMmPerS),
      note: "flange centre, every joint at its rated speed, best direction and pose",
      flag: false,
      href: "#speed",
    },
    {
      key: "share-1",
      label: "Guaranteed line speed \u2265 1 m/s, tool down",
      value: shareDown === undefined ? NOT_STATED : formatShare(shareDown),
      note: "share of the side-view cells reached with the tool pointing down",
      flag: false,
      href: "#speed",
    },
    {
      key: "cycle",
      label: "Standard cycle estimate",
      value:
        analysis.cycle.standardCycleS === null ? "not computed" : formatQuantity(analysis.cycle.standardCycleS, "s", 2),
      note:
        analysis.cycle.standardCycleS === null
          ? analysis.cycle.failure
            ? cycleFailureText(
                analysis.cycle.failure,
                analysis.cycle.location ? Math.round(analysis.cycle.location.rMm) : null,
              )
            : ""
          : `up ${STANDARD_CYCLE_MOVES.upMm} mm, across ${STANDARD_CYCLE_MOVES.acrossMm} mm, down and back; set by ${analysis.cycle.limitingJoint ?? "\u2014"}; no blending`,
      flag: false,
      href: "#cycle",
    },
    ...(fullReachRow && primary
      ? [
          {
            key: "payload-full-reach",
            label: "Payload at full reach",
            value: formatQuantity(fullReachRow.payloadKg, "kg", 2),
            note: `${MOUNTING_LABEL[primary]} mounting, ${formatQuantity(fullReachRow.reachMm, "mm")} out, CG on the flange centre; static, ${PAYLOAD_SHORT_BASIS[analysis.payload.basis] ?? analysis.payload.basis}`,
            flag: false,
            href: "#payload",
          },
        ]
      : []),
    capabilitySummaryFigure(analysis),
  ];
  const paths = armDataPaths(arm.id);
  const downloads: DownloadLink[] = [
    {
      key: "json",
      label: "Analysis (JSON)",
      href: siteHref(options.baseUrl, paths.json),
      description: "every computed figure, map and curve of this arm, with the spec fingerprint and analysis version",
    },
    {
      key: "payload-csv",
      label: "Payload at reach (CSV)",
      href: siteHref(options.baseUrl, paths.payloadCsv),
      description: "one row per mounting, reach and CG offset",
    },
    {
      key: "joints-csv",
      label: "Joint table (CSV)",
      href: siteHref(options.baseUrl, paths.jointsCsv),
      description: "ranges, speeds, accelerations and ratings as declared",
    },
    {
      key: "urdf",
      label: "Kinematic chain (URDF)",
      href: siteHref(options.baseUrl, paths.urdf),
      description: "joints, axes and limits in SI units for tools that read URDF; no meshes or inertia",
    },
  ];
  return {
    summary,
    warnings: analysis.warnings.map((w) => ({ code: w.code, text: sentence(analysisWarningText(w)) })),
    envelope: envelopeSection(arm, analysis, name),
    speed: speedSection(analysis, name, layout),
    capability: capabilitySection(analysis, name, arm.chain.drivenCount),
    singularities: singularitySection(analysis, name, layout),
    payload: payloadSection(arm, analysis, name),
    cycle,
    downloads,
  };
}

const PAYLOAD_SHORT_BASIS: Readonly<Record<string, string>> = {
  computed: "computed from joint ratings and link masses",
  "upper-bound-no-link-masses": "an upper bound (no link masses in the file)",
  "upper-bound-missing-torques": "an upper bound (torque ratings missing)",
  "as-rated": "as rated by the maker",
};
