/**
 * Placement map of one arm for a cell, top view to scale: the base positions of the grid from which the tool point
 * reaches every target (each a square of one grid step centred on its position, shaded), the area the grid covered
 * (dashed), the targets (named ×), today's placement (●) and the fastest position found (◆). A node tree (nodes.ts).
 * Pure: the placement map's grid (rows follow yMm, columns xMm) in, nodes out.
 */
import {
  crossNode,
  groupPoints,
  labelNode,
  placeLabels,
  type NamedPoint,
  type NodeChart,
  type Point2,
} from "./cellMarks";
import { DEFAULT_MARGINS, equalScale } from "./layout";
import {
  axisBottomNode,
  axisLeftNode,
  chartRootNode,
  legendNode,
  legendNodeRows,
  node,
  textNode,
  type NodeLegendItem,
  type SvgNode,
} from "./nodes";
import { fmt, label } from "./svg";

export interface PlacementMapChartInput {
  readonly id: string;
  readonly title: string;
  readonly gridMm: number;
  readonly xMm: readonly number[];
  readonly yMm: readonly number[];
  /** 1 where the position is feasible; rows follow yMm, columns xMm. */
  readonly feasible: readonly (readonly (0 | 1)[])[];
  readonly targets: readonly NamedPoint[];
  readonly current: Point2;
  readonly best: Point2 | null;
  readonly caption: string;
  readonly widthPx?: number;
  readonly maxHeightPx?: number;
}

export const PLACEMENT_MAP_WIDTH_PX = 600;

/**
 * Path data of the feasible cells, one rectangle per run of feasible columns in a row (px), and the run count.
 * Cell (i, j) covers x ∈ [xMm[i] − g/2, xMm[i] + g/2], y ∈ [yMm[j] − g/2, yMm[j] + g/2].
 */
export function feasibleRunsPath(
  input: Pick<PlacementMapChartInput, "gridMm" | "xMm" | "yMm" | "feasible">,
  x: (v: number) => number,
  y: (v: number) => number,
): { d: string; runs: number; cells: number } {
  const g = input.gridMm / 2;
  let d = "",
    runs = 0,
    cells = 0;
  input.feasible.forEach((row, j) => {
    const yc = input.yMm[j]!;
    let i = 0;
    while (i < row.length) {
      if (row[i] !== 1) {
        i++;
        continue;
      }
      const i0 = i;
      while (i < row.length && row[i] === 1) i++;
      cells += i - i0;
      runs++;
      const xa = x(input.xMm[i0]! - g),
        xb = x(input.xMm[i - 1]! + g);
      const ya = y(yc + g),
        yb = y(yc - g);
      d += `M${fmt(xa)} ${fmt(ya)}H${fmt(xb)}V${fmt(yb)}H${fmt(xa)}Z`;
    }
  });
  return { d, runs, cells };
}

/**
 * The map.
 * @example placementMapChart({ id: "pm", title: "…", gridMm: 50, xMm: [0, 50], yMm: [0], feasible: [[1, 1]],
 *   targets: [{ name: "pick", p: [600, 0] }], current: [0, 0], best: [50, 0], caption: "…" })
 *   // one shaded rectangle from x = −25 to 75 mm, y = −25 to 25 mm
 */
export function placementMapChart(input: PlacementMapChartInput): NodeChart {
  const widthPx = input.widthPx ?? PLACEMENT_MAP_WIDTH_PX;
  const g = input.gridMm / 2;
  const hasGrid = input.xMm.length > 0 && input.yMm.length > 0;
  const legend: NodeLegendItem[] = [
    { kind: "fill", className: "pm-feasible", label: "base reaches every target" },
    { kind: "line", className: "pm-searched", label: "area searched" },
    { kind: "fill", className: "pm-current", label: "today's placement (\u25cf)" },
  ];
  if (input.best) legend.push({ kind: "fill", className: "pm-best", label: "fastest position found (\u25c6)" });
  const rows = legendNodeRows(legend, widthPx - 16);
  const margins = { ...DEFAULT_MARGINS, top: 30 + rows * 17 + 10 };
  const pts: Point2[] = [...input.targets.map((t) => t.p), input.current, ...(input.best ? [input.best] : [])];
  if (hasGrid) {
    pts.push([input.xMm[0]! - g, input.yMm[0]! - g]);
    pts.push([input.xMm[input.xMm.length - 1]! + g, input.yMm[input.yMm.length - 1]! + g]);
  }
  const xs = pts.map((p) => p[0]),
    ys = pts.map((p) => p[1]);
  const layout = equalScale([Math.min(...xs), Math.max(...xs)], [Math.min(...ys), Math.max(...ys)], {
    widthPx,
    maxHeightPx: input.maxHeightPx ?? 620,
    minHeightPx: 300,
    margins,
    padShare: 0.05,
  });
  const { x, y, area } = layout;
  const parts: SvgNode[] = [
    axisBottomNode(x, area, "base x, cell frame", "mm"),
    axisLeftNode(y, area, "base y, cell frame", "mm"),
  ];
  const runs = feasibleRunsPath(input, x, y);
  if (runs.d) parts.push(node("path", { class: "pm-feasible", d: runs.d, "data-cells": runs.cells }));
  if (hasGrid) {
    const x0 = x(input.xMm[0]! - g),
      x1 = x(input.xMm[input.xMm.length - 1]! + g);
    const y1 = y(input.yMm[0]! - g),
      y0 = y(input.yMm[input.yMm.length - 1]! + g);
    parts.push(
      node("rect", { class: "pm-searched", x: fmt(x0), y: fmt(y0), width: fmt(x1 - x0), height: fmt(y1 - y0) }),
    );
  }
  if (runs.cells === 0)
    parts.push(
      textNode("no base position on this plane reaches every target", {
        class: "mark-label",
        x: fmt(area.left + 8),
        y: fmt(area.top + area.height - 8),
      }),
    );
  const targets = groupPoints(input.targets);
  for (const t of targets) parts.push(crossNode(x(t.p[0]), y(t.p[1])));
  const [cx, cy] = [x(input.current[0]), y(input.current[1])];
  parts.push(node("circle", { class: "pm-current", cx: fmt(cx), cy: fmt(cy), r: 5 }));
  const marks = [
    ...targets.map((t) => ({ text: t.names.join(", "), x: x(t.p[0]), y: y(t.p[1]) })),
    { text: "today", x: cx, y: cy },
  ];
  if (input.best) {
    const [bx, by] = [x(input.best[0]), y(input.best[1])];
    parts.push(node("path", { class: "pm-best", d: `M${fmt(bx)} ${fmt(by - 7)}l7 7l-7 7l-7 -7Z` }));
    marks.push({ text: "fastest", x: bx, y: by });
  }
  const placed = placeLabels(marks, {
    x0: area.left,
    y0: area.top,
    x1: area.left + area.width,
    y1: area.top + area.height,
  });
  placed.forEach((l) => parts.push(labelNode(l)));
  parts.push(legendNode(legend, 8, 40, widthPx - 16));
  const areaM2 = (runs.cells * input.gridMm * input.gridMm) / 1e6;
  const description =
    `${input.title}, top view to scale in millimetres: ${runs.cells} feasible base positions on a ${label(input.gridMm)} mm grid ` +
    `(${label(areaM2, 2)} m²); today's placement at (${label(input.current[0])}, ${label(input.current[1])})` +
    (input.best
      ? `; fastest position found at (${label(input.best[0])}, ${label(input.best[1])}).`
      : "; no fastest position.");
  const root = chartRootNode(
    { id: input.id, title: input.title, description, widthPx, heightPx: layout.heightPx, className: "chart-placement" },
    parts,
  );
  return { id: input.id, title: input.title, description, caption: input.caption, node: root };
}
