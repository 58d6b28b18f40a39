export * from "./schema";
export * from "./issues";
export * from "./validate";
export * from "./load";
export * from "./cell";
