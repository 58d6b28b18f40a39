/**
 * Chart pieces as plain node trees (`SvgNode`, see lineRatesChart.ts) for charts drawn in the browser: the browser
 * turns a tree into SVG elements with d3-selection (never innerHTML); the build can write it as a string
 * (`svgNodeToString`). Same classes, ticks and legend layout as the string charts, so both kinds look alike.
 */
import type { ScaleLinear } from "d3-scale";
import type { PlotArea } from "./axes";
import { axisTitle, ticksOf } from "./axes";
import { textWidthPx } from "./legend";
import { checkId, fmt, type AttrValue } from "./svg";
import type { SvgNode } from "./lineRatesChart";

export type { SvgNode } from "./lineRatesChart";
export { svgNodeToString } from "./lineRatesChart";

export const node = (
  tag: string,
  attrs: Readonly<Record<string, AttrValue>>,
  children?: readonly SvgNode[],
): SvgNode => (children ? { tag, attrs, children } : { tag, attrs });
export const textNode = (text: string, attrs: Readonly<Record<string, AttrValue>>): SvgNode => ({
  tag: "text",
  attrs,
  text,
});

/** Horizontal axis along the bottom of `area`, with grid lines (as axisBottomSvg). */
export function axisBottomNode(
  x: ScaleLinear<number, number>,
  area: PlotArea,
  quantity: string,
  unit: string,
  ticks = 7,
): SvgNode {
  const y0 = area.top + area.height;
  const parts: SvgNode[] = [];
  for (const t of ticksOf(x, ticks)) {
    const px = x(t.value);
    if (px < area.left - 0.5 || px > area.left + area.width + 0.5) continue;
    parts.push(node("line", { class: "grid-line", x1: fmt(px), x2: fmt(px), y1: fmt(area.top), y2: fmt(y0) }));
    parts.push(node("line", { class: "tick", x1: fmt(px), x2: fmt(px), y1: fmt(y0), y2: fmt(y0 + 5) }));
    parts.push(textNode(t.text, { class: "tick-label", x: fmt(px), y: fmt(y0 + 17), "text-anchor": "middle" }));
  }
  parts.push(
    node("line", { class: "domain", x1: fmt(area.left), x2: fmt(area.left + area.width), y1: fmt(y0), y2: fmt(y0) }),
  );
  parts.push(
    textNode(axisTitle(quantity, unit), {
      class: "axis-label",
      x: fmt(area.left + area.width / 2),
      y: fmt(y0 + 34),
      "text-anchor": "middle",
    }),
  );
  return node("g", { class: "axis axis-x" }, parts);
}

/** Vertical axis along the left of `area`, with grid lines (as axisLeftSvg). */
export function axisLeftNode(
  y: ScaleLinear<number, number>,
  area: PlotArea,
  quantity: string,
  unit: string,
  ticks = 7,
): SvgNode {
  const parts: SvgNode[] = [];
  for (const t of ticksOf(y, ticks)) {
    const py = y(t.value);
    if (py < area.top - 0.5 || py > area.top + area.height + 0.5) continue;
    parts.push(
      node("line", {
        class: "grid-line",
        x1: fmt(area.left),
        x2: fmt(area.left + area.width),
        y1: fmt(py),
        y2: fmt(py),
      }),
    );
    parts.push(node("line", { class: "tick", x1: fmt(area.left - 5), x2: fmt(area.left), y1: fmt(py), y2: fmt(py) }));
    parts.push(textNode(t.text, { class: "tick-label", x: fmt(area.left - 8), y: fmt(py + 4), "text-anchor": "end" }));
  }
  parts.push(
    node("line", {
      class: "domain",
      x1: fmt(area.left),
      x2: fmt(area.left),
      y1: fmt(area.top),
      y2: fmt(area.top + area.height),
    }),
  );
  const cx = area.left - 50,
    cy = area.top + area.height / 2;
  parts.push(
    textNode(axisTitle(quantity, unit), {
      class: "axis-label",
      x: fmt(cx),
      y: fmt(cy),
      "text-anchor": "middle",
      transform: `rotate(-90 ${fmt(cx)} ${fmt(cy)})`,
    }),
  );
  return node("g", { class: "axis axis-y" }, parts);
}

export interface NodeLegendItem {
  readonly kind: "line" | "fill";
  readonly className: string;
  readonly label: string;
  /** data-* attribute for tests and scripts (e.g. the arm id). */
  readonly key?: string;
}

const itemWidth = (item: NodeLegendItem) => 30 + textWidthPx(item.label) + 16;

/** Legend rows `items` take in maxWidthPx (same wrapping as legendNode). */
export function legendNodeRows(items: readonly NodeLegendItem[], maxWidthPx: number): number {
  let cx = 0,
    rows = items.length > 0 ? 1 : 0;
  for (const item of items) {
    const w = itemWidth(item);
    if (cx > 0 && cx + w > maxWidthPx) {
      rows++;
      cx = 0;
    }
    cx += w;
  }
  return rows;
}

/** A legend of line samples and swatches from (x, y), wrapping within maxWidthPx (17 px rows). */
export function legendNode(items: readonly NodeLegendItem[], x: number, y: number, maxWidthPx: number): SvgNode {
  const parts: SvgNode[] = [];
  let cx = x,
    row = 0;
  for (const item of items) {
    const w = itemWidth(item);
    if (cx > x && cx + w > x + maxWidthPx) {
      row++;
      cx = x;
    }
    const by = y + row * 17;
    const sample =
      item.kind === "fill"
        ? node("rect", { class: `legend-swatch ${item.className}`, x: fmt(cx), y: fmt(by - 9), width: 22, height: 11 })
        : node("line", {
            class: `legend-line ${item.className}`,
            x1: fmt(cx),
            x2: fmt(cx + 24),
            y1: fmt(by - 4),
            y2: fmt(by - 4),
          });
    parts.push(
      node("g", { class: "legend-item", "data-key": item.key }, [
        sample,
        textNode(item.label, { class: "legend-label", x: fmt(cx + 30), y: fmt(by) }),
      ]),
    );
    cx += w;
  }
  return node("g", { class: "legend" }, parts);
}

/** The root <svg> node with its accessible name and description and the visible title (as svgRoot). */
export function chartRootNode(
  frame: { id: string; title: string; description: string; widthPx: number; heightPx: number; className: string },
  body: readonly SvgNode[],
): SvgNode {
  const id = checkId(frame.id);
  return node(
    "svg",
    {
      xmlns: "http://www.w3.org/2000/svg",
      id,
      class: `chart ${frame.className}`,
      viewBox: `0 0 ${fmt(frame.widthPx, 1)} ${fmt(frame.heightPx, 1)}`,
      width: Math.round(frame.widthPx),
      height: Math.round(frame.heightPx),
      role: "img",
      "aria-label": frame.title,
      "aria-describedby": `${id}-desc`,
    },
    [
      { tag: "title", attrs: { id: `${id}-title` }, text: frame.title },
      { tag: "desc", attrs: { id: `${id}-desc` }, text: frame.description },
      textNode(frame.title, { class: "chart-title", x: 8, y: 18 }),
      ...body,
    ],
  );
}
