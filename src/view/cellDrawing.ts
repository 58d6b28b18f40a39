/**
 * The cell drawings' data (pure): targets, the loop's path and each arm's base and reach outline, projected on the
 * top view (cell x, y) or the side view (cell x, z, seen from −y), with captions that say what the outline is.
 * Used by the cell page at build time and by the cell editor in the browser.
 */
import { fromXyzRpyInto, degToRad, resolveTargets, transformPointInto, type CellSpec } from "../core";
import type { CellLayoutBase, CellLayoutInput, CellLayoutSegment, ReachOutline } from "../charts/cellLayoutChart";
import { MAX_OVERLAY_ARMS } from "../charts/compareCharts";
import { formatQuantity } from "./format";

/** What the drawing takes from an arm's analysis summary (`reach`, `envelope.axis1`), base frame, mm. */
export interface CellArmReach {
  /** Largest horizontal distance of the flange centre from axis 1 (no tool), mm. */
  readonly flangeMaxMm: number | null;
  /** Axis 1 in the arm's base frame; null when the first joint does not turn the arm about a fixed axis. */
  readonly axis1: { readonly pointMm: readonly number[]; readonly direction: readonly number[] } | null;
}

export interface CellDrawingArm {
  readonly id: string;
  readonly name: string;
  /** Beside the base's mark, e.g. the model alone ("Tern 12"); the name when absent. */
  readonly shortName?: string;
  /** Null when the arm's analysis is not at hand: the base is drawn without an outline. */
  readonly reach: CellArmReach | null;
}

type V3 = [number, number, number];

/** The base frame of an arm in the cell frame (its own placement or the cell's), row-major 4×4 in mm. */
export function cellFromBaseMm(cell: Pick<CellSpec, "placement" | "placements">, armId: string): Float64Array {
  const pl = cell.placements?.[armId] ?? cell.placement;
  const [x, y, z] = pl.positionMm;
  const [r, p, w] = pl.rpyDeg;
  return fromXyzRpyInto(new Float64Array(16), x, y, z, degToRad(r), degToRad(p), degToRad(w));
}

const apply = (t: Float64Array, v: readonly number[]): V3 => {
  const out = new Float64Array(3);
  transformPointInto(out, 0, t, v[0]!, v[1]!, v[2]!);
  return [out[0]!, out[1]!, out[2]!];
};
const rotate = (t: Float64Array, v: readonly number[]): V3 => [
  t[0]! * v[0]! + t[1]! * v[1]! + t[2]! * v[2]!,
  t[4]! * v[0]! + t[5]! * v[1]! + t[6]! * v[2]!,
  t[8]! * v[0]! + t[9]! * v[1]! + t[10]! * v[2]!,
];

/** Axis 1 in the cell frame when it is vertical (floor or ceiling), else null. */
export function verticalAxis1(cellFromBase: Float64Array, reach: CellArmReach | null): V3 | null {
  if (!reach?.axis1 || reach.flangeMaxMm === null) return null;
  const d = rotate(cellFromBase, reach.axis1.direction);
  if (Math.abs(Math.abs(d[2]) - 1) > 1e-6) return null;
  return apply(cellFromBase, reach.axis1.pointMm);
}

function outlineOf(view: "top" | "side", axis: V3 | null, rMm: number | null, baseZ: number): ReachOutline | null {
  if (!axis || rMm === null) return null;
  if (view === "top") return { kind: "circle", c: [axis[0], axis[1]], rMm };
  // Side view: the same bound on either side of axis 1, drawn at the base's height (heights are not bounded by it).
  return { kind: "span", x: [axis[0] - rMm, axis[0] + rMm], y: baseZ };
}

/** The loop's path: step i goes from step i−1's target (the last step's before the first) to its own. */
export function pathOf(
  cell: Pick<CellSpec, "targets" | "cycle">,
): { from: V3; to: V3; motion: "joint" | "linear"; step: number }[] {
  const pos = new Map(resolveTargets(cell.targets).map((t) => [t.name, t.positionMm as readonly number[]]));
  const n = cell.cycle.length;
  const out: { from: V3; to: V3; motion: "joint" | "linear"; step: number }[] = [];
  cell.cycle.forEach((s, i) => {
    const a = pos.get(cell.cycle[(i - 1 + n) % n]!.to);
    const b = pos.get(s.to);
    if (a && b) out.push({ from: [a[0]!, a[1]!, a[2]!], to: [b[0]!, b[1]!, b[2]!], motion: s.motion, step: i + 1 });
  });
  return out;
}

function caption(view: "top" | "side", tcpMm: number, skipped: readonly string[], many: boolean): string {
  const tool = `the tool point can lie up to ${formatQuantity(tcpMm, "mm")} (the tool offset) beyond it`;
  const what =
    view === "top"
      ? `Circles: the largest horizontal distance of each arm's flange centre from its axis 1, from the arm's ` +
        `computed envelope (no tool; ${tool}). It bounds where the flange centre can be in plan; it is not the ` +
        `reach set at the targets' orientations: whether each target is reached is in the targets tables.`
      : `Horizontal bars at each base's height: the same largest distance of the flange centre from axis 1, on ` +
        `either side of the axis (no tool; ${tool}); bars that coincide are drawn a few pixels apart, and a bar without an end tick runs on beyond the drawing. Heights are ` +
        `not bounded by them. Whether each target is reached is in the targets tables.`;
  const skippedText = skipped.length
    ? ` No outline for ${skipped.join(", ")}: axis 1 is not vertical at this placement, or the arm has no fixed first turning axis.`
    : "";
  const overflow = many ? ` Only the first ${MAX_OVERLAY_ARMS} arms are drawn.` : "";
  return (
    `${view === "top" ? "Looking down on the cell" : "Looking at the cell from −y"}, to scale. Targets are tool-point ` +
    `positions; linear moves are drawn solid, joint moves dashed and straight (a joint move's real tool path is ` +
    `curved). Squares: each arm's base at its placement. ${what}${skippedText}${overflow} Collisions are not checked.`
  );
}

/**
 * The two drawings of a cell for the arms given (at most six drawn: one line style each).
 * @example cellDrawings(cell, [{ id: "a", name: "A", reach: { flangeMaxMm: 1200, axis1: { pointMm: [0, 0, 0],
 *   direction: [0, 0, 1] } } }], "cell").top.bases[0].outline // circle about the placement's (x, y), r 1200 mm
 */
export function cellDrawings(
  cell: CellSpec,
  arms: readonly CellDrawingArm[],
  idPrefix: string,
): { top: CellLayoutInput; side: CellLayoutInput } {
  const drawn = arms.slice(0, MAX_OVERLAY_ARMS);
  const targets = resolveTargets(cell.targets);
  const path = pathOf(cell);
  const skipped: string[] = [];
  const frames = drawn.map((a, i) => {
    const t = cellFromBaseMm(cell, a.id);
    const axis = verticalAxis1(t, a.reach);
    if (!axis) skipped.push(a.name);
    return { arm: a, i, base: apply(t, [0, 0, 0]), axis, rMm: a.reach?.flangeMaxMm ?? null };
  });
  const tcpMm = Math.hypot(...cell.tool.tcp.xyzMm);
  const side = (v: V3): [number, number] => [v[0], v[2]];
  const top = (v: V3): [number, number] => [v[0], v[1]];
  const build = (view: "top" | "side"): CellLayoutInput => {
    const proj = view === "top" ? top : side;
    const segments: CellLayoutSegment[] = path.map((s) => ({
      a: proj(s.from),
      b: proj(s.to),
      motion: s.motion,
      step: s.step,
    }));
    const bases: CellLayoutBase[] = frames.map((f) => {
      const outline = outlineOf(view, f.axis, f.rMm, f.base[2]);
      return {
        key: f.arm.id,
        label: f.arm.name,
        shortLabel: f.arm.shortName ?? f.arm.name,
        p: proj(f.base),
        series: f.i,
        outline,
      };
    });
    return {
      id: `${idPrefix}-${view}`,
      title: view === "top" ? "Cell, top view" : "Cell, side view",
      axes: view === "top" ? { x: "cell x", y: "cell y" } : { x: "cell x", y: "height, cell z" },
      targets: targets.map((t) => ({ name: t.name, p: proj(t.positionMm as V3) })),
      segments,
      bases,
      floor: view === "side",
      caption: caption(view, tcpMm, skipped, arms.length > drawn.length),
    };
  };
  return { top: build("top"), side: build("side") };
}

/** The drawing's part of an arm's analysis summary (or full analysis). */
export function cellArmReachOf(analysis: {
  readonly reach: { readonly flangeMaxMm: number | null };
  readonly envelope: { readonly axis1: CellArmReach["axis1"] };
}): CellArmReach {
  return { flangeMaxMm: analysis.reach.flangeMaxMm, axis1: analysis.envelope.axis1 };
}
