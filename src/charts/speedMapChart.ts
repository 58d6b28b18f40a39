/**
 * Speed map: the guaranteed straight-line speed at constant tool orientation over the side view, in fixed bands of
 * m/s (a light-to-dark ramp; one filled path per band from d3-contour), unreachable cells left blank, the flange
 * envelope outlined for context, drawn to scale.
 */
import { axisBottomSvg, axisLeftSvg } from "./axes";
import { dilateGrid, gridBands, polygonsPath, presentRegion, type GridData, type PolygonData } from "./geometry";
import { DEFAULT_MARGINS, equalScale } from "./layout";
import type { ScaleLinear } from "d3-scale";
import { legendRows, legendSvg, stepScaleSvg, type LegendItem } from "./legend";
import type { EnvelopeLayoutKind } from "./envelopeChart";
import { SPEED_BANDS_M_PER_S, speedBandClass } from "./theme";
import { axis1LineSvg, el, fmt, label, svgRoot, type ChartResult } from "./svg";

export interface SpeedMapChartInput {
  readonly id: string;
  readonly armName: string;
  /** "tool pointing down" (legend, caption). */
  readonly orientationLabel: string;
  /** "tool down" (title). */
  readonly orientationShort: string;
  readonly layout: EnvelopeLayoutKind;
  readonly grid: GridData;
  /** Row-major over grid; null where the pose cannot be reached with this orientation. */
  readonly guaranteedMmPerS: readonly (number | null)[];
  /** Flange-centre side view (any orientation), drawn as a dashed outline; optional. */
  readonly flangeSide?: readonly PolygonData[] | null;
  /** Share of reachable cells with guaranteed speed ≥ 1 m/s (0–1), for the description. */
  readonly shareAtLeast1?: number | null;
  readonly widthPx?: number;
  readonly maxHeightPx?: number;
}

export const SPEED_MAP_WIDTH_PX = 600;
/** Narrowest map chart (tall maps narrow to their data down to this width), px. */
export const MIN_MAP_WIDTH_PX = 470;

/** The area a grid covers: each cell's square around its node, mm. */
/**
 * The equal-scale layout of a side-view map (speed, singularity and tool-direction maps share it): one millimetre the
 * same length on both axes, `topPx` above the plot for the title and legend.
 */
export function sideMapLayout(
  box: { x0: number; x1: number; y0: number; y1: number },
  widthPx: number,
  maxHeightPx: number | undefined,
  topPx: number,
) {
  return equalScale([box.x0, box.x1], [box.y0, box.y1], {
    widthPx,
    maxHeightPx: maxHeightPx ?? 640,
    minHeightPx: 300,
    margins: { ...DEFAULT_MARGINS, top: topPx },
    padShare: 0,
    minWidthPx: MIN_MAP_WIDTH_PX,
  });
}

export function mappedBox(g: GridData): { x0: number; x1: number; y0: number; y1: number } {
  const half = g.stepMm / 2;
  return {
    x0: g.rMinMm - half,
    x1: g.rMinMm + (g.nx - 1) * g.stepMm + half,
    y0: g.zMinMm - half,
    y1: g.zMinMm + (g.ny - 1) * g.stepMm + half,
  };
}

/** The mapped area as a <rect> in px. */
export function mappedRect(
  box: { x0: number; x1: number; y0: number; y1: number },
  x: ScaleLinear<number, number>,
  y: ScaleLinear<number, number>,
  className: string,
): string {
  return el("rect", {
    class: className || undefined,
    x: fmt(x(box.x0)),
    y: fmt(y(box.y1)),
    width: fmt(x(box.x1) - x(box.x0)),
    height: fmt(y(box.y0) - y(box.y1)),
  });
}

/** Edge label of a band: "0.25", "1", "2". */
export function speedEdgeLabel(valueMPerS: number): string {
  return label(valueMPerS, 2);
}

/** Index of the band a speed falls in (mm/s); −1 for null. */
export function speedBandIndex(mmPerS: number | null): number {
  if (mmPerS === null || !Number.isFinite(mmPerS)) return -1;
  let i = 0;
  while (i + 1 < SPEED_BANDS_M_PER_S.length && mmPerS >= SPEED_BANDS_M_PER_S[i + 1]! * 1000) i++;
  return i;
}

/**
 * The speed map chart.
 * @example speedMapChart({ id: "speed-down", armName: "Demo", orientationLabel: "tool pointing down",
 *   layout: "revolute-base", grid: { nx: 2, ny: 1, rMinMm: 0, zMinMm: 0, stepMm: 10 }, guaranteedMmPerS: [300, null] })
 *   // one band path (0.25–0.5 m/s) over the first cell; the second cell blank
 */
export function speedMapChart(input: SpeedMapChartInput): ChartResult {
  const widthPx = input.widthPx ?? SPEED_MAP_WIDTH_PX;
  const g = input.grid;
  const revolute = input.layout === "revolute-base";
  const box = mappedBox(g);
  const keys: LegendItem[] = [
    { kind: "fill", className: "unreached", label: `blank: not reached with the ${input.orientationLabel}` },
  ];
  if (input.flangeSide && input.flangeSide.length > 0)
    keys.push({ kind: "line", className: "env-outline", label: "flange envelope, any orientation" });
  if (revolute && box.x0 <= 0 && box.x1 >= 0) keys.push({ kind: "line", className: "axis1", label: "axis 1" });
  const keyRows = legendRows(keys, MIN_MAP_WIDTH_PX - 16);
  const layout = sideMapLayout(box, widthPx, input.maxHeightPx, 40 + 36 + 10 + keyRows * 17 + 4);
  const { x, y, area } = layout;
  const finalWidthPx = layout.widthPx;

  const parts: string[] = [];
  const clipId = `${input.id}-clip`;
  const reachId = `${input.id}-reached`;
  const reachedD = polygonsPath(presentRegion(g, input.guaranteedMmPerS), x, y);
  parts.push(
    `<defs><clipPath id="${clipId}">${mappedRect(box, x, y, "")}</clipPath>` +
      `<clipPath id="${reachId}">${el("path", { d: reachedD || "M0 0", "clip-rule": "evenodd" })}</clipPath></defs>`,
  );
  parts.push(
    axisBottomSvg(x, area, {
      label: revolute ? "distance from axis 1, r" : "base x",
      unit: "mm",
      ticks: 7,
      grid: true,
    }),
  );
  parts.push(
    axisLeftSvg(y, area, {
      label: revolute ? "height along axis 1, z" : "height, base z",
      unit: "mm",
      ticks: 7,
      grid: true,
    }),
  );

  const thresholds = SPEED_BANDS_M_PER_S.map((v) => v * 1000);
  // Contours of the values spread one cell outward, clipped to the reached cells: bands run to the cells' borders.
  const bands = gridBands(g, dilateGrid(g, input.guaranteedMmPerS), thresholds);
  const bandPaths: string[] = [];
  bands.forEach((band, i) => {
    const d = polygonsPath(band.polygons, x, y);
    if (d)
      bandPaths.push(
        el("path", {
          class: `speed-band ${speedBandClass(i)}`,
          d,
          "fill-rule": "evenodd",
          "data-band-m-per-s": speedEdgeLabel(SPEED_BANDS_M_PER_S[i]!),
        }),
      );
  });
  const reached = bandPaths.length > 0;
  parts.push(el("g", { class: "speed-bands", "clip-path": `url(#${reachId})` }, ...bandPaths));
  if (input.flangeSide && input.flangeSide.length > 0) {
    const d = polygonsPath(input.flangeSide, x, y);
    if (d) parts.push(el("path", { class: "env-outline", d, "fill-rule": "evenodd", "clip-path": `url(#${clipId})` }));
  }
  if (revolute && box.x0 <= 0 && box.x1 >= 0) {
    parts.push(axis1LineSvg(x(0), area));
  }
  parts.push(mappedRect(box, x, y, "mapped-area"));

  const scale = stepScaleSvg({
    edges: SPEED_BANDS_M_PER_S,
    bandClass: speedBandClass,
    edgeLabel: speedEdgeLabel,
    title: "guaranteed straight-line speed (m/s)",
    x: 8,
    y: 40,
    widthPx: Math.min(360, finalWidthPx - 80),
  });
  parts.push(scale.svg);
  parts.push(legendSvg(keys, 8, 40 + scale.heightPx + 14, MIN_MAP_WIDTH_PX - 16).svg);

  let max = 0;
  for (const v of input.guaranteedMmPerS) if (v !== null && v > max) max = v;
  const title = `${input.armName}: guaranteed line speed, ${input.orientationShort}`;
  const shareText =
    input.shareAtLeast1 !== undefined && input.shareAtLeast1 !== null
      ? ` ${label(input.shareAtLeast1 * 100, 1)} % of the reached cells allow at least 1 m/s.`
      : "";
  const description = reached
    ? `Colour map over the side view of the straight-line speed the flange centre reaches in every direction with the ${input.orientationLabel}, in bands from 0 to ${speedEdgeLabel(SPEED_BANDS_M_PER_S.at(-1)!)} m/s and above; highest value ${label(max / 1000, 2)} m/s.${shareText} Blank cells are not reached with this orientation.`
    : `No cell of the side view is reached with the ${input.orientationLabel}.`;
  const caption =
    `Flange centre as the tool point (no tool), ${input.orientationLabel}, orientation held constant. Each ${label(g.stepMm)} mm cell shows the speed reached in every direction with every joint within its rated speed ` +
    `(best inverse-kinematics branch per cell; drawn against the distance from ${revolute ? "axis 1" : "the base z axis"}). Joint speed limits only: no acceleration, controller or payload limits.`;
  return {
    id: input.id,
    title,
    description,
    caption,
    svg: svgRoot(
      { id: input.id, title, description, widthPx: finalWidthPx, heightPx: layout.heightPx, className: "chart-speed" },
      parts.join(""),
    ),
    widthPx: finalWidthPx,
    heightPx: layout.heightPx,
  };
}
