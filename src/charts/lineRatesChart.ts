/**
 * Joint rates along a straight line: for each driven joint, the rate the line needs at the commanded speed divided
 * by the joint's speed limit, against the distance along the line; the limit (1.0) as a rule, the bottleneck
 * marked, out-of-reach stretches shaded. One line style per joint (colour and dash pattern, lineCheck.css).
 *
 * The chart is built as a small tree of plain nodes (`SvgNode`) so the same drawing serves both sides: the build
 * writes it as an SVG string (`lineRatesChart`), the browser turns it into SVG elements with d3-selection
 * (src/scripts/lineCheck.ts), never through innerHTML. Pure: data in, nodes out; no DOM.
 */
import { scaleLinear, type ScaleLinear } from "d3-scale";
import { line } from "d3-shape";
import { ticksOf } from "./axes";
import { checkId, el, escapeXml, fmt, label, textEl, type AttrValue, type ChartResult } from "./svg";

/** One SVG element: tag, attributes (escaped when written), text content or children. */
export interface SvgNode {
  readonly tag: string;
  readonly attrs: Readonly<Record<string, AttrValue>>;
  readonly text?: string;
  readonly children?: readonly SvgNode[];
}

export interface LineRatesSeries {
  readonly joint: string;
  /** Rate ratio per sample (|needed rate| / limit at the commanded speed); null where there is none. */
  readonly values: readonly (number | null)[];
}

export interface LineRatesChartInput {
  /** Element id of the <svg>. */
  readonly id: string;
  readonly title: string;
  readonly lengthMm: number;
  /** Commanded speed the ratios are computed at, mm/s. */
  readonly speedMmPerS: number;
  /** Distance of each sample from the start, mm. */
  readonly positionsMm: readonly number[];
  readonly series: readonly LineRatesSeries[];
  readonly bottleneck: {
    readonly positionMm: number;
    readonly jointIndex: number | null;
    /** Ratio of the bottleneck joint there; null when the limit is not a joint rate (out of reach, jump, singular). */
    readonly rateRatio: number | null;
    readonly label: string;
  } | null;
  /** Out-of-reach stretches, [from, to] mm along the line. */
  readonly gapsMm: readonly (readonly [number, number])[];
  /** Largest constant speed, mm/s (for the description); null when unbounded. */
  readonly feasibleMmPerS: number | null;
  readonly widthPx?: number;
  readonly heightPx?: number;
}

export const LINE_RATES_CHART_SIZE = { widthPx: 600, heightPx: 330 } as const;

/** Highest ratio drawn: a line above it runs along the top edge and the chart says "off the scale". */
export const LINE_RATES_MAX_SHOWN = 4;

/** Distinct joint line styles (lr-joint-0 … lr-joint-6 in lineCheck.css); an eighth joint reuses the first. */
export const LINE_RATE_STYLES = 7;

export function lineRateClass(i: number): string {
  return `lr-joint lr-joint-${i % LINE_RATE_STYLES}`;
}

const n = (tag: string, attrs: Readonly<Record<string, AttrValue>>, children?: readonly SvgNode[]): SvgNode =>
  children ? { tag, attrs, children } : { tag, attrs };
const t = (text: string, attrs: Readonly<Record<string, AttrValue>>): SvgNode => ({ tag: "text", attrs, text });

interface Area {
  readonly left: number;
  readonly top: number;
  readonly width: number;
  readonly height: number;
}

function axisBottom(x: ScaleLinear<number, number>, area: Area, title: string): SvgNode {
  const y0 = area.top + area.height;
  const parts: SvgNode[] = [];
  for (const tick of ticksOf(x, 8)) {
    const px = x(tick.value);
    parts.push(n("line", { class: "grid-line", x1: fmt(px), x2: fmt(px), y1: fmt(area.top), y2: fmt(y0) }));
    parts.push(n("line", { class: "tick", x1: fmt(px), x2: fmt(px), y1: fmt(y0), y2: fmt(y0 + 5) }));
    parts.push(t(tick.text, { class: "tick-label", x: fmt(px), y: fmt(y0 + 17), "text-anchor": "middle" }));
  }
  parts.push(
    n("line", { class: "domain", x1: fmt(area.left), x2: fmt(area.left + area.width), y1: fmt(y0), y2: fmt(y0) }),
  );
  parts.push(
    t(title, { class: "axis-label", x: fmt(area.left + area.width / 2), y: fmt(y0 + 34), "text-anchor": "middle" }),
  );
  return n("g", { class: "axis axis-x" }, parts);
}

function axisLeft(y: ScaleLinear<number, number>, area: Area, title: string): SvgNode {
  const parts: SvgNode[] = [];
  for (const tick of ticksOf(y, 6)) {
    const py = y(tick.value);
    parts.push(
      n("line", { class: "grid-line", x1: fmt(area.left), x2: fmt(area.left + area.width), y1: fmt(py), y2: fmt(py) }),
    );
    parts.push(n("line", { class: "tick", x1: fmt(area.left - 5), x2: fmt(area.left), y1: fmt(py), y2: fmt(py) }));
    parts.push(t(tick.text, { class: "tick-label", x: fmt(area.left - 8), y: fmt(py + 4), "text-anchor": "end" }));
  }
  parts.push(
    n("line", {
      class: "domain",
      x1: fmt(area.left),
      x2: fmt(area.left),
      y1: fmt(area.top),
      y2: fmt(area.top + area.height),
    }),
  );
  const cx = area.left - 46,
    cy = area.top + area.height / 2;
  parts.push(
    t(title, {
      class: "axis-label",
      x: fmt(cx),
      y: fmt(cy),
      "text-anchor": "middle",
      transform: `rotate(-90 ${fmt(cx)} ${fmt(cy)})`,
    }),
  );
  return n("g", { class: "axis axis-y" }, parts);
}

/** Estimated text width at 11.5 px (system sans), as the legends elsewhere estimate it. */
const textWidth = (s: string) => s.length * 11.5 * 0.56;

/** Legend of line samples, wrapping within maxWidth; returns the group and the rows used. */
function legend(
  items: readonly { className: string; label: string }[],
  x: number,
  y: number,
  maxWidth: number,
): { node: SvgNode; rows: number } {
  const parts: SvgNode[] = [];
  let cx = x,
    row = 0;
  for (const item of items) {
    const w = 30 + textWidth(item.label) + 14;
    if (cx > x && cx + w > x + maxWidth) {
      row++;
      cx = x;
    }
    const by = y + row * 17;
    parts.push(
      n("line", {
        class: `legend-line ${item.className}`,
        x1: fmt(cx),
        x2: fmt(cx + 24),
        y1: fmt(by - 4),
        y2: fmt(by - 4),
      }),
    );
    parts.push(t(item.label, { class: "legend-label", x: fmt(cx + 30), y: fmt(by) }));
    cx += w;
  }
  return { node: n("g", { class: "legend" }, parts), rows: items.length ? row + 1 : 0 };
}

function legendRowCount(items: readonly { label: string }[], maxWidth: number): number {
  let cx = 0,
    rows = items.length ? 1 : 0;
  for (const item of items) {
    const w = 30 + textWidth(item.label) + 14;
    if (cx > 0 && cx + w > maxWidth) {
      rows++;
      cx = 0;
    }
    cx += w;
  }
  return rows;
}

/** Words for the accessible description. */
function describe(input: LineRatesChartInput): string {
  const speed = `${label(input.speedMmPerS)} mm/s`;
  const peaks = input.series.map((s) => {
    let best = -1;
    for (const v of s.values) if (v !== null && v > best) best = v;
    return best >= 0 ? `${s.joint} up to ${label(best, 2)}` : `${s.joint} no value`;
  });
  const b = input.bottleneck;
  const feasible =
    input.feasibleMmPerS === null
      ? "not limited by a joint speed"
      : `${label(input.feasibleMmPerS, input.feasibleMmPerS < 100 ? 1 : 0)} mm/s`;
  return (
    `Needed joint rate divided by the joint's speed limit at ${speed}, along a ${label(input.lengthMm)} mm line. ` +
    `${peaks.join("; ")}. Largest constant speed ${feasible}` +
    (b ? `; limited by ${b.label.replace(/^bottleneck /, "")} at ${label(b.positionMm)} mm.` : ".")
  );
}

/**
 * The chart as a node tree (the <svg> element at the root).
 * @example lineRatesChartNode({ id: "lr", title: "Line", lengthMm: 100, speedMmPerS: 500, positionsMm: [0, 100],
 *   series: [{ joint: "J1", values: [0.2, 0.5] }], bottleneck: { positionMm: 100, jointIndex: 0, rateRatio: 0.5, label: "bottleneck J1" },
 *   gapsMm: [], feasibleMmPerS: 1000 }) // <svg> with one path.lr-joint-0, a limit rule at 1 and a marker at (100 mm, 0.5)
 */
export function lineRatesChartNode(input: LineRatesChartInput): SvgNode {
  const id = checkId(input.id);
  const widthPx = input.widthPx ?? LINE_RATES_CHART_SIZE.widthPx;
  if (!(input.lengthMm > 0)) throw new RangeError(`invalid lengthMm: ${input.lengthMm}`);
  if (input.positionsMm.length === 0 || input.series.some((s) => s.values.length !== input.positionsMm.length)) {
    throw new RangeError(`invalid series: ${input.positionsMm.length} positions`);
  }
  const items = input.series.map((s, i) => ({ className: lineRateClass(i), label: s.joint }));
  items.push({ className: "lr-limit", label: "limit (1.0)" });
  const rows = legendRowCount(items, widthPx - 16);
  const margin = { top: 30 + rows * 17 + 12, right: 20, bottom: 46, left: 62 };
  const heightPx = (input.heightPx ?? LINE_RATES_CHART_SIZE.heightPx) + (rows - 1) * 17;
  const area: Area = {
    left: margin.left,
    top: margin.top,
    width: widthPx - margin.left - margin.right,
    height: heightPx - margin.top - margin.bottom,
  };
  if (!(area.width > 0) || !(area.height > 0)) throw new RangeError(`invalid chart size: ${widthPx}×${heightPx}`);

  let peak = 0;
  for (const s of input.series) for (const v of s.values) if (v !== null && Number.isFinite(v) && v > peak) peak = v;
  const top = Math.min(LINE_RATES_MAX_SHOWN, Math.max(1.2, peak * 1.08));
  const x = scaleLinear([0, input.lengthMm], [area.left, area.left + area.width]);
  const y = scaleLinear([0, top], [area.top + area.height, area.top]).nice();
  const yTop = y.domain()[1]!;
  const clampY = (v: number) => y(Math.min(v, yTop));

  const parts: SvgNode[] = [];
  // Out-of-reach stretches first, under everything.
  for (const [a, b] of input.gapsMm) {
    const x0 = x(Math.max(0, a)),
      x1 = x(Math.min(input.lengthMm, b));
    parts.push(
      n("rect", {
        class: "lr-gap",
        x: fmt(x0),
        y: fmt(area.top),
        width: fmt(Math.max(1, x1 - x0)),
        height: fmt(area.height),
      }),
    );
    parts.push(
      t("out of reach", {
        class: "mark-label muted",
        x: fmt((x0 + x1) / 2),
        y: fmt(area.top + 14),
        "text-anchor": "middle",
      }),
    );
  }
  parts.push(axisBottom(x, area, "distance along the line (mm)"));
  parts.push(axisLeft(y, area, `needed rate at ${label(input.speedMmPerS)} mm/s (× limit)`));
  const limitY = y(1);
  parts.push(
    n("line", {
      class: "lr-limit",
      x1: fmt(area.left),
      x2: fmt(area.left + area.width),
      y1: fmt(limitY),
      y2: fmt(limitY),
    }),
  );

  const path = line<number>(
    (_, k) => x(input.positionsMm[k]!),
    (v) => clampY(v),
  )
    .defined((v) => v !== null && Number.isFinite(v))
    .digits(1);
  let offScale = false;
  input.series.forEach((s, i) => {
    const d = path(s.values as number[]);
    if (s.values.some((v) => v !== null && v > yTop)) offScale = true;
    if (d) parts.push(n("path", { class: lineRateClass(i), d, "data-joint": s.joint }));
  });
  if (offScale) {
    parts.push(
      t(`above ${label(yTop, 1)} × limit: off the scale`, {
        class: "mark-label muted",
        x: fmt(area.left + area.width - 4),
        y: fmt(area.top - 4),
        "text-anchor": "end",
      }),
    );
  }

  const b = input.bottleneck;
  if (b) {
    const bx = x(Math.min(input.lengthMm, Math.max(0, b.positionMm)));
    parts.push(
      n("line", {
        class: "lr-bottleneck-rule",
        x1: fmt(bx),
        x2: fmt(bx),
        y1: fmt(area.top),
        y2: fmt(area.top + area.height),
      }),
    );
    const by = b.rateRatio !== null ? clampY(b.rateRatio) : limitY;
    parts.push(n("circle", { class: "lr-bottleneck", cx: fmt(bx), cy: fmt(by), r: 5 }));
    const rightHalf = bx > area.left + area.width / 2;
    parts.push(
      t(b.label, {
        class: "mark-label",
        x: fmt(rightHalf ? bx - 8 : bx + 8),
        y: fmt(Math.max(area.top + 12, by - 9)),
        "text-anchor": rightHalf ? "end" : "start",
      }),
    );
  }
  parts.push(legend(items, 8, 40, widthPx - 16).node);

  const description = describe(input);
  return n(
    "svg",
    {
      xmlns: "http://www.w3.org/2000/svg",
      id,
      class: "chart chart-line-rates",
      viewBox: `0 0 ${fmt(widthPx, 1)} ${fmt(heightPx, 1)}`,
      width: Math.round(widthPx),
      height: Math.round(heightPx),
      role: "img",
      "aria-label": input.title,
      "aria-describedby": `${id}-desc`,
    },
    [
      { tag: "title", attrs: { id: `${id}-title` }, text: input.title },
      { tag: "desc", attrs: { id: `${id}-desc` }, text: description },
      t(input.title, { class: "chart-title", x: 8, y: 18 }),
      ...parts,
    ],
  );
}

/** Writes a node tree as an SVG string (attributes and text escaped). */
export function svgNodeToString(node: SvgNode): string {
  if (node.text !== undefined)
    return node.tag === "text" ? textEl(node.text, node.attrs) : el(node.tag, node.attrs, escapeXml(node.text));
  return el(node.tag, node.attrs, ...(node.children ?? []).map(svgNodeToString));
}

/** The chart as the site's other charts return it (build time). */
export function lineRatesChart(input: LineRatesChartInput, caption: string): ChartResult {
  const node = lineRatesChartNode(input);
  const widthPx = Number(node.attrs.width),
    heightPx = Number(node.attrs.height);
  return {
    id: input.id,
    title: input.title,
    description: describe(input),
    caption,
    svg: svgNodeToString(node),
    widthPx,
    heightPx,
  };
}
