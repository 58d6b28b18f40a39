/**
 * Capability map: the share of tool directions from which the flange centre reaches each cell of the side view, in
 * fixed bands of 10 % (a light-to-dark ramp; one filled path per band from d3-contour), cells outside the flange
 * envelope left blank, the flange envelope outlined for context and, when given, the outline of the cells reached
 * with the tool pointing straight down (from the tool-down speed map), drawn to scale.
 */
import { axisBottomSvg, axisLeftSvg } from "./axes";
import { dilateGrid, gridBands, polygonsPath, presentRegion, type GridData, type PolygonData } from "./geometry";
import { legendRows, legendSvg, stepScaleSvg, type LegendItem } from "./legend";
import { mappedBox, mappedRect, MIN_MAP_WIDTH_PX, sideMapLayout, SPEED_MAP_WIDTH_PX } from "./speedMapChart";
import { CAPABILITY_BANDS, capabilityBandClass } from "./theme";
import { axis1LineSvg, el, label, svgRoot, type ChartResult } from "./svg";

export interface CapabilityMapChartInput {
  readonly id: string;
  readonly armName: string;
  /** Grid of the shares: nodes (rMinMm + i·stepMm, zMinMm + j·stepMm), r = distance from axis 1. */
  readonly grid: GridData;
  /** Row-major over grid: share of the directions reached (0–1); null outside the flange envelope. */
  readonly share: readonly (number | null)[];
  /** Number of tool directions tried per cell. */
  readonly directions: number;
  /** Flange-centre side view (any orientation), drawn as a dashed outline; optional. */
  readonly flangeSide?: readonly PolygonData[] | null;
  /** Cells reached with the tool pointing straight down (the tool-down speed map's grid and values); optional. */
  readonly toolDown?: { readonly grid: GridData; readonly reached: readonly (number | null)[] } | null;
  /** Share of the envelope's cells reached from at least half of the directions (0–1), for the description. */
  readonly areaShareAtLeastHalf?: number | null;
  readonly widthPx?: number;
  readonly maxHeightPx?: number;
}

/** Edge label of a band in percent: "0", "10", … "90". */
export function capabilityEdgeLabel(share: number): string {
  return label(share * 100, 0);
}

/** Index of the band a share falls in; −1 for null. */
export function capabilityBandIndex(share: number | null): number {
  if (share === null || !Number.isFinite(share)) return -1;
  let i = 0;
  // A share is a count over the directions: compare with a tolerance far below 1/directions.
  while (i + 1 < CAPABILITY_BANDS.length && share >= CAPABILITY_BANDS[i + 1]! - 1e-9) i++;
  return i;
}

/** The legend keys: blank cells, the envelope, the tool-down outline and axis 1, as present. */
function legendKeys(input: CapabilityMapChartInput, axisShown: boolean, downShown: boolean): LegendItem[] {
  const keys: LegendItem[] = [{ kind: "fill", className: "unreached", label: "blank: outside the flange envelope" }];
  if (input.flangeSide && input.flangeSide.length > 0)
    keys.push({ kind: "line", className: "env-outline", label: "flange envelope, any orientation" });
  if (downShown)
    keys.push({ kind: "line", className: "tool-down-outline", label: "reached with the tool pointing down" });
  if (axisShown) keys.push({ kind: "line", className: "axis1", label: "axis 1" });
  return keys;
}

/**
 * The capability map chart.
 * @example capabilityMapChart({ id: "capability", armName: "Demo", grid: { nx: 2, ny: 1, rMinMm: 0, zMinMm: 0,
 *   stepMm: 50 }, share: [0.55, null], directions: 128 })
 *   // one band path (50–60 %) over the first cell; the second cell blank
 */
export function capabilityMapChart(input: CapabilityMapChartInput): ChartResult {
  const widthPx = input.widthPx ?? SPEED_MAP_WIDTH_PX;
  const g = input.grid;
  const box = mappedBox(g);
  const axisShown = box.x0 <= 0 && box.x1 >= 0;
  const downRegion = input.toolDown ? presentRegion(input.toolDown.grid, input.toolDown.reached) : [];
  const keys = legendKeys(input, axisShown, downRegion.length > 0);
  const keyRows = legendRows(keys, MIN_MAP_WIDTH_PX - 16);
  const layout = sideMapLayout(box, widthPx, input.maxHeightPx, 40 + 36 + 10 + keyRows * 17 + 4);
  const { x, y, area } = layout;
  const finalWidthPx = layout.widthPx;

  const parts: string[] = [];
  const clipId = `${input.id}-clip`;
  const insideId = `${input.id}-inside`;
  const insideD = polygonsPath(presentRegion(g, input.share), x, y);
  parts.push(
    `<defs><clipPath id="${clipId}">${mappedRect(box, x, y, "")}</clipPath>` +
      `<clipPath id="${insideId}">${el("path", { d: insideD || "M0 0", "clip-rule": "evenodd" })}</clipPath></defs>`,
  );
  parts.push(axisBottomSvg(x, area, { label: "distance from axis 1, r", unit: "mm", ticks: 7, grid: true }));
  parts.push(axisLeftSvg(y, area, { label: "height along axis 1, z", unit: "mm", ticks: 7, grid: true }));

  // Contours of the shares spread one cell outward, clipped to the envelope's cells: bands run to the cells' borders.
  const bands = gridBands(g, dilateGrid(g, input.share), CAPABILITY_BANDS.slice());
  const bandPaths: string[] = [];
  bands.forEach((band, i) => {
    const d = polygonsPath(band.polygons, x, y);
    if (d)
      bandPaths.push(
        el("path", {
          class: `capability-band ${capabilityBandClass(i)}`,
          d,
          "fill-rule": "evenodd",
          "data-band-percent": capabilityEdgeLabel(CAPABILITY_BANDS[i]!),
        }),
      );
  });
  parts.push(el("g", { class: "capability-bands", "clip-path": `url(#${insideId})` }, ...bandPaths));
  if (input.flangeSide && input.flangeSide.length > 0) {
    const d = polygonsPath(input.flangeSide, x, y);
    if (d) parts.push(el("path", { class: "env-outline", d, "fill-rule": "evenodd", "clip-path": `url(#${clipId})` }));
  }
  if (downRegion.length > 0) {
    const d = polygonsPath(downRegion, x, y);
    if (d)
      parts.push(el("path", { class: "tool-down-outline", d, "fill-rule": "evenodd", "clip-path": `url(#${clipId})` }));
  }
  if (axisShown) {
    parts.push(axis1LineSvg(x(0), area));
  }
  parts.push(mappedRect(box, x, y, "mapped-area"));

  const scale = stepScaleSvg({
    edges: CAPABILITY_BANDS,
    bandClass: capabilityBandClass,
    edgeLabel: capabilityEdgeLabel,
    title: "share of tool directions reached (%)",
    x: 8,
    y: 40,
    widthPx: Math.min(360, finalWidthPx - 80),
  });
  parts.push(scale.svg);
  parts.push(legendSvg(keys, 8, 40 + scale.heightPx + 14, MIN_MAP_WIDTH_PX - 16).svg);

  const n = input.directions;
  const title = `${input.armName}: share of tool directions reached`;
  const half =
    input.areaShareAtLeastHalf !== undefined && input.areaShareAtLeastHalf !== null
      ? ` ${label(input.areaShareAtLeastHalf * 100, 1)} % of the envelope's cells are reached from at least half of the directions.`
      : "";
  const any = input.share.some((v) => v !== null);
  const description = any
    ? `Colour map over the side view of the share of ${n} tool directions, spread evenly over the sphere, from which the flange centre reaches each cell, in bands of 10 %.${half} Blank cells lie outside the flange envelope.`
    : "No cell of the side view lies inside the flange envelope.";
  const caption =
    `Flange centre as the tool point (no tool). Each ${label(g.stepMm)} mm cell shows the share of ${n} tool directions, spread evenly over the sphere, from which the flange centre reaches it with every joint within its range and the roll about the tool axis free: 30 % means 30 % of all directions. ` +
    `A pick from above needs the tool pointing down, one from the side a horizontal tool; a high share says the approach can also tilt well away from either, a low one that few approach directions are left` +
    (downRegion.length > 0
      ? `. The dotted outline marks where the tool pointing straight down is reached (the tool-down speed map): the share alone does not say whether that direction is among those reached.`
      : `; the share alone does not say which directions those are.`);
  return {
    id: input.id,
    title,
    description,
    caption,
    svg: svgRoot(
      {
        id: input.id,
        title,
        description,
        widthPx: finalWidthPx,
        heightPx: layout.heightPx,
        className: "chart-capability",
      },
      parts.join(""),
    ),
    widthPx: finalWidthPx,
    heightPx: layout.heightPx,
  };
}
