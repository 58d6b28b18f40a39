/** Public API of the pure computation core: no Astro, no filesystem, no clock, no unseeded randomness. */
export * from "./units";
export * from "./math/mat4";
export * from "./math/svd";
export type { Chain, WristCentre } from "./kinematics/chain";
export * from "./kinematics/compile";
export * from "./kinematics/forward";
export * from "./kinematics/pose";
export * from "./analysis/envelope/envelope";
export * from "./measures/speed";
export * from "./measures/singularity";
export * from "./analysis/warnings";
export type { CycleFailure, CycleResult } from "./analysis/cycle/cycle";
export type { PayloadAnalysis } from "./analysis/payload";
export type { AnalysisOptions, ArmAnalysis } from "./analysis/armAnalysis";
export * from "./kinematics/statics";
export * from "./analysis/analyseArm";
export { STANDARD_CYCLE_MOVES } from "./analysis/cycle/cycle";
export * from "./kinematics/toolOrientation";
export * from "./analysis/line";
export * from "./analysis/standardLines/standardLines";
export type { PayloadInput, PayloadSpec, WristLever, WristRating } from "./analysis/payload/input";
export { payloadInputOf } from "./analysis/payload/input";
export type {
  BodySpec,
  CellRequirementsSpec,
  CellSpec,
  CycleStepSpec,
  InertiaSpec,
  PlacementSpec,
  TargetSpec,
} from "./analysis/cell/types";
export * from "./analysis/cell/targets";
export * from "./analysis/cell/grip";
export * from "./analysis/cell/toolLoad";
export { symmetricEigenvalues3 } from "./math/sym3";
export * from "./analysis/cell/study";
export * from "./analysis/placement/placement";
export type { PlacementBest } from "./analysis/placement/fastest";
export * from "./analysis/cell/jointMove";
export * from "./analysis/cell/timeOptimal";
