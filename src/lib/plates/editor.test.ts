// Checks: dilution series values are top/factor^k (common practice for serial dilutions); the
// expected numbers are written out by hand, not computed by the module.
import { describe, expect, it } from "vitest";
import {
  assignWells,
  fillDilutionSeries,
  mechanismMatrix,
  placeWells,
  selectBlock,
  selectColumns,
  selectRows,
} from "./editor";
import { emptyPlateMap, getPlateMapWell } from "./plate-map";

describe("plate map editor helpers", () => {
  it("selects a rectangle from either corner", () => {
    expect(selectBlock(96, "B2", "C3")).toEqual(["B2", "B3", "C2", "C3"]);
    expect(selectBlock(96, "c3", "B02")).toEqual(["B2", "B3", "C2", "C3"]);
    expect(selectBlock(1536, "AE47", "AF48")).toEqual(["AE47", "AE48", "AF47", "AF48"]);
    expect(selectBlock(1536, "A1", "AF48")).toHaveLength(1536);
    expect(selectRows(384, ["P"])).toHaveLength(24);
    expect(selectColumns(1536, [1])).toHaveLength(32);
    expect(() => selectBlock(96, "A1", "I1")).toThrow('"I1" is not a well of a 96-well plate');
  });

  it("assigns roles and compounds without touching the input", () => {
    const before = emptyPlateMap(96);
    const after = assignWells(before, ["A1", "A2"], { role: "sample", compound: "INH-000001", concentrationUm: 5 });
    expect(getPlateMapWell(before, "A1")).toEqual({ well: "A1", role: "empty" });
    expect(getPlateMapWell(after, "A2")).toEqual({
      well: "A2",
      role: "sample",
      compound: "INH-000001",
      concentrationUm: 5,
    });
    const cleared = assignWells(after, ["A2"], { compound: null });
    expect(getPlateMapWell(cleared, "A2")).toEqual({ well: "A2", role: "sample", concentrationUm: 5 });
    expect(getPlateMapWell(assignWells(after, ["A1"], { role: "empty" }), "A1")).toEqual({ well: "A1", role: "empty" });
  });

  it("fills 1:3 along rows and 1:2 / 1:10 down columns", () => {
    const m = fillDilutionSeries(emptyPlateMap(96), {
      from: "A1",
      to: "B4",
      along: "row",
      topConcentrationUm: 90,
      dilutionFactor: 3,
      compound: "INH-000007",
    });
    expect(["A1", "A2", "A3", "A4", "B1", "B4"].map((w) => getPlateMapWell(m, w)?.concentrationUm)).toEqual([
      90, 30, 10, 3.33333333333, 90, 3.33333333333,
    ]);
    expect(getPlateMapWell(m, "B2")).toMatchObject({ role: "sample", compound: "INH-000007" });
    const c = fillDilutionSeries(emptyPlateMap(384), {
      from: "A5",
      to: "D5",
      along: "column",
      topConcentrationUm: 100,
      dilutionFactor: 10,
    });
    expect(["A5", "B5", "C5", "D5"].map((w) => getPlateMapWell(c, w)?.concentrationUm)).toEqual([100, 10, 1, 0.1]);
    const r = fillDilutionSeries(emptyPlateMap(96), {
      from: "A1",
      to: "A3",
      along: "row",
      topConcentrationUm: 8,
      dilutionFactor: 2,
      descendingFrom: "to",
    });
    expect(["A1", "A2", "A3"].map((w) => getPlateMapWell(r, w)?.concentrationUm)).toEqual([2, 4, 8]);
    expect(() =>
      fillDilutionSeries(emptyPlateMap(96), {
        from: "A1",
        to: "A3",
        along: "row",
        topConcentrationUm: 8,
        dilutionFactor: 1,
      }),
    ).toThrow();
  });

  it("lays out a substrate × inhibitor matrix with replicates in adjacent rows", () => {
    const wells = mechanismMatrix({
      format: 96,
      compound: "INH-000003",
      substrateUm: [5, 10, 20],
      inhibitorUm: [0, 1],
      replicates: 2,
      origin: "B2",
    });
    expect(wells).toHaveLength(12);
    expect(wells[0]).toEqual({
      well: "B2",
      role: "sample",
      compound: "INH-000003",
      concentrationUm: 0,
      substrateUm: 5,
      group: "S5_I0",
    });
    expect(wells.find((w) => w.well === "C4")).toMatchObject({ concentrationUm: 0, substrateUm: 20 });
    expect(wells.find((w) => w.well === "E2")).toMatchObject({ concentrationUm: 1, substrateUm: 5, group: "S5_I1" });
    const map = placeWells(emptyPlateMap(96), wells);
    expect(getPlateMapWell(map, "E4")?.group).toBe("S20_I1");
    expect(() =>
      mechanismMatrix({ format: 96, compound: "X", substrateUm: [1], inhibitorUm: [0, 1, 2, 3, 4], replicates: 2 }),
    ).toThrow(/does not fit a 96-well plate/);
  });
});
