/**
 * Singularity chart: the loci (zero crossings of det J) over the region reached with one tool orientation, each kind
 * its own colour and dash pattern with a legend, and the cells close to a singularity (low inverse condition) hatched.
 */
import { axisBottomSvg, axisLeftSvg } from "./axes";
import {
  dilateGrid,
  gridBands,
  polygonsPath,
  polylinesPath,
  presentRegion,
  type GridData,
  type PointData,
} from "./geometry";
import type { EnvelopeLayoutKind } from "./envelopeChart";
import { MIN_MAP_WIDTH_PX, mappedBox, mappedRect, sideMapLayout } from "./speedMapChart";
import { legendRows, legendSvg, type LegendItem } from "./legend";
import { LOCUS_KINDS, LOCUS_LABEL, NEAR_SINGULAR_INVERSE_CONDITION, locusClass, type LocusKind } from "./theme";
import { axis1LineSvg, el, fmt, label, svgRoot, textEl, type ChartResult } from "./svg";

export interface LocusData {
  readonly kind: string;
  readonly polylinesMm: readonly (readonly PointData[])[];
}

export interface SingularityChartInput {
  readonly id: string;
  readonly armName: string;
  /** "tool pointing down" (legend, caption). */
  readonly orientationLabel: string;
  /** "tool down" (title). */
  readonly orientationShort: string;
  readonly layout: EnvelopeLayoutKind;
  readonly grid: GridData;
  /** Any per-cell value of the map, row-major: null where the pose is not reached (defines the region drawn). */
  readonly reached: readonly (number | null)[];
  /** σ_min/σ_max of the scaled Jacobian per cell (null unreached); cells below the threshold are hatched. */
  readonly inverseCondition?: readonly (number | null)[] | null;
  /** Loci of this orientation. Kinds other than wrist, shoulder and elbow are drawn as "other". */
  readonly loci: readonly LocusData[];
  /** Length that scales the linear rows of J, mm (stated in the caption). */
  readonly lengthScaleMm?: number | null;
  readonly widthPx?: number;
  readonly maxHeightPx?: number;
}

export const SINGULARITY_CHART_WIDTH_PX = 600;

function kindOf(kind: string): LocusKind {
  return (LOCUS_KINDS as readonly string[]).includes(kind) ? (kind as LocusKind) : "other";
}

/**
 * The singularity chart: one <path class="locus locus-<kind>"> per kind present.
 * @example singularityChart({ id: "sing-down", armName: "Demo", orientationLabel: "tool pointing down", layout: "revolute-base",
 *   grid, reached, loci: [{ kind: "wrist", polylinesMm: [[[100, 0], [100, 400]]] }] })
 *   // one wrist path, a vertical line at r = 100 mm
 */
export function singularityChart(input: SingularityChartInput): ChartResult {
  const widthPx = input.widthPx ?? SINGULARITY_CHART_WIDTH_PX;
  const g = input.grid;
  const revolute = input.layout === "revolute-base";
  const hatchId = `${input.id}-hatch`;

  const byKind = new Map<LocusKind, PointData[][]>();
  for (const locus of input.loci) {
    const k = kindOf(locus.kind);
    const list = byKind.get(k) ?? [];
    for (const pl of locus.polylinesMm) list.push(pl.slice());
    byKind.set(k, list);
  }
  const kinds = LOCUS_KINDS.filter((k) => (byKind.get(k)?.length ?? 0) > 0);

  const near = input.inverseCondition
    ? (gridBands(
        g,
        dilateGrid(
          g,
          input.inverseCondition.map((v) => (v === null ? null : -v)),
        ),
        [-NEAR_SINGULAR_INVERSE_CONDITION],
      )[0]?.polygons ?? [])
    : [];
  const reachedPolys = presentRegion(g, input.reached);
  const reachId = `${input.id}-reached`;

  const legend: LegendItem[] = [
    { kind: "fill", className: "reached-region", label: `reached with the ${input.orientationLabel}` },
  ];
  if (near.length > 0) {
    legend.push({
      kind: "fill",
      className: "near-singular",
      patternId: hatchId,
      label: `near a singularity (inverse condition < ${label(NEAR_SINGULAR_INVERSE_CONDITION, 2)})`,
    });
  }
  for (const k of kinds) legend.push({ kind: "line", className: locusClass(k), label: `${LOCUS_LABEL[k]}` });
  const box = mappedBox(g);
  const showAxis1 = revolute && box.x0 <= 0 && box.x1 >= 0;
  if (showAxis1) legend.push({ kind: "line", className: "axis1", label: "axis 1" });
  const rows = legendRows(legend, MIN_MAP_WIDTH_PX - 16);
  const layout = sideMapLayout(box, widthPx, input.maxHeightPx, 30 + rows * 17 + 10);
  const { x, y, area } = layout;
  const finalWidthPx = layout.widthPx;

  const parts: string[] = [];
  const reachedD = polygonsPath(reachedPolys, x, y);
  parts.push(
    `<defs><pattern id="${hatchId}" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">` +
      `${el("line", { class: "hatch-line", x1: 0, y1: 0, x2: 0, y2: 6 })}</pattern>` +
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
  if (reachedD) parts.push(el("path", { class: "reached-region", d: reachedD, "fill-rule": "evenodd" }));
  const nearD = polygonsPath(near, x, y);
  if (nearD)
    parts.push(
      el("path", {
        class: "near-singular",
        d: nearD,
        "fill-rule": "evenodd",
        fill: `url(#${hatchId})`,
        "clip-path": `url(#${reachId})`,
      }),
    );
  if (showAxis1) {
    parts.push(axis1LineSvg(x(0), area));
  }
  for (const k of kinds) {
    const d = polylinesPath(byKind.get(k)!, x, y);
    if (d) parts.push(el("path", { class: locusClass(k), d, "data-kind": k }));
  }
  if (kinds.length === 0) {
    parts.push(
      textEl("no singular loci inside the reached region", {
        class: "mark-label",
        x: fmt(area.left + area.width / 2),
        y: fmt(area.top + 16),
        "text-anchor": "middle",
      }),
    );
  }
  parts.push(mappedRect(box, x, y, "mapped-area"));
  parts.push(legendSvg(legend, 8, 40, MIN_MAP_WIDTH_PX - 16).svg);

  const title = `${input.armName}: singularities, ${input.orientationShort}`;
  const kindWords =
    kinds.length > 0
      ? `Loci drawn: ${kinds.map((k) => LOCUS_LABEL[k]).join("; ")}.`
      : "No singular loci lie inside the reached region.";
  const description =
    `Side view of the region the flange centre reaches with the ${input.orientationLabel}. ${kindWords}` +
    (near.length > 0 ? ` Hatched cells are close to a singularity.` : "");
  const scaleWords = input.lengthScaleMm
    ? ` (linear rows of the Jacobian divided by ${label(input.lengthScaleMm)} mm)`
    : "";
  const caption =
    `Loci: where det J changes sign along continuous inverse-kinematics solutions, named by the joints that move without moving the tool. ` +
    `Hatched: inverse condition σmin/σmax below ${label(NEAR_SINGULAR_INVERSE_CONDITION, 2)}${scaleWords}, where straight-line speed falls. ` +
    `Flange centre as the tool point, ${input.orientationLabel}, best branch per cell${revolute ? "; turned about axis 1, each locus is a surface" : ""}.`;
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
        className: "chart-singularity",
      },
      parts.join(""),
    ),
    widthPx: finalWidthPx,
    heightPx: layout.heightPx,
  };
}
