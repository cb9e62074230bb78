import { describe, expect, it } from "vitest";
import { ic50FromKi, kiFromIc50 } from "./cheng-prusoff";
import { morrisonFractionalActivity, morrisonIc50, fitMorrison } from "./morrison";
import { logistic4 } from "./logistic4";
import { fitLogistic4 } from "./logistic4";
import { inhibitedRate } from "./inhibition-models";

// Cheng & Prusoff, Biochem Pharmacol 1973;22:3099; worked values computed from its equations, S = 10, Km = 5.
describe("Cheng–Prusoff worked values (Cheng & Prusoff 1973)", () => {
  it("competitive Ki 1 → IC50 3.0; uncompetitive Kiu 1 → 1.5; noncompetitive Ki 1 → 1.0", () => {
    expect(ic50FromKi("competitive", { s: 10, km: 5, kic: 1 })).toBeCloseTo(3, 12);
    expect(ic50FromKi("uncompetitive", { s: 10, km: 5, kiu: 1 })).toBeCloseTo(1.5, 12);
    expect(ic50FromKi("noncompetitive", { s: 10, km: 5, kic: 1 })).toBeCloseTo(1, 12);
  });
  it("mixed Kic 1, Kiu 4 → 2.0 at S = 10, Km = 5, and 1.6 at S = Km = 5", () => {
    expect(ic50FromKi("mixed", { s: 10, km: 5, kic: 1, kiu: 4 })).toBeCloseTo(2, 12);
    expect(ic50FromKi("mixed", { s: 5, km: 5, kic: 1, kiu: 4 })).toBeCloseTo(1.6, 12);
  });
  it("inverses return the constants", () => {
    expect(kiFromIc50("competitive", { ic50: 3, s: 10, km: 5 }).kic).toBeCloseTo(1, 12);
    expect(kiFromIc50("uncompetitive", { ic50: 1.5, s: 10, km: 5 }).kiu).toBeCloseTo(1, 12);
    expect(kiFromIc50("noncompetitive", { ic50: 1, s: 10, km: 5 })).toEqual({ kic: 1, kiu: 1 });
    const m = kiFromIc50("mixed", { ic50: 2, s: 10, km: 5, alpha: 4 });
    expect(m.kic!).toBeCloseTo(1, 12);
    expect(m.kiu!).toBeCloseTo(4, 12);
    expect(() => kiFromIc50("mixed", { ic50: 2, s: 10, km: 5 })).toThrow(/alpha/);
  });
  it("at fixed S every classical model gives v/v0 = 1/(1 + I/IC50), a Hill slope of 1 (common practice)", () => {
    const c = { vmax: 1, km: 5, kic: 1, kiu: 4 };
    const ic50 = ic50FromKi("mixed", { s: 10, km: 5, kic: 1, kiu: 4 });
    const conc = [0.01, 0.03, 0.1, 0.3, 1, 3, 10, 30, 100];
    const v0 = inhibitedRate("mixed", 10, 0, c);
    const y = conc.map((i) => (100 * inhibitedRate("mixed", 10, i, c)) / v0);
    for (const [k, i] of conc.entries()) expect(y[k]!).toBeCloseTo(logistic4(i, 100, 0, Math.log10(ic50), 1), 10);
    const f = fitLogistic4(conc, y);
    expect(f.hill!).toBeCloseTo(1, 8);
    expect(f.ic50!).toBeCloseTo(2, 8);
  });
});

// Morrison, Biochim Biophys Acta 1969;185:269 [from memory]; IC50 = K′ + E/2, Copeland et al.,
// Bioorg Med Chem Lett 1995;5:1947. Check values computed with SciPy: E = 10 nM, K′ = 1 nM.
describe("Morrison tight-binding equation (Morrison 1969; Copeland et al. 1995)", () => {
  it("v/v0 = 0.574166 at I = 5, 0.5 at 6, 0.270156 at 10, 0.084429 at 20; IC50 = 6", () => {
    expect(morrisonFractionalActivity(5, 10, 1)).toBeCloseTo(0.574166, 6);
    expect(morrisonFractionalActivity(6, 10, 1)).toBeCloseTo(0.5, 12);
    expect(morrisonFractionalActivity(10, 10, 1)).toBeCloseTo(0.270156, 6);
    expect(morrisonFractionalActivity(20, 10, 1)).toBeCloseTo(0.084429, 6);
    expect(morrisonFractionalActivity(0, 10, 1)).toBe(1);
    expect(morrisonIc50(10, 1)).toBe(6);
  });
  it("fits K′ (and v0) from exact data and returns IC50 = K′ + E/2", () => {
    const i = [0, 1, 2, 4, 6, 8, 10, 15, 20, 40];
    const v = i.map((x) => 250 * morrisonFractionalActivity(x, 10, 1));
    const f = fitMorrison(i, v, 10);
    expect(f.kApp).toBeCloseTo(1, 8);
    expect(f.v0).toBeCloseTo(250, 6);
    expect(f.ic50).toBeCloseTo(6, 8);
    const fixed = fitMorrison(
      i,
      v.map((x) => x / 250),
      10,
      { fixedV0: 1 },
    );
    expect(fixed.kApp).toBeCloseTo(1, 8);
    expect(fixed.v0Se).toBeNull();
  });
});
