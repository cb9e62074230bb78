import { describe, expect, it } from "vitest";
import { formatConcentration, formatConcentrationRange } from "./units";

// Unit prefixes (SI; common practice): 1 µM = 1000 nM = 10⁶ pM, 1 mM = 1000 µM.
describe("concentration labels", () => {
  it("writes a value in µM with a readable prefix", () => {
    expect(formatConcentration(0.0042)).toBe("4.2 nM");
    expect(formatConcentration(2.5)).toBe("2.5 µM");
    expect(formatConcentration(null)).toBe("—");
  });
  it("writes a confidence interval, an unbounded upper end as ∞ and no interval as a dash", () => {
    expect(formatConcentrationRange(0.796, 0.927)).toBe("796 nM – 927 nM");
    expect(formatConcentrationRange(1.2, null)).toBe("1.2 µM – ∞");
    expect(formatConcentrationRange(null, null)).toBe("—");
  });
});
