export * from "./auth";
export * from "./audit";
export * from "./plates";
export * from "./analyses";
export * from "./compounds";
export * from "./digest";
export * from "./hits";
export * from "./workers";
