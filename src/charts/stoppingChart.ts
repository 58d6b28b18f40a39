/**
 * Stopping data of one joint as the maker declares it: stopping distance (deg) and stopping time (s) against the
 * joint speed at the stop command (% of its maximum), one row of two panels per stop category, one line per
 * combination of arm extension and payload (each its own colour, dash pattern and marker shape, so it reads in
 * greyscale). Both rows share their y scales, so category 0 and category 1 can be compared by eye. Nothing is
 * computed: every point is a row of the arm file.
 */
import { scaleLinear } from "d3-scale";
import {
  line,
  symbol,
  symbolCircle,
  symbolCross,
  symbolDiamond,
  symbolSquare,
  symbolStar,
  symbolTriangle,
} from "d3-shape";
import { axisBottomSvg, axisLeftSvg, type PlotArea } from "./axes";
import { legendRows, legendSvg, type LegendItem } from "./legend";
import { seriesClass, SERIES_COUNT } from "./theme";
import { el, fmt, label, svgRoot, textEl, type ChartResult } from "./svg";

export interface StoppingPointData {
  readonly stopCategory: number;
  readonly speedPercent: number;
  readonly extensionPercent: number;
  readonly payloadPercent: number;
  readonly distanceDeg: number;
  readonly timeS: number;
}

export interface StoppingChartInput {
  readonly id: string;
  readonly armName: string;
  readonly joint: string;
  readonly points: readonly StoppingPointData[];
  readonly widthPx?: number;
}

const SYMBOLS = [symbolCircle, symbolSquare, symbolTriangle, symbolDiamond, symbolCross, symbolStar] as const;

const LEFT_PX = 62;
const GAP_PX = 74;
const RIGHT_PX = 14;
const PANEL_PX = 150;
const ROW_TITLE_PX = 26;
const AXIS_PX = 44;

/** The (extension, payload) combinations of the points, sorted by extension then payload. */
export function stoppingSeries(
  points: readonly StoppingPointData[],
): { extensionPercent: number; payloadPercent: number }[] {
  const keys = new Map<string, { extensionPercent: number; payloadPercent: number }>();
  for (const p of points)
    keys.set(`${p.extensionPercent}|${p.payloadPercent}`, {
      extensionPercent: p.extensionPercent,
      payloadPercent: p.payloadPercent,
    });
  return [...keys.values()].sort(
    (a, b) => a.extensionPercent - b.extensionPercent || a.payloadPercent - b.payloadPercent,
  );
}

function seriesLabel(s: { extensionPercent: number; payloadPercent: number }): string {
  return `extension ${label(s.extensionPercent)} %, payload ${label(s.payloadPercent)} %`;
}

interface Panel {
  readonly area: PlotArea;
  readonly measure: "distanceDeg" | "timeS";
}

/**
 * The stopping chart of one joint: per stop category a row with a distance panel and a time panel; per series a
 * <path class="series series-i"> (when it has two points or more) and one marker per point
 * (<use class="stop-point point-i distance|time" x y data-speed-percent … data-value …>, the shape in <defs>).
 * @example stoppingChart({ id: "stop-j1", armName: "Demo", joint: "J1", points: [
 *   { stopCategory: 0, speedPercent: 100, extensionPercent: 100, payloadPercent: 100, distanceDeg: 30, timeS: 0.4 }] })
 */
export function stoppingChart(input: StoppingChartInput): ChartResult {
  const widthPx = input.widthPx ?? 600;
  const categories = [...new Set(input.points.map((p) => p.stopCategory))].sort((a, b) => a - b);
  const series = stoppingSeries(input.points);
  const legend: LegendItem[] = series.map((s, i) => ({
    kind: "line",
    className: seriesClass(i),
    label: seriesLabel(s),
  }));
  const legendTop = 40;
  const legendH = legendRows(legend, widthPx - 16) * 17;
  const top = legendTop + legendH + 4;
  const rowPx = ROW_TITLE_PX + PANEL_PX + AXIS_PX;
  const heightPx = top + Math.max(1, categories.length) * rowPx + 6;
  const panelW = (widthPx - LEFT_PX - GAP_PX - RIGHT_PX) / 2;
  const x = (area: PlotArea) => scaleLinear([0, 100], [area.left, area.left + area.width]);
  const maxOf = (k: "distanceDeg" | "timeS") => Math.max(0, ...input.points.map((p) => p[k])) * 1.1 || 1;
  const yDomain = { distanceDeg: maxOf("distanceDeg"), timeS: maxOf("timeS") };
  const axisWords = { distanceDeg: ["stopping distance", "deg"], timeS: ["stopping time", "s"] } as const;

  // One marker shape per series, defined once and placed with <use> (a page may hold several of these charts).
  const parts: string[] = [
    el(
      "defs",
      {},
      ...series.map((_, i) =>
        el("path", { id: `${input.id}-m${i}`, d: symbol(SYMBOLS[i % SYMBOLS.length]!, 42).digits(1)() ?? "" }),
      ),
    ),
  ];
  categories.forEach((category, row) => {
    const rowTop = top + row * rowPx;
    parts.push(textEl(`Stop category ${category}`, { class: "panel-title", x: 8, y: fmt(rowTop + 16) }));
    const panels: Panel[] = (["distanceDeg", "timeS"] as const).map((measure, col) => ({
      measure,
      area: { left: LEFT_PX + col * (panelW + GAP_PX), top: rowTop + ROW_TITLE_PX, width: panelW, height: PANEL_PX },
    }));
    for (const panel of panels) {
      const xs = x(panel.area);
      const ys = scaleLinear([0, yDomain[panel.measure]], [panel.area.top + panel.area.height, panel.area.top]).nice();
      const [words, unit] = axisWords[panel.measure];
      parts.push(axisBottomSvg(xs, panel.area, { label: "speed at the stop", unit: "% of max.", ticks: 5 }));
      parts.push(axisLeftSvg(ys, panel.area, { label: words, unit, ticks: 5, grid: true }));
      series.forEach((s, i) => {
        const own = input.points
          .filter(
            (p) =>
              p.stopCategory === category &&
              p.extensionPercent === s.extensionPercent &&
              p.payloadPercent === s.payloadPercent,
          )
          .sort((a, b) => a.speedPercent - b.speedPercent);
        if (own.length >= 2) {
          const d = line<StoppingPointData>(
            (p) => xs(p.speedPercent),
            (p) => ys(p[panel.measure]),
          ).digits(1)(own);
          if (d) parts.push(el("path", { class: seriesClass(i), d }));
        }
        for (const p of own)
          parts.push(
            el("use", {
              class: `stop-point point-${i % SERIES_COUNT} ${panel.measure === "distanceDeg" ? "distance" : "time"}`,
              href: `#${input.id}-m${i}`,
              x: fmt(xs(p.speedPercent)),
              y: fmt(ys(p[panel.measure])),
              "data-speed-percent": p.speedPercent,
              "data-value": p[panel.measure],
            }),
          );
      });
    }
  });
  parts.push(legendSvg(legend, 8, legendTop, widthPx - 16).svg);

  const title = `${input.armName}: stopping data of ${input.joint}, as declared`;
  const pointText = (p: StoppingPointData) =>
    `category ${p.stopCategory}, ${label(p.speedPercent)} % speed, ${label(p.extensionPercent)} % extension, ${label(p.payloadPercent)} % payload: ${label(p.distanceDeg, 2)} deg in ${label(p.timeS, 3)} s`;
  const description =
    `Declared stopping distance (deg) and stopping time (s) of joint ${input.joint} against the joint speed at the stop command ` +
    `(% of its maximum), one row per stop category, one line per arm extension and payload. ` +
    `${input.points.map(pointText).join("; ")}.`;
  const caption =
    "As the maker declares it, copied from the source document; not computed and not checked by Armdex. " +
    "Lines only join the declared points of one extension and payload: read the values at the markers, not between them.";
  return {
    id: input.id,
    title,
    description,
    caption,
    svg: svgRoot({ id: input.id, title, description, widthPx, heightPx, className: "chart-stopping" }, parts.join("")),
    widthPx,
    heightPx,
  };
}
