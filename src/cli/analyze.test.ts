/**
 * The analyze command as a child process, through its launcher (scripts/analyze.cjs, what
 * `npm run analyze` runs): its output on published data sets (isdals `inhibitor`, R DNase run 1 —
 * sources in src/lib/kinetics/testdata/reference-data.ts; the published fits are unweighted, so
 * those checks pass --weighting=none), the new options on INVENTED difficult data
 * (src/lib/analysis/testdata/difficult-cases.ts), a compound that cannot be fitted in its own
 * object, worker threads that keep the output byte for byte, and each kind of bad input → one
 * stderr line naming line and column, exit 2, empty stdout.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { DNASE_RUN1, ISDALS_INHIBITOR } from "../lib/kinetics/testdata/reference-data";
import {
  DOSE_CASES,
  ENZYME_UM,
  MECHANISM_CASES,
  doseSeries,
  mechanismRates,
} from "../lib/analysis/testdata/difficult-cases";

const ROOT = fileURLToPath(new URL("../..", import.meta.url));
const dir = mkdtempSync(join(tmpdir(), "analyze-test-"));

function run(
  args: string[],
  env: Record<string, string> = {},
): { stdout: string; stderr: string; status: number | null } {
  const r = spawnSync(process.execPath, [join(ROOT, "scripts/analyze.cjs"), ...args], {
    cwd: ROOT,
    encoding: "utf8",
    env: { ...process.env, ...env },
  });
  return { stdout: r.stdout, stderr: r.stderr, status: r.status };
}

function csv(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

function expectBadInput(r: ReturnType<typeof run>, pattern: RegExp): void {
  expect(r.status).toBe(2);
  expect(r.stdout).toBe("");
  const lines = r.stderr.trimEnd().split("\n");
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
}

function ok(r: ReturnType<typeof run>): unknown {
  expect(r.stderr).toBe("");
  expect(r.status).toBe(0);
  return JSON.parse(r.stdout);
}

const mechanismCsv =
  "Rate,SUBSTRATE,inhibitor\n" +
  ISDALS_INHIBITOR.map((p) => `${p.rate},${p.substrate},${p.inhibitor}`).join("\n") +
  "\n";
const doseCsv =
  "compound,concentration,response\n" +
  DNASE_RUN1.conc.map((c, k) => `DNase run 1,${c},${DNASE_RUN1.density[k]}`).join("\n") +
  "\n" +
  [30, 10, 3, 1, 0.3, 0.1, 0.03, 0.01]
    .map((c) => `IT-0042 (invented),${c},${(100 / (1 + c / 0.5)).toFixed(3)}`)
    .join("\n") +
  "\n";

/** The invented difficult dose-response cases as % inhibition, one compound each. */
const difficultDoseCsv =
  "compound,concentration,response (% inhibition)\n" +
  DOSE_CASES.flatMap((c, k) =>
    doseSeries(c, 7100 + k).map((p) => `${c.id},${p.concentrationUm},${p.inhibitionPct}`),
  ).join("\n") +
  "\n";
/** The invented difficult mechanism matrices as one batch file with a compound column. */
const difficultMechanismCsv =
  "compound,substrate (µM),inhibitor (µM),rate\n" +
  MECHANISM_CASES.flatMap((c, k) =>
    mechanismRates(c, 7200 + k).map((p) => `${c.id},${p.substrateUm},${p.inhibitorUm},${p.rate}`),
  ).join("\n") +
  "\n";

type DoseOut = Record<string, unknown> & { compound: string; outcome: string; flags: string[] };
type MechOut = Record<string, unknown> & { compound: string; recommended: string; label: string; flags: string[] };

describe("analyze mechanism (isdals inhibitor data, Ekstrøm & Sørensen; expected values computed with SciPy)", () => {
  it("prints the standard call, all four models with their constants and adequacy, and the judgement", () => {
    const out = ok(run(["mechanism", csv("isdals.csv", mechanismCsv), "--weighting=none"])) as Record<
      string,
      unknown
    > & {
      models: Record<string, Record<string, unknown>>;
    };
    for (const k of ["best", "label", "models", "recommended", "weighting", "alternatives", "flags", "outliers"])
      expect(out).toHaveProperty(k);
    expect(out.best).toBe("competitive");
    expect(out.label).toBe("ambiguous");
    expect(Object.keys(out.models).sort()).toEqual(["competitive", "mixed", "noncompetitive", "uncompetitive"]);
    const models = out.models;
    for (const m of Object.values(models)) {
      for (const k of ["vmax", "km", "rss", "aicc"]) expect(typeof m[k]).toBe("number");
      expect(m).toHaveProperty("kic");
      expect(m).toHaveProperty("kiu");
      expect(m).toHaveProperty("adequacy.runs.expected");
    }
    expect(models.competitive!.kic).toBeCloseTo(34.845, 3);
    expect(models.competitive!.kiu).toBeNull();
    expect(models.uncompetitive!.kic).toBeNull();
    expect(models.noncompetitive!.kic).toBe(models.noncompetitive!.kiu);
    expect(models.mixed!.aicc).toBeCloseTo(-166.75, 2);
    // F-test competitive vs mixed, p = 0.0956 (science.md, computed with SciPy).
    expect((models.competitive!.fTestVsMixed as { p: number }).p).toBeCloseTo(0.0956, 3);
    expect(out.weighting).toMatchObject({ used: "none", chosen: "set" });
  });

  it("accepts substrate-0 rows and units in the header", () => {
    const text =
      "substrate (uM),inhibitor (uM),rate\n0,0,0.01\n0,50,0.0\n" +
      mechanismCsv
        .split("\n")
        .slice(1)
        .map((l) => l.split(","))
        .filter((c) => c.length === 3)
        .map(([r, s, i]) => `${s},${i},${r}`)
        .join("\n");
    const out = ok(run(["mechanism", csv("zero.csv", text), "--weighting=none"])) as { best: string };
    expect(out.best).toBe("competitive");
  });

  it("weighting: none by default (the published fit), auto says what it chose and why", () => {
    const plain = ok(run(["mechanism", csv("isdals-default.csv", mechanismCsv)])) as {
      weighting: Record<string, string>;
      models: { competitive: { kic: number } };
    };
    expect(plain.weighting.used).toBe("none");
    expect(plain.models.competitive.kic).toBeCloseTo(34.845, 2);
    const out = ok(run(["mechanism", csv("isdals-auto.csv", mechanismCsv), "--weighting=auto"])) as {
      weighting: Record<string, string>;
    };
    expect(out.weighting.chosen).toBe("auto");
    expect(["none", "relative"]).toContain(out.weighting.used);
    expect(out.weighting.reason).toMatch(/replicate groups/);
  });
});

describe("analyze dose-response (R datasets::DNase run 1; expected values computed with SciPy, same as R SSfpl)", () => {
  it("prints one object per compound in input order with its outcome, figures and judgement", () => {
    // DNase density is a raw signal, not % inhibition; the published fit is unweighted.
    const out = ok(run(["dose-response", csv("dose.csv", doseCsv), "--response=signal", "--weighting=none"])) as Record<
      string,
      never
    >[];
    expect(out).toHaveLength(2);
    expect(Object.keys(out[0]!)).toEqual([
      "compound",
      "outcome",
      "reason",
      "ic50",
      "ic50Qualifier",
      "ic50Ci95",
      "hill",
      "top",
      "bottom",
      "maxInhibition",
      "maxActivation",
      "ic50Bracket",
      "testedRange",
      "fixed",
      "flags",
      "weighting",
      "adequacy",
      "outliers",
      "morrison",
      "fit",
    ]);
    type Row = { compound: string; outcome: string; ic50: number; hill: number; bottom: number; flags: string[] };
    const [dnase, invented] = out as unknown as (Row & { ic50Ci95: [number, number] })[];
    expect(dnase!.compound).toBe("DNase run 1");
    expect(dnase!.outcome).toBe("fitted");
    expect(dnase!.ic50).toBeCloseTo(4.515, 3);
    expect(dnase!.hill).toBeCloseTo(0.94111, 4);
    expect(dnase!.bottom).toBeCloseTo(-0.0078971, 6);
    expect(dnase!.ic50Ci95[0]).toBeCloseTo(3.6146, 3);
    expect(dnase!.ic50Ci95[1]).toBeCloseTo(5.6396, 3);
    expect(dnase!).toHaveProperty("adequacy.lackOfFit.dfPe", 8); // 16 wells at 8 concentrations
    expect(invented!.compound).toBe("IT-0042 (invented)");
    expect(invented!.ic50).toBeCloseTo(0.5, 2);
    expect(Array.isArray(invented!.flags)).toBe(true);
  });
});

describe("analyze on difficult invented data: outcomes, --enzyme, --robust, --weighting", () => {
  it("dose-response: inactive and activator get no IC50 and say why; the partial inhibitor is flagged", () => {
    const out = ok(run(["dose-response", csv("difficult-dose.csv", difficultDoseCsv)])) as DoseOut[];
    const by = new Map(out.map((o) => [o.compound, o]));
    expect(out.map((o) => o.compound)).toEqual(DOSE_CASES.map((c) => c.id));
    expect(by.get("inactive")).toMatchObject({ outcome: "inactive", ic50: null });
    expect(by.get("inactive")!.reason).toMatch(/< 50 % inhibition at the top concentration/);
    expect(by.get("weak")).toMatchObject({ outcome: "inactive", ic50: null });
    expect(by.get("weak")!.maxInhibition as number).toBeGreaterThan(20);
    expect(by.get("activator")).toMatchObject({ outcome: "activator", ic50: null });
    expect(by.get("partial")!.flags).toContain("partial-inhibition");
    expect(by.get("clean")).toMatchObject({ outcome: "fitted" });
    // Without --enzyme there is no tight-binding check.
    expect(by.get("tight-binder")!.morrison).toBeNull();
  });

  it("--enzyme: the dose-response tight binder gets the Morrison fit, the mechanism one its depletion-aware model", () => {
    const dose = ok(
      run(["dose-response", csv("difficult-dose-e.csv", difficultDoseCsv), `--enzyme=${ENZYME_UM}`]),
    ) as DoseOut[];
    const tight = dose.find((o) => o.compound === "tight-binder")!;
    expect(tight.flags).toContain("tight-binding-suspected");
    expect(tight.morrison).toMatchObject({ enzyme: ENZYME_UM });

    const mech = ok(
      run(["mechanism", csv("difficult-mech-e.csv", difficultMechanismCsv), `--enzyme=${ENZYME_UM}`]),
    ) as MechOut[];
    expect(mech.map((m) => m.compound)).toEqual(MECHANISM_CASES.map((c) => c.id));
    const byId = new Map(mech.map((m) => [m.compound, m]));
    expect(byId.get("tight-binder")!.recommended).toBe("tight-binding-competitive");
    expect(byId.get("tight-binder")!.label).toBe("inadequate");
    expect(byId.get("tight-binder")!.enzyme).toBe(ENZYME_UM);
    expect(byId.get("substrate-inhibited")!.recommended).toBe("substrate-inhibition-competitive");
    expect(byId.get("partial")!.recommended).toMatch(/^partial-/);
    expect(byId.get("mixed-clean")).toMatchObject({ recommended: "mixed", label: "clear" });
    const alt = (
      byId.get("substrate-inhibited")!.alternatives as { model: string; meaning: string; constants: object }[]
    ).find((a) => a.model === "substrate-inhibition-competitive")!;
    expect(alt.constants).toHaveProperty("ksi.value");
    expect(alt.meaning).toMatch(/substrate/i);
  });

  it("--robust reports the fit without the wild well; without it the well is only proposed", () => {
    const plain = ok(run(["dose-response", csv("wild.csv", difficultDoseCsv)])) as DoseOut[];
    const robust = ok(run(["dose-response", csv("wild-r.csv", difficultDoseCsv), "--robust"])) as DoseOut[];
    const p = plain.find((o) => o.compound === "wild-well")!;
    const r = robust.find((o) => o.compound === "wild-well")!;
    const wild = { concentration: 100, response: 0 };
    expect(p.outliers).toMatchObject({ reported: "all-points", proposed: [expect.objectContaining(wild)] });
    expect(r.outliers).toMatchObject({ reported: "without-outliers", proposed: [expect.objectContaining(wild)] });
    expect(r.flags).toContain("outliers-excluded");
    expect(Math.abs(Math.log10((r.ic50 as number) / 1))).toBeLessThan(Math.log10(2));
    // The proposal names the file line of the well.
    const line = (r.outliers as { proposed: { line: number }[] }).proposed[0]!.line;
    expect(difficultDoseCsv.split("\n")[line - 1]).toMatch(/^wild-well,100,0$/);
  });

  it("the header's concentration unit is named in the sentences; without one they give bare numbers", () => {
    const withUnit = difficultDoseCsv.replace(/^compound,concentration,/, "compound,concentration (µM),");
    const named = ok(run(["dose-response", csv("unit.csv", withUnit)])) as DoseOut[];
    const bare = ok(run(["dose-response", csv("bare.csv", difficultDoseCsv)])) as DoseOut[];
    const inactive = named.find((o) => o.compound === "inactive")!;
    expect(inactive.reason).toMatch(/^< 50 % inhibition at the top concentration \d[\d.]* µM: maximum/);
    expect(bare.find((o) => o.compound === "inactive")!.reason).toBe((inactive.reason as string).replace(" µM", ""));
    // Figures are the same either way.
    expect(named.map((o) => o.ic50)).toEqual(bare.map((o) => o.ic50));
    expect(inactive.testedRange).toEqual([expect.any(Number), expect.any(Number)]);
    expect(named.find((o) => o.compound === "clean")!.fixed).toEqual({ top: null, bottom: null });
  });

  it("mechanism: n, background, alternative exclusions and units, β's fixed mark, outlier residuals and p", () => {
    const mech = ok(run(["mechanism", csv("fields.csv", difficultMechanismCsv), "--robust"])) as MechOut[];
    type Constant = { value: number | null; unit: string; fixed: boolean };
    type Alt = { model: string; exclusion: string | null; constants: Record<string, Constant> };
    for (const m of mech) {
      if ("error" in m) continue;
      expect(typeof m.n).toBe("number");
      expect(typeof m.backgroundSubtracted).toBe("boolean");
      for (const a of m.alternatives as Alt[]) {
        expect(a).toHaveProperty("exclusion");
        // The file's header says µM: the constants carry it; Vmax is a rate, β a ratio.
        expect(a.constants.km!.unit).toBe("µM");
        expect(a.constants.vmax!.unit).toBe("rate");
        if (a.constants.beta) expect(a.constants.beta.unit).toBe("");
        for (const c of Object.values(a.constants)) expect(typeof c.fixed).toBe("boolean");
      }
    }
    // Invented: a competitive matrix (Vmax 1, Km 10, Ki 2, µM), a little deterministic scatter, one rate 40 % high.
    const rows: string[] = [];
    for (const i of [0, 1, 2, 4, 8])
      for (const sub of [2, 5, 10, 20, 50, 100])
        for (let rep = 0; rep < 2; rep++) {
          const k = rows.length;
          const v = sub / (10 * (1 + i / 2) + sub) + 0.01 * Math.sin(7.3 * k + 1);
          rows.push(`wild,${sub},${i},${(k === 27 ? 1.4 : 1) * v}`);
        }
    const wildCsv = "compound,substrate (µM),inhibitor (µM),rate\n" + rows.join("\n") + "\n";
    mech.push(...(ok(run(["mechanism", csv("wild-mech.csv", wildCsv)])) as MechOut[]));
    const proposed = mech.flatMap(
      (m) =>
        ((m.outliers as { proposed: Record<string, unknown>[] } | null)?.proposed ?? []) as Record<string, unknown>[],
    );
    expect(proposed.length).toBeGreaterThan(0);
    for (const p of proposed) {
      expect(p).toHaveProperty("residual");
      expect(p).toHaveProperty("p");
    }
    // The wild rate (data row 28, file line 29) stands out with its standardised residual and ROUT p.
    const wild = proposed.find((p) => p.line === 29)!;
    expect(wild.residual as number).toBeGreaterThan(5);
    expect(wild.p as number).toBeLessThan(1e-6);
  });

  it("--weighting=relative is used as set and said so", () => {
    const out = ok(run(["dose-response", csv("rel.csv", difficultDoseCsv), "--weighting=relative"])) as DoseOut[];
    expect(out.find((o) => o.compound === "clean")!.weighting).toMatchObject({ used: "relative", chosen: "set" });
  });

  it("--response=activity reads % activity (100 = vehicle)", () => {
    const activity =
      "compound,concentration,response\n" +
      doseSeries(DOSE_CASES[0]!, 7100)
        .map((p) => `clean,${p.concentrationUm},${100 - p.inhibitionPct}`)
        .join("\n") +
      "\n";
    const [asActivity] = ok(run(["dose-response", csv("act.csv", activity), "--response=activity"])) as DoseOut[];
    const [asInhibition] = ok(run(["dose-response", csv("inh.csv", difficultDoseCsv)])) as DoseOut[];
    expect(asActivity!.outcome).toBe("fitted");
    expect(asActivity!.ic50 as number).toBeCloseTo(asInhibition!.ic50 as number, 6);
  });
});

describe("analyze batches: one compound's error in its own object, the rest fitted (exit 0)", () => {
  it("dose-response: a compound with too few points", () => {
    const text = doseCsv + "X,1,90\nX,10,50\nX,100,10\n";
    const out = ok(run(["dose-response", csv("few.csv", text), "--response=signal"])) as Record<string, unknown>[];
    expect(out).toHaveLength(3);
    expect(out[0]).toMatchObject({ compound: "DNase run 1", outcome: "fitted" });
    expect(out[2]).toEqual({
      compound: "X",
      error: expect.stringMatching(/^line 28, column "concentration": too few points: 3 points at 3 concentrations/),
    });
  });

  it("mechanism with a compound column: a compound with too few levels", () => {
    const text = difficultMechanismCsv + "thin,10,0,50\nthin,20,0,60\nthin,40,1,40\n";
    const out = ok(run(["mechanism", csv("few-mech.csv", text)])) as Record<string, unknown>[];
    expect(out.map((o) => o.compound)).toEqual([...MECHANISM_CASES.map((c) => c.id), "thin"]);
    expect(out.at(-1)).toEqual({ compound: "thin", error: expect.stringMatching(/^lines \d+–\d+: too few points/) });
    for (const o of out.slice(0, -1)) expect(o).toHaveProperty("best");
  });

  it("worker threads print the same bytes as one thread, in input order", () => {
    const path = csv("threads.csv", difficultDoseCsv.repeat(1).replace(/\n$/, "\n"));
    const one = run(["dose-response", path], { ANALYZE_THREADS: "1" });
    const two = run(["dose-response", path], { ANALYZE_THREADS: "2" });
    expect(two.status).toBe(0);
    expect(two.stdout).toBe(one.stdout);
    const mp = csv("threads-mech.csv", difficultMechanismCsv);
    const m1 = run(["mechanism", mp], { ANALYZE_THREADS: "1" });
    const m2 = run(["mechanism", mp], { ANALYZE_THREADS: "2" });
    expect(m2.status).toBe(0);
    expect(m2.stdout).toBe(m1.stdout);
  });
});

describe("analyze: bad input → one stderr line with line and column, exit 2, nothing on stdout", () => {
  it("missing column", () => {
    expectBadInput(
      run(["mechanism", csv("nocol.csv", "substrate,inhibitor,velocity\n1,0,2\n")]),
      /line 1, column "rate": missing column/,
    );
    expectBadInput(
      run(["dose-response", csv("nocol2.csv", "compound,conc,response\nA,1,2\n")]),
      /line 1, column "concentration": missing column/,
    );
  });

  it("non-numeric cell", () => {
    const text = doseCsv.replace("DNase run 1,0.1953125,0.121", "DNase run 1,0.1953125,n/a");
    expectBadInput(run(["dose-response", csv("nan.csv", text)]), /line 4, column "response": "n\/a" is not a number/);
    expectBadInput(
      run(["mechanism", csv("empty.csv", "substrate,inhibitor,rate\n1,,2\n")]),
      /line 2, column "inhibitor": empty cell/,
    );
  });

  it("negative concentration", () => {
    const text = doseCsv.replace("IT-0042 (invented),30,", "IT-0042 (invented),-30,");
    expectBadInput(
      run(["dose-response", csv("neg.csv", text)]),
      /line 18, column "concentration": negative concentration -30/,
    );
    expectBadInput(
      run(["mechanism", csv("neg2.csv", mechanismCsv.replace("\n0.542,10,0\n", "\n0.542,-10,0\n"))]),
      /line 2, column "substrate": negative concentration/,
    );
  });

  it("too few points in a file that is one mechanism data set", () => {
    const oneLevel =
      "substrate,inhibitor,rate\n" +
      [1, 2, 5, 10, 20, 50, 100, 200].map((s) => `${s},0,${s / (s + 10)}`).join("\n") +
      "\n";
    expectBadInput(
      run(["mechanism", csv("few2.csv", oneLevel)]),
      /line 9, column "inhibitor": too few points: only one inhibitor concentration/,
    );
  });

  it("unknown command, missing file, unknown option, bad option values", () => {
    expectBadInput(run(["kinetics", "x.csv"]), /unknown command/);
    expectBadInput(run(["mechanism", join(dir, "does-not-exist.csv")]), /cannot read/);
    const ok = csv("ok.csv", doseCsv);
    expectBadInput(run(["dose-response", ok, "--fast"]), /unknown option "--fast"/);
    expectBadInput(run(["dose-response", ok, "--weighting=heavy"]), /--weighting must be auto, none or relative/);
    expectBadInput(run(["dose-response", ok, "--enzyme=-1"]), /--enzyme needs a positive number/);
    expectBadInput(run(["dose-response", ok, "--enzyme"]), /--enzyme needs a value/);
    expectBadInput(run(["dose-response", ok, "--robust=yes"]), /--robust takes no value/);
    expectBadInput(
      run(["dose-response", ok, "--response=ratio"]),
      /--response must be auto, inhibition, activity or signal/,
    );
    expectBadInput(run(["mechanism", csv("m.csv", mechanismCsv), "--fix-top=100"]), /unknown option "--fix-top=100"/);
  });

  it("--help prints the usage with every option", () => {
    const r = run(["--help"]);
    expect(r.status).toBe(0);
    for (const o of ["--enzyme=", "--weighting=", "--robust", "--response=", "--fix-top=", "--fix-bottom="])
      expect(r.stdout).toContain(o);
  });
});
