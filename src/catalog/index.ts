export * from "./schema";
export * from "./datasheetSchema";
export * from "./issues";
export * from "./validate";
export * from "./load";
export * from "./cell";
