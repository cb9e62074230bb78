import { rangeFields, sortFields, type HitQueryParams, type RangeField, type SortField } from "./query";

/**
 * Turns what AG Grid's infinite row model asks for (sort model, filter model) plus the toolbar's
 * choices into the hit API's query parameters, so the grid, the API and the export link share one
 * query. Column ids are the API's field names. Number filters are inclusive ranges in the API's
 * units (µM for concentrations).
 */
export type GridSort = { colId: string; sort: "asc" | "desc" }[];
export type GridNumberFilter = { filterType: "number"; type: string; filter?: number | null; filterTo?: number | null };
export type GridTextFilter = { filterType: "text"; type: string; filter?: string | null };
export type GridFilterModel = Record<string, GridNumberFilter | GridTextFilter | { filterType?: string }>;
export type Toolbar = {
  status?: string[];
  mechanism?: string[];
  flagged?: "" | "true" | "false";
  hit?: "" | "true" | "false";
};

const isRange = (f: string): f is RangeField => (rangeFields as readonly string[]).includes(f);
const isSort = (f: string): f is SortField => (sortFields as readonly string[]).includes(f);

export function gridToQuery(sortModel: GridSort, filterModel: GridFilterModel, toolbar: Toolbar = {}): HitQueryParams {
  const q: HitQueryParams = {};
  const s = sortModel[0];
  if (s && isSort(s.colId) && s.colId !== "default") {
    q.sort = s.colId;
    q.dir = s.sort;
  }
  for (const [colId, model] of Object.entries(filterModel)) {
    if (model.filterType === "number" && isRange(colId)) {
      const m = model as GridNumberFilter;
      const a = m.filter ?? null;
      const b = m.filterTo ?? null;
      if ((m.type === "greaterThanOrEqual" || m.type === "greaterThan") && a !== null) q[`${colId}Min`] = String(a);
      else if ((m.type === "lessThanOrEqual" || m.type === "lessThan") && a !== null) q[`${colId}Max`] = String(a);
      else if (m.type === "equals" && a !== null) {
        q[`${colId}Min`] = String(a);
        q[`${colId}Max`] = String(a);
      } else if (m.type === "inRange") {
        if (a !== null) q[`${colId}Min`] = String(Math.min(a, b ?? a));
        if (b !== null) q[`${colId}Max`] = String(Math.max(b, a ?? b));
      }
    } else if (model.filterType === "text") {
      const m = model as GridTextFilter;
      const v = (m.filter ?? "").trim();
      if (!v) continue;
      if (colId === "registryId") q.q = v;
      else if (colId === "owner") q.owner = v;
    }
  }
  if (toolbar.status?.length) q.status = toolbar.status.join(",");
  if (toolbar.mechanism?.length) q.mechanism = toolbar.mechanism.join(",");
  if (toolbar.flagged) q.flagged = toolbar.flagged;
  if (toolbar.hit) q.hit = toolbar.hit;
  return q;
}

/** The reverse, for restoring a saved view into the grid: filter model and toolbar from query parameters. */
export function queryToGrid(q: HitQueryParams): {
  sortModel: GridSort;
  filterModel: GridFilterModel;
  toolbar: Toolbar;
} {
  const sortModel: GridSort =
    q.sort && isSort(q.sort) && q.sort !== "default"
      ? [{ colId: q.sort, sort: q.dir === "desc" ? "desc" : "asc" }]
      : [];
  const filterModel: GridFilterModel = {};
  for (const f of rangeFields) {
    const min = q[`${f}Min`];
    const max = q[`${f}Max`];
    if (min !== undefined && max !== undefined)
      filterModel[f] = { filterType: "number", type: "inRange", filter: Number(min), filterTo: Number(max) };
    else if (min !== undefined)
      filterModel[f] = { filterType: "number", type: "greaterThanOrEqual", filter: Number(min) };
    else if (max !== undefined) filterModel[f] = { filterType: "number", type: "lessThanOrEqual", filter: Number(max) };
  }
  if (q.q) filterModel.registryId = { filterType: "text", type: "contains", filter: q.q };
  if (q.owner) filterModel.owner = { filterType: "text", type: "contains", filter: q.owner };
  const flagged = q.flagged === "true" || q.flagged === "false" ? q.flagged : "";
  const hit = q.hit === "true" || q.hit === "false" ? q.hit : "";
  return {
    sortModel,
    filterModel,
    toolbar: {
      status: q.status ? q.status.split(",") : [],
      mechanism: q.mechanism ? q.mechanism.split(",") : [],
      flagged,
      hit,
    },
  };
}
