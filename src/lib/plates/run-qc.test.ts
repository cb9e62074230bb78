// Checks: readings built from an export and its plate map, plate QC and % inhibition.
// Outside references: a worked example of the Z′ definition (Zhang, Chung & Oldenburg, J Biomol
// Screen 1999;4:67–73) on controls 1000 ± 31.6 and 100 ± 7.07, its figures calculated with SciPy,
// and SciPy itself (python3 on the machine) for Z′ and CVs of a fixture plate. The fixture files
// are INVENTED data (fixtures/plates/README.md); their "truth" is the simulator's input, used
// only as a consistency check, not as a reference.
// The non-finite and range checks at the end are common practice (IEEE 754 doubles: NaN compares
// false with every threshold); their plates are invented.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import { describe, expect, it } from "vitest";
import { parsePlateMapCsv, plateMapFromWells, type PlateMap, type PlateMapWell } from "./plate-map";
import { parseReaderExport, parseReaderExportText, type ReaderExport } from "./reader-export";
import { buildReadings, computeRunQc, type QcInputWell, type RunReading } from "./run-qc";

const neutral = [950, 1010, 1040, 980, 1020, 1000];
const full = [90, 110, 95, 105, 100, 100];

function workedMap(swap = false): PlateMap {
  const wells: PlateMapWell[] = [];
  neutral.forEach((_, i) => wells.push({ well: `A${i + 1}`, role: swap ? "full" : "neutral" }));
  full.forEach((_, i) => wells.push({ well: `B${i + 1}`, role: swap ? "neutral" : "full" }));
  wells.push({ well: "C1", role: "sample", compound: "INH-000001", concentrationUm: 10 });
  return plateMapFromWells(96, wells);
}

function workedExport(extra: string[] = []): ReaderExport {
  const lines = [
    "well,value",
    ...neutral.map((v, i) => `A${i + 1},${v}`),
    ...full.map((v, i) => `B${i + 1},${v}`),
    "C1,550",
    ...extra,
  ];
  const r = parseReaderExportText(lines.join("\n"), "worked.csv", { format: 96 });
  if (!r.ok) throw new Error(r.issues[0]!.text);
  return r.export;
}

function qcOf(readings: RunReading[], masked: string[] = [], direction: "falls" | "rises" = "falls") {
  const wells: QcInputWell[] = readings.map((r) => ({
    well: r.well,
    role: r.role,
    signal: r.signal,
    isEdge: r.isEdge,
    masked: masked.includes(r.well),
    rateLinear: r.rate ? !r.rate.curved : null,
  }));
  return computeRunQc(wells, { readout: "endpoint", direction, minZPrime: 0.5, maxCvPct: 20 });
}

describe("QC of a run (worked Z′ example)", () => {
  it("Z′ 0.87102, SW 24.79, S/B 10, CV 3.16 % and 7.07 %, and 550 is 50 % inhibition", () => {
    const b = buildReadings(workedMap(), workedExport());
    if (!b.ok) throw new Error(b.issues[0]!.text);
    const { qc, inhibitionPct } = qcOf(b.readings);
    expect(qc.zPrime).toBeCloseTo(0.87102, 5);
    expect(qc.signalWindow).toBeCloseTo(24.79, 2);
    expect(qc.signalToBackground).toBeCloseTo(10, 10);
    expect(qc.cvNeutralPct).toBeCloseTo(3.16, 2);
    expect(qc.cvFullPct).toBeCloseTo(7.07, 2);
    expect(qc.verdict).toBe("pass");
    expect(inhibitionPct.get("C1")).toBeCloseTo(50, 10);
    expect(inhibitionPct.get("A1")).toBeCloseTo((100 * 50) / 900, 10); // (1000 − 950)/(1000 − 100) · 100
  });

  it("keeps readings of wells the map leaves empty but does not normalise them", () => {
    const b = buildReadings(workedMap(), workedExport(["H12,400"]));
    if (!b.ok) throw new Error(b.issues[0]!.text);
    const h12 = b.readings.find((r) => r.well === "H12")!;
    expect(h12.role).toBe("empty");
    expect(qcOf(b.readings).inhibitionPct.get("H12")).toBeNull();
  });

  it("excludes masked controls from the statistics", () => {
    const b = buildReadings(workedMap(), workedExport());
    if (!b.ok) throw new Error(b.issues[0]!.text);
    const { qc } = qcOf(b.readings, ["A1", "A3"]); // 950 and 1040 masked
    expect(qc.neutral!.n).toBe(4);
    expect(qc.neutral!.mean).toBeCloseTo(1002.5, 10);
    expect(qc.maskedWells).toBe(2);
  });

  it("a run whose controls are swapped fails QC, although Z′ is symmetric", () => {
    const b = buildReadings(workedMap(true), workedExport());
    if (!b.ok) throw new Error(b.issues[0]!.text);
    const { qc } = qcOf(b.readings);
    expect(qc.zPrime).toBeCloseTo(0.87102, 5);
    expect(qc.direction).toEqual({ expected: "falls", observed: "rises", ok: false });
    expect(qc.verdict).toBe("fail");
    expect(qc.reasons).toContain(
      "the neutral controls read lower than the full-inhibition controls, but this plate map's signal falls with inhibition: are the controls swapped?",
    );
    // The same plate passes when the map says the readout rises with inhibition.
    expect(qcOf(b.readings, [], "rises").qc.verdict).toBe("pass");
  });

  it("too few unmasked controls fail QC with a clear reason", () => {
    const b = buildReadings(workedMap(), workedExport());
    if (!b.ok) throw new Error(b.issues[0]!.text);
    const { qc } = qcOf(b.readings, ["B1", "B2", "B3", "B4", "B5"]);
    expect(qc.verdict).toBe("fail");
    expect(qc.reasons[0]).toBe(
      "QC needs at least 2 unmasked wells of each control; there are 6 neutral and 1 full-inhibition",
    );
  });

  it("refuses an export that misses a well the map uses, naming file and well", () => {
    const lines = ["well,value", ...neutral.map((v, i) => `A${i + 1},${v}`), ...full.map((v, i) => `B${i + 1},${v}`)];
    const r = parseReaderExportText(lines.join("\n"), "short.csv", { format: 96 });
    if (!r.ok) throw new Error("parse");
    const b = buildReadings(workedMap(), r.export);
    expect(b.ok).toBe(false);
    if (!b.ok)
      expect(b.issues.map((i) => i.text)).toEqual([
        "short.csv, well C1: the plate map has a sample well here but the export has no reading for it",
      ]);
  });
});

const dir = "fixtures/plates";
const truth = JSON.parse(fs.readFileSync(`${dir}/truth.json`, "utf8")) as {
  good: { file: string; map: string; truth: Record<string, unknown> }[];
};

async function fixture(file: string, mapFile: string) {
  const mapText = fs.readFileSync(`${dir}/${mapFile}`, "utf8");
  const m = parsePlateMapCsv(mapText, mapFile.includes("1536") ? 1536 : mapFile.includes("384") ? 384 : 96, mapFile);
  if (!m.ok) throw new Error(m.issues[0]!.text);
  const r = await parseReaderExport(new Uint8Array(fs.readFileSync(`${dir}/${file}`)), file, { format: m.map.format });
  if (!r.ok) throw new Error(r.issues[0]!.text);
  const b = buildReadings(m.map, r.export);
  if (!b.ok) throw new Error(b.issues[0]!.text);
  return b;
}

describe("fixture plates (INVENTED data)", () => {
  it("Z′ and control CVs of single-dose-96 agree with SciPy/NumPy on the same control values", async () => {
    const b = await fixture("single-dose-96.long.csv", "single-dose-96.map.csv");
    const { qc } = qcOf(b.readings);
    const n = b.readings.filter((r) => r.role === "neutral").map((r) => r.signal);
    const f = b.readings.filter((r) => r.role === "full").map((r) => r.signal);
    const py = execFileSync(
      "python3",
      [
        "-c",
        "import json,sys,numpy as np;d=json.load(sys.stdin);a=np.array(d[0]);b=np.array(d[1]);sa,sb=a.std(ddof=1),b.std(ddof=1);print(json.dumps([1-3*(sa+sb)/abs(a.mean()-b.mean()),100*sa/a.mean(),100*sb/b.mean()]))",
      ],
      { input: JSON.stringify([n, f]) },
    ).toString();
    const [z, cvn, cvf] = JSON.parse(py) as number[];
    expect(qc.zPrime).toBeCloseTo(z!, 10);
    expect(qc.cvNeutralPct).toBeCloseTo(cvn!, 10);
    expect(qc.cvFullPct).toBeCloseTo(cvf!, 10);
    expect(qc.verdict).toBe("pass");
  });

  it("flags the edge effect of single-dose-1536 (outer ring 20 % low by construction)", async () => {
    const b = await fixture("single-dose-1536.grid.csv", "single-dose-1536.map.csv");
    const { qc } = qcOf(b.readings);
    expect(qc.edge?.basis).toBe("neutral");
    expect(qc.edge!.differencePct).toBeLessThan(-10);
    expect(qc.edge!.flagged).toBe(true);
    expect(qc.warnings.some((w) => w.startsWith("edge effect"))).toBe(true);
  });

  it("initial rates of mechanism-96 follow the simulator's rates (consistency, invented data)", async () => {
    const b = await fixture("mechanism-96.long-kinetic.csv", "mechanism-96.map.csv");
    const t = truth.good.find((g) => g.file === "mechanism-96.long-kinetic.csv")!.truth.initialRatePerS as Record<
      string,
      number
    >;
    const samples = b.readings.filter((r) => r.role === "sample");
    expect(samples.length).toBe(64);
    for (const r of samples) expect(Math.abs(r.signal - t[r.well]!)).toBeLessThan(0.1 * Math.abs(t[r.well]!) + 0.02);
    const wells: QcInputWell[] = b.readings.map((r) => ({
      well: r.well,
      role: r.role,
      signal: r.signal,
      isEdge: r.isEdge,
      masked: false,
      rateLinear: r.rate ? !r.rate.curved : null,
    }));
    const { qc } = computeRunQc(wells, { readout: "kinetic", direction: "falls", minZPrime: 0.5, maxCvPct: 20 });
    expect(qc.full!.cvApplies).toBe(false); // no-enzyme rate ≈ 0
    expect(qc.signalUnit).toBe("signal units/s");
  });
});

describe("non-finite figures never pass QC", () => {
  const well = (w: string, role: QcInputWell["role"], signal: number): QcInputWell => ({
    well: w,
    role,
    signal,
    isEdge: false,
    masked: false,
  });
  const opts = { readout: "endpoint", direction: "falls", minZPrime: 0.5, maxCvPct: 20 } as const;

  it("controls whose SD overflows (±1e308 readings, if one ever got past the parser) fail with the reason", () => {
    const wells = [
      well("A1", "neutral", 1e308),
      well("A2", "neutral", -1e308),
      well("B1", "full", 100),
      well("B2", "full", 101),
      well("C1", "sample", 500),
    ];
    const { qc, inhibitionPct } = computeRunQc(wells, opts);
    expect(qc.verdict).toBe("fail");
    expect(qc.reasons.some((r) => r.includes("not a finite number"))).toBe(true);
    for (const x of [qc.zPrime, qc.signalToBackground, qc.signalWindow, qc.cvNeutralPct, qc.cvFullPct])
      expect(x === null || Number.isFinite(x)).toBe(true);
    for (const v of inhibitionPct.values()) expect(v === null || Number.isFinite(v)).toBe(true);
  });

  it("a NaN signal in a control fails QC instead of comparing false with the thresholds", () => {
    const wells = [
      well("A1", "neutral", NaN),
      well("A2", "neutral", 1000),
      well("B1", "full", 100),
      well("B2", "full", 101),
    ];
    const { qc } = computeRunQc(wells, opts);
    expect(qc.verdict).toBe("fail");
    expect(qc.reasons[0]).toBe("1 well has a signal that is not a finite number (A1), so the plate cannot pass QC");
  });
});

describe("readings outside a reader's range are refused at parse with file, line and well", () => {
  const plate = (value: string) => {
    const rows = ["well,value"];
    for (let r = 0; r < 8; r++)
      for (let c = 1; c <= 12; c++) rows.push(`${"ABCDEFGH"[r]}${c},${r === 2 && c === 7 ? value : 100}`);
    return rows.join("\n");
  };
  for (const v of ["1e308", "-1.5e300", "2e12"]) {
    it(v, () => {
      const r = parseReaderExportText(plate(v), "p.csv", { format: 96 });
      expect(r.ok).toBe(false);
      if (r.ok) return;
      expect(r.issues[0]!.text).toBe(
        `p.csv line 32, well C7: ${v} is not a finite reading (the accepted range is ±1e12)`,
      );
    });
  }
  for (const v of ["NaN", "Infinity", "inf"]) {
    it(`${v} is not a number`, () => {
      const r = parseReaderExportText(plate(v), "p.csv", { format: 96 });
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.issues[0]!.text).toBe(`p.csv line 32, well C7: "${v}" is not a number`);
    });
  }
});
