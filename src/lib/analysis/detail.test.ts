import { describe, expect, it } from "vitest";
import { DNASE_RUN1, ISDALS_INHIBITOR } from "@/lib/kinetics/testdata/reference-data";
import { analyseDoseResponse, analyseMechanism, analyseSingleDose, type AnalysisReading } from "./compute";
import { isFittedDoseResponse, isFittedMechanism, parseResultDetail } from "./detail";

// The detail that compute.ts writes must parse with the schema its readers use. Inputs are the
// published data sets of the engine's own tests: R datasets::DNase run 1 (density scaled to a
// % inhibition-like response) and the isdals `inhibitor` matrix (Ekstrøm & Sørensen).

const well = (k: number) => `A${k + 1}`;
const reading = (r: Partial<AnalysisReading> & { well: string }): AnalysisReading => ({
  runId: "run-1",
  role: "sample",
  compoundId: "REF",
  concentrationUm: null,
  substrateUm: null,
  signal: null,
  inhibitionPct: null,
  masked: false,
  ...r,
});

const dnase = DNASE_RUN1.conc.map((c, k) =>
  reading({ well: well(k), concentrationUm: c, inhibitionPct: DNASE_RUN1.density[k]! * 40 }),
);
const isdals = ISDALS_INHIBITOR.map((p, k) =>
  reading({ well: well(k), substrateUm: p.substrate, concentrationUm: p.inhibitor, signal: p.rate }),
);

describe("result detail schema against compute's output", () => {
  it("single-dose (DNase run 1 duplicates as compounds, with neutral wells for the k·SD rule)", () => {
    const readings = [
      ...dnase.map((r, k) => ({ ...r, compoundId: `REF-${k >> 1}` })),
      ...[0.5, -1.5, 2, 0].map((p, k) => reading({ well: `P${k + 1}`, role: "neutral", inhibitionPct: p })),
    ];
    for (const rule of [
      { kind: "percent", thresholdPercent: 50 },
      { kind: "sd", k: 3 },
    ] as const) {
      const { results } = analyseSingleDose(readings, rule);
      expect(results).toHaveLength(8);
      for (const r of results) expect(parseResultDetail("single-dose", r.detail)).toEqual(r.detail);
    }
  });

  it("dose-response: a fit, a tight-binding Morrison record, and too few points", () => {
    const [fitted] = analyseDoseResponse(dnase);
    const d = parseResultDetail("dose-response", fitted!.detail);
    expect(isFittedDoseResponse(d)).toBe(true);
    expect(d).toEqual(fitted!.detail);

    const [tight] = analyseDoseResponse(dnase, { enzymeUm: 1 });
    expect(tight!.flags).toContain("tight-binding-suspected");
    const t = parseResultDetail("dose-response", tight!.detail);
    expect(isFittedDoseResponse(t) && t.morrison).toBeTruthy();

    const [few] = analyseDoseResponse(dnase.slice(0, 4));
    expect(few!.flags).toEqual(["too-few-points"]);
    expect(isFittedDoseResponse(parseResultDetail("dose-response", few!.detail))).toBe(false);
  });

  it("mechanism: the four-model fit of the isdals matrix, and too few levels", () => {
    const [fitted] = analyseMechanism(isdals);
    const d = parseResultDetail("mechanism", fitted!.detail);
    expect(isFittedMechanism(d)).toBe(true);
    expect(d).toEqual(fitted!.detail);
    if (isFittedMechanism(d))
      expect(Object.keys(d.models).sort()).toEqual(["competitive", "mixed", "noncompetitive", "uncompetitive"]);

    const [few] = analyseMechanism(isdals.filter((r) => r.concentrationUm === 0));
    expect(few!.flags).toEqual(["too-few-points"]);
    expect(isFittedMechanism(parseResultDetail("mechanism", few!.detail))).toBe(false);
  });

  it("refuses a misspelt key and says where (common practice: strict schemas catch writer typos)", () => {
    const [fitted] = analyseDoseResponse(dnase);
    const detail = fitted!.detail;
    if (!isFittedDoseResponse(detail)) throw new Error("expected a fit");
    const typo = { ...detail, fit: { ...detail.fit, topPC: 1 } };
    expect(() => parseResultDetail("dose-response", typo)).toThrow(/dose-response result detail/);
    const [mech] = analyseMechanism(isdals);
    const noModel = JSON.parse(JSON.stringify(mech!.detail)) as { models: Record<string, unknown> };
    delete noModel.models.mixed;
    expect(() => parseResultDetail("mechanism", noModel)).toThrow(/mechanism result detail/);
    expect(() => parseResultDetail("single-dose", {})).toThrow(/single-dose result detail/);
  });

  it("survives a JSON round trip, as stored in jsonb", () => {
    const [mech] = analyseMechanism(isdals);
    const stored = JSON.parse(JSON.stringify(mech!.detail)) as unknown;
    expect(parseResultDetail("mechanism", stored)).toEqual(mech!.detail);
  });
});
