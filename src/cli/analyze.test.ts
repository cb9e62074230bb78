/**
 * The analyze command as a child process: its output shapes on published data sets
 * (isdals `inhibitor`, R DNase run 1 — sources in src/lib/kinetics/testdata/reference-data.ts),
 * and each kind of bad input → one stderr line naming line and column, exit 2, empty stdout.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { DNASE_RUN1, ISDALS_INHIBITOR } from "../lib/kinetics/testdata/reference-data";

const ROOT = fileURLToPath(new URL("../..", import.meta.url));
const TSX = join(ROOT, "node_modules", ".bin", "tsx");
const dir = mkdtempSync(join(tmpdir(), "analyze-test-"));

function run(args: string[]): { stdout: string; stderr: string; status: number | null } {
  const r = spawnSync(TSX, [join(ROOT, "src/cli/analyze.ts"), ...args], { cwd: ROOT, encoding: "utf8" });
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

describe("analyze mechanism (isdals inhibitor data, Ekstrøm & Sørensen; expected values computed with SciPy)", () => {
  it("prints {best, label, models} with all four models and their constants", () => {
    const r = run(["mechanism", csv("isdals.csv", mechanismCsv)]);
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out)).toEqual(["best", "label", "models"]);
    expect(out.best).toBe("competitive");
    expect(out.label).toBe("ambiguous");
    expect(Object.keys(out.models).sort()).toEqual(["competitive", "mixed", "noncompetitive", "uncompetitive"]);
    for (const m of Object.values(out.models) as Record<string, unknown>[]) {
      for (const k of ["vmax", "km", "rss", "aicc"]) expect(typeof m[k]).toBe("number");
      expect(m).toHaveProperty("kic");
      expect(m).toHaveProperty("kiu");
    }
    expect(out.models.competitive.kic).toBeCloseTo(34.845, 3);
    expect(out.models.competitive.kiu).toBeNull();
    expect(out.models.uncompetitive.kic).toBeNull();
    expect(out.models.noncompetitive.kic).toBe(out.models.noncompetitive.kiu);
    expect(out.models.mixed.aicc).toBeCloseTo(-166.75, 2);
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
    const r = run(["mechanism", csv("zero.csv", text)]);
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).best).toBe("competitive");
  });
});

describe("analyze dose-response (R datasets::DNase run 1; expected values computed with SciPy, same as R SSfpl)", () => {
  it("prints one object per compound in input order with the specified keys", () => {
    const r = run(["dose-response", csv("dose.csv", doseCsv)]);
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out).toHaveLength(2);
    expect(Object.keys(out[0])).toEqual(["compound", "ic50", "hill", "top", "bottom", "ic50Ci95", "flags"]);
    expect(out[0].compound).toBe("DNase run 1");
    expect(out[0].ic50).toBeCloseTo(4.515, 3);
    expect(out[0].hill).toBeCloseTo(0.94111, 4);
    expect(out[0].bottom).toBeCloseTo(-0.0078971, 6);
    expect(out[0].ic50Ci95[0]).toBeCloseTo(3.6146, 3);
    expect(out[0].ic50Ci95[1]).toBeCloseTo(5.6396, 3);
    expect(out[1].compound).toBe("IT-0042 (invented)");
    expect(out[1].ic50).toBeCloseTo(0.5, 2);
    expect(Array.isArray(out[1].flags)).toBe(true);
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

  it("too few points", () => {
    expectBadInput(
      run(["dose-response", csv("few.csv", "compound,concentration,response\nX,1,90\nX,10,50\nX,100,10\n")]),
      /line 4, column "concentration": too few points: compound "X" has 3/,
    );
    const oneLevel =
      "substrate,inhibitor,rate\n" +
      [1, 2, 5, 10, 20, 50, 100, 200].map((s) => `${s},0,${s / (s + 10)}`).join("\n") +
      "\n";
    expectBadInput(
      run(["mechanism", csv("few2.csv", oneLevel)]),
      /line 9, column "inhibitor": too few points: only one inhibitor concentration/,
    );
  });

  it("unknown command, missing file, unknown option", () => {
    expectBadInput(run(["kinetics", "x.csv"]), /unknown command/);
    expectBadInput(run(["mechanism", join(dir, "does-not-exist.csv")]), /cannot read/);
    expectBadInput(run(["dose-response", csv("ok.csv", doseCsv), "--fast"]), /unknown option/);
  });
});
