/**
 * Legends: a row of keys (filled swatch or line sample, then the label) that wraps to further rows, and a stepped
 * colour scale with labelled edges. Text widths are estimated (system sans at 11.5 px), so the layout needs no DOM.
 */
import { el, fmt, textEl } from "./svg";

export interface LegendItem {
  /** "fill": a square swatch with the class's fill and outline; "line": a 24 px line sample with the class's stroke. */
  readonly kind: "fill" | "line";
  readonly className: string;
  readonly label: string;
  /** Fill the swatch with this pattern (an element id in the same SVG) instead of the class's fill. */
  readonly patternId?: string;
}

/** Estimated width of `text` at the legend font size, px (average glyph of a system sans ≈ 0.56 em). */
export function textWidthPx(text: string, fontPx = 11.5): number {
  return text.length * fontPx * 0.56;
}

const ROW_PX = 17;

/**
 * Keys from (x, y) (y = the first row's text baseline) to the right, wrapping within maxWidthPx.
 * @returns the SVG group and the height used, px
 */
export function legendSvg(
  items: readonly LegendItem[],
  x: number,
  y: number,
  maxWidthPx: number,
): { svg: string; heightPx: number } {
  const parts: string[] = [];
  let cx = x;
  let row = 0;
  for (const item of items) {
    const w = 30 + textWidthPx(item.label) + 16;
    if (cx > x && cx + w > x + maxWidthPx) {
      row++;
      cx = x;
    }
    const by = y + row * ROW_PX;
    parts.push(
      item.kind === "fill"
        ? el("rect", {
            class: `legend-swatch ${item.className}`,
            x: fmt(cx),
            y: fmt(by - 9),
            width: 22,
            height: 11,
            fill: item.patternId ? `url(#${item.patternId})` : undefined,
          })
        : el("line", {
            class: `legend-line ${item.className}`,
            x1: fmt(cx),
            x2: fmt(cx + 24),
            y1: fmt(by - 4),
            y2: fmt(by - 4),
          }),
    );
    parts.push(textEl(item.label, { class: "legend-label", x: fmt(cx + 30), y: fmt(by) }));
    cx += w;
  }
  return { svg: el("g", { class: "legend" }, ...parts), heightPx: items.length === 0 ? 0 : (row + 1) * ROW_PX };
}

/** How many legend rows `items` take in maxWidthPx (the same wrapping as legendSvg). */
export function legendRows(items: readonly LegendItem[], maxWidthPx: number): number {
  let cx = 0;
  let rows = items.length > 0 ? 1 : 0;
  for (const item of items) {
    const w = 30 + textWidthPx(item.label) + 16;
    if (cx > 0 && cx + w > maxWidthPx) {
      rows++;
      cx = 0;
    }
    cx += w;
  }
  return rows;
}

export interface StepScaleOptions {
  /** Lower edges of the bands, in display units, ascending. */
  readonly edges: readonly number[];
  /** Class of band i. */
  readonly bandClass: (i: number) => string;
  /** Label of an edge value, e.g. "0.5". */
  readonly edgeLabel: (value: number) => string;
  /** Title above the bar, with the unit: "guaranteed line speed (m/s)". */
  readonly title: string;
  readonly x: number;
  readonly y: number;
  /** Width of the bar; "and above" follows it, about 60 px more. */
  readonly widthPx: number;
}

/**
 * A horizontal stepped colour bar: one box per band, edge values under the box borders, the last band open ("≥").
 * @returns the SVG group and its height, px
 */
export function stepScaleSvg(o: StepScaleOptions): { svg: string; heightPx: number } {
  const n = o.edges.length;
  const boxW = o.widthPx / n;
  const parts: string[] = [textEl(o.title, { class: "legend-title", x: fmt(o.x), y: fmt(o.y) })];
  const top = o.y + 6;
  for (let i = 0; i < n; i++) {
    parts.push(
      el("rect", {
        class: `scale-box ${o.bandClass(i)}`,
        x: fmt(o.x + i * boxW),
        y: fmt(top),
        width: fmt(boxW),
        height: 12,
      }),
    );
    parts.push(
      textEl(o.edgeLabel(o.edges[i]!), {
        class: "tick-label",
        x: fmt(o.x + i * boxW),
        y: fmt(top + 25),
        "text-anchor": i === 0 ? "start" : "middle",
      }),
    );
  }
  parts.push(textEl("and above", { class: "tick-label", x: fmt(o.x + o.widthPx + 5), y: fmt(top + 10) }));
  return { svg: el("g", { class: "legend step-scale" }, ...parts), heightPx: 36 };
}
