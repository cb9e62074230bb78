import { describe, expect, it } from "vitest";
import { formatAlpha } from "./alpha";

// The limits of α = Kiu/Kic per model: Copeland, Evaluation of Enzyme Inhibitors in Drug
// Discovery (2005), from memory (the four models as limits of α = Kiu/Kic).
describe("formatAlpha", () => {
  it("shows a fitted α to three significant figures", () => {
    expect(formatAlpha(3.14159, "mixed")).toBe("3.14");
    expect(formatAlpha(1, "noncompetitive")).toBe("1");
  });
  it("shows the limits of the constrained models", () => {
    expect(formatAlpha(0, "uncompetitive")).toBe("0");
    expect(formatAlpha(null, "competitive")).toBe("∞");
    expect(formatAlpha(null, "mixed")).toBe("∞");
  });
  it("shows a dash where there is no mechanism call", () => {
    expect(formatAlpha(null, null)).toBe("—");
  });
});
