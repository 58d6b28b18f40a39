/** Public API of the pure computation core: no Astro, no filesystem, no clock, no unseeded randomness. */
export * from "./units";
export * from "./math/mat4";
export * from "./math/svd";
export type { Chain, WristCentre } from "./kinematics/chain";
export * from "./kinematics/compile";
export * from "./kinematics/forward";
export * from "./kinematics/pose";
export * from "./analysis/envelope/envelope";
export * from "./analysis/speed";
export * from "./analysis/singularity";
