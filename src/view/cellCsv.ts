/**
 * The CSV downloads of a cell study: every move and every target of every candidate arm, plain numbers in the units
 * named in the headers (text cells escaped by csv.ts). Arms in the study's order (passing arms by cycle time first).
 */
import type { CellStudyJson } from "../core";
import { toCsv, type CsvCell } from "./csv";

export const MOVES_CSV_HEADER = [
  "arm",
  "rank",
  "verdict",
  "step",
  "from",
  "to",
  "motion",
  "carrying",
  "time_s",
  "dwell_s",
  "limited_by",
  "feasible",
  "problem",
  "problem_joint",
  "problem_x_mm",
  "problem_y_mm",
  "problem_z_mm",
] as const;

/** One row per move of every arm; time empty where the move cannot be done. */
export function movesCsv(study: CellStudyJson): string {
  const rows: CsvCell[][] = [];
  for (const a of study.arms)
    for (const m of a.moves)
      rows.push([
        a.arm,
        a.rank,
        a.verdict,
        m.step,
        m.from,
        m.to,
        m.motion,
        m.carrying ?? "",
        m.timeS,
        m.dwellS,
        m.limitedBy ?? "",
        m.feasible ? "yes" : "no",
        m.problem?.kind ?? "",
        m.problem?.joint ?? "",
        m.problem?.positionMm[0] ?? null,
        m.problem?.positionMm[1] ?? null,
        m.problem?.positionMm[2] ?? null,
      ]);
  return toCsv(MOVES_CSV_HEADER, rows);
}

/**
 * One row per target of every arm: the joints of the solution at its first visit in columns j1…jN (N: the most
 * driven joints of any arm; deg for turning joints, mm for linear ones, as `joint_units` says when the caller knows
 * the arm's joints), margins, inverse condition and the joint with the largest holding-torque share.
 */
export function targetsCsv(
  study: CellStudyJson,
  jointUnits: ReadonlyMap<string, readonly string[]> = new Map(),
): string {
  const n = Math.max(0, ...study.arms.flatMap((a) => a.targets.map((t) => t.jointsDeg?.length ?? 0)));
  const jointCols = Array.from({ length: n }, (_, i) => `j${i + 1}`);
  const header = [
    "arm",
    "target",
    "reachable",
    "solutions",
    "reason",
    ...jointCols,
    "joint_units",
    "joint_margin_deg",
    "tightest_joint",
    "joint_margin_mm",
    "inverse_condition",
    "holding_joint",
    "holding_torque_nm",
    "holding_rated_nm",
    "holding_ok",
  ];
  const rows: CsvCell[][] = [];
  for (const a of study.arms)
    for (const t of a.targets) {
      const joints = Array.from({ length: n }, (_, i) => t.jointsDeg?.[i] ?? null);
      const worst = t.holding.length
        ? t.holding.reduce((x, y) => (y.torqueNm / y.ratedNm > x.torqueNm / x.ratedNm ? y : x))
        : null;
      rows.push([
        a.arm,
        t.name,
        t.reachable ? "yes" : "no",
        t.solutions,
        t.reason ?? "",
        ...joints,
        (jointUnits.get(a.arm) ?? []).join(" "),
        t.jointMarginDeg,
        t.tightestJoint ?? "",
        t.jointMarginMm,
        t.inverseCondition,
        worst?.joint ?? "",
        worst?.torqueNm ?? null,
        worst?.ratedNm ?? null,
        worst ? (worst.ok ? "yes" : "no") : "",
      ]);
    }
  return toCsv(header, rows);
}
