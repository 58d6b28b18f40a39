/**
 * Load diagram: curves of equal payload mass over the centre-of-gravity offset from the flange, across the flange
 * axis (Lxy, horizontal) and along it (Lz, vertical), both in mm at one scale; each mass its own colour and dash
 * pattern, labelled on the curve and in the legend.
 */
import { axisBottomSvg, axisLeftSvg } from "./axes";
import { polylinesPath, type PointData } from "./geometry";
import { DEFAULT_MARGINS, equalScale } from "./layout";
import { legendRows, legendSvg, type LegendItem } from "./legend";
import { seriesClass } from "./theme";
import { el, fmt, label, svgRoot, textEl, type ChartResult } from "./svg";

export interface LoadCurveData {
  readonly massKg: number;
  readonly fractionOfRated: number;
  /** [LxyMm, LzMm] from Lz = 0 to the Lz axis; empty when the mass is not allowed even at zero offset. */
  readonly pointsMm: readonly PointData[];
  readonly openEnded: boolean;
}

export interface LoadDiagramChartInput {
  readonly id: string;
  readonly armName: string;
  readonly curves: readonly LoadCurveData[];
  readonly ratedPayloadKg: number;
  readonly widthPx?: number;
  readonly maxHeightPx?: number;
}

export const LOAD_DIAGRAM_WIDTH_PX = 600;

/**
 * The load-diagram chart: one <path class="series series-i"> per drawable curve, heaviest first.
 * @example loadDiagramChart({ id: "load", armName: "Demo", ratedPayloadKg: 7,
 *   curves: [{ massKg: 7, fractionOfRated: 1, pointsMm: [[130, 0], [0, 50]], openEnded: false }] })
 */
export function loadDiagramChart(input: LoadDiagramChartInput): ChartResult {
  const widthPx = input.widthPx ?? LOAD_DIAGRAM_WIDTH_PX;
  const curves = input.curves
    .filter((c) => c.pointsMm.length >= 2)
    .slice()
    .sort((a, b) => b.massKg - a.massKg);
  const missing = input.curves.filter((c) => c.pointsMm.length < 2);
  const legend: LegendItem[] = curves.map((c, i) => ({
    kind: "line",
    className: seriesClass(i),
    label: `${label(c.massKg, 2)} kg${c.fractionOfRated === 1 ? " (rated)" : ` (${label(c.fractionOfRated * 100)} %)`}`,
  }));
  const rows = legendRows(legend, widthPx - 16);
  const margins = { ...DEFAULT_MARGINS, top: 30 + rows * 17 + 10, right: 24 };
  let xMax = 1,
    yMax = 1;
  for (const c of curves) {
    for (const [lxy, lz] of c.pointsMm) {
      xMax = Math.max(xMax, lxy);
      yMax = Math.max(yMax, lz);
    }
  }
  const layout = equalScale([0, xMax * 1.08], [0, yMax * 1.08], {
    widthPx,
    maxHeightPx: input.maxHeightPx ?? 520,
    minHeightPx: 300,
    margins,
    padShare: 0,
  });
  const { area } = layout;
  // Keep the origin at the lower left corner: shift the widened domains to start at 0.
  const xs = layout.x.copy().domain([0, layout.x.domain()[1]! - layout.x.domain()[0]!]);
  const ys = layout.y.copy().domain([0, layout.y.domain()[1]! - layout.y.domain()[0]!]);

  const parts: string[] = [];
  parts.push(
    axisBottomSvg(xs, area, { label: "CG offset across the flange axis, Lxy", unit: "mm", ticks: 7, grid: true }),
  );
  parts.push(axisLeftSvg(ys, area, { label: "CG offset along the flange axis, Lz", unit: "mm", ticks: 7, grid: true }));
  curves.forEach((c, i) => {
    const d = polylinesPath([c.pointsMm], xs, ys, 0.2);
    if (d) parts.push(el("path", { class: seriesClass(i), d, "data-mass-kg": fmt(c.massKg, 3) }));
    // Labels at staggered places along the curves, so curves that run side by side keep their labels apart.
    const mid = c.pointsMm[Math.min(c.pointsMm.length - 1, Math.floor(c.pointsMm.length * (0.12 + 0.14 * (i % 6))))]!;
    parts.push(
      textEl(`${label(c.massKg, 1)} kg`, { class: "series-label", x: fmt(xs(mid[0]) + 4), y: fmt(ys(mid[1]) - 4) }),
    );
  });
  parts.push(legendSvg(legend, 8, 40, widthPx - 16).svg);

  const title = `${input.armName}: load diagram`;
  const description =
    curves.length > 0
      ? `Curves of equal payload mass against the centre-of-gravity offset from the flange: across the flange axis (Lxy, horizontal) and along it (Lz, vertical), in millimetres at one scale. ` +
        `Masses drawn: ${curves.map((c) => `${label(c.massKg, 2)} kg`).join(", ")}; a load is allowed when its CG lies inside the curve of its mass.` +
        (missing.length > 0
          ? ` Not allowed even at zero offset: ${missing.map((c) => `${label(c.massKg, 2)} kg`).join(", ")}.`
          : "")
      : "No mass of the diagram is allowed by the wrist ratings, even at zero offset.";
  const open = curves.some((c) => c.openEnded)
    ? " Curves that run off the top of the chart continue: their limit does not depend on Lz (a roll rating alone)."
    : "";
  const caption =
    "From the declared wrist moment (M ≥ m·g·L) and inertia (J ≥ m·L², point mass) ratings, capped at the rated payload. " +
    "Static: excludes acceleration; the load's own inertia about its CG is not included; gripper, tooling and part all count as payload." +
    open;
  return {
    id: input.id,
    title,
    description,
    caption,
    svg: svgRoot(
      { id: input.id, title, description, widthPx: layout.widthPx, heightPx: layout.heightPx, className: "chart-load" },
      parts.join(""),
    ),
    widthPx: layout.widthPx,
    heightPx: layout.heightPx,
  };
}
