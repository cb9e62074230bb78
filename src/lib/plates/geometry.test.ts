// Reference: plate layouts from the ANSI/SLAS microplate standards 1-2004 to 4-2004 (from memory):
// 96 = 8 × 12, 384 = 16 × 24, 1536 = 32 × 48, rows A–Z then AA–AF.
import { describe, expect, it } from "vitest";
import {
  allWells,
  canonicalWell,
  formatForGrid,
  indexOfWell,
  isEdgeWellName,
  paddedWellName,
  parseWellName,
  plateDimensions,
  rowIndexOfLabel,
  rowLabel,
  wellNameOfIndex,
} from "./geometry";

describe("plate geometry (ANSI/SLAS 1-2004…4-2004, from memory)", () => {
  it("has the standard dimensions", () => {
    expect(plateDimensions(96)).toMatchObject({ rows: 8, columns: 12 });
    expect(plateDimensions(384)).toMatchObject({ rows: 16, columns: 24 });
    expect(plateDimensions(1536)).toMatchObject({ rows: 32, columns: 48 });
    expect(formatForGrid(16, 24)).toBe(384);
    expect(formatForGrid(10, 12)).toBeUndefined();
  });

  it("labels rows A–Z then AA–AF", () => {
    expect(rowLabel(0)).toBe("A");
    expect(rowLabel(25)).toBe("Z");
    expect(rowLabel(26)).toBe("AA");
    expect(rowLabel(31)).toBe("AF");
    expect(() => rowLabel(32)).toThrow();
    expect(rowIndexOfLabel("af")).toBe(31);
    expect(rowIndexOfLabel("AG")).toBeUndefined();
  });

  it("parses A1, A01, a1 and AF48 to one canonical name", () => {
    expect(parseWellName("A1")).toEqual({ row: 0, column: 0 });
    expect(parseWellName("A01")).toEqual({ row: 0, column: 0 });
    expect(parseWellName(" a1 ")).toEqual({ row: 0, column: 0 });
    expect(parseWellName("AF48")).toEqual({ row: 31, column: 47 });
    expect(canonicalWell("p024", 384)).toBe("P24");
    expect(canonicalWell("P24", 96)).toBeUndefined();
    expect(canonicalWell("A0", 96)).toBeUndefined();
    expect(canonicalWell("af048")).toBe("AF48"); // no format: any well name (ANSI/SLAS rows A–P, AA–AF; common practice)
    expect(parseWellName("1A")).toBeUndefined();
    expect(parseWellName("ABC1")).toBeUndefined();
    expect(paddedWellName({ row: 0, column: 2 }, 96)).toBe("A03");
  });

  it("maps names to row-major indices and back", () => {
    expect(indexOfWell("A1", 96)).toBe(0);
    expect(indexOfWell("A12", 96)).toBe(11);
    expect(indexOfWell("B1", 96)).toBe(12);
    expect(indexOfWell("H12", 96)).toBe(95);
    expect(indexOfWell("AF48", 1536)).toBe(1535);
    for (const f of [96, 384, 1536] as const) {
      const names = allWells(f);
      expect(names).toHaveLength(f);
      expect(new Set(names).size).toBe(f);
      names.forEach((n, i) => expect(indexOfWell(n, f)).toBe(i));
    }
    expect(wellNameOfIndex(383, 384)).toBe("P24");
  });

  it("finds the outer ring (edge wells, common practice)", () => {
    expect(isEdgeWellName("A5", 96)).toBe(true);
    expect(isEdgeWellName("H5", 96)).toBe(true);
    expect(isEdgeWellName("D1", 96)).toBe(true);
    expect(isEdgeWellName("D12", 96)).toBe(true);
    expect(isEdgeWellName("D6", 96)).toBe(false);
    // The outer ring holds 2·rows + 2·columns − 4 wells.
    for (const f of [96, 384, 1536] as const) {
      const d = plateDimensions(f);
      expect(allWells(f).filter((w) => isEdgeWellName(w, f))).toHaveLength(2 * d.rows + 2 * d.columns - 4);
    }
  });
});
