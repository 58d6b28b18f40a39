/** What the cell pages take from a catalog arm besides the study (build time only: the catalog's Arm type). */
import type { Arm } from "../catalog";
import { drivenJointIndices } from "./jointTables";

/** The driven joints that slide (linear axes), by name: their holding figures are forces, their joints mm. */
export function prismaticJointNames(arm: Arm): string[] {
  const driven = drivenJointIndices(arm);
  return arm.spec.joints.filter((j, i) => driven.has(i) && j.kind === "prismatic").map((j) => j.name);
}

/** Units of the driven joints in order: "deg" for turning joints, "mm" for linear ones. */
export function drivenJointUnits(arm: Arm): string[] {
  const driven = drivenJointIndices(arm);
  return arm.spec.joints.filter((_, i) => driven.has(i)).map((j) => (j.kind === "prismatic" ? "mm" : "deg"));
}
