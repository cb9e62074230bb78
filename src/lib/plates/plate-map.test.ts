// Checks: plate map CSV rules of this product; formula-injection rule from the OWASP "CSV
// Injection" guidance (= + - @, tab, carriage return); CSV quoting per RFC 4180.
import { describe, expect, it } from "vitest";
import {
  emptyPlateMap,
  parsePlateMapCsv,
  plateMapFromJson,
  plateMapToCsv,
  validatePlateMap,
  countRoles,
  getPlateMapWell,
} from "./plate-map";
import { assignWells, selectColumns } from "./editor";

const controls = [
  "A1,neutral,,,,",
  "B1,neutral,,,,",
  "C1,neutral,,,,",
  "D1,neutral,,,,",
  "E1,full,INH-000099,10,,",
  "F1,full,INH-000099,10,,",
  "G1,full,INH-000099,10,,",
  "H1,full,INH-000099,10,,",
];
const header = "well,role,compound,concentration_uM,substrate_uM,group";

function csv(...lines: string[]): string {
  return [header, ...controls, ...lines].join("\n") + "\n";
}

function messages(text: string, format: 96 | 384 | 1536 = 96): string[] {
  const r = parsePlateMapCsv(text, format, "map.csv");
  if (r.ok) return [];
  return r.issues.map((i) => i.text);
}

describe("plate map CSV import", () => {
  it("reads a valid map; unlisted wells are empty; A01 and a1 are accepted", () => {
    const r = parsePlateMapCsv(csv("A02,sample,INH-000001,10,50,r1", "a3,Sample,INH-000001,3.33,50,r1"), 96);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(getPlateMapWell(r.map, "A2")).toEqual({
      well: "A2",
      role: "sample",
      compound: "INH-000001",
      concentrationUm: 10,
      substrateUm: 50,
      group: "r1",
    });
    expect(getPlateMapWell(r.map, "A3")?.concentrationUm).toBe(3.33);
    expect(getPlateMapWell(r.map, "H12")).toEqual({ well: "H12", role: "empty" });
    expect(countRoles(r.map)).toEqual({ sample: 2, neutral: 4, full: 4, blank: 0, empty: 86 });
  });

  it("accepts columns in any order and header case, and a quoted field (RFC 4180)", () => {
    const text = [
      "Role,WELL,Compound,Concentration_uM",
      ...controls.map((l) => {
        const [w, role, c, conc] = l.split(",");
        return `${role},${w},${c},${conc}`;
      }),
      'sample,A2,"INH-000001",1',
    ].join("\r\n");
    const r = parsePlateMapCsv(text, 96);
    expect(r.ok).toBe(true);
  });

  it("names the line of a quote that is never closed", () => {
    const r = parsePlateMapCsv(csv('A2,sample,"INH-000001,10,,'), 96, "map.csv");
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues.map((i) => i.text)).toEqual([`map.csv line ${controls.length + 2}: a quoted cell is not closed`]);
  });

  it("round-trips through export (A1 form and padded A01 form)", () => {
    const r = parsePlateMapCsv(csv("A2,sample,INH-000001,10,50,r1", "P24,blank,,,,"), 384);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    for (const padded of [false, true]) {
      const again = parsePlateMapCsv(plateMapToCsv(r.map, { padded }), 384);
      expect(again.ok && again.map).toEqual(r.map);
    }
    expect(plateMapToCsv(r.map).split("\n")[0]).toBe(header);
    expect(plateMapToCsv(r.map, { padded: true })).toContain("\nA02,sample,INH-000001,10,50,r1\n");
  });

  it("gives each problem its exact message with line and well", () => {
    expect(messages(csv("I1,sample,INH-000001,1,,"))).toEqual([
      'map.csv line 10: "I1" is not a well of a 96-well plate',
    ]);
    expect(messages(csv("XX1,sample,INH-000001,1,,"))).toEqual(['map.csv line 10: "XX1" is not a well name']);
    expect(messages(csv("A2,sample,INH-000001,1,,", "A02,sample,INH-000002,1,,"))).toEqual([
      "map.csv line 11, well A2: well is listed twice (first on line 10)",
    ]);
    expect(messages(csv("A2,control,,,,"))).toEqual([
      'map.csv line 10, well A2: unknown role "control"; use sample, neutral, full, blank, empty',
    ]);
    expect(messages(csv("A2,sample,,1,,"))).toEqual(["map.csv line 10, well A2: sample well has no compound"]);
    expect(messages(csv("A2,sample,INH-000001,,,"))).toEqual([
      "map.csv line 10, well A2: sample well has no concentration_uM",
    ]);
    expect(messages(csv("A2,sample,INH-000001,-1,,"))).toEqual([
      "map.csv line 10, well A2: concentration_uM -1 is negative",
    ]);
    expect(messages(csv("A2,sample,INH-000001,ten,,"))).toEqual([
      'map.csv line 10, well A2: concentration_uM "ten" is not a number',
    ]);
    expect(messages(csv("A2,sample,INH-000001,1,-5,"))).toEqual([
      "map.csv line 10, well A2: substrate_uM -5 is negative",
    ]);
    expect(messages(csv("A2,,INH-000001,1,,"))).toEqual(["map.csv line 10, well A2: role is missing"]);
    expect(messages([header, "A1,neutral,,,,"].join("\n"))).toEqual([
      "map.csv: plate map has 1 neutral control wells; at least 4 are needed",
      "map.csv: plate map has 0 full-inhibition control wells; at least 4 are needed",
    ]);
    expect(messages("well,role,concentration_nM\nA1,sample,1\n")).toEqual([
      'map.csv line 1: unknown column "concentration_nM"; expected well, role, compound, concentration_uM, substrate_uM, group',
    ]);
    expect(messages("")).toEqual(["map.csv: file is empty"]);
  });

  it("refuses formula-like text (OWASP CSV injection: = + - @)", () => {
    for (const bad of ['=HYPERLINK("http://x")', "+1+1", "-2+3", "@SUM(A1)"]) {
      const m = messages(csv(`A2,sample,${bad.includes(",") ? `"${bad}"` : bad},1,,`));
      expect(m).toHaveLength(1);
      expect(m[0]).toMatch(
        /^map\.csv line 10: ".*" starts with "[=+\-@]", which a spreadsheet may run as a formula; text like this is refused$/,
      );
    }
    expect(messages(csv("A2,sample,INH-000001,1,,\"=cmd|' /C calc'!A0\""))).toEqual([
      `map.csv line 10: "=cmd|' /C calc'!A0" starts with "=", which a spreadsheet may run as a formula; text like this is refused`,
    ]);
  });

  it("collects several problems at once, capped at 50", () => {
    const lines = Array.from({ length: 80 }, (_, i) => `A${(i % 11) + 2},bogus,,,,`);
    const r = parsePlateMapCsv(csv(...lines), 96);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues).toHaveLength(50);
  });
});

describe("plate map validation outside CSV (editor, JSON)", () => {
  it("applies the same rules", () => {
    let map = emptyPlateMap(96);
    map = assignWells(map, ["A1", "B1", "C1"], { role: "neutral" });
    map = assignWells(map, ["A2"], { role: "sample", compound: "INH-000001" });
    expect(validatePlateMap(map).map((i) => i.text)).toEqual([
      "well A2: sample well has no concentration_uM",
      "plate map has 3 neutral control wells; at least 4 are needed",
      "plate map has 0 full-inhibition control wells; at least 4 are needed",
    ]);
    map = assignWells(map, selectColumns(96, [12]), { role: "full" });
    map = assignWells(map, ["D1", "A2"], { role: "neutral" });
    expect(validatePlateMap(map)).toEqual([]);
  });

  it("parses the JSON form with zod and fills the rest with empty wells", () => {
    const wells = [
      ...["A1", "B1", "C1", "D1"].map((well) => ({ well, role: "neutral" })),
      ...["E1", "F1", "G1", "H1"].map((well) => ({ well, role: "full" })),
      { well: "a02", role: "sample", compound: "INH-000001", concentrationUm: 1 },
    ];
    const r = plateMapFromJson({ format: 96, wells });
    expect(r.ok).toBe(true);
    if (r.ok) expect(getPlateMapWell(r.map, "A2")?.well).toBe("A2");
    const bad = plateMapFromJson({ format: 96, wells: [...wells, { well: "Z9", role: "blank" }] });
    expect(bad.ok === false && bad.issues.map((i) => i.text)).toEqual(['"Z9" is not a well of a 96-well plate']);
    expect(plateMapFromJson({ format: 95, wells: [] }).ok).toBe(false);
  });
});
