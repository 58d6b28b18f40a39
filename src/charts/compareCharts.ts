/**
 * Side-by-side charts: several arms overlaid on one chart, each arm its own colour AND dash pattern (`series-i`, the
 * payload chart's line styles), with a legend. Node trees (nodes.ts) so the browser draws them with d3-selection.
 *
 * - `envelopeOverlayNode`: side-view envelope outlines of the chosen point, every arm at one scale (mm on both
 *   axes, equal aspect), axis 1 marked, optionally the requirement's band as a shaded rectangle.
 * - `payloadOverlayNode`: payload at reach, one curve per arm at one CG offset, optionally the needed payload and
 *   the reach band.
 */
import { scaleLinear } from "d3-scale";
import { line } from "d3-shape";
import { polygonsExtent, polygonsPath, type PolygonData } from "./geometry";
import { DEFAULT_MARGINS, equalScale, plotArea } from "./layout";
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
import { seriesClass, SERIES_COUNT } from "./theme";
import { fmt, label } from "./svg";

/** Most arms one overlay distinguishes (one line style each). */
export const MAX_OVERLAY_ARMS = SERIES_COUNT;

export interface OverlayBand {
  readonly rMm: readonly [number, number];
  readonly zMm: readonly [number, number];
}

export interface EnvelopeOverlayArm {
  readonly id: string;
  readonly name: string;
  readonly polygons: readonly PolygonData[];
  /** Words after the name in the legend, e.g. "(flange centre: no WCP)". */
  readonly note?: string;
}

export interface EnvelopeOverlayInput {
  readonly id: string;
  /** "wrist centre point" or "flange centre". */
  readonly pointWords: string;
  readonly arms: readonly EnvelopeOverlayArm[];
  readonly band?: OverlayBand | null;
  readonly widthPx?: number;
  readonly maxHeightPx?: number;
}

function checkArmCount(n: number): void {
  if (n < 1 || n > MAX_OVERLAY_ARMS) throw new RangeError(`invalid arm count: ${n} (1 to ${MAX_OVERLAY_ARMS})`);
}

/**
 * Envelope outlines of several arms on one side view, to scale.
 * @example envelopeOverlayNode({ id: "cmp-env", pointWords: "wrist centre point", arms: [
 *   { id: "a", name: "A", polygons: [{ outer: [[0, 0], [500, 0], [500, 400], [0, 0]], holes: [] }] }] })
 *   // <svg> with one path.series-0 (data-arm="a") and a legend of one
 */
export function envelopeOverlayNode(input: EnvelopeOverlayInput): SvgNode {
  checkArmCount(input.arms.length);
  const widthPx = input.widthPx ?? 720;
  const legend: NodeLegendItem[] = input.arms.map((a, i) => ({
    kind: "line",
    className: `${seriesClass(i)} env-overlay`,
    label: a.note ? `${a.name} ${a.note}` : a.name,
    key: a.id,
  }));
  legend.push({ kind: "line", className: "axis1", label: "axis 1" });
  if (input.band) legend.push({ kind: "fill", className: "need-band", label: "band the cell needs" });
  const rows = legendNodeRows(legend, widthPx - 16);
  const margins = { ...DEFAULT_MARGINS, top: 30 + rows * 17 + 10 };
  const all = input.arms.flatMap((a) => a.polygons);
  const box = polygonsExtent(all) ?? [
    [0, 1],
    [0, 1],
  ];
  let [x0, x1] = box[0];
  let [y0, y1] = box[1];
  x0 = Math.min(x0, 0);
  if (input.band) {
    x0 = Math.min(x0, input.band.rMm[0]);
    x1 = Math.max(x1, input.band.rMm[1]);
    y0 = Math.min(y0, input.band.zMm[0]);
    y1 = Math.max(y1, input.band.zMm[1]);
  }
  const layout = equalScale([x0, x1], [y0, y1], {
    widthPx,
    maxHeightPx: input.maxHeightPx ?? 720,
    minHeightPx: 300,
    margins,
    padShare: 0.03,
  });
  const { x, y, area } = layout;
  const parts: SvgNode[] = [
    axisBottomNode(x, area, "distance from axis 1, r", "mm"),
    axisLeftNode(y, area, "height along axis 1, z", "mm"),
  ];
  if (input.band) {
    const bx = x(input.band.rMm[0]),
      by = y(input.band.zMm[1]);
    parts.push(
      node("rect", {
        class: "need-band",
        x: fmt(bx),
        y: fmt(by),
        width: fmt(Math.max(1, x(input.band.rMm[1]) - bx)),
        height: fmt(Math.max(1, y(input.band.zMm[0]) - by)),
      }),
    );
  }
  const ax = x(0);
  parts.push(
    node("line", { class: "axis1", x1: fmt(ax), x2: fmt(ax), y1: fmt(area.top), y2: fmt(area.top + area.height) }),
  );
  input.arms.forEach((a, i) => {
    const d = polygonsPath(a.polygons, x, y);
    if (d)
      parts.push(node("path", { class: `${seriesClass(i)} env-overlay`, d, "fill-rule": "evenodd", "data-arm": a.id }));
  });
  parts.push(legendNode(legend, 8, 40, widthPx - 16));
  const title = `Reach envelopes, side view: ${input.pointWords}`;
  const description =
    `Side-view regions the ${input.pointWords} of ${input.arms.length} arms can reach, drawn to one scale in millimetres (distance from axis 1 against height): ` +
    input.arms
      .map((a) => {
        const e = polygonsExtent(a.polygons);
        return e
          ? `${a.name} up to ${label(e[0][1])} mm from axis 1 and ${label(e[1][0])} to ${label(e[1][1])} mm high`
          : `${a.name} no region`;
      })
      .join("; ") +
    (input.band
      ? `. The band the cell needs, ${label(input.band.rMm[0])} to ${label(input.band.rMm[1])} mm by ${label(input.band.zMm[0])} to ${label(input.band.zMm[1])} mm, is shaded.`
      : ".");
  return chartRootNode(
    {
      id: input.id,
      title,
      description,
      widthPx: layout.widthPx,
      heightPx: layout.heightPx,
      className: "chart-compare-envelope",
    },
    parts,
  );
}

export interface PayloadOverlayArm {
  readonly id: string;
  readonly name: string;
  /** Rows at the chosen offset and mounting, ascending reach; payload null where out of reach. */
  readonly reachMm: readonly number[];
  readonly payloadKg: readonly (number | null)[];
  readonly note?: string;
}

export interface PayloadOverlayInput {
  readonly id: string;
  readonly offsetMm: number;
  readonly arms: readonly PayloadOverlayArm[];
  /** The needed payload, kg, drawn as a rule; null to leave out. */
  readonly needKg?: number | null;
  readonly bandMm?: readonly [number, number] | null;
  readonly widthPx?: number;
  readonly heightPx?: number;
}

/**
 * Payload-at-reach curves of several arms at one CG offset.
 * @example payloadOverlayNode({ id: "cmp-pay", offsetMm: 0, arms: [{ id: "a", name: "A", reachMm: [100, 200], payloadKg: [7, 6] }] })
 *   // <svg> with one path.series-0 from (100 mm, 7 kg) to (200 mm, 6 kg)
 */
export function payloadOverlayNode(input: PayloadOverlayInput): SvgNode {
  checkArmCount(input.arms.length);
  const widthPx = input.widthPx ?? 720;
  const legend: NodeLegendItem[] = input.arms.map((a, i) => ({
    kind: "line",
    className: seriesClass(i),
    label: a.note ? `${a.name} ${a.note}` : a.name,
    key: a.id,
  }));
  if (input.needKg != null)
    legend.push({ kind: "line", className: "need-rule", label: `needed ${label(input.needKg, 2)} kg` });
  if (input.bandMm) legend.push({ kind: "fill", className: "need-band", label: "reach band" });
  const rows = legendNodeRows(legend, widthPx - 16);
  const margins = { ...DEFAULT_MARGINS, top: 30 + rows * 17 + 10 };
  const heightPx = (input.heightPx ?? 380) + (rows - 1) * 17;
  const area = plotArea(widthPx, heightPx, margins);
  let xMax = input.bandMm ? input.bandMm[1] : 1,
    yMax = input.needKg ?? 0;
  for (const a of input.arms) {
    a.reachMm.forEach((r, k) => {
      const p = a.payloadKg[k];
      if (p === null || p === undefined) return;
      xMax = Math.max(xMax, r);
      yMax = Math.max(yMax, p);
    });
  }
  const x = scaleLinear([0, xMax], [area.left, area.left + area.width]).nice();
  const y = scaleLinear([0, (yMax || 1) * 1.1], [area.top + area.height, area.top]).nice();
  const parts: SvgNode[] = [];
  if (input.bandMm) {
    const b0 = x(input.bandMm[0]);
    parts.push(
      node("rect", {
        class: "need-band",
        x: fmt(b0),
        y: fmt(area.top),
        width: fmt(Math.max(1, x(input.bandMm[1]) - b0)),
        height: fmt(area.height),
      }),
    );
  }
  parts.push(
    axisBottomNode(x, area, "flange centre distance from axis 1", "mm", 8),
    axisLeftNode(y, area, "payload", "kg", 6),
  );
  if (input.needKg != null) {
    const ny = y(input.needKg);
    parts.push(
      node("line", {
        class: "need-rule",
        x1: fmt(area.left),
        x2: fmt(area.left + area.width),
        y1: fmt(ny),
        y2: fmt(ny),
      }),
    );
  }
  input.arms.forEach((a, i) => {
    const path = line<number | null>(
      (_, k) => x(a.reachMm[k]!),
      (p) => y(p ?? 0),
    )
      .defined((p) => p !== null)
      .digits(1);
    const d = path(a.payloadKg.slice());
    if (d) parts.push(node("path", { class: seriesClass(i), d, "data-arm": a.id }));
  });
  parts.push(legendNode(legend, 8, 40, widthPx - 16));
  const title = `Payload at reach, CG offset ${label(input.offsetMm)} mm`;
  const description =
    `Largest static payload against the flange centre's distance from axis 1 at a CG offset of ${label(input.offsetMm)} mm, one line per arm: ` +
    input.arms
      .map((a) => {
        let lastK = -1;
        a.payloadKg.forEach((p, k) => {
          if (p !== null) lastK = k;
        });
        return lastK < 0
          ? `${a.name} no row`
          : `${a.name} ${label(a.payloadKg[lastK]!, 1)} kg at ${label(a.reachMm[lastK]!)} mm, its last row`;
      })
      .join("; ") +
    ".";
  return chartRootNode(
    { id: input.id, title, description, widthPx, heightPx, className: "chart-compare-payload" },
    parts,
  );
}
