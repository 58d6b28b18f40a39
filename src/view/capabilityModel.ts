/**
 * The "Tool directions" section of an arm sheet and its key figure, from the analysis's capability map: the chart, its
 * figures in words, or the sentence that stands in for a map (arms whose tool axis cannot turn). Also the words the
 * catalog and the side-by-side page use for the headline share. Pure: (analysis, name) → props.
 */
import type { ArmAnalysis } from "../core";
import { capabilityMapChart, type ChartResult } from "../charts";
import { formatNumber, formatQuantity, NOT_STATED } from "./format";

type CapabilityReason = NonNullable<ArmAnalysis["capabilityReason"]>;

/** Why an arm has no capability map, as a sentence. */
export const CAPABILITY_REASON_TEXT: Readonly<Record<CapabilityReason, string>> = {
  "tool-axis-cannot-turn":
    "No map of tool directions: this arm cannot turn its tool axis freely at a point (its flange centre and tool axis have fewer than five independent motions; a SCARA or a palletizer keeps the tool axis vertical), so every point is reached with one tool direction at most and the shares would all be zero.",
  "no-axis-1":
    "No map of tool directions: the arm's first joint is not a revolute axis 1 for the side view to turn about (it slides), so the side view is a projection and a share per cell would have no single point to stand for.",
};

/** Label of the headline share (key figure, catalog column, side-by-side row). */
export const CAPABILITY_HEADLINE_LABEL = "Cells reached from half of all tool directions";

export interface CapabilitySectionModel {
  /** One sentence: what the section shows. */
  readonly intro: string;
  readonly chart: ChartResult | null;
  /** The sentence shown instead of a map; null when there is one. */
  readonly absentText: string | null;
  /** The figures in words (headline, mean, method, roll). */
  readonly notes: readonly string[];
}

/** A share 0–1 as a percentage with one decimal: "86.3 %". */
function percent(share: number): string {
  return formatQuantity(share * 100, "%", 1);
}

/** The words of the method and the roll (the README of core/analysis/capability says the same). */
function methodNotes(c: NonNullable<ArmAnalysis["capability"]>, redundant: boolean): string[] {
  const method =
    c.method === "closed-form"
      ? "Solved in closed form: every inverse-kinematics solution within the joint ranges is considered, so a direction counts whenever some posture reaches it."
      : "Solved numerically, by continuation from cell to cell and from direction to direction started from seeded joint samples: the shares are a lower bound (a direction the continuation does not reach counts as not reached).";
  const roll =
    c.rollBasis === "last-joint"
      ? "The roll about the tool axis is free: the last joint turns the flange about its own axis, so its range never decides whether a direction is reached."
      : c.rollBasis === "sampled"
        ? `The roll about the tool axis is free: ${formatNumber(c.rollsTried)} rolls spread over a turn are tried per direction.`
        : "The roll about the tool axis is free: the solver holds the tool axis only.";
  return [
    method,
    ...(redundant
      ? [
          "Seven-axis arm: each direction is reached in the posture the continuation carries to it; the arm's self-motion at a cell is not searched.",
        ]
      : []),
    roll,
  ];
}

/**
 * The section's props: the chart over the side view with the flange envelope and the tool-down outline, or the
 * sentence of `capabilityReason`.
 */
export function capabilitySection(a: ArmAnalysis, name: string, drivenCount: number): CapabilitySectionModel {
  const c = a.capability;
  const intro =
    "From how many tool directions the flange centre can reach each point of the side view, within the joint limits of the arm file, the roll about the tool axis free.";
  if (!c)
    return {
      intro,
      chart: null,
      absentText: a.capabilityReason ? CAPABILITY_REASON_TEXT[a.capabilityReason] : "No map of tool directions.",
      notes: [],
    };
  const down = a.speed.maps.find((m) => m.orientation === "down") ?? null;
  const chart = capabilityMapChart({
    id: "capability",
    armName: name,
    grid: { nx: c.rMm.length, ny: c.zMm.length, rMinMm: c.rMm[0] ?? 0, zMinMm: c.zMm[0] ?? 0, stepMm: c.gridMm },
    share: c.share,
    directions: c.directions,
    flangeSide: a.envelope.flange.side,
    toolDown: down ? { grid: down.grid, reached: down.guaranteedMmPerS } : null,
    areaShareAtLeastHalf: c.areaShareAtLeastHalf,
  });
  const notes = [
    `${CAPABILITY_HEADLINE_LABEL}: ${c.areaShareAtLeastHalf === null ? NOT_STATED : percent(c.areaShareAtLeastHalf)} of the ${formatNumber(c.gridMm)}\u00a0mm cells inside the flange envelope; mean share over those cells ${c.meanShare === null ? NOT_STATED : percent(c.meanShare)}.`,
    `Directions: ${formatNumber(c.directions)}, spread evenly over the whole sphere (a Fibonacci lattice; neighbours about ${formatNumber(Math.sqrt((4 * Math.PI) / c.directions) * (180 / Math.PI))}\u00b0 apart).`,
    "Each cell stands for its whole circle about axis 1 (joint 1 turns within its range); a tool longer than zero moves the point the arm must reach, so the map of a tool-centre point differs from this one.",
    ...methodNotes(c, drivenCount > 6),
  ];
  return { intro, chart, absentText: null, notes };
}

/** The key figure of the sheet: the headline share, or "no map" with the reason in short. */
export function capabilitySummaryFigure(a: Pick<ArmAnalysis, "capability" | "capabilityReason">): {
  key: string;
  label: string;
  value: string;
  note: string;
  flag: boolean;
  href: string;
} {
  const c = a.capability;
  return {
    key: "capability-half",
    label: CAPABILITY_HEADLINE_LABEL,
    value: c ? (c.areaShareAtLeastHalf === null ? NOT_STATED : percent(c.areaShareAtLeastHalf)) : "no map",
    note: c
      ? `share of the flange envelope's side-view cells reached from at least half of ${formatNumber(c.directions)} tool directions, roll free`
      : a.capabilityReason === "no-axis-1"
        ? "no revolute axis 1 to draw the side view about"
        : "the tool axis cannot turn freely at a point",
    flag: false,
    href: "#directions",
  };
}

/** The headline share as a percentage for tables ("86.3"), with its sort value; "no map" without one. */
export function capabilityHeadlineCell(capability: { readonly areaShareAtLeastHalf: number | null } | null): {
  text: string;
  sortValue?: number;
} {
  if (!capability) return { text: "no map" };
  const v = capability.areaShareAtLeastHalf;
  return v === null ? { text: NOT_STATED } : { text: formatNumber(v * 100, 1), sortValue: v * 100 };
}
