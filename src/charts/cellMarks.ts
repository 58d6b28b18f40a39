/**
 * Pieces shared by the cell charts (cell drawings, placement maps): named target marks whose labels are placed so
 * that they do not cover one another, base marks, and the ChartResult of a node tree. Pure: data in, nodes out.
 */
import { textWidthPx } from "./legend";
import { node, svgNodeToString, textNode, type SvgNode } from "./nodes";
import { fmt, type ChartResult } from "./svg";

/** A point on the drawing, data units (mm) of the two drawn axes. */
export type Point2 = readonly [number, number];

export interface NamedPoint {
  readonly name: string;
  readonly p: Point2;
}

/** Points closer than this on the drawing share one mark and one label ("a, b"), mm. */
export const SAME_POINT_MM = 1;

/**
 * Named points grouped where they coincide on the drawing (a target straight above another in a top view): one
 * entry per place, names in their first order.
 * @example groupPoints([{ name: "a", p: [0, 0] }, { name: "b", p: [0, 0.5] }, { name: "c", p: [9, 0] }])
 *   // [{ names: ["a", "b"], p: [0, 0] }, { names: ["c"], p: [9, 0] }]
 */
export function groupPoints(points: readonly NamedPoint[]): { names: string[]; p: Point2 }[] {
  const out: { names: string[]; p: Point2 }[] = [];
  for (const pt of points) {
    const hit = out.find((g) => Math.hypot(g.p[0] - pt.p[0], g.p[1] - pt.p[1]) < SAME_POINT_MM);
    if (hit) {
      if (!hit.names.includes(pt.name)) hit.names.push(pt.name);
    } else out.push({ names: [pt.name], p: pt.p });
  }
  return out;
}

interface Box {
  readonly x0: number;
  readonly y0: number;
  readonly x1: number;
  readonly y1: number;
}

const overlaps = (a: Box, b: Box) => a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;

export interface PlacedLabel {
  readonly text: string;
  /** Text anchor position, px. */
  readonly x: number;
  readonly y: number;
  readonly anchor: "start" | "end" | "middle";
}

const LABEL_FONT_PX = 11;

/**
 * Places labels beside marks (px), each at the first free spot of: right, left, above, below, then further below in
 * 13 px steps; a spot is free when its box covers no earlier label and no mark, and lies inside `bounds`.
 * @example placeLabels([{ text: "a", x: 100, y: 100 }, { text: "b", x: 100, y: 100 }], { x0: 0, y0: 0, x1: 300, y1: 300 })
 *   // "a" right of the mark, "b" left of it
 */
export function placeLabels(
  marks: readonly { readonly text: string; readonly x: number; readonly y: number }[],
  bounds: Box,
): PlacedLabel[] {
  const taken: Box[] = marks.map((m) => ({ x0: m.x - 4, y0: m.y - 4, x1: m.x + 4, y1: m.y + 4 }));
  const out: PlacedLabel[] = [];
  for (const m of marks) {
    const w = textWidthPx(m.text, LABEL_FONT_PX) + 2;
    const h = LABEL_FONT_PX + 2;
    const spots: PlacedLabel[] = [
      { text: m.text, x: m.x + 7, y: m.y + 4, anchor: "start" },
      { text: m.text, x: m.x - 7, y: m.y + 4, anchor: "end" },
      { text: m.text, x: m.x, y: m.y - 8, anchor: "middle" },
      { text: m.text, x: m.x, y: m.y + 16, anchor: "middle" },
    ];
    for (let k = 1; k <= 8; k++) spots.push({ text: m.text, x: m.x + 7, y: m.y + 4 + 13 * k, anchor: "start" });
    const boxOf = (s: PlacedLabel): Box => {
      const x0 = s.anchor === "start" ? s.x : s.anchor === "end" ? s.x - w : s.x - w / 2;
      return { x0, y0: s.y - h + 3, x1: x0 + w, y1: s.y + 3 };
    };
    const inside = (b: Box) => b.x0 >= bounds.x0 && b.x1 <= bounds.x1 && b.y0 >= bounds.y0 && b.y1 <= bounds.y1;
    const chosen =
      spots.find((s) => {
        const b = boxOf(s);
        return inside(b) && !taken.some((t) => overlaps(t, b));
      }) ??
      spots.find((s) => inside(boxOf(s))) ??
      spots[0]!;
    taken.push(boxOf(chosen));
    out.push(chosen);
  }
  return out;
}

/** A label as a text node (class mark-label: a halo keeps it readable over lines). */
export function labelNode(l: PlacedLabel, extraClass = ""): SvgNode {
  return textNode(l.text, {
    class: extraClass ? `mark-label ${extraClass}` : "mark-label",
    x: fmt(l.x),
    y: fmt(l.y),
    "text-anchor": l.anchor,
  });
}

/** A target mark: an × of 10 px. */
export function crossNode(x: number, y: number, className = "cell-target"): SvgNode {
  return node("path", { class: className, d: `M${fmt(x - 5)} ${fmt(y - 5)}l10 10M${fmt(x - 5)} ${fmt(y + 5)}l10 -10` });
}

/** A chart as a node tree with the words that go with it (the browser appends `node`; the build writes a string). */
export interface NodeChart {
  readonly id: string;
  readonly title: string;
  /** Accessible description (also the <desc> of the SVG). */
  readonly description: string;
  /** Caption for the figure: what the chart assumes. */
  readonly caption: string;
  readonly node: SvgNode;
}

/** The ChartResult of a node chart, for ChartFigure at build time. */
export function nodeChartResult(chart: NodeChart): ChartResult {
  return {
    id: chart.id,
    title: chart.title,
    description: chart.description,
    caption: chart.caption,
    svg: svgNodeToString(chart.node),
    widthPx: Number(chart.node.attrs.width),
    heightPx: Number(chart.node.attrs.height),
  };
}
