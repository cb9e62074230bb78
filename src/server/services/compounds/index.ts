import "server-only";

// The compound registry's use cases; callers import them from "@/server/services/compounds".
export { insertCompounds, prepareStructure, prepareStructureOffThread, type PreparedCompound } from "./write";
export { drawingResponse, structureSvgOf, structureSvgs } from "./drawings";
export { STRUCTURE_TIME_LIMIT_MS } from "./prepare-pool";
export { addBatch, addStock, editCompound, registerCompound, type RegisterResult } from "./register";
export {
  compoundSummary,
  countCompounds,
  getCompound,
  PROPERTY_UNITS,
  type CompoundDetail,
  type CompoundRow,
  type CompoundSummary,
} from "./read";
export {
  MAX_SUBSTRUCTURE_CANDIDATES,
  searchCompounds,
  SMALL_CANDIDATE_SET,
  SMALL_SET_BUDGET_MS,
  SORT_FIELDS,
  SUBSTRUCTURE_BUDGET_MS,
  type SearchInput,
  type SearchResult,
  type SortField,
} from "./search";
export { addToLibrary, createLibrary, getLibrary, listLibraries, parseIdList, removeFromLibrary } from "./libraries";
export { resultsForCompound, type CompoundResultRow } from "./results";
export { importFormatOf, importS3Key, startImport, waitForImport } from "./imports/start";
export { getImport, importView, listImports } from "./imports/view";
export { commitImport } from "./imports/commit";
export { importReportCsv } from "./imports/report";
export type { ImportJob, ImportMode, ImportPreview, ImportResult } from "./imports/types";
