/**
 * Plate library: geometry, plate maps (CSV, editor helpers, validation) and reader export parsing.
 * Pure: no database, network or file system. The simulator, layouts and writers that make the
 * invented demo and fixture plates are in `./invented` (not part of this production barrel).
 */
export * from "./geometry";
export * from "./issues";
export { formulaInjectionMessage, parseNumber } from "./cells";
export * from "./plate-map";
export * from "./editor";
export * from "./reader-export";
export { parseTimeLabel, parseDuration } from "./read-time";
