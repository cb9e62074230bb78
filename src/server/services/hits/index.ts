import "server-only";
/**
 * The hit grid's use cases: keeping the rows in step with the results (refresh), reading and
 * exporting a view (list, export), triage decisions and comments (triage), the compound panel
 * (panel) and saved views (views).
 */
export { bumpHitVersion, headlineKeySql, refreshHitRows } from "./refresh";
export { HIT_UNITS, hitJson, listHits, listHitsJson, type HitItem, type HitRow } from "./list";
export { EXPORT_MAX_ROWS, exportColumns, exportHits, hitsCsv, hitsXlsx } from "./export";
export { addComment, setTriageStatus } from "./triage";
export { hitDetail, hitStructureKey } from "./panel";
export { deleteView, listViews, saveView } from "./views";
