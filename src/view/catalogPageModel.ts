/** Props of the catalog page: one row per arm with its key declared figures. */
import type { Arm } from "../catalog";
import { formatList, formatNumber, formatPrice, NOT_STATED } from "./format";
import { CLASS_LABEL, MOUNTING_LABEL } from "./labels";
import { armPath, siteHref } from "./links";
import type { TableColumn, TableModel, TableRow } from "./table";

export interface CatalogPageModel {
  readonly title: string;
  /** "3 arms from 2 makers". */
  readonly countText: string;
  readonly table: TableModel;
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
];

const PRICE_COLUMN: TableColumn = { key: "price", label: "List price", numeric: true };

function plural(n: number, word: string): string {
  return `${formatNumber(n)} ${word}${n === 1 ? "" : "s"}`;
}

/** The catalog table. The price column appears only when at least one arm file carries commercial data. */
export function catalogPageModel(arms: readonly Arm[], options: ViewOptions): CatalogPageModel {
  const withPrice = arms.some((a) => a.spec.commercial !== undefined);
  const rows: TableRow[] = arms.map((arm) => {
    const s = arm.spec;
    const c = s.commercial;
    return {
      key: arm.id,
      cells: [
        { text: s.maker, sortValue: s.maker },
        { text: s.model, sortValue: s.model, href: siteHref(options.baseUrl, armPath(arm.id)) },
        { text: CLASS_LABEL[s.class], sortValue: s.class },
        { text: formatNumber(arm.chain.drivenCount), sortValue: arm.chain.drivenCount },
        { text: formatNumber(s.ratedPayloadKg, 1), sortValue: s.ratedPayloadKg },
        s.reachMm === undefined ? { text: NOT_STATED } : { text: formatNumber(s.reachMm), sortValue: s.reachMm },
        { text: formatNumber(s.repeatabilityMm, 3), sortValue: s.repeatabilityMm },
        { text: formatNumber(s.massKg, 1), sortValue: s.massKg },
        { text: formatList(s.mountings.map((m) => MOUNTING_LABEL[m])), sortValue: s.mountings.join(" ") },
        { text: s.protection, sortValue: s.protection },
        ...(withPrice ? [c ? { text: formatPrice(c.listPrice, c.currency), sortValue: c.listPrice } : { text: NOT_STATED }] : []),
      ],
    };
  });
  const makers = new Set(arms.map((a) => a.spec.maker)).size;
  return {
    title: "Catalog",
    countText: `${plural(arms.length, "arm")} from ${plural(makers, "maker")}`,
    table: {
      id: "catalog",
      caption: "Every arm in the catalog, with figures as declared in its source document",
      rowHeaders: false,
      columns: withPrice ? [...COLUMNS, PRICE_COLUMN] : COLUMNS,
      rows,
    },
  };
}
