import { describe, expect, it } from "vitest";
import { fitMichaelisMenten } from "./michaelis-menten";
import { PUROMYCIN_TREATED, PUROMYCIN_UNTREATED } from "./testdata/reference-data";

// Puromycin: Treloar 1974 via Bates & Watts 1988 and R datasets::Puromycin (data src); fitted
// values computed with SciPy 1.17; they agree with R's nls as published in Bates & Watts 1988.
describe("Michaelis–Menten: Puromycin (Treloar 1974; Bates & Watts 1988; R datasets)", () => {
  it("treated: Vm 212.684 (SE 6.947), K 0.064121 (SE 0.008281), residual SE 10.934 on 10 df", () => {
    const f = fitMichaelisMenten(PUROMYCIN_TREATED.conc, PUROMYCIN_TREATED.rate);
    expect(f.vmax).toBeCloseTo(212.684, 3);
    expect(f.vmaxSe!).toBeCloseTo(6.947, 3);
    expect(f.km).toBeCloseTo(0.064121, 6);
    expect(f.kmSe!).toBeCloseTo(0.008281, 6);
    expect(f.residualSe!).toBeCloseTo(10.934, 3);
    expect(f.dof).toBe(10);
  });

  it("untreated: Vm 160.280 (SE 6.480), K 0.047708 (SE 0.007782)", () => {
    const f = fitMichaelisMenten(PUROMYCIN_UNTREATED.conc, PUROMYCIN_UNTREATED.rate);
    expect(f.vmax).toBeCloseTo(160.28, 3);
    expect(f.vmaxSe!).toBeCloseTo(6.48, 3);
    expect(f.km).toBeCloseTo(0.047708, 6);
    expect(f.kmSe!).toBeCloseTo(0.007782, 6);
  });
});
