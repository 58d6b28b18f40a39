/**
 * Plot layout: margins around the plot area, and scales with one millimetre the same length on both axes (so an
 * envelope is drawn to scale).
 */
import { scaleLinear, type ScaleLinear } from "d3-scale";
import type { PlotArea } from "./axes";

export interface Margins {
  readonly top: number;
  readonly right: number;
  readonly bottom: number;
  readonly left: number;
}

/** Room for the title and a legend row above, tick labels and the axis title below and left. */
export const DEFAULT_MARGINS: Margins = { top: 58, right: 18, bottom: 46, left: 66 };

export interface EqualScaleOptions {
  readonly widthPx: number;
  /** Largest and smallest total chart height, px. */
  readonly maxHeightPx: number;
  readonly minHeightPx: number;
  readonly margins: Margins;
  /** Share of the data span added on each side (0.04 = 4 %). */
  readonly padShare: number;
  /** When the height limits the scale, narrow the chart to the data, but not below this width (px). */
  readonly minWidthPx?: number;
}

export interface EqualScaleLayout {
  readonly x: ScaleLinear<number, number>;
  readonly y: ScaleLinear<number, number>;
  readonly area: PlotArea;
  readonly widthPx: number;
  readonly heightPx: number;
  /** Pixels per data unit, the same on both axes. */
  readonly pxPerUnit: number;
}

/**
 * Scales for x (to the right) and y (up) with the same pixels per unit. The data box is padded, fitted into the
 * width (and at most maxHeightPx), then the shorter direction's domain is widened about its centre to fill the plot.
 * @example equalScale([0, 1000], [0, 500], { widthPx: 600, maxHeightPx: 600, minHeightPx: 200, margins: m, padShare: 0 })
 *   // pxPerUnit = (600 − m.left − m.right) / 1000; heightPx = 500·pxPerUnit + m.top + m.bottom
 */
export function equalScale(
  xExtent: readonly [number, number],
  yExtent: readonly [number, number],
  options: EqualScaleOptions,
): EqualScaleLayout {
  const { maxHeightPx, minHeightPx, margins: m, padShare } = options;
  let widthPx = options.widthPx;
  let [x0, x1] = xExtent;
  let [y0, y1] = yExtent;
  if (!(x1 > x0)) [x0, x1] = [x0 - 1, x0 + 1];
  if (!(y1 > y0)) [y0, y1] = [y0 - 1, y0 + 1];
  const span = Math.max(x1 - x0, y1 - y0);
  x0 -= padShare * span;
  x1 += padShare * span;
  y0 -= padShare * span;
  y1 += padShare * span;
  let plotW = widthPx - m.left - m.right;
  const maxPlotH = maxHeightPx - m.top - m.bottom;
  const minPlotH = minHeightPx - m.top - m.bottom;
  if (!(plotW > 0) || !(maxPlotH > 0)) throw new RangeError(`invalid chart size: ${widthPx}×${maxHeightPx}`);
  const k = Math.min(plotW / (x1 - x0), maxPlotH / (y1 - y0));
  if (options.minWidthPx !== undefined && (x1 - x0) * k < plotW) {
    widthPx = Math.max(options.minWidthPx, (x1 - x0) * k + m.left + m.right);
    plotW = widthPx - m.left - m.right;
  }
  // Widen x about its centre to fill the width.
  const cx = (x0 + x1) / 2;
  x0 = cx - plotW / k / 2;
  x1 = cx + plotW / k / 2;
  let plotH = (y1 - y0) * k;
  if (plotH < minPlotH) {
    const cy = (y0 + y1) / 2;
    plotH = minPlotH;
    y0 = cy - plotH / k / 2;
    y1 = cy + plotH / k / 2;
  }
  const area: PlotArea = { left: m.left, top: m.top, width: plotW, height: plotH };
  return {
    x: scaleLinear([x0, x1], [area.left, area.left + area.width]),
    y: scaleLinear([y0, y1], [area.top + area.height, area.top]),
    area,
    widthPx,
    heightPx: plotH + m.top + m.bottom,
    pxPerUnit: k,
  };
}

/** A plot area for a chart of the given size. */
export function plotArea(widthPx: number, heightPx: number, m: Margins = DEFAULT_MARGINS): PlotArea {
  const area = { left: m.left, top: m.top, width: widthPx - m.left - m.right, height: heightPx - m.top - m.bottom };
  if (!(area.width > 0) || !(area.height > 0)) throw new RangeError(`invalid chart size: ${widthPx}×${heightPx}`);
  return area;
}
