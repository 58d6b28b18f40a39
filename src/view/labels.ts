/** Plain words for the enumerations of the arm format. */
import type { ArmSpec } from "../catalog";

export const CLASS_LABEL: Readonly<Record<ArmSpec["class"], string>> = {
  articulated: "Articulated",
  collaborative: "Collaborative",
  scara: "SCARA",
  palletizer: "Palletizer",
  gantry: "Gantry",
  other: "Other",
};

export const CONVENTION_LABEL: Readonly<Record<ArmSpec["convention"], string>> = {
  dh: "Standard Denavit\u2013Hartenberg",
  mdh: "Modified Denavit\u2013Hartenberg (Craig)",
  frames: "Joint frames (origin and axis, as URDF)",
  dimensions: "Dimension drawing (seven lengths of an ortho-parallel six-axis arm)",
};

export const MOUNTING_LABEL: Readonly<Record<ArmSpec["mountings"][number], string>> = {
  floor: "floor",
  ceiling: "ceiling",
  wall: "wall",
  angled: "angled",
};
