/** Charts: pure (data, size) → SVG string functions built on d3-scale, d3-shape, d3-contour and d3-array. */
export * from "./svg";
export * from "./axes";
export * from "./layout";
export * from "./legend";
export * from "./geometry";
export * from "./theme";
export * from "./envelopeChart";
export * from "./speedMapChart";
export * from "./capabilityMapChart";
export * from "./singularityChart";
export * from "./payloadChart";
export * from "./loadDiagramChart";
export * from "./cycleChart";
export * from "./stoppingChart";
