/** View layer: pure functions from catalog arms to formatted page props. No Astro, no I/O. */
export * from "./format";
export * from "./links";
export * from "./cautions";
export * from "./csp";
export * from "./labels";
export * from "./table";
export * from "./jointTables";
export * from "./catalogPageModel";
export * from "./armPageModel";
export * from "./armAnalysisModel";
export * from "./armCsv";
export * from "./csv";
export * from "./siteModel";
export * from "./warningText";
