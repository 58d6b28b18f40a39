/**
 * Tables of a cell study (the JSON of `armdex cell`): the ranking, and per arm its targets, moves and tool loads,
 * every cell already formatted with units. Pure and DOM-free: the cell page renders them at build time and the cell
 * editor renders the same models in the browser after each recomputation.
 */
import { CELL_TIME_TO_TOP_SPEED_S, type CellArmJson, type CellSpec, type CellStudyJson } from "../core";
import { formatNumber, formatQuantity, formatVector } from "./format";
import type { TableCell, TableModel, TableRow } from "./table";

/** What the tables need to know about an arm beyond the study: its name, sheet and the spec revision used. */
export interface CellArmInfo {
  readonly id: string;
  /** "Corvell Tern 12". */
  readonly name: string;
  /** Link to the arm sheet (joined with the base path), or null. */
  readonly sheetHref: string | null;
  /** sha256 of the arm file the study was computed from, hex; null when unknown. */
  readonly specHash: string | null;
  /** Link to the arm's pinned sheet of that revision (`/arms/<id>/rev/<fingerprint>/`) when the site has it. */
  readonly revisionHref?: string | null;
  /** Driven joints that slide (their holding figure is a force, N); the others turn (N·m). */
  readonly prismaticJoints?: readonly string[];
}

/** Hex digits of a spec fingerprint shown beside a figure (as on the arm sheets). */
export const CELL_FINGERPRINT_DIGITS = 12;

const DASH = "\u2014";

export function armNameOf(info: ReadonlyMap<string, CellArmInfo>, id: string): string {
  return info.get(id)?.name ?? id;
}

/**
 * Driven joints named in a list, runs of consecutive J-numbers joined: ["J1", "J2", "J3", "J5"] → "J1–J3, J5".
 * @example jointList(["J1", "J2", "J3", "J4", "J5", "J6"]) // "J1–J6"
 */
export function jointList(names: readonly string[]): string {
  const out: string[] = [];
  let i = 0;
  const num = (s: string) => (/^J(\d+)$/.exec(s) ? Number(/^J(\d+)$/.exec(s)![1]) : NaN);
  while (i < names.length) {
    let j = i;
    while (j + 1 < names.length && num(names[j + 1]!) === num(names[j]!) + 1) j++;
    out.push(j - i >= 2 ? `${names[i]}\u2013${names[j]}` : names.slice(i, j + 1).join(", "));
    i = j + 1;
  }
  return out.join(", ");
}

/** The sentence that goes wherever an arm's figure rests on assumed accelerations, or "". */
export function accelerationNote(arm: Pick<CellArmJson, "accelerationAssumed">): string {
  if (!arm.accelerationAssumed.length) return "";
  return (
    `${jointList(arm.accelerationAssumed)}: no acceleration in the arm file; assumed full speed in ` +
    `${formatNumber(CELL_TIME_TO_TOP_SPEED_S, 2)} s.`
  );
}

/** The tightest joint margin over the targets with the joint that has it, e.g. "28.5° (J3)", or null. */
export function tightestMargin(arm: CellArmJson): { text: string; valueDeg: number } | null {
  let best: { deg: number; joint: string | null } | null = null;
  for (const t of arm.targets)
    if (t.jointMarginDeg !== null && (best === null || t.jointMarginDeg < best.deg))
      best = { deg: t.jointMarginDeg, joint: t.tightestJoint };
  if (!best) return null;
  return { text: `${formatNumber(best.deg, 1)}°${best.joint ? ` (${best.joint})` : ""}`, valueDeg: best.deg };
}

const loadName = (carrying: string | null) => (carrying === null ? "tool alone" : `tool with ${carrying}`);

/** Tool-load status of an arm: within every rating, or what is over, with the most used rating. */
export function toolLoadStatus(arm: CellArmJson): { text: string; note: string; ok: boolean } {
  let over = 0;
  let most: { share: number; what: string } | null = null;
  for (const load of arm.toolLoad) {
    if (!load.withinRatedPayload) over++;
    const massShare = load.massKg / load.ratedPayloadKg;
    if (!most || massShare > most.share) most = { share: massShare, what: `mass, ${loadName(load.carrying)}` };
    for (const r of load.ratings) {
      if (!r.ok) over++;
      const shares: [number, string][] = [];
      if (r.allowedMomentNm) shares.push([r.momentNm / r.allowedMomentNm, "moment"]);
      if (r.allowedInertiaKgM2) shares.push([r.inertiaKgM2 / r.allowedInertiaKgM2, "inertia"]);
      for (const [share, kind] of shares)
        if (share > most.share) most = { share, what: `${r.joint} ${kind}, ${loadName(load.carrying)}` };
    }
  }
  const mostText = most ? `most used: ${most.what}, ${formatNumber(100 * most.share, 0)} %` : "";
  if (over === 0) return { text: "within ratings", note: mostText, ok: true };
  return { text: `${over} check${over === 1 ? "" : "s"} over`, note: mostText, ok: false };
}

/** At most `n` reasons, then how many more. */
export function shortReasons(reasons: readonly string[], n = 3): string {
  if (!reasons.length) return DASH;
  const shown = reasons.slice(0, n).join("; ");
  return reasons.length > n ? `${shown}; and ${reasons.length - n} more (see the arm's section)` : shown;
}

const fingerprintOf = (hash: string | null | undefined) => (hash ? hash.slice(0, CELL_FINGERPRINT_DIGITS) : DASH);

/** The ranking: passing arms by cycle time, then the failing ones, as the study orders them. */
export function rankingTable(
  study: CellStudyJson,
  info: ReadonlyMap<string, CellArmInfo>,
  options: { readonly id: string },
): TableModel {
  const rows: TableRow[] = study.arms.map((a) => {
    const i = info.get(a.arm);
    const margin = tightestMargin(a);
    const load = toolLoadStatus(a);
    const accel = a.accelerationAssumed.length ? `acceleration assumed (${jointList(a.accelerationAssumed)})` : "";
    const armCell: TableCell = {
      text: armNameOf(info, a.arm),
      ...(i?.sheetHref ? { href: i.sheetHref } : {}),
      note: a.arm,
    };
    return {
      key: a.arm,
      label: armNameOf(info, a.arm),
      data: { verdict: a.verdict, ...(a.cycleTimeS !== null ? { "cycle-s": String(a.cycleTimeS) } : {}) },
      cells: [
        { text: a.rank === null ? DASH : String(a.rank), sortValue: a.rank ?? 99 },
        armCell,
        { text: a.verdict, sortValue: a.verdict },
        a.cycleTimeS === null
          ? { text: DASH, note: "a move cannot be done" }
          : { text: formatNumber(a.cycleTimeS, 2), sortValue: a.cycleTimeS, ...(accel ? { note: accel } : {}) },
        margin ? { text: margin.text, sortValue: margin.valueDeg } : { text: DASH },
        { text: load.text, note: load.note },
        { text: fingerprintOf(i?.specHash), ...(i?.revisionHref ? { href: i.revisionHref } : {}) },
        { text: shortReasons(a.reasons) },
      ],
    };
  });
  return {
    id: options.id,
    caption: "Ranking: passing arms by cycle time, then the arms that fail",
    columns: [
      { key: "rank", label: "Rank", numeric: true },
      { key: "arm", label: "Arm", numeric: false },
      { key: "verdict", label: "Verdict", numeric: false },
      { key: "cycle", label: "Cycle time", unit: "s", numeric: true },
      { key: "margin", label: "Tightest joint margin", numeric: true },
      { key: "load", label: "Tool load", numeric: false },
      { key: "fingerprint", label: "Spec fingerprint", numeric: false },
      { key: "reasons", label: "Reasons", numeric: false },
    ],
    rows,
    rowHeaders: false,
    footnote:
      "Spec fingerprint: the first 12 hex digits of the arm file's sha256, the revision the figures were computed " +
      "from (the arm sheet shows the same); it links to that revision's pinned sheet, which never changes. Tightest margin: the smallest distance of a joint to a range end over the " +
      "targets, in the solution the loop uses.",
  };
}

/** The largest holding torque share at a target, or null when the arm file rates no joint. */
function holdingCell(t: CellArmJson["targets"][number], prismatic: readonly string[]): TableCell {
  if (!t.reachable) return { text: DASH };
  if (!t.holding.length) return { text: DASH, note: "no rated torques in the arm file" };
  const worst = t.holding.reduce((a, b) => (b.torqueNm / b.ratedNm > a.torqueNm / a.ratedNm ? b : a));
  const share = worst.torqueNm / worst.ratedNm;
  return {
    text: `${worst.joint} ${formatNumber(worst.torqueNm, 1)} of ${formatQuantity(worst.ratedNm, prismatic.includes(worst.joint) ? "N" : "N\u00b7m")}`,
    note: `${formatNumber(100 * share, 0)} % of rated${worst.ok ? "" : ": over"}`,
    sortValue: share,
  };
}

/** The targets of one arm: reach, solutions, joints, margin, inverse condition, holding torque. */
export function targetsTable(
  arm: CellArmJson,
  id: string,
  armName: string,
  prismaticJoints: readonly string[] = [],
): TableModel {
  const rows: TableRow[] = arm.targets.map((t) => ({
    key: t.name,
    cells: [
      { text: t.name },
      t.reachable
        ? { text: `yes, ${t.solutions} solution${t.solutions === 1 ? "" : "s"}`, sortValue: t.solutions }
        : { text: "no", note: t.reason ?? "out of reach", sortValue: 0 },
      { text: t.jointsDeg ? t.jointsDeg.map((v) => formatNumber(v, 1)).join(", ") : DASH },
      t.jointMarginDeg !== null
        ? {
            text: `${formatNumber(t.jointMarginDeg, 1)}°${t.tightestJoint ? ` (${t.tightestJoint})` : ""}`,
            sortValue: t.jointMarginDeg,
            ...(t.jointMarginMm !== null ? { note: `linear axes: ${formatQuantity(t.jointMarginMm, "mm", 1)}` } : {}),
          }
        : t.jointMarginMm !== null
          ? { text: formatQuantity(t.jointMarginMm, "mm", 1), sortValue: t.jointMarginMm }
          : { text: DASH },
      t.inverseCondition !== null
        ? { text: formatNumber(t.inverseCondition, 3), sortValue: t.inverseCondition }
        : { text: DASH },
      holdingCell(t, prismaticJoints),
    ],
  }));
  return {
    id,
    caption: `${armName}: targets`,
    columns: [
      { key: "target", label: "Target", numeric: false },
      { key: "reach", label: "Reached", numeric: false },
      { key: "joints", label: "Joints at first visit", unit: "deg; mm for linear axes", numeric: false },
      { key: "margin", label: "Joint margin", numeric: true },
      { key: "condition", label: "Inverse condition", numeric: true },
      { key: "holding", label: "Holding torque (force), largest share", numeric: false },
    ],
    rows,
    rowHeaders: true,
    footnote:
      "Solutions: every inverse-kinematics solution of the tool point inside the joint ranges (whole-turn variants " +
      "included). Joint margin: the smallest distance of a joint to a range end. Inverse condition: 1 isotropic, 0 " +
      "singular (as on the arm sheets). Holding torque: static, arm links and tool load under gravity, against the " +
      "rated torque (N for linear axes).",
  };
}

/** A step's speed in words, from the cell file: "100 %" for a joint move, "400 mm/s" or "joint limits" for a linear one. */
export function stepSpeedText(step: CellSpec["cycle"][number] | undefined): string {
  if (!step) return "";
  if (step.motion === "joint") return `${formatNumber(step.speedPercent ?? 100, 1)} %`;
  return step.speedMmPerS !== undefined ? formatQuantity(step.speedMmPerS, "mm/s") : "joint limits";
}

/** The moves of one arm: time, dwell, what limits it, the problem where it cannot be done. */
export function movesTable(arm: CellArmJson, cell: Pick<CellSpec, "cycle">, id: string, armName: string): TableModel {
  const rows: TableRow[] = arm.moves.map((m) => ({
    key: String(m.step),
    cells: [
      { text: String(m.step), sortValue: m.step },
      { text: `${m.from} \u2192 ${m.to}` },
      { text: `${m.motion}, ${stepSpeedText(cell.cycle[m.step - 1])}` },
      { text: m.carrying ?? DASH },
      m.timeS === null ? { text: DASH } : { text: formatNumber(m.timeS, 3), sortValue: m.timeS },
      { text: m.dwellS > 0 ? formatNumber(m.dwellS, 2) : "0", sortValue: m.dwellS },
      { text: m.limitedBy ?? DASH },
      m.problem
        ? {
            text: `${m.problem.kind}${m.problem.joint ? ` (${m.problem.joint})` : ""}`,
            note: `at ${formatVector(m.problem.positionMm, 0)} mm`,
          }
        : { text: DASH },
    ],
  }));
  return {
    id,
    caption: `${armName}: moves of the loop`,
    columns: [
      { key: "step", label: "Step", numeric: true },
      { key: "move", label: "Move", numeric: false },
      { key: "motion", label: "Motion, speed", numeric: false },
      { key: "carrying", label: "Carrying", numeric: false },
      { key: "time", label: "Time", unit: "s", numeric: true },
      { key: "dwell", label: "Dwell", unit: "s", numeric: true },
      { key: "limited", label: "Limited by", numeric: false },
      { key: "problem", label: "Problem", numeric: false },
    ],
    rows,
    rowHeaders: false,
    footnote:
      "Joint moves: every joint on a trapezoidal speed profile, all finishing together; linear moves: the time-optimal " +
      "timing along the straight line under every joint's speed and acceleration limit and the tool-speed cap. From " +
      "rest to rest, no blending.",
  };
}

const over = (used: number, allowed: number | null) => allowed !== null && used > allowed;

/** The tool loads of one arm: per load case and wrist rating, moment and inertia against the allowed values. */
export function toolLoadTable(arm: CellArmJson, id: string, armName: string): TableModel {
  const rows: TableRow[] = [];
  for (const load of arm.toolLoad) {
    const name = loadName(load.carrying);
    const massCell: TableCell = {
      text: formatNumber(load.massKg, 2),
      note: `rated ${formatQuantity(load.ratedPayloadKg, "kg", 1)}${load.withinRatedPayload ? "" : ": over"}`,
      sortValue: load.massKg,
    };
    const cg = { text: formatVector(load.cogMm, 1) };
    if (!load.ratings.length) {
      rows.push({
        key: `${name}`,
        cells: [
          { text: name },
          massCell,
          cg,
          { text: DASH, note: "no wrist rating in the arm file" },
          { text: DASH },
          { text: DASH },
          { text: load.withinRatedPayload ? "ok" : "over" },
        ],
      });
      continue;
    }
    for (const r of load.ratings) {
      const momentOver = over(r.momentNm, r.allowedMomentNm);
      const inertiaOver = over(r.inertiaKgM2, r.allowedInertiaKgM2);
      rows.push({
        key: `${name}/${r.joint}`,
        cells: [
          { text: name },
          massCell,
          cg,
          {
            text: `${r.joint} (${r.axis === "roll" ? "roll" : "bending"})`,
            note: `lever ${formatQuantity(r.leverMm, "mm", 1)}`,
          },
          {
            text: `${formatNumber(r.momentNm, 1)}${r.allowedMomentNm === null ? " (not rated)" : ` of ${formatNumber(r.allowedMomentNm, 1)}`}`,
            ...(momentOver ? { note: "over" } : {}),
            sortValue: r.momentNm,
          },
          {
            text: `${formatNumber(r.inertiaKgM2, 3)}${r.allowedInertiaKgM2 === null ? " (not rated)" : ` of ${formatNumber(r.allowedInertiaKgM2, 3)}`}`,
            ...(inertiaOver ? { note: "over" } : {}),
            sortValue: r.inertiaKgM2,
          },
          { text: r.ok && load.withinRatedPayload ? "ok" : "over" },
        ],
      });
    }
  }
  return {
    id,
    caption: `${armName}: tool load against the wrist ratings`,
    columns: [
      { key: "load", label: "Load", numeric: false },
      { key: "mass", label: "Mass", unit: "kg", numeric: true },
      { key: "cg", label: "Centre of gravity, flange frame", unit: "mm", numeric: false },
      { key: "rating", label: "Wrist rating", numeric: false },
      { key: "moment", label: "Moment, used of allowed", unit: "N\u00b7m", numeric: true },
      { key: "inertia", label: "Inertia, used of allowed", unit: "kg\u00b7m\u00b2", numeric: true },
      { key: "result", label: "Result", numeric: false },
    ],
    rows,
    rowHeaders: false,
    footnote:
      "Static: gripper, tooling and part all count as payload; acceleration derates further. Bending axes: moment " +
      "m·g·L with L from the pivot to the centre of gravity; inertia m·L² plus the load's largest principal moment (a " +
      "bound over wrist postures). Roll axis: moment m·g·(lever), inertia I_zz + m·(lever)².",
  };
}
