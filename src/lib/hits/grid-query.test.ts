// The grid's request → API query translation (no outside reference: the API's own contract).
import { describe, it, expect } from "vitest";
import { gridToQuery, queryToGrid } from "./grid-query";

describe("grid request to hit query", () => {
  it("maps the sort model, inclusive number ranges, text filters and the toolbar", () => {
    const q = gridToQuery(
      [{ colId: "ki", sort: "desc" }],
      {
        ic50: { filterType: "number", type: "inRange", filter: 3, filterTo: 0.1 },
        le: { filterType: "number", type: "greaterThanOrEqual", filter: 0.3 },
        registryId: { filterType: "text", type: "contains", filter: " INH-0001 " },
      },
      { status: ["unreviewed", "on-hold"], mechanism: ["competitive"], flagged: "false" },
    );
    expect(q).toEqual({
      sort: "ki",
      dir: "desc",
      ic50Min: "0.1",
      ic50Max: "3",
      leMin: "0.3",
      q: "INH-0001",
      status: "unreviewed,on-hold",
      mechanism: "competitive",
      flagged: "false",
    });
  });
  it("round-trips through a saved view", () => {
    const q = { sort: "lipe", dir: "asc", kiMax: "0.5", status: "confirmed", owner: "Lars" };
    const g = queryToGrid(q);
    expect(gridToQuery(g.sortModel, g.filterModel, g.toolbar)).toEqual(q);
  });
});
