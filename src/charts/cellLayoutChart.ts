/**
 * Drawing of a cell, top view or side view, to scale (one millimetre the same length on both axes): the targets
 * (named ×), the path of the loop (linear moves solid, joint moves dashed: drawn straight between their targets), each
 * arm's base at its placement (a square in the arm's line style) and an outline of its reach given by the caller.
 * A node tree (nodes.ts) for the page and the editor. Pure: the caller projects the cell onto the drawing's plane.
 */
import {
  groupPoints,
  crossNode,
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
  type NodeLegendItem,
  type SvgNode,
} from "./nodes";
import { seriesClass } from "./theme";
import { fmt, label } from "./svg";

export type ReachOutline =
  | { readonly kind: "circle"; readonly c: Point2; readonly rMm: number }
  /**
   * A horizontal span at one height, with end ticks (side views); spans that coincide are drawn a few px apart, and a
   * span longer than the drawing is cut at its edge without a tick there.
   */
  | { readonly kind: "span"; readonly x: readonly [number, number]; readonly y: number };

export interface CellLayoutBase {
  readonly key: string;
  /** Name of the arm in the legend. */
  readonly label: string;
  /** Short name beside the base's mark ("Tern 12"). */
  readonly shortLabel: string;
  readonly p: Point2;
  /** Line style index (series-i). */
  readonly series: number;
  readonly outline: ReachOutline | null;
}

export interface CellLayoutSegment {
  readonly a: Point2;
  readonly b: Point2;
  readonly motion: "joint" | "linear";
  readonly step: number;
}

export interface CellLayoutInput {
  readonly id: string;
  readonly title: string;
  /** Names of the drawn axes, e.g. "cell x" and "cell y" (unit mm). */
  readonly axes: { readonly x: string; readonly y: string };
  readonly targets: readonly NamedPoint[];
  readonly segments: readonly CellLayoutSegment[];
  readonly bases: readonly CellLayoutBase[];
  /** Draw the floor (vertical coordinate 0) as a rule: side views. */
  readonly floor?: boolean;
  readonly caption: string;
  readonly widthPx?: number;
  readonly maxHeightPx?: number;
}

export const CELL_LAYOUT_WIDTH_PX = 620;

function extentOf(input: CellLayoutInput): [[number, number], [number, number]] {
  const xs: number[] = [],
    ys: number[] = [];
  const add = (p: Point2) => {
    xs.push(p[0]);
    ys.push(p[1]);
  };
  input.targets.forEach((t) => add(t.p));
  for (const b of input.bases) {
    add(b.p);
    const o = b.outline;
    if (o?.kind === "circle") {
      add([o.c[0] - o.rMm, o.c[1] - o.rMm]);
      add([o.c[0] + o.rMm, o.c[1] + o.rMm]);
    } else if (o?.kind === "span") {
      // Spans do not widen the drawing (they would flatten a side view): they are cut at its edges.
      ys.push(o.y);
    }
  }
  if (input.floor) ys.push(0);
  if (xs.length === 0)
    return [
      [0, 1000],
      [0, 1000],
    ];
  return [
    [Math.min(...xs), Math.max(...xs)],
    [Math.min(...ys), Math.max(...ys)],
  ];
}

/**
 * The drawing.
 * @example cellLayoutChart({ id: "top", title: "Top view", axes: { x: "cell x", y: "cell y" }, caption: "…",
 *   targets: [{ name: "pick", p: [1000, 0] }], segments: [],
 *   bases: [{ key: "a", label: "A", p: [0, 0], series: 0, outline: { kind: "circle", c: [0, 0], rMm: 1200 } }] })
 *   // the circle's radius in px equals 1200 × the x scale's px per mm, and the same on the y axis
 */
export function cellLayoutChart(input: CellLayoutInput): NodeChart {
  const widthPx = input.widthPx ?? CELL_LAYOUT_WIDTH_PX;
  const legend: NodeLegendItem[] = [
    { kind: "line", className: "cell-path cell-linear", label: "linear move" },
    { kind: "line", className: "cell-path cell-joint", label: "joint move (drawn straight)" },
  ];
  input.bases.forEach((b) =>
    legend.push({ kind: "line", className: `${seriesClass(b.series)} cell-reach`, label: b.label, key: b.key }),
  );
  const rows = legendNodeRows(legend, widthPx - 16);
  const margins = { ...DEFAULT_MARGINS, top: 30 + rows * 17 + 10 };
  const [xe, ye] = extentOf(input);
  const layout = equalScale(xe, ye, {
    widthPx,
    maxHeightPx: input.maxHeightPx ?? 640,
    minHeightPx: 300,
    margins,
    padShare: 0.06,
  });
  const { x, y, area } = layout;
  const px = (p: Point2): [number, number] => [x(p[0]), y(p[1])];
  const parts: SvgNode[] = [axisBottomNode(x, area, input.axes.x, "mm"), axisLeftNode(y, area, input.axes.y, "mm")];
  if (input.floor && y(0) >= area.top && y(0) <= area.top + area.height)
    parts.push(
      node("line", {
        class: "cell-floor",
        x1: fmt(area.left),
        x2: fmt(area.left + area.width),
        y1: fmt(y(0)),
        y2: fmt(y(0)),
      }),
    );
  const spansAt: number[] = [];
  for (const b of input.bases) {
    const o = b.outline;
    const cls = `${seriesClass(b.series)} cell-reach`;
    if (o?.kind === "circle") {
      const [cx, cy] = px(o.c);
      parts.push(
        node("circle", { class: cls, cx: fmt(cx), cy: fmt(cy), r: fmt(o.rMm * layout.pxPerUnit), "data-arm": b.key }),
      );
    } else if (o?.kind === "span") {
      const py = y(o.y) + 5 * spansAt.filter((v) => Math.abs(v - y(o.y)) < 3).length;
      spansAt.push(y(o.y));
      const [left, right] = [area.left, area.left + area.width];
      const [xa, xb] = [Math.max(left, x(o.x[0])), Math.min(right, x(o.x[1]))];
      // An end tick only where the span ends inside the drawing; a cut end runs to the edge.
      const ticks = [xa > left ? xa : null, xb < right ? xb : null].filter((v): v is number => v !== null);
      const d = `M${fmt(xa)} ${fmt(py)}H${fmt(xb)}${ticks.map((t) => `M${fmt(t)} ${fmt(py - 4)}v8`).join("")}`;
      parts.push(node("path", { class: cls, d, "data-arm": b.key }));
    }
  }
  for (const s of input.segments) {
    const [ax, ay] = px(s.a);
    const [bx, by] = px(s.b);
    parts.push(
      node("line", {
        class: `cell-path cell-${s.motion}`,
        x1: fmt(ax),
        y1: fmt(ay),
        x2: fmt(bx),
        y2: fmt(by),
        "data-step": s.step,
      }),
    );
  }
  const targets = groupPoints(input.targets);
  const bases = groupPoints(input.bases.map((b) => ({ name: b.shortLabel, p: b.p })));
  for (const t of targets) parts.push(crossNode(...px(t.p)));
  for (const b of input.bases) {
    const [bx, by] = px(b.p);
    parts.push(
      node("rect", {
        class: `${seriesClass(b.series)} cell-base`,
        x: fmt(bx - 5),
        y: fmt(by - 5),
        width: 10,
        height: 10,
        "data-arm": b.key,
      }),
    );
  }
  const marks = [
    ...targets.map((t) => ({ text: t.names.join(", "), x: px(t.p)[0], y: px(t.p)[1] })),
    ...bases.map((b) => ({ text: b.names.join(", "), x: px(b.p)[0], y: px(b.p)[1] })),
  ];
  const placed = placeLabels(marks, {
    x0: area.left,
    y0: area.top,
    x1: area.left + area.width,
    y1: area.top + area.height,
  });
  placed.forEach((l, i) => parts.push(labelNode(l, i < targets.length ? "cell-target-label" : "cell-base-label")));
  parts.push(legendNode(legend, 8, 40, widthPx - 16));

  const description =
    `${input.title}, to scale in millimetres (${input.axes.x} against ${input.axes.y}). Targets: ` +
    `${input.targets.map((t) => `${t.name} (${label(t.p[0])}, ${label(t.p[1])})`).join("; ")}. Bases: ` +
    `${input.bases.map((b) => `${b.label} at (${label(b.p[0])}, ${label(b.p[1])})`).join("; ")}.`;
  const root = chartRootNode(
    {
      id: input.id,
      title: input.title,
      description,
      widthPx,
      heightPx: layout.heightPx,
      className: "chart-cell-layout",
    },
    parts,
  );
  return { id: input.id, title: input.title, description, caption: input.caption, node: root };
}
