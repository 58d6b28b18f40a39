/**
 * The standard straight lines of an arm sheet as the page shows them. The analysis chooses and checks them
 * (src/core/analysis/standardLines: level lines across the front, close to axis 1 and out to the edge of the
 * tool-down reach, at the standard speed); this module words them, draws their joint-rate charts and links each to
 * the form and the command line. Pure: analysis data in, page props out.
 */
import type { AnalysisSummary } from "../catalog/analysis";
import {
  gravityDirectionInBase,
  STANDARD_LINE_SPEED_MM_PER_S,
  type ArmAnalysis,
  type Mounting,
  type StandardLineKey,
  type StandardLineNote,
  type StandardLinePlacement,
} from "../core";
import { lineRatesChart } from "../charts/lineRatesChart";
import type { ChartResult } from "../charts/svg";
import { formatQuantity } from "./format";
import {
  lineCommandText,
  lineFigures,
  lineQueryString,
  lineRatesChartInput,
  type LineFigures,
  type LineQuery,
} from "./lineCheckModel";

export { STANDARD_LINE_SPEED_MM_PER_S };

/** One chosen line, worded. */
export interface StandardLine {
  readonly key: StandardLineKey;
  /** Short name: "Across the front". */
  readonly title: string;
  /** Where the line is, in words with units. */
  readonly summary: string;
  readonly query: LineQuery;
}

/** Words for a height: "600 mm above the base" (world up = against gravity). */
function heightWords(zMm: number, gravity: readonly number[]): string {
  const above = -gravity[2]! * zMm >= 0;
  return `${formatQuantity(Math.abs(zMm), "mm")} ${above ? "above" : "below"} the base`;
}

function levelWord(gravity: readonly number[]): string {
  return Math.abs(Math.abs(gravity[2]!) - 1) < 1e-9 ? "Level" : "Parallel to the base plate";
}

/** Title of a line by its placement. */
export function standardLineTitle(kind: StandardLinePlacement["kind"]): string {
  switch (kind) {
    case "across":
    case "radial":
      return "Across the front";
    case "area-across":
      return "Across the working area";
    case "near-axis1":
      return "Close to axis 1";
    case "to-edge":
    case "area-out":
      return "Out to the edge of the reach";
  }
}

/** Where a line is, in words with units. */
function summaryWords(p: StandardLinePlacement, lengthMm: number, gravity: readonly number[]): string {
  const start = `${levelWord(gravity)}, ${formatQuantity(lengthMm, "mm")} long`;
  const height = heightWords(p.zMm, gravity);
  switch (p.kind) {
    case "across":
      return `${start}, crossing in front of the arm ${formatQuantity(p.rMm, "mm")} from axis 1, ${height} (mid height of the tool-down region).`;
    case "radial":
      return `${start}, straight out in front of the arm, ${height} (mid height of the tool-down region).`;
    case "near-axis1":
      return `${start}, passing ${formatQuantity(p.dMm, "mm")} from axis 1${p.closest ? " (the closest the arm reaches there with the tool down)" : ""}, ${height}.`;
    case "to-edge":
      return `${start}, straight out from axis 1 to ${formatQuantity(p.endMm, "mm")} from it, about ${formatQuantity(p.insideEdgeMm, "mm")} inside the edge of the tool-down reach, ${height}.`;
    case "area-across":
      return `${start} along base y at x = ${formatQuantity(p.xMm, "mm")}, ${height} (mid height).`;
    case "area-out":
      return `${start} along base x, from the middle to ${formatQuantity(p.marginMm, "mm")} inside the end of the travel, ${height}.`;
  }
}

/** A note on a missing line, as a sentence. */
export function standardLineNoteText(note: StandardLineNote): string {
  switch (note.code) {
    case "no-tool-down-region":
      return "No flange position with the tool pointing down was found, so no standard line is drawn.";
    case "region-too-small":
      return "The tool-down region is too small for a standard line.";
    case "no-top-view":
      return "No top view of the reach, so no standard line is drawn.";
    case "too-short":
      return `The "${standardLineTitle(note.placement)}" line would be shorter than 10 mm, so it is left out.`;
    case "no-line-near-axis1":
      return "No level line close to axis 1 is reachable with the tool down, so that line is left out.";
    case "no-axis1":
      return "The first joint is linear: there is no axis 1, so the line close to axis 1 is left out.";
  }
}

/**
 * The standard lines of an analysis (or its summary), worded, with the query the form and `armdex line` take.
 * @param mounting the arm's primary mounting (the words above/below)
 */
export function standardLineQueries(
  analysis: Pick<AnalysisSummary, "standardLines">,
  mounting: Mounting,
): { lines: StandardLine[]; notes: string[] } {
  const gravity = gravityDirectionInBase(mounting);
  const lines = analysis.standardLines.lines.map((l): StandardLine => {
    const query: LineQuery = {
      fromMm: [...l.fromMm],
      toMm: [...l.toMm],
      orientation: { kind: "down" },
      speedMmPerS: l.speedMmPerS,
    };
    const lengthMm = Math.hypot(l.toMm[0] - l.fromMm[0], l.toMm[1] - l.fromMm[1], l.toMm[2] - l.fromMm[2]);
    return {
      key: l.key,
      title: standardLineTitle(l.placement.kind),
      summary: summaryWords(l.placement, lengthMm, gravity),
      query,
    };
  });
  return { lines, notes: analysis.standardLines.notes.map(standardLineNoteText) };
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
  readonly spec: { readonly model: string; readonly mountings: readonly Mounting[] };
}

/**
 * The standard lines of an arm as the sheet shows them, from the checks the analysis ran.
 */
export function standardLinesModel(arm: StandardLinesArm, analysis: ArmAnalysis): StandardLinesModel {
  const { lines, notes } = standardLineQueries(analysis, arm.spec.mountings[0] ?? "floor");
  const checked = lines.map((line, k): CheckedStandardLine => {
    const result = analysis.standardLines.lines[k]!.result;
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
  const postureNote =
    analysis.speed.redundancy !== null
      ? [
          "Posture rule for this redundant arm: each line follows the start postures the check finds and keeps the fastest that follows the whole line; the self-motion along the line is not optimised, so another start posture (the form's start joints, or --start-joints) can be faster.",
        ]
      : [];
  return { speedMmPerS: STANDARD_LINE_SPEED_MM_PER_S, lines: checked, notes: [...notes, ...postureNote] };
}
