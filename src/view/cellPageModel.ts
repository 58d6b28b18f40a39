/**
 * The cell study page (`/cells/<id>/`): the ranking, the assumptions, the drawings of the cell and one section per
 * arm (targets, moves, tool load, time bar, placement map), the downloads and the cautions. Pure: the study and the
 * placement maps (from the catalog's cache) and a little about each arm in, formatted props out. The per-arm parts
 * (`cellArmParts`) are what the cell editor redraws in the browser.
 */
import type { CellArmJson, CellSpec, CellStudyJson, PlacementMapJson } from "../core";
import { nodeChartResult } from "../charts/cellMarks";
import { cellLayoutChart } from "../charts/cellLayoutChart";
import { cellTimeChart, type CellTimeRow } from "../charts/cellTimeChart";
import { placementMapChart } from "../charts/placementMapChart";
import type { ChartResult } from "../charts/svg";
import { CAUTIONS, type Cautions } from "./cautions";
import { cellDrawings, type CellArmReach } from "./cellDrawing";
import { cellDataPaths, cellEditorPath, cellPath, CELLS_INDEX_PATH } from "./cellLinks";
import {
  accelerationNote,
  armNameOf,
  jointList,
  movesTable,
  rankingTable,
  targetsTable,
  toolLoadTable,
  type CellArmInfo,
} from "./cellTables";
import { formatNumber, formatQuantity, formatVector } from "./format";
import { absoluteUrl, armPath, siteHref } from "./links";
import type { DownloadLink, SummaryFigure } from "./armAnalysisModel";
import type { PageSection } from "./armPageModel";
import type { TableModel } from "./table";

export interface CellPageArm {
  readonly id: string;
  /** "Corvell Tern 12". */
  readonly name: string;
  /** Beside its base on the drawings ("Tern 12"). */
  readonly shortName?: string;
  /** From the arm's analysis summary; null when not at hand. */
  readonly reach: CellArmReach | null;
  /** Driven joints that slide (holding figures in N). */
  readonly prismaticJoints?: readonly string[];
}

export interface CellPageInput {
  readonly cell: { readonly id: string; readonly spec: CellSpec };
  readonly study: CellStudyJson;
  /** One map per candidate, in candidate order (the catalog's cell results). */
  readonly placements: readonly PlacementMapJson[];
  /** Spec hash of each candidate arm the results were computed from. */
  readonly armSpecHashes: Readonly<Record<string, string>>;
  readonly arms: readonly CellPageArm[];
  /** Pinned sheet of the revision each arm's results were computed from, by arm id, where the site has one. */
  readonly revisionHrefs?: Readonly<Record<string, string>>;
}

/** What the page shows for one arm; the editor builds the same parts (without the placement map). */
export interface CellArmParts {
  readonly id: string;
  /** Anchor of the arm's section. */
  readonly anchor: string;
  readonly heading: string;
  readonly sheetHref: string | null;
  readonly verdict: "pass" | "fail";
  readonly summary: string;
  readonly placementText: string;
  readonly reasons: readonly string[];
  readonly accelerationNote: string;
  readonly targets: TableModel;
  readonly moves: TableModel;
  readonly toolLoad: TableModel;
  readonly timeRow: CellTimeRow;
}

export interface CellArmSection extends CellArmParts {
  readonly timeChart: ChartResult;
  readonly placement: { readonly chart: ChartResult; readonly line: string } | null;
}

export interface CellPageModel {
  readonly id: string;
  readonly title: string;
  readonly description: string | null;
  readonly href: string;
  readonly canonicalUrl: string | null;
  readonly indexHref: string;
  readonly editHref: string;
  readonly methodsHref: string;
  readonly sections: readonly PageSection[];
  readonly keyFigures: readonly SummaryFigure[];
  readonly ranking: TableModel;
  readonly timeChart: ChartResult;
  readonly requirementsText: string;
  readonly assumptions: readonly string[];
  readonly drawings: readonly ChartResult[];
  readonly armSections: readonly CellArmSection[];
  readonly downloads: readonly DownloadLink[];
  readonly cautions: Cautions;
  readonly printRef: string;
}

export const armAnchor = (id: string) => `arm-${id}`;

/** The requirements in words. */
export function requirementsText(cell: Pick<CellSpec, "requirements">): string {
  const r = cell.requirements ?? {};
  const parts: string[] = [];
  if (r.maxCycleS !== undefined) parts.push(`a cycle of at most ${formatQuantity(r.maxCycleS, "s", 2)}`);
  if (r.minJointMarginDeg !== undefined)
    parts.push(`every joint at least ${formatNumber(r.minJointMarginDeg, 1)}° from a range end at every target`);
  const base = "Every target reached, every move feasible, the tool load within the rated payload and wrist ratings";
  return parts.length ? `${base}, and ${parts.join(" and ")}.` : `${base}; no cycle time or margin is required.`;
}

/** The assumptions behind every figure of the study, in plain sentences. */
export function cellAssumptions(study: CellStudyJson, info: ReadonlyMap<string, CellArmInfo>): string[] {
  const assumed = study.arms.filter((a) => a.accelerationAssumed.length);
  return [
    "Kinematic figures: rigid links, no payload dynamics (the load does not slow the arm), no blending of corners " +
      "(every move starts and ends at rest) and no controller limits. Cycle times are lower bounds.",
    "Joint moves: each joint on a trapezoidal (or triangular) speed profile at its speed times the step's " +
      "percentage and its acceleration; the move lasts as long as the slowest joint, the others finish with it.",
    "Linear moves: the fastest timing along the straight line under every joint's speed and acceleration limit and " +
      "the step's tool-speed cap (time-optimal path parameterisation), orientation turning uniformly.",
    assumed.length
      ? `Accelerations assumed (full speed in 0.25 s) where the arm file gives none: ${assumed
          .map((a) => `${armNameOf(info, a.arm)} (${jointList(a.accelerationAssumed)})`)
          .join("; ")}. Their cycle times rest on that assumption.`
      : "Every candidate's arm file gives its joint accelerations.",
    "Configuration: one inverse-kinematics solution per step, chosen so that the whole loop is feasible and fastest; " +
      "a linear move must follow its line from its start solution without a singular crossing, a change of branch or " +
      "a joint leaving its range.",
    "Tool load: static, against the rated payload and the wrist's moment and inertia ratings; acceleration derates further.",
    "Not modelled: collisions (with the cell, the arm's own links, people), cable and hose routing, gripper and I/O " +
      "times beyond the dwells given, settling, and safety functions.",
  ];
}

const placementWords = (p: CellArmJson["placement"]) =>
  `Base at ${formatVector(p.positionMm, 1)} mm, roll-pitch-yaw ${formatVector(p.rpyDeg, 1)}°, ${p.mounting} mounting.`;

/** One arm's heading, verdict line, tables and time-bar row. */
export function cellArmParts(
  arm: CellArmJson,
  cell: Pick<CellSpec, "cycle">,
  info: ReadonlyMap<string, CellArmInfo>,
  idPrefix: string,
): CellArmParts {
  const name = armNameOf(info, arm.arm);
  const cycle = arm.cycleTimeS === null ? "no cycle time" : `${formatNumber(arm.cycleTimeS, 2)} s`;
  const rank = arm.rank === null ? "" : `${arm.rank}. `;
  const key = `${idPrefix}-${arm.arm}`;
  return {
    id: arm.arm,
    anchor: armAnchor(arm.arm),
    heading: `${rank}${name}`,
    sheetHref: info.get(arm.arm)?.sheetHref ?? null,
    verdict: arm.verdict,
    summary:
      arm.verdict === "pass"
        ? `Passes, cycle ${cycle}${arm.rank === 1 ? ", the fastest" : ""}.`
        : `Fails (${arm.reasons.length} reason${arm.reasons.length === 1 ? "" : "s"}), ${cycle}.`,
    placementText: placementWords(arm.placement),
    reasons: arm.reasons,
    accelerationNote: accelerationNote(arm),
    targets: targetsTable(arm, `${key}-targets`, name, info.get(arm.arm)?.prismaticJoints ?? []),
    moves: movesTable(arm, cell, `${key}-moves`, name),
    toolLoad: toolLoadTable(arm, `${key}-load`, name),
    timeRow: { key: arm.arm, label: name, moves: arm.moves, cycleTimeS: arm.cycleTimeS },
  };
}

/** The one-line result of a placement map, e.g. "Feasible area 0.35 m²; fastest placement found: …". */
export function placementLine(map: PlacementMapJson, todayS: number | null): string {
  const area = `Feasible area ${formatQuantity(map.feasibleAreaM2, "m\u00b2", 2)} (${formatNumber(map.gridMm)} mm grid at z = ${formatNumber(map.planeZMm)} mm)`;
  if (!map.feasible.some((row) => row.includes(1)))
    return `No base position on the plane z = ${formatNumber(map.planeZMm)} mm reaches every target (${formatNumber(map.gridMm)} mm grid).`;
  if (!map.best) return `${area}; no position with a feasible cycle found.`;
  const [x, y] = map.best.positionMm;
  const today = todayS === null ? "today's placement has no cycle time" : `today ${formatQuantity(todayS, "s", 2)}`;
  return (
    `${area}; fastest placement found: x ${formatNumber(x)} mm, y ${formatNumber(y)} mm, yaw ` +
    `${formatNumber(map.best.yawDeg, 1)}°, cycle ${formatQuantity(map.best.cycleTimeS, "s", 2)} (${today}); ` +
    `${map.search.evaluated} positions evaluated.`
  );
}

function placementSection(map: PlacementMapJson, arm: CellArmJson, spec: CellSpec, name: string, id: string) {
  const targets = cellDrawings(spec, [], id).top.targets;
  const caption =
    `Base positions on the plane z = ${formatNumber(map.planeZMm)} mm with the placement's roll, pitch and yaw, every ` +
    `${formatNumber(map.gridMm)} mm; shaded where the tool point reaches every target inside the joint ranges (each ` +
    `target in its best posture; margins not required). Only positions within the tool point's estimated extent of ` +
    `every target are solved. The fastest position comes from the full cycle evaluated on a coarse subset (every ` +
    `${formatNumber(map.search.coarseStepMm)} mm) and refined by a pattern search: a position found, not a proven ` +
    `optimum. Collisions are not checked.`;
  const chart = placementMapChart({
    id,
    title: `${name}: where the base can stand`,
    gridMm: map.gridMm,
    xMm: map.xMm,
    yMm: map.yMm,
    feasible: map.feasible,
    targets,
    current: [map.current.positionMm[0]!, map.current.positionMm[1]!],
    best: map.best ? [map.best.positionMm[0], map.best.positionMm[1]] : null,
    caption,
  });
  return { chart: nodeChartResult(chart), line: placementLine(map, arm.cycleTimeS) };
}

/** Arm names, sheet links and spec revisions of a page's arms. */
export function cellArmInfo(
  arms: readonly { readonly id: string; readonly name: string; readonly prismaticJoints?: readonly string[] }[],
  specHashes: Readonly<Record<string, string>>,
  baseUrl: string,
  revisionHrefs: Readonly<Record<string, string>> = {},
): Map<string, CellArmInfo> {
  return new Map(
    arms.map((a) => [
      a.id,
      {
        id: a.id,
        name: a.name,
        sheetHref: siteHref(baseUrl, armPath(a.id)),
        specHash: specHashes[a.id] ?? null,
        revisionHref: revisionHrefs[a.id] ?? null,
        prismaticJoints: a.prismaticJoints ?? [],
      },
    ]),
  );
}

function keyFigures(study: CellStudyJson, cell: CellSpec, info: ReadonlyMap<string, CellArmInfo>): SummaryFigure[] {
  const passing = study.arms.filter((a) => a.verdict === "pass");
  const best = passing[0];
  const req = cell.requirements?.maxCycleS;
  return [
    {
      key: "candidates",
      label: "Candidates",
      value: String(study.arms.length),
      note: `${passing.length} pass, ${study.arms.length - passing.length} fail`,
      flag: false,
      href: "#ranking",
    },
    {
      key: "best",
      label: "Fastest passing arm",
      value: best ? `${formatNumber(best.cycleTimeS!, 2)} s` : "none",
      note: best ? armNameOf(info, best.arm) : "no candidate passes",
      flag: !best,
      href: best ? `#${armAnchor(best.arm)}` : "#ranking",
    },
    {
      key: "required",
      label: "Required cycle",
      value: req === undefined ? "none" : `${formatNumber(req, 2)} s`,
      note:
        cell.requirements?.minJointMarginDeg === undefined
          ? "no joint margin required"
          : `joint margin at least ${formatNumber(cell.requirements.minJointMarginDeg, 1)}°`,
      flag: false,
      href: "#assumptions",
    },
  ];
}

/** The cell page's props. */
export function cellPageModel(
  input: CellPageInput,
  options: { readonly baseUrl: string; readonly site?: URL | string | undefined },
): CellPageModel {
  const { cell, study } = input;
  const spec = cell.spec;
  const info = cellArmInfo(input.arms, input.armSpecHashes, options.baseUrl, input.revisionHrefs);
  const href = siteHref(options.baseUrl, cellPath(cell.id));
  const byId = new Map(input.arms.map((a) => [a.id, a]));
  const ordered = study.arms.map((a) => ({
    id: a.arm,
    name: armNameOf(info, a.arm),
    shortName: byId.get(a.arm)?.shortName ?? armNameOf(info, a.arm),
    reach: byId.get(a.arm)?.reach ?? null,
  }));
  const drawings = cellDrawings(spec, ordered, "cell");
  const armSections: CellArmSection[] = study.arms.map((a) => {
    const parts = cellArmParts(a, spec, info, "cell");
    const map = input.placements.find((p) => p.arm === a.arm);
    return {
      ...parts,
      timeChart: nodeChartResult(
        cellTimeChart({
          id: `cell-${a.arm}-time`,
          title: `${parts.heading.replace(/^\d+\. /, "")}: cycle by move`,
          rows: [parts.timeRow],
          maxCycleS: spec.requirements?.maxCycleS ?? null,
          captionExtra: parts.accelerationNote,
        }),
      ),
      placement: map ? placementSection(map, a, spec, armNameOf(info, a.arm), `cell-${a.arm}-placement`) : null,
    };
  });
  const paths = cellDataPaths(cell.id);
  const dl = (key: string, label: string, path: string, description: string): DownloadLink => ({
    key,
    label,
    href: siteHref(options.baseUrl, path),
    description,
  });
  const first = study.arms.find((a) => a.verdict === "pass");
  return {
    id: cell.id,
    title: spec.title,
    description: spec.description ?? null,
    href,
    canonicalUrl: absoluteUrl(options.site, href),
    indexHref: siteHref(options.baseUrl, CELLS_INDEX_PATH),
    editHref: siteHref(options.baseUrl, cellEditorPath({ cell: cell.id })),
    methodsHref: siteHref(options.baseUrl, "methods/#cell-studies"),
    sections: [
      { id: "ranking", title: "Ranking" },
      { id: "assumptions", title: "Assumptions" },
      { id: "layout", title: "Cell drawings" },
      ...armSections.map((s) => ({ id: s.anchor, title: s.heading.replace(/^\d+\. /, "") })),
      { id: "downloads", title: "Downloads" },
      { id: "cautions", title: "Cautions" },
    ],
    keyFigures: keyFigures(study, spec, info),
    ranking: rankingTable(study, info, { id: "cell-ranking" }),
    timeChart: nodeChartResult(
      cellTimeChart({
        id: "cell-time",
        title: "Cycle by move, every candidate",
        rows: armSections.map((s) => s.timeRow),
        maxCycleS: spec.requirements?.maxCycleS ?? null,
        captionExtra: first ? "" : "No candidate passes.",
      }),
    ),
    requirementsText: requirementsText(spec),
    assumptions: cellAssumptions(study, info),
    drawings: [nodeChartResult(cellLayoutChart(drawings.top)), nodeChartResult(cellLayoutChart(drawings.side))],
    armSections,
    downloads: [
      dl("study", "Cell study (JSON)", paths.study, "the study of every candidate, exactly as `armdex cell` prints it"),
      dl("placements", "Placement maps (JSON)", paths.placements, "one map per candidate, as `armdex place` prints it"),
      dl("moves", "Moves (CSV)", paths.movesCsv, "every move of every arm: time, dwell, what limits it, problem"),
      dl("targets", "Targets (CSV)", paths.targetsCsv, "every target of every arm: joints, margins, holding torque"),
      dl("cell", "Cell file (JSON)", paths.cellFile, `the cell file itself, arms/cells/${cell.id}.json`),
    ],
    cautions: CAUTIONS,
    printRef: `${absoluteUrl(options.site, href) ?? href} · cell ${cell.id} · arm spec fingerprints in the ranking`,
  };
}
