/**
 * Workspace envelope charts, side view and top view: the wrist centre point's region (filled, solid outline) over the
 * flange centre's (dashed outline), axis 1 and the maker's stated reach marked, both axes in mm at one scale.
 */
import { axisBottomSvg, axisLeftSvg } from "./axes";
import { polygonsExtent, polygonsPath, type PointData, type PolygonData } from "./geometry";
import { DEFAULT_MARGINS, equalScale } from "./layout";
import { legendRows, legendSvg, type LegendItem } from "./legend";
import { axis1LineSvg, el, fmt, label, svgRoot, textEl, type ChartResult } from "./svg";

export type EnvelopeLayoutKind = "revolute-base" | "prismatic-base" | "base-frame";

export interface EnvelopeChartInput {
  /** Element id, unique on the page. */
  readonly id: string;
  /** "Corvell Tern 7". */
  readonly armName: string;
  readonly view: "side" | "top";
  readonly layout: EnvelopeLayoutKind;
  /** Regions of the wrist centre point, mm; null when the arm has none. */
  readonly wcp: readonly PolygonData[] | null;
  /** Regions of the flange centre, mm. */
  readonly flange: readonly PolygonData[];
  /** The maker's stated reach, mm (drawn for the revolute-base layout only); null when not stated. */
  readonly statedReachMm: number | null;
  /** Top view: where axis 1 pierces the plan, mm; null to leave it out. Side view: axis 1 is r = 0. */
  readonly axis1TopMm?: PointData | null;
  readonly widthPx?: number;
  readonly maxHeightPx?: number;
}

export const ENVELOPE_CHART_WIDTH_PX = 600;

function axisNames(layout: EnvelopeLayoutKind, view: "side" | "top"): { x: string; y: string } {
  if (view === "top") return { x: "base x", y: "base y" };
  return layout === "revolute-base"
    ? { x: "distance from axis 1, r", y: "height along axis 1, z" }
    : { x: "base x", y: "height, base z" };
}

/**
 * The envelope chart.
 * @example envelopeChart({ id: "env-side", armName: "Demo", view: "side", layout: "revolute-base", wcp: null,
 *   flange: [{ outer: [[0, 0], [500, 0], [500, 400], [0, 400], [0, 0]], holes: [] }], statedReachMm: 500 })
 *   // an SVG 600 px wide with the flange region, axis 1 at r = 0 and a dotted line at r = 500 mm
 */
export function envelopeChart(input: EnvelopeChartInput): ChartResult {
  const widthPx = input.widthPx ?? ENVELOPE_CHART_WIDTH_PX;
  const side = input.view === "side";
  const revolute = input.layout === "revolute-base";
  const drawStated = revolute && input.statedReachMm !== null && input.statedReachMm > 0;
  const stated = drawStated ? input.statedReachMm! : 0;
  const axisTop = side ? null : (input.axis1TopMm ?? null);

  const legend: LegendItem[] = [];
  if (input.wcp && input.wcp.length > 0)
    legend.push({ kind: "fill", className: "env-wcp", label: "wrist centre point (WCP)" });
  legend.push({ kind: "line", className: "env-flange", label: "flange centre" });
  if (revolute && (side || axisTop))
    legend.push({ kind: "line", className: "axis1", label: side ? "axis 1" : "axis 1 (centre mark)" });
  if (drawStated) legend.push({ kind: "line", className: "stated-reach", label: `stated reach ${label(stated)} mm` });
  const rows = legendRows(legend, widthPx - 16);
  const margins = { ...DEFAULT_MARGINS, top: 30 + rows * 17 + 10 };

  // Extent: every region, axis 1 and the stated reach.
  const all = [...(input.wcp ?? []), ...input.flange];
  const box = polygonsExtent(all) ?? [
    [0, 1],
    [0, 1],
  ];
  let [x0, x1] = box[0];
  let [y0, y1] = box[1];
  if (side && revolute) {
    x0 = Math.min(x0, 0);
    x1 = Math.max(x1, 0);
  }
  if (drawStated) {
    if (side) x1 = Math.max(x1, stated);
    else {
      const [ax, ay] = axisTop ?? [0, 0];
      x0 = Math.min(x0, ax - stated);
      x1 = Math.max(x1, ax + stated);
      y0 = Math.min(y0, ay - stated);
      y1 = Math.max(y1, ay + stated);
    }
  }
  const layout = equalScale([x0, x1], [y0, y1], {
    widthPx,
    maxHeightPx: input.maxHeightPx ?? 640,
    minHeightPx: 280,
    margins,
    padShare: 0.04,
  });
  const { x, y, area } = layout;
  const names = axisNames(input.layout, input.view);

  const parts: string[] = [];
  parts.push(axisBottomSvg(x, area, { label: names.x, unit: "mm", ticks: 7, grid: true }));
  parts.push(axisLeftSvg(y, area, { label: names.y, unit: "mm", ticks: 7, grid: true }));
  const flangeD = polygonsPath(input.flange, x, y);
  if (flangeD) parts.push(el("path", { class: "env-flange", d: flangeD, "fill-rule": "evenodd" }));
  if (input.wcp && input.wcp.length > 0) {
    const wcpD = polygonsPath(input.wcp, x, y);
    if (wcpD) parts.push(el("path", { class: "env-wcp", d: wcpD, "fill-rule": "evenodd" }));
  }
  if (side && revolute) {
    const ax = x(0);
    parts.push(axis1LineSvg(ax, area));
    parts.push(textEl("axis 1", { class: "mark-label", x: fmt(ax + 4), y: fmt(area.top + 12) }));
    if (x0 < -0.05 * (x1 - x0)) {
      parts.push(
        textEl("\u2190 behind axis 1", {
          class: "mark-label muted",
          x: fmt(ax - 4),
          y: fmt(area.top + area.height - 6),
          "text-anchor": "end",
        }),
      );
    }
    parts.push(
      textEl("in front \u2192", { class: "mark-label muted", x: fmt(ax + 4), y: fmt(area.top + area.height - 6) }),
    );
  }
  if (!side && axisTop && revolute) {
    const cx = x(axisTop[0]);
    const cy = y(axisTop[1]);
    parts.push(el("path", { class: "axis1", d: `M${fmt(cx - 9)} ${fmt(cy)}h18M${fmt(cx)} ${fmt(cy - 9)}v18` }));
    parts.push(el("circle", { class: "axis1-dot", cx: fmt(cx), cy: fmt(cy), r: 2.5 }));
  }
  if (drawStated) {
    if (side) {
      const sx = x(stated);
      parts.push(
        el("line", {
          class: "stated-reach",
          x1: fmt(sx),
          x2: fmt(sx),
          y1: fmt(area.top),
          y2: fmt(area.top + area.height),
        }),
      );
      parts.push(
        textEl(`stated ${label(stated)} mm`, {
          class: "mark-label",
          x: fmt(sx - 4),
          y: fmt(area.top + 12),
          "text-anchor": "end",
        }),
      );
    } else {
      const [ax, ay] = axisTop ?? [0, 0];
      const r = stated * layout.pxPerUnit;
      parts.push(el("circle", { class: "stated-reach", cx: fmt(x(ax)), cy: fmt(y(ay)), r: fmt(r) }));
    }
  }
  parts.push(legendSvg(legend, 8, 40, widthPx - 16).svg);

  const point = input.wcp && input.wcp.length > 0 ? "wrist centre point and flange centre" : "flange centre";
  const viewWords = side
    ? revolute
      ? "side view: distance from axis 1 against height; negative distances reach over the back"
      : "side view: base x against height"
    : revolute
      ? "top view: the plan swept by joint 1 over its range"
      : "top view: base x against base y";
  const title = `${input.armName}: reach envelope, ${side ? "side view" : "top view"}`;
  const reachWords = drawStated ? ` The maker's stated reach, ${label(stated)} mm, is marked.` : "";
  const description = `Regions the ${point} can reach, ${viewWords}, drawn to scale in millimetres.${reachWords}`;
  const caption = side
    ? revolute
      ? "Every position the point reaches with joint 1 held, shown as distance from axis 1 (negative: behind it) against height; joint limits honoured, no tool fitted, collisions with the arm's own links and the floor not checked."
      : "Positions the point reaches projected on the base x–z plane; joint limits honoured, no tool fitted, collisions not checked."
    : revolute
      ? "The side-view region swept by joint 1 over its range, looking down axis 1; joint limits honoured, collisions not checked."
      : "Positions the point reaches projected on the base x–y plane; joint limits honoured, collisions not checked.";
  return {
    id: input.id,
    title,
    description,
    caption,
    svg: svgRoot(
      { id: input.id, title, description, widthPx, heightPx: layout.heightPx, className: "chart-envelope" },
      parts.join(""),
    ),
    widthPx,
    heightPx: layout.heightPx,
  };
}
