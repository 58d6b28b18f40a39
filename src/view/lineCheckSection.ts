/**
 * Props of the straight-line check section (src/components/LineCheck.astro): the standard lines of an arm sheet
 * (checked at build time) and the settings of the in-browser form, for one arm (arm sheet) or several (comparison
 * page). Pure; the catalog's Arm and ArmAnalysis come in, finished strings and plain data go out.
 */
import type { ArmAnalysis } from "../core";
import type { AnalysisSummary } from "../catalog/analysis";
import type { Chain } from "../core";
import type { Mounting } from "../core";
import { siteHref } from "./links";
import { lineQueryPairs, orientationKindsFor, type LineOrientation, type LineQuery } from "./lineCheckModel";
import {
  STANDARD_LINE_SPEED_MM_PER_S,
  standardLineQueries,
  standardLinesModel,
  type StandardLinesModel,
} from "./standardLines";

/** What the section needs of an arm (the catalog's Arm has these). */
export interface LineCheckSectionArm {
  readonly id: string;
  readonly file: string;
  readonly chain: Chain;
  readonly spec: { readonly maker: string; readonly model: string; readonly mountings: readonly Mounting[] };
}

/** One arm as the browser module sees it: where to fetch its validated description. */
export interface LineCheckArmRef {
  readonly id: string;
  /** "Corvell Automation Tern 7". */
  readonly name: string;
  /** URL of the arm's validated description (dist/data/arms/<id>/spec.json). */
  readonly specHref: string;
  /** Arm file path, for the `armdex line` hint. */
  readonly file: string;
  readonly drivenCount: number;
  /** This arm's default line (its "front" standard line) as query pairs: the form's values when the URL holds none. */
  readonly defaults: readonly [string, string][];
}

/** Settings handed to src/scripts/lineCheck.ts through the section's data-line-check attribute (JSON). */
export interface LineCheckClientConfig {
  /** The arms (armsFromQuery: every arm that may be chosen). */
  readonly arms: readonly LineCheckArmRef[];
  /** True on the comparison page: the arms checked are those named in the address (`?arms=a,b`), in that order. */
  readonly armsFromQuery: boolean;
}

/** URL query key of the compared arms (comparison page). */
export const COMPARE_ARMS_KEY = "arms";

export interface LineCheckSectionModel {
  readonly heading: string;
  readonly intro: string;
  readonly arms: readonly LineCheckArmRef[];
  /** Standard lines (arm sheet only). */
  readonly standard: StandardLinesModel | null;
  /** Orientation choices of the form (the union over the arms; each arm says if it cannot hold one). */
  readonly orientationKinds: readonly LineOrientation["kind"][];
  /** Note under the orientation choice, e.g. for arms that hold "down" only; "" when none. */
  readonly orientationNote: string;
  readonly defaults: LineQuery;
  /** Form field values of `defaults`, by input name. */
  readonly fieldValues: Readonly<Record<string, string>>;
  /** JSON for the data-line-check attribute. */
  readonly config: string;
}

/** The specification endpoint of an arm (src/pages/data/arms/[id]/spec.json.ts). */
export function armSpecPath(id: string): string {
  return `data/arms/${encodeURIComponent(id)}/spec.json`;
}

function armRef(arm: LineCheckSectionArm, baseUrl: string, defaults: LineQuery): LineCheckArmRef {
  return {
    id: arm.id,
    name: `${arm.spec.maker} ${arm.spec.model}`,
    specHref: siteHref(baseUrl, armSpecPath(arm.id)),
    file: arm.file,
    drivenCount: arm.chain.drivenCount,
    defaults: lineQueryPairs(defaults),
  };
}

/** An arm's default line: its first standard line (chosen without running the check), else a fallback. */
function defaultQuery(arm: LineCheckSectionArm, analysis: AnalysisSummary | null): LineQuery {
  return (
    (analysis ? standardLineQueries(analysis, arm.spec.mountings[0] ?? "floor").lines[0]?.query : undefined) ??
    fallbackQuery(analysis)
  );
}

/** Form field values of a query (names as in LineCheck.astro). */
export function lineFieldValues(q: LineQuery): Record<string, string> {
  const [, , orientation] = lineQueryPairs(q);
  const out: Record<string, string> = {
    "from-x": String(q.fromMm[0]),
    "from-y": String(q.fromMm[1]),
    "from-z": String(q.fromMm[2]),
    "to-x": String(q.toMm[0]),
    "to-y": String(q.toMm[1]),
    "to-z": String(q.toMm[2]),
    orientation: q.orientation.kind,
    roll: "180",
    pitch: "0",
    yaw: "0",
    speed: String(q.speedMmPerS),
  };
  if (q.orientation.kind === "rpy")
    [out.roll, out.pitch, out.yaw] = orientation![1].split(",") as [string, string, string];
  return out;
}

function orientationChoices(arms: readonly LineCheckArmRef[]): { kinds: LineOrientation["kind"][]; note: string } {
  const kinds = new Set<LineOrientation["kind"]>();
  for (const a of arms) for (const k of orientationKindsFor(a.drivenCount)) kinds.add(k);
  const downOnly = arms.filter((a) => orientationKindsFor(a.drivenCount).length === 1);
  const note =
    downOnly.length === 0
      ? ""
      : arms.length === 1
        ? `This arm has ${downOnly[0]!.drivenCount} driven joints: its tool turns about one axis only, so the check holds the tool pointing down.`
        : `Arms with fewer than six driven joints hold the tool pointing down only: ${downOnly.map((a) => a.name).join(", ")}.`;
  return {
    kinds: ["down", "outward", "rpy"].filter((k) =>
      kinds.has(k as LineOrientation["kind"]),
    ) as LineOrientation["kind"][],
    note,
  };
}

function section(
  arms: readonly LineCheckArmRef[],
  standard: StandardLinesModel | null,
  defaults: LineQuery,
  armsFromQuery: boolean,
): LineCheckSectionModel {
  const { kinds, note } = orientationChoices(arms);
  const several = arms.length > 1;
  const config: LineCheckClientConfig = { arms, armsFromQuery };
  return {
    heading: "Straight-line check",
    intro:
      `Can ${several ? "each arm" : "the arm"} move the flange centre along a straight line at one constant tool orientation and a constant speed, and which ` +
      "joint runs out of speed first? Needed joint rates come from the arm's kinematics along the whole line; the largest constant speed " +
      "is the speed at which the busiest joint just reaches its limit. Idealised: no acceleration limits, no controller behaviour, no payload.",
    arms,
    standard,
    orientationKinds: kinds,
    orientationNote: note,
    defaults,
    fieldValues: lineFieldValues(defaults),
    config: JSON.stringify(config),
  };
}

/** A fallback line when an arm has no standard line: level, in front of the base at half the stated or computed reach. */
function fallbackQuery(analysis: Pick<AnalysisSummary, "reach"> | null): LineQuery {
  const reach = analysis?.reach.flangeMaxMm ?? 1000;
  const r = Math.round((reach * 0.5) / 5) * 5,
    h = Math.round((reach * 0.2) / 5) * 5;
  const z = Math.round(((analysis?.reach.maxHeightMm ?? reach) * 0.4) / 5) * 5;
  return {
    fromMm: [r, -h, z],
    toMm: [r, h, z],
    orientation: { kind: "down" },
    speedMmPerS: STANDARD_LINE_SPEED_MM_PER_S,
  };
}

/**
 * The section of an arm sheet: standard lines (lineCheck runs now, at build time) and the form for this arm.
 * @param baseUrl import.meta.env.BASE_URL
 */
export function lineCheckSectionModel(
  arm: LineCheckSectionArm,
  analysis: ArmAnalysis | null,
  baseUrl: string,
): LineCheckSectionModel {
  const standard = analysis ? standardLinesModel(arm, analysis) : null;
  const defaults = standard?.lines[0]?.query ?? fallbackQuery(analysis);
  return section([armRef(arm, baseUrl, defaults)], standard, defaults, false);
}

/**
 * The section of the comparison page: the form only, run for several arms at once (no standard lines).
 * @param arms the arms that may be compared (the whole catalog for a static `/compare/?arms=a,b` page), each with
 *   its analysis or the analysis' summary (for its default line; null allowed)
 * @param options.armsFromQuery true (default): the browser checks the arms the address names in `?arms=a,b`, in
 *   that order; false: it checks every arm given here
 */
export function lineCheckCompareModel(
  arms: readonly { readonly arm: LineCheckSectionArm; readonly analysis: AnalysisSummary | null }[],
  baseUrl: string,
  options: { readonly armsFromQuery?: boolean } = {},
): LineCheckSectionModel {
  if (arms.length === 0) throw new RangeError("invalid arms: at least one arm is needed");
  const refs = arms.map((a) => armRef(a.arm, baseUrl, defaultQuery(a.arm, a.analysis)));
  const first = arms[0]!;
  return section(refs, null, defaultQuery(first.arm, first.analysis), options.armsFromQuery ?? true);
}
