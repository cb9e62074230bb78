import "server-only";
/** Plate use cases: plate maps, uploads of reader exports, QC review (masks, decisions), and reading runs back. */
export { issueDetails } from "./errors";
export { createPlateMap, getPlateMap, listPlateMaps, updatePlateMap, type PlateMapInput } from "./plate-maps";
export { readPlateMapCsv, readPlateMapJson } from "./plate-maps-import";
export { copyPlateMap, deletePlateMap, plateMapWithUse } from "./plate-maps-manage";
export { checkWellNames, runHead } from "./run-checks";
export {
  previewRun,
  s3KeyFor,
  uploadRun,
  UPLOAD_LIMIT_BYTES,
  type RunPreview,
  type RunSummary,
  type UploadInput,
} from "./upload";
export {
  changeMasks,
  compoundMaskedWells,
  decideRun,
  maskWell,
  unmaskWell,
  type CompoundMaskedWell,
  type MaskEdit,
} from "./review";
export { getRawFile, getRunDetail, listRuns, zPrimeTrend } from "./readings";
