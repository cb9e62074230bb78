/**
 * analyseCurve: the outside reference is R `datasets::DNase` run 1 fitted by R's nls(SSfpl) in the
 * same run (and the published check values in the science notes, computed with SciPy). Everything
 * else is seeded invented data (marked so): it checks the judgement — inactive, activator, step,
 * outlier, weighting — against the truth the data were made from, not against another program.
 */
import { describe, expect, it } from "vitest";
import { analyseCurve, type CurveAnalysis } from "./dose-response";
import { fitLogistic4 } from "./logistic4";
import { DNASE_RUN1 } from "./testdata/reference-data";
import { readRLines, rPrint, runR } from "./testdata/r-oracle";
import { seededNormal, seededRandom } from "./testdata/synthetic";

// Invented: a ten-point half-log dilution from 30 (any unit), % inhibition rising with dose.
const CONC = Array.from({ length: 10 }, (_, k) => 30 / Math.pow(10, k / 2));
const inhibition = (x: number, ic50: number, hill: number, max = 100, min = 0) =>
  min + (max - min) / (1 + Math.pow(ic50 / x, hill));

function series(seed: number, f: (x: number) => number, sd = 5, reps = 1) {
  const z = seededNormal(seededRandom(seed));
  const x: number[] = [];
  const y: number[] = [];
  for (const c of CONC) {
    for (let r = 0; r < reps; r++) {
      x.push(c);
      y.push(f(c) + sd * z());
    }
  }
  return { x, y };
}

/** An invented curve with IC50 and Hill drawn from a seed (IC50 0.03–3, inside the range). */
function randomCurve(seed: number, reps = 1) {
  const u = seededRandom(seed);
  const ic50 = Math.pow(10, -1.5 + 2 * u());
  const hill = 0.8 + 0.6 * u();
  return { ic50, hill, ...series(seed + 1, (x) => inhibition(x, ic50, hill), 5, reps) };
}

const fold = (a: number, b: number) => Math.max(a / b, b / a);

describe("R DNase run 1 through analyseCurve (raw signal, rising)", () => {
  const x = DNASE_RUN1.conc;
  const y = DNASE_RUN1.density;
  const r = readRLines(
    runR(`
d <- DNase[DNase$Run == 1, ]
fit <- nls(density ~ SSfpl(log(conc), A, B, xmid, scal), data = d)
${rPrint("coef", "coef(fit)")}${rPrint("rss", "deviance(fit)")}
`),
  );

  it("weighting none: the published fit (bottom −0.0078971, top 2.37724, EC50 4.5150, Hill 0.94111) and R's nls(SSfpl)", () => {
    const a = analyseCurve(x, y, { response: "signal", weighting: "none" });
    expect(a.outcome).toBe("fitted");
    expect(a.reason).toBeUndefined();
    const f = a.fit!;
    expect(f.bottom!).toBeCloseTo(-0.0078971, 6);
    expect(f.top!).toBeCloseTo(2.37724, 5);
    expect(f.ic50!).toBeCloseTo(4.515, 3);
    expect(f.ic50Ci95[0]!).toBeCloseTo(3.6146, 3);
    expect(f.ic50Ci95[1]!).toBeCloseTo(5.6396, 3);
    expect(f.hill!).toBeCloseTo(0.94111, 5);
    expect(f.rss).toBeCloseTo(0.0047073, 7);
    // R: A = bottom, B = top, xmid = ln EC50, scal = 1/Hill.
    const [A, B, xmid, scal] = r.coef!;
    expect(Math.abs(f.bottom! - A!) / (B! - A!)).toBeLessThan(1e-5);
    expect(Math.abs(f.top! / B! - 1)).toBeLessThan(1e-5);
    expect(Math.abs(f.ic50! / Math.exp(xmid!) - 1)).toBeLessThan(1e-5);
    expect(Math.abs(f.hill! * scal! - 1)).toBeLessThan(1e-5);
    expect(Math.abs(f.rss / r.rss![0]! - 1)).toBeLessThan(1e-6);
    // The duplicates agree more closely than the curve follows the doses: lack of fit is flagged
    // (adequacy.test.ts checks F and p against R), never hidden; no outlier is proposed.
    expect(a.adequacy!.lackOfFit!.dfLof).toBe(4);
    expect(a.flags).toContain("inadequate-fit");
    expect(a.outliers).toEqual([]);
    expect(a.weighting).toMatchObject({ used: "none", chosen: "set" });
  });

  it("weighting auto: the duplicates' SD grows with the signal, so relative weighting is chosen and said so", () => {
    const a = analyseCurve(x, y, { response: "signal" });
    expect(a.weighting.used).toBe("relative");
    expect(a.weighting.chosen).toBe("auto");
    expect(a.weighting.slope!).toBeGreaterThan(0.5);
    expect(a.weighting.p!).toBeLessThan(0.05);
    expect(a.weighting.reason).toMatch(/SD grows with the signal/);
    expect(a.fit!.weighting).toBe("relative");
    expect(a.flags).toContain("relative-weighting");
    // The relative fit itself is checked against minpack.lm in logistic4.test.ts.
    expect(a.fit!.ic50).toBeCloseTo(fitLogistic4(x, y, { weighting: "relative" }).ic50!, 12);
  });
});

describe("no effect, weak effect, activation (seeded invented data)", () => {
  it("flat curves (100 sets, single wells and duplicates): always inactive, never an IC50", () => {
    for (let s = 0; s < 100; s++) {
      const a = analyseCurve(...xy(series(1000 + s, () => 0, 5, 1 + (s % 2))));
      expect(a.outcome).toBe("inactive");
      expect(a.fit).toBeNull();
      expect(a.maxInhibitionPct!).toBeLessThan(20);
      expect(a.reason).toMatch(/^< 50 % inhibition at the top concentration 30: maximum/);
    }
  });

  it("weak inhibitor reaching 30 % (100 sets): inactive, with the maximum shown (within noise of 30 %)", () => {
    for (let s = 0; s < 100; s++) {
      const a = analyseCurve(...xy(series(2000 + s, (x) => inhibition(x, 1, 1, 30), 5, 2)));
      expect(a.outcome).toBe("inactive");
      expect(a.fit).toBeNull();
      expect(Math.abs(a.maxInhibitionPct! - 30)).toBeLessThan(12);
      expect(a.reason).toContain(`maximum ${Number(a.maxInhibitionPct!.toPrecision(3))} %`);
    }
  });

  it("activator (activity rises to 160 %, 100 sets): named an activator, with the rise shown; no IC50", () => {
    for (let s = 0; s < 100; s++) {
      const a = analyseCurve(...xy(series(3000 + s, (x) => -inhibition(x, 1, 1, 60), 5)));
      expect(a.outcome).toBe("activator");
      expect(a.fit).toBeNull();
      expect(a.maxActivationPct!).toBeGreaterThan(40);
      expect(a.reason).toMatch(/an activator, not an inhibitor/);
    }
  });

  it("% activity input (100 − inhibition) gives the same judgements and potency", () => {
    const c = randomCurve(4000);
    const inh = analyseCurve(c.x, c.y);
    const act = analyseCurve(
      c.x,
      c.y.map((v) => 100 - v),
      { response: "activity-pct" },
    );
    expect(act.outcome).toBe("fitted");
    expect(act.fit!.ic50!).toBeCloseTo(inh.fit!.ic50!, 8);
    const flat = analyseCurve(
      CONC,
      CONC.map(() => 98),
      { response: "activity-pct" },
    );
    expect(flat.outcome).toBe("inactive");
  });
});

describe("curves that must not give a confident IC50 (seeded invented data)", () => {
  it("a two-level step between two doses: not determined, the IC50 bracketed by the two concentrations", () => {
    const y = CONC.map((c, k) => (c > 0.5 ? 97 : 3) + (k % 2 ? 1 : -1));
    const a = analyseCurve(CONC, y);
    expect(fitLogistic4(CONC, y).hill!).toBeGreaterThan(5);
    expect(a.outcome).toBe("not-determined");
    expect(a.fit).toBeNull();
    expect(a.flags).toContain("steep-step");
    expect(a.ic50Bracket).toEqual([CONC[4], CONC[3]]);
    expect(a.reason).toMatch(/^a step \(Hill .*\) between 0\.3 and 0\.9487/);
  });

  it("≥ 50 % at every concentration: not determined, IC50 below the tested range", () => {
    const a = analyseCurve(...xy(series(5000, (x) => inhibition(x, 1e-4, 1), 3)));
    expect(a.outcome).toBe("not-determined");
    expect(a.reason).toMatch(/below the tested range/);
    expect(a.flags).toContain("ic50-below-range");
  });

  it("too few points: not determined with the counts", () => {
    const a = analyseCurve([1, 2, 3, 4], [10, 20, 60, 90]);
    expect(a.outcome).toBe("not-determined");
    expect(a.reason).toBe(
      "too few points: 4 points at 4 concentrations; at least 5 points at 4 concentrations are needed",
    );
    expect(a.adequacy).toBeNull();
  });

  it("partial inhibitor (plateau at 65 %): fitted and flagged partial", () => {
    const a = analyseCurve(...xy(series(6000, (x) => inhibition(x, 0.3, 1, 65), 2, 2)));
    expect(a.outcome).toBe("fitted");
    expect(a.fit!.top!).toBeLessThan(80);
    expect(a.flags).toContain("partial-inhibition");
    expect(fold(a.fit!.ic50!, 0.3)).toBeLessThan(1.5);
  });

  it("clean curves (200 sets): fitted, no outlier proposed in ≥ 98 %, IC50 within 2-fold of the truth in ≥ 95 %", () => {
    let clean = 0;
    let close = 0;
    for (let s = 0; s < 200; s++) {
      const c = randomCurve(7000 + 2 * s);
      const a = analyseCurve(c.x, c.y);
      expect(a.outcome).toBe("fitted");
      if (a.outliers.length === 0) clean++;
      if (fold(a.fit!.ic50!, c.ic50) < 2) close++;
    }
    expect(clean / 200).toBeGreaterThanOrEqual(0.98);
    expect(close / 200).toBeGreaterThanOrEqual(0.95);
  });
});

describe("one wild well (seeded invented data)", () => {
  /** A curve with the 8th well (a low concentration) read 90 % too high or too low. */
  function wild(seed: number) {
    const c = randomCurve(seed);
    const k = 7;
    const y = [...c.y];
    y[k] = y[k]! > 50 ? y[k]! - 90 : y[k]! + 90;
    return { ...c, y, k };
  }

  it("the example: the ordinary fit moves the IC50 > 100-fold; the well is proposed and the fit without it is within 2-fold", () => {
    const c = wild(1002);
    const old = fitLogistic4(c.x, c.y);
    expect(fold(old.ic50!, c.ic50)).toBeGreaterThan(100);
    const a = analyseCurve(c.x, c.y);
    // Robust off: the well is proposed, not dropped; the all-points judgement refuses an IC50.
    expect(a.reported).toBe("all-points");
    expect(a.outcome).not.toBe("fitted");
    expect(a.outliers.map((o) => o.index)).toEqual([c.k]);
    expect(a.outliers[0]!.p).toBeLessThan(0.001);
    expect(a.outliers[0]!.y).toBe(c.y[c.k]);
    expect(a.flags).toContain("outliers-proposed");
    expect(a.reason).toMatch(/without the proposed outlier the curve is fitted, IC50/);
    expect(a.alternative!.basis).toBe("outliers-excluded");
    expect(a.alternative!.outcome).toBe("fitted");
    expect(fold(a.alternative!.fit!.ic50!, c.ic50)).toBeLessThan(2);
    expect(a.alternative!.usedIndices).not.toContain(c.k);
    // Robust on: the fit without the well is reported and the all-points judgement kept beside it.
    const b = analyseCurve(c.x, c.y, { robust: true });
    expect(b.reported).toBe("outliers-excluded");
    expect(b.outcome).toBe("fitted");
    expect(b.fit!.ic50).toBe(a.alternative!.fit!.ic50);
    expect(b.flags).toContain("outliers-excluded");
    expect(b.alternative!.basis).toBe("all-points");
    expect(b.alternative!.outcome).toBe(a.outcome);
  });

  it("100 sets: proposed in ≥ 85 %, the refit within 2-fold in ≥ 85 %, and the all-points judgement never a confident wrong IC50", () => {
    let proposed = 0;
    let refitClose = 0;
    let oldFar = 0;
    let confidentlyWrong = 0;
    for (let s = 0; s < 100; s++) {
      const c = wild(8000 + 2 * s);
      if (fold(fitLogistic4(c.x, c.y).ic50!, c.ic50) > 100) oldFar++;
      const a: CurveAnalysis = analyseCurve(c.x, c.y);
      if (a.outliers.some((o) => o.index === c.k)) proposed++;
      if (a.alternative?.fit && fold(a.alternative.fit.ic50!, c.ic50) < 2) refitClose++;
      // "Never confidently wrong": the all-points judgement reports no IC50 more than 3-fold off.
      if (a.outcome === "fitted" && fold(a.fit!.ic50!, c.ic50) > 3) confidentlyWrong++;
    }
    expect(confidentlyWrong).toBe(0);
    expect(proposed).toBeGreaterThanOrEqual(85);
    expect(refitClose).toBeGreaterThanOrEqual(85);
    expect(oldFar).toBeGreaterThan(10);
  });
});

describe("weighting chosen from the replicates (seeded invented data)", () => {
  // Raw plate signal 1000 → 50 with 10 % CV, triplicates: SD grows with the signal.
  function proportional(seed: number) {
    const z = seededNormal(seededRandom(seed));
    const x: number[] = [];
    const y: number[] = [];
    for (const c of CONC) {
      for (let r = 0; r < 3; r++) {
        x.push(c);
        y.push((50 + 950 / (1 + Math.pow(c / 0.5, 1))) * (1 + 0.1 * z()));
      }
    }
    return { x, y };
  }

  it("proportional noise (50 sets): relative chosen in ≥ 90 %, and the reason names the slope", () => {
    let relative = 0;
    for (let s = 0; s < 50; s++) {
      const a = analyseCurve(...xy(proportional(9000 + s)), { response: "signal" });
      expect(a.outcome).toBe("fitted");
      if (a.weighting.used === "relative") {
        relative++;
        expect(a.weighting.reason).toMatch(/slope of log SD on log mean/);
        expect(a.fit!.weighting).toBe("relative");
      }
    }
    expect(relative).toBeGreaterThanOrEqual(45);
  });

  it("constant noise in % inhibition (50 sets, duplicates): none in ≥ 90 %", () => {
    let none = 0;
    for (let s = 0; s < 50; s++) {
      const c = randomCurve(9500 + 2 * s, 2);
      if (analyseCurve(c.x, c.y).weighting.used === "none") none++;
    }
    expect(none).toBeGreaterThanOrEqual(45);
  });

  it("single wells: none, because there is no scatter to judge", () => {
    const c = randomCurve(9900);
    expect(analyseCurve(c.x, c.y).weighting).toEqual({
      used: "none",
      chosen: "auto",
      reason: "no replicate wells to judge the scatter by: unweighted",
    });
  });
});

describe("input errors name what is wrong and where", () => {
  it("lengths, values, keys and options", () => {
    expect(() => analyseCurve([1, 2], [1])).toThrow("analyseCurve: 2 concentrations but 1 responses");
    expect(() => analyseCurve([1, -2, 3, 4, 5], [1, 2, 3, 4, 5])).toThrow(
      /concentration 2 must be a finite number ≥ 0/,
    );
    expect(() => analyseCurve([1, 2, 3, 4, 5], [1, NaN, 3, 4, 5])).toThrow(/response 2 must be finite/);
    expect(() => analyseCurve([1, 2, 3, 4, 5], [1, 2, 3, 4, 5], { keys: ["a"] })).toThrow(/1 keys for 5 points/);
    expect(() => analyseCurve([1, 2, 3, 4, 5], [1, 2, 3, 4, 5], { q: 2 })).toThrow(/q must be between 0 and 1/);
    expect(() => analyseCurve([1, 2, 3, 4, 5], [1, 2, 3, 4, 5], { weighting: "proportional" as "none" })).toThrow(
      /weighting must be auto, none or relative/,
    );
  });
});

describe("sentences name the concentration unit and the wells when given (seeded invented data)", () => {
  const units = { concentration: "µM" };
  const names = CONC.map((_, k) => `P${k + 1}`);

  it("inactive, step and below-range sentences carry the unit", () => {
    const flat = analyseCurve(...xy(series(1000, () => 0, 5)), { units });
    expect(flat.reason).toMatch(/^< 50 % inhibition at the top concentration 30 µM: maximum -?[\d.]+ %$/);
    const step = analyseCurve(
      CONC,
      CONC.map((c, k) => (c > 0.5 ? 97 : 3) + (k % 2 ? 1 : -1)),
      { units },
    );
    expect(step.reason).toMatch(/^a step \(Hill .*\) between 0\.3 µM and 0\.9487 µM: /);
    const below = analyseCurve(...xy(series(5000, (x) => inhibition(x, 1e-4, 1), 3)), { units });
    expect(below.reason).toBe("≥ 50 % inhibition at every concentration: IC50 below the tested range (< 0.0009487 µM)");
  });

  it("a proposed outlier is named by its well, and the IC50 without it has its unit", () => {
    const c = randomCurve(1002);
    const y = [...c.y];
    y[7] = y[7]! > 50 ? y[7]! - 90 : y[7]! + 90;
    const a = analyseCurve(c.x, y, { units, rowNames: names });
    expect(a.reason).toMatch(/; without the proposed outlier \(well P8\) the curve is fitted, IC50 [\d.]+ µM$/);
  });

  it("400 varied curves: every concentration in a reason has the unit; without units the texts are the same bare", () => {
    let reasons = 0;
    for (let s = 0; s < 400; s++) {
      const u = seededRandom(90000 + s);
      const z = seededNormal(seededRandom(91000 + s));
      const ic50 = Math.pow(10, -3 + 5.5 * u());
      const hill = 0.5 + 8 * u() ** 2;
      const max = 40 + 80 * u();
      const sd = 3 + 25 * u();
      const x: number[] = [];
      const y: number[] = [];
      for (const c of CONC)
        for (let r = 0; r < 2; r++) {
          x.push(c);
          y.push(inhibition(c, ic50, hill, max) + sd * z());
        }
      if (s % 7 === 0) y[5]! += 90;
      const plain = analyseCurve(x, y);
      const worded = analyseCurve(x, y, { units });
      expect(worded.outcome).toBe(plain.outcome);
      expect(worded.fit?.ic50).toBe(plain.fit?.ic50);
      expect(worded.reason?.replaceAll(" µM", "")).toBe(plain.reason);
      const t = worded.reason;
      if (!t) continue;
      reasons++;
      for (const m of t.matchAll(/(top concentration|range \([<>]|between|and|IC50) (-?\d[\d.e+-]*)(.{0,3})/g))
        expect(m[3], `${m[0]} in: ${t}`).toMatch(/^ µM/);
      for (const m of t.matchAll(/decades \(([^)]*)\)/g)) expect(m[1], t).toMatch(/^[\d.e+-]+–[\d.e+-]+ µM$/);
      // Outcomes in words, not as codes ("not determined", not "not-determined").
      expect(t).not.toMatch(/not-determined/);
    }
    expect(reasons).toBeGreaterThan(100);
  });

  it("row names must match the points", () => {
    expect(() => analyseCurve([1, 2, 3, 4, 5], [1, 2, 3, 4, 5], { rowNames: ["A1"] })).toThrow(
      /1 row names for 5 points/,
    );
  });
});

function xy(s: { x: number[]; y: number[] }): [number[], number[]] {
  return [s.x, s.y];
}
