/**
 * Axes as SVG strings: a domain line, ticks with labels, an axis title with its unit, optional grid lines across the
 * plot. Pure; scales from d3-scale.
 */
import { tickStep } from "d3-array";
import type { ScaleLinear } from "d3-scale";
import { el, fmt, label, textEl } from "./svg";

/** The plot rectangle inside a chart, px. */
export interface PlotArea {
  readonly left: number;
  readonly top: number;
  readonly width: number;
  readonly height: number;
}

export interface AxisOptions {
  /** Quantity in words, e.g. "height z". */
  readonly label: string;
  /** Unit, e.g. "mm" (shown in parentheses after the label). */
  readonly unit: string;
  /** Approximate number of ticks. */
  readonly ticks?: number;
  /** Draw grid lines across the plot at each tick. */
  readonly grid?: boolean;
  /** Where the label goes: "end" of the axis (default "middle"). */
  readonly labelAt?: "middle" | "end";
}

/** "height z (mm)": an axis title with its unit. */
export function axisTitle(quantity: string, unit: string): string {
  return unit ? `${quantity} (${unit})` : quantity;
}

/** Decimals that tick labels need for the step of `ticks` over `domain`. */
export function tickDecimals(domain: readonly number[], count: number): number {
  const a = domain[0] ?? 0;
  const b = domain[domain.length - 1] ?? 1;
  const step = Math.abs(tickStep(Math.min(a, b), Math.max(a, b), count));
  if (!(step > 0) || !Number.isFinite(step)) return 0;
  return Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
}

/** Tick values and their labels for a linear scale. */
export function ticksOf(scale: ScaleLinear<number, number>, count: number): { value: number; text: string }[] {
  const decimals = tickDecimals(scale.domain(), count);
  return scale.ticks(count).map((value) => ({ value, text: label(value, decimals) }));
}

/**
 * The grid lines of an axis as one path, its tick marks as another, then the labels: one element per axis instead
 * of one per tick keeps a sheet of many charts light (the drawing is the same).
 */
function pushTickPaths(parts: string[], grid: string, marks: string, labels: readonly string[]): void {
  if (grid) parts.push(el("path", { class: "grid-line", d: grid }));
  if (marks) parts.push(el("path", { class: "tick", d: marks }));
  parts.push(...labels);
}

/** Horizontal axis along the bottom of `area`. */
export function axisBottomSvg(scale: ScaleLinear<number, number>, area: PlotArea, options: AxisOptions): string {
  const y0 = area.top + area.height;
  const parts: string[] = [];
  const ticks = ticksOf(scale, options.ticks ?? 6);
  let grid = "",
    marks = "";
  const labels: string[] = [];
  for (const t of ticks) {
    const x = scale(t.value);
    if (x < area.left - 0.5 || x > area.left + area.width + 0.5) continue;
    grid += `M${fmt(x)} ${fmt(area.top)}V${fmt(y0)}`;
    marks += `M${fmt(x)} ${fmt(y0)}v5`;
    labels.push(textEl(t.text, { class: "tick-label", x: fmt(x), y: fmt(y0 + 17), "text-anchor": "middle" }));
  }
  pushTickPaths(parts, options.grid ? grid : "", marks, labels);
  parts.push(
    el("line", { class: "domain", x1: fmt(area.left), x2: fmt(area.left + area.width), y1: fmt(y0), y2: fmt(y0) }),
  );
  const title = axisTitle(options.label, options.unit);
  parts.push(
    options.labelAt === "end"
      ? textEl(title, { class: "axis-label", x: fmt(area.left + area.width), y: fmt(y0 + 34), "text-anchor": "end" })
      : textEl(title, {
          class: "axis-label",
          x: fmt(area.left + area.width / 2),
          y: fmt(y0 + 34),
          "text-anchor": "middle",
        }),
  );
  return el("g", { class: "axis axis-x" }, ...parts);
}

/** Vertical axis along the left of `area`; the title is turned to read bottom to top. */
export function axisLeftSvg(scale: ScaleLinear<number, number>, area: PlotArea, options: AxisOptions): string {
  const x0 = area.left;
  const parts: string[] = [];
  const ticks = ticksOf(scale, options.ticks ?? 6);
  let grid = "",
    marks = "";
  const labels: string[] = [];
  for (const t of ticks) {
    const y = scale(t.value);
    if (y < area.top - 0.5 || y > area.top + area.height + 0.5) continue;
    grid += `M${fmt(x0)} ${fmt(y)}H${fmt(x0 + area.width)}`;
    marks += `M${fmt(x0 - 5)} ${fmt(y)}h5`;
    labels.push(textEl(t.text, { class: "tick-label", x: fmt(x0 - 8), y: fmt(y + 4), "text-anchor": "end" }));
  }
  pushTickPaths(parts, options.grid ? grid : "", marks, labels);
  parts.push(
    el("line", { class: "domain", x1: fmt(x0), x2: fmt(x0), y1: fmt(area.top), y2: fmt(area.top + area.height) }),
  );
  const cx = x0 - 50;
  const cy = area.top + area.height / 2;
  parts.push(
    textEl(axisTitle(options.label, options.unit), {
      class: "axis-label",
      x: fmt(cx),
      y: fmt(cy),
      "text-anchor": "middle",
      transform: `rotate(-90 ${fmt(cx)} ${fmt(cy)})`,
    }),
  );
  return el("g", { class: "axis axis-y" }, ...parts);
}
