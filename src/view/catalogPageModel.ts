/** Props of the catalog page: one row per arm with its key declared figures and, given the analyses, computed ones. */
import type { Arm, ArmSpec } from "../catalog";
import type { AnalysisSummary } from "../catalog/analysis";
import { formatSignedPercent, reachCheck } from "./armAnalysisModel";
import { conditionsText, declaredPoseRepeatability, NOT_DECLARED } from "./datasheetFormat";
import { formatList, formatNumber, formatPrice, NOT_STATED } from "./format";
import { CLASS_LABEL, MOUNTING_LABEL } from "./labels";
import { armPath, siteHref } from "./links";
import type { TableCell, TableColumn, TableModel, TableRow } from "./table";
import { capabilityHeadlineCell } from "./capabilityModel";

export interface FilterOption {
  readonly value: string;
  readonly label: string;
}

export interface CatalogPageModel {
  readonly title: string;
  /** "3 arms from 2 makers". */
  readonly countText: string;
  readonly table: TableModel;
  /** Choices of the filter form: the classes and mountings that occur in the catalog, in the format's order. */
  readonly filterChoices: {
    readonly classes: readonly FilterOption[];
    readonly mountings: readonly FilterOption[];
    /** IP codes that occur in the catalog, sorted: the choices of "protection at least". */
    readonly protections: readonly FilterOption[];
  };
}

export interface ViewOptions {
  /** import.meta.env.BASE_URL */
  readonly baseUrl: string;
}

const COLUMNS: readonly TableColumn[] = [
  { key: "maker", label: "Maker", numeric: false },
  { key: "model", label: "Model", numeric: false },
  { key: "class", label: "Class", numeric: false },
  { key: "axes", label: "Driven axes", numeric: true },
  { key: "payload", label: "Rated payload", unit: "kg", numeric: true },
  { key: "reach", label: "Stated reach", unit: "mm", numeric: true },
  { key: "repeatability", label: "Repeatability", unit: "mm", numeric: true },
  { key: "mass", label: "Mass", unit: "kg", numeric: true },
  { key: "mountings", label: "Mountings", numeric: false },
  { key: "protection", label: "Protection", numeric: false },
  { key: "footprint", label: "Footprint", unit: "mm", numeric: true },
];

/** Computed columns, shown when the analyses are given: after the stated reach, and after the mass. */
const COMPUTED_REACH_COLUMN: TableColumn = {
  key: "computed-reach",
  label: "Computed reach",
  unit: "mm",
  numeric: true,
};
const COMPUTED_COLUMNS: readonly TableColumn[] = [
  { key: "max-tool-speed", label: "Max tool speed", unit: "m/s", numeric: true },
  { key: "line-speed", label: "Best guaranteed line speed, tool down", unit: "m/s", numeric: true },
  { key: "share-1", label: "Share \u2265 1 m/s, tool down", unit: "%", numeric: true },
  { key: "directions-half", label: "Cells from \u2265 half of tool directions", unit: "%", numeric: true },
  { key: "cycle", label: "Standard cycle", unit: "s", numeric: true },
];

/**
 * The arm's best guaranteed straight-line speed with the tool pointing down, m/s: the largest value of the "down"
 * tool-speed map (every arm has that map; the share column uses it too). Null without a map.
 */
export function bestGuaranteedLineSpeedDownMPerS(analysis: AnalysisSummary): number | null {
  const down = analysis.speed.maps.find((m) => m.orientation === "down");
  const v = down?.maxGuaranteedMmPerS;
  return v === null || v === undefined ? null : v / 1000;
}

function computedCells(analysis: AnalysisSummary | undefined): {
  reach: TableCell;
  stated: TableCell | null;
  rest: TableCell[];
} {
  if (!analysis) {
    const none = { text: "not computed" };
    return { reach: none, stated: null, rest: [none, none, none, none, none] };
  }
  const rc = reachCheck(analysis);
  const reach: TableCell = {
    text: formatNumber(rc.computedMm),
    note: rc.basis === "wcp" ? "WCP" : "flange",
    sortValue: rc.computedMm,
  };
  const stated: TableCell | null =
    rc.statedMm === null || rc.deviation === null
      ? null
      : {
          text: formatNumber(rc.statedMm),
          note: rc.mismatch ? `check: ${formatSignedPercent(rc.deviation)}` : formatSignedPercent(rc.deviation),
          sortValue: rc.statedMm,
        };
  const down = analysis.speed.maps.find((m) => m.orientation === "down");
  const share = down?.shareAtLeast["1"];
  const v = analysis.speed.maxToolSpeedMmPerS;
  const line = bestGuaranteedLineSpeedDownMPerS(analysis);
  const c = analysis.cycle.standardCycleS;
  // Where the cycle could not be computed the arm sheet gives the reason; the table stays narrow.
  const cycleCell: TableCell = c === null ? { text: "not computed" } : { text: formatNumber(c, 2), sortValue: c };
  return {
    reach,
    stated,
    rest: [
      v === null ? { text: "not computed" } : { text: formatNumber(v / 1000, 2), sortValue: v / 1000 },
      line === null ? { text: "not computed" } : { text: formatNumber(line, 2), sortValue: line },
      share === undefined ? { text: "\u2014" } : { text: formatNumber(share * 100, 1), sortValue: share * 100 },
      capabilityHeadlineCell(analysis.capability),
      cycleCell,
    ],
  };
}

const PRICE_COLUMN: TableColumn = { key: "price", label: "List price", numeric: true };

function plural(n: number, word: string): string {
  return `${formatNumber(n)} ${word}${n === 1 ? "" : "s"}`;
}

/**
 * The catalog table. The price column appears only when at least one arm file carries commercial data; the computed
 * columns (reach, maximum tool speed, share of guaranteed line speed ≥ 1 m/s with the tool down, share of cells reached
 * from at least half of the tool directions, standard cycle) only
 * when `analyses` (by arm id; summaries or full analyses) is given.
 */
export function catalogPageModel(
  arms: readonly Arm[],
  options: ViewOptions,
  analyses?: ReadonlyMap<string, AnalysisSummary>,
): CatalogPageModel {
  const withPrice = arms.some((a) => a.spec.commercial !== undefined);
  const withComputed = analyses !== undefined;
  const rows: TableRow[] = arms.map((arm) => {
    const s = arm.spec;
    const c = s.commercial;
    const computed = withComputed ? computedCells(analyses.get(arm.id)) : null;
    const statedCell: TableCell =
      s.reachMm === undefined
        ? { text: NOT_STATED }
        : (computed?.stated ?? { text: formatNumber(s.reachMm), sortValue: s.reachMm });
    const analysis = analyses?.get(arm.id);
    const line = analysis ? bestGuaranteedLineSpeedDownMPerS(analysis) : null;
    const data: Record<string, string> = {
      class: s.class,
      mountings: s.mountings.join(" "),
      "payload-kg": String(s.ratedPayloadKg),
      protection: s.protection,
      "repeatability-mm": String(s.repeatabilityMm),
    };
    if (s.footprintMm) {
      data["footprint-width-mm"] = String(s.footprintMm[0]);
      data["footprint-depth-mm"] = String(s.footprintMm[1]);
    }
    const rp = declaredPoseRepeatability(s);
    if (analysis) {
      data["computed-reach-mm"] = String(reachCheck(analysis).computedMm);
      if (analysis.reach.minHeightMm !== null) data["min-height-mm"] = String(analysis.reach.minHeightMm);
      if (analysis.reach.maxHeightMm !== null) data["max-height-mm"] = String(analysis.reach.maxHeightMm);
      if (line !== null) data["line-speed-m-per-s"] = String(line);
    }
    return {
      key: arm.id,
      label: `${s.maker} ${s.model}`,
      data,
      cells: [
        { text: s.maker, sortValue: s.maker },
        { text: s.model, sortValue: s.model, href: siteHref(options.baseUrl, armPath(arm.id)) },
        { text: CLASS_LABEL[s.class], sortValue: s.class },
        { text: formatNumber(arm.chain.drivenCount), sortValue: arm.chain.drivenCount },
        { text: formatNumber(s.ratedPayloadKg, 1), sortValue: s.ratedPayloadKg },
        ...(computed ? [computed.reach] : []),
        statedCell,
        {
          text: formatNumber(s.repeatabilityMm, 3),
          sortValue: s.repeatabilityMm,
          ...(rp && rp.valueMm === s.repeatabilityMm ? { note: conditionsText(rp) } : {}),
        },
        { text: formatNumber(s.massKg, 1), sortValue: s.massKg },
        ...(computed ? computed.rest : []),
        { text: formatList(s.mountings.map((m) => MOUNTING_LABEL[m])), sortValue: s.mountings.join(" ") },
        { text: s.protection, sortValue: s.protection },
        s.footprintMm
          ? {
              text: `${formatNumber(s.footprintMm[0])} \u00d7 ${formatNumber(s.footprintMm[1])}`,
              note: "width \u00d7 depth",
              sortValue: s.footprintMm[0] * s.footprintMm[1],
            }
          : { text: NOT_DECLARED },
        ...(withPrice
          ? [
              c
                ? { text: formatPrice(c.listPrice, c.currency), sortValue: c.listPrice, sortGroup: c.currency }
                : { text: NOT_STATED },
            ]
          : []),
      ],
    };
  });
  const makers = new Set(arms.map((a) => a.spec.maker)).size;
  const columns: TableColumn[] = withComputed
    ? [...COLUMNS.slice(0, 5), COMPUTED_REACH_COLUMN, ...COLUMNS.slice(5, 8), ...COMPUTED_COLUMNS, ...COLUMNS.slice(8)]
    : [...COLUMNS];
  if (withPrice) columns.push(PRICE_COLUMN);
  return {
    title: "Catalog",
    countText: `${plural(arms.length, "arm")} from ${plural(makers, "maker")}`,
    filterChoices: {
      classes: (Object.keys(CLASS_LABEL) as ArmSpec["class"][])
        .filter((k) => arms.some((a) => a.spec.class === k))
        .map((k) => ({ value: k, label: CLASS_LABEL[k] })),
      mountings: (Object.keys(MOUNTING_LABEL) as ArmSpec["mountings"][number][])
        .filter((k) => arms.some((a) => a.spec.mountings.includes(k)))
        .map((k) => ({ value: k, label: MOUNTING_LABEL[k] })),
      protections: [...new Set(arms.map((a) => a.spec.protection))].sort().map((c) => ({ value: c, label: c })),
    },
    table: {
      id: "catalog",
      caption: withComputed
        ? "Every arm in the catalog: figures as declared in its source document, and computed reach, tool speed, line speed, line-speed share, tool-direction share and cycle estimate"
        : "Every arm in the catalog, with figures as declared in its source document",
      rowHeaders: false,
      columns,
      rows,
      ...(withComputed && {
        footnote:
          "Computed reach: of the wrist centre point (WCP), or of the flange centre where the arm has none. Under the stated reach: how far it lies from the computed one, " +
          "marked \u201ccheck\u201d beyond 2\u00a0%. Best guaranteed line speed: the highest guaranteed straight-line speed anywhere in the side view with the tool pointing down. " +
          "Share \u2265 1 m/s: share of the side view reached with the tool pointing down where the guaranteed straight-line speed is at least 1 m/s. " +
          "Cells from \u2265 half of tool directions: share of the flange envelope's side-view cells the flange centre reaches from at least half of all tool directions (roll free); \u201cno map\u201d where the tool axis cannot turn. " +
          "Speeds and the cycle are for the flange centre with no tool, from joint limits only. Computed figures are for early comparison, not maker figures." +
          (withPrice ? " List prices are not converted between currencies: they sort by currency first." : ""),
      }),
    },
  };
}
