// Round trip: everything the simulator writes must parse with our own parser, into the shape,
// format, reads and wells its truth says; each bad fixture must fail with its exact message; the
// committed files in fixtures/plates must be what the generator writes today. All data INVENTED.
import { existsSync, readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import { demoCampaignPlates } from "./demo-campaign";
import { buildFixtureSet, type FixtureSet } from "./fixture-set";
import { parsePlateMapCsv, type PlateMap } from "./plate-map";
import { parseReaderExport, parseReaderExportText, type ReaderExport } from "./reader-export";

const dir = fileURLToPath(new URL("../../../fixtures/plates/", import.meta.url));
let set: FixtureSet;
beforeAll(async () => {
  set = await buildFixtureSet();
});

function bytesOf(contents: string | Uint8Array): Uint8Array {
  return typeof contents === "string" ? new TextEncoder().encode(contents) : contents;
}

function baseName(path: string): string {
  return path.split("/").pop()!;
}

/** Every well the map uses (not empty) has a reading. */
function expectMapCovered(map: PlateMap, exp: ReaderExport): void {
  const missing = map.wells.filter((w) => w.role !== "empty" && !exp.wells.has(w.well)).map((w) => w.well);
  expect(missing).toEqual([]);
}

describe("fixture set", () => {
  it("parses every good file into what its truth says, with its plate map", async () => {
    for (const g of set.good) {
      const file = set.files.find((f) => f.path === g.file)!;
      const mapFile = set.files.find((f) => f.path === g.map)!;
      const m = parsePlateMapCsv(bytesOf(mapFile.contents), g.format, g.map);
      expect(m.ok, `${g.map}: ${m.ok ? "" : m.issues[0]?.text}`).toBe(true);
      const r = await parseReaderExport(bytesOf(file.contents), g.file, { format: g.format });
      if (!r.ok) throw new Error(r.issues.map((i) => i.text).join("; "));
      expect({
        shape: r.export.shape,
        format: r.export.format,
        reads: r.export.reads,
        wells: r.export.wells.size,
      }).toEqual({
        shape: g.shape,
        format: g.format,
        reads: g.reads,
        wells: g.wells,
      });
      if (m.ok) expectMapCovered(m.map, r.export);
    }
  });

  it("holds the same read in the long and grid forms of single-dose-96", () => {
    const get = (p: string) => parseReaderExportText(set.files.find((f) => f.path === p)!.contents as string, p);
    const a = get("single-dose-96.long.csv");
    const b = get("single-dose-96.grid.csv");
    expect(a.ok && b.ok).toBe(true);
    if (a.ok && b.ok) expect([...a.export.wells]).toEqual([...b.export.wells]);
  });

  it("refuses every bad file with its exact first message", async () => {
    const cases = new Set(set.bad.map((b) => b.case));
    expect(cases.size).toBe(set.bad.length);
    for (const b of set.bad) {
      const file = set.files.find((f) => f.path === b.file)!;
      const name = baseName(b.file);
      const bytes = bytesOf(file.contents);
      const r =
        b.parseAs === "plate-map"
          ? parsePlateMapCsv(bytes, b.format ?? 96, name)
          : await parseReaderExport(bytes, name, b.format ? { format: b.format } : {});
      expect(r.ok, b.file).toBe(false);
      if (!r.ok) expect(r.issues[0]!.text, b.file).toBe(b.error);
    }
  });

  it("is what is committed in fixtures/plates (regenerate with npx tsx src/cli/fixtures.ts)", () => {
    for (const f of set.files) {
      const path = dir + f.path;
      expect(existsSync(path), path).toBe(true);
      expect(Buffer.compare(readFileSync(path), Buffer.from(bytesOf(f.contents))), f.path).toBe(0);
    }
  });

  it("marks the data as invented", () => {
    expect(set.readme).toContain("INVENTED");
    expect(JSON.parse(set.truthJson).note).toMatch(/^INVENTED/);
  });
});

describe("demo campaign", () => {
  it("is deterministic and every plate round-trips through the parsers", () => {
    const a = demoCampaignPlates(7, {
      compoundCount: 120,
      screenPlates: 3,
      compoundsPerPlate: 40,
      doseResponsePlates: 1,
    });
    const b = demoCampaignPlates(7, {
      compoundCount: 120,
      screenPlates: 3,
      compoundsPerPlate: 40,
      doseResponsePlates: 1,
    });
    expect(a.plates.map((p) => p.file.contents)).toEqual(b.plates.map((p) => p.file.contents));
    expect(a.plates.map((p) => p.experiment)).toEqual([
      "single-dose",
      "single-dose",
      "single-dose",
      "dose-response",
      "mechanism",
    ]);
    expect(a.compounds.every((c) => /^INH-\d{6}$/.test(c.id))).toBe(true);
    for (const p of a.plates) {
      const m = parsePlateMapCsv(p.mapCsv, p.format, p.name);
      expect(m.ok && m.map).toEqual(p.map);
      const r = parseReaderExportText(p.file.contents, p.file.name, { format: p.format });
      if (!r.ok) throw new Error(r.issues.map((i) => i.text).join("; "));
      expectMapCovered(p.map, r.export);
      const used = p.map.wells.flatMap((w) => (w.compound ? [w.compound] : []));
      expect(used.every((id) => a.compounds.some((c) => c.id === id))).toBe(true);
    }
    const mech = a.plates.at(-1)!;
    const r = parseReaderExportText(mech.file.contents, mech.file.name);
    expect(r.ok && r.export.shape === "grid-kinetic" && r.export.reads).toBe(60);
  });

  it("builds the default campaign over the 300-compound demo library: 20 screen plates, dose-response plates, 1 mechanism plate", () => {
    const d = demoCampaignPlates(1);
    expect(d.plates.filter((p) => p.experiment === "single-dose")).toHaveLength(20);
    expect(d.plates.filter((p) => p.experiment === "dose-response").length).toBeGreaterThanOrEqual(2);
    expect(d.plates.filter((p) => p.experiment === "mechanism")).toHaveLength(1);
    expect(d.compounds).toHaveLength(300);
    const screened = d.plates
      .filter((p) => p.experiment === "single-dose")
      .flatMap((p) => p.map.wells.flatMap((w) => (w.role === "sample" && w.compound ? [w.compound] : [])));
    expect(new Set(screened).size).toBe(300);
    expect(d.note).toMatch(/^INVENTED/);
  });
});
