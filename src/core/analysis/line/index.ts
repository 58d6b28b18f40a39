/** The straight-line check (README.md in this folder): lineCheck and its input, options and result types. */
export { lineCheck } from "./lineCheck";
export * from "./types";
export * from "./lineMm";
