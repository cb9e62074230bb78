export * from "./authenticate";
export * from "./manage";
export { newTokenSecret, tokenHashOf } from "./secret";
