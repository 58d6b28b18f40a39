/**
 * Choice of an arm's standard straight lines from its published "tool down" speed map (the side view of the flange
 * positions it reaches with the tool pointing along gravity):
 * - "front": level, across the front of the arm at mid height (a conveyor-tracking or dispensing pass);
 * - "axis1": level, passing close to axis 1 away from the base plate (the shoulder region, where axis 1 must spin);
 * - "edge": level, straight out from axis 1 to just inside the edge of the reach (the arm stretching out).
 * Arms whose first joint is linear (gantries) have no axis 1: "front" and "edge" come from the top view instead.
 * Every line holds the tool down. Coordinates are whole millimetres in the base frame, so the sheet, the form and
 * `armdex line` reproduce the figures exactly. The choices are common practice for a first look, no source.
 */
import type { Axis1, EnvelopeLayout } from "../envelope/envelope";

export type StandardLineKey = "front" | "axis1" | "edge";

/** Where a line was placed, in numbers (the view words them). Lengths in mm; heights along axis 1 (map z). */
export type StandardLinePlacement =
  /** Across the front, crossing in front of the arm rMm from axis 1. */
  | { readonly kind: "across"; readonly rMm: number; readonly zMm: number }
  /** Straight out in front of the arm (the region was too narrow to cross it). */
  | { readonly kind: "radial"; readonly zMm: number }
  /** Passing dMm from axis 1; `closest`: as close as the arm reaches there (d0 was not reachable). */
  | { readonly kind: "near-axis1"; readonly dMm: number; readonly zMm: number; readonly closest: boolean }
  /** Straight out to endMm from axis 1, insideEdgeMm inside the edge of the tool-down reach. */
  | { readonly kind: "to-edge"; readonly endMm: number; readonly insideEdgeMm: number; readonly zMm: number }
  /** Gantry: along base y at x = xMm. */
  | { readonly kind: "area-across"; readonly xMm: number; readonly zMm: number }
  /** Gantry: along base x from the middle to marginMm inside the end of the travel. */
  | { readonly kind: "area-out"; readonly marginMm: number; readonly zMm: number };

export interface StandardLineSpec {
  readonly key: StandardLineKey;
  readonly placement: StandardLinePlacement;
  readonly fromMm: readonly [number, number, number];
  readonly toMm: readonly [number, number, number];
}

/** Why a line is missing, as a code (the view words it). */
export type StandardLineNote =
  | { readonly code: "no-tool-down-region" }
  | { readonly code: "region-too-small" }
  | { readonly code: "no-top-view" }
  | { readonly code: "too-short"; readonly key: StandardLineKey; readonly placement: StandardLinePlacement["kind"] }
  | { readonly code: "no-line-near-axis1" }
  | { readonly code: "no-axis1" };

/** What the choice reads of an analysis (the published map grid and the envelope). */
export interface StandardLineSource {
  readonly downMap: {
    readonly grid: {
      readonly nx: number;
      readonly ny: number;
      readonly rMinMm: number;
      readonly zMinMm: number;
      readonly stepMm: number;
    };
    readonly reachableCells: number;
    /** Row-major over grid; null where the flange cannot reach with the tool down. */
    readonly guaranteedMmPerS: readonly (number | null)[];
  } | null;
  readonly flangeMaxMm: number | null;
  readonly layout: EnvelopeLayout;
  readonly axis1: Axis1 | null;
  /** Outer rings of the flange's top view, mm. */
  readonly flangeTopMm: readonly (readonly (readonly [number, number])[])[];
}

type Vec3 = [number, number, number];

/** Side-view plane of the speed maps: origin on axis 1, radial = base x made perpendicular to axis 1, up = axis 1
 * pointing to base +z (or +x). Map cell (r, z) is o + r·radial moved along up to height z. */
interface Plane {
  readonly o: Vec3;
  readonly radial: Vec3;
  readonly up: Vec3;
  readonly lateral: Vec3;
}

const dot = (a: readonly number[], b: readonly number[]) => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
const cross = (a: readonly number[], b: readonly number[]): Vec3 => [
  a[1]! * b[2]! - a[2]! * b[1]!,
  a[2]! * b[0]! - a[0]! * b[2]!,
  a[0]! * b[1]! - a[1]! * b[0]!,
];

function planeOf(axis: Axis1 | null): Plane {
  if (!axis) return { o: [0, 0, 0], radial: [1, 0, 0], up: [0, 0, 1], lateral: [0, 1, 0] };
  let [zx, zy, zz] = axis.direction;
  const sign = Math.abs(zz) > 1e-9 ? Math.sign(zz) : Math.sign(zx) || 1;
  zx *= sign;
  zy *= sign;
  zz *= sign;
  let r: Vec3 = [1 - zx * zx, -zx * zy, -zx * zz];
  if (Math.hypot(...r) < 1e-6) r = [-zy * zx, 1 - zy * zy, -zy * zz];
  const rn = Math.hypot(...r);
  const radial: Vec3 = [r[0] / rn, r[1] / rn, r[2] / rn];
  const up: Vec3 = [zx, zy, zz];
  const p = axis.pointMm;
  const t = -dot(p, up);
  return { o: [p[0] + t * zx, p[1] + t * zy, p[2] + t * zz], radial, up, lateral: cross(up, radial) };
}

/** Base-frame point (whole mm) at distance r from axis 1 along the radial direction, `side` mm sideways, height z. */
function pointAt(plane: Plane, rMm: number, sideMm: number, zMm: number): Vec3 {
  const p0: Vec3 = [0, 1, 2].map((i) => plane.o[i]! + rMm * plane.radial[i]! + sideMm * plane.lateral[i]!) as Vec3;
  const h0 = dot(p0, plane.up);
  return [0, 1, 2].map((i) => Math.round(p0[i]! + (zMm - h0) * plane.up[i]!) + 0) as Vec3;
}

type DownMap = NonNullable<StandardLineSource["downMap"]>;

/** Runs of reachable cells along one row of the map with r ≥ 0, as [rFirst, rLast] in mm. */
function rowRuns(map: DownMap, iy: number): [number, number][] {
  const g = map.grid;
  const runs: [number, number][] = [];
  let start: number | null = null;
  for (let ix = 0; ix <= g.nx; ix++) {
    const r = g.rMinMm + ix * g.stepMm;
    const ok = ix < g.nx && r >= 0 && map.guaranteedMmPerS[ix + iy * g.nx] !== null;
    if (ok && start === null) start = r;
    if (!ok && start !== null) {
      runs.push([start, r - g.stepMm]);
      start = null;
    }
  }
  return runs;
}

const floorTo = (v: number, step: number) => Math.floor(v / step) * step;
const ceilTo = (v: number, step: number) => Math.ceil(v / step) * step;
const roundTo = (v: number, step: number) => Math.round(v / step) * step;

/** Lines shorter than this are left out, mm. */
export const MIN_STANDARD_LINE_MM = 10;

interface Row {
  readonly iy: number;
  readonly z: number;
  readonly runs: [number, number][];
}

/** Collects lines and notes; a line shorter than MIN_STANDARD_LINE_MM becomes a note. */
class Picks {
  readonly lines: StandardLineSpec[] = [];
  readonly notes: StandardLineNote[] = [];
  add(key: StandardLineKey, placement: StandardLinePlacement, fromMm: Vec3, toMm: Vec3): void {
    const lengthMm = Math.hypot(toMm[0] - fromMm[0], toMm[1] - fromMm[1], toMm[2] - fromMm[2]);
    if (lengthMm < MIN_STANDARD_LINE_MM) this.notes.push({ code: "too-short", key, placement: placement.kind });
    else this.lines.push({ key, placement, fromMm, toMm });
  }
}

/** What the three revolute-base choices share: the rows of the tool-down map and the line margins, mm. */
interface Choice {
  readonly rows: readonly Row[];
  readonly zMid: number;
  readonly reach: number;
  readonly margin: number;
  readonly step: number;
  readonly plane: Plane;
  readonly picks: Picks;
}

/** Gantry-like arms: the top view of the flange gives the working area; heights from the map. */
function chooseOnArea(source: StandardLineSource, stepMm: number, zMid: number, picks: Picks): void {
  const pts = source.flangeTopMm.flat();
  if (pts.length === 0) {
    picks.notes.push({ code: "no-top-view" });
    return;
  }
  const xs = pts.map((p) => p[0]),
    ys = pts.map((p) => p[1]);
  const [x0, x1, y0, y1] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
  const m = Math.max(stepMm, 0.02 * Math.max(x1 - x0, y1 - y0));
  const z = roundTo(zMid, 5);
  const xc = roundTo((x0 + x1) / 2, 5),
    yc = roundTo((y0 + y1) / 2, 5);
  picks.add("front", { kind: "area-across", xMm: xc, zMm: z }, [xc, ceilTo(y0 + m, 5), z], [xc, floorTo(y1 - m, 5), z]);
  picks.add("edge", { kind: "area-out", marginMm: m, zMm: z }, [xc, yc, z], [floorTo(x1 - m, 5), yc, z]);
  picks.notes.push({ code: "no-axis1" });
}

/** 1. Across the front at mid height: the row nearest mid height with a long enough run. */
function chooseFront({ rows, zMid, reach, margin, step, plane, picks }: Choice): void {
  const longest = Math.max(...rows.map((r) => Math.max(...r.runs.map(([a, b]) => b - a))));
  const byMid = [...rows].sort((a, b) => Math.abs(a.z - zMid) - Math.abs(b.z - zMid));
  const frontRow = byMid.find((r) => r.runs.some(([a, b]) => b - a >= 0.25 * longest)) ?? byMid[0]!;
  const [a, b] = frontRow.runs.reduce((best, run) => (run[1] - run[0] > best[1] - best[0] ? run : best));
  const rc = roundTo((a + b) / 2, 5);
  const outer = b - margin;
  const half = floorTo(Math.min(outer > rc ? Math.sqrt(outer * outer - rc * rc) : 0, 0.4 * reach, rc), 5);
  const z = frontRow.z;
  if (half >= 2 * step) {
    picks.add("front", { kind: "across", rMm: rc, zMm: z }, pointAt(plane, rc, -half, z), pointAt(plane, rc, half, z));
  } else {
    const r0 = ceilTo(a + margin, 5),
      r1 = floorTo(b - margin, 5);
    picks.add("front", { kind: "radial", zMm: z }, pointAt(plane, r0, 0, z), pointAt(plane, r1, 0, z));
  }
}

/** 2. Close to axis 1, away from the base plate: the row where a line passing d from axis 1 can be longest. */
function chooseNearAxis1({ rows, reach, margin, step, plane, picks }: Choice): void {
  const d0 = ceilTo(Math.max(2 * step, 0.04 * reach), 5);
  const clearance = 0.25 * reach;
  const candidates = (minZ: number) =>
    rows
      .filter((r) => r.z >= minZ)
      .map((r) => {
        // The run that holds d0, else the run nearest axis 1 (the line passes as close as the arm reaches).
        const holding = r.runs.find(([a, b]) => a <= d0 && b - margin > d0);
        const run = holding ?? r.runs[0]!;
        const d = holding ? d0 : ceilTo(run[0] + margin, 5);
        const outer = run[1] - margin;
        const half = outer > d ? floorTo(Math.min(Math.sqrt(outer * outer - d * d), 0.4 * reach), 5) : 0;
        return { z: r.z, d, half, close: holding !== undefined };
      })
      .filter((c) => c.half >= 2 * step);
  let found = candidates(clearance);
  if (found.length === 0) found = candidates(0);
  if (found.length === 0) {
    picks.notes.push({ code: "no-line-near-axis1" });
    return;
  }
  if (found.some((c) => c.close)) found = found.filter((c) => c.close);
  const minD = Math.min(...found.map((c) => c.d));
  found = found.filter((c) => c.d === minD);
  const bestHalf = Math.max(...found.map((c) => c.half));
  const good = found.filter((c) => c.half >= 0.95 * bestHalf);
  const pick = good[Math.floor((good.length - 1) / 2)]!;
  picks.add(
    "axis1",
    { kind: "near-axis1", dMm: pick.d, zMm: pick.z, closest: !pick.close },
    pointAt(plane, pick.d, -pick.half, pick.z),
    pointAt(plane, pick.d, pick.half, pick.z),
  );
}

/** 3. Out to the edge of the reach: the rows reaching furthest out (the middle one), radial, ending inside the edge. */
function chooseEdge({ rows, reach, step, picks, plane, margin }: Choice): void {
  const outerOf = (r: Row) => Math.max(...r.runs.map(([, b]) => b));
  const rMax = Math.max(...rows.map(outerOf));
  const far = rows.filter((r) => outerOf(r) >= rMax - step);
  const row = far[Math.floor((far.length - 1) / 2)]!;
  const run = row.runs.reduce((best, x) => (x[1] > best[1] ? x : best));
  const end = floorTo(run[1] - step, 5);
  const start = ceilTo(Math.max(run[0] + margin, end - 0.3 * reach), 5);
  picks.add(
    "edge",
    { kind: "to-edge", endMm: end, insideEdgeMm: rMax - end, zMm: row.z },
    pointAt(plane, start, 0, row.z),
    pointAt(plane, end, 0, row.z),
  );
}

/**
 * Chooses the standard lines of an arm (see the module comment). Lines that cannot be placed are left out, with a
 * note.
 * @example chooseStandardLines(sourceOf(analysis)).lines.map((l) => l.key) // ["front", "axis1", "edge"] for a 6R arm
 */
export function chooseStandardLines(source: StandardLineSource): {
  lines: StandardLineSpec[];
  notes: StandardLineNote[];
} {
  const map = source.downMap;
  if (!map || map.reachableCells === 0) return { lines: [], notes: [{ code: "no-tool-down-region" }] };
  const g = map.grid;
  const reach = source.flangeMaxMm ?? g.rMinMm + g.nx * g.stepMm;
  const rows: Row[] = Array.from({ length: g.ny }, (_, iy) => ({
    iy,
    z: g.zMinMm + iy * g.stepMm,
    runs: rowRuns(map, iy).filter(([a, b]) => b - a >= 2 * g.stepMm),
  })).filter((r) => r.runs.length > 0);
  if (rows.length === 0) return { lines: [], notes: [{ code: "region-too-small" }] };
  const zMid = (rows[0]!.z + rows[rows.length - 1]!.z) / 2;
  const margin = Math.max(g.stepMm, 0.02 * reach);
  const picks = new Picks();
  if (source.layout !== "revolute-base") {
    chooseOnArea(source, g.stepMm, zMid, picks);
    return { lines: picks.lines, notes: picks.notes };
  }
  const choice: Choice = { rows, zMid, reach, margin, step: g.stepMm, plane: planeOf(source.axis1), picks };
  chooseFront(choice);
  chooseNearAxis1(choice);
  chooseEdge(choice);
  return { lines: picks.lines, notes: picks.notes };
}
