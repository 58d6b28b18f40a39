/**
 * The CSV downloads of an arm sheet: the joint table (from the arm file, as declared) and payload at reach (from the
 * analysis). Plain numbers in the file units named in each header; text cells escaped by csv.ts.
 */
import type { Arm } from "../catalog";
import type { ArmAnalysis } from "../core";
import { couplingFormula, drivenJointIndices } from "./jointTables";
import { csvRound, toCsv, type CsvCell } from "./csv";

/** Site paths of an arm's downloads (relative to the site base). */
export function armDataPaths(id: string): { json: string; payloadCsv: string; jointsCsv: string; urdf: string } {
  const e = encodeURIComponent(id);
  return {
    json: `data/arms/${e}.json`,
    payloadCsv: `data/arms/${e}/payload.csv`,
    jointsCsv: `data/arms/${e}/joints.csv`,
    urdf: `data/arms/${e}/arm.urdf`,
  };
}

export const JOINTS_CSV_HEADER = [
  "joint",
  "type",
  "drive",
  "follows",
  "relation",
  "range_min",
  "range_max",
  "range_unit",
  "max_speed",
  "speed_unit",
  "max_acceleration",
  "acceleration_unit",
  "rated_torque_or_force",
  "torque_or_force_unit",
  "note",
] as const;

/** The joint table as CSV: one row per joint in file order; passive joints have no limits of their own. */
export function jointsCsv(arm: Arm): string {
  const driven = drivenJointIndices(arm);
  const rows: CsvCell[][] = arm.spec.joints.map((j, i) => {
    const isDriven = driven.has(i);
    const prismatic = j.kind === "prismatic";
    const range = prismatic ? j.rangeMm : j.rangeDeg;
    const limits: CsvCell[] = isDriven
      ? [
          range?.[0] ?? null,
          range?.[1] ?? null,
          prismatic ? "mm" : "deg",
          prismatic ? (j.maxSpeedMmPerS ?? null) : (j.maxSpeedDegPerS ?? null),
          prismatic ? "mm/s" : "deg/s",
          prismatic ? (j.maxAccelMmPerS2 ?? null) : (j.maxAccelDegPerS2 ?? null),
          prismatic ? "mm/s2" : "deg/s2",
          prismatic ? (j.ratedForceN ?? null) : (j.ratedTorqueNm ?? null),
          prismatic ? "N" : "N·m",
        ]
      : [null, null, "", null, "", null, "", null, ""];
    return [
      j.name,
      j.kind,
      isDriven ? "driven" : "passive",
      j.coupling ? j.coupling.terms.map((t) => t.joint).join(" ") : "",
      j.coupling ? couplingFormula(j, isDriven) : "",
      ...limits,
      j.note ?? "",
    ];
  });
  return toCsv(JOINTS_CSV_HEADER, rows);
}

export const PAYLOAD_CSV_HEADER = [
  "mounting",
  "reach_mm",
  "cg_offset_mm",
  "payload_kg",
  "limited_by",
  "limiting_joint",
  "joint_ratings_limit_kg",
  "joint_ratings_limit_joint",
  "flange_height_mm",
  "basis",
] as const;

/** Payload at reach as CSV: one row per mounting, reach and CG offset, as the analysis gives them. */
export function payloadCsv(analysis: ArmAnalysis): string {
  const basis = analysis.payload.basis;
  const rows: CsvCell[][] = analysis.payload.atReach.map((r) => [
    r.mounting,
    csvRound(r.reachMm, 1),
    csvRound(r.offsetMm, 1),
    csvRound(r.payloadKg, 3),
    r.limitedBy,
    r.limitingJoint ?? "",
    csvRound(r.torqueLimitKg, 3),
    r.torqueLimitJoint ?? "",
    csvRound(r.flangeHeightMm, 1),
    basis,
  ]);
  return toCsv(PAYLOAD_CSV_HEADER, rows);
}
