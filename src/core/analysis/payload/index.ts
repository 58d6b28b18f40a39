/** Public API of the payload analyses: input, load diagram and warnings, payload at reach, all together. */
export * from "./analysePayload";
export * from "./atReach";
export * from "./atReachTypes";
export * from "./input";
export * from "./loadDiagram";
