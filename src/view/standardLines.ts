/**
 * Standard straight lines for an arm sheet, chosen from the arm's own "tool down" speed map (the side view of the
 * flange positions it reaches with the tool pointing along gravity), then checked with the core's lineCheck at
 * build time:
 * - "front": level, across the front of the arm at mid height (a conveyor-tracking or dispensing pass);
 * - "axis1": level, passing close to axis 1 away from the base plate (the shoulder region, where axis 1 must spin);
 * - "edge": level, straight out from axis 1 to just inside the edge of the reach (the arm stretching out).
 * Arms whose first joint is linear (gantries) have no axis 1: "front" and "edge" come from the top view instead.
 * Every line holds the tool "down". Coordinates are whole millimetres in the base frame, so the form, the URL and
 * `armdex line` reproduce the figures exactly. Pure: analysis data and the chain in, plain data out.
 */
import type { Chain } from "../core";
import type { ArmAnalysis } from "../core";
import type { AnalysisSummary } from "../catalog/analysis";
import { gravityDirectionInBase, type Mounting } from "../core";
import type { LineCheckResult } from "../core/analysis/line";
import { lineRatesChart } from "../charts/lineRatesChart";
import type { ChartResult } from "../charts/svg";
import { formatQuantity } from "./format";
import {
  lineCommandText,
  lineFigures,
  lineQueryString,
  lineRatesChartInput,
  runLineQuery,
  type LineFigures,
  type LineQuery,
} from "./lineCheckModel";

export type StandardLineKey = "front" | "axis1" | "edge";

/** One chosen line before it is checked. */
export interface StandardLine {
  readonly key: StandardLineKey;
  /** Short name: "Across the front". */
  readonly title: string;
  /** Where the line is, in words with units. */
  readonly summary: string;
  readonly query: LineQuery;
}

/** Commanded speed of the standard lines, mm/s (the ratios in the charts are at this speed; the largest constant
 * speed does not depend on it). */
export const STANDARD_LINE_SPEED_MM_PER_S = 500;

type Vec3 = [number, number, number];
type Map2 = AnalysisSummary["speed"]["maps"][number];

/** Side-view plane of the speed maps (speedMap.ts sidePlane): origin on axis 1, radial = base x made perpendicular
 * to axis 1, up = axis 1 pointing to base +z (or +x). Map cell (r, z) is o + r·radial moved along up to height z. */
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

function planeOf(analysis: AnalysisSummary): Plane {
  const axis = analysis.envelope.axis1;
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

/** Base-frame point (mm) at distance r from axis 1 along the radial direction, `side` mm sideways, height z. */
function pointAt(plane: Plane, rMm: number, sideMm: number, zMm: number): Vec3 {
  const p0: Vec3 = [0, 1, 2].map((i) => plane.o[i]! + rMm * plane.radial[i]! + sideMm * plane.lateral[i]!) as Vec3;
  const h0 = dot(p0, plane.up);
  return [0, 1, 2].map((i) => Math.round(p0[i]! + (zMm - h0) * plane.up[i]!) + 0) as Vec3;
}

/** Runs of reachable cells along one row of the map with r ≥ 0, as [rFirst, rLast] in mm. */
function rowRuns(map: Map2, iy: number): [number, number][] {
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

/** Words for a height: "600 mm above the base" (world up = against gravity). */
function heightWords(zMm: number, gravity: readonly number[]): string {
  const above = -gravity[2]! * zMm >= 0;
  return `${formatQuantity(Math.abs(zMm), "mm")} ${above ? "above" : "below"} the base`;
}

function levelWord(gravity: readonly number[]): string {
  return Math.abs(Math.abs(gravity[2]!) - 1) < 1e-9 ? "Level" : "Parallel to the base plate";
}

const lengthOf = (q: LineQuery) =>
  Math.hypot(q.toMm[0] - q.fromMm[0], q.toMm[1] - q.fromMm[1], q.toMm[2] - q.fromMm[2]);

/**
 * Chooses the standard lines of an arm from its analysis (see the module comment). Lines that cannot be placed are
 * left out, with a note.
 * @param mounting the arm's primary mounting (gravity: "down" and the words above/below)
 * @example standardLineQueries(analysisOf("corvell-tern-7"), "floor").lines.map((l) => l.key) // ["front", "axis1", "edge"]
 */
export function standardLineQueries(
  analysis: AnalysisSummary,
  mounting: Mounting,
): { lines: StandardLine[]; notes: string[] } {
  const gravity = gravityDirectionInBase(mounting);
  const map = analysis.speed.maps.find((m) => m.orientation === "down");
  const notes: string[] = [];
  if (!map || map.reachableCells === 0)
    return {
      lines: [],
      notes: ["No flange position with the tool pointing down was found, so no standard line is drawn."],
    };
  const g = map.grid;
  const reach = analysis.reach.flangeMaxMm ?? g.rMinMm + g.nx * g.stepMm;
  const speed = STANDARD_LINE_SPEED_MM_PER_S;
  const plane = planeOf(analysis);
  const zOf = (iy: number) => g.zMinMm + iy * g.stepMm;
  const rows = Array.from({ length: g.ny }, (_, iy) => ({
    iy,
    z: zOf(iy),
    runs: rowRuns(map, iy).filter(([a, b]) => b - a >= 2 * g.stepMm),
  })).filter((r) => r.runs.length > 0);
  if (rows.length === 0) return { lines: [], notes: ["The tool-down region is too small for a standard line."] };
  const zLo = rows[0]!.z,
    zHi = rows[rows.length - 1]!.z,
    zMid = (zLo + zHi) / 2;
  const margin = Math.max(g.stepMm, 0.02 * reach);
  const level = levelWord(gravity);
  const lines: StandardLine[] = [];
  const make = (key: StandardLineKey, title: string, summary: (q: LineQuery) => string, from: Vec3, to: Vec3) => {
    const q: LineQuery = { fromMm: from, toMm: to, orientation: { kind: "down" }, speedMmPerS: speed };
    if (lengthOf(q) < 10) {
      notes.push(`The "${title}" line would be shorter than 10 mm, so it is left out.`);
      return;
    }
    lines.push({ key, title, summary: summary(q), query: q });
  };

  if (analysis.envelope.layout !== "revolute-base") {
    // Gantry-like: the top view of the flange gives the working area; heights from the map.
    const pts = (analysis.envelope.flange?.top ?? []).flatMap((p) => p.outer);
    const xs = pts.map((p) => p[0]),
      ys = pts.map((p) => p[1]);
    if (xs.length === 0) return { lines: [], notes: ["No top view of the reach, so no standard line is drawn."] };
    const [x0, x1, y0, y1] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
    const m = Math.max(g.stepMm, 0.02 * Math.max(x1 - x0, y1 - y0));
    const z = roundTo(zMid, 5);
    const xc = roundTo((x0 + x1) / 2, 5),
      yc = roundTo((y0 + y1) / 2, 5);
    make(
      "front",
      "Across the working area",
      (q) =>
        `${level}, ${formatQuantity(lengthOf(q), "mm")} long along base y at x = ${formatQuantity(xc, "mm")}, ${heightWords(z, gravity)} (mid height).`,
      [xc, ceilTo(y0 + m, 5), z],
      [xc, floorTo(y1 - m, 5), z],
    );
    make(
      "edge",
      "Out to the edge of the reach",
      (q) =>
        `${level}, ${formatQuantity(lengthOf(q), "mm")} long along base x, from the middle to ${formatQuantity(m, "mm")} inside the end of the travel, ${heightWords(z, gravity)}.`,
      [xc, yc, z],
      [floorTo(x1 - m, 5), yc, z],
    );
    notes.push("The first joint is linear: there is no axis 1, so the line close to axis 1 is left out.");
    return { lines, notes };
  }

  // 1. Across the front at mid height: the row nearest mid height with a long enough run.
  const longest = Math.max(...rows.map((r) => Math.max(...r.runs.map(([a, b]) => b - a))));
  const byMid = [...rows].sort((a, b) => Math.abs(a.z - zMid) - Math.abs(b.z - zMid));
  const frontRow = byMid.find((r) => r.runs.some(([a, b]) => b - a >= 0.25 * longest)) ?? byMid[0]!;
  {
    const [a, b] = frontRow.runs.reduce((best, run) => (run[1] - run[0] > best[1] - best[0] ? run : best));
    const rc = roundTo((a + b) / 2, 5);
    const outer = b - margin;
    const half = floorTo(Math.min(outer > rc ? Math.sqrt(outer * outer - rc * rc) : 0, 0.4 * reach, rc), 5);
    const z = frontRow.z;
    if (half >= 2 * g.stepMm) {
      make(
        "front",
        "Across the front",
        (q) =>
          `${level}, ${formatQuantity(lengthOf(q), "mm")} long, crossing in front of the arm ${formatQuantity(rc, "mm")} from axis 1, ${heightWords(z, gravity)} (mid height of the tool-down region).`,
        pointAt(plane, rc, -half, z),
        pointAt(plane, rc, half, z),
      );
    } else {
      const r0 = ceilTo(a + margin, 5),
        r1 = floorTo(b - margin, 5);
      make(
        "front",
        "Across the front",
        (q) =>
          `${level}, ${formatQuantity(lengthOf(q), "mm")} long, straight out in front of the arm, ${heightWords(z, gravity)} (mid height of the tool-down region).`,
        pointAt(plane, r0, 0, z),
        pointAt(plane, r1, 0, z),
      );
    }
  }

  // 2. Close to axis 1, away from the base plate: the row where a line passing d from axis 1 can be longest.
  {
    const d0 = ceilTo(Math.max(2 * g.stepMm, 0.04 * reach), 5);
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
        .filter((c) => c.half >= 2 * g.stepMm);
    let found = candidates(clearance);
    if (found.length === 0) found = candidates(0);
    if (found.length > 0) {
      const anyClose = found.some((c) => c.close);
      if (anyClose) found = found.filter((c) => c.close);
      const minD = Math.min(...found.map((c) => c.d));
      found = found.filter((c) => c.d === minD);
      const bestHalf = Math.max(...found.map((c) => c.half));
      const good = found.filter((c) => c.half >= 0.95 * bestHalf);
      const pick = good[Math.floor((good.length - 1) / 2)]!;
      const closeWords = pick.close ? "" : " (the closest the arm reaches there with the tool down)";
      make(
        "axis1",
        "Close to axis 1",
        (q) =>
          `${level}, ${formatQuantity(lengthOf(q), "mm")} long, passing ${formatQuantity(pick.d, "mm")} from axis 1${closeWords}, ${heightWords(pick.z, gravity)}.`,
        pointAt(plane, pick.d, -pick.half, pick.z),
        pointAt(plane, pick.d, pick.half, pick.z),
      );
    } else {
      notes.push("No level line close to axis 1 is reachable with the tool down, so that line is left out.");
    }
  }

  // 3. Out to the edge of the reach: the rows reaching furthest out (the middle one), radial, ending inside the edge.
  {
    const outerOf = (r: (typeof rows)[number]) => Math.max(...r.runs.map(([, b]) => b));
    const rMax = Math.max(...rows.map(outerOf));
    const far = rows.filter((r) => outerOf(r) >= rMax - g.stepMm);
    const row = far[Math.floor((far.length - 1) / 2)]!;
    const run = row.runs.reduce((best, x) => (x[1] > best[1] ? x : best));
    const end = floorTo(run[1] - g.stepMm, 5);
    const start = ceilTo(Math.max(run[0] + margin, end - 0.3 * reach), 5);
    make(
      "edge",
      "Out to the edge of the reach",
      (q) =>
        `${level}, ${formatQuantity(lengthOf(q), "mm")} long, straight out from axis 1 to ${formatQuantity(end, "mm")} from it, about ${formatQuantity(rMax - end, "mm")} inside the edge of the tool-down reach, ${heightWords(row.z, gravity)}.`,
      pointAt(plane, start, 0, row.z),
      pointAt(plane, end, 0, row.z),
    );
  }
  return { lines, notes };
}

/** One standard line, checked, ready for the page. */
export interface CheckedStandardLine extends StandardLine {
  readonly figures: LineFigures;
  readonly chart: ChartResult;
  /** Page-relative link that loads the line into the form ("?from=…#line-check"). */
  readonly formHref: string;
  /** The `armdex line` command giving the full JSON. */
  readonly command: string;
}

export interface StandardLinesModel {
  readonly speedMmPerS: number;
  readonly lines: readonly CheckedStandardLine[];
  readonly notes: readonly string[];
}

/** What standardLinesModel needs of an arm (the catalog's Arm has these). */
export interface StandardLinesArm {
  readonly id: string;
  readonly file: string;
  readonly chain: Chain;
  readonly spec: { readonly model: string; readonly mountings: readonly Mounting[] };
}

/**
 * Chooses and checks the standard lines of an arm (lineCheck runs here, at build time).
 * @param run the check (default: the site's runLineQuery); a test may pass a recording one
 */
export function standardLinesModel(
  arm: StandardLinesArm,
  analysis: ArmAnalysis,
  run: (q: LineQuery) => LineCheckResult = (q) => runLineQuery(arm.chain, arm.spec.mountings, q),
): StandardLinesModel {
  const { lines, notes } = standardLineQueries(analysis, arm.spec.mountings[0] ?? "floor");
  const checked = lines.map((line): CheckedStandardLine => {
    const result = run(line.query);
    const figures = lineFigures(result);
    const chart = lineRatesChart(
      lineRatesChartInput(result, `line-rates-${line.key}`, `${arm.spec.model}: ${line.title.toLowerCase()}`),
      `${line.summary} Tool pointing down, flange centre as the tool point; ratios at ${formatQuantity(STANDARD_LINE_SPEED_MM_PER_S, "mm/s")}.`,
    );
    return {
      ...line,
      figures,
      chart,
      formHref: `?${lineQueryString(line.query)}#line-check`,
      command: lineCommandText(arm.file, line.query),
    };
  });
  return { speedMmPerS: STANDARD_LINE_SPEED_MM_PER_S, lines: checked, notes };
}
