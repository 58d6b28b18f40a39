/**
 * Payload at reach: the largest static payload against the flange centre's distance from axis 1, one line per
 * centre-of-gravity offset (each its own colour and dash pattern), for one mounting, with the rated payload marked.
 */
import { max } from "d3-array";
import { scaleLinear } from "d3-scale";
import { line } from "d3-shape";
import { axisBottomSvg, axisLeftSvg } from "./axes";
import { DEFAULT_MARGINS, plotArea } from "./layout";
import { legendRows, legendSvg, type LegendItem } from "./legend";
import { seriesClass } from "./theme";
import { el, fmt, label, svgRoot, textEl, type ChartResult } from "./svg";

export interface PayloadRowData {
  readonly reachMm: number;
  readonly offsetMm: number;
  readonly payloadKg: number;
  /** "unreachable" rows break the line. */
  readonly limitedBy: string;
}

export interface PayloadChartInput {
  readonly id: string;
  readonly armName: string;
  /** "floor". */
  readonly mountingLabel: string;
  /** Rows of this mounting only. */
  readonly rows: readonly PayloadRowData[];
  readonly ratedPayloadKg: number;
  /** How the figures were obtained, one sentence (goes into the caption). */
  readonly basisText: string;
  /** "distance from axis 1" or "distance from the base z axis". */
  readonly reachWords?: string;
  readonly widthPx?: number;
  readonly heightPx?: number;
}

export const PAYLOAD_CHART_SIZE = { widthPx: 600, heightPx: 360 } as const;

/**
 * The payload-at-reach chart: one <path class="series series-i"> per CG offset, ascending.
 * @example payloadChart({ id: "payload-floor", armName: "Demo", mountingLabel: "floor", ratedPayloadKg: 7, basisText: "…",
 *   rows: [{ reachMm: 50, offsetMm: 0, payloadKg: 7, limitedBy: "rated-payload" }, { reachMm: 100, offsetMm: 0, payloadKg: 6, limitedBy: "joint-rating" }] })
 */
export function payloadChart(input: PayloadChartInput): ChartResult {
  const widthPx = input.widthPx ?? PAYLOAD_CHART_SIZE.widthPx;
  const offsets = [...new Set(input.rows.map((r) => r.offsetMm))].sort((a, b) => a - b);
  const legend: LegendItem[] = offsets.map((o, i) => ({
    kind: "line",
    className: seriesClass(i),
    label: `CG offset ${label(o)} mm`,
  }));
  legend.push({ kind: "line", className: "rated-line", label: `rated payload ${label(input.ratedPayloadKg, 2)} kg` });
  const rows = legendRows(legend, widthPx - 16);
  const margins = { ...DEFAULT_MARGINS, top: 30 + rows * 17 + 10, right: 70 };
  const heightPx = (input.heightPx ?? PAYLOAD_CHART_SIZE.heightPx) + (rows - 1) * 17;
  const area = plotArea(widthPx, heightPx, margins);

  const reachable = input.rows.filter((r) => r.limitedBy !== "unreachable");
  const xMax = max(reachable, (r) => r.reachMm) ?? 1;
  const yMax = Math.max(input.ratedPayloadKg, max(reachable, (r) => r.payloadKg) ?? 0) * 1.12 || 1;
  const x = scaleLinear([0, xMax], [area.left, area.left + area.width]).nice();
  const y = scaleLinear([0, yMax], [area.top + area.height, area.top]).nice();
  const reachWords = input.reachWords ?? "distance from axis 1";

  const parts: string[] = [];
  parts.push(axisBottomSvg(x, area, { label: `flange centre ${reachWords}`, unit: "mm", ticks: 8, grid: true }));
  parts.push(axisLeftSvg(y, area, { label: "payload", unit: "kg", ticks: 6, grid: true }));
  const ry = y(input.ratedPayloadKg);
  parts.push(
    el("line", { class: "rated-line", x1: fmt(area.left), x2: fmt(area.left + area.width), y1: fmt(ry), y2: fmt(ry) }),
  );
  const path = line<PayloadRowData>(
    (r) => x(r.reachMm),
    (r) => y(r.payloadKg),
  )
    .defined((r) => r.limitedBy !== "unreachable")
    .digits(1);
  const ends: { y: number; text: string; i: number }[] = [];
  offsets.forEach((o, i) => {
    const series = input.rows.filter((r) => r.offsetMm === o).sort((a, b) => a.reachMm - b.reachMm);
    const d = path(series);
    if (d) parts.push(el("path", { class: seriesClass(i), d, "data-offset-mm": o }));
    const last = [...series].reverse().find((r) => r.limitedBy !== "unreachable");
    if (last) ends.push({ y: y(last.payloadKg), text: `${label(o)} mm`, i });
  });
  // End labels right of the plot, pushed apart so they do not overlap.
  ends.sort((a, b) => a.y - b.y);
  for (let k = 1; k < ends.length; k++) if (ends[k]!.y - ends[k - 1]!.y < 12) ends[k]!.y = ends[k - 1]!.y + 12;
  for (const e of ends)
    parts.push(textEl(e.text, { class: "series-label", x: fmt(area.left + area.width + 6), y: fmt(e.y + 4) }));
  const allRated = reachable.length > 0 && reachable.every((r) => Math.abs(r.payloadKg - input.ratedPayloadKg) < 1e-9);
  if (allRated) {
    parts.push(
      textEl("every reach and offset: capped at the rated payload", {
        class: "mark-label",
        x: fmt(area.left + area.width / 2),
        y: fmt(ry + 22),
        "text-anchor": "middle",
      }),
    );
  }
  parts.push(legendSvg(legend, 8, 40, widthPx - 16).svg);

  const title = `${input.armName}: payload at reach, ${input.mountingLabel} mounting`;
  const atMax = offsets.map((o) => {
    const r = reachable.filter((row) => row.offsetMm === o).sort((a, b) => b.reachMm - a.reachMm)[0];
    return r ? `${label(r.payloadKg, 1)} kg at ${label(r.reachMm)} mm with a ${label(o)} mm offset` : null;
  });
  const description =
    `Largest static payload against the flange centre's ${reachWords}, ${input.mountingLabel} mounting, one line per centre-of-gravity offset; ` +
    `rated payload ${label(input.ratedPayloadKg, 2)} kg. At the largest reach: ${atMax.filter((t) => t !== null).join("; ") || "no row reached"}.`;
  const caption =
    `${input.basisText} Worst posture found at each reach, CG offset along the tool axis, tool pointing along gravity where the wrist allows. ` +
    "Static holding only: excludes acceleration and safety margins; gripper, tooling and part all count as payload.";
  return {
    id: input.id,
    title,
    description,
    caption,
    svg: svgRoot({ id: input.id, title, description, widthPx, heightPx, className: "chart-payload" }, parts.join("")),
    widthPx,
    heightPx,
  };
}
