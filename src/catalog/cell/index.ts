export * from "./schema";
export * from "./validate";
export * from "./load";
