/**
 * Standard cycle: one bar per move of the pick-and-place cycle (up, across, down and back), its time in seconds and
 * the joint that sets it.
 */
import { scaleBand, scaleLinear } from "d3-scale";
import { axisBottomSvg } from "./axes";
import { DEFAULT_MARGINS } from "./layout";
import { el, fmt, label, svgRoot, textEl, type ChartResult } from "./svg";

export interface CycleMoveData {
  readonly from: string;
  readonly to: string;
  readonly timeS: number;
  readonly limitingJoint: string;
}

export interface CycleChartInput {
  readonly id: string;
  readonly armName: string;
  readonly moves: readonly CycleMoveData[];
  readonly totalS: number;
  /** The cycle's moves in words, e.g. "up 25 mm, across 300 mm, down 25 mm and back" (the caller knows the cycle). */
  readonly pathText: string;
  readonly widthPx?: number;
}

const ROW_PX = 26;

/**
 * The cycle chart: one <rect class="cycle-bar"> per move.
 * @example cycleChart({ id: "cycle", armName: "Demo", totalS: 0.2, pathText: "up 25 mm, …", moves: [{ from: "A", to: "A up", timeS: 0.1, limitingJoint: "J2" },
 *   { from: "A up", to: "A", timeS: 0.1, limitingJoint: "J2" }] })
 */
export function cycleChart(input: CycleChartInput): ChartResult {
  const widthPx = input.widthPx ?? 600;
  const margins = { ...DEFAULT_MARGINS, top: 34, left: 112, right: 110 };
  const heightPx = margins.top + input.moves.length * ROW_PX + margins.bottom + 6;
  const area = {
    left: margins.left,
    top: margins.top,
    width: widthPx - margins.left - margins.right,
    height: input.moves.length * ROW_PX,
  };
  const tMax = Math.max(...input.moves.map((m) => m.timeS), 1e-3);
  const x = scaleLinear([0, tMax], [area.left, area.left + area.width]).nice();
  const keys = input.moves.map((m, i) => `${i}`);
  const band = scaleBand(keys, [area.top, area.top + area.height]).padding(0.25);

  const parts: string[] = [axisBottomSvg(x, area, { label: "time per move", unit: "s", ticks: 6, grid: true })];
  input.moves.forEach((m, i) => {
    const y0 = band(`${i}`)!;
    const across = m.from.endsWith("up") && m.to.endsWith("up");
    parts.push(
      el("rect", {
        class: across ? "cycle-bar across" : "cycle-bar",
        x: fmt(area.left),
        y: fmt(y0),
        width: fmt(Math.max(1, x(m.timeS) - area.left)),
        height: fmt(band.bandwidth()),
      }),
    );
    parts.push(
      textEl(`${m.from} \u2192 ${m.to}`, {
        class: "bar-label",
        x: fmt(area.left - 8),
        y: fmt(y0 + band.bandwidth() / 2 + 4),
        "text-anchor": "end",
      }),
    );
    parts.push(
      textEl(`${label(m.timeS, 3)} s, ${m.limitingJoint}`, {
        class: "bar-label",
        x: fmt(x(m.timeS) + 6),
        y: fmt(y0 + band.bandwidth() / 2 + 4),
      }),
    );
  });

  const title = `${input.armName}: standard cycle, ${label(input.totalS, 2)} s`;
  const description =
    `Time of each move of the standard cycle (${input.pathText}), in seconds, with the joint that sets it; ` +
    `total ${label(input.totalS, 2)} s. ${input.moves.map((m) => `${m.from} to ${m.to}: ${label(m.timeS, 3)} s (${m.limitingJoint})`).join("; ")}.`;
  const caption =
    "Point-to-point joint moves with trapezoidal speed profiles inside each joint's speed and acceleration limits, all joints finishing together; " +
    "no blending, no dwell, tool pointing down, flange centre as the tool point, no payload dynamics: a lower bound under these assumptions.";
  return {
    id: input.id,
    title,
    description,
    caption,
    svg: svgRoot({ id: input.id, title, description, widthPx, heightPx, className: "chart-cycle" }, parts.join("")),
    widthPx,
    heightPx,
  };
}
