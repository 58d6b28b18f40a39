/**
 * Cycle of a cell study by move: one horizontal stacked bar per arm, seconds from the start of the loop; each move a
 * segment numbered by its step (joint moves and linear moves in two tones), its dwell after it as a lighter dotted
 * segment, the required cycle time as a dashed rule. A node tree (nodes.ts): the cell page writes it as a string, the
 * cell editor appends it with d3-selection. Pure: data in, nodes out.
 */
import { scaleLinear } from "d3-scale";
import type { NodeChart } from "./cellMarks";
import {
  axisBottomNode,
  chartRootNode,
  legendNode,
  legendNodeRows,
  node,
  textNode,
  type NodeLegendItem,
  type SvgNode,
} from "./nodes";
import { textWidthPx } from "./legend";
import { fmt, label } from "./svg";

export interface CellTimeMove {
  readonly step: number;
  readonly from: string;
  readonly to: string;
  readonly motion: "joint" | "linear";
  /** Move time, s; null when the move is infeasible. */
  readonly timeS: number | null;
  readonly dwellS: number;
}

export interface CellTimeRow {
  /** Arm id (data-arm on the row's group). */
  readonly key: string;
  /** Arm name, shown left of the bar when the chart has more than one row. */
  readonly label: string;
  readonly moves: readonly CellTimeMove[];
  /** Σ (move + dwell), s; null when some move is infeasible. */
  readonly cycleTimeS: number | null;
}

export interface CellTimeChartInput {
  readonly id: string;
  readonly title: string;
  readonly rows: readonly CellTimeRow[];
  /** The cell's required cycle time, s, or null. */
  readonly maxCycleS: number | null;
  /** Words added to the caption (what the caller knows: assumed accelerations). */
  readonly captionExtra?: string;
  readonly widthPx?: number;
}

export const CELL_TIME_CHART_WIDTH_PX = 720;
const ROW_PX = 40;
const BAR_PX = 22;
/** Narrowest segment that gets its step number, px. */
const MIN_LABELLED_PX = 15;

const isFeasible = (r: CellTimeRow) => r.cycleTimeS !== null && r.moves.every((m) => m.timeS !== null);

/** Segments of one row: [start, end] s, class, step, what (for the title). */
function segmentsOf(row: CellTimeRow): { t0: number; t1: number; kind: "move" | "dwell"; move: CellTimeMove }[] {
  const out: { t0: number; t1: number; kind: "move" | "dwell"; move: CellTimeMove }[] = [];
  let t = 0;
  for (const m of row.moves) {
    const moveS = m.timeS ?? 0;
    out.push({ t0: t, t1: t + moveS, kind: "move", move: m });
    t += moveS;
    if (m.dwellS > 0) {
      out.push({ t0: t, t1: t + m.dwellS, kind: "dwell", move: m });
      t += m.dwellS;
    }
  }
  return out;
}

function rowNode(row: CellTimeRow, y0: number, x: (t: number) => number, left: number, showLabel: boolean): SvgNode {
  const parts: SvgNode[] = [];
  const mid = y0 + BAR_PX / 2 + 4;
  if (showLabel)
    parts.push(textNode(row.label, { class: "bar-label", x: fmt(left - 8), y: fmt(mid), "text-anchor": "end" }));
  if (!isFeasible(row)) {
    const bad = row.moves.filter((m) => m.timeS === null).map((m) => m.step);
    const text = bad.length
      ? `no cycle time: step${bad.length > 1 ? "s" : ""} ${bad.join(", ")} cannot be done`
      : "no cycle time";
    parts.push(textNode(text, { class: "mark-label muted", x: fmt(left + 4), y: fmt(mid) }));
    return node("g", { class: "ct-row", "data-arm": row.key }, parts);
  }
  for (const s of segmentsOf(row)) {
    const xa = x(s.t0),
      xb = x(s.t1);
    const w = Math.max(0.5, xb - xa);
    const cls = s.kind === "dwell" ? "ct-dwell" : `ct-move ct-${s.move.motion}`;
    const seconds = label(s.t1 - s.t0, 2);
    const what =
      s.kind === "dwell"
        ? `step ${s.move.step}: dwell at ${s.move.to}, ${seconds} s`
        : `step ${s.move.step}: ${s.move.from} to ${s.move.to}, ${s.move.motion} move, ${seconds} s`;
    parts.push(
      node(
        "rect",
        {
          class: cls,
          x: fmt(xa),
          y: fmt(y0),
          width: fmt(w),
          height: BAR_PX,
          "data-step": s.move.step,
          "data-kind": s.kind,
        },
        [{ tag: "title", attrs: {}, text: what }],
      ),
    );
    if (s.kind === "move" && w >= MIN_LABELLED_PX && textWidthPx(String(s.move.step), 10) + 4 <= w)
      parts.push(
        textNode(String(s.move.step), {
          class: `ct-step-label ct-on-${s.move.motion}`,
          x: fmt(xa + w / 2),
          y: fmt(y0 + BAR_PX / 2 + 3.5),
          "text-anchor": "middle",
        }),
      );
  }
  const end = x(row.cycleTimeS!);
  parts.push(textNode(`${label(row.cycleTimeS!, 2)} s`, { class: "bar-label ct-total", x: fmt(end + 6), y: fmt(mid) }));
  return node("g", { class: "ct-row", "data-arm": row.key, "data-cycle-s": row.cycleTimeS! }, parts);
}

/**
 * The chart.
 * @example cellTimeChart({ id: "t", title: "Cycle by move", maxCycleS: 3, rows: [{ key: "a", label: "A",
 *   cycleTimeS: 2.5, moves: [{ step: 1, from: "p", to: "q", motion: "joint", timeS: 1, dwellS: 0.5 },
 *   { step: 2, from: "q", to: "p", motion: "linear", timeS: 1, dwellS: 0 }] }] })
 *   // one bar: move 1 over 0–1 s, dwell 1–1.5 s, move 2 over 1.5–2.5 s; a dashed rule at 3 s
 */
export function cellTimeChart(input: CellTimeChartInput): NodeChart {
  const widthPx = input.widthPx ?? CELL_TIME_CHART_WIDTH_PX;
  const many = input.rows.length > 1;
  const longest = Math.max(0, ...input.rows.map((r) => textWidthPx(r.label, 11)));
  const left = many ? Math.min(220, Math.max(80, longest + 16)) : 18;
  const legend: NodeLegendItem[] = [
    { kind: "fill", className: "ct-move ct-joint", label: "joint move" },
    { kind: "fill", className: "ct-move ct-linear", label: "linear move" },
    { kind: "fill", className: "ct-dwell", label: "dwell" },
  ];
  if (input.maxCycleS !== null)
    legend.push({ kind: "line", className: "ct-limit", label: `required cycle ${label(input.maxCycleS, 2)} s` });
  const legendRows = legendNodeRows(legend, widthPx - 16);
  const top = 30 + legendRows * 17 + 14;
  const right = 64;
  const plotH = Math.max(1, input.rows.length) * ROW_PX;
  const heightPx = top + plotH + 46;
  const area = { left, top, width: widthPx - left - right, height: plotH };
  const tMax = Math.max(1e-3, input.maxCycleS ?? 0, ...input.rows.map((r) => (isFeasible(r) ? r.cycleTimeS! : 0)));
  const x = scaleLinear([0, tMax], [area.left, area.left + area.width]).nice();

  const parts: SvgNode[] = [axisBottomNode(x, area, "time from the start of the loop", "s", 8)];
  input.rows.forEach((row, i) => parts.push(rowNode(row, top + i * ROW_PX + (ROW_PX - BAR_PX) / 2, x, left, many)));
  if (input.maxCycleS !== null) {
    const lx = x(input.maxCycleS);
    parts.push(node("line", { class: "ct-limit", x1: fmt(lx), x2: fmt(lx), y1: fmt(top - 6), y2: fmt(top + plotH) }));
  }
  parts.push(legendNode(legend, 8, 40, widthPx - 16));

  const described = input.rows.map((r) =>
    isFeasible(r)
      ? `${r.label}: ${label(r.cycleTimeS!, 2)} s (${r.moves
          .map((m) => `step ${m.step} ${label(m.timeS!, 2)} s${m.dwellS > 0 ? ` + dwell ${label(m.dwellS, 2)} s` : ""}`)
          .join(", ")})`
      : `${r.label}: no cycle time (a move cannot be done)`,
  );
  const description =
    `Cycle by move, seconds from the start of the loop. ${described.join("; ")}.` +
    (input.maxCycleS !== null ? ` Required cycle: ${label(input.maxCycleS, 2)} s.` : "");
  const caption =
    "Each segment is one move of the loop, numbered by its step as in the moves table (darker: joint move, lighter: " +
    "linear move), then its dwell (dotted). Kinematic figures: no payload dynamics, no blending of corners, no gripper " +
    "or I/O time beyond the dwells given: a lower bound of the real cycle." +
    (input.captionExtra ? ` ${input.captionExtra}` : "");
  const root = chartRootNode(
    { id: input.id, title: input.title, description, widthPx, heightPx, className: "chart-cell-time" },
    parts,
  );
  return { id: input.id, title: input.title, description, caption, node: root };
}
